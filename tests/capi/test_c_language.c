/* The C interface from C: this file is compiled as C99 (not C++) into the C-interface tests,
 * so it checks what a C host sees: the header in C, every status value pinned to its number,
 * a C progress callback, and the life cycle with the buffer protocol. Each function returns 0
 * when all holds, else the line of the first check that failed (its message in `why`). */
#include <elyblock/elyblock.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "test_c_language.h"

#define CHECK(cond)                                                                         \
    do {                                                                                    \
        if (!(cond)) {                                                                      \
            snprintf(why, why_size, "%s (last error: %s)", #cond, ely_last_error());        \
            return __LINE__;                                                                \
        }                                                                                   \
    } while (0)

/* Frozen values (abidiff cannot see macros): a change here is an ABI break. Checked at compile
 * time too: a wrong value makes an array of negative size. */
#define PIN(name, value) typedef char pin_##name[(name) == (value) ? 1 : -1];
PIN(ELY_OK, 0)
PIN(ELY_WARNING, 1)
PIN(ELY_PARTIAL, 2)
PIN(ELY_ERR_INVALID_ARGUMENT, -1)
PIN(ELY_ERR_OUT_OF_RANGE, -2)
PIN(ELY_ERR_CONFIG, -3)
PIN(ELY_ERR_INFEASIBLE, -4)
PIN(ELY_ERR_NO_CONVERGENCE, -5)
PIN(ELY_ERR_UNKNOWN_NAME, -6)
PIN(ELY_ERR_WRONG_STATE, -7)
PIN(ELY_ERR_IO, -8)
PIN(ELY_ERR_BUFFER_TOO_SMALL, -9)
PIN(ELY_ERR_CANCELLED, -10)
PIN(ELY_ERR_OUT_OF_MEMORY, -11)
PIN(ELY_ERR_INTERNAL, -12)
PIN(ELY_ABI_VERSION, 1)
PIN(ELY_CAUSALITY_INPUT, 0)
PIN(ELY_CAUSALITY_OUTPUT, 1)
PIN(ELY_CAUSALITY_PARAMETER, 2)

int ely_c_test_status_values(char* why, size_t why_size) {
    static const struct {
        int32_t value;
        int32_t expected;
        const char* text;
    } pins[] = {
        {ELY_OK, 0, "ok"},
        {ELY_WARNING, 1, "solved with a warning"},
        {ELY_PARTIAL, 2, "batch finished; some points failed"},
        {ELY_ERR_INVALID_ARGUMENT, -1, "invalid argument"},
        {ELY_ERR_OUT_OF_RANGE, -2, "out of range"},
        {ELY_ERR_CONFIG, -3, "invalid configuration"},
        {ELY_ERR_INFEASIBLE, -4, "infeasible specification"},
        {ELY_ERR_NO_CONVERGENCE, -5, "no convergence"},
        {ELY_ERR_UNKNOWN_NAME, -6, "unknown name"},
        {ELY_ERR_WRONG_STATE, -7, "call in the wrong state"},
        {ELY_ERR_IO, -8, "file error"},
        {ELY_ERR_BUFFER_TOO_SMALL, -9, "buffer too small"},
        {ELY_ERR_CANCELLED, -10, "cancelled"},
        {ELY_ERR_OUT_OF_MEMORY, -11, "out of memory"},
        {ELY_ERR_INTERNAL, -12, "internal error"},
    };
    size_t i;
    for (i = 0; i < sizeof pins / sizeof pins[0]; ++i) {
        CHECK(pins[i].value == pins[i].expected);
        CHECK(strcmp(ely_status_text(pins[i].value), pins[i].text) == 0);
    }
    CHECK(strcmp(ely_status_text(3), "unknown status") == 0);
    CHECK(strcmp(ely_status_text(-13), "unknown status") == 0);
    CHECK(ely_abi_version() == ELY_ABI_VERSION);
    return 0;
}

struct progress_log {
    size_t calls, last_done, last_total;
};

static int32_t count_progress(size_t done, size_t total, void* user) {
    struct progress_log* log = (struct progress_log*)user;
    ++log->calls;
    log->last_done = done;
    log->last_total = total;
    return 0;
}

int ely_c_test_life_cycle(const char* config_json, char* why, size_t why_size) {
    ely_block* b = NULL;
    ely_block* c = NULL;
    int32_t i_j = -1, i_v = -1, i_h2 = -1, i_i = -1, count = 0;
    double v = 0, h2 = 0, current = 0;
    size_t needed = 0, length = 0;
    char* text = NULL;
    char small[8];
    int32_t in_idx[1], out_idx[2], st[3];
    double in[3] = {5000.0, 10000.0, 15000.0}, out[6];
    struct progress_log log = {0, 0, 0};
    ely_variable_info info;

    CHECK(ely_block_create(NULL, &b) == ELY_ERR_INVALID_ARGUMENT && b == NULL);
    CHECK(ely_block_create(config_json, &b) == ELY_OK && b != NULL);
    CHECK(strcmp(ely_last_error(), "") == 0);
    CHECK(ely_block_variable_count(b, &count) == ELY_OK && count > 20);
    memset(&info, 0, sizeof info);
    info.struct_size = (uint32_t)sizeof info;
    CHECK(ely_block_variable_info(b, 0, &info) == ELY_OK && info.name != NULL && info.unit != NULL);
    CHECK(ely_block_find(b, "in.current_density", &i_j) == ELY_OK);
    CHECK(ely_block_find(b, "cell.voltage", &i_v) == ELY_OK);
    CHECK(ely_block_find(b, "product.hydrogen", &i_h2) == ELY_OK);
    CHECK(ely_block_find(b, "stack.current", &i_i) == ELY_OK);
    CHECK(ely_block_find(b, "no.such.variable", &i_i) == ELY_ERR_UNKNOWN_NAME);
    CHECK(ely_block_find(b, "stack.current", &i_i) == ELY_OK);
    CHECK(ely_block_get(b, i_v, &v) == ELY_ERR_WRONG_STATE); /* not solved yet */

    CHECK(ely_block_set(b, i_j, 12000.0) == ELY_OK);
    CHECK(ely_block_solve(b) >= 0);
    CHECK(ely_block_get(b, i_v, &v) == ELY_OK && v > 1.4 && v < 2.5); /* a PEM cell at 1.2 A/cm2 */
    CHECK(ely_block_get(b, i_h2, &h2) == ELY_OK && h2 > 0);
    CHECK(ely_block_get(b, i_i, &current) == ELY_OK);
    /* Faraday's law bounds the hydrogen: at most I·N·M/(2F) (100 cells; CODATA 2018 F,
     * M(H2) = 2.01588 g/mol from IUPAC atomic weights), and more than 95 % of it at 1.2 A/cm2. */
    CHECK(h2 <= current * 100 * 2.01588e-3 / (2 * 96485.33212) * (1 + 1e-12));
    CHECK(h2 > 0.95 * current * 100 * 2.01588e-3 / (2 * 96485.33212));

    /* Buffer protocol of the report. */
    CHECK(ely_block_report_json(b, NULL, 0, &needed) == ELY_OK && needed > 100);
    CHECK(ely_block_report_json(b, small, sizeof small, &length) == ELY_ERR_BUFFER_TOO_SMALL && length == needed);
    text = (char*)malloc(needed);
    CHECK(text != NULL);
    CHECK(ely_block_report_json(b, text, needed, &length) == ELY_OK && strlen(text) + 1 == needed);
    CHECK(strstr(text, "\"cell.voltage\"") != NULL);
    free(text);

    /* A batch with a progress callback written in C. */
    in_idx[0] = i_j;
    out_idx[0] = i_v;
    out_idx[1] = i_h2;
    CHECK(ely_block_solve_batch(b, 3, 1, in_idx, in, 2, out_idx, out, st, count_progress, &log) >= 0);
    CHECK(log.calls == 1 && log.last_done == 3 && log.last_total == 3);
    CHECK(st[0] >= 0 && st[1] >= 0 && st[2] >= 0);
    CHECK(out[0] < out[2] && out[2] < out[4]); /* the voltage rises with the current density */
    CHECK(ely_block_solve_batch(b, 0, 1, NULL, NULL, 0, NULL, NULL, NULL, NULL, NULL) == ELY_ERR_INVALID_ARGUMENT);

    /* A clone, then the original goes first. */
    CHECK(ely_block_clone(b, &c) == ELY_OK && c != NULL);
    ely_block_destroy(b);
    b = NULL;
    CHECK(ely_block_get(c, i_v, &h2) == ELY_OK && h2 == v);
    CHECK(ely_block_set(c, i_v, 1.0) == ELY_ERR_INVALID_ARGUMENT); /* an output */
    CHECK(ely_block_set(c, i_j, NAN) == ELY_ERR_INVALID_ARGUMENT);
    CHECK(strstr(ely_last_error(), "in.current_density") != NULL);
    ely_block_destroy(c);
    ely_block_destroy(NULL);
    return 0;
}

/* ely_parse_quantity: the plant description's quantities from C. Exact values by the unit
 * definitions (SI Brochure, 9th ed.: 1 bar = 1e5 Pa, t/degC = T/K - 273.15; prefixes). */
int ely_c_test_parse_quantity(char* why, size_t why_size) {
    double v = 0;
    CHECK(ely_parse_quantity("2 A/cm2", "A/m2", &v) == ELY_OK && v == 2e4);
    CHECK(ely_parse_quantity("30 bar", "Pa", &v) == ELY_OK && v == 3e6);
    CHECK(ely_parse_quantity(" 1.5 MW ", "kW", &v) == ELY_OK && v == 1500);
    CHECK(ely_parse_quantity("25 %", "1", &v) == ELY_OK && v == 0.25);
    CHECK(ely_parse_quantity("42", "K", &v) == ELY_OK && v == 42);            /* bare: already in K */
    CHECK(ely_parse_quantity("80 degC", "K", &v) == ELY_OK && fabs(v - 353.15) < 1e-12);
    CHECK(ely_parse_quantity("2 d", "h", &v) == ELY_OK && v == 48);
    CHECK(strcmp(ely_last_error(), "") == 0);

    /* Failures write nothing and name the problem. */
    v = -7;
    CHECK(ely_parse_quantity("80 C", "K", &v) == ELY_ERR_INVALID_ARGUMENT && v == -7);
    CHECK(strstr(ely_last_error(), "did you mean degC?") != NULL);
    CHECK(ely_parse_quantity("1 bar", "K", &v) == ELY_ERR_INVALID_ARGUMENT && v == -7);
    CHECK(strstr(ely_last_error(), "expected a quantity in K, got 'bar'") != NULL);
    CHECK(ely_parse_quantity("3 furlongs", "m", &v) == ELY_ERR_INVALID_ARGUMENT && v == -7);
    CHECK(strstr(ely_last_error(), "unit 'furlongs' is not known") != NULL);
    CHECK(ely_parse_quantity("nan K", "K", &v) == ELY_ERR_INVALID_ARGUMENT && v == -7);
    CHECK(ely_parse_quantity("", "K", &v) == ELY_ERR_INVALID_ARGUMENT && v == -7);
    CHECK(ely_parse_quantity("80 degC", "degC", &v) == ELY_ERR_INVALID_ARGUMENT && v == -7);
    CHECK(strstr(ely_last_error(), "has an offset") != NULL);
    CHECK(ely_parse_quantity(NULL, "K", &v) == ELY_ERR_INVALID_ARGUMENT && v == -7);
    CHECK(ely_parse_quantity("1 K", NULL, &v) == ELY_ERR_INVALID_ARGUMENT && v == -7);
    CHECK(ely_parse_quantity("1 K", "K", NULL) == ELY_ERR_INVALID_ARGUMENT);
    return 0;
}

/* ely_parse_quantity (text with its unit) and ely_convert_unit (a number and its unit apart)
 * are one conversion: the same double for every quantity, and the same refusal. Values in the
 * target unit by the unit definitions (SI Brochure, 9th ed.; 1 atm = 101325 Pa, NIST SP 811). */
int ely_c_test_units_agree(char* why, size_t why_size) {
    static const struct {
        double number;
        const char* unit;
        const char* si;
        double expected;
    } cases[] = {
        {2.0, "A/cm2", "A/m2", 2e4},         {1.5, "MW", "W", 1.5e6},          {30.0, "bar", "Pa", 3e6},
        {1.0, "atm", "kPa", 101.325},        {80.0, "degC", "K", 353.15},      {0.15, "ohm cm2", "ohm m2", 1.5e-5},
        {25.0, "%", "1", 0.25},              {50.0, "kWh/kg", "J/kg", 1.8e8},  {-40.0, "degC", "K", 233.15},
        {3.0, "mol/s", "mol/h", 10800.0},    {12.5, "kg/h", "kg/s", 12.5 / 3600.0},
    };
    char text[64];
    size_t k;
    double by_text = 0, by_number = 0, back = 0;
    for (k = 0; k < sizeof cases / sizeof cases[0]; ++k) {
        snprintf(text, sizeof text, "%.17g %s", cases[k].number, cases[k].unit);
        CHECK(ely_parse_quantity(text, cases[k].si, &by_text) == ELY_OK);
        CHECK(ely_convert_unit(cases[k].number, cases[k].unit, cases[k].si, &by_number) == ELY_OK);
        CHECK(by_text == by_number);
        CHECK(fabs(by_text - cases[k].expected) <= 1e-15 * fabs(cases[k].expected));
        /* and back into the unit it came in, degC included */
        CHECK(ely_convert_unit(by_number, cases[k].si, cases[k].unit, &back) == ELY_OK);
        CHECK(fabs(back - cases[k].number) <= 1e-13 * fabs(cases[k].number));
    }
    CHECK(ely_convert_unit(25.0, "degC", "degC", &back) == ELY_OK && back == 25.0); /* offsets cancel exactly */
    CHECK(ely_parse_quantity("1 bar", "K", &by_text) == ELY_ERR_INVALID_ARGUMENT);
    CHECK(strstr(ely_last_error(), "expected a quantity in K, got 'bar'") != NULL);
    CHECK(ely_convert_unit(1.0, "bar", "K", &by_number) == ELY_ERR_INVALID_ARGUMENT);
    CHECK(strstr(ely_last_error(), "expected a quantity in K, got 'bar'") != NULL);
    CHECK(ely_convert_unit(1e300, "GW", "W", &by_number) == ELY_ERR_INVALID_ARGUMENT);
    CHECK(strstr(ely_last_error(), "out of range") != NULL);
    return 0;
}

/* A batch after a failed point keeps what was set on the block before the batch: the inputs,
 * a tunable parameter and the spec set since the block's last solve (or, here, with no solve
 * at all). Point 0 asks for an impossible current density and fails; point 1 must be solved at
 * the block's state at the start of the batch, which a separate solve of a clone at the same
 * inputs gives (the current-density spec is solved directly: the same bits). */
int ely_c_test_batch_after_a_failed_point(const char* config_json, char* why, size_t why_size) {
    ely_block* b = NULL;
    ely_block* c = NULL;
    int32_t i_j = -1, i_t = -1, i_r = -1, i_v = -1, i_p = -1, i_power = -1, st[2] = {0, 0};
    int32_t out_idx[4];
    double in[2] = {1.0e6, 1.0e4}, out[8], v = 0, r0 = 0; /* 100 A/cm2: beyond any cell's limit */
    double power_in[2] = {1.0e12, 4.0e5};

    CHECK(ely_block_create(config_json, &b) == ELY_OK);
    CHECK(ely_block_find(b, "in.current_density", &i_j) == ELY_OK);
    CHECK(ely_block_find(b, "in.temperature", &i_t) == ELY_OK);
    CHECK(ely_block_find(b, "param.cell.contact_resistance", &i_r) == ELY_OK);
    CHECK(ely_block_find(b, "cell.voltage", &i_v) == ELY_OK);
    CHECK(ely_block_find(b, "stack.power", &i_p) == ELY_OK);
    CHECK(ely_block_find(b, "in.power", &i_power) == ELY_OK);
    CHECK(ely_block_get(b, i_r, &r0) == ELY_OK && r0 > 0);
    CHECK(ely_block_set(b, i_t, 352.0) == ELY_OK);        /* never solved at it */
    CHECK(ely_block_set(b, i_r, 2.0 * r0) == ELY_OK);

    out_idx[0] = i_t;
    out_idx[1] = i_r;
    out_idx[2] = i_v;
    out_idx[3] = i_p;
    CHECK(ely_block_solve_batch(b, 2, 1, &i_j, in, 4, out_idx, out, st, NULL, NULL) == ELY_PARTIAL);
    CHECK(st[0] < 0 && st[1] >= 0);
    CHECK(isnan(out[0]) && isnan(out[2]));
    CHECK(out[4] == 352.0);    /* the input set before the batch */
    CHECK(out[5] == 2.0 * r0); /* the parameter set before the batch */
    CHECK(ely_block_clone(b, &c) == ELY_OK);
    CHECK(ely_block_set(c, i_j, 1.0e4) == ELY_OK && ely_block_solve(c) >= 0);
    CHECK(ely_block_get(c, i_v, &v) == ELY_OK && out[6] == v);
    ely_block_destroy(c);
    c = NULL;
    /* The block itself is unchanged: still its inputs, still unsolved. */
    CHECK(ely_block_get(b, i_t, &v) == ELY_OK && v == 352.0);
    CHECK(ely_block_get(b, i_v, &v) == ELY_ERR_WRONG_STATE);

    /* The spec set on the block since its last solve: a power setpoint far beyond the plant
     * fails, the next point is solved at the power spec (DC power equal to its setpoint). */
    CHECK(ely_block_set(b, i_j, 1.0e4) == ELY_OK && ely_block_solve(b) >= 0);
    CHECK(ely_block_set_spec(b, "power") == ELY_OK);
    CHECK(ely_block_solve_batch(b, 2, 1, &i_power, power_in, 4, out_idx, out, st, NULL, NULL) == ELY_PARTIAL);
    CHECK(st[0] < 0 && st[1] >= 0);
    CHECK(fabs(out[7] / 4.0e5 - 1.0) < 1e-9);
    ely_block_destroy(b);
    return 0;
}
