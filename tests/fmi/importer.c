/* An FMI importer of our own (C99, dlopen): drives an unpacked elyblock FMU, FMI 2.0 or 3.0
 * Co-Simulation, through its life cycle and the standard's misuse cases, and compares its physics
 * with the library's own dynamic calls (ely_block_reset / ely_block_advance) bit for bit.
 * Usage: importer 2|3 UNPACKED_FMU_DIR [VALUES_FILE]. Prints one line per check ("ok -" /
 * "not ok -") and returns the number of failed checks. Value references, the token and the model
 * identifier are read from modelDescription.xml (libxml2), as any importer reads them.
 * VALUES_FILE: the FMU's outputs of the stepped run and of the steady run, written with 17
 * significant digits, to compare the Linux binary with the Windows one (tests/fmi/wine_fmu.sh).
 *
 * The same source is cross-compiled for Windows (importer.exe, run under Wine): LoadLibraryW and
 * GetProcAddress instead of dlopen, the Windows binary binaries/win64 or binaries/x86_64-windows,
 * resource locations as Windows paths, and the model description read by a small attribute scanner
 * (mingw has no libxml2; the file is this project's own output, one element per tag). */
#ifdef _WIN32
#define WIN32_LEAN_AND_MEAN
#define NOGDI /* wingdi.h defines ERROR */
#include <windows.h>
#include <shellapi.h> /* CommandLineToArgvW */
#else
#define _DEFAULT_SOURCE /* realpath */
#include <dlfcn.h>
#include <libxml/parser.h>
#include <libxml/tree.h>
#endif
#include <elyblock/elyblock.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "fmi2_api.h"
#include "fmi3_api.h"

static int failures = 0;
static FILE* values = NULL; /* VALUES_FILE, or NULL */
static void check(int ok, const char* what) {
    printf("%s - %s\n", ok ? "ok" : "not ok", what);
    if (!ok) ++failures;
}

/* ---- the model description ------------------------------------------------------------- */

#define MAX_VARS 512
static char var_names[MAX_VARS][128];
static unsigned var_refs[MAX_VARS];
static int n_vars = 0;
static char token[128], identifier[128];

/* A file named by a UTF-8 path (on Windows through its UTF-16 form: narrow paths are ANSI there). */
static FILE* open_utf8(const char* path, const char* mode) {
#ifdef _WIN32
    wchar_t wide_path[8192], wide_mode[8];
    if (!MultiByteToWideChar(CP_UTF8, 0, path, -1, wide_path, 8192) ||
        !MultiByteToWideChar(CP_UTF8, 0, mode, -1, wide_mode, 8))
        return NULL;
    return _wfopen(wide_path, wide_mode);
#else
    return fopen(path, mode);
#endif
}

/* The file: URI of an absolute path ("/dir" or, on Windows, "C:/dir"), every byte outside RFC
 * 3986's unreserved characters, '/' and ':' percent-encoded (spaces, non-ASCII UTF-8 bytes). */
static void file_uri(const char* path, char* uri, size_t size) {
    size_t n = (size_t)snprintf(uri, size, "file://%s", path[0] == '/' ? "" : "/");
    for (const unsigned char* c = (const unsigned char*)path; *c && n + 4 < size; ++c) {
        if ((*c >= 'A' && *c <= 'Z') || (*c >= 'a' && *c <= 'z') || (*c >= '0' && *c <= '9') || strchr("-._~/:", *c))
            uri[n++] = (char)*c;
        else
            n += (size_t)snprintf(uri + n, size - n, "%%%02X", *c);
    }
    uri[n] = 0;
}

/* The plant file in the unpacked FMU's resources, and the resource location the standard hands the
 * FMU: FMI 2 a file: URI of the folder (file:///Z:/dir/resources on Windows), FMI 3 a native path
 * ending in a separator ('\\' on Windows). */
static void resource_locations(int version, const char* dir, char* plant, size_t plant_size, char* resources,
                               size_t size) {
    snprintf(plant, plant_size, "%s/resources/plant.json", dir);
    if (version == 2) {
        char resource_dir[8192];
        snprintf(resource_dir, sizeof resource_dir, "%s/resources", dir);
        file_uri(resource_dir, resources, size);
        return;
    }
    snprintf(resources, size, "%s/resources/", dir);
#ifdef _WIN32
    for (char* c = resources; *c; ++c)
        if (*c == '/') *c = '\\';
#endif
}

#ifdef _WIN32
/* The value of attribute `name` inside the tag [tag, end), into out; 0 when absent. */
static int attribute(const char* tag, const char* end, const char* name, char* out, size_t size) {
    char key[64];
    snprintf(key, sizeof key, " %s=\"", name);
    const char* a = strstr(tag, key);
    if (!a || a >= end) return 0;
    a += strlen(key);
    const char* q = strchr(a, '"');
    if (!q || q >= end || (size_t)(q - a) >= size) return 0;
    memcpy(out, a, (size_t)(q - a));
    out[q - a] = 0;
    return 1;
}

static void read_description(const char* dir) {
    char path[8192], value[128];
    snprintf(path, sizeof path, "%s/modelDescription.xml", dir);
    FILE* f = open_utf8(path, "rb");
    if (!f) {
        fprintf(stderr, "cannot read %s\n", path);
        exit(100);
    }
    fseek(f, 0, SEEK_END);
    long n = ftell(f);
    fseek(f, 0, SEEK_SET);
    char* text = malloc((size_t)n + 1);
    if (!text || fread(text, 1, (size_t)n, f) != (size_t)n) exit(100);
    text[n] = 0;
    fclose(f);
    const char* root = strstr(text, "<fmiModelDescription");
    const char* cs = strstr(text, "<CoSimulation");
    const char* vars = strstr(text, "<ModelVariables>");
    const char* vars_end = strstr(text, "</ModelVariables>");
    if (!root || !cs || !vars || !vars_end) {
        fprintf(stderr, "%s: not an FMI model description\n", path);
        exit(100);
    }
    if (!attribute(root, strchr(root, '>'), "guid", token, sizeof token) &&
        !attribute(root, strchr(root, '>'), "instantiationToken", token, sizeof token))
        exit(100);
    if (!attribute(cs, strchr(cs, '>'), "modelIdentifier", identifier, sizeof identifier)) exit(100);
    /* Every tag in ModelVariables with a name and a value reference is a variable. */
    for (const char* tag = strchr(vars + 1, '<'); tag && tag < vars_end && n_vars < MAX_VARS; tag = strchr(tag + 1, '<')) {
        const char* end = strchr(tag, '>');
        if (!end) break;
        if (attribute(tag, end, "name", var_names[n_vars], sizeof var_names[0]) &&
            attribute(tag, end, "valueReference", value, sizeof value))
            var_refs[n_vars++] = (unsigned)strtoul(value, NULL, 10);
    }
    free(text);
}
#else
static void read_description(const char* dir) {
    char path[8192];
    snprintf(path, sizeof path, "%s/modelDescription.xml", dir);
    xmlDocPtr doc = xmlReadFile(path, NULL, 0);
    if (!doc) {
        fprintf(stderr, "cannot read %s\n", path);
        exit(100);
    }
    xmlNodePtr root = xmlDocGetRootElement(doc);
    xmlChar* t = xmlGetProp(root, BAD_CAST "guid");
    if (!t) t = xmlGetProp(root, BAD_CAST "instantiationToken");
    snprintf(token, sizeof token, "%s", (const char*)t);
    xmlFree(t);
    for (xmlNodePtr n = root->children; n; n = n->next) {
        if (n->type != XML_ELEMENT_NODE) continue;
        if (xmlStrEqual(n->name, BAD_CAST "CoSimulation")) {
            xmlChar* id = xmlGetProp(n, BAD_CAST "modelIdentifier");
            snprintf(identifier, sizeof identifier, "%s", (const char*)id);
            xmlFree(id);
        }
        if (!xmlStrEqual(n->name, BAD_CAST "ModelVariables")) continue;
        for (xmlNodePtr v = n->children; v; v = v->next) {
            if (v->type != XML_ELEMENT_NODE || n_vars >= MAX_VARS) continue;
            xmlChar* name = xmlGetProp(v, BAD_CAST "name");
            xmlChar* vr = xmlGetProp(v, BAD_CAST "valueReference");
            snprintf(var_names[n_vars], sizeof var_names[0], "%s", (const char*)name);
            var_refs[n_vars++] = (unsigned)strtoul((const char*)vr, NULL, 10);
            xmlFree(name);
            xmlFree(vr);
        }
    }
    xmlFreeDoc(doc);
}
#endif

static unsigned vr_of(const char* name) {
    for (int i = 0; i < n_vars; ++i)
        if (strcmp(var_names[i], name) == 0) return var_refs[i];
    fprintf(stderr, "no variable %s in the model description\n", name);
    exit(101);
}

/* ---- the FMU, FMI 2 or 3 behind one set of helpers -------------------------------------- */

static int version;
static void* lib;
static char resources[8192];
static char last_log[4096];
static int log_count = 0;

static void logger2(fmi2ComponentEnvironment env, fmi2String name, fmi2Status status, fmi2String category,
                    fmi2String message, ...) {
    (void)env;
    (void)name;
    (void)status;
    (void)category;
    va_list args;
    va_start(args, message);
    vsnprintf(last_log, sizeof last_log, message, args);
    va_end(args);
    ++log_count;
}

static void logger3(fmi3InstanceEnvironment env, fmi3Status status, fmi3String category, fmi3String message) {
    (void)env;
    (void)status;
    (void)category;
    snprintf(last_log, sizeof last_log, "%s", message);
    ++log_count;
}

static void* sym(const char* name) {
#ifdef _WIN32
    void* f = (void*)GetProcAddress((HMODULE)lib, name);
#else
    void* f = dlsym(lib, name);
#endif
    if (!f) {
        fprintf(stderr, "the FMU does not export %s\n", name);
        exit(102);
    }
    return f;
}
#define F2(name) ((name##TYPE_2*)sym(#name))
#define F3(name) ((name##TYPE_3*)sym(#name))
typedef __typeof__(fmi2Instantiate) fmi2InstantiateTYPE_2;
typedef __typeof__(fmi2FreeInstance) fmi2FreeInstanceTYPE_2;
typedef __typeof__(fmi2SetupExperiment) fmi2SetupExperimentTYPE_2;
typedef __typeof__(fmi2EnterInitializationMode) fmi2EnterInitializationModeTYPE_2;
typedef __typeof__(fmi2ExitInitializationMode) fmi2ExitInitializationModeTYPE_2;
typedef __typeof__(fmi2DoStep) fmi2DoStepTYPE_2;
typedef __typeof__(fmi2GetReal) fmi2GetRealTYPE_2;
typedef __typeof__(fmi2SetReal) fmi2SetRealTYPE_2;
typedef __typeof__(fmi2GetFMUstate) fmi2GetFMUstateTYPE_2;
typedef __typeof__(fmi2SetFMUstate) fmi2SetFMUstateTYPE_2;
typedef __typeof__(fmi2FreeFMUstate) fmi2FreeFMUstateTYPE_2;
typedef __typeof__(fmi2SerializedFMUstateSize) fmi2SerializedFMUstateSizeTYPE_2;
typedef __typeof__(fmi2SerializeFMUstate) fmi2SerializeFMUstateTYPE_2;
typedef __typeof__(fmi2DeSerializeFMUstate) fmi2DeSerializeFMUstateTYPE_2;
typedef __typeof__(fmi2Terminate) fmi2TerminateTYPE_2;
typedef __typeof__(fmi2Reset) fmi2ResetTYPE_2;
typedef __typeof__(fmi2SetDebugLogging) fmi2SetDebugLoggingTYPE_2;
typedef __typeof__(fmi2GetRealStatus) fmi2GetRealStatusTYPE_2;
typedef __typeof__(fmi2GetBooleanStatus) fmi2GetBooleanStatusTYPE_2;
typedef __typeof__(fmi2GetDirectionalDerivative) fmi2GetDirectionalDerivativeTYPE_2;
typedef __typeof__(fmi2GetInteger) fmi2GetIntegerTYPE_2;
typedef __typeof__(fmi2GetVersion) fmi2GetVersionTYPE_2;
typedef __typeof__(fmi2GetTypesPlatform) fmi2GetTypesPlatformTYPE_2;
typedef __typeof__(fmi3InstantiateCoSimulation) fmi3InstantiateCoSimulationTYPE_3;
typedef __typeof__(fmi3InstantiateModelExchange) fmi3InstantiateModelExchangeTYPE_3;
typedef __typeof__(fmi3FreeInstance) fmi3FreeInstanceTYPE_3;
typedef __typeof__(fmi3EnterInitializationMode) fmi3EnterInitializationModeTYPE_3;
typedef __typeof__(fmi3ExitInitializationMode) fmi3ExitInitializationModeTYPE_3;
typedef __typeof__(fmi3DoStep) fmi3DoStepTYPE_3;
typedef __typeof__(fmi3GetFloat64) fmi3GetFloat64TYPE_3;
typedef __typeof__(fmi3SetFloat64) fmi3SetFloat64TYPE_3;
typedef __typeof__(fmi3GetFMUState) fmi3GetFMUStateTYPE_3;
typedef __typeof__(fmi3SetFMUState) fmi3SetFMUStateTYPE_3;
typedef __typeof__(fmi3FreeFMUState) fmi3FreeFMUStateTYPE_3;
typedef __typeof__(fmi3SerializedFMUStateSize) fmi3SerializedFMUStateSizeTYPE_3;
typedef __typeof__(fmi3SerializeFMUState) fmi3SerializeFMUStateTYPE_3;
typedef __typeof__(fmi3DeserializeFMUState) fmi3DeserializeFMUStateTYPE_3;
typedef __typeof__(fmi3Terminate) fmi3TerminateTYPE_3;
typedef __typeof__(fmi3Reset) fmi3ResetTYPE_3;
typedef __typeof__(fmi3SetDebugLogging) fmi3SetDebugLoggingTYPE_3;
typedef __typeof__(fmi3GetInt32) fmi3GetInt32TYPE_3;
typedef __typeof__(fmi3EnterEventMode) fmi3EnterEventModeTYPE_3;
typedef __typeof__(fmi3GetVersion) fmi3GetVersionTYPE_3;

static fmi2CallbackFunctions callbacks2 = {logger2, NULL, NULL, NULL, NULL};

static void* instantiate_with(const char* name, const char* tok) {
    if (version == 2)
        return F2(fmi2Instantiate)(name, fmi2CoSimulation, tok, resources, &callbacks2, fmi2False, fmi2True);
    return F3(fmi3InstantiateCoSimulation)(name, tok, resources, false, true, false, false, NULL, 0, NULL, logger3,
                                           NULL);
}
static void* instantiate(const char* name) { return instantiate_with(name, token); }
static void free_instance(void* c) {
    if (version == 2)
        F2(fmi2FreeInstance)(c);
    else
        F3(fmi3FreeInstance)(c);
}
static int enter_init(void* c, double start) {
    if (version == 2) {
        int s = F2(fmi2SetupExperiment)(c, fmi2False, 0, start, fmi2False, 0);
        return s ? s : (int)F2(fmi2EnterInitializationMode)(c);
    }
    return F3(fmi3EnterInitializationMode)(c, false, 0, start, false, 0);
}
static int exit_init(void* c) {
    return version == 2 ? (int)F2(fmi2ExitInitializationMode)(c) : (int)F3(fmi3ExitInitializationMode)(c);
}
static double last_successful = -1;
static int do_step(void* c, double t, double h) {
    if (version == 2) {
        int s = F2(fmi2DoStep)(c, t, h, fmi2True);
        if (s <= fmi2Discard) F2(fmi2GetRealStatus)(c, fmi2LastSuccessfulTime, &last_successful);
        return s;
    }
    fmi3Boolean event = true, terminate = true, early = true;
    int s = F3(fmi3DoStep)(c, t, h, true, &event, &terminate, &early, &last_successful);
    if (event || terminate || early) return 99;
    return s;
}
static int get(void* c, const char* name, double* value) {
    unsigned vr = vr_of(name);
    return version == 2 ? (int)F2(fmi2GetReal)(c, &vr, 1, value) : (int)F3(fmi3GetFloat64)(c, &vr, 1, value, 1);
}
static int set(void* c, const char* name, double value) {
    unsigned vr = vr_of(name);
    return version == 2 ? (int)F2(fmi2SetReal)(c, &vr, 1, &value) : (int)F3(fmi3SetFloat64)(c, &vr, 1, &value, 1);
}
static int get_state(void* c, void** s) {
    return version == 2 ? (int)F2(fmi2GetFMUstate)(c, s) : (int)F3(fmi3GetFMUState)(c, s);
}
static int set_state(void* c, void* s) {
    return version == 2 ? (int)F2(fmi2SetFMUstate)(c, s) : (int)F3(fmi3SetFMUState)(c, s);
}
static int free_state(void* c, void** s) {
    return version == 2 ? (int)F2(fmi2FreeFMUstate)(c, s) : (int)F3(fmi3FreeFMUState)(c, s);
}
static int state_size(void* c, void* s, size_t* n) {
    return version == 2 ? (int)F2(fmi2SerializedFMUstateSize)(c, s, n) : (int)F3(fmi3SerializedFMUStateSize)(c, s, n);
}
static int serialize(void* c, void* s, unsigned char* b, size_t n) {
    return version == 2 ? (int)F2(fmi2SerializeFMUstate)(c, s, (fmi2Byte*)b, n)
                        : (int)F3(fmi3SerializeFMUState)(c, s, b, n);
}
static int deserialize(void* c, const unsigned char* b, size_t n, void** s) {
    return version == 2 ? (int)F2(fmi2DeSerializeFMUstate)(c, (const fmi2Byte*)b, n, s)
                        : (int)F3(fmi3DeserializeFMUState)(c, b, n, s);
}
static int terminate_instance(void* c) {
    return version == 2 ? (int)F2(fmi2Terminate)(c) : (int)F3(fmi3Terminate)(c);
}
static int reset_instance(void* c) { return version == 2 ? (int)F2(fmi2Reset)(c) : (int)F3(fmi3Reset)(c); }

#define OK 0
#define DISCARD 2
#define ERROR 3

/* ---- the same run through the library -------------------------------------------------- */

static const char* const kOutputs[] = {"cell.voltage",     "stack.temperature", "stack.current", "product.hydrogen",
                                       "heat.released",    "heat.to_coolant",   "gas.h2_in_o2",  "state.mode",
                                       "state.hours_operated", "plant.power"};
#define N_OUT (sizeof kOutputs / sizeof kOutputs[0])
#define N_STEPS 60

/* The run every check compares with: start at 2 A/cm2, drop to 1 A/cm2 at 10 s, then to 0.15
 * A/cm2 at 30 s, 1 s steps (the second half with 2.5 s steps: the step size varies). */
static double current_density_at(int k) { return k < 10 ? 20000.0 : k < 30 ? 10000.0 : 1500.0; }
static double step_at(int k) { return k < 30 ? 1.0 : 2.5; }

static void run_library(const char* plant_path, double heat_capacity, double out[N_STEPS][N_OUT]) {
    ely_block* b = NULL;
    int32_t idx, k;
    double t;
    if (ely_block_create_from_file(plant_path, &b) < 0) {
        fprintf(stderr, "library: %s\n", ely_last_error());
        exit(103);
    }
    if (heat_capacity > 0) {
        ely_block_find(b, "param.heat_capacity", &idx);
        ely_block_set(b, idx, heat_capacity);
    }
    ely_block_find(b, "in.current_density", &idx);
    ely_block_set(b, idx, current_density_at(0));
    ely_block_reset(b, 0.0);
    t = 0;
    for (k = 0; k < N_STEPS; ++k) {
        ely_block_set(b, idx, current_density_at(k));
        if (ely_block_advance(b, step_at(k)) < 0) fprintf(stderr, "library step %d: %s\n", k, ely_last_error());
        t += step_at(k);
        for (size_t o = 0; o < N_OUT; ++o) {
            int32_t i;
            ely_block_find(b, kOutputs[o], &i);
            ely_block_get(b, i, &out[k][o]);
        }
    }
    (void)t;
    ely_block_destroy(b);
}

/* The same run through an FMU instance already instantiated; steps [from, to). */
static int run_fmu(void* c, int from, int to, double* t, double out[N_STEPS][N_OUT]) {
    for (int k = from; k < to; ++k) {
        if (set(c, "in.current_density", current_density_at(k)) != OK) return 0;
        if (do_step(c, *t, step_at(k)) != OK) return 0;
        *t += step_at(k);
        if (fabs(last_successful - *t) > 1e-12 * *t) return 0;
        for (size_t o = 0; o < N_OUT; ++o)
            if (get(c, kOutputs[o], &out[k][o]) != OK) return 0;
    }
    return 1;
}

static int start_fmu(void* c, double heat_capacity) {
    if (heat_capacity > 0 && set(c, "param.heat_capacity", heat_capacity) != OK) return 0;
    if (set(c, "in.current_density", current_density_at(0)) != OK) return 0;
    if (enter_init(c, 0.0) != OK) return 0;
    return exit_init(c) == OK;
}

static int same(double a[N_STEPS][N_OUT], double b[N_STEPS][N_OUT], int from, int to) {
    return memcmp(a[from], b[from], sizeof(double) * N_OUT * (size_t)(to - from)) == 0;
}

int main(int argc, char** argv) {
    if (argc != 3 && argc != 4) {
        fprintf(stderr, "usage: importer 2|3 UNPACKED_FMU_DIR [VALUES_FILE]\n");
        return 100;
    }
    version = atoi(argv[1]);
    char dir[4096];
    char binary[8192], plant[8192];
#ifdef _WIN32
    /* Windows: the arguments as UTF-8 (from the UTF-16 command line), the folder as an absolute
     * path with '/' separators (as the URI wants them; Windows takes both). */
    static char utf8_args[4][4096];
    int wide_argc = 0;
    wchar_t** wide_argv = CommandLineToArgvW(GetCommandLineW(), &wide_argc);
    if (!wide_argv || wide_argc != argc) return 100;
    for (int i = 0; i < argc; ++i) {
        wchar_t full[4096];
        const wchar_t* arg = wide_argv[i];
        if (i == 2 && _wfullpath(full, arg, 4096)) arg = full;
        if (!WideCharToMultiByte(CP_UTF8, 0, arg, -1, utf8_args[i], 4096, NULL, NULL)) return 100;
        argv[i] = utf8_args[i];
    }
    LocalFree(wide_argv);
    snprintf(dir, sizeof dir, "%s", argv[2]);
    for (char* c = dir; *c; ++c)
        if (*c == '\\') *c = '/';
    read_description(dir);
    if (argc == 4 && !(values = open_utf8(argv[3], "w"))) return 100;
    snprintf(binary, sizeof binary, "%s/binaries/%s/%s.dll", dir, version == 2 ? "win64" : "x86_64-windows", identifier);
    resource_locations(version, dir, plant, sizeof plant, resources, sizeof resources);
    wchar_t wide[8192];
    if (!MultiByteToWideChar(CP_UTF8, 0, binary, -1, wide, 8192)) return 104;
    lib = (void*)LoadLibraryW(wide);
    if (!lib) {
        fprintf(stderr, "LoadLibraryW %s: error %lu\n", binary, (unsigned long)GetLastError());
        return 104;
    }
#else
    if (!realpath(argv[2], dir)) {
        fprintf(stderr, "no folder %s\n", argv[2]);
        return 100;
    }
    read_description(dir);
    if (argc == 4 && !(values = open_utf8(argv[3], "w"))) return 100;
    snprintf(binary, sizeof binary, "%s/binaries/%s/%s.so", dir, version == 2 ? "linux64" : "x86_64-linux", identifier);
    resource_locations(version, dir, plant, sizeof plant, resources, sizeof resources);
    lib = dlopen(binary, RTLD_NOW | RTLD_LOCAL);
    if (!lib) {
        fprintf(stderr, "dlopen %s: %s\n", binary, dlerror());
        return 104;
    }
#endif
    printf("# %s, %d variables, resources at %s\n", binary, n_vars, resources);
    check(strcmp(version == 2 ? F2(fmi2GetVersion)() : F3(fmi3GetVersion)(), version == 2 ? "2.0" : "3.0") == 0,
          "GetVersion names the standard");
    if (version == 2) check(strcmp(F2(fmi2GetTypesPlatform)(), "default") == 0, "fmi2GetTypesPlatform is default");

    static double reference[N_STEPS][N_OUT], through_fmu[N_STEPS][N_OUT], again[N_STEPS][N_OUT];
    static double reference_b[N_STEPS][N_OUT], through_b[N_STEPS][N_OUT];
    run_library(plant, 0, reference);

    /* Life cycle, physics bit for bit. */
    void* a = instantiate("a");
    check(a != NULL, "instantiate");
    double value = 0, t = 0;
    check(get(a, "cell.voltage", &value) == ERROR, "an output cannot be read before initialization");
    check(strstr(last_log, "not allowed in the instantiated state") != NULL, "... and the log says why");
    check(get(a, "in.current_density", &value) == ERROR, "nothing is read before initialization, not even an input");
    check(do_step(a, 0, 1) == ERROR, "doStep before initialization is an error");
    check(set(a, "in.current_density", current_density_at(0)) == OK, "set an input before initialization");
    check(enter_init(a, 0.0) == OK, "enter initialization");
    check(get(a, "cell.voltage", &value) == OK && value > 1.4 && value < 2.5, "outputs are readable in initialization");
    check(get(a, "in.current_density", &value) == OK && value == 20000.0, "an input reads its value in initialization");
    check(exit_init(a) == OK, "exit initialization");
    check(exit_init(a) == ERROR, "exit initialization twice is an error");
    check(run_fmu(a, 0, N_STEPS, &t, through_fmu), "60 steps with a current step and two step sizes");
    check(same(reference, through_fmu, 0, N_STEPS),
          "the FMU's trajectory equals ely_block_reset/ely_block_advance bit for bit");
    check(through_fmu[N_STEPS - 1][1] != through_fmu[0][1], "... and the stack temperature moved");
    if (values)
        for (int k = 0; k < N_STEPS; ++k)
            for (size_t o = 0; o < N_OUT; ++o) fprintf(values, "step %d %s %.17g\n", k, kOutputs[o], through_fmu[k][o]);

    /* Reset runs the same again. */
    check(terminate_instance(a) == OK, "terminate");
    check(do_step(a, t, 1) == ERROR, "doStep after terminate is an error");
    check(get(a, "cell.voltage", &value) == OK && value == through_fmu[N_STEPS - 1][0], "outputs readable after terminate");
    check(reset_instance(a) == OK, "reset");
    t = 0;
    check(start_fmu(a, 0) && run_fmu(a, 0, N_STEPS, &t, again) && same(reference, again, 0, N_STEPS),
          "after reset the run repeats bit for bit");

    /* FMU state mid-run: get, serialize, deserialize, continue identically. */
    void* saved = NULL;
    void* restored = NULL;
    check(reset_instance(a) == OK && start_fmu(a, 0), "reset and start again");
    t = 0;
    run_fmu(a, 0, 30, &t, again);
    check(get_state(a, &saved) == OK && saved != NULL, "get FMU state at t = 30 s");
    size_t size = 0;
    check(state_size(a, saved, &size) == OK && size > 100, "serialized state size");
    unsigned char* bytes = malloc(size);
    check(serialize(a, saved, bytes, size) == OK, "serialize the state");
    double t_saved = t;
    run_fmu(a, 30, N_STEPS, &t, again);
    check(same(reference, again, 30, N_STEPS), "the run goes on as before");
    check(set_state(a, saved) == OK, "set the FMU state back to t = 30 s");
    t = t_saved;
    memset(again, 0, sizeof again);
    check(run_fmu(a, 30, N_STEPS, &t, again) && same(reference, again, 30, N_STEPS),
          "after set state the run continues bit for bit");
    check(deserialize(a, bytes, size, &restored) == OK && restored != NULL, "deserialize the state");
    check(set_state(a, restored) == OK, "set the deserialized state");
    t = t_saved;
    memset(again, 0, sizeof again);
    check(run_fmu(a, 30, N_STEPS, &t, again) && same(reference, again, 30, N_STEPS),
          "after a deserialized state the run continues bit for bit");
    bytes[size / 2] ^= 0x5a;
    void* broken = NULL;
    check(deserialize(a, bytes, size, &broken) == ERROR && broken == NULL, "a changed serialized state is refused");
    check(deserialize(a, bytes, 10, &broken) == ERROR, "a serialized state cut short is refused");
    check(set_state(a, (void*)bytes) == ERROR, "a pointer that is no FMU state is refused");
    free(bytes);
    check(free_state(a, &saved) == OK && saved == NULL, "free the FMU state");
    check(free_state(a, &restored) == OK, "free the deserialized state");

    /* Two instances, different parameters, stepped in turn, do not interfere. */
    run_library(plant, 2.0e6, reference_b);
    void* b = instantiate("b");
    check(b != NULL, "a second instance");
    check(reset_instance(a) == OK && start_fmu(a, 0) && start_fmu(b, 2.0e6), "both initialised, b with its own heat capacity");
    double ta = 0, tb = 0;
    int ok = 1;
    for (int k = 0; k < N_STEPS && ok; ++k) ok = run_fmu(a, k, k + 1, &ta, again) && run_fmu(b, k, k + 1, &tb, through_b);
    check(ok && same(reference, again, 0, N_STEPS), "instance a, stepped in turn with b, equals the library's run");
    check(ok && same(reference_b, through_b, 0, N_STEPS), "instance b equals the library's run with its parameter");
    check(through_b[N_STEPS - 1][1] != again[N_STEPS - 1][1], "... and the two differ");

    /* Direct feedthrough: outputs after setting an input, before the step, without changing the
     * run (the reversible voltage follows the cathode pressure at once). */
    double before = 0, after = 0;
    get(b, "cell.reversible_voltage", &before);
    set(b, "in.pressure_cathode", 2.0e6);
    check(get(b, "cell.reversible_voltage", &after) == OK && after < before,
          "outputs follow inputs set at a communication point");

    /* A steady run equals the steady block: constant inputs for 40 h in 10-minute steps, then a
     * steady solve of the library at the settled stack temperature and operating hours. */
    {
        void* st = instantiate("steady");
        double ts = 0, T = 0, hours = 0, v_fmu = 0, h2_fmu = 0, released = 0, to_coolant = 0, loss = 0;
        int steady_ok = st != NULL && start_fmu(st, 0);
        for (int k = 0; k < 240 && steady_ok; ++k) {
            steady_ok = do_step(st, ts, 600.0) == OK;
            ts += 600.0;
        }
        steady_ok = steady_ok && get(st, "stack.temperature", &T) == OK && get(st, "state.hours_operated", &hours) == OK &&
                    get(st, "cell.voltage", &v_fmu) == OK && get(st, "product.hydrogen", &h2_fmu) == OK &&
                    get(st, "heat.released", &released) == OK && get(st, "heat.to_coolant", &to_coolant) == OK &&
                    get(st, "heat.loss", &loss) == OK;
        check(steady_ok, "40 h at constant inputs");
        if (values)
            fprintf(values,
                    "steady stack.temperature %.17g\nsteady state.hours_operated %.17g\nsteady cell.voltage %.17g\n"
                    "steady product.hydrogen %.17g\nsteady heat.released %.17g\nsteady heat.to_coolant %.17g\n"
                    "steady heat.loss %.17g\n",
                    T, hours, v_fmu, h2_fmu, released, to_coolant, loss);
        ely_block* blk = NULL;
        int32_t i_t, i_h, i_v, i_h2, i_j;
        double v_lib = 0, h2_lib = 0;
        ely_block_create_from_file(plant, &blk);
        ely_block_find(blk, "in.temperature", &i_t);
        ely_block_find(blk, "in.hours_operated", &i_h);
        ely_block_find(blk, "in.current_density", &i_j);
        ely_block_find(blk, "cell.voltage", &i_v);
        ely_block_find(blk, "product.hydrogen", &i_h2);
        ely_block_set(blk, i_t, T);
        ely_block_set(blk, i_h, hours);
        ely_block_set(blk, i_j, current_density_at(0));
        check(ely_block_solve(blk) >= 0 && ely_block_get(blk, i_v, &v_lib) >= 0 && ely_block_get(blk, i_h2, &h2_lib) >= 0,
              "the steady block at the settled temperature");
        printf("# settled at %.6f K after %.3f h: voltage %.12g V (steady block %.12g V), hydrogen %.12g kg/s (%.12g)\n",
               T, hours - 8000, v_fmu, v_lib, h2_fmu, h2_lib);
        check(fabs(v_fmu - v_lib) <= 1e-9 * v_lib, "settled cell voltage equals the steady block's to 1e-9");
        check(fabs(h2_fmu - h2_lib) <= 1e-9 * h2_lib, "settled hydrogen equals the steady block's to 1e-9");
        check(fabs(released - to_coolant - loss) <= 1e-6 * released,
              "settled: heat released = heat to the coolant + heat lost (to 1e-6)");
        ely_block_destroy(blk);
        free_instance(st);
    }

    /* Misuse. */
    unsigned bad_vr = 12345u, vr_voltage = vr_of("cell.voltage");
    for (int i = 0; i < n_vars; ++i)
        if (var_refs[i] == bad_vr) bad_vr = 54321u;
    check(set(a, "cell.voltage", 1.0) == ERROR && strstr(last_log, "is an output") != NULL, "setting an output is refused");
    check(set(a, "param.cells", 10) == ERROR && strstr(last_log, "plant description") != NULL,
          "setting a structural parameter is refused");
    get(a, "in.temperature", &before);
    check(set(a, "in.temperature", -5) == ERROR && get(a, "in.temperature", &after) == OK && after == before,
          "an out-of-range value is refused and changes nothing");
    if (version == 2) {
        double v2[2];
        check(F2(fmi2GetReal)(a, &bad_vr, 1, v2) == fmi2Error, "an unknown value reference is refused");
        check(F2(fmi2GetReal)(a, NULL, 1, v2) == fmi2Error, "NULL value references are refused");
        check(F2(fmi2GetReal)(a, &vr_voltage, 1, NULL) == fmi2Error, "a NULL value array is refused");
        check(F2(fmi2GetInteger)(a, &vr_voltage, 1, (fmi2Integer*)v2) == fmi2Error, "no Integer variables");
        check(F2(fmi2GetDirectionalDerivative)(a, NULL, 0, NULL, 0, NULL, NULL) == fmi2Error,
              "directional derivatives are not provided");
        check(F2(fmi2Instantiate)("me", fmi2ModelExchange, token, resources, &callbacks2, 0, 1) == NULL,
              "Model Exchange is refused");
        check(F2(fmi2Instantiate)("x", fmi2CoSimulation, token, "http://example.invalid/r", &callbacks2, 0, 1) == NULL,
              "a resource location that is not a file URI is refused");
        const fmi2String unknown[] = {"logNoSuchThing"};
        check(F2(fmi2SetDebugLogging)(a, fmi2True, 1, unknown) == fmi2Error, "an unknown log category is refused");
        check(F2(fmi2DoStep)(a, ta + 5, 1, fmi2True) == fmi2Error && strstr(last_log, "is not the FMU's time"),
              "doStep at the wrong communication point is refused");
        check(F2(fmi2DoStep)(a, ta, 0, fmi2True) == fmi2Error, "doStep of zero length is refused");
    } else {
        double v3[2];
        int32_t i3[1];
        check(F3(fmi3GetFloat64)(a, &bad_vr, 1, v3, 1) == fmi3Error, "an unknown value reference is refused");
        check(F3(fmi3GetFloat64)(a, NULL, 1, v3, 1) == fmi3Error, "NULL value references are refused");
        check(F3(fmi3GetFloat64)(a, &vr_voltage, 1, v3, 2) == fmi3Error, "nValues other than nValueReferences is refused");
        unsigned vr_time = 0;
        check(F3(fmi3GetFloat64)(a, &vr_time, 1, v3, 1) == fmi3OK && v3[0] == ta, "time reads the FMU's time");
        check(F3(fmi3GetInt32)(a, &vr_voltage, 1, i3, 1) == fmi3Error, "no Int32 variables");
        check(F3(fmi3EnterEventMode)(a) == fmi3Error && strstr(last_log, "event mode"), "no event mode");
        check(F3(fmi3InstantiateModelExchange)("me", token, resources, false, true, NULL, logger3) == NULL,
              "Model Exchange is refused");
        const fmi3String unknown[] = {"logNoSuchThing"};
        check(F3(fmi3SetDebugLogging)(a, true, 1, unknown) == fmi3Error, "an unknown log category is refused");
        fmi3Boolean e, te, er;
        double lst;
        check(F3(fmi3DoStep)(a, ta + 5, 1, true, &e, &te, &er, &lst) == fmi3Error &&
                  strstr(last_log, "is not the FMU's time"),
              "doStep at the wrong communication point is refused");
        check(F3(fmi3DoStep)(a, ta, 1, true, NULL, &te, &er, &lst) == fmi3Error, "doStep with NULL out-arguments is refused");
    }
    check(instantiate_with("x", "{00000000-0000-0000-0000-000000000000}") == NULL &&
              strstr(last_log, "instantiation token") != NULL,
          "a token of another FMU is refused");
    check(instantiate_with(NULL, token) == NULL, "a NULL instance name is refused");
    check(enter_init(a, 0) == ERROR, "enter initialization in Step Mode is an error");

    /* A step the model refuses: a coolant flow of zero without the temperature control, at full
     * load, for a week: the stack leaves the cell model's range. Discard, the FMU stays where it was. */
    set(a, "param.thermal.temperature_control", 0);
    set(a, "in.coolant_flow", 0);
    set(a, "in.current_density", 25000);
    int s = do_step(a, ta, 7 * 86400.0);
    check(s == DISCARD && last_successful == ta, "a step the model refuses is discarded at its start");
    check(get(a, "stack.temperature", &value) == OK && value == again[N_STEPS - 1][1],
          "... and the FMU is as before the step");
    if (version == 2) {
        fmi2Boolean terminated = fmi2True;
        check(do_step(a, ta, 1) == ERROR && strstr(last_log, "after a discarded step") != NULL,
              "FMI 2: no step after a discarded one (stepFailed)");
        check(F2(fmi2GetBooleanStatus)(a, fmi2Terminated, &terminated) == fmi2OK && terminated == fmi2False,
              "FMI 2: fmi2Terminated status is false");
    } else {
        check(do_step(a, ta, 1) == OK, "FMI 3: Step Mode goes on after a discarded step");
    }

    /* Use after free: refused without a crash. */
    free_instance(a);
    check(get(a, "cell.voltage", &value) == ERROR, "a call on a freed instance is refused");
    free_instance(a); /* a second free does nothing */
    free_instance(b);
    free_instance(NULL);
    check(log_count > 0, "the host's logger was called");

#ifdef _WIN32
    FreeLibrary((HMODULE)lib);
#else
    dlclose(lib);
#endif
    if (values) fclose(values);
    printf("%d failed\n", failures);
    return failures;
}
