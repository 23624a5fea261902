// Alkaline (KOH) water electrolysis cell: reference values, consistency identities over grids,
// Faraday-efficiency options, errors. Every reference value names its source beside it.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "cells/cell.hpp"
#include "electrochem/conduction.hpp"
#include "electrochem/crossover.hpp"
#include "thermo/constants.hpp"
#include "base/error.hpp"
#include "thermo/reaction.hpp"
#include "support.hpp"

using namespace ely;
using ely::test::expect_error;
using ely::test::rel;
using ::testing::HasSubstr;

namespace {

std::unique_ptr<Cell> alkaline(std::initializer_list<std::pair<const char*, double>> set = {}) {
    return ely::test::cell_with("alkaline", set);
}

constexpr double kAtm = 101325.0;
const double kTemperatures[] = {323.15, 333.15, 343.15, 353.15, 363.15};
const double kCurrentDensities[] = {400.0, 800.0, 2000.0, 4000.0, 6000.0, 1e4, 1.5e4};  // A/m²
const std::pair<double, double> kPressures[] = {{kAtm, kAtm}, {16e5, 16e5}, {30e5, 30e5}};  // anode, cathode

// Every option of the cell, for the identities that must hold in all of them.
std::vector<std::unique_ptr<Cell>> all_variants() {
    std::vector<std::unique_ptr<Cell>> cells;
    cells.push_back(alkaline());
    cells.push_back(alkaline({{"kinetics_model", 1}}));
    cells.push_back(alkaline({{"gap_anode", 2e-3}, {"gap_cathode", 2e-3}}));
    cells.push_back(alkaline({{"o2_recombination_fraction", 0.5}}));
    cells.push_back(alkaline({{"faraday_model", 1}}));
    cells.push_back(alkaline({{"shunt_model", 1}, {"shunt_current_fraction", 0.02}}));
    cells.push_back(alkaline({{"shunt_model", 2}}));
    return cells;
}

}  // namespace

TEST(AlkalineCell, TypicalVoltageAt04AcmSquared) {
    // 0.4 A/cm², 80 °C, 30 wt% KOH: 1.8–2.1 V (common practice; IRENA 2020: alkaline 0.2–0.8 A/cm²).
    for (double p : {kAtm, 30e5}) {
        const auto r = alkaline()->evaluate({4000.0, 353.15, p, p});
        EXPECT_GT(r.voltage, 1.8) << p;
        EXPECT_LT(r.voltage, 2.1) << p;
    }
}

TEST(AlkalineCell, ReversibleVoltageUsesWaterActivityOfTheLye) {
    const auto cell = alkaline();
    for (double t : kTemperatures)
        for (const auto& [pa, pc] : kPressures) {
            const auto r = cell->evaluate({4000.0, t, pa, pc});
            const double a_w = koh_water_activity_balej(koh_molality(0.30), t);
            EXPECT_EQ(r.water_activity_anode, a_w);
            EXPECT_EQ(r.water_activity_cathode, a_w);
            EXPECT_EQ(r.reversible_voltage, reversible_voltage_liquid_water(t, pa, pc, a_w));
            EXPECT_EQ(r.thermoneutral_voltage, thermoneutral_voltage_hhv(t));
            // Less water vapour in the gases and a_w < 1 in the Nernst term: above the pure-water value.
            EXPECT_GT(r.reversible_voltage, reversible_voltage_liquid_water(t, pa, pc, 1.0));
            // Zero-gap: separator (MacMullin 4 × 500 µm) and 0.1 Ω cm² electrode resistance only.
            const double sigma = koh_conductivity_gilliam(koh_molarity(0.30, t), t);
            EXPECT_LT(rel(r.ohmic, 4000.0 * (4.0 * 500e-6 / sigma + 1e-5)), 1e-14);
        }
}

TEST(AlkalineCell, GapResistanceGrowsWithBubbles) {
    // With a gap, the Bruggeman-corrected lye resistance rises with the void fraction, which rises
    // with current density: the ohmic loss per unit current density grows with j.
    const auto gap = alkaline({{"gap_anode", 2e-3}, {"gap_cathode", 2e-3}});
    const auto zero = alkaline();
    double previous = 0.0;
    for (double j : kCurrentDensities) {
        const auto r = gap->evaluate({j, 353.15, kAtm, kAtm});
        const double sigma = koh_conductivity_gilliam(koh_molarity(0.30, 353.15), 353.15);
        const double eps = bubble_void_fraction({0.023 * 2.0 / 3.0, 0.3, 0.5}, j);
        const double expected = j * (4.0 * 500e-6 / sigma + 1e-5 + 4e-3 / bruggeman_conductivity(sigma, eps));
        EXPECT_LT(rel(r.ohmic, expected), 1e-13);
        EXPECT_GT(r.ohmic / j, previous);
        previous = r.ohmic / j;
        EXPECT_GT(r.ohmic, zero->evaluate({j, 353.15, kAtm, kAtm}).ohmic + j * 4e-3 / sigma);
    }
}

TEST(AlkalineCell, VoltagePartsSumExactlyAndElementsBalanceInEveryOption) {
    for (const auto& cell : all_variants())
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
                    const double h_in = 2.0 * r.consumed[kH2O];
                    const double h_out = 2.0 * (r.cathode_out[kH2] + r.anode_out[kH2]);
                    const double o_in = r.consumed[kH2O];
                    const double o_out = 2.0 * (r.cathode_out[kO2] + r.anode_out[kO2]);
                    EXPECT_LT(std::fabs(h_in - h_out), 1e-14 * h_in);
                    EXPECT_LT(std::fabs(o_in - o_out), 1e-14 * o_in);
                    EXPECT_GT(r.faraday_efficiency, 0.0);
                    EXPECT_LE(r.faraday_efficiency, 1.0);
                    EXPECT_GE(r.h2_in_o2, 0.0);
                    EXPECT_LT(r.h2_in_o2, 1.0);
                    EXPECT_GE(r.o2_in_h2, 0.0);
                    EXPECT_LT(r.o2_in_h2, 1.0);
                    EXPECT_LT(rel(r.faraday_efficiency, r.cathode_out[kH2] / (j / (2.0 * kFaraday))), 1e-15);
                }
}

TEST(AlkalineCell, VoltageRisesWithCurrentDensityAndFallsWithTemperature) {
    for (const auto& cell : all_variants())
        ely::test::expect_voltage_monotone(*cell, kPressures, kTemperatures, kCurrentDensities,
                                           {2000.0, 4000.0, 6000.0, 1e4, 1.5e4});
}

TEST(AlkalineCell, HydrogenInOxygenAtLowLoad) {
    // Plants report 1–2 % hydrogen in oxygen near 10–20 % load (common practice); the default
    // effective permeability and supersaturation are set for 80 °C and 0.4 A/cm² nominal: about
    // 1.5 % at 15 % load and 30 bar, about 1 % at 5 % load and 1 atm.
    const auto cell = alkaline();
    const double h15 = cell->evaluate({600.0, 353.15, 30e5, 30e5}).h2_in_o2;  // 15 % load
    EXPECT_GT(h15, 0.01);
    EXPECT_LT(h15, 0.02);
    EXPECT_GT(cell->evaluate({400.0, 353.15, 30e5, 30e5}).h2_in_o2, 0.02);   // 10 % load
    EXPECT_LT(cell->evaluate({800.0, 353.15, 30e5, 30e5}).h2_in_o2, 0.015);  // 20 % load
    const double h5_atm = cell->evaluate({200.0, 353.15, kAtm, kAtm}).h2_in_o2;
    EXPECT_GT(h5_atm, 0.007);
    EXPECT_LT(h5_atm, 0.015);
    // Supersaturation off: crossover in proportion to the gas partial pressure alone.
    const auto plain = alkaline({{"supersaturation_pressure", 0.0}});
    EXPECT_LT(plain->evaluate({200.0, 353.15, kAtm, kAtm}).h2_in_o2, 0.2 * h5_atm);
    for (double t : kTemperatures)
        for (const auto& [pa, pc] : kPressures) {
            double previous = 1.0, fe_previous = 0.0;
            for (double j : kCurrentDensities) {
                const auto r = cell->evaluate({j, t, pa, pc});
                EXPECT_LT(r.h2_in_o2, previous);
                EXPECT_GT(r.faraday_efficiency, fe_previous);
                previous = r.h2_in_o2;
                fe_previous = r.faraday_efficiency;
            }
            EXPECT_GT(fe_previous, 0.999);
        }
    // Oxygen stays in the hydrogen by default (no recombination on the cathode).
    EXPECT_GT(cell->evaluate({4000.0, 353.15, 30e5, 30e5}).o2_in_h2, 0.0);
}

TEST(AlkalineCell, UllebergFaradayEfficiencyOption) {
    // faraday_model 1: the hydrogen delivered follows Ulleberg (2003) exactly, f1 = 250 (mA/cm²)²,
    // f2 = 0.96 (from memory); the lost current makes no gas; crossover still sets the purities.
    const auto cell = alkaline({{"faraday_model", 1}});
    const auto physics = alkaline();
    for (double j : {200.0, 1000.0, 3000.0, 4000.0, 1e4})
        for (double p : {kAtm, 30e5}) {
            const auto r = cell->evaluate({j, 353.15, p, p});
            EXPECT_LT(rel(r.faraday_efficiency, faraday_efficiency_ulleberg(j, 2.5e4, 0.96)), 1e-12) << j;
            const auto q = physics->evaluate({j, 353.15, p, p});
            EXPECT_EQ(r.anode_out[kH2], q.anode_out[kH2]);
            EXPECT_LT(r.faraday_efficiency, q.faraday_efficiency);
            EXPECT_LT(r.voltage, q.voltage);  // electrodes carry only the gas-making current
        }
    // Ulleberg's points: 20, 100, 300 mA/cm² → 0.5908, 0.9366, 0.9573 [D from f1, f2].
    EXPECT_NEAR(cell->evaluate({200.0, 353.15, kAtm, kAtm}).faraday_efficiency, 0.590769, 1e-6);
    EXPECT_NEAR(cell->evaluate({1000.0, 353.15, kAtm, kAtm}).faraday_efficiency, 0.936585, 1e-6);
    EXPECT_NEAR(cell->evaluate({3000.0, 353.15, kAtm, kAtm}).faraday_efficiency, 0.957341, 1e-6);
}

TEST(AlkalineCell, ShuntCurrentOptions) {
    const auto none = alkaline();
    // Fixed fraction: exactly that fraction of the current makes no gas.
    const auto fraction = alkaline({{"shunt_model", 1}, {"shunt_current_fraction", 0.03}});
    for (double j : {800.0, 4000.0, 1e4}) {
        const auto a = none->evaluate({j, 353.15, 16e5, 16e5});
        const auto b = fraction->evaluate({j, 353.15, 16e5, 16e5});
        EXPECT_NEAR(b.faraday_efficiency, a.faraday_efficiency - 0.03, 1e-12);
        EXPECT_EQ(b.anode_out[kH2], a.anode_out[kH2]);
    }
    // Resistor network: a shunt current ∝ cell voltage × lye conductivity, nearly independent of
    // the load, so its share grows as the load falls.
    const auto network = alkaline({{"shunt_model", 2}});
    const double g = shunt_loss_factor(100, 1.25 / 2500.0);
    double previous_loss = 0.0;
    for (double j : {1.5e4, 1e4, 4000.0, 2000.0, 800.0}) {
        const auto a = none->evaluate({j, 353.15, 16e5, 16e5});
        const auto b = network->evaluate({j, 353.15, 16e5, 16e5});
        const double sigma = koh_conductivity_gilliam(koh_molarity(0.30, 353.15), 353.15);
        const double j_shunt = g * b.voltage * sigma / (100.0 * 2500.0 * 2.5);  // G V/(N R_ch A) [D]
        const double loss = a.faraday_efficiency - b.faraday_efficiency;
        EXPECT_LT(rel(loss, j_shunt / j), 1e-11) << j;
        EXPECT_GT(loss, previous_loss);
        previous_loss = loss;
    }
    // About 0.6 % of 0.4 A/cm² for 100 cells with these manifold proportions [D].
    const double nominal = none->evaluate({4000.0, 353.15, 16e5, 16e5}).faraday_efficiency -
                           network->evaluate({4000.0, 353.15, 16e5, 16e5}).faraday_efficiency;
    EXPECT_GT(nominal, 0.003);
    EXPECT_LT(nominal, 0.02);
    expect_error([] { alkaline({{"shunt_model", 1.5}}); }, ErrorKind::invalid_argument, "shunt_model");
}

TEST(AlkalineCell, ErrorsNameTheLimit) {
    const auto cell = alkaline();
    expect_error([&] { cell->evaluate({4000.0, 380.0, kAtm, kAtm}); }, ErrorKind::out_of_range, "temperature");
    expect_error([&] { cell->evaluate({4000.0, 380.0, kAtm, kAtm}); }, ErrorKind::out_of_range, "373.15");
    expect_error([&] { cell->evaluate({4000.0, 353.15, 6e6, kAtm}); }, ErrorKind::out_of_range, "anode pressure");
    expect_error([&] { cell->evaluate({3e4, 353.15, kAtm, kAtm}); }, ErrorKind::out_of_range, "current density");
    expect_error([&] { cell->evaluate({1.0, 353.15, 30e5, 30e5}); }, ErrorKind::out_of_range, "minimum");
    expect_error([] { alkaline({{"shunt_model", 2}})->evaluate({10.0, 353.15, kAtm, kAtm}); },
                 ErrorKind::out_of_range, "minimum");
    const auto limited = alkaline({{"limiting_current_density", 1.2e4}});
    expect_error([&] { limited->evaluate({1.2e4, 353.15, kAtm, kAtm}); }, ErrorKind::out_of_range, "limiting current");
    EXPECT_TRUE(limited->evaluate({0.97 * 1.2e4, 353.15, kAtm, kAtm}).warnings & kWarnNearLimitingCurrent);
    EXPECT_LT(limited->current_density_limit({0.0, 353.15, kAtm, kAtm}), 1.2e4);
    EXPECT_EQ(alkaline()->current_density_limit({0.0, 353.15, kAtm, kAtm}), 2e4);
    EXPECT_TRUE(cell->evaluate({4000.0, 313.15, kAtm, kAtm}).warnings & kWarnTemperatureExtrapolated);
    const auto open = cell->evaluate({0.0, 353.15, kAtm, kAtm});
    EXPECT_EQ(open.voltage, open.reversible_voltage);
    EXPECT_EQ(open.consumed[kH2O], 0.0);
}
