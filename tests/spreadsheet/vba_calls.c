/*
 * The Excel VBA module's calls, made the way VBA makes them, under Wine.
 *
 * Every function the module declares (adapters/spreadsheet/excel/elyblock.bas) is called through a
 * pointer of the type its Declare statement amounts to on 64-bit Windows (vba_declares.h, written
 * from the .bas by check_vba.py): ByVal Long = int32_t, ByVal Double = double, ByVal LongPtr = a
 * 64-bit integer, ByRef T = T*. elyblock.dll is loaded with the module's LoadLibraryW and every
 * function found by name, as VBA binds a Declare; strings cross as the module's Utf8 and FromUtf8
 * do (WideCharToMultiByte, lstrlenA, MultiByteToWideChar through their Declares too).
 *
 *   vba_calls calls PLANT          calls every declared function once and checks its results
 *                                  (PLANT: a plant file, its Windows path)
 *   vba_calls points PLANTS LINUX  the operating points of tests/windows/points.c through the
 *                                  module's Declares (PLANTS: "name<TAB>json" lines; LINUX: points.c's
 *                                  output on Linux, whose plants, specs, drives and outputs are
 *                                  computed again, in its order: one block per plant, a clone of
 *                                  the block created from its text, solved point after point as
 *                                  points.c does, since a power-spec solve starts from the last
 *                                  solution); prints points.c's format for compare_points.py
 *   vba_calls profile PLANT RUN    a profile run as the module's ELYPROFILE and ELYSUMMARY make it
 *                                  (PLANT: a plant file; RUN: the run written by profile_run.py,
 *                                  SI values): ely_block_simulate on a clone of the plant's block,
 *                                  then ely_block_run_summary_json; prints the rows and the
 *                                  summary for profile_run.py compare
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <wchar.h>
#include <windows.h>

#include "elyblock/elyblock.h" /* for the struct layout and status values the module assumes */
#include "vba_declares.h"

static struct vba_api vba;
static int failures = 0;
static int called[VBA_DECLARE_COUNT];

#define CHECK(condition, ...)                                                        \
    do {                                                                             \
        if (!(condition)) {                                                          \
            fprintf(stderr, "FAILED (%s:%d): ", __FILE__, __LINE__);                 \
            fprintf(stderr, __VA_ARGS__);                                            \
            fprintf(stderr, "\n");                                                   \
            ++failures;                                                              \
        }                                                                            \
    } while (0)

static void die(const char* what) {
    fprintf(stderr, "%s (error %lu)\n", what, (unsigned long)GetLastError());
    exit(2);
}

static void mark(const char* name) {
    for (int k = 0; k < VBA_DECLARE_COUNT; ++k)
        if (strcmp(vba_declares[k].name, name) == 0) called[k] = 1;
}
#define CALL(name) (mark(#name), vba.name)

/* Binds the Declares of one library, as VBA does on the first call of each. */
static void bind_declares(HMODULE module, const char* lib) {
    for (int k = 0; k < VBA_DECLARE_COUNT; ++k) {
        if (_stricmp(vba_declares[k].lib, lib) != 0) continue;
        FARPROC p = GetProcAddress(module, vba_declares[k].name);
        if (!p) {
            fprintf(stderr, "GetProcAddress(%s, %s) failed\n", lib, vba_declares[k].name);
            exit(2);
        }
        memcpy((char*)&vba + vba_declares[k].offset, &p, sizeof p);
    }
}

static void load(void) {
    HMODULE kernel = LoadLibraryA("kernel32.dll");
    if (!kernel) die("LoadLibraryA(kernel32.dll)");
    bind_declares(kernel, "kernel32");
    /* The module's EnsureLoaded: LoadLibraryW through its Declare, then the Declares of
     * "elyblock.dll" bind to the module loaded under that name. */
    static const wchar_t dll[] = L"elyblock.dll";
    const intptr_t handle = CALL(LoadLibraryW)((intptr_t)dll);
    if (!handle) die("LoadLibraryW(elyblock.dll) through the module's Declare");
    HMODULE by_name = GetModuleHandleA("elyblock.dll");
    CHECK((intptr_t)by_name == handle, "the DLL loaded is not the one found by name");
    bind_declares(by_name, "elyblock.dll");
}

/* ---- the module's string conversions ---------------------------------------------------------- */
/* Utf8(s): the UTF-8 bytes of a UTF-16 string with a terminating NUL (caller frees). */
static char* utf8(const wchar_t* s) {
    const int32_t length = (int32_t)wcslen(s);
    int32_t n = 0;
    if (length > 0) n = CALL(WideCharToMultiByte)(VBA_CP_UTF8, 0, (intptr_t)s, length, 0, 0, 0, 0);
    char* bytes = calloc((size_t)n + 1, 1);
    if (n > 0) CALL(WideCharToMultiByte)(VBA_CP_UTF8, 0, (intptr_t)s, length, (intptr_t)bytes, n, 0, 0);
    return bytes;
}

/* FromUtf8(p): the UTF-16 text of a NUL-terminated UTF-8 string of the library (caller frees). */
static wchar_t* from_utf8(intptr_t p) {
    const int32_t n = p ? CALL(lstrlenA)(p) : 0;
    const int32_t m = n > 0 ? CALL(MultiByteToWideChar)(VBA_CP_UTF8, 0, p, n, 0, 0) : 0;
    wchar_t* s = calloc((size_t)m + 1, sizeof(wchar_t));
    if (m > 0) CALL(MultiByteToWideChar)(VBA_CP_UTF8, 0, p, n, (intptr_t)s, m);
    return s;
}

/* Narrow copies for messages (ASCII texts only). */
static const char* narrow(const wchar_t* w) {
    static char buffers[4][32768];
    static int next = 0;
    char* out = buffers[next++ % 4];
    size_t k = 0;
    for (; w[k] && k + 1 < sizeof buffers[0]; ++k) out[k] = w[k] < 128 ? (char)w[k] : '?';
    out[k] = '\0';
    return out;
}

static const char* last_error(void) {
    wchar_t* w = from_utf8(CALL(ely_last_error)());
    const char* s = narrow(w);
    free(w);
    return s;
}

static intptr_t create(const wchar_t* json) {
    char* bytes = utf8(json);
    intptr_t block = 0;
    const int32_t s = CALL(ely_block_create)((intptr_t)bytes, &block);
    free(bytes);
    CHECK(s == ELY_OK && block != 0, "ely_block_create: %d %s", (int)s, last_error());
    return block;
}

static int32_t find(intptr_t block, const wchar_t* name) {
    char* bytes = utf8(name);
    int32_t index = -1;
    const int32_t s = CALL(ely_block_find)(block, (intptr_t)bytes, &index);
    CHECK(s == ELY_OK, "ely_block_find(%s): %s", narrow(name), last_error());
    free(bytes);
    return index;
}

/* Buffer protocol of the report calls: the size first, then the text (UTF-16, caller frees). */
typedef int32_t (*text_call)(intptr_t, intptr_t, intptr_t, intptr_t*);
static wchar_t* text_of(text_call call, intptr_t object) {
    intptr_t length = 0;
    CHECK(call(object, 0, 0, &length) == ELY_OK && length > 1, "size of a text: %s", last_error());
    char* buffer = malloc((size_t)length);
    intptr_t small = 0;
    CHECK(call(object, (intptr_t)buffer, 1, &small) == ELY_ERR_BUFFER_TOO_SMALL && small == length,
          "a buffer too small is refused with the size needed");
    CHECK(call(object, (intptr_t)buffer, length, &length) == ELY_OK, "text: %s", last_error());
    wchar_t* text = from_utf8((intptr_t)buffer);
    free(buffer);
    return text;
}

static int close_rel(double a, double b, double tolerance) {
    return fabs(a - b) <= tolerance * fmax(fabs(a), fabs(b));
}

/* ---- calls: every Declare once ------------------------------------------------------------------ */
static int run_calls(const wchar_t* plant_path) {
    /* The struct layout the module reads ely_variable_info with. */
    CHECK(VBA_INFO_SIZE == sizeof(ely_variable_info), "INFO_SIZE %d, sizeof %u", VBA_INFO_SIZE,
          (unsigned)sizeof(ely_variable_info));
    CHECK(VBA_INFO_CAUSALITY == offsetof(ely_variable_info, causality), "INFO_CAUSALITY");
    CHECK(VBA_INFO_NAME == offsetof(ely_variable_info, name), "INFO_NAME");
    CHECK(VBA_INFO_UNIT == offsetof(ely_variable_info, unit), "INFO_UNIT");
    CHECK(VBA_INFO_DESCRIPTION == offsetof(ely_variable_info, description), "INFO_DESCRIPTION");
    CHECK(VBA_INFO_DISPLAY_UNIT == offsetof(ely_variable_info, display_unit), "INFO_DISPLAY_UNIT");
    CHECK(VBA_ELY_ABI_VERSION == ELY_ABI_VERSION, "the module's ABI version");

    CHECK(CALL(ely_abi_version)() == ELY_ABI_VERSION, "ABI version");
    wchar_t* version = from_utf8(CALL(ely_version)());
    unsigned major, minor, patch;
    CHECK(sscanf(narrow(version), "%u.%u.%u", &major, &minor, &patch) == 3, "version '%s'", narrow(version));
    wchar_t* text = from_utf8(CALL(ely_status_text)(ELY_ERR_CONFIG));
    CHECK(wcslen(text) > 5, "status text '%s'", narrow(text));
    free(text);

    /* IAPWS R7-97(2012) Table 35: p_s(300 K) = 0.353658941e-2 MPa. */
    double p = 0.0, reversible = 0.0, thermoneutral = 0.0, m = 0.0, v = 0.0;
    CHECK(CALL(ely_water_saturation_pressure)(300.0, &p) == ELY_OK && close_rel(p, 3536.58941, 1e-8),
          "saturation pressure %.17g", p);
    /* Liquid water split at 25 degC and 1 bar: E_rev about 1.229 V (standard potential, CRC) with the
     * wet-gas correction, E_tn = 1.481 V (HHV, common practice); the arguments arrive in order. */
    CHECK(CALL(ely_water_electrolysis_voltages)(298.15, 1e5, 1e5, &reversible, &thermoneutral) == ELY_OK &&
              fabs(reversible - 1.229) < 0.01 && fabs(thermoneutral - 1.481) < 0.005,
          "voltages %.6g %.6g", reversible, thermoneutral);
    char* formula = utf8(L"H2O");
    /* IUPAC standard atomic weights (conventional): H 1.008, O 15.999 g/mol. */
    CHECK(CALL(ely_molar_mass)((intptr_t)formula, &m) == ELY_OK && close_rel(m, 18.015e-3, 1e-12), "M(H2O) %.17g", m);
    free(formula);
    char* quantity = utf8(L"15 MW");
    char* watt = utf8(L"W");
    CHECK(CALL(ely_parse_quantity)((intptr_t)quantity, (intptr_t)watt, &v) == ELY_OK && v == 15e6, "15 MW: %.17g", v);
    char* from = utf8(L"A/cm2");
    char* to = utf8(L"A/m2");
    CHECK(CALL(ely_convert_unit)(1.5, (intptr_t)from, (intptr_t)to, &v) == ELY_OK && v == 15000.0, "1.5 A/cm2: %.17g", v);
    free(quantity); free(watt); free(from); free(to);

    /* A failed create: the library's message through ely_last_error. */
    char* broken = utf8(L"{ \"technology\": ");
    intptr_t none = 1;
    CHECK(CALL(ely_block_create)((intptr_t)broken, &none) == ELY_ERR_CONFIG && none == 0 && strlen(last_error()) > 0,
          "a broken plant is refused");
    free(broken);

    /* A plant whose name is not ASCII: it comes back unchanged in the report. */
    static const wchar_t name[] = L"Anlage \x00d6kostrom \x96fb\x89e3";
    wchar_t json[512] = L"{\"technology\": \"pem\", \"name\": \"";
    wcscat(json, name);
    wcscat(json, L"\", \"stack\": {\"cells\": 100, \"active_area\": 0.1}, "
                 L"\"cell\": {\"h2_recombination_fraction_anode\": 0.9}, "
                 L"\"operating\": {\"spec\": \"current_density\", \"temperature\": 353.15}}");
    const intptr_t block = create(json);

    int32_t count = 0;
    CHECK(CALL(ely_block_variable_count)(block, &count) == ELY_OK && count > 50, "variable count %d", (int)count);
    /* The module's InfoRead and InfoText: a byte buffer, struct_size first, members by offset. */
    unsigned char info[VBA_INFO_SIZE];
    int found_current_density = 0;
    for (int32_t k = 0; k < count; ++k) {
        memset(info, 0, sizeof info);
        const int32_t size = VBA_INFO_SIZE;
        CALL(RtlMoveMemory)((intptr_t)info, (intptr_t)&size, 4);
        CHECK(CALL(ely_block_variable_info)(block, k, (intptr_t)info) == ELY_OK, "variable info %d", (int)k);
        intptr_t pointer = 0;
        int32_t causality = -1;
        CALL(RtlMoveMemory)((intptr_t)&pointer, (intptr_t)(info + VBA_INFO_NAME), 8);
        CALL(RtlMoveMemory)((intptr_t)&causality, (intptr_t)(info + VBA_INFO_CAUSALITY), 4);
        wchar_t* variable = from_utf8(pointer);
        CALL(RtlMoveMemory)((intptr_t)&pointer, (intptr_t)(info + VBA_INFO_UNIT), 8);
        wchar_t* unit = from_utf8(pointer);
        CALL(RtlMoveMemory)((intptr_t)&pointer, (intptr_t)(info + VBA_INFO_DISPLAY_UNIT), 8);
        wchar_t* display = from_utf8(pointer);
        CALL(RtlMoveMemory)((intptr_t)&pointer, (intptr_t)(info + VBA_INFO_DESCRIPTION), 8);
        wchar_t* description = from_utf8(pointer);
        CHECK(causality >= 0 && causality <= 2 && wcslen(description) > 0, "variable %d", (int)k);
        if (wcscmp(variable, L"in.current_density") == 0) {
            found_current_density = 1;
            CHECK(causality == ELY_CAUSALITY_INPUT && wcscmp(unit, L"A/m2") == 0 && wcscmp(display, L"A/cm2") == 0,
                  "in.current_density: causality %d, unit %s, display unit %s", (int)causality, narrow(unit),
                  narrow(display));
        }
        free(variable); free(unit); free(display); free(description);
    }
    CHECK(found_current_density, "in.current_density not listed");

    const int32_t i_j = find(block, L"in.current_density"), i_p = find(block, L"in.power");
    const int32_t i_v = find(block, L"cell.voltage"), i_h2 = find(block, L"product.hydrogen");
    char* unknown = utf8(L"in.powr");
    int32_t index = 0;
    CHECK(CALL(ely_block_find)(block, (intptr_t)unknown, &index) == ELY_ERR_UNKNOWN_NAME &&
              strstr(last_error(), "in.powr") != NULL, "an unknown name is named");
    free(unknown);
    CHECK(CALL(ely_block_set)(block, i_j, 15000.0) == ELY_OK, "set");
    CHECK(CALL(ely_block_solve)(block) == ELY_OK, "solve: %s", last_error());
    double voltage = 0.0, hydrogen = 0.0, power = 0.0;
    CHECK(CALL(ely_block_get)(block, i_v, &voltage) == ELY_OK && voltage > 1.4 && voltage < 2.5, "voltage %.6g", voltage);
    CHECK(CALL(ely_block_get)(block, find(block, L"stack.power"), &power) == ELY_OK, "power");
    CHECK(CALL(ely_block_get)(block, i_h2, &hydrogen) == ELY_OK, "hydrogen");
    /* Faraday's law: 100 cells x 0.1 m2 x 15000 A/m2 / (2 F) x M(H2) x Faraday efficiency. */
    double efficiency = 0.0;
    CHECK(CALL(ely_block_get)(block, find(block, L"cell.faraday_efficiency"), &efficiency) == ELY_OK, "efficiency");
    CHECK(close_rel(hydrogen, 100 * 0.1 * 15000.0 / (2 * 96485.33212) * 2.016e-3 * efficiency, 1e-9),
          "hydrogen %.17g", hydrogen);

    /* The spec by name, and read back (static storage). */
    char* spec = utf8(L"power");
    CHECK(CALL(ely_block_set_spec)(block, (intptr_t)spec) == ELY_OK, "set_spec");
    free(spec);
    intptr_t spec_text = 0;
    CHECK(CALL(ely_block_get_spec)(block, &spec_text) == ELY_OK, "get_spec");
    wchar_t* spec_name = from_utf8(spec_text);
    CHECK(wcscmp(spec_name, L"power") == 0, "spec '%s'", narrow(spec_name));
    free(spec_name);
    CHECK(CALL(ely_block_set)(block, i_p, power) == ELY_OK && CALL(ely_block_solve)(block) >= 0, "power spec");
    double j = 0.0;
    CHECK(CALL(ely_block_get)(block, find(block, L"cell.current_density"), &j) == ELY_OK && close_rel(j, 15000.0, 1e-9),
          "the power spec finds the current density back: %.17g", j);

    /* The report: the plant's name arrives as it was written, through UTF-8 both ways. */
    wchar_t* report = text_of(vba.ely_block_report_json, block);
    mark("ely_block_report_json");
    CHECK(wcsstr(report, name) != NULL, "the report lacks the plant's name");
    free(report);

    /* A batch, arrays passed ByRef by their first element: a polarization curve. */
    intptr_t copy = 0;
    CHECK(CALL(ely_block_clone)(block, &copy) == ELY_OK && copy != 0, "clone");
    char* back = utf8(L"current_density");
    CHECK(CALL(ely_block_set_spec)(copy, (intptr_t)back) == ELY_OK, "spec back");
    free(back);
    enum { N = 12 };
    double in[N], out[N], again[N];
    int32_t status[N], outputs[1] = {i_v};
    for (int k = 0; k < N; ++k) in[k] = 6000.0 + 1200.0 * k;
    CHECK(CALL(ely_block_solve_batch)(copy, N, 1, (int32_t[]){i_v}, in, 1, outputs, out, status, 0, 0) ==
              ELY_ERR_INVALID_ARGUMENT, "a batch over an output as its input is refused");
    CHECK(CALL(ely_block_solve_batch)(copy, N, 1, (int32_t[]){i_j}, in, 1, outputs, out, status, 0, 0) == ELY_OK,
          "batch: %s", last_error());
    for (int k = 0; k < N; ++k) {
        double single = 0.0;
        CALL(ely_block_set)(copy, i_j, in[k]);
        CHECK(CALL(ely_block_solve)(copy) == ELY_OK && CALL(ely_block_get)(copy, i_v, &single) == ELY_OK &&
                  close_rel(single, out[k], 1e-12), "batch point %d: %.17g vs %.17g", k, out[k], single);
        again[k] = out[k];
    }
    /* The same batch on two threads: the same values (the result does not depend on the thread count). */
    {
        double threaded[N];
        int32_t threaded_status[N];
        CHECK(CALL(ely_block_solve_batch_threads)(copy, N, 1, (int32_t[]){i_j}, in, 1, outputs, threaded,
                                                  threaded_status, 2, 0, 0) == ELY_OK,
              "threaded batch: %s", last_error());
        for (int k = 0; k < N; ++k)
            CHECK(threaded_status[k] == status[k] && close_rel(threaded[k], out[k], 1e-12),
                  "threaded batch point %d: %.17g vs %.17g", k, threaded[k], out[k]);
    }
    /* The same batch as columns (one array per input and output): the same values, bit for bit. */
    {
        double column_out[N];
        int32_t column_status[N];
        intptr_t in_columns[1] = {(intptr_t)in}, out_columns[1] = {(intptr_t)column_out};
        CHECK(CALL(ely_block_solve_batch_columns)(copy, N, 1, (int32_t[]){i_j}, in_columns, 1, outputs, out_columns,
                                                  column_status, 0, 0) == ELY_OK,
              "batch as columns: %s", last_error());
        for (int k = 0; k < N; ++k)
            CHECK(column_status[k] == status[k] && column_out[k] == out[k], "batch as columns point %d: %.17g vs %.17g",
                  k, column_out[k], out[k]);
    }

    /* A fit: the contact resistance recovered from the curve made at its default value. */
    const int32_t i_r = find(copy, L"param.cell.contact_resistance");
    double truth = 0.0;
    CHECK(CALL(ely_block_get)(copy, i_r, &truth) == ELY_OK && truth > 0, "contact resistance");
    CHECK(CALL(ely_block_set)(copy, i_r, 2.0 * truth) == ELY_OK, "set the start value");
    char* free_name = utf8(L"contact_resistance");
    intptr_t names[1] = {(intptr_t)free_name};
    intptr_t fit = 0;
    const int32_t fitted = CALL(ely_block_fit)(copy, N, 1, (int32_t[]){i_j}, in, 1, outputs, again, 0, 1, names, 0, 0,
                                               0, &fit);
    CHECK((fitted == ELY_OK || fitted == ELY_WARNING) && fit != 0, "fit: %d %s", (int)fitted, last_error());
    free(free_name);
    double value = 0.0, error = 0.0;
    CHECK(CALL(ely_fit_parameter)(fit, 0, &value, &error) == ELY_OK && close_rel(value, truth, 1e-6),
          "fitted %.17g, made with %.17g", value, truth);
    /* The data are the model's own: the fit's RMSE is about zero, over all N rows. */
    double rmse = -1.0;
    intptr_t rows = 0;
    CHECK(CALL(ely_fit_rmse)(fit, 0, &rmse, &rows) == ELY_OK && rows == N && rmse >= 0.0 && rmse < 1e-9,
          "fit RMSE %.3g over %d rows", rmse, (int)rows);
    wchar_t* fit_report = text_of(vba.ely_fit_report_json, fit);
    mark("ely_fit_report_json");
    CHECK(wcsstr(fit_report, L"\"parameters\"") != NULL, "fit report");
    wchar_t* fit_plant = text_of(vba.ely_fit_plant_json, fit);
    mark("ely_fit_plant_json");
    CHECK(wcsstr(fit_plant, name) != NULL, "the calibrated plant keeps the name");
    free(fit_report); free(fit_plant);
    CALL(ely_fit_destroy)(fit);
    CALL(ely_block_destroy)(copy);
    CALL(ely_block_destroy)(block);

    /* A plant file by its path (UTF-8 of the wide path), as ELYSOLVE("plant.json", ...) opens it. */
    char* path = utf8(plant_path);
    intptr_t from_file = 0;
    CHECK(CALL(ely_block_create_from_file)((intptr_t)path, &from_file) == ELY_OK && from_file != 0,
          "ely_block_create_from_file(%s): %s", narrow(plant_path), last_error());
    free(path);
    CHECK(CALL(ely_block_solve)(from_file) >= 0, "solve the file's plant: %s", last_error());

    /* The plant in time: a reset, a step, its time; a state saved, the run gone on, the state
     * restored and the same step again gives the same temperature bit for bit. */
    const int32_t i_temperature = find(from_file, L"stack.temperature");
    CHECK(CALL(ely_block_reset)(from_file, 3600.0) >= 0, "reset: %s", last_error());
    CHECK(CALL(ely_block_advance)(from_file, 1800.0) >= 0, "advance: %s", last_error());
    double now = 0.0, t1 = 0.0, t2 = -1.0;
    CHECK(CALL(ely_block_time)(from_file, &now) == ELY_OK && now == 5400.0, "time %.17g", now);
    intptr_t state_length = 0;
    CHECK(CALL(ely_block_save_state)(from_file, 0, 0, &state_length) == ELY_OK && state_length > 0, "state size: %s",
          last_error());
    char* state = malloc((size_t)state_length);
    CHECK(CALL(ely_block_save_state)(from_file, (intptr_t)state, state_length, &state_length) == ELY_OK, "save: %s",
          last_error());
    CHECK(CALL(ely_block_set)(from_file, find(from_file, L"in.current_density"), 8000.0) == ELY_OK, "set");
    CHECK(CALL(ely_block_advance)(from_file, 900.0) >= 0 && CALL(ely_block_get)(from_file, i_temperature, &t1) == ELY_OK,
          "advance after the save: %s", last_error());
    CHECK(CALL(ely_block_restore_state)(from_file, (intptr_t)state, state_length) == ELY_OK, "restore: %s", last_error());
    CHECK(CALL(ely_block_set)(from_file, find(from_file, L"in.current_density"), 8000.0) == ELY_OK, "set");
    CHECK(CALL(ely_block_advance)(from_file, 900.0) >= 0 && CALL(ely_block_get)(from_file, i_temperature, &t2) == ELY_OK &&
              t2 == t1, "the restored run: %.17g, the run saved: %.17g", t2, t1);
    free(state);
    /* A profile in one call, arrays ByRef by their first element; its summary lasts the profile.
     * Row k's outputs are at times[k] with its inputs just applied: the current then ramps, so
     * row 1 still shows the first hour's hydrogen and row 2 the second hour's (Faraday's law: in
     * the ratio of the current densities, within the Faraday efficiency's change). */
    double times[3] = {0.0, 3600.0, 7200.0}, densities[3] = {15000.0, 10000.0, 20000.0}, made[3] = {0, 0, 0};
    int32_t rows_in[1] = {find(from_file, L"in.current_density")}, rows_out[1] = {i_h2}, row_status[3] = {9, 9, 9};
    const int32_t ran = CALL(ely_block_simulate)(from_file, 3, times, 1, rows_in, densities, 1, rows_out, made,
                                                 row_status, 0, 0);
    CHECK(ran >= 0 && ran != ELY_PARTIAL && row_status[2] >= 0 && close_rel(made[1], made[0], 1e-6) &&
              close_rel(made[2], made[0] * 10000.0 / 15000.0, 0.02),
          "simulate: %d %s; hydrogen %.6g %.6g %.6g", (int)ran, last_error(), made[0], made[1], made[2]);
    wchar_t* summary = text_of(vba.ely_block_run_summary_json, from_file);
    mark("ely_block_run_summary_json");
    CHECK(wcsstr(summary, L"\"end_time\":7200,") != NULL && wcsstr(summary, L"\"hydrogen\":{\"value\":") != NULL,
          "run summary %.200s", narrow(summary));
    free(summary);
    CALL(ely_block_destroy)(from_file);

    int used = 0;
    for (int k = 0; k < VBA_DECLARE_COUNT; ++k) {
        used += called[k];
        CHECK(called[k], "%s (Lib \"%s\") was never called", vba_declares[k].name, vba_declares[k].lib);
    }
    printf("%d of the module's %d Declares called with their declared types; %d checks failed\n", used,
           VBA_DECLARE_COUNT, failures);
    free(version);
    return failures ? 1 : 0;
}

/* ---- points: tests/windows' 50, through the Declares ------------------------------------------------ */
#define MAX_PLANTS 16
static struct {
    char name[64];
    wchar_t* json;
    intptr_t block; /* created once, never solved: every point works on a clone */
} plants[MAX_PLANTS];
static int plant_count = 0;

static wchar_t* widen(const char* s) {
    const int n = MultiByteToWideChar(CP_UTF8, 0, s, -1, NULL, 0);
    wchar_t* w = calloc((size_t)n, sizeof(wchar_t));
    MultiByteToWideChar(CP_UTF8, 0, s, -1, w, n);
    return w;
}

static int read_plants(const char* path) {
    FILE* f = fopen(path, "rb");
    static char line[8192];
    if (!f) return 0;
    while (plant_count < MAX_PLANTS && fgets(line, sizeof line, f)) {
        char* tab = strchr(line, '\t');
        if (!tab) continue;
        *tab = '\0';
        tab[1 + strcspn(tab + 1, "\r\n")] = '\0';
        snprintf(plants[plant_count].name, sizeof plants[0].name, "%s", line);
        plants[plant_count].json = widen(tab + 1);
        ++plant_count;
    }
    fclose(f);
    return plant_count;
}

static intptr_t plant_block(const char* name) {
    for (int k = 0; k < plant_count; ++k) {
        if (strcmp(plants[k].name, name) != 0) continue;
        if (!plants[k].block) plants[k].block = create(plants[k].json);
        return plants[k].block;
    }
    fprintf(stderr, "no plant '%s' in the plants file\n", name);
    exit(2);
}

static int run_points(const char* plants_path, const char* linux_path) {
    if (read_plants(plants_path) == 0) return fprintf(stderr, "no plants in %s\n", plants_path), 2;
    FILE* f = fopen(linux_path, "rb");
    if (!f) return fprintf(stderr, "cannot open %s\n", linux_path), 2;
    wchar_t* version = from_utf8(CALL(ely_version)());
    printf("abi %d version %s\n", (int)CALL(ely_abi_version)(), narrow(version));
    free(version);
    static char line[16384];
    int points = 0;
    char current_plant[64] = "", current_spec[64] = "";
    intptr_t work = 0;
    while (fgets(line, sizeof line, f)) {
        if (strncmp(line, "abi ", 4) == 0 || strncmp(line, "points ", 7) == 0) continue;
        char* save = NULL;
        const char* plant = strtok_s(line, " \r\n", &save);
        const char* spec = strtok_s(NULL, " \r\n", &save);
        const char* drive = strtok_s(NULL, " \r\n", &save);
        if (!plant || !spec || !drive) continue;
        strtok_s(NULL, " \r\n", &save); /* "status" */
        strtok_s(NULL, " \r\n", &save); /* the Linux status: this side computes its own */
        if (strcmp(plant, current_plant) != 0) {
            CALL(ely_block_destroy)(work);
            work = 0;
            CHECK(CALL(ely_block_clone)(plant_block(plant), &work) == ELY_OK, "clone: %s", last_error());
            snprintf(current_plant, sizeof current_plant, "%s", plant);
            current_spec[0] = '\0';
        }
        wchar_t* wide;
        if (strcmp(spec, current_spec) != 0) {
            wide = widen(spec);
            char* spec_bytes = utf8(wide);
            CHECK(CALL(ely_block_set_spec)(work, (intptr_t)spec_bytes) == ELY_OK, "spec %s: %s", spec, last_error());
            free(spec_bytes);
            free(wide);
            snprintf(current_spec, sizeof current_spec, "%s", spec);
        }
        char drive_name[128];
        snprintf(drive_name, sizeof drive_name, "in.%s", spec);
        wide = widen(drive_name);
        const double value = strtod(drive, NULL);
        CHECK(CALL(ely_block_set)(work, find(work, wide), value) == ELY_OK, "set %s: %s", drive_name, last_error());
        free(wide);
        const int32_t status = CALL(ely_block_solve)(work);
        printf("%s %s %.17g status %d", plant, spec, value, (int)status);
        const char* output;
        while ((output = strtok_s(NULL, " \r\n", &save)) != NULL) {
            strtok_s(NULL, " \r\n", &save); /* the Linux value */
            if (status < 0) continue;
            wide = widen(output);
            double result = 0.0;
            CHECK(CALL(ely_block_get)(work, find(work, wide), &result) == ELY_OK, "get %s: %s", output, last_error());
            printf(" %s %.17g", output, result);
            free(wide);
        }
        printf("\n");
        ++points;
    }
    CALL(ely_block_destroy)(work);
    fclose(f);
    for (int k = 0; k < plant_count; ++k) CALL(ely_block_destroy)(plants[k].block);
    printf("points %d\n", points);
    return failures ? 1 : 0;
}

/* ---- profile: a run as ELYPROFILE and ELYSUMMARY make it ------------------------------------------- */
static int run_profile(const wchar_t* plant_path, const char* run_path) {
    FILE* f = fopen(run_path, "rb");
    if (!f) return fprintf(stderr, "cannot open %s\n", run_path), 2;
    static char line[65536];
    char spec[64] = "";
    wchar_t* inputs[16];
    wchar_t* outputs[16];
    int n_in = 0, n_out = 0;
    size_t n = 0, capacity = 0;
    double *times = NULL, *values = NULL;
    while (fgets(line, sizeof line, f)) {
        char* save = NULL;
        const char* word = strtok_s(line, " \r\n", &save);
        if (!word) continue;
        if (strcmp(word, "spec") == 0) {
            snprintf(spec, sizeof spec, "%s", strtok_s(NULL, " \r\n", &save));
        } else if (strcmp(word, "inputs") == 0 || strcmp(word, "outputs") == 0) {
            const char* name;
            while ((name = strtok_s(NULL, " \r\n", &save)) != NULL) {
                if (word[0] == 'i' && n_in < 16) inputs[n_in++] = widen(name);
                if (word[0] == 'o' && n_out < 16) outputs[n_out++] = widen(name);
            }
        } else if (strcmp(word, "row") == 0) {
            if (n == capacity) {
                capacity = capacity ? 2 * capacity : 64;
                times = realloc(times, capacity * sizeof *times);
                values = realloc(values, capacity * (size_t)n_in * sizeof *values);
            }
            times[n] = strtod(strtok_s(NULL, " \r\n", &save), NULL);
            for (int i = 0; i < n_in; ++i) values[n * (size_t)n_in + (size_t)i] = strtod(strtok_s(NULL, " \r\n", &save), NULL);
            ++n;
        }
    }
    fclose(f);
    if (n == 0 || n_in == 0 || n_out == 0) return fprintf(stderr, "no rows, inputs or outputs in %s\n", run_path), 2;
    /* The module's PlantBlock (a block per plant file, never run) and CloneWithInputs. */
    char* path = utf8(plant_path);
    intptr_t base = 0, work = 0;
    CHECK(CALL(ely_block_create_from_file)((intptr_t)path, &base) == ELY_OK, "plant: %s", last_error());
    free(path);
    CHECK(CALL(ely_block_clone)(base, &work) == ELY_OK, "clone: %s", last_error());
    if (spec[0]) {
        wchar_t* wide = widen(spec);
        char* bytes = utf8(wide);
        CHECK(CALL(ely_block_set_spec)(work, (intptr_t)bytes) == ELY_OK, "spec %s: %s", spec, last_error());
        free(bytes);
        free(wide);
    }
    int32_t in_index[16], out_index[16];
    for (int i = 0; i < n_in; ++i) in_index[i] = find(work, inputs[i]);
    for (int o = 0; o < n_out; ++o) out_index[o] = find(work, outputs[o]);
    double* out = calloc(n * (size_t)n_out, sizeof *out);
    int32_t* status = calloc(n, sizeof *status);
    const int32_t result = CALL(ely_block_simulate)(work, (intptr_t)n, times, n_in, in_index, values, n_out, out_index,
                                                    out, status, 0, 0);
    printf("status %d\n", (int)result);
    for (size_t k = 0; k < n; ++k) {
        printf("row %u %d", (unsigned)k, (int)status[k]);
        for (int o = 0; o < n_out; ++o) printf(" %.17g", out[k * (size_t)n_out + (size_t)o]);
        printf("\n");
    }
    if (result >= 0) {
        wchar_t* summary = text_of(vba.ely_block_run_summary_json, work);
        printf("summary %s\n", narrow(summary));
        free(summary);
    }
    CALL(ely_block_destroy)(work);
    CALL(ely_block_destroy)(base);
    free(times); free(values); free(out); free(status);
    for (int i = 0; i < n_in; ++i) free(inputs[i]);
    for (int o = 0; o < n_out; ++o) free(outputs[o]);
    return failures ? 1 : 0;
}

int main(void) {
    int argc = 0;
    LPWSTR* wargv = CommandLineToArgvW(GetCommandLineW(), &argc);
    load();
    if (argc == 3 && wcscmp(wargv[1], L"calls") == 0) return run_calls(wargv[2]);
    if (argc == 4 && wcscmp(wargv[1], L"points") == 0) {
        char plants_path[MAX_PATH], linux_path[MAX_PATH];
        WideCharToMultiByte(CP_ACP, 0, wargv[2], -1, plants_path, MAX_PATH, NULL, NULL);
        WideCharToMultiByte(CP_ACP, 0, wargv[3], -1, linux_path, MAX_PATH, NULL, NULL);
        return run_points(plants_path, linux_path);
    }
    if (argc == 4 && wcscmp(wargv[1], L"profile") == 0) {
        char run_path[MAX_PATH];
        WideCharToMultiByte(CP_ACP, 0, wargv[3], -1, run_path, MAX_PATH, NULL, NULL);
        return run_profile(wargv[2], run_path);
    }
    fprintf(stderr, "usage: vba_calls calls PLANT | points PLANTS LINUX_OUTPUT | profile PLANT RUN\n");
    return 2;
}
