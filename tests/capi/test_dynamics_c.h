/* The C-language checks of test_dynamics_c.c, called from test_dynamics.cpp. */
#ifndef ELY_TEST_DYNAMICS_C_H
#define ELY_TEST_DYNAMICS_C_H
#include <stddef.h>
#ifdef __cplusplus
extern "C" {
#endif
int ely_c_test_dynamic_run(const char* config_json, char* why, size_t why_size);
#ifdef __cplusplus
}
#endif
#endif
