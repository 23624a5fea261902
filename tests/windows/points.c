/*
 * 50 operating points through the C interface, printed with 17 significant digits.
 *
 * One source, two builds: on Linux it links libelyblock.so; on Windows (cross-built with
 * mingw-w64, run under Wine) it loads elyblock.dll with LoadLibraryW and finds every entry
 * point with GetProcAddress, as a host program that ships the DLL beside itself would.
 * compare_points.py checks that both print the same statuses and values to 1e-12 relative.
 *
 * Usage: points                      the 50 points on stdout
 *        points --open-file PATH     create a block from PATH (UTF-8 on Linux; on Windows the
 *                                    wide command line, so non-ASCII names survive) and solve it
 *        points --unload-thread      Windows only: a thread hits an error, the DLL is unloaded,
 *                                    then the thread exits (must not hang)
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "elyblock/elyblock.h"

#ifdef _WIN32
#include <windows.h>
#endif

/* The entry points this program uses, with the signatures of the public header. */
struct api {
    int32_t (*abi_version)(void);
    const char* (*version)(void);
    const char* (*last_error)(void);
    int32_t (*block_create)(const char*, ely_block**);
    int32_t (*block_create_from_file)(const char*, ely_block**);
    void (*block_destroy)(ely_block*);
    int32_t (*block_find)(const ely_block*, const char*, int32_t*);
    int32_t (*block_set)(ely_block*, int32_t, double);
    int32_t (*block_get)(const ely_block*, int32_t, double*);
    int32_t (*block_set_spec)(ely_block*, const char*);
    int32_t (*block_solve)(ely_block*);
};

static struct api ely;

#ifdef _WIN32
static HMODULE library;

static void* entry(const char* name) {
    FARPROC p = GetProcAddress(library, name);
    if (!p) {
        fprintf(stderr, "GetProcAddress(%s) failed: error %lu\n", name, (unsigned long)GetLastError());
        exit(2);
    }
    void* q;
    memcpy(&q, &p, sizeof q); /* function pointer to data pointer without a cast warning */
    return q;
}

#define BIND(field, name) memcpy(&ely.field, &(void*){entry(name)}, sizeof ely.field)

static void load_api(void) {
    /* elyblock.dll is looked up beside this program first (the DLL search order). */
    library = LoadLibraryW(L"elyblock.dll");
    if (!library) {
        fprintf(stderr, "LoadLibraryW(elyblock.dll) failed: error %lu\n", (unsigned long)GetLastError());
        exit(2);
    }
    BIND(abi_version, "ely_abi_version");
    BIND(version, "ely_version");
    BIND(last_error, "ely_last_error");
    BIND(block_create, "ely_block_create");
    BIND(block_create_from_file, "ely_block_create_from_file");
    BIND(block_destroy, "ely_block_destroy");
    BIND(block_find, "ely_block_find");
    BIND(block_set, "ely_block_set");
    BIND(block_get, "ely_block_get");
    BIND(block_set_spec, "ely_block_set_spec");
    BIND(block_solve, "ely_block_solve");
}
#else
static void load_api(void) {
    ely.abi_version = ely_abi_version;
    ely.version = ely_version;
    ely.last_error = ely_last_error;
    ely.block_create = ely_block_create;
    ely.block_create_from_file = ely_block_create_from_file;
    ely.block_destroy = ely_block_destroy;
    ely.block_find = ely_block_find;
    ely.block_set = ely_block_set;
    ely.block_get = ely_block_get;
    ely.block_set_spec = ely_block_set_spec;
    ely.block_solve = ely_block_solve;
}
#endif

static int32_t find(const ely_block* b, const char* name) {
    int32_t i = -1;
    if (ely.block_find(b, name, &i) != ELY_OK) {
        fprintf(stderr, "ely_block_find(%s): %s\n", name, ely.last_error());
        exit(1);
    }
    return i;
}

/* Plants: the minimal configuration of each technology (examples/minimal) and a plant with
 * a rectifier, auxiliaries and pressures set (invented numbers, for this test only). */
static const char* const plants[][3] = {
    {"pem", "{\"technology\":\"pem\",\"stack\":{\"cells\":100,\"active_area\":0.1},"
            "\"operating\":{\"spec\":\"current_density\"}}", "20000"},
    {"alkaline", "{\"technology\":\"alkaline\",\"stack\":{\"cells\":100,\"active_area\":0.1},"
                 "\"operating\":{\"spec\":\"current_density\"}}", "6000"},
    {"solid_oxide", "{\"technology\":\"solid_oxide\",\"stack\":{\"cells\":100,\"active_area\":0.1},"
                    "\"operating\":{\"spec\":\"current_density\"}}", "10000"},
    {"brine", "{\"technology\":\"brine\",\"stack\":{\"cells\":100,\"active_area\":0.1},"
              "\"operating\":{\"spec\":\"current_density\"}}", "6000"},
    {"pem_plant", "{\"technology\":\"pem\",\"stack\":{\"cells\":250,\"active_area\":\"2000 cm2\",\"stacks\":4},"
                  "\"plant\":{\"auxiliaries\":{\"fixed\":\"150 kW\",\"proportional\":0.03}},"
                  "\"operating\":{\"spec\":\"current_density\",\"temperature\":\"65 degC\","
                  "\"pressure_cathode\":\"30 bar\",\"pressure_anode\":\"1.5 bar\"}}", "20000"},
};

static const char* const outputs[] = {"cell.voltage",          "cell.current_density", "cell.faraday_efficiency",
                                      "stack.power",           "plant.power",          "product.hydrogen",
                                      "feed.water",            "heat.duty",            "gas.h2_in_o2"};
#define N_OUTPUTS (sizeof outputs / sizeof outputs[0])

/* Per plant (third column: the highest current density used, A/m2, within the cell's limit):
 * five current densities (fractions of it) and five power setpoints (fractions of the power
 * at 80 % of it): 5 plants x 10 = 50 points. */
static const double fractions[5] = {0.15, 0.35, 0.55, 0.75, 0.95};

static void print_point(const ely_block* b, const char* plant, const char* spec, double drive, int32_t status) {
    printf("%s %s %.17g status %d", plant, spec, drive, (int)status);
    for (size_t o = 0; o < N_OUTPUTS; ++o) {
        double v = 0.0;
        if (status >= 0) {
            if (ely.block_get(b, find(b, outputs[o]), &v) != ELY_OK) {
                fprintf(stderr, "ely_block_get(%s): %s\n", outputs[o], ely.last_error());
                exit(1);
            }
            printf(" %s %.17g", outputs[o], v);
        }
    }
    printf("\n");
}

static int run_points(void) {
    int points = 0;
    printf("abi %d version %s\n", (int)ely.abi_version(), ely.version());
    for (size_t p = 0; p < sizeof plants / sizeof plants[0]; ++p) {
        ely_block* b = NULL;
        if (ely.block_create(plants[p][1], &b) != ELY_OK) {
            fprintf(stderr, "%s: %s\n", plants[p][0], ely.last_error());
            return 1;
        }
        const double j_top = atof(plants[p][2]); /* A/m2 */
        const int32_t i_j = find(b, "in.current_density"), i_p = find(b, "in.power");
        double p_ref = 0.0;
        ely.block_set(b, i_j, 0.8 * j_top);
        if (ely.block_solve(b) < 0 || ely.block_get(b, find(b, "stack.power"), &p_ref) != ELY_OK) {
            fprintf(stderr, "%s at the reference point: %s\n", plants[p][0], ely.last_error());
            return 1;
        }
        for (int k = 0; k < 5; ++k) {
            const double j = fractions[k] * j_top;
            if (ely.block_set(b, i_j, j) != ELY_OK) return fprintf(stderr, "set: %s\n", ely.last_error()), 1;
            print_point(b, plants[p][0], "current_density", j, ely.block_solve(b));
            ++points;
        }
        if (ely.block_set_spec(b, "power") != ELY_OK) return fprintf(stderr, "spec: %s\n", ely.last_error()), 1;
        for (int k = 0; k < 5; ++k) {
            const double power = fractions[k] * 1.1 * p_ref;
            if (ely.block_set(b, i_p, power) != ELY_OK) return fprintf(stderr, "set: %s\n", ely.last_error()), 1;
            print_point(b, plants[p][0], "power", power, ely.block_solve(b));
            ++points;
        }
        ely.block_destroy(b);
    }
    printf("points %d\n", points);
    return 0;
}

static int open_file(const char* path_utf8) {
    ely_block* b = NULL;
    int32_t s = ely.block_create_from_file(path_utf8, &b);
    if (s != ELY_OK) {
        fprintf(stderr, "ely_block_create_from_file: status %d: %s\n", (int)s, ely.last_error());
        return 1;
    }
    s = ely.block_solve(b);
    double h2 = 0.0;
    if (s < 0 || ely.block_get(b, find(b, "product.hydrogen"), &h2) != ELY_OK) {
        fprintf(stderr, "solve: %s\n", ely.last_error());
        return 1;
    }
    printf("opened %s: product.hydrogen %.17g\n", path_utf8, h2);
    ely.block_destroy(b);
    return 0;
}

#ifdef _WIN32
static HANDLE go_on;

static DWORD WINAPI failing_thread(LPVOID unused) {
    (void)unused;
    ely_block* b = NULL;
    /* An error writes the thread's last-error message. */
    if (ely.block_create("{ not json", &b) == ELY_OK || ely.last_error()[0] == '\0') return 1;
    WaitForSingleObject(go_on, INFINITE); /* stays alive until the DLL is unloaded */
    return 0;
}

static int unload_with_thread(void) {
    go_on = CreateEventW(NULL, TRUE, FALSE, NULL);
    HANDLE t = CreateThread(NULL, 0, failing_thread, NULL, 0, NULL);
    if (!go_on || !t) return fprintf(stderr, "CreateThread failed\n"), 1;
    Sleep(200);
    if (!FreeLibrary(library)) return fprintf(stderr, "FreeLibrary failed\n"), 1;
    SetEvent(go_on);
    if (WaitForSingleObject(t, 20000) != WAIT_OBJECT_0) return fprintf(stderr, "thread did not exit\n"), 1;
    DWORD code = 1;
    GetExitCodeThread(t, &code);
    printf("thread exited after FreeLibrary with code %lu\n", (unsigned long)code);
    return code == 0 ? 0 : 1;
}
#endif

int main(int argc, char** argv) {
    load_api();
    if (ely.abi_version() != ELY_ABI_VERSION) {
        fprintf(stderr, "ABI %d, header %d\n", (int)ely.abi_version(), ELY_ABI_VERSION);
        return 1;
    }
#ifdef _WIN32
    /* Arguments from the wide command line, converted to UTF-8 (argv is in the ANSI code page). */
    LPWSTR* wargv = CommandLineToArgvW(GetCommandLineW(), &argc);
    char* utf8_argv[4] = {0};
    for (int i = 0; i < argc && i < 4; ++i) {
        int n = WideCharToMultiByte(CP_UTF8, 0, wargv[i], -1, NULL, 0, NULL, NULL);
        utf8_argv[i] = malloc((size_t)n);
        WideCharToMultiByte(CP_UTF8, 0, wargv[i], -1, utf8_argv[i], n, NULL, NULL);
    }
    argv = utf8_argv;
    if (argc == 2 && strcmp(argv[1], "--unload-thread") == 0) return unload_with_thread();
#endif
    if (argc == 3 && strcmp(argv[1], "--open-file") == 0) return open_file(argv[2]);
    if (argc != 1) {
        fprintf(stderr, "usage: points [--open-file PATH | --unload-thread]\n");
        return 2;
    }
    return run_points();
}
