// Alkaline (KOH) water electrolysis cell: reference values, consistency identities over grids,
// Faraday-efficiency options, errors. Every reference value names its source beside it.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "cells/cell.hpp"
#include "electrochem/conduction.hpp"
#include "electrochem/electrolyte.hpp"
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
    // Carmo et al., Int. J. Hydrogen Energy 38 (2013) 4901, Table 1: alkaline cells 1.8-2.4 V at their
    // nominal 0.2-0.4 A/cm2 and 60-80 C (from memory).
    for (double p : {kAtm, 30e5}) {
        const auto r = alkaline()->evaluate({4000.0, 353.15, p, p});
        EXPECT_GE(r.voltage, 1.8) << p;
        EXPECT_LE(r.voltage, 2.4) << p;
    }
}

TEST(AlkalineCell, ActivatedNickelCathodeOverpotential) {
    // Activated (Raney-type) nickel cathodes evolve hydrogen at about 0.1-0.2 V overpotential at 0.3 A/cm2 in
    // 30 wt% KOH at 80 C (from memory).
    const double eta = alkaline()->evaluate({3000.0, 353.15, kAtm, kAtm}).activation_cathode;
    EXPECT_GE(eta, 0.1);
    EXPECT_LE(eta, 0.2);
}

TEST(AlkalineCell, ReversibleVoltageUsesWaterActivityOfTheLye) {
    const auto cell = alkaline({{"koh_mass_fraction", 0.30}});
    for (double t : kTemperatures)
        for (const auto& [pa, pc] : kPressures) {
            const auto r = cell->evaluate({4000.0, t, pa, pc});
            const double a_w = koh_water_activity_balej(molality_from_mass_fraction(0.30, molar_mass::KOH), t);
            EXPECT_EQ(r.water_activity_anode, a_w);
            EXPECT_EQ(r.water_activity_cathode, a_w);
            EXPECT_EQ(r.reversible_voltage, reversible_voltage_liquid_water(t, pa, pc, a_w));
            EXPECT_EQ(r.thermoneutral_voltage, thermoneutral_voltage_hhv(t));
            // Less water vapour in the gases and a_w < 1 in the Nernst term: above the pure-water value.
            EXPECT_GT(r.reversible_voltage, reversible_voltage_liquid_water(t, pa, pc, 1.0));
        }
}

TEST(AlkalineCell, SeparatorResistanceAgainstItsDataSheet) {
    // A 500 um polysulfone-zirconia separator has an area resistance of about 0.3 ohm cm2 in 30 wt% KOH at 30 C
    // (manufacturer's data sheet, from memory). The default separator alone (electrode resistance removed),
    // zero gap, from the ohmic loss at 0.2 A/cm2: within 0.25-0.35 ohm cm2.
    const auto r = alkaline({{"electrode_resistance", 0.0}})->evaluate({2000.0, 303.15, kAtm, kAtm});
    EXPECT_GE(r.ohmic / 2000.0, 0.25e-4);
    EXPECT_LE(r.ohmic / 2000.0, 0.35e-4);
}

TEST(AlkalineCell, GapResistanceGrowsWithBubbles) {
    // With a gap, the Bruggeman-corrected lye resistance rises with the void fraction, which rises with
    // current density: the ohmic loss per unit current density grows with j. Without bubbles the gap adds a
    // resistance linear in its width: twice the gap, twice the extra resistance.
    const auto zero = alkaline();
    const auto gap2 = alkaline({{"gap_anode", 1e-3}, {"gap_cathode", 1e-3}});
    const auto gap4 = alkaline({{"gap_anode", 2e-3}, {"gap_cathode", 2e-3}});
    double previous = 0.0;
    for (double j : kCurrentDensities) {
        const double extra2 = gap2->evaluate({j, 353.15, kAtm, kAtm}).ohmic - zero->evaluate({j, 353.15, kAtm, kAtm}).ohmic;
        const double extra4 = gap4->evaluate({j, 353.15, kAtm, kAtm}).ohmic - zero->evaluate({j, 353.15, kAtm, kAtm}).ohmic;
        EXPECT_NEAR(extra4, 2.0 * extra2, 1e-12 * extra4);
        EXPECT_GT(extra4 / j, previous);
        previous = extra4 / j;
    }
    const auto clear2 = alkaline({{"gap_anode", 1e-3}, {"gap_cathode", 1e-3}, {"bubble_void_coefficient", 0.0}});
    const auto clear4 = alkaline({{"gap_anode", 2e-3}, {"gap_cathode", 2e-3}, {"bubble_void_coefficient", 0.0}});
    const double base = zero->evaluate({4000.0, 353.15, kAtm, kAtm}).ohmic;
    EXPECT_NEAR(clear4->evaluate({4000.0, 353.15, kAtm, kAtm}).ohmic - base,
                2.0 * (clear2->evaluate({4000.0, 353.15, kAtm, kAtm}).ohmic - base), 1e-12);
    // Bubbles (Bruggeman) make the gap's resistance larger than the clear lye's.
    EXPECT_GT(gap4->evaluate({4000.0, 353.15, kAtm, kAtm}).ohmic, clear4->evaluate({4000.0, 353.15, kAtm, kAtm}).ohmic);
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
                }
}

TEST(AlkalineCell, VoltageRisesWithCurrentDensityAndFallsWithTemperature) {
    for (const auto& cell : all_variants())
        ely::test::expect_voltage_monotone(*cell, kPressures, kTemperatures, kCurrentDensities,
                                           {2000.0, 4000.0, 6000.0, 1e4, 1.5e4});
}

TEST(AlkalineCell, HydrogenInOxygenLimitsThePartLoad) {
    // Haug, PhD thesis, Clausthal 2019: gas purity limits the part load of alkaline electrolysers to about
    // 10-40 % of nominal. de Groot, Kraakman & Barros, Int. J. Hydrogen Energy 47 (2022) 34773: a minimum load
    // of 10 % needs the pressure kept below about 8 bar. With the 2 % trip limit (half the 4 % lower
    // flammability limit; common practice) and 0.4 A/cm2 nominal at 80 C: at 30 bar the lowest load that keeps
    // H2 in O2 below 2 % lies in 10-40 %; at 8 bar 10 % load stays below it.
    const auto cell = alkaline();
    const auto lowest_load = [&](double p) {
        double lo = 0.005, hi = 1.0;  // fraction of 0.4 A/cm2; bisect on h2_in_o2 = 2 %
        for (int i = 0; i < 60; ++i) {
            const double mid = 0.5 * (lo + hi);
            (cell->evaluate({mid * 4000.0, 353.15, p, p}).h2_in_o2 > 0.02 ? lo : hi) = mid;
        }
        return hi;
    };
    EXPECT_GE(lowest_load(30e5), 0.10);
    EXPECT_LE(lowest_load(30e5), 0.40);
    EXPECT_LE(lowest_load(8e5), 0.10);
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
    // Supersaturation off: crossover in proportion to the gas partial pressure alone, much lower at 1 atm.
    const auto plain = alkaline({{"supersaturation_pressure", 0.0}});
    EXPECT_LT(plain->evaluate({200.0, 353.15, kAtm, kAtm}).h2_in_o2, 0.2 * cell->evaluate({200.0, 353.15, kAtm, kAtm}).h2_in_o2);
    // Oxygen stays in the hydrogen by default (no recombination on the cathode).
    EXPECT_GT(cell->evaluate({4000.0, 353.15, 30e5, 30e5}).o2_in_h2, 0.0);
}

TEST(AlkalineCell, UllebergFaradayEfficiencyOption) {
    // faraday_model 1: the hydrogen delivered follows Ulleberg (2003), whose table gives f1 = 150, 200, 250
    // (mA/cm2)^2 and f2 = 0.990, 0.985, 0.980 at 40, 60, 80 C (from memory). At 100 mA/cm2 [D from the rows]:
    // 40 C: 1e4/1.015e4 x 0.990 = 0.975369; 60 C: 1e4/1.02e4 x 0.985 = 0.965686; 80 C: 1e4/1.025e4 x 0.98 =
    // 0.956098.
    const auto cell = alkaline({{"faraday_model", 1}});
    EXPECT_NEAR(cell->evaluate({1000.0, 313.15, kAtm, kAtm}).faraday_efficiency, 0.975369, 1e-6);
    EXPECT_NEAR(cell->evaluate({1000.0, 333.15, kAtm, kAtm}).faraday_efficiency, 0.965686, 1e-6);
    EXPECT_NEAR(cell->evaluate({1000.0, 353.15, kAtm, kAtm}).faraday_efficiency, 0.956098, 1e-6);
    // Outside the table's 40-80 C the result is flagged as extrapolated.
    EXPECT_TRUE(cell->evaluate({1000.0, 358.15, kAtm, kAtm}).warnings & kWarnTemperatureExtrapolated);
    EXPECT_FALSE(cell->evaluate({1000.0, 343.15, kAtm, kAtm}).warnings & kWarnTemperatureExtrapolated);
    // The lost current bypasses the electrodes without lowering the current they carry: the voltage is the
    // crossover model's at the same terminal current, while crossover still sets the purities.
    const auto physics = alkaline();
    for (double j : {100.0, 200.0, 1000.0, 4000.0, 1e4})
        for (double p : {kAtm, 30e5}) {
            const auto r = cell->evaluate({j, 353.15, p, p});
            const auto q = physics->evaluate({j, 353.15, p, p});
            EXPECT_EQ(r.voltage, q.voltage) << j;
            EXPECT_EQ(r.anode_out[kH2], q.anode_out[kH2]);
            EXPECT_LT(r.faraday_efficiency, q.faraday_efficiency);
        }
}

TEST(AlkalineCell, ShuntCurrentOptions) {
    const auto none = alkaline({{"koh_mass_fraction", 0.30}});
    // Fixed fraction: exactly that fraction of the current makes no gas.
    const auto fraction = alkaline({{"shunt_model", 1}, {"shunt_current_fraction", 0.03}});
    for (double j : {800.0, 4000.0, 1e4}) {
        const auto a = none->evaluate({j, 353.15, 16e5, 16e5});
        const auto b = fraction->evaluate({j, 353.15, 16e5, 16e5});
        EXPECT_NEAR(b.faraday_efficiency, a.faraday_efficiency - 0.03, 1e-12);
        EXPECT_EQ(b.anode_out[kH2], a.anode_out[kH2]);
    }
    // Resistor network: a shunt current ∝ cell voltage × lye conductivity, nearly independent of the load, so
    // its share grows as the load falls.
    const auto network = alkaline({{"shunt_model", 2}});
    double previous_loss = 0.0;
    for (double j : {1.5e4, 1e4, 4000.0, 2000.0, 800.0}) {
        const double loss = none->evaluate({j, 353.15, 16e5, 16e5}).faraday_efficiency -
                            network->evaluate({j, 353.15, 16e5, 16e5}).faraday_efficiency;
        EXPECT_GT(loss, previous_loss);
        previous_loss = loss;
    }
    // Hand calculation for two cells on an ideal manifold (every number shown): cell 0 at electrolyte potential
    // 0, cell 1 at -V, manifold at -V/2; the port of cell 0 carries V/(2 R), that of cell 1 -V/(2 R); the
    // electrode current of cell 0 is short by V/(2 R), cell 1 by nothing: the mean lost current is V/(4 R) per
    // cell, R = (L/A)/sigma. With L/A = 2500 1/m, A = 2.5 m2: lost j = V sigma/(4 x 2500 x 2.5).
    const auto pair = alkaline({{"shunt_model", 2}, {"shunt_cells", 2}, {"shunt_manifold_length_per_area", 0.0},
                                {"shunt_channel_length_per_area", 2500.0}, {"shunt_cell_area", 2.5},
                                {"koh_mass_fraction", 0.30}});
    const auto b = pair->evaluate({4000.0, 353.15, 16e5, 16e5});
    const double sigma = koh_conductivity_gilliam(koh_molarity(0.30, 353.15), 353.15);
    const double lost = none->evaluate({4000.0, 353.15, 16e5, 16e5}).faraday_efficiency - b.faraday_efficiency;
    EXPECT_NEAR(lost * 4000.0, b.voltage * sigma / (4.0 * 2500.0 * 2.5), 1e-9 * lost * 4000.0);
    // About 0.6 % of 0.4 A/cm² for 100 cells with these manifold proportions [D].
    const double nominal = none->evaluate({4000.0, 353.15, 16e5, 16e5}).faraday_efficiency -
                           network->evaluate({4000.0, 353.15, 16e5, 16e5}).faraday_efficiency;
    EXPECT_GT(nominal, 0.003);
    EXPECT_LT(nominal, 0.02);
    expect_error([] { alkaline({{"shunt_model", 1.5}}); }, ErrorKind::invalid_argument, "shunt_model");
    // One limit for the network's cell count, the parameter table's (the stack's own limit): 10000 cells.
    EXPECT_NO_THROW(alkaline({{"shunt_model", 2}, {"shunt_cells", 10000}}));
    expect_error([] { alkaline({{"shunt_cells", 10001}}); }, ErrorKind::out_of_range, "10000");
}

TEST(AlkalineCell, ErrorsNameTheLimit) {
    const auto cell = alkaline();
    expect_error([&] { cell->evaluate({4000.0, 380.0, kAtm, kAtm}); }, ErrorKind::out_of_range, "temperature");
    expect_error([&] { cell->evaluate({4000.0, 380.0, kAtm, kAtm}); }, ErrorKind::out_of_range, "373.15");
    expect_error([&] { cell->evaluate({4000.0, 353.15, 6e6, kAtm}); }, ErrorKind::out_of_range, "anode pressure");
    expect_error([&] { cell->evaluate({3e4, 353.15, kAtm, kAtm}); }, ErrorKind::out_of_range, "current density");
    // Below the crossover minimum the cell is in standby (no error): its anode gas is mostly hydrogen.
    EXPECT_GT(cell->evaluate({1.0, 353.15, 30e5, 30e5}).h2_in_o2, 0.5);
    expect_error([] { alkaline({{"shunt_model", 2}})->evaluate({10.0, 353.15, kAtm, kAtm}); },
                 ErrorKind::out_of_range, "shunt currents would carry the whole current");
    const auto limited = alkaline({{"limiting_current_density", 1.2e4}});
    expect_error([&] { limited->evaluate({1.2e4, 353.15, kAtm, kAtm}); }, ErrorKind::out_of_range, "limiting current");
    EXPECT_TRUE(limited->evaluate({0.97 * 1.2e4, 353.15, kAtm, kAtm}).warnings & kWarnNearLimitingCurrent);
    EXPECT_LT(limited->current_density_limit({0.0, 353.15, kAtm, kAtm}), 1.2e4);
    EXPECT_EQ(alkaline()->current_density_limit({0.0, 353.15, kAtm, kAtm}), alkaline()->envelope().current_density_max);
    EXPECT_TRUE(cell->evaluate({4000.0, 313.15, kAtm, kAtm}).warnings & kWarnTemperatureExtrapolated);
    const auto open = cell->evaluate({0.0, 353.15, kAtm, kAtm});
    EXPECT_EQ(open.voltage, open.reversible_voltage);
    EXPECT_EQ(open.consumed[kH2O], 0.0);
}
