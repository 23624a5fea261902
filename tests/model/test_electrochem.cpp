// Electrochemistry building blocks: kinetics, conduction, crossover, Faraday efficiency,
// shunt currents. Every reference value names its source beside it.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>

#include "electrochem/conduction.hpp"
#include "electrochem/electrolyte.hpp"
#include "electrochem/crossover.hpp"
#include "electrochem/kinetics.hpp"
#include "thermo/constants.hpp"
#include "base/error.hpp"
#include "support.hpp"

using namespace ely;
using ely::test::expect_error;
using ely::test::rel;
using ::testing::HasSubstr;

// ---------------------------------------------------------------------------------------
// Kinetics
// ---------------------------------------------------------------------------------------

TEST(ElectrochemKinetics, ButlerVolmerClosedFormWhenTransferCoefficientsEqual) {
    // PHYSICS.md: with α_a = α_c = α, η = (RT/(αF))·asinh(j/(2 j0)) exactly.
    for (double t : {300.0, 353.15, 1073.15})
        for (double alpha : {0.3, 0.5, 1.0, 1.5})
            for (double j : {1e-3, 0.1, 10.0, 1e3, 2e4, 1e5}) {
                const double j0 = 1.0;
                // The closed form put back into the Butler–Volmer equation (the definition) gives j.
                const double expected = butler_volmer_overpotential(j, j0, alpha, alpha, t);
                const double f = alpha * kFaraday / (kGasConstant * t);
                EXPECT_LT(rel(j0 * (std::exp(f * expected) - std::exp(-f * expected)), j), 1e-12)
                    << "alpha " << alpha << " j " << j << " T " << t;
                // The general (Newton) solve with α_f a hair off α_b lands on the same curve.
                const double general = butler_volmer_overpotential(j, j0, alpha * (1.0 + 1e-12), alpha, t);
                EXPECT_LT(rel(general, expected), 1e-9) << "alpha " << alpha << " j " << j;
            }
}

TEST(ElectrochemKinetics, ButlerVolmerGeneralSolveReproducesCurrent) {
    // η from the bracketed Newton solve put back into the Butler–Volmer equation gives j. (For
    // j << j0 the check itself loses digits: j is the difference of two exponentials near 1,
    // relative rounding ≈ 1e-16·j0/j; the grid starts at j/j0 ≈ 0.01.)
    for (double t : {298.15, 353.15, 1073.15})
        for (double af : {0.25, 0.5, 1.2, 2.0})
            for (double ab : {0.3, 0.7, 1.5})
                for (double j : {7e-3, 0.05, 3.0, 250.0, 4e3, 3e4}) {
                    if (af == ab) continue;
                    const double j0 = 0.7;
                    const double eta = butler_volmer_overpotential(j, j0, af, ab, t);
                    EXPECT_GT(eta, 0.0);
                    EXPECT_LT(rel(butler_volmer_current(eta, j0, af, ab, t), j), 1e-12)
                        << "af " << af << " ab " << ab << " j " << j << " T " << t;
                }
}

TEST(ElectrochemKinetics, TafelAgreesWithButlerVolmerAtHighCurrent) {
    // For j >> j0 the reverse branch vanishes: asinh(x/2) − ln(x) ≈ 1/x², far below 1 mV.
    for (double t : {353.15, 1073.15})
        for (double alpha : {0.5, 1.0, 1.5})
            for (double ratio : {100.0, 1e3, 1e6}) {
                const double j0 = 2.0, j = ratio * j0;
                const double bv = butler_volmer_overpotential(j, j0, alpha, alpha, t);
                const double tafel = tafel_overpotential(j, j0, alpha, t);
                EXPECT_LT(std::fabs(bv - tafel), 1e-3);
            }
}

TEST(ElectrochemKinetics, ConcentrationLossAtLimitingCurrentIsAnError) {
    expect_error([] { concentration_overpotential(2e4, 2e4, 353.15, 2); }, ErrorKind::out_of_range,
                 "limiting current density");
}

// ---------------------------------------------------------------------------------------
// Conduction
// ---------------------------------------------------------------------------------------

TEST(ElectrochemConduction, SpringerMembraneConductivity) {
    // Springer, Zawodzinski & Gottesfeld, J. Electrochem. Soc. 138 (1991) 2334: the temperature factor
    // exp[1268 (1/303 − 1/T)] is an activation energy of 10.54 kJ/mol (the paper's own statement, from memory):
    // the ratio of conductivities at two temperatures follows it, whatever the water content.
    for (double lambda : {14.0, 22.0}) {
        const double ratio = membrane_conductivity_springer(lambda, 353.15) / membrane_conductivity_springer(lambda, 303.15);
        EXPECT_NEAR(std::log(ratio), 10.54e3 / kGasConstant * (1.0 / 303.15 - 1.0 / 353.15), 2e-3);
    }
    // At 303 K (the correlation's reference) σ is linear in λ and vanishes at λ = 0.00326/0.005139 = 0.634:
    // σ(22)/σ(14) = (22 − 0.634)/(14 − 0.634) = 1.5985 [D].
    EXPECT_NEAR(membrane_conductivity_springer(22.0, 303.0) / membrane_conductivity_springer(14.0, 303.0), 1.5985, 1e-4);
    // Window for a liquid-equilibrated membrane at 80 °C: 0.18–0.20 S/cm (from memory).
    EXPECT_GT(membrane_conductivity_springer(22.0, 353.15), 18.0);
    EXPECT_LT(membrane_conductivity_springer(22.0, 353.15), 20.0);
    expect_error([] { membrane_conductivity_springer(0.5, 353.15); }, ErrorKind::out_of_range, "water content");
}

TEST(ElectrochemConduction, KohDensityAndMolarityOf30WtPercent) {
    // 30 wt% KOH: density ≈ 1.29 g/cm³ at 20–25 °C (CRC Handbook concentrative-properties table,
    // from memory) and ≈ 6.9 mol/L (common practice; 6.9 M is the concentration the 0.62 S/cm
    // conductivity below refers to).
    EXPECT_NEAR(koh_density(0.30, 298.15), 1290.0, 6.0);
    EXPECT_NEAR(koh_molarity(0.30, 298.15), 6.9, 0.05);
    // Molality is w/(M_KOH (1 − w)): 0.3/(0.0561056·0.7) = 7.6387 mol/kg [D].
    EXPECT_LT(rel(molality_from_mass_fraction(0.30, molar_mass::KOH), 0.30 / (0.0561056 * 0.70)), 1e-5);
    // The solution expands on heating: molarity falls with temperature.
    EXPECT_LT(koh_molarity(0.30, 353.15), koh_molarity(0.30, 298.15));
}

TEST(ElectrochemConduction, KohConductivityGilliam) {
    // Gilliam et al., Int. J. Hydrogen Energy 32 (2007) 359, coefficients in S/cm (form seen in two
    // public model codes citing the paper): at 6.9 M and 25 °C ≈ 0.62 S/cm (common practice).
    EXPECT_NEAR(koh_conductivity_gilliam(6.9, 298.15) / 100.0, 0.62, 0.005);
    // Peak conductivity near 6–7 M at 25 °C (from memory): scan the molarity.
    double best_m = 0, best = 0;
    for (double x = 1.0; x <= 11.0; x += 0.05) {
        const double s = koh_conductivity_gilliam(x, 298.15);
        if (s > best) { best = s; best_m = x; }
    }
    EXPECT_GE(best_m, 5.5);
    EXPECT_LE(best_m, 7.0);
    // Rises with temperature (common practice: about 2 %/K).
    double previous = 0;
    for (double tc : {25.0, 40.0, 60.0, 80.0, 90.0}) {
        const double s = koh_conductivity_gilliam(6.9, tc + kZeroCelsius);
        EXPECT_GT(s, previous);
        previous = s;
    }
    expect_error([] { koh_conductivity_gilliam(13.0, 353.15); }, ErrorKind::out_of_range, "molarity");
}

TEST(ElectrochemConduction, KohWaterActivityBalej) {
    // Balej, Int. J. Hydrogen Energy 10 (1985) 233: a_w → 1 for pure water and falls with strength.
    EXPECT_EQ(koh_water_activity_balej(0.0, 353.15), 1.0);
    double previous = 1.0;
    for (double m = 1.0; m <= 16.0; m += 1.0) {
        const double a = koh_water_activity_balej(m, 353.15);
        EXPECT_LT(a, previous);
        EXPECT_GT(a, 0.0);
        previous = a;
    }
    // 30 wt% KOH at 80 °C: vapour pressure about 0.6 of pure water's (from memory).
    const double a30 = koh_water_activity_balej(molality_from_mass_fraction(0.30, molar_mass::KOH), 353.15);
    EXPECT_GT(a30, 0.55);
    EXPECT_LT(a30, 0.68);
}

TEST(ElectrochemConduction, BruggemanAndBubbleVoidFraction) {
    // Bruggeman: σ_eff = σ (1 − ε)^1.5; worked number: ε = 0.36 leaves 0.64^1.5 = 0.8^3 = 0.512 of σ [D].
    EXPECT_EQ(bruggeman_conductivity(120.0, 0.0), 120.0);
    EXPECT_NEAR(bruggeman_conductivity(120.0, 0.36), 61.44, 1e-12);
    // Any volume fraction 0..1 (the bubble model caps its own void fraction).
    EXPECT_EQ(bruggeman_conductivity(120.0, 1.0), 0.0);  // nothing left to conduct
    expect_error([] { bruggeman_conductivity(120.0, 1.05); }, ErrorKind::out_of_range, "volume fraction");
    // Void fraction ε = min(c j^n, ε_max): zero without current, rising, capped. Worked number at 0.4 A/cm²:
    // (2/3)(0.023)·4000^0.3 = 0.015333 x 12.0398 = 0.18461 [D].
    const BubbleVoidModel model{0.023 * 2.0 / 3.0, 0.3, 0.5};
    EXPECT_EQ(bubble_void_fraction(model, 0.0), 0.0);
    EXPECT_NEAR(bubble_void_fraction(model, 4000.0), 0.18461, 1e-5);
    double previous = 0.0;
    for (double j : {100.0, 1000.0, 4000.0, 1e4, 3e4}) {
        const double e = bubble_void_fraction(model, j);
        EXPECT_GT(e, previous);
        previous = e;
    }
    EXPECT_EQ(bubble_void_fraction(model, 1e9), 0.5);
}

TEST(ElectrochemConduction, ArrheniusAreaSpecificResistance) {
    // ASR(T) = ASR_ref·exp[(E_a/R)(1/T − 1/T_ref)]: equal at T_ref, larger when colder.
    const double asr = 1e-5, ea = 80e3, tref = 1073.15;
    EXPECT_EQ(arrhenius_area_specific_resistance(asr, ea, tref, tref), asr);
    // 80 kJ/mol from 800 to 700 °C: exp[(80000/8.314463)(1/973.15 − 1/1073.15)] = exp(0.92133) = 2.5126 [D].
    EXPECT_NEAR(arrhenius_area_specific_resistance(asr, ea, tref, 973.15) / asr, 2.5126, 1e-4);
}

// ---------------------------------------------------------------------------------------
// Crossover, Faraday efficiency, shunt currents
// ---------------------------------------------------------------------------------------

TEST(ElectrochemCrossover, PermeationAndDarcyFluxes) {
    const GasPermeability h2{2e-14, 20e3, 353.15};
    EXPECT_EQ(gas_permeability(h2, 353.15), 2e-14);
    EXPECT_GT(gas_permeability(h2, 363.15), gas_permeability(h2, 343.15));
    // 20 kJ/mol from 80 to 60 °C: factor exp[−(20000/8.314463)(1/333.15 − 1/353.15)] = 1/1.50517 [D].
    EXPECT_NEAR(gas_permeability(h2, 333.15), 1.32875e-14, 1e-19);
    // N = P p/δ: 2e-14 x 3e6 / 177.8e-6 = 3.37458e-4 mol/(m² s) [D].
    EXPECT_NEAR(permeation_flux(2e-14, 3e6, 177.8e-6), 3.37458e-4, 1e-9);
    EXPECT_EQ(permeation_flux(2e-14, 0.0, 177.8e-6), 0.0);
    // Darcy term only when the cathode is above the anode; linear in Δp.
    EXPECT_EQ(darcy_gas_flux(2e-22, 3e6, -1e5, 1e-4), 0.0);
    EXPECT_EQ(darcy_gas_flux(2e-22, 3e6, 0.0, 1e-4), 0.0);
    EXPECT_LT(rel(darcy_gas_flux(2e-22, 3e6, 2e6, 1e-4), 2.0 * darcy_gas_flux(2e-22, 3e6, 1e6, 1e-4)), 1e-15);
    expect_error([] { permeation_flux(1e-14, 1e5, 0.0); }, ErrorKind::invalid_argument, "thickness");
}

TEST(ElectrochemCrossover, UllebergFaradayEfficiency) {
    // Ulleberg, Int. J. Hydrogen Energy 28 (2003) 21: η_F = j²/(f1 + j²)·f2, j in mA/cm²,
    // f1 = 250 (mA/cm²)², f2 = 0.96 at 80 °C (from memory). The model takes SI units:
    // j in A/m² (×10) and f1 in (A/m²)² (×100), which leaves η_F unchanged.
    // Worked numbers: 20, 100, 300 mA/cm² → 400/650, 10000/10250, 90000/90250 of 0.96 [D].
    EXPECT_NEAR(faraday_efficiency_ulleberg(200.0, 2.5e4, 0.96), 0.590769, 1e-6);
    EXPECT_NEAR(faraday_efficiency_ulleberg(1000.0, 2.5e4, 0.96), 0.936585, 1e-6);
    EXPECT_NEAR(faraday_efficiency_ulleberg(3000.0, 2.5e4, 0.96), 0.957341, 1e-6);
    EXPECT_EQ(faraday_efficiency_ulleberg(0.0, 2.5e4, 0.96), 0.0);
}

TEST(ElectrochemCrossover, ShuntNetworkLossFactor) {
    // Ideal manifold (ρ = 0): the manifold sits at the mean electrolyte potential, channel
    // currents are linear in the cell index and Σ_k S_k = (N³ − N)/12 [D].
    for (int n : {1, 2, 3, 10, 100, 250}) {
        const double expected = (static_cast<double>(n) * n * n - n) / 12.0;
        if (n == 1) {
            EXPECT_EQ(shunt_loss_factor(n, 0.0), 0.0);
        } else {
            EXPECT_LT(rel(shunt_loss_factor(n, 0.0), expected), 1e-12) << n;
        }
    }
    // A resistive manifold lowers the shunt currents; a nearly ideal one approaches the limit.
    EXPECT_LT(rel(shunt_loss_factor(100, 1e-9), 83325.0), 1e-5);
    double previous = shunt_loss_factor(100, 0.0);
    for (double rho : {1e-4, 1e-3, 1e-2, 0.1, 1.0, 10.0}) {
        const double g = shunt_loss_factor(100, rho);
        EXPECT_LT(g, previous);
        EXPECT_GT(g, 0.0);
        previous = g;
    }
    expect_error([] { shunt_loss_factor(0, 0.0); }, ErrorKind::out_of_range, "cells");
}
