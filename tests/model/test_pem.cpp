// PEM water electrolysis cell: reference values, consistency identities over grids, errors.
// Every reference value names its source beside it.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "cells/cell.hpp"
#include "electrochem/conduction.hpp"
#include "electrochem/kinetics.hpp"
#include "thermo/constants.hpp"
#include "base/error.hpp"
#include "thermo/reaction.hpp"
#include "support.hpp"

using namespace ely;
using ely::test::expect_error;
using ely::test::rel;
using ::testing::HasSubstr;

namespace {

std::unique_ptr<Cell> pem(std::initializer_list<std::pair<const char*, double>> set = {}) {
    return ely::test::cell_with("pem", set);
}

constexpr double kAtm = 101325.0;
const double kTemperatures[] = {323.15, 333.15, 343.15, 353.15, 363.15};
const double kCurrentDensities[] = {1000.0, 2000.0, 5000.0, 1e4, 2e4, 3e4, 4e4};  // A/m²
const std::pair<double, double> kPressures[] = {{kAtm, kAtm}, {kAtm, 30e5}, {10e5, 10e5}, {2e5, 50e5}};  // anode, cathode

}  // namespace

TEST(PemCell, TypicalVoltageAt2AcmSquared) {
    // 2 A/cm², 80 °C, 30 bar cathode, atmospheric anode: 1.8–2.0 V (common practice; IRENA 2020
    // ranges for PEM stacks at 1–3 A/cm²).
    const auto r = pem()->evaluate({2e4, 353.15, kAtm, 30e5});
    EXPECT_GT(r.voltage, 1.8);
    EXPECT_LT(r.voltage, 2.0);
    EXPECT_EQ(r.warnings, 0u);
}

TEST(PemCell, ReversibleThermoneutralAndOhmicParts) {
    const auto cell = pem();
    for (double t : kTemperatures)
        for (const auto& [pa, pc] : kPressures) {
            const auto r = cell->evaluate({1e4, t, pa, pc});
            EXPECT_EQ(r.reversible_voltage, reversible_voltage_liquid_water(t, pa, pc, 1.0));
            EXPECT_EQ(r.thermoneutral_voltage, thermoneutral_voltage_hhv(t));
            // Springer conductivity at the default λ = 21 and 177.8 µm plus 0.05 Ω cm² contact.
            const double expected = 1e4 * (177.8e-6 / membrane_conductivity_springer(21.0, t) + 5e-6);
            EXPECT_LT(rel(r.ohmic, expected), 1e-14);
            EXPECT_TRUE(r.gases_saturated);
            EXPECT_EQ(r.water_activity_anode, 1.0);
            EXPECT_EQ(r.water_activity_cathode, 1.0);
        }
}

TEST(PemCell, VoltagePartsSumExactlyToVoltage) {
    for (int model = 0; model <= 1; ++model) {
        const auto cell = pem({{"kinetics_model", model}});
        for (double t : kTemperatures)
            for (double j : kCurrentDensities)
                for (const auto& [pa, pc] : kPressures) {
                    const auto r = cell->evaluate({j, t, pa, pc});
                    EXPECT_EQ(r.voltage, r.reversible_voltage + r.activation_anode + r.activation_cathode + r.ohmic +
                                             r.concentration);
                    EXPECT_GE(r.activation_anode, 0.0);
                    EXPECT_GE(r.activation_cathode, 0.0);
                    EXPECT_GT(r.ohmic, 0.0);
                    EXPECT_GT(r.concentration, 0.0);
                    EXPECT_EQ(r.current_density, j);
                }
    }
}

TEST(PemCell, VoltageRisesWithCurrentDensityAndFallsWithTemperature) {
    // At fixed j >= 0.2 A/cm² the voltage falls as the stack warms.
    ely::test::expect_voltage_monotone(*pem(), kPressures, kTemperatures, kCurrentDensities,
                                       {2000.0, 5000.0, 1e4, 2e4, 3e4});
}

TEST(PemCell, CrossoverPurityAndFaradayEfficiency) {
    const auto cell = pem();
    for (double t : kTemperatures)
        for (const auto& [pa, pc] : kPressures) {
            double h2_in_o2_previous = 1.0, fe_previous = 0.0;
            for (double j : kCurrentDensities) {
                const auto r = cell->evaluate({j, t, pa, pc});
                // Hydrogen in oxygen rises as the load falls; Faraday efficiency rises with load.
                EXPECT_LT(r.h2_in_o2, h2_in_o2_previous);
                EXPECT_GT(r.faraday_efficiency, fe_previous);
                EXPECT_GT(r.faraday_efficiency, 0.0);
                EXPECT_LE(r.faraday_efficiency, 1.0);
                EXPECT_GE(r.h2_in_o2, 0.0);
                EXPECT_LT(r.h2_in_o2, 1.0);
                EXPECT_GE(r.o2_in_h2, 0.0);
                EXPECT_LT(r.o2_in_h2, 1.0);
                h2_in_o2_previous = r.h2_in_o2;
                fe_previous = r.faraday_efficiency;
                // Faraday efficiency is the hydrogen leaving at the cathode over j/(2F).
                EXPECT_LT(rel(r.faraday_efficiency, r.cathode_out[kH2] / (j / (2.0 * kFaraday))), 1e-15);
            }
            EXPECT_GT(fe_previous, 0.99);  // → 1 at high load
        }
    // Differential pressure: several per cent of hydrogen in oxygen at 10 % load of 2 A/cm²
    // (the known limit of differential-pressure PEM operation without recombiners; common practice).
    const auto low = cell->evaluate({2000.0, 353.15, kAtm, 30e5});
    EXPECT_GT(low.h2_in_o2, 0.02);
    EXPECT_LT(low.h2_in_o2, 0.1);
}

TEST(PemCell, ElementBalancesClose) {
    for (double recombination : {0.0, 0.4, 1.0}) {
        const auto cell = pem({{"o2_recombination_fraction", recombination}});
        for (double t : kTemperatures)
            for (double j : kCurrentDensities)
                for (const auto& [pa, pc] : kPressures) {
                    const auto r = cell->evaluate({j, t, pa, pc});
                    const double h_in = 2.0 * r.consumed[kH2O];
                    const double h_out = 2.0 * (r.cathode_out[kH2] + r.anode_out[kH2]);
                    const double o_in = r.consumed[kH2O];
                    const double o_out = 2.0 * (r.cathode_out[kO2] + r.anode_out[kO2]);
                    EXPECT_LT(std::fabs(h_in - h_out), 1e-14 * h_in);
                    EXPECT_LT(std::fabs(o_in - o_out), 1e-14 * o_in);
                    for (int k = 0; k < kComponentCount; ++k) {
                        EXPECT_GE(r.cathode_out[k], 0.0);
                        EXPECT_GE(r.anode_out[k], 0.0);
                    }
                }
    }
}

TEST(PemCell, OxygenRecombinationAndDarcyCrossover) {
    // Without recombination the permeated O2 stays in the hydrogen and costs no hydrogen.
    const auto full = pem()->evaluate({5000.0, 353.15, 10e5, 10e5});
    const auto none = pem({{"o2_recombination_fraction", 0.0}})->evaluate({5000.0, 353.15, 10e5, 10e5});
    EXPECT_EQ(full.o2_in_h2, 0.0);
    EXPECT_GT(none.o2_in_h2, 0.0);
    EXPECT_GT(none.faraday_efficiency, full.faraday_efficiency);
    EXPECT_EQ(none.anode_out[kH2], full.anode_out[kH2]);
    // The Darcy term adds hydrogen crossover only with the cathode above the anode.
    const auto no_darcy = pem({{"h2_darcy_coefficient", 0.0}});
    EXPECT_EQ(no_darcy->evaluate({5000.0, 353.15, 10e5, 10e5}).h2_in_o2, pem()->evaluate({5000.0, 353.15, 10e5, 10e5}).h2_in_o2);
    EXPECT_LT(no_darcy->evaluate({5000.0, 353.15, kAtm, 30e5}).h2_in_o2, pem()->evaluate({5000.0, 353.15, kAtm, 30e5}).h2_in_o2);
}

TEST(PemCell, ElectroosmoticDrag) {
    // water_drag = n_d·j/F with the default n_d = 2.5 (Zawodzinski et al. 1993; from memory).
    const auto r = pem()->evaluate({2e4, 353.15, kAtm, 30e5});
    EXPECT_LT(rel(r.water_drag, 2.5 * 2e4 / kFaraday), 1e-15);
}

TEST(PemCell, TafelOptionMatchesButlerVolmerAtHighOverpotential) {
    // The anode runs at j/j0 ~ 1e7: Tafel and Butler–Volmer agree far better than 1 mV.
    const auto bv = pem()->evaluate({2e4, 353.15, kAtm, 30e5});
    const auto tafel = pem({{"kinetics_model", 1.0}})->evaluate({2e4, 353.15, kAtm, 30e5});
    EXPECT_LT(std::fabs(bv.activation_anode - tafel.activation_anode), 1e-3);
    // The cathode (j/j0 = 2; at T = T_ref = 353.15 K, j0 = its reference value) follows the
    // Tafel form exactly when it is selected.
    EXPECT_EQ(tafel.activation_cathode, tafel_overpotential(2e4, 1e4, 0.5, 353.15));
}

TEST(PemCell, OpenCircuit) {
    const auto r = pem()->evaluate({0.0, 353.15, kAtm, 30e5});
    EXPECT_EQ(r.voltage, r.reversible_voltage);
    EXPECT_EQ(r.activation_anode + r.activation_cathode + r.ohmic + r.concentration, 0.0);
    for (int k = 0; k < kComponentCount; ++k) {
        EXPECT_EQ(r.cathode_out[k], 0.0);
        EXPECT_EQ(r.anode_out[k], 0.0);
        EXPECT_EQ(r.consumed[k], 0.0);
    }
}

TEST(PemCell, ErrorsOutsideEnvelopeNameTheLimit) {
    const auto cell = pem();
    expect_error([&] { cell->evaluate({1e4, 400.0, kAtm, kAtm}); }, ErrorKind::out_of_range, "temperature");
    expect_error([&] { cell->evaluate({1e4, 400.0, kAtm, kAtm}); }, ErrorKind::out_of_range, "373.15");
    expect_error([&] { cell->evaluate({1e4, 290.0, kAtm, kAtm}); }, ErrorKind::out_of_range, "298.15");
    expect_error([&] { cell->evaluate({1e4, 353.15, kAtm, 2e7}); }, ErrorKind::out_of_range, "cathode pressure");
    expect_error([&] { cell->evaluate({5.5e4, 353.15, kAtm, kAtm}); }, ErrorKind::out_of_range, "current density");
    expect_error([&] { cell->evaluate({-1.0, 353.15, kAtm, kAtm}); }, ErrorKind::out_of_range, "current density");
    expect_error([&] { cell->evaluate({1e4, std::nan(""), kAtm, kAtm}); }, ErrorKind::invalid_argument, "temperature");
    // Below the minimum load the crossover exceeds production: an error naming the minimum.
    expect_error([&] { cell->evaluate({20.0, 353.15, kAtm, 30e5}); }, ErrorKind::out_of_range, "minimum");
    // A soft limit only warns.
    EXPECT_TRUE(cell->evaluate({1e4, 368.15, kAtm, kAtm}).warnings & kWarnTemperatureExtrapolated);
}

TEST(PemCell, LimitingCurrentDensity) {
    const auto cell = pem({{"limiting_current_density", 3e4}});
    expect_error([&] { cell->evaluate({3e4, 353.15, kAtm, kAtm}); }, ErrorKind::out_of_range, "limiting current");
    expect_error([&] { cell->evaluate({3.5e4, 353.15, kAtm, kAtm}); }, ErrorKind::out_of_range, "limiting current");
    EXPECT_TRUE(cell->evaluate({0.96 * 3e4, 353.15, kAtm, kAtm}).warnings & kWarnNearLimitingCurrent);
    EXPECT_FALSE(cell->evaluate({0.90 * 3e4, 353.15, kAtm, kAtm}).warnings & kWarnNearLimitingCurrent);
    const double limit = cell->current_density_limit({0.0, 353.15, kAtm, kAtm});
    EXPECT_LT(limit, 3e4);
    EXPECT_GT(limit, 0.999 * 3e4);
    EXPECT_TRUE(std::isfinite(cell->evaluate({limit, 353.15, kAtm, kAtm}).voltage));
    // Default: the hard envelope limit (5 A/cm²) is below j_lim (6 A/cm²).
    EXPECT_EQ(pem()->current_density_limit({0.0, 353.15, kAtm, kAtm}), 5e4);
    EXPECT_FALSE(pem()->evaluate({5e4, 353.15, kAtm, kAtm}).warnings & kWarnNearLimitingCurrent);
}

TEST(PemCell, CloneAndParameterChecks) {
    const auto cell = pem();
    const auto copy = cell->clone();
    const auto a = cell->evaluate({1.5e4, 343.15, 2e5, 20e5}), b = copy->evaluate({1.5e4, 343.15, 2e5, 20e5});
    EXPECT_EQ(a.voltage, b.voltage);
    EXPECT_EQ(a.h2_in_o2, b.h2_in_o2);
    expect_error([] { pem({{"kinetics_model", 0.5}}); }, ErrorKind::invalid_argument, "kinetics_model");
    expect_error([] { pem({{"membrane_thickness", -1.0}}); }, ErrorKind::out_of_range, "membrane_thickness");
}
