// Solid oxide steam electrolysis cell: open-circuit voltage against NIST-JANAF, consistency
// identities over grids, errors. Every reference value names its source beside it.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "cells/cell.hpp"
#include "thermo/constants.hpp"
#include "base/error.hpp"
#include "thermo/reaction.hpp"
#include "support.hpp"

using namespace ely;
using ely::test::expect_error;
using ely::test::rel;
using ::testing::HasSubstr;

namespace {

std::unique_ptr<Cell> soec(std::initializer_list<std::pair<const char*, double>> set = {}) {
    return ely::test::cell_with("solid_oxide", set);
}

constexpr double kAtm = 101325.0;

// E°(T) of H2O(g) → H2 + ½ O2 from NIST-JANAF (Chase 1998) ΔfG°(H2O, g) = −192.603 kJ/mol at
// 1000 K and −187.052 kJ/mol at 1100 K, interpolated linearly in T (ΔG is nearly linear: the
// curvature −ΔCp/T gives < 0.1 mV over 100 K) [S, D].
double janaf_standard_voltage(double t) {
    const double dfg = -192.603e3 + (t - 1000.0) / 100.0 * (-187.052e3 - -192.603e3);
    return -dfg / (2.0 * kFaraday);
}

const double kTemperatures[] = {923.15, 973.15, 1023.15, 1073.15, 1123.15};
const double kCurrentDensities[] = {0.0, 1000.0, 3000.0, 5000.0, 1e4, 1.5e4, 2e4};
const std::pair<double, double> kPressures[] = {{kAtm, kAtm}, {5e5, 5e5}, {kAtm, 3e5}};

}  // namespace

TEST(SolidOxideCell, OpenCircuitVoltageAgainstJanaf) {
    // 800 °C, x_H2O = x_H2 = 0.5, air (x_O2 = 0.21) at 1 atm:
    // OCV = E°(T) + RT/2F·ln(x_H2·(x_O2·p/p°)^½/x_H2O) = 0.97704 − 0.03578 = 0.94126 V [D].
    const double t = 1073.15;
    const double expected =
        janaf_standard_voltage(t) +
        kGasConstant * t / (2.0 * kFaraday) * std::log(0.5 * std::sqrt(0.21 * kAtm / kStandardPressure) / 0.5);
    EXPECT_NEAR(expected, 0.94128, 1e-4);
    EXPECT_NEAR(reversible_voltage_steam(t, 0.5 * kAtm, 0.5 * kAtm, 0.21 * kAtm), expected, 1e-3);
    // The cell at the same mean cathode composition (x_in = 0.625, U = 0.4: mean x_H2O = 0.5) with
    // its pure-oxygen sweep at 1 atm: E° + RT/2F·ln((p/p°)^½) [D].
    const auto r = soec({{"steam_inlet_fraction", 0.625}, {"steam_utilisation", 0.4}})->evaluate({0.0, t, kAtm, kAtm});
    const double expected_o2 =
        janaf_standard_voltage(t) + kGasConstant * t / (2.0 * kFaraday) * 0.5 * std::log(kAtm / kStandardPressure);
    EXPECT_NEAR(r.reversible_voltage, expected_o2, 1e-3);
    EXPECT_EQ(r.voltage, r.reversible_voltage);
    // Across the hard envelope the Shomate-based E° follows JANAF within 1 mV.
    for (double tk : {900.0, 1000.0, 1100.0})
        EXPECT_NEAR(reversible_voltage_steam(tk, kStandardPressure, kStandardPressure, kStandardPressure),
                    janaf_standard_voltage(tk), 1e-3)
            << tk;
}

TEST(SolidOxideCell, ReversibleVoltageAtTheMeanComposition) {
    // Arithmetic mean of inlet and outlet: x_H2O = x_in(1 − U/2), x_H2 = 1 − x_H2O; O2 at p_anode.
    for (double u : {0.3, 0.5, 0.7, 0.9}) {
        const auto cell = soec({{"steam_utilisation", u}});
        for (double t : kTemperatures)
            for (const auto& [pa, pc] : kPressures) {
                const auto r = cell->evaluate({5000.0, t, pa, pc});
                const double x_steam = 0.9 * (1.0 - 0.5 * u);
                EXPECT_EQ(r.reversible_voltage, reversible_voltage_steam(t, pc * (1.0 - x_steam), pc * x_steam, pa));
                EXPECT_EQ(r.thermoneutral_voltage, thermoneutral_voltage_lhv(t));
            }
    }
    // More conversion, more hydrogen in the mean gas: higher Nernst voltage.
    EXPECT_GT(soec({{"steam_utilisation", 0.9}})->evaluate({0.0, 1073.15, kAtm, kAtm}).reversible_voltage,
              soec({{"steam_utilisation", 0.3}})->evaluate({0.0, 1073.15, kAtm, kAtm}).reversible_voltage);
    // Thermoneutral voltage in steam ≈ 1.28–1.29 V (REFERENCES.md [D]).
    EXPECT_GT(thermoneutral_voltage_lhv(1073.15), 1.28);
    EXPECT_LT(thermoneutral_voltage_lhv(1073.15), 1.295);
}

TEST(SolidOxideCell, TypicalVoltageAt05AcmSquared) {
    // 800 °C, 0.5 A/cm²: 1.2–1.35 V, near thermoneutral (common practice).
    const auto r = soec()->evaluate({5000.0, 1073.15, kAtm, kAtm});
    EXPECT_GT(r.voltage, 1.2);
    EXPECT_LT(r.voltage, 1.35);
    // Cell area-specific resistance (V − E)/j within 0.15–0.7 Ω cm² (REFERENCES.md: 0.15–0.5 Ω cm²,
    // from memory; the concentration loss adds a little).
    const double asr = (r.voltage - r.reversible_voltage) / 5000.0;
    EXPECT_GT(asr, 0.15e-4);
    EXPECT_LT(asr, 0.7e-4);
}

TEST(SolidOxideCell, VoltagePartsSumExactlyAndRiseWithCurrentDensity) {
    for (int model = 0; model <= 1; ++model) {
        const auto cell = soec({{"kinetics_model", model}});
        for (double t : kTemperatures)
            for (const auto& [pa, pc] : kPressures) {
                double previous = 0.0;
                for (double j : kCurrentDensities) {
                    const auto r = cell->evaluate({j, t, pa, pc});
                    EXPECT_EQ(r.voltage, r.reversible_voltage + r.activation_anode + r.activation_cathode + r.ohmic +
                                             r.concentration);
                    EXPECT_GE(r.activation_anode, 0.0);
                    EXPECT_GE(r.activation_cathode, 0.0);
                    EXPECT_GE(r.ohmic, 0.0);
                    EXPECT_GE(r.concentration, 0.0);
                    if (j > 0) {
                        EXPECT_GT(r.voltage, previous);
                    }
                    previous = r.voltage;
                }
            }
    }
}

TEST(SolidOxideCell, FluxesAndElementBalances) {
    for (double leak : {0.0, 0.05})
        for (double u : {0.5, 0.7}) {
            const auto cell = soec({{"electronic_leakage_fraction", leak}, {"steam_utilisation", u}});
            for (double t : kTemperatures)
                for (double j : kCurrentDensities) {
                    if (j == 0.0) continue;
                    const auto r = cell->evaluate({j, t, kAtm, kAtm});
                    EXPECT_FALSE(r.gases_saturated);
                    EXPECT_EQ(r.faraday_efficiency, 1.0 - leak);
                    EXPECT_EQ(r.h2_in_o2, 0.0);
                    EXPECT_EQ(r.o2_in_h2, 0.0);
                    // Steam fed = reacted (consumed) + unreacted (cathode_out[H2O]); utilisation U.
                    const double feed = r.consumed[kH2O] + r.cathode_out[kH2O];
                    EXPECT_LT(rel(r.consumed[kH2O] / feed, u), 1e-14);
                    const double h_in = 2.0 * feed, h_out = 2.0 * (r.cathode_out[kH2] + r.cathode_out[kH2O]);
                    const double o_in = feed, o_out = r.cathode_out[kH2O] + 2.0 * r.anode_out[kO2];
                    EXPECT_LT(std::fabs(h_in - h_out), 1e-14 * h_in);
                    EXPECT_LT(std::fabs(o_in - o_out), 1e-14 * o_in);
                    // Faraday's law on the ionic current.
                    EXPECT_LT(rel(r.cathode_out[kH2], (1.0 - leak) * j / (2.0 * kFaraday)), 1e-15);
                }
        }
}

TEST(SolidOxideCell, LimitingCurrentFromSteamDepletion) {
    // j_lim = 2F·D_eff·c_H2O,out/δ at the outlet steam fraction x_in(1 − U): at U = 0.95 the
    // outlet holds 4.5 % steam and j_lim ≈ 0.49 A/cm² at 800 °C [D from the defaults].
    const auto cell = soec({{"steam_utilisation", 0.95}});
    const double x_out = 0.9 * 0.05;
    const double j_lim = 2.0 * kFaraday * 2e-5 * kStandardPressure * x_out / (kGasConstant * 1073.15 * 400e-6);
    EXPECT_NEAR(j_lim, 4866.0, 5.0);
    const double limit = cell->current_density_limit({0.0, 1073.15, kAtm, kAtm});
    EXPECT_LT(limit, j_lim);
    EXPECT_GT(limit, 0.999 * j_lim);
    expect_error([&] { cell->evaluate({5000.0, 1073.15, kAtm, kAtm}); }, ErrorKind::out_of_range, "limiting current");
    EXPECT_TRUE(cell->evaluate({0.97 * j_lim, 1073.15, kAtm, kAtm}).warnings & kWarnNearLimitingCurrent);
    // Default utilisation: the hard envelope (2 A/cm²) is below the diffusion limit (2.9 A/cm² at
    // 800 °C, 2.5 A/cm² at 600 °C).
    EXPECT_EQ(soec()->current_density_limit({0.0, 1073.15, kAtm, kAtm}), 2e4);
    EXPECT_EQ(soec()->current_density_limit({0.0, 873.15, kAtm, kAtm}), 2e4);
}

TEST(SolidOxideCell, ErrorsOutsideEnvelopeNameTheLimit) {
    const auto cell = soec();
    expect_error([&] { cell->evaluate({5000.0, 850.0, kAtm, kAtm}); }, ErrorKind::out_of_range, "temperature");
    expect_error([&] { cell->evaluate({5000.0, 850.0, kAtm, kAtm}); }, ErrorKind::out_of_range, "873.15");
    expect_error([&] { cell->evaluate({5000.0, 1200.0, kAtm, kAtm}); }, ErrorKind::out_of_range, "1173.15");
    expect_error([&] { cell->evaluate({2.1e4, 1073.15, kAtm, kAtm}); }, ErrorKind::out_of_range, "current density");
    expect_error([&] { cell->evaluate({5000.0, 1073.15, 1e4, kAtm}); }, ErrorKind::out_of_range, "anode pressure");
    EXPECT_TRUE(cell->evaluate({5000.0, 923.15, kAtm, kAtm}).warnings & kWarnTemperatureExtrapolated);
    EXPECT_EQ(cell->evaluate({5000.0, 1073.15, kAtm, kAtm}).warnings, 0u);
    expect_error([] { soec({{"kinetics_model", 0.3}}); }, ErrorKind::invalid_argument, "kinetics_model");
    const auto copy = cell->clone();
    EXPECT_EQ(copy->evaluate({5000.0, 1073.15, kAtm, kAtm}).voltage, cell->evaluate({5000.0, 1073.15, kAtm, kAtm}).voltage);
}
