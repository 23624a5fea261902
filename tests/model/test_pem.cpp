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
#include "thermo/water.hpp"
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

TEST(PemCell, NominalLoadIsFarFromTheLimitingCurrent) {
    // The voltage band of the nominal 1-2 A/cm2 is checked in test_published_bands.cpp; there the
    // concentration loss must not be near its limit.
    for (double j : {1e4, 1.5e4, 2e4})
        for (double t : {323.15, 353.15})
            EXPECT_EQ(pem()->evaluate({j, t, kAtm, 30e5}).warnings & kWarnNearLimitingCurrent, 0u) << j << " " << t;
}

TEST(PemCell, MembraneResistanceAgainstMeasuredNafion117) {
    // Slade et al., J. Electrochem. Soc. 149 (2002) A1556: a 178 um extruded 1100 EW membrane has an area
    // resistance of 0.16 ohm cm2 at 298 K (ex situ, 1 M H2SO4). The default membrane alone (contact resistance
    // removed) at 298.15 K, from its ohmic loss at 1 A/cm2: within 15 %.
    const auto r = pem({{"contact_resistance", 0.0}})->evaluate({1e4, 298.15, kAtm, kAtm});
    EXPECT_NEAR(r.ohmic / 1e4, 0.16e-4, 0.15 * 0.16e-4);
    // In a stack the cell adds plate, transport-layer and contact resistances: about 0.2 ohm cm2 at 80 C for
    // a 178 um membrane (from memory).
    const auto stack = pem()->evaluate({1e4, 353.15, kAtm, kAtm});
    EXPECT_NEAR(stack.ohmic / 1e4, 0.2e-4, 0.02e-4);
}

TEST(PemCell, HydrogenEvolutionOverpotentialIsSmall) {
    // Pt/C hydrogen evolution is fast: about 10 mV at 2 A/cm2 in a practical cathode (from memory).
    const auto r = pem()->evaluate({2e4, 353.15, kAtm, 30e5});
    EXPECT_GT(r.activation_cathode, 0.002);
    EXPECT_LT(r.activation_cathode, 0.015);
}

TEST(PemCell, ReversibleVoltageIsTheWetGasNernstVoltage) {
    const auto cell = pem();
    for (double t : kTemperatures)
        for (const auto& [pa, pc] : kPressures) {
            const auto r = cell->evaluate({1e4, t, pa, pc});
            EXPECT_EQ(r.reversible_voltage, reversible_voltage_liquid_water(t, pa, pc, 1.0));
            EXPECT_EQ(r.thermoneutral_voltage, thermoneutral_voltage_hhv(t));
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
            double fe_previous = 0.0;
            for (double j : kCurrentDensities) {
                const auto r = cell->evaluate({j, t, pa, pc});
                // Faraday efficiency rises with load; purities stay physical.
                EXPECT_GT(r.faraday_efficiency, fe_previous);
                EXPECT_GT(r.faraday_efficiency, 0.0);
                EXPECT_LE(r.faraday_efficiency, 1.0);
                EXPECT_GT(r.h2_in_o2, 0.0);
                EXPECT_LT(r.h2_in_o2, 1.0);
                EXPECT_GE(r.o2_in_h2, 0.0);
                EXPECT_LT(r.o2_in_h2, 1.0);
                fe_previous = r.faraday_efficiency;
            }
            EXPECT_GT(fe_previous, 0.97);
        }
}

TEST(PemCell, HydrogenPermeabilityOfTheMembrane) {
    // Trinke et al., J. Electrochem. Soc. 163 (2016) F3164: diffusive hydrogen permeability 2.95e-14 mol/(m s Pa)
    // at 60 C, measured in an electrolysis cell. The default at 60 C, from the crossover flux at open-circuit
    // conditions (supersaturation off, no pressure difference): N = P p_H2/delta.
    // Nafion 117: 7 mil = 177.8 um nominal dry thickness (common practice), set explicitly.
    const auto cell = pem({{"h2_supersaturation_coefficient", 0.0}, {"membrane_thickness", 177.8e-6}});
    const double t = 333.15, p = 10e5;
    const auto r = cell->evaluate({2e4, t, p, p});
    const double p_h2 = p - 19946.4;  // IAPWS-IF97 saturation pressure at 60 C: 19.946 kPa (rounded)
    EXPECT_NEAR(r.anode_out[kH2] * 177.8e-6 / p_h2, 2.95e-14, 0.005 * 2.95e-14);
}

TEST(PemCell, HydrogenCrossoverRisesLinearlyWithCurrentDensity) {
    // Trinke et al., Int. J. Hydrogen Energy 42 (2017) 14355: the hydrogen permeation rises linearly with the
    // current density (supersaturation of dissolved hydrogen in the cathode catalyst layer).
    const auto cell = pem();
    for (const auto& [pa, pc] : kPressures) {
        const double n1 = cell->evaluate({5000.0, 343.15, pa, pc}).anode_out[kH2];
        const double n2 = cell->evaluate({1e4, 343.15, pa, pc}).anode_out[kH2];
        const double n3 = cell->evaluate({1.5e4, 343.15, pa, pc}).anode_out[kH2];
        EXPECT_GT(n2, n1);
        EXPECT_NEAR(n3 - n2, n2 - n1, 1e-9 * n3);  // equal steps: a straight line
    }
    // Trinke et al., J. Electrochem. Soc. 165 (2018) F502 (Nafion 117, 60 C): at 1 A/cm2 and atmospheric
    // pressure the supersaturation carries 98 % of the permeation flux.
    const auto with = pem()->evaluate({1e4, 333.15, kAtm, kAtm});
    const auto without = pem({{"h2_supersaturation_coefficient", 0.0}})->evaluate({1e4, 333.15, kAtm, kAtm});
    EXPECT_NEAR(1.0 - without.anode_out[kH2] / with.anode_out[kH2], 0.98, 0.005);
}

TEST(PemCell, DifferentialPressureBringsTheAnodeGasNearTheFlammabilityLimit) {
    // Trinke et al. 2017: high cathode pressures bring the hydrogen in the anode gas close to the lower
    // explosion limit (4 % in oxygen); with 30 bar on the cathode the default cell passes the common 2 % trip
    // limit (half the limit; common practice) at every load.
    const auto cell = pem();
    for (double j : {5000.0, 1e4, 2e4}) EXPECT_GT(cell->evaluate({j, 353.15, kAtm, 30e5}).h2_in_o2, 0.02) << j;
    // A recombination catalyst at the anode burns most of it; the Faraday efficiency does not change (the
    // hydrogen is lost from the product either way) and the oxygen it burns is half the hydrogen.
    const auto base = cell->evaluate({1e4, 353.15, kAtm, 30e5});
    const auto rec = pem({{"h2_recombination_fraction_anode", 0.9}})->evaluate({1e4, 353.15, kAtm, 30e5});
    EXPECT_LT(rec.h2_in_o2, 0.2 * base.h2_in_o2);
    EXPECT_DOUBLE_EQ(rec.faraday_efficiency, base.faraday_efficiency);
    EXPECT_NEAR(base.anode_out[kO2] - rec.anode_out[kO2], 0.5 * (base.anode_out[kH2] - rec.anode_out[kH2]),
                1e-12 * base.anode_out[kO2]);
}

TEST(PemCell, ElementBalancesClose) {
    for (double recombination : {0.0, 0.4, 1.0}) {
        const auto cell = pem({{"o2_recombination_fraction", recombination},
                               {"h2_recombination_fraction_anode", 1.0 - recombination}});
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
    // Zawodzinski et al., J. Electrochem. Soc. 140 (1993) 1981: 2.5 H2O per H+ for a liquid-equilibrated
    // membrane (from memory). Two protons make one hydrogen molecule: 5 mol of water per mol of hydrogen
    // formed at the cathode, j/2F.
    const auto r = pem()->evaluate({2e4, 353.15, kAtm, 30e5});
    EXPECT_NEAR(r.water_drag / (2e4 / (2.0 * kFaraday)), 5.0, 1e-12);
}

TEST(PemCell, TafelOptionMatchesButlerVolmerAtHighOverpotential) {
    // The anode runs at j/j0 ~ 1e7: Tafel and Butler-Volmer agree far better than 1 mV.
    const auto bv = pem({{"anode_transfer_coefficient_forward", 1.5}, {"anode_transfer_coefficient_backward", 1.5}})
                        ->evaluate({2e4, 353.15, kAtm, 30e5});
    const auto tafel_cell = pem({{"kinetics_model", 1.0}, {"anode_transfer_coefficient_forward", 1.5},
                                 {"anode_transfer_coefficient_backward", 1.5}});
    const auto tafel = tafel_cell->evaluate({2e4, 353.15, kAtm, 30e5});
    EXPECT_LT(std::fabs(bv.activation_anode - tafel.activation_anode), 1e-3);
    // Tafel slope per decade 2.303 RT/(alpha F) (PHYSICS.md): the anode's alpha 1.5 at 80 C gives
    // 2.302585 x 8.314462618 x 353.15/(1.5 x 96485.33212) = 46.71 mV per decade [D].
    const auto decade = tafel_cell->evaluate({2e3, 353.15, kAtm, 30e5});
    EXPECT_NEAR(tafel.activation_anode - decade.activation_anode, 0.046710, 1e-5);
}

TEST(PemCell, OpenCircuitUnderPressureIsHotStandby) {
    // No current, 30 bar of hydrogen on the cathode: nothing is made, but the membrane still passes hydrogen
    // (Fick with Henry's law, N = P p_H2/delta, and the pressure-driven part; Trinke et al. 2016). All of it
    // is drawn back from the product line and leaves with the anode gas, which is pure hydrogen (dry basis):
    // no operating point may report a safe anode gas that is not.
    // Permeability at its reference temperature 353.15 K (Arrhenius factor 1), set here with the thickness and
    // the Darcy coefficient so that the hand calculation below owns its inputs.
    const double permeability = 3.1e-14, thickness = 150e-6, darcy_coefficient = 3e-22;
    const auto r = pem({{"h2_permeability", permeability}, {"membrane_thickness", thickness},
                        {"h2_darcy_coefficient", darcy_coefficient}})
                       ->evaluate({0.0, 353.15, kAtm, 30e5});
    EXPECT_EQ(r.voltage, r.reversible_voltage);
    EXPECT_EQ(r.activation_anode + r.activation_cathode + r.ohmic + r.concentration, 0.0);
    const double p_h2 = 30e5 - water_saturation_pressure(353.15);
    const double fick = permeability * p_h2 / thickness, darcy = darcy_coefficient * p_h2 * (30e5 - kAtm) / thickness;
    EXPECT_NEAR(r.anode_out[kH2], fick + darcy, 1e-12 * (fick + darcy));
    EXPECT_EQ(r.consumed[kH2], r.anode_out[kH2]);
    EXPECT_EQ(r.cathode_out[kH2], 0.0);
    EXPECT_EQ(r.anode_out[kO2] + r.cathode_out[kO2] + r.consumed[kH2O], 0.0);  // no oxygen made, none crosses
    EXPECT_EQ(r.h2_in_o2, 1.0);
    EXPECT_EQ(r.faraday_efficiency, 0.0);
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
    // Below the minimum load the crossover exceeds production (standby): nothing leaves as product, the
    // shortfall is drawn back, and the anode gas is mostly hydrogen.
    const double j_min = cell->current_density_minimum({0.0, 353.15, kAtm, 30e5});
    const auto below = cell->evaluate({0.9 * j_min, 353.15, kAtm, 30e5});
    EXPECT_EQ(below.cathode_out[kH2], 0.0);
    EXPECT_GT(below.consumed[kH2], 0.0);
    EXPECT_GT(below.h2_in_o2, 0.5);
    // Just above it the hydrogen leaving the cathode is (nearly) nothing: the minimum is where production
    // equals crossover.
    EXPECT_LT(cell->evaluate({1.0001 * j_min, 353.15, kAtm, 30e5}).faraday_efficiency, 1e-3);
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
    // Default: the hard envelope limit is below j_lim, so the limit is the envelope's.
    EXPECT_EQ(pem()->current_density_limit({0.0, 353.15, kAtm, kAtm}), pem()->envelope().current_density_max);
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
