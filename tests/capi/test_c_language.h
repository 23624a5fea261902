/* The C-language checks of test_c_language.c, called from test_c_language.cpp. */
#ifndef ELY_TEST_C_LANGUAGE_H
#define ELY_TEST_C_LANGUAGE_H
#include <stddef.h>
#ifdef __cplusplus
extern "C" {
#endif
int ely_c_test_status_values(char* why, size_t why_size);
int ely_c_test_life_cycle(const char* config_json, char* why, size_t why_size);
int ely_c_test_parse_quantity(char* why, size_t why_size);
int ely_c_test_units_agree(char* why, size_t why_size);
int ely_c_test_batch_after_a_failed_point(const char* config_json, char* why, size_t why_size);
#ifdef __cplusplus
}
#endif
#endif
