// Custom cell from competing half-reactions. Standard potentials: CRC Handbook, Vanýsek,
// "Electrochemical Series", 25 °C vs SHE. Kinetic numbers of the zinc cell are invented demo
// values (labelled), chosen only to be of a plausible order.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <limits>

#include "cells/custom.hpp"
#include "electrochem/kinetics.hpp"
#include "thermo/constants.hpp"
#include "base/error.hpp"
#include "thermo/reaction.hpp"
#include "alloc_counter.hpp"
#include "support.hpp"


using namespace ely;
using ely::test::expect_error;
using ely::test::rel;
using ::testing::HasSubstr;

namespace {
constexpr double kInf = std::numeric_limits<double>::infinity();

// CRC standard potentials, V vs SHE
constexpr double kEO2 = 1.229, kEH2 = 0.0, kEZn = -0.7618, kECl2 = 1.35827, kEWaterReduction = -0.8277;

HalfReaction reaction(const char* name, const char* product, int n, double e0, double j0, double alpha_f,
                      double alpha_b, double limit = kInf, double reactant_activity = 1.0) {
    HalfReaction h;
    h.name = name;
    h.product = product;
    h.electrons = n;
    h.standard_potential = e0;
    h.reactant_activity = reactant_activity;
    h.kinetics = {j0, 0.0, 298.15, alpha_f, alpha_b};
    h.limiting_current_density = limit;
    return h;
}

SpeciesTerm term(const char* name, Phase phase, double coefficient) {
    return {species_record(name, phase), coefficient};
}

// Half-reactions written as reductions with their species (thermo/species_table).
const std::vector<SpeciesTerm> kOxygenSpecies = {term("O2", Phase::gas, -1), term("H+", Phase::aqueous, -4),
                                                 term("H2O", Phase::liquid, 2)};
const std::vector<SpeciesTerm> kZincSpecies = {term("Zn+2", Phase::aqueous, -1), term("Zn", Phase::solid, 1)};
const std::vector<SpeciesTerm> kProtonSpecies = {term("H+", Phase::aqueous, -2), term("H2", Phase::gas, 1)};

// Zinc electrowinning-like acidic sulfate cell. Invented demo numbers: j0(O2 on the anode)
// 1e-4 A/m², j0(Zn²⁺/Zn) 50 A/m², j0(H2 on zinc) 1e-6 A/m², Zn²⁺ limit 2000 A/m² at unit
// activity, ASR 5e-4 Ω m². Species from the bundled table (NBS 1982 ions, JANAF/CODATA zinc).
CustomCellSpec zinc_cell(double j0_h2 = 1e-6, double zinc_activity = 1.0) {
    CustomCellSpec s;
    s.anode = {reaction("oxygen evolution", "O2", 4, kEO2, 1e-4, 0.5, 0.5)};
    s.anode[0].species = kOxygenSpecies;
    auto zinc = reaction("zinc deposition", "Zn", 2, kEZn, 50.0, 0.5, 0.5, 2000.0 * zinc_activity, zinc_activity);
    zinc.product_molar_mass = 65.38e-3;  // IUPAC, from memory
    zinc.species = kZincSpecies;
    auto hydrogen = reaction("hydrogen evolution", "H2", 2, kEH2, j0_h2, 0.5, 0.5);
    hydrogen.species = kProtonSpecies;
    s.cathode = {zinc, hydrogen};
    s.area_specific_resistance = 5e-4;
    return s;
}

CustomCellSpec water_cell() {
    CustomCellSpec s;
    s.anode = {reaction("oxygen evolution", "O2", 4, kEO2, 1e-3, 0.5, 0.5)};
    s.cathode = {reaction("hydrogen evolution", "H2", 2, kEH2, 10.0, 0.5, 0.5)};
    s.area_specific_resistance = 1e-5;
    return s;
}

OperatingPoint point(double j, double t = 308.15) { return {j, t, 1.0e5, 1.0e5}; }

double hydrogen_share(const CustomCellSpec& spec, double j) {
    return make_custom_cell(spec)->evaluate(point(j)).reaction_current_efficiency[2];  // anode O2, Zn, H2
}
}  // namespace

TEST(Custom, LimitedButlerVolmer) {
    const double t = 320.0;
    // Without a limit: plain Butler–Volmer.
    for (double eta : {-0.2, -0.01, 0.0, 0.03, 0.3})
        EXPECT_NEAR(limited_butler_volmer_current(eta, 2.0, 0.6, 0.4, kInf, t), butler_volmer_current(eta, 2.0, 0.6, 0.4, t),
                    1e-12 * std::fabs(butler_volmer_current(eta, 2.0, 0.6, 0.4, t)) + 1e-15);
    // With a limit: approaches it, never exceeds it, monotone; the reverse is unlimited.
    double last = -kInf;
    for (double eta = -0.3; eta <= 1.0; eta += 0.01) {
        const double j = limited_butler_volmer_current(eta, 2.0, 0.5, 0.5, 100.0, t);
        EXPECT_GT(j, last);
        EXPECT_LT(j, 100.0);
        last = j;
    }
    EXPECT_NEAR(limited_butler_volmer_current(3.0, 2.0, 0.5, 0.5, 100.0, t), 100.0, 1e-9);
    EXPECT_LE(limited_butler_volmer_current(30.0, 2.0, 0.5, 0.5, 100.0, t), 100.0);
    EXPECT_LT(limited_butler_volmer_current(-1.0, 2.0, 0.5, 0.5, 100.0, t), -1e6);
    // Far beyond any physical overpotential the current stays finite.
    EXPECT_TRUE(std::isfinite(limited_butler_volmer_current(100.0, 1.0, 2.0, 2.0, kInf, 300.0)));
    EXPECT_TRUE(std::isfinite(limited_butler_volmer_current(-100.0, 1.0, 2.0, 2.0, kInf, 300.0)));
}

TEST(Custom, WaterCellReversibleVoltageAndFaraday) {
    // CRC: E°(O2/H2O) − E°(H⁺/H2) = 1.229 V at 25 °C, unit activities
    auto cell = make_custom_cell(water_cell());
    const auto r0 = cell->evaluate(point(0.0, 298.15));
    EXPECT_NEAR(r0.reversible_voltage, 1.229, 1e-12);
    EXPECT_EQ(r0.activation_anode, 0.0);
    EXPECT_EQ(r0.activation_cathode, 0.0);
    EXPECT_EQ(r0.voltage, r0.reversible_voltage);
    // One reaction per electrode: the activation terms are the exact Butler–Volmer overpotentials.
    const double j = 5000.0, t = 330.0;
    const auto r = cell->evaluate(point(j, t));
    EXPECT_NEAR(r.activation_anode, butler_volmer_overpotential(j, 1e-3, 0.5, 0.5, t), 1e-12);
    EXPECT_NEAR(r.activation_cathode, butler_volmer_overpotential(j, 10.0, 0.5, 0.5, t), 1e-12);
    EXPECT_NEAR(r.ohmic, j * 1e-5, 1e-15);
    EXPECT_EQ(r.reaction_current_efficiency.size(), 2u);
    EXPECT_NEAR(r.reaction_current_efficiency[0], 1.0, 1e-15);
    EXPECT_NEAR(r.faraday_efficiency, 1.0, 1e-15);
    EXPECT_EQ(r.thermoneutral_voltage, thermoneutral_voltage_hhv(t));
    // Faraday's law and element balances (H, O) to rounding.
    const double n = j / kFaraday;
    EXPECT_NEAR(r.cathode_out[kH2], n / 2, 1e-15 * n);
    EXPECT_NEAR(r.anode_out[kO2], n / 4, 1e-15 * n);
    EXPECT_NEAR(r.consumed[kH2O] * 2, r.cathode_out[kH2] * 2, 1e-14 * n);
    EXPECT_NEAR(r.consumed[kH2O], 2 * r.anode_out[kO2], 1e-14 * n);
}

TEST(Custom, ZincCellSharesSumToOneAndVoltagePartsAdd) {
    auto cell = make_custom_cell(zinc_cell());
    for (double j : {0.0, 50.0, 300.0, 500.0, 1500.0})
        for (double t : {298.15, 308.15, 333.15}) {
            const auto r = cell->evaluate(point(j, t));
            ASSERT_EQ(r.reaction_current_efficiency.size(), 3u);
            EXPECT_NEAR(r.reaction_current_efficiency[0], 1.0, 1e-14);
            EXPECT_NEAR(r.reaction_current_efficiency[1] + r.reaction_current_efficiency[2], 1.0, 1e-14);
            EXPECT_EQ(r.voltage, r.reversible_voltage + r.activation_anode + r.activation_cathode + r.ohmic + r.concentration);
            EXPECT_GE(r.activation_anode, 0.0);
            EXPECT_GE(r.activation_cathode, 0.0);
            EXPECT_EQ(r.faraday_efficiency, r.reaction_current_efficiency[2]);  // the H2 reaction
        }
    // At 500 A/m² (zinc electrowinning range, common practice) zinc carries the current:
    // E_rev = 1.229 − (−0.7618) = 1.9908 V (CRC electrochemical series); the cell computes it from the NBS
    // formation data of its species, an independent route: within 0.2 mV.
    const auto r = cell->evaluate(point(500.0, 298.15));
    EXPECT_NEAR(r.reversible_voltage, 1.229 + 0.7618, 2e-4);
    EXPECT_GT(r.reaction_current_efficiency[1], 0.9);
}

TEST(Custom, HydrogenShareGrowsWithHydrogenExchangeCurrent) {
    double last = 0.0;
    for (double j0 : {1e-8, 1e-7, 1e-6, 1e-5, 1e-4}) {
        const double share = hydrogen_share(zinc_cell(j0), 500.0);
        EXPECT_GT(share, last) << j0;
        last = share;
    }
}

TEST(Custom, HydrogenShareGrowsAsZincIonsFall) {
    // Lower Zn²⁺ activity lowers E(Zn²⁺/Zn) and its transport limit (scaled with the activity):
    // more of the current goes to hydrogen.
    double last = 0.0;
    for (double a : {1.0, 0.5, 0.3, 0.1, 0.03}) {
        const double share = hydrogen_share(zinc_cell(1e-6, a), 500.0);
        EXPECT_GT(share, last) << a;
        last = share;
    }
    EXPECT_GT(last, 0.85);  // Zn limit 60 A/m² of 500 A/m²
}

TEST(Custom, ReverseCurrentOfACorrodingMetal) {
    // Fast hydrogen evolution at low current: the common potential sits above E(Zn²⁺/Zn), zinc
    // dissolves (negative share) and hydrogen carries more than the whole current.
    const auto spec = zinc_cell(10.0);
    const double j = 1.0, t = 298.15;
    const auto r = make_custom_cell(spec)->evaluate(point(j, t));
    const double zinc = r.reaction_current_efficiency[1], hydrogen = r.reaction_current_efficiency[2];
    EXPECT_LT(zinc, 0.0);
    EXPECT_GT(hydrogen, 1.0);
    EXPECT_NEAR(zinc + hydrogen, 1.0, 1e-12);
    // The potential reproduces the total current through the public kinetics.
    const double e_h2 = half_reaction_equilibrium_potential(spec.cathode[1], false, t);
    const double phi = e_h2 - r.activation_cathode;  // main reaction: hydrogen
    double total = 0.0;
    for (const auto& h : spec.cathode) {
        const double eta = half_reaction_equilibrium_potential(h, false, t) - phi;
        total += limited_butler_volmer_current(eta, h.kinetics.exchange_current_density, h.kinetics.alpha_forward,
                                               h.kinetics.alpha_backward, h.limiting_current_density, t);
    }
    EXPECT_NEAR(total, j, 1e-9 * std::fabs(zinc) * j);
}

TEST(Custom, ReproducesTheBrineCellReactions) {
    // Anode: Cl2 evolution (E° 1.35827) against O2 evolution in the acidic anolyte (acid form,
    // E° 1.229); cathode: water reduction (E° −0.8277), all CRC. Typical kinetics, from memory:
    // Cl2 on a dimensionally stable anode j0 ~ 100 A/m², O2 on it slow, j0 ~ 1e-2 A/m².
    CustomCellSpec s;
    s.anode = {reaction("chlorine evolution", "Cl2", 2, kECl2, 100.0, 1.5, 0.5),
               reaction("oxygen evolution", "O2", 4, kEO2, 1e-2, 0.5, 0.5)};
    s.cathode = {reaction("water reduction", "H2", 2, kEWaterReduction, 100.0, 1.0, 1.0)};
    s.anode[0].species = {term("Cl2", Phase::gas, -1), term("Cl-", Phase::aqueous, 2)};
    s.anode[1].species = kOxygenSpecies;
    s.cathode[0].species = {term("H2O", Phase::liquid, -2), term("H2", Phase::gas, 1), term("OH-", Phase::aqueous, 2)};
    s.area_specific_resistance = 1e-4;
    auto cell = make_custom_cell(s);
    // CRC: 1.35827 − (−0.8277) = 2.186 V at unit activities, 25 °C; from the NBS data of the species
    // (an independent route) within 3 mV.
    const auto r = cell->evaluate(point(4000.0, 298.15));
    EXPECT_NEAR(r.reversible_voltage, 2.186, 3e-3);  // chlorine is the main anode reaction
    EXPECT_GT(r.reaction_current_efficiency[0], 0.99);
    EXPECT_NEAR(r.reaction_current_efficiency[0] + r.reaction_current_efficiency[1], 1.0, 1e-14);
    const double n = 4000.0 / kFaraday;
    EXPECT_NEAR(r.anode_out[kCl2], r.reaction_current_efficiency[0] * n / 2, 1e-15 * n);
    EXPECT_NEAR(r.anode_out[kO2], r.reaction_current_efficiency[1] * n / 4, 1e-15 * n);
    EXPECT_NEAR(r.cathode_out[kH2], n / 2, 1e-15 * n);
    // Thermoneutral voltage from the NBS enthalpies (hand calculation): 2 Cl⁻ + 2 H2O → Cl2 + H2 + 2 OH⁻,
    // ΔH = 2(−229.994) − 2(−167.159) − 2(−285.830) = 445.99 kJ/mol, /2F = 2.3112 V, weighted by the shares
    // (chlorine > 99 %; the oxygen side reaction has 2 H2O → O2 + 4 H⁺ + 4 e⁻ + water reduction, 1.4812 V).
    const double cl2 = r.reaction_current_efficiency[0];
    EXPECT_NEAR(r.thermoneutral_voltage, cl2 * 2.31115 + (1.0 - cl2) * 1.48117, 1e-4);
    // At zero current the anode rests at the mixed potential between E(O2) and E(Cl2): O2
    // evolution runs forward, Cl2 backward, so O2 is the main anode reaction there (docs).
    const auto r0 = cell->evaluate(point(0.0, 298.15));
    EXPECT_NEAR(r0.reversible_voltage, 1.229 + 0.8277, 3e-3);
    EXPECT_GT(r0.activation_anode, 0.0);
    EXPECT_LT(r0.activation_anode, half_reaction_equilibrium_potential(s.anode[0], true, 298.15) -
                                        half_reaction_equilibrium_potential(s.anode[1], true, 298.15));
    EXPECT_GT(r0.reaction_current_efficiency[0], 0.99);  // the next increment of current goes to Cl2
    // A fast oxygen catalyst takes a visible share.
    s.anode[1].kinetics.exchange_current_density = 10.0;
    EXPECT_GT(make_custom_cell(s)->evaluate(point(4000.0, 298.15)).reaction_current_efficiency[1], 0.01);
}

TEST(Custom, ProductRates) {
    const auto spec = zinc_cell();
    const auto r = make_custom_cell(spec)->evaluate(point(500.0));
    const auto rates = custom_product_rates(spec, r);
    ASSERT_EQ(rates.size(), 3u);
    for (std::size_t k = 0; k < 3; ++k) {
        const auto& h = k == 0 ? spec.anode[0] : spec.cathode[k - 1];
        EXPECT_DOUBLE_EQ(rates[k], r.reaction_current_efficiency[k] * 500.0 / (h.electrons * kFaraday));
    }
    EXPECT_DOUBLE_EQ(r.cathode_out[kH2], rates[2]);
    EXPECT_DOUBLE_EQ(r.anode_out[kO2], rates[0]);
    // Zinc: 1.2197 g per A·h at 100 % (65.38/(2·26.8015)), derived from Faraday's law
    EXPECT_NEAR(rates[1] / r.reaction_current_efficiency[1] * (3600.0 / 500.0) * spec.cathode[0].product_molar_mass * 1e3,
                1.2197, 1e-3);
    CellResult wrong;
    expect_error([&] { custom_product_rates(spec, wrong); }, ErrorKind::invalid_argument, "reaction shares");
}

TEST(Custom, NernstUsesActivitiesAndElectrodeDirection) {
    auto h = reaction("zinc deposition", "Zn", 2, kEZn, 1.0, 0.5, 0.5, kInf, 0.01);
    const double t = 298.15, slope = kGasConstant * t / (2 * kFaraday);
    // Cathode: a_ox = reactant (Zn²⁺), a_red = product (Zn)
    EXPECT_NEAR(half_reaction_equilibrium_potential(h, false, t), kEZn + slope * std::log(0.01), 1e-15);
    // Anode (dissolution): the reactant is the reduced species
    EXPECT_NEAR(half_reaction_equilibrium_potential(h, true, t), kEZn - slope * std::log(0.01), 1e-15);
    h.standard_potential_temperature_coefficient = 1e-3;
    EXPECT_NEAR(half_reaction_equilibrium_potential(h, false, t + 10), kEZn + 0.01 + slope * (t + 10) / t * std::log(0.01),
                1e-14);
}

TEST(Custom, LimitsWarningsAndErrors) {
    // Only limited reactions at the cathode: j must stay below the sum of their limits.
    CustomCellSpec s = water_cell();
    s.cathode = {reaction("copper deposition", "Cu", 2, 0.3419, 10.0, 0.5, 0.5, 300.0),
                 reaction("zinc deposition", "Zn", 2, kEZn, 10.0, 0.5, 0.5, 200.0)};
    s.thermoneutral_voltage = 2.0;  // invented test value: these reactions carry no species
    auto cell = make_custom_cell(s);
    EXPECT_EQ(cell->current_density_limit(point(0.0)), 500.0);
    EXPECT_NE(cell->evaluate(point(480.0)).warnings & kWarnNearLimitingCurrent, 0u);
    EXPECT_EQ(cell->evaluate(point(100.0)).warnings & kWarnNearLimitingCurrent, 0u);
    expect_error([&] { cell->evaluate(point(500.0)); }, ErrorKind::out_of_range, "500");
    expect_error([&] { cell->evaluate(point(600.0)); }, ErrorKind::out_of_range, "sum of the limiting current densities");
    // Copper (more noble) goes first and reaches its limit before zinc takes the rest.
    const auto r = cell->evaluate(point(400.0));
    EXPECT_NEAR(r.reaction_current_efficiency[1], 0.75, 1e-3);
    EXPECT_NEAR(r.reaction_current_efficiency[2], 0.25, 1e-3);

    auto water = make_custom_cell(water_cell());
    const double nan = std::numeric_limits<double>::quiet_NaN();
    expect_error([&] { water->evaluate(point(nan)); }, ErrorKind::invalid_argument, "current density");
    expect_error([&] { water->evaluate({100.0, nan, 1e5, 1e5}); }, ErrorKind::invalid_argument, "temperature");
    expect_error([&] { water->evaluate(point(100.0, 400.0)); }, ErrorKind::out_of_range, "373.15");
    expect_error([&] { water->evaluate({100.0, 300.0, 6e5, 1e5}); }, ErrorKind::out_of_range, "anode pressure");
    expect_error([&] { water->evaluate(point(2e4)); }, ErrorKind::out_of_range, "10000");

    auto bad = water_cell();
    bad.cathode[0].electrons = 0;
    expect_error([&] { make_custom_cell(bad); }, ErrorKind::invalid_argument, "cathode reaction 1 'hydrogen evolution'");
    bad = water_cell();
    bad.anode[0].kinetics.exchange_current_density = -1.0;
    expect_error([&] { make_custom_cell(bad); }, ErrorKind::invalid_argument, "exchange current density");
    bad = water_cell();
    bad.anode[0].limiting_current_density = nan;
    expect_error([&] { make_custom_cell(bad); }, ErrorKind::invalid_argument, "limiting current density");
    bad = water_cell();
    bad.anode.clear();
    expect_error([&] { make_custom_cell(bad); }, ErrorKind::invalid_argument, "anode has no reactions");
    bad = water_cell();
    bad.cathode[0].reactant_activity = 0.0;
    expect_error([&] { make_custom_cell(bad); }, ErrorKind::invalid_argument, "reactant activity");
    bad = water_cell();
    bad.area_specific_resistance = -1.0;
    expect_error([&] { make_custom_cell(bad); }, ErrorKind::invalid_argument, "area-specific resistance");
}

TEST(Custom, CloneAndGivenThermoneutralVoltage) {
    // A table whose reactions give no species takes the thermoneutral voltage given; one with species
    // computes it and refuses a given value as well (two sources of the same heat).
    auto spec = zinc_cell();
    spec.thermoneutral_voltage = 2.05;  // invented demo value
    expect_error([&] { make_custom_cell(spec); }, ErrorKind::invalid_argument, "do not give it as well");
    for (auto* side : {&spec.anode, &spec.cathode})
        for (auto& h : *side) h.species.clear();
    auto cell = make_custom_cell(spec);
    auto copy = cell->clone();
    const auto a = cell->evaluate(point(400.0)), b = copy->evaluate(point(400.0));
    EXPECT_EQ(a.voltage, b.voltage);
    EXPECT_EQ(a.thermoneutral_voltage, 2.05);
    EXPECT_TRUE(a.heat_from_thermoneutral_voltage);
    EXPECT_FALSE(make_custom_cell(zinc_cell())->evaluate(point(400.0)).heat_from_thermoneutral_voltage);
}

TEST(Custom, EvaluateDoesNotAllocate) {
    auto cell = make_custom_cell(zinc_cell());
    const OperatingPoint p = point(500.0);
    CellResult r = cell->evaluate(p);
    const long allocations = ely::test::count_allocations([&] { r = cell->evaluate(p); });
    if (allocations < 0) GTEST_SKIP() << "operator new is replaced elsewhere in this test program; cannot count";
    EXPECT_EQ(allocations, 0) << "evaluate() allocated";
    EXPECT_EQ(r.reaction_current_efficiency.size(), 3u);
}

TEST(Custom, ActivationEnergyIsRequiredAwayFromTheReferenceTemperature) {
    // An exchange current density is known at its reference temperature; without an activation energy it
    // cannot be carried to another temperature, and the cell says so (no silent factor of 1).
    auto spec = water_cell();
    spec.cathode[0].kinetics.activation_energy = std::numeric_limits<double>::quiet_NaN();  // not given
    const auto cell = make_custom_cell(spec);
    EXPECT_NO_THROW(cell->evaluate(point(1000.0, 298.15)));
    expect_error([&] { cell->evaluate(point(1000.0, 330.0)); }, ErrorKind::out_of_range,
                 "cathode reaction 'hydrogen evolution': activation_energy is not given");
    // The default of a half-reaction is "not given".
    EXPECT_TRUE(std::isnan(HalfReaction{}.kinetics.activation_energy));
    // Given, it follows Arrhenius: the overpotential of a lone reaction at 330 K equals Butler-Volmer with
    // j0(330 K) = j0 exp[-(E/R)(1/330 - 1/298.15)]; 16 kJ/mol: factor 1.86440 [D].
    spec.cathode[0].kinetics.activation_energy = 16e3;
    const auto r = make_custom_cell(spec)->evaluate(point(5000.0, 330.0));
    EXPECT_NEAR(r.activation_cathode, butler_volmer_overpotential(5000.0, 10.0 * 1.86440, 0.5, 0.5, 330.0), 2e-6);
    // A negative activation energy is refused at build time.
    spec.cathode[0].kinetics.activation_energy = -1.0;
    expect_error([&] { make_custom_cell(spec); }, ErrorKind::invalid_argument, "activation energy");
    // Outside the envelope's fitted range the result is flagged as extrapolated.
    spec.cathode[0].kinetics.activation_energy = 16e3;
    spec.envelope.temperature_fit_max = 320.0;
    EXPECT_TRUE(make_custom_cell(spec)->evaluate(point(1000.0, 330.0)).warnings & kWarnTemperatureExtrapolated);
}

TEST(Custom, ThermoneutralVoltageNeedsEnthalpyData) {
    // Without species a table that is not water splitting has no known heat: an error unless E_tn is given.
    auto spec = zinc_cell();
    for (auto& h : spec.cathode) h.species.clear();
    expect_error([&] { make_custom_cell(spec); }, ErrorKind::invalid_argument, "give every reaction its species");
    spec.thermoneutral_voltage = 2.2;  // invented test value
    EXPECT_EQ(make_custom_cell(spec)->evaluate(point(400.0)).thermoneutral_voltage, 2.2);
    // A water table without species is water splitting with liquid water (HHV).
    EXPECT_EQ(make_custom_cell(water_cell())->evaluate(point(400.0, 330.0)).thermoneutral_voltage,
              thermoneutral_voltage_hhv(330.0));
    // Species data must cover the envelope; charges must balance.
    auto hot = zinc_cell();
    hot.envelope.temperature_max = 400.0;  // the aqueous ions' data end at 373.15 K
    expect_error([&] { make_custom_cell(hot); }, ErrorKind::invalid_argument, "not the cell's 298.15..400 K");
    auto unbalanced = zinc_cell();
    unbalanced.cathode[0].electrons = 1;
    expect_error([&] { make_custom_cell(unbalanced); }, ErrorKind::invalid_argument, "charges must sum to -1");
}

TEST(Custom, ThermoneutralVoltageOfZincElectrowinningFromSpecies) {
    // Zn²⁺ + H2O(l) → Zn + ½ O2 + 2 H⁺: ΔH = 153.89 + 285.83 = 439.72 kJ/mol (NBS 1982 / CODATA, hand
    // calculation), E_tn = 439720/(2 x 96485.33) = 2.2787 V at 25 C with zinc carrying the current; the
    // hydrogen side reaction (2 H⁺ → H2 with the anode's water oxidation, 1.4812 V) lowers it by its share.
    const auto r = make_custom_cell(zinc_cell())->evaluate(point(500.0, 298.15));
    const double zinc = r.reaction_current_efficiency[1];
    EXPECT_NEAR(r.thermoneutral_voltage, zinc * 2.27869 + (1.0 - zinc) * 1.48117, 2e-5);
    // Gibbs-Helmholtz for the cell's standard potential: E_tn = E − T dE/dT at unit activities, one reaction
    // per electrode (zinc carrying the current, hydrogen made negligible), by a central difference.
    const auto cell = make_custom_cell(zinc_cell(1e-30));
    const double t = 310.0, d = 0.01;
    const auto at = [&](double tk) { return cell->evaluate(point(1.0, tk)); };
    const double de_dt = (at(t + d).reversible_voltage - at(t - d).reversible_voltage) / (2.0 * d);
    EXPECT_NEAR(at(t).reaction_current_efficiency[1], 1.0, 1e-12);
    EXPECT_NEAR(at(t).thermoneutral_voltage, at(t).reversible_voltage - t * de_dt, 1e-6);
}
