// Library-level calls of the C interface: versions, status texts, per-thread last error,
// and the water functions, compared with the C++ model.
#include <elyblock/elyblock.h>
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <regex>
#include <set>
#include <string>
#include <thread>

#include "thermo/reaction.hpp"
#include "thermo/water.hpp"

using ::testing::HasSubstr;

TEST(Library, Versions) {
    EXPECT_EQ(ely_abi_version(), ELY_ABI_VERSION);
    EXPECT_TRUE(std::regex_match(ely_version(), std::regex(R"(\d+\.\d+\.\d+)"))) << ely_version();
}

TEST(Library, StatusTextsAreDistinctAndNeverNull) {
    const int32_t codes[] = {ELY_OK, ELY_WARNING, ELY_PARTIAL, ELY_ERR_INVALID_ARGUMENT, ELY_ERR_OUT_OF_RANGE,
                             ELY_ERR_CONFIG, ELY_ERR_INFEASIBLE, ELY_ERR_NO_CONVERGENCE, ELY_ERR_UNKNOWN_NAME,
                             ELY_ERR_WRONG_STATE, ELY_ERR_IO, ELY_ERR_BUFFER_TOO_SMALL, ELY_ERR_CANCELLED,
                             ELY_ERR_OUT_OF_MEMORY, ELY_ERR_INTERNAL};
    std::set<std::string> seen;
    for (int32_t c : codes) {
        ASSERT_NE(ely_status_text(c), nullptr);
        EXPECT_TRUE(seen.insert(ely_status_text(c)).second) << c;
    }
    EXPECT_STREQ(ely_status_text(12345), "unknown status");
}

TEST(Library, SaturationPressureMatchesModelAndIapws) {
    for (double t = 275.0; t < 640.0; t += 13.0) {
        double p = 0.0;
        ASSERT_EQ(ely_water_saturation_pressure(t, &p), ELY_OK);
        EXPECT_EQ(p, ely::water_saturation_pressure(t));
        EXPECT_STREQ(ely_last_error(), "");
    }
    double p = 0.0;
    ASSERT_EQ(ely_water_saturation_pressure(300.0, &p), ELY_OK);
    EXPECT_NEAR(p / 3536.58941, 1.0, 1e-8);  // IAPWS R7-97(2012) Table 35
}

TEST(Library, SaturationPressureErrorsLeaveOutputUntouched) {
    double p = -7.0;
    EXPECT_EQ(ely_water_saturation_pressure(300.0, nullptr), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("pressure_Pa"));
    EXPECT_EQ(ely_water_saturation_pressure(std::nan(""), &p), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("temperature"));
    EXPECT_EQ(ely_water_saturation_pressure(std::numeric_limits<double>::infinity(), &p), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_water_saturation_pressure(700.0, &p), ELY_ERR_OUT_OF_RANGE);
    EXPECT_THAT(ely_last_error(), HasSubstr("647.096"));
    EXPECT_EQ(ely_water_saturation_pressure(200.0, &p), ELY_ERR_OUT_OF_RANGE);
    EXPECT_THAT(ely_last_error(), HasSubstr("273.15"));
    EXPECT_EQ(p, -7.0);
    ASSERT_EQ(ely_water_saturation_pressure(300.0, &p), ELY_OK);
    EXPECT_STREQ(ely_last_error(), "");
}

TEST(Library, LastErrorIsPerThread) {
    double p = 0;
    ASSERT_EQ(ely_water_saturation_pressure(700.0, &p), ELY_ERR_OUT_OF_RANGE);
    std::string other;
    std::thread th([&] {
        double q = 0;
        ely_water_saturation_pressure(300.0, &q);
        other = ely_last_error();
    });
    th.join();
    EXPECT_EQ(other, "");
    EXPECT_THAT(ely_last_error(), HasSubstr("647.096"));
}

TEST(Library, WaterElectrolysisVoltagesMatchModel) {
    double e_rev = 0, e_tn = 0;
    ASSERT_EQ(ely_water_electrolysis_voltages(353.15, 1.3e5, 30e5, &e_rev, &e_tn), ELY_OK);
    EXPECT_EQ(e_rev, ely::reversible_voltage_liquid_water(353.15, 1.3e5, 30e5));
    EXPECT_EQ(e_tn, ely::thermoneutral_voltage_hhv(353.15));
    EXPECT_EQ(ely_water_electrolysis_voltages(353.15, 1e5, 0.3e5, &e_rev, &e_tn), ELY_ERR_OUT_OF_RANGE);
    EXPECT_THAT(ely_last_error(), HasSubstr("cathode pressure"));
    EXPECT_EQ(ely_water_electrolysis_voltages(353.15, 1e5, 1e5, nullptr, nullptr), ELY_ERR_INVALID_ARGUMENT);
}
