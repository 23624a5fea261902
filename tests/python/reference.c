/*
 * The reference for the Python tests: drives the public C interface directly, so that every
 * number the elyblock package returns can be compared with what C gets for the same calls.
 *
 * Reads commands from stdin, one per line, and answers each on stdout. Numbers travel as C99
 * hexadecimal floats (printf %a, strtod; Python float.hex/fromhex), so nothing is rounded.
 *
 *   create PATH                 -> "status S"           (replaces the current block)
 *   spec NAME                   -> "status S"
 *   set NAME VALUE              -> "status S"
 *   solve                       -> "status S"
 *   get NAME                    -> "status S VALUE"
 *   report                      -> "status S LENGTH", then the JSON report on one line
 *   variables                   -> "status S COUNT", then per variable one line of tab-separated
 *                               fields: name, unit, causality, description, and with the second
 *                               version of ely_variable_info: variability, flags, min, max, start,
 *                               nominal, label, display unit, display scale, display offset,
 *                               summary group, summary rank, config key
 *   water T                     -> "status S PSAT" (ely_water_saturation_pressure)
 *   voltages T PA PC            -> "status S REVERSIBLE THERMONEUTRAL" (ely_water_electrolysis_voltages)
 *   batch NPOINTS NIN NOUT      followed by a line of NIN input names, a line of NOUT output
 *                               names and NPOINTS lines of NIN values
 *                               -> "status S", then NPOINTS lines "POINT_STATUS V1 ... VNOUT"
 *   fit NPOINTS NIN NMEAS NFREE followed by a line of NIN input names, a line of NMEAS measured
 *                               names, a line of NFREE free parameter names, a line of NFREE lower and
 *                               NFREE upper bounds (nan: the variable's limit) and NPOINTS lines of
 *                               NIN inputs, NMEAS measured values and NMEAS weights
 *                               -> "status S", then NFREE lines "VALUE STANDARD_ERROR", then the
 *                               report and the calibrated plant, each as "LENGTH" and the JSON
 *                               on one line (its line breaks turned into spaces)
 *   reset T                     -> "status S"           (ely_block_reset)
 *   advance DT                  -> "status S"           (ely_block_advance)
 *   time                        -> "status S TIME"      (ely_block_time)
 *   save                        -> "status S LENGTH", then the state's bytes in hexadecimal on one line
 *   restore LENGTH              followed by a line of the state's bytes in hexadecimal -> "status S"
 *   simulate NROWS NIN NOUT     followed by a line of NIN input names, a line of NOUT output
 *                               names and NROWS lines "TIME V1 ... VNIN" (ely_block_simulate)
 *                               -> "status S", then NROWS lines "ROW_STATUS V1 ... VNOUT"
 *   summary                     -> "status S LENGTH", then the run summary's JSON on one line
 *   quit
 *
 * A failed call answers "status S" followed by the library's message on the same line.
 */
#define _POSIX_C_SOURCE 200809L /* strtok_r */
#include <elyblock/elyblock.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

enum { LINE = 65536 };

static ely_block* block = NULL;

static void answer(int32_t status) {
    if (status < 0)
        printf("status %d %s\n", (int)status, ely_last_error());
    else
        printf("status %d\n", (int)status);
}

static int32_t find(const char* name, int32_t* index) {
    if (!block) return ELY_ERR_WRONG_STATE;
    return ely_block_find(block, name, index);
}

static int read_line(char* line) {
    return fgets(line, LINE, stdin) != NULL;
}

static int32_t find_names(char* line, int32_t n, int32_t* indices) {
    char* save = NULL;
    char* token = strtok_r(line, " \t\r\n", &save);
    for (int32_t i = 0; i < n; ++i) {
        if (!token) return ELY_ERR_INVALID_ARGUMENT;
        const int32_t s = find(token, &indices[i]);
        if (s < 0) return s;
        token = strtok_r(NULL, " \t\r\n", &save);
    }
    return ELY_OK;
}

static void batch(size_t n_points, int32_t n_in, int32_t n_out) {
    static char names[LINE];
    int32_t* in_idx = calloc((size_t)n_in + 1, sizeof(int32_t));
    int32_t* out_idx = calloc((size_t)n_out + 1, sizeof(int32_t));
    double* in = calloc(n_points * (size_t)n_in + 1, sizeof(double));
    double* out = calloc(n_points * (size_t)n_out + 1, sizeof(double));
    int32_t* st = calloc(n_points + 1, sizeof(int32_t));
    int32_t status = ELY_OK;
    if (!read_line(names)) status = ELY_ERR_INVALID_ARGUMENT;
    if (status == ELY_OK) status = find_names(names, n_in, in_idx);
    if (!read_line(names) && status == ELY_OK) status = ELY_ERR_INVALID_ARGUMENT;
    if (status == ELY_OK) status = find_names(names, n_out, out_idx);
    for (size_t k = 0; k < n_points; ++k) {
        static char row[LINE];
        if (!read_line(row)) { status = ELY_ERR_INVALID_ARGUMENT; break; }
        char* cursor = row;
        for (int32_t i = 0; i < n_in; ++i) in[k * (size_t)n_in + (size_t)i] = strtod(cursor, &cursor);
    }
    if (status == ELY_OK)
        status = ely_block_solve_batch(block, n_points, n_in, in_idx, in, n_out, out_idx, out, st, NULL, NULL);
    answer(status);
    if (status >= 0 || status == ELY_ERR_CANCELLED) {
        for (size_t k = 0; k < n_points; ++k) {
            printf("%d", (int)st[k]);
            for (int32_t o = 0; o < n_out; ++o) printf(" %a", out[k * (size_t)n_out + (size_t)o]);
            printf("\n");
        }
    }
    free(in_idx); free(out_idx); free(in); free(out); free(st);
}

/* JSON text on one line: its line breaks are white space between tokens (JSON escapes those
 * inside strings). */
static void print_one_line(const char* text) {
    printf("%zu\n", strlen(text) + 1);
    for (const char* c = text; *c; ++c) putchar(*c == '\n' ? ' ' : *c);
    putchar('\n');
}

static void print_fit_text(int32_t (*call)(const ely_fit*, char*, size_t, size_t*), const ely_fit* fit) {
    size_t length = 0;
    char* text = NULL;
    if (call(fit, NULL, 0, &length) < 0 || !(text = malloc(length)) || call(fit, text, length, &length) < 0) {
        printf("0\n\n");
    } else {
        print_one_line(text);
    }
    free(text);
}

static void fit(size_t n_points, int32_t n_in, int32_t n_meas, int32_t n_free) {
    static char line[LINE];
    int32_t* in_idx = calloc((size_t)n_in + 1, sizeof(int32_t));
    int32_t* meas_idx = calloc((size_t)n_meas + 1, sizeof(int32_t));
    double* in = calloc(n_points * (size_t)n_in + 1, sizeof(double));
    double* meas = calloc(n_points * (size_t)n_meas + 1, sizeof(double));
    double* weights = calloc(n_points * (size_t)n_meas + 1, sizeof(double));
    double* bounds = calloc(2 * (size_t)n_free + 1, sizeof(double));
    char** names = calloc((size_t)n_free + 1, sizeof(char*));
    ely_fit* result = NULL;
    ely_fit_options options;
    int32_t status = ELY_OK;
    if (!read_line(line)) status = ELY_ERR_INVALID_ARGUMENT;
    if (status == ELY_OK) status = find_names(line, n_in, in_idx);
    if (status == ELY_OK && !read_line(line)) status = ELY_ERR_INVALID_ARGUMENT;
    if (status == ELY_OK) status = find_names(line, n_meas, meas_idx);
    if (status == ELY_OK && !read_line(line)) status = ELY_ERR_INVALID_ARGUMENT;
    if (status == ELY_OK) {
        char* save = NULL;
        char* token = strtok_r(line, " \t\r\n", &save);
        for (int32_t f = 0; f < n_free && token; ++f, token = strtok_r(NULL, " \t\r\n", &save)) names[f] = strdup(token);
    }
    if (status == ELY_OK && read_line(line)) {
        char* cursor = line;
        for (int32_t f = 0; f < 2 * n_free; ++f) bounds[f] = strtod(cursor, &cursor);
    }
    for (size_t k = 0; k < n_points && status == ELY_OK; ++k) {
        if (!read_line(line)) { status = ELY_ERR_INVALID_ARGUMENT; break; }
        char* cursor = line;
        for (int32_t i = 0; i < n_in; ++i) in[k * (size_t)n_in + (size_t)i] = strtod(cursor, &cursor);
        for (int32_t o = 0; o < n_meas; ++o) meas[k * (size_t)n_meas + (size_t)o] = strtod(cursor, &cursor);
        for (int32_t o = 0; o < n_meas; ++o) weights[k * (size_t)n_meas + (size_t)o] = strtod(cursor, &cursor);
    }
    memset(&options, 0, sizeof options);
    options.struct_size = (uint32_t)sizeof options;
    options.lower = bounds;
    options.upper = bounds + n_free;
    if (status == ELY_OK)
        status = ely_block_fit(block, n_points, n_in, in_idx, in, n_meas, meas_idx, meas, weights, n_free,
                               (const char* const*)names, &options, NULL, NULL, &result);
    answer(status);
    if (status >= 0) {
        for (int32_t f = 0; f < n_free; ++f) {
            double value = 0.0, standard_error = 0.0;
            ely_fit_parameter(result, f, &value, &standard_error);
            printf("%a %a\n", value, standard_error);
        }
        print_fit_text(ely_fit_report_json, result);
        print_fit_text(ely_fit_plant_json, result);
    }
    ely_fit_destroy(result);
    for (int32_t f = 0; f < n_free; ++f) free(names[f]);
    free(names); free(bounds); free(weights); free(meas); free(in); free(meas_idx); free(in_idx);
}

/* A block's JSON text (ely_block_report_json, ely_block_run_summary_json): "status S LENGTH", then the text. */
static void block_text(int32_t (*call)(const ely_block*, char*, size_t, size_t*)) {
    size_t length = 0;
    int32_t s = block ? call(block, NULL, 0, &length) : ELY_ERR_WRONG_STATE;
    char* text = s >= 0 ? malloc(length) : NULL;
    if (s >= 0) s = call(block, text, length, &length);
    if (s < 0) answer(s);
    else printf("status %d %zu\n%s\n", (int)s, length, text);
    free(text);
}

static void simulate(size_t n_rows, int32_t n_in, int32_t n_out) {
    static char names[LINE];
    int32_t* in_idx = calloc((size_t)n_in + 1, sizeof(int32_t));
    int32_t* out_idx = calloc((size_t)n_out + 1, sizeof(int32_t));
    double* times = calloc(n_rows + 1, sizeof(double));
    double* in = calloc(n_rows * (size_t)n_in + 1, sizeof(double));
    double* out = calloc(n_rows * (size_t)n_out + 1, sizeof(double));
    int32_t* st = calloc(n_rows + 1, sizeof(int32_t));
    int32_t s = ELY_OK;
    if (!read_line(names) || (s = find_names(names, n_in, in_idx)) < 0) goto done;
    if (!read_line(names) || (s = find_names(names, n_out, out_idx)) < 0) goto done;
    for (size_t k = 0; k < n_rows; ++k) {
        static char row[LINE];
        if (!read_line(row)) { s = ELY_ERR_INVALID_ARGUMENT; goto done; }
        char* save = NULL;
        char* token = strtok_r(row, " \t\r\n", &save);
        for (int32_t i = -1; i < n_in; ++i) {
            const double v = token ? strtod(token, NULL) : 0.0;
            if (i < 0) times[k] = v;
            else in[k * (size_t)n_in + (size_t)i] = v;
            token = strtok_r(NULL, " \t\r\n", &save);
        }
    }
    s = ely_block_simulate(block, n_rows, times, n_in, in_idx, in, n_out, out_idx, out, st, NULL, NULL);
    answer(s);
    for (size_t k = 0; k < n_rows; ++k) {
        printf("%d", (int)st[k]);
        for (int32_t o = 0; o < n_out; ++o) printf(" %a", out[k * (size_t)n_out + (size_t)o]);
        printf("\n");
    }
    goto freed;
done:
    answer(s);
    for (size_t k = 0; k < n_rows; ++k) printf("%d\n", (int)s);
freed:
    free(in_idx);
    free(out_idx);
    free(times);
    free(in);
    free(out);
    free(st);
}

static void save_state(void) {
    size_t length = 0;
    int32_t s = block ? ely_block_save_state(block, NULL, 0, &length) : ELY_ERR_WRONG_STATE;
    unsigned char* bytes = s >= 0 ? malloc(length + 1) : NULL;
    if (s >= 0) s = ely_block_save_state(block, bytes, length, &length);
    if (s < 0) {
        answer(s);
    } else {
        printf("status %d %zu\n", (int)s, length);
        for (size_t k = 0; k < length; ++k) printf("%02x", bytes[k]);
        printf("\n");
    }
    free(bytes);
}

static void restore_state(size_t length) {
    static char hex[LINE * 4];
    unsigned char* bytes = malloc(length + 1);
    int32_t s = ELY_ERR_INVALID_ARGUMENT;
    if (fgets(hex, sizeof hex, stdin) && strlen(hex) >= 2 * length) {
        for (size_t k = 0; k < length; ++k) {
            unsigned int b = 0;
            sscanf(hex + 2 * k, "%2x", &b);
            bytes[k] = (unsigned char)b;
        }
        s = block ? ely_block_restore_state(block, bytes, length) : ELY_ERR_WRONG_STATE;
    }
    answer(s);
    free(bytes);
}

static const char* text_of(const char* s) { return s ? s : "(null)"; }

static void variables(void) {
    int32_t count = 0;
    int32_t s = block ? ely_block_variable_count(block, &count) : ELY_ERR_WRONG_STATE;
    if (s < 0) { answer(s); return; }
    printf("status %d %d\n", (int)s, (int)count);
    for (int32_t i = 0; i < count; ++i) {
        ely_variable_info info;
        memset(&info, 0, sizeof info);
        info.struct_size = (uint32_t)sizeof info;
        if (ely_block_variable_info(block, i, &info) < 0) { printf("error %s\n", ely_last_error()); continue; }
        printf("%s\t%s\t%d\t%s", text_of(info.name), text_of(info.unit), (int)info.causality, text_of(info.description));
#ifdef ELY_VARIABILITY_FIXED /* the second version of the struct */
        printf("\t%d\t%u\t%a\t%a\t%a\t%a\t%s\t%s\t%a\t%a\t%s\t%d\t%s", (int)info.variability, (unsigned)info.flags,
               info.min, info.max, info.start, info.nominal, text_of(info.label), text_of(info.display_unit), info.display_scale,
               info.display_offset, text_of(info.summary_group), (int)info.summary_rank, text_of(info.config_key));
#endif
        printf("\n");
    }
}

int main(void) {
    static char line[LINE];
    if (ely_abi_version() != ELY_ABI_VERSION) {
        fprintf(stderr, "library ABI %d, header ABI %d\n", (int)ely_abi_version(), ELY_ABI_VERSION);
        return 1;
    }
    while (read_line(line)) {
        char* save = NULL;
        const char* command = strtok_r(line, " \t\r\n", &save);
        if (!command) continue;
        const char* arg = strtok_r(NULL, " \t\r\n", &save);
        int32_t index = 0;
        if (strcmp(command, "quit") == 0) {
            break;
        } else if (strcmp(command, "create") == 0 && arg) {
            ely_block_destroy(block);
            block = NULL;
            answer(ely_block_create_from_file(arg, &block));
        } else if (strcmp(command, "spec") == 0 && arg) {
            answer(block ? ely_block_set_spec(block, arg) : ELY_ERR_WRONG_STATE);
        } else if (strcmp(command, "set") == 0 && arg) {
            const char* value = strtok_r(NULL, " \t\r\n", &save);
            int32_t s = value ? find(arg, &index) : ELY_ERR_INVALID_ARGUMENT;
            if (s >= 0) s = ely_block_set(block, index, strtod(value, NULL));
            answer(s);
        } else if (strcmp(command, "solve") == 0) {
            answer(block ? ely_block_solve(block) : ELY_ERR_WRONG_STATE);
        } else if (strcmp(command, "get") == 0 && arg) {
            double value = 0.0;
            int32_t s = find(arg, &index);
            if (s >= 0) s = ely_block_get(block, index, &value);
            if (s < 0) answer(s);
            else printf("status %d %a\n", (int)s, value);
        } else if (strcmp(command, "report") == 0) {
            block_text(ely_block_report_json);
        } else if (strcmp(command, "variables") == 0) {
            variables();
        } else if (strcmp(command, "water") == 0 && arg) {
            double p = 0.0;
            const int32_t s = ely_water_saturation_pressure(strtod(arg, NULL), &p);
            if (s < 0) answer(s);
            else printf("status %d %a\n", (int)s, p);
        } else if (strcmp(command, "voltages") == 0 && arg) {
            const char* pa = strtok_r(NULL, " \t\r\n", &save);
            const char* pc = pa ? strtok_r(NULL, " \t\r\n", &save) : NULL;
            double rev = 0.0, tn = 0.0;
            const int32_t s = pc ? ely_water_electrolysis_voltages(strtod(arg, NULL), strtod(pa, NULL), strtod(pc, NULL), &rev, &tn)
                                 : ELY_ERR_INVALID_ARGUMENT;
            if (s < 0) answer(s);
            else printf("status %d %a %a\n", (int)s, rev, tn);
        } else if (strcmp(command, "batch") == 0 && arg) {
            const char* n_in = strtok_r(NULL, " \t\r\n", &save);
            const char* n_out = n_in ? strtok_r(NULL, " \t\r\n", &save) : NULL;
            if (!block || !n_out) answer(ELY_ERR_WRONG_STATE);
            else batch((size_t)strtoull(arg, NULL, 10), (int32_t)atoi(n_in), (int32_t)atoi(n_out));
        } else if (strcmp(command, "fit") == 0 && arg) {
            const char* n_in = strtok_r(NULL, " \t\r\n", &save);
            const char* n_meas = n_in ? strtok_r(NULL, " \t\r\n", &save) : NULL;
            const char* n_free = n_meas ? strtok_r(NULL, " \t\r\n", &save) : NULL;
            if (!block || !n_free) answer(ELY_ERR_WRONG_STATE);
            else fit((size_t)strtoull(arg, NULL, 10), (int32_t)atoi(n_in), (int32_t)atoi(n_meas), (int32_t)atoi(n_free));
        } else if (strcmp(command, "reset") == 0 && arg) {
            answer(block ? ely_block_reset(block, strtod(arg, NULL)) : ELY_ERR_WRONG_STATE);
        } else if (strcmp(command, "advance") == 0 && arg) {
            answer(block ? ely_block_advance(block, strtod(arg, NULL)) : ELY_ERR_WRONG_STATE);
        } else if (strcmp(command, "time") == 0) {
            double t = 0.0;
            const int32_t s = block ? ely_block_time(block, &t) : ELY_ERR_WRONG_STATE;
            if (s < 0) answer(s);
            else printf("status %d %a\n", (int)s, t);
        } else if (strcmp(command, "save") == 0) {
            save_state();
        } else if (strcmp(command, "restore") == 0 && arg) {
            restore_state((size_t)strtoull(arg, NULL, 10));
        } else if (strcmp(command, "simulate") == 0 && arg) {
            const char* n_in = strtok_r(NULL, " \t\r\n", &save);
            const char* n_out = n_in ? strtok_r(NULL, " \t\r\n", &save) : NULL;
            if (!block || !n_out) answer(ELY_ERR_WRONG_STATE);
            else simulate((size_t)strtoull(arg, NULL, 10), (int32_t)atoi(n_in), (int32_t)atoi(n_out));
        } else if (strcmp(command, "summary") == 0) {
            block_text(ely_block_run_summary_json);
        } else {
            printf("status %d unknown command\n", (int)ELY_ERR_INVALID_ARGUMENT);
        }
        fflush(stdout);
    }
    ely_block_destroy(block);
    return 0;
}
