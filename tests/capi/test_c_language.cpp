// Runs the checks written in C (test_c_language.c, compiled as C99) and reports them.
#include "test_c_language.h"

#include "capi_support.hpp"

TEST(CLanguage, StatusValuesArePinned) {
    char why[512] = "";
    EXPECT_EQ(ely_c_test_status_values(why, sizeof why), 0) << why;
}

TEST(CLanguage, LifeCycleFromC) {
    char why[512] = "";
    const std::string json = capi_test::minimal_config("pem");
    EXPECT_EQ(ely_c_test_life_cycle(json.c_str(), why, sizeof why), 0) << why;
}

TEST(CLanguage, ParseQuantityFromC) {
    char why[512] = "";
    EXPECT_EQ(ely_c_test_parse_quantity(why, sizeof why), 0) << why;
}

TEST(CLanguage, ParseQuantityAndConvertUnitAreOneConversion) {
    char why[512] = "";
    EXPECT_EQ(ely_c_test_units_agree(why, sizeof why), 0) << why;
}

TEST(CLanguage, BatchAfterAFailedPointKeepsTheStateSetBeforeIt) {
    char why[512] = "";
    const std::string json = capi_test::minimal_config("pem");
    EXPECT_EQ(ely_c_test_batch_after_a_failed_point(json.c_str(), why, sizeof why), 0) << why;
}
