/* A dynamic run from C (compiled as C99): reset, advance, time, a profile with a C progress
 * callback that cancels, a saved state through the buffer protocol restored into a second block,
 * the run summary. Returns 0 when all holds, else the line of the first check that failed (its
 * message in `why`). */
#include <elyblock/elyblock.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "test_dynamics_c.h"

#define CHECK(cond)                                                                         \
    do {                                                                                    \
        if (!(cond)) {                                                                      \
            snprintf(why, why_size, "%s (last error: %s)", #cond, ely_last_error());        \
            status = __LINE__;                                                              \
            goto done;                                                                      \
        }                                                                                   \
    } while (0)

static int32_t stop_after_first_call(size_t done_rows, size_t total, void* user) {
    (void)done_rows;
    (void)total;
    ++*(int*)user;
    return 1;
}

int ely_c_test_dynamic_run(const char* config_json, char* why, size_t why_size) {
    int status = 0, calls = 0;
    ely_block *a = NULL, *b = NULL;
    unsigned char* state = NULL;
    char* summary = NULL;
    int32_t i_temperature = -1, i_current = -1, i_request = -1;
    double t = -1, value_a = 0, value_b = 0;
    size_t length = 0, summary_length = 0;
    double times[3000], currents[3000], outputs[3000];
    int32_t statuses[3000];
    int k;

    CHECK(ely_block_create(config_json, &a) == ELY_OK);
    CHECK(ely_block_create(config_json, &b) == ELY_OK);
    CHECK(ely_block_advance(a, 1.0) == ELY_ERR_WRONG_STATE);
    CHECK(strstr(ely_last_error(), "reset") != NULL);
    CHECK(ely_block_time(a, &t) == ELY_ERR_WRONG_STATE);
    CHECK(ely_block_run_summary_json(a, NULL, 0, &length) == ELY_ERR_WRONG_STATE);
    CHECK(ely_block_find(a, "stack.temperature", &i_temperature) == ELY_OK);
    CHECK(ely_block_find(a, "in.current_density", &i_current) == ELY_OK);
    CHECK(ely_block_find(a, "in.mode_request", &i_request) == ELY_OK);
    CHECK(ely_block_reset(a, 10.0) >= 0);
    CHECK(ely_block_time(a, &t) == ELY_OK && t == 10.0);
    CHECK(ely_block_set(a, i_current, 12000.0) == ELY_OK);
    CHECK(ely_block_advance(a, 30.0) >= 0);
    CHECK(ely_block_advance(a, NAN) == ELY_ERR_INVALID_ARGUMENT);
    CHECK(ely_block_advance(a, -1.0) == ELY_ERR_INVALID_ARGUMENT);
    CHECK(ely_block_time(a, &t) == ELY_OK && t == 40.0);

    /* The saved state through the buffer protocol, into the other block: the same next step. */
    CHECK(ely_block_save_state(a, NULL, 0, &length) == ELY_OK && length > 0);
    state = (unsigned char*)malloc(length);
    CHECK(state != NULL);
    CHECK(ely_block_save_state(a, state, 1, &length) == ELY_ERR_BUFFER_TOO_SMALL);
    CHECK(ely_block_save_state(a, state, length, &length) == ELY_OK);
    CHECK(ely_block_restore_state(b, state, length - 1) == ELY_ERR_INVALID_ARGUMENT);
    CHECK(ely_block_restore_state(b, state, length) == ELY_OK);
    CHECK(ely_block_advance(a, 600.0) >= 0 && ely_block_advance(b, 600.0) >= 0);
    CHECK(ely_block_get(a, i_temperature, &value_a) == ELY_OK && ely_block_get(b, i_temperature, &value_b) == ELY_OK);
    CHECK(value_a == value_b);

    /* A profile whose callback cancels at its first call (after 1024 rows). */
    for (k = 0; k < 3000; ++k) {
        times[k] = 60.0 * k;
        currents[k] = k < 1500 ? 15000.0 : 8000.0;
    }
    CHECK(ely_block_simulate(a, 3000, times, 1, &i_current, currents, 1, &i_temperature, outputs, statuses,
                             stop_after_first_call, &calls) == ELY_ERR_CANCELLED);
    CHECK(calls == 1 && statuses[1023] >= 0 && statuses[1024] == ELY_ERR_CANCELLED && isnan(outputs[2999]));
    CHECK(ely_block_time(a, &t) == ELY_OK && t == times[1023]);
    CHECK(ely_block_simulate(a, 3000, times, 1, &i_current, currents, 1, &i_temperature, outputs, statuses, NULL,
                             NULL) >= 0);
    CHECK(ely_block_time(a, &t) == ELY_OK && t == times[2999]);

    /* The run summary: a NUL-terminated JSON object. */
    CHECK(ely_block_run_summary_json(a, NULL, 0, &summary_length) == ELY_OK);
    summary = (char*)malloc(summary_length);
    CHECK(summary != NULL);
    CHECK(ely_block_run_summary_json(a, summary, summary_length, &summary_length) == ELY_OK);
    CHECK(strlen(summary) + 1 == summary_length && strstr(summary, "\"hydrogen\"") != NULL);

    /* Asked to stop, then to start again from cold. */
    CHECK(ely_block_set(a, i_request, 0.0) == ELY_OK && ely_block_advance(a, 3600.0) >= 0);
    CHECK(ely_block_set(a, i_request, 2.0) == ELY_OK && ely_block_advance(a, 7200.0) >= 0);
done:
    free(summary);
    free(state);
    ely_block_destroy(a);
    ely_block_destroy(b);
    return status;
}
