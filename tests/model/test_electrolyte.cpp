// Activity model of concentrated NaCl and NaOH (Pitzer) and the gap conductivity helpers.
// Every reference value names its source beside it.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <limits>

#include "electrochem/electrolyte.hpp"
#include "thermo/constants.hpp"
#include "base/error.hpp"
#include "support.hpp"

using namespace ely;
using ely::test::expect_error;
using ely::test::rel;
using ::testing::HasSubstr;

namespace {
constexpr double k25C = 298.15;
}  // namespace

TEST(Electrolyte, DebyeHueckelSlopeAt25C) {
    // A_φ = 0.3915 kg^½/mol^½ at 25 °C (Pitzer & Mayorga 1973; Pitzer 1991)
    EXPECT_NEAR(debye_huckel_osmotic_slope(k25C), 0.3915, 2e-4);
    EXPECT_GT(debye_huckel_osmotic_slope(363.15), debye_huckel_osmotic_slope(k25C));  // rises with T
}

TEST(Electrolyte, TemperatureFitsMatchPitzerMayorgaAt25C) {
    // Pitzer & Mayorga (1973) Table I: NaCl 0.0765 / 0.2664 / 0.00127; NaOH 0.0864 / 0.253 / 0.0044.
    // The temperature fits (Møller 1988 for NaCl, Pabalan & Pitzer 1987 for NaOH) were fitted to
    // more data, so they agree with the 1973 set only roughly parameter by parameter.
    const auto nacl = pitzer_parameters(AqueousSalt::sodium_chloride, k25C);
    EXPECT_NEAR(nacl.beta0, 0.0765, 2e-3);
    EXPECT_NEAR(nacl.beta1, 0.2664, 1.5e-2);
    EXPECT_NEAR(nacl.c_phi, 0.00127, 3e-4);
    const auto naoh = pitzer_parameters(AqueousSalt::sodium_hydroxide, k25C);
    EXPECT_NEAR(naoh.beta0, 0.0864, 1e-4);
    EXPECT_NEAR(naoh.beta1, 0.253, 1e-4);
    EXPECT_NEAR(naoh.c_phi, 0.0044, 4e-4);
}

TEST(Electrolyte, SodiumChlorideMeanActivityCoefficient) {
    // Robinson & Stokes, Electrolyte Solutions (1959), App. 8.10, 25 °C, from memory:
    // γ±(NaCl) = 0.657 at 1 mol/kg and 0.986 at 6 mol/kg.
    EXPECT_NEAR(aqueous_salt_activity(AqueousSalt::sodium_chloride, 1.0, k25C).mean_activity_coefficient, 0.657, 3e-3);
    EXPECT_NEAR(aqueous_salt_activity(AqueousSalt::sodium_chloride, 6.0, k25C).mean_activity_coefficient, 0.986, 6e-3);
    // The 25 °C parameter set gives the same within its stated fit quality.
    const auto pm = pitzer_parameters_25c(AqueousSalt::sodium_chloride);
    EXPECT_NEAR(pitzer_activity(pm, 0.3915, 1.0).mean_activity_coefficient, 0.657, 3e-3);
    EXPECT_NEAR(pitzer_activity(pm, 0.3915, 6.0).mean_activity_coefficient, 0.986, 6e-3);
}

TEST(Electrolyte, SodiumChlorideWaterActivity) {
    // Robinson & Stokes (1959), 25 °C, from memory: a_w of 6 mol/kg NaCl ≈ 0.76
    // (osmotic coefficient 1.271).
    const auto a = aqueous_salt_activity(AqueousSalt::sodium_chloride, 6.0, k25C);
    EXPECT_NEAR(a.water_activity, 0.76, 5e-3);
    EXPECT_NEAR(a.osmotic_coefficient, 1.271, 5e-3);
}

TEST(Electrolyte, SodiumHydroxideMeanActivityCoefficient) {
    // Robinson & Stokes (1959), 25 °C, from memory: γ±(NaOH, 1 mol/kg) ≈ 0.679
    EXPECT_NEAR(aqueous_salt_activity(AqueousSalt::sodium_hydroxide, 1.0, k25C).mean_activity_coefficient, 0.679, 0.015);
}

TEST(Electrolyte, IdentitiesAndLimits) {
    for (auto salt : {AqueousSalt::sodium_chloride, AqueousSalt::sodium_hydroxide}) {
        for (double t : {298.15, 333.15, 363.15, 368.15}) {
            const auto zero = aqueous_salt_activity(salt, 0.0, t);
            EXPECT_EQ(zero.mean_activity_coefficient, 1.0);
            EXPECT_EQ(zero.water_activity, 1.0);
            // Debye–Hückel limiting law at high dilution: ln γ± → −A_φ·3·√m (A_γ = 3 A_φ, ln basis)
            const double m = 1e-6;
            const auto dilute = aqueous_salt_activity(salt, m, t);
            EXPECT_NEAR(std::log(dilute.mean_activity_coefficient), -3.0 * debye_huckel_osmotic_slope(t) * std::sqrt(m),
                        5e-6);
            for (double mm : {0.5, 2.0, 4.0, 6.0}) EXPECT_LT(aqueous_salt_activity(salt, mm, t).water_activity, 1.0);
        }
    }
}

TEST(Electrolyte, GibbsDuhemConsistency) {
    // The single-salt equations come from one excess Gibbs energy, so the solute and solvent
    // activities obey Gibbs–Duhem: d ln a_w / dm = −2 M_w m · d ln(m γ±)/dm (by finite differences).
    const auto p = pitzer_parameters(AqueousSalt::sodium_hydroxide, 363.15);
    const double aphi = debye_huckel_osmotic_slope(363.15);
    for (double m : {0.5, 3.0, 8.0, 11.8}) {
        const double h = 1e-5 * m;
        const auto up = pitzer_activity(p, aphi, m + h), dn = pitzer_activity(p, aphi, m - h);
        const double dln_aw = (std::log(up.water_activity) - std::log(dn.water_activity)) / (2 * h);
        const double dln_solute = (std::log((m + h) * up.mean_activity_coefficient) -
                                   std::log((m - h) * dn.mean_activity_coefficient)) / (2 * h);
        EXPECT_NEAR(dln_aw, -2.0 * molar_mass::H2O * m * dln_solute, 1e-7 * std::fabs(dln_aw) + 1e-9);
    }
}

TEST(Electrolyte, ConcentratedCausticAtCellTemperature) {
    // 32 wt % NaOH = 11.77 mol/kg. No reference value at hand for 90 °C: plausibility only —
    // γ± and a_w of concentrated caustic fall/rise with temperature as the solution is
    // less non-ideal when hot (Pabalan & Pitzer 1987 fit), and a_w sits well below 1.
    const double m = molality_from_mass_fraction(0.32, molar_mass::NaOH);
    EXPECT_NEAR(m, 11.766, 1e-3);
    const auto cold = aqueous_salt_activity(AqueousSalt::sodium_hydroxide, m, 298.15);
    const auto hot = aqueous_salt_activity(AqueousSalt::sodium_hydroxide, m, 363.15);
    EXPECT_GT(cold.mean_activity_coefficient, hot.mean_activity_coefficient);
    EXPECT_LT(cold.water_activity, hot.water_activity);
    EXPECT_GT(hot.water_activity, 0.3);
    EXPECT_LT(hot.water_activity, 0.6);
}

TEST(Electrolyte, MassFractionRoundTrip) {
    for (double w : {0.0, 0.1, 0.18, 0.32, 0.5}) {
        EXPECT_NEAR(mass_fraction_from_molality(molality_from_mass_fraction(w, molar_mass::NaCl), molar_mass::NaCl), w,
                    1e-15);
    }
}

TEST(Electrolyte, GapResistanceAndConductivity) {
    const ArrheniusConductivity c{80.0, 363.15, 15000.0};
    EXPECT_DOUBLE_EQ(arrhenius_conductivity(c, 363.15), 80.0);
    EXPECT_LT(arrhenius_conductivity(c, 343.15), 80.0);
    // Bruggeman: δ/(σ (1 − ε)^1.5); 1 mm, 80 S/m, no gas: 1.25e-5 Ω m²
    EXPECT_DOUBLE_EQ(bubbly_gap_resistance(1e-3, 80.0, 0.0), 1.25e-5);
    EXPECT_NEAR(bubbly_gap_resistance(1e-3, 80.0, 0.36), 1.25e-5 / 0.512, 1e-18);
    EXPECT_EQ(bubbly_gap_resistance(0.0, 80.0, 0.3), 0.0);
}

TEST(Electrolyte, Errors) {
    const double nan = std::numeric_limits<double>::quiet_NaN();
    expect_error([&] { aqueous_salt_activity(AqueousSalt::sodium_chloride, nan, 298.15); }, ErrorKind::invalid_argument,
                 "molality");
    expect_error([] { aqueous_salt_activity(AqueousSalt::sodium_chloride, 7.0, 298.15); }, ErrorKind::out_of_range,
                 "6.7");
    expect_error([] { aqueous_salt_activity(AqueousSalt::sodium_hydroxide, 2.0, 290.0); }, ErrorKind::out_of_range,
                 "298.15");
    expect_error([] { aqueous_salt_activity(AqueousSalt::sodium_chloride, 2.0, 600.0); }, ErrorKind::out_of_range,
                 "573.15");
    expect_error([] { molality_from_mass_fraction(1.0, molar_mass::NaOH); }, ErrorKind::out_of_range, "mass fraction");
    expect_error([] { bubbly_gap_resistance(1e-3, 80.0, 0.95); }, ErrorKind::out_of_range, "void fraction");
    expect_error([] { bubbly_gap_resistance(-1e-3, 80.0, 0.1); }, ErrorKind::invalid_argument, "gap");
}

TEST(Electrolyte, RelativeEnthalpiesAgainstTheDebyeHueckelLimit) {
    // Debye–Hückel limit of the apparent relative enthalpy of a 1-1 salt in Pitzer's form, Φ_L → (A_H/b)
    // ln(1 + b√m) ≈ A_H √m, with A_H = 1.986 kJ kg^½ mol^-3/2 at 25 C (A_H/RT = 0.8018; Pitzer 1991, from
    // memory; the classical 476 cal kg^½ mol^-3/2 of Harned & Owen). The code gets it from the temperature
    // derivative of the Møller A_φ fit, an independent number. Within 3 % at 1e-4 mol/kg.
    const double m = 1e-4, expected = 1986.0 / 1.2 * std::log1p(1.2 * std::sqrt(m));
    for (auto salt : {AqueousSalt::sodium_chloride, AqueousSalt::sodium_hydroxide})
        EXPECT_NEAR(aqueous_salt_relative_enthalpies(salt, m, 298.15).apparent(m), expected, 0.03 * expected);
}

TEST(Electrolyte, RelativeEnthalpiesObeyGibbsDuhem) {
    // n1 dL̄1 + n2 dL̄2 = 0 per kg of water (n1 = 1/M_w, n2 = m): the two come from different derivatives (of
    // a_w and of γ±), so the identity checks them against each other.
    for (auto salt : {AqueousSalt::sodium_chloride, AqueousSalt::sodium_hydroxide})
        for (double t : {298.15, 333.15, 363.15})
            for (double m : {0.5, 2.0, 5.0}) {
                const double h = 1e-3 * m;
                const auto up = aqueous_salt_relative_enthalpies(salt, m + h, t);
                const auto dn = aqueous_salt_relative_enthalpies(salt, m - h, t);
                const double dl1 = (up.water - dn.water) / (2 * h), dl2 = (up.solute - dn.solute) / (2 * h);
                EXPECT_NEAR(dl1 / molar_mass::H2O, -m * dl2, 1e-3 * std::fabs(m * dl2) + 1e-3) << m << " " << t;
            }
}

TEST(Electrolyte, HeatOfMixingOfSaturatedBrine) {
    // NaCl dissolves endothermically: +3.88 kJ/mol to infinite dilution, about +1.9 kJ/mol to a saturated
    // solution at 25 C (from memory), so Φ_L(6 mol/kg) ≈ −2.0 kJ/mol. Within 0.4 kJ/mol.
    EXPECT_NEAR(aqueous_salt_relative_enthalpies(AqueousSalt::sodium_chloride, 6.0, 298.15).apparent(6.0), -2.0e3, 400.0);
    // Concentrated caustic gives off heat when diluted: Φ_L > 0 at 32 wt % (11.77 mol/kg), more so when hot.
    const double m = molality_from_mass_fraction(0.32, molar_mass::NaOH);
    const double cold = aqueous_salt_relative_enthalpies(AqueousSalt::sodium_hydroxide, m, 298.15).apparent(m);
    const double hot = aqueous_salt_relative_enthalpies(AqueousSalt::sodium_hydroxide, m, 363.15).apparent(m);
    EXPECT_GT(cold, 0.0);
    EXPECT_GT(hot, cold);
}
