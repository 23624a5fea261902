#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <limits>
#include <string>

#include <fmt/format.h>

#include "base/error.hpp"
#include "thermo/if97.hpp"

namespace {

using ely::Error;
using ely::ErrorKind;
namespace if97 = ely::if97;

constexpr double kRel = 1e-8;

// Relative comparison: |actual - expected| <= rel * |expected|.
::testing::AssertionResult near_rel(double actual, double expected, double rel) {
    const double err = std::fabs(actual - expected);
    if (err <= rel * std::fabs(expected)) return ::testing::AssertionSuccess();
    return ::testing::AssertionFailure() << fmt::format("actual {:.12g}, expected {:.12g}, relative error {:.3g} > {:.3g}",
                                                        actual, expected, err / std::fabs(expected), rel);
}

// Expected values of the verification tables in their units (MPa, kJ/kg, kJ/(kg K)),
// converted to SI here.
struct Expected {
    double T, p_MPa, v, h_kJ, u_kJ, s_kJ, cp_kJ;
};

void expect_state(const if97::State& st, const Expected& e) {
    SCOPED_TRACE(fmt::format("T = {} K, p = {} MPa", e.T, e.p_MPa));
    EXPECT_TRUE(near_rel(st.v, e.v, kRel)) << "v";
    EXPECT_TRUE(near_rel(st.h, e.h_kJ * 1e3, kRel)) << "h";
    EXPECT_TRUE(near_rel(st.u, e.u_kJ * 1e3, kRel)) << "u";
    EXPECT_TRUE(near_rel(st.s, e.s_kJ * 1e3, kRel)) << "s";
    EXPECT_TRUE(near_rel(st.cp, e.cp_kJ * 1e3, kRel)) << "cp";
}

void expect_error(const std::function<void()>& call, ErrorKind kind, const std::string& fragment) {
    try {
        call();
        ADD_FAILURE() << "no ely::Error thrown; expected one containing \"" << fragment << "\"";
    } catch (const Error& e) {
        EXPECT_EQ(e.kind(), kind) << e.what();
        EXPECT_NE(std::string(e.what()).find(fragment), std::string::npos)
            << "message \"" << e.what() << "\" lacks \"" << fragment << "\"";
    }
}

TEST(If97Region4, SaturationPressureVerification) {
    // IAPWS R7-97(2012) Table 35
    EXPECT_TRUE(near_rel(if97::saturation_pressure(300.0), 0.353658941e-2 * 1e6, kRel));
    EXPECT_TRUE(near_rel(if97::saturation_pressure(500.0), 0.263889776e1 * 1e6, kRel));
    EXPECT_TRUE(near_rel(if97::saturation_pressure(600.0), 0.123443146e2 * 1e6, kRel));
}

TEST(If97Region4, SaturationTemperatureVerification) {
    // IAPWS R7-97(2012) Table 36
    EXPECT_TRUE(near_rel(if97::saturation_temperature(0.1e6), 0.372755919e3, kRel));
    EXPECT_TRUE(near_rel(if97::saturation_temperature(1e6), 0.453035632e3, kRel));
    EXPECT_TRUE(near_rel(if97::saturation_temperature(10e6), 0.584149488e3, kRel));
}

TEST(If97Region4, RoundTrip) {
    // IAPWS R7-97(2012) eqs. 30 and 31 are exact inverses of eq. 28
    for (double T = 280.0; T <= 640.0; T += 2.5) {
        const double p = if97::saturation_pressure(T);
        EXPECT_TRUE(near_rel(if97::saturation_temperature(p), T, 1e-10)) << "T = " << T;
    }
}

TEST(If97Region4, EndPoints) {
    // IAPWS R7-97(2012) section 8.1: the saturation line from 273.15 K to the critical point
    EXPECT_TRUE(near_rel(if97::saturation_pressure(273.15), 611.213, 1e-6));
    EXPECT_TRUE(near_rel(if97::saturation_pressure(if97::kCriticalTemperature), if97::kCriticalPressure, 1e-6));
    EXPECT_NO_THROW(if97::saturation_temperature(611.213));
    EXPECT_NO_THROW(if97::saturation_temperature(if97::kCriticalPressure));
}

TEST(If97Boundary23, Verification) {
    // IAPWS R7-97(2012) section 4, check value of eq. 5: T = 0.62315e3 K -> p = 0.165291643e2 MPa
    EXPECT_TRUE(near_rel(if97::boundary23_pressure(623.15), 0.165291643e2 * 1e6, kRel));
}

TEST(If97Region1, Verification) {
    // IAPWS R7-97(2012) Table 5
    expect_state(if97::region1(300.0, 3e6),
                 {300.0, 3.0, 0.100215168e-2, 0.115331273e3, 0.112324818e3, 0.392294792, 0.417301218e1});
    // IAPWS R7-97(2012) Table 5
    expect_state(if97::region1(300.0, 80e6),
                 {300.0, 80.0, 0.971180894e-3, 0.184142828e3, 0.106448356e3, 0.368563852, 0.401008987e1});
    // IAPWS R7-97(2012) Table 5
    expect_state(if97::region1(500.0, 3e6),
                 {500.0, 3.0, 0.120241800e-2, 0.975542239e3, 0.971934985e3, 0.258041912e1, 0.465580682e1});
}

TEST(If97Region2, Verification) {
    // IAPWS R7-97(2012) Table 15
    expect_state(if97::region2(300.0, 0.0035e6),
                 {300.0, 0.0035, 0.394913866e2, 0.254991145e4, 0.241169160e4, 0.852238967e1, 0.191300162e1});
    // IAPWS R7-97(2012) Table 15
    expect_state(if97::region2(700.0, 0.0035e6),
                 {700.0, 0.0035, 0.923015898e2, 0.333568375e4, 0.301262819e4, 0.101749996e2, 0.208141274e1});
    // IAPWS R7-97(2012) Table 15
    expect_state(if97::region2(700.0, 30e6),
                 {700.0, 30.0, 0.542946619e-2, 0.263149474e4, 0.246861076e4, 0.517540298e1, 0.103505092e2});
}

// cp = (dh/dT)_p, checked by a central difference; IAPWS R7-97(2012) Table 3 and Table 12
// (cp = -tau^2 gamma_tautau R is the derivative of h = tau gamma_tau R T).
TEST(If97Consistency, HeatCapacityIsEnthalpyDerivative) {
    for (double T = 280.0; T <= 620.0; T += 20.0) {
        for (double p : {1e6, 20e6, 50e6, 100e6}) {
            if (p < if97::saturation_pressure(T + 1.0)) continue;
            const double dT = 1e-5 * T;
            const double dhdT = (if97::region1(T + dT, p).h - if97::region1(T - dT, p).h) / (2.0 * dT);
            EXPECT_TRUE(near_rel(if97::region1(T, p).cp, dhdT, 1e-6)) << "region 1, T = " << T << ", p = " << p;
        }
    }
    for (double T = 300.0; T <= 1060.0; T += 20.0) {
        for (double p : {100.0, 1e3, 1e4, 1e5, 1e6, 10e6, 50e6, 100e6}) {
            const double Tlo = T * (1.0 - 1e-5);
            if (Tlo <= 623.15 && p > if97::saturation_pressure(Tlo)) continue;
            if (Tlo > 623.15 && T <= 870.0 && p > if97::boundary23_pressure(std::min(Tlo, 863.15))) continue;
            const double dT = 1e-5 * T;
            const double dhdT = (if97::region2(T + dT, p).h - if97::region2(T - dT, p).h) / (2.0 * dT);
            EXPECT_TRUE(near_rel(if97::region2(T, p).cp, dhdT, 1e-6)) << "region 2, T = " << T << ", p = " << p;
        }
    }
}

// u = h - p v; IAPWS R7-97(2012) Table 3 and Table 12
TEST(If97Consistency, InternalEnergyIsEnthalpyLessFlowWork) {
    for (double T = 280.0; T <= 620.0; T += 40.0) {
        for (double p : {1e6, 30e6, 100e6}) {
            if (p < if97::saturation_pressure(T)) continue;
            const auto st = if97::region1(T, p);
            EXPECT_TRUE(near_rel(st.u, st.h - p * st.v, 1e-14)) << "region 1, T = " << T << ", p = " << p;
        }
    }
    for (double T = 300.0; T <= 1060.0; T += 40.0) {
        for (double p : {10.0, 1e3, 1e5, 1e6}) {
            if (T <= 623.15 && p > if97::saturation_pressure(T)) continue;
            for (const auto& st : {if97::region2(T, p), if97::region2_ideal_gas(T, p)}) {
                EXPECT_TRUE(near_rel(st.u, st.h - p * st.v, 1e-14)) << "region 2, T = " << T << ", p = " << p;
            }
        }
    }
}

// The residual part of IAPWS R7-97(2012) eq. 15 vanishes as p -> 0 (eq. 17: every term
// carries pi^I with I >= 1).
TEST(If97Consistency, IdealGasLimit) {
    for (double T = 280.0; T <= 1070.0; T += 30.0) {
        const auto real = if97::region2(T, 1.0);
        const auto ideal = if97::region2_ideal_gas(T, 1.0);
        EXPECT_TRUE(near_rel(real.h, ideal.h, 1e-6)) << "T = " << T;
        EXPECT_TRUE(near_rel(real.s, ideal.s, 1e-6)) << "T = " << T;
        EXPECT_TRUE(near_rel(real.cp, ideal.cp, 1e-5)) << "T = " << T;  // gamma^r_tautau is large near 273 K
        EXPECT_TRUE(near_rel(real.v, ideal.v, 1e-6)) << "T = " << T;
        EXPECT_TRUE(near_rel(ideal.v, if97::kSpecificGasConstant * T / 1.0, 1e-14)) << "T = " << T;
    }
}

TEST(If97Errors, InvalidArguments) {
    const double nan = std::numeric_limits<double>::quiet_NaN();
    const double inf = std::numeric_limits<double>::infinity();
    expect_error([&] { if97::region1(nan, 1e6); }, ErrorKind::invalid_argument, "temperature nan");
    expect_error([&] { if97::region2(nan, 1e3); }, ErrorKind::invalid_argument, "temperature nan");
    expect_error([&] { if97::saturation_pressure(nan); }, ErrorKind::invalid_argument, "temperature nan");
    expect_error([&] { if97::saturation_temperature(inf); }, ErrorKind::invalid_argument, "pressure inf");
    expect_error([&] { if97::region1(300.0, -1e5); }, ErrorKind::invalid_argument, "limit 0 Pa");
    expect_error([&] { if97::region2(400.0, -1.0); }, ErrorKind::invalid_argument, "limit 0 Pa");
    expect_error([&] { if97::region2_ideal_gas(400.0, 0.0); }, ErrorKind::invalid_argument, "limit 0 Pa");
    expect_error([&] { if97::saturation_temperature(-1.0); }, ErrorKind::invalid_argument, "limit 0 Pa");
}

TEST(If97Errors, OutOfRange) {
    // limits of IAPWS R7-97(2012) section 4 (Figure 1), eq. 30 and eq. 31
    expect_error([] { if97::region1(650.0, 30e6); }, ErrorKind::out_of_range,
                 "IF97 region 1: temperature 650 K is above the limit 623.15 K");
    expect_error([] { if97::region1(300.0, 101e6); }, ErrorKind::out_of_range, "above the limit 100000000 Pa");
    expect_error([] { if97::region1(300.0, 1e3); }, ErrorKind::out_of_range,
                 fmt::format("pressure 1000 Pa is below the limit {:.9g} Pa", if97::saturation_pressure(300.0)));
    expect_error([] { if97::region2(400.0, 1e6); }, ErrorKind::out_of_range,
                 fmt::format("pressure 1000000 Pa is above the limit {:.9g} Pa", if97::saturation_pressure(400.0)));
    expect_error([] { if97::region2(700.0, 40e6); }, ErrorKind::out_of_range,
                 fmt::format("above the limit {:.9g} Pa", if97::boundary23_pressure(700.0)));
    expect_error([] { if97::region2(1100.0, 1e5); }, ErrorKind::out_of_range, "above the limit 1073.15 K");
    expect_error([] { if97::region2(900.0, 101e6); }, ErrorKind::out_of_range, "above the limit 100000000 Pa");
    expect_error([] { if97::region2_ideal_gas(270.0, 1e3); }, ErrorKind::out_of_range, "below the limit 273.15 K");
    expect_error([] { if97::saturation_pressure(200.0); }, ErrorKind::out_of_range,
                 "temperature 200 K is below the limit 273.15 K");
    expect_error([] { if97::saturation_pressure(650.0); }, ErrorKind::out_of_range, "above the limit 647.096 K");
    expect_error([] { if97::saturation_temperature(500.0); }, ErrorKind::out_of_range, "below the limit 611.213 Pa");
    expect_error([] { if97::saturation_temperature(23e6); }, ErrorKind::out_of_range, "above the limit 22064000 Pa");
    expect_error([] { if97::boundary23_pressure(900.0); }, ErrorKind::out_of_range, "above the limit 863.15 K");
}

TEST(If97Errors, RoundOffToleranceAtSaturation) {
    // Region 1 and 2 share the saturation line (IAPWS R7-97(2012) section 4): both accept p_sat(T)
    for (double T : {300.0, 450.0, 600.0, 623.15}) {
        const double p_sat = if97::saturation_pressure(T);
        EXPECT_NO_THROW(if97::region1(T, p_sat * (1.0 - 1e-12))) << "T = " << T;
        EXPECT_NO_THROW(if97::region2(T, p_sat * (1.0 + 1e-12))) << "T = " << T;
    }
}

}  // namespace
