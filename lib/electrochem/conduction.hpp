#pragma once
// Ionic conduction: perfluorosulfonic acid membranes (Springer et al. 1991), aqueous KOH
// (density, molality, molarity, conductivity, water activity), the Bruggeman correction for
// gas bubbles in a liquid electrolyte, and Arrhenius area-specific resistances of oxide cells.
// SI units: conductivities in S/m, resistances in ohm m², concentrations as named.
namespace ely {

/// Perfluorosulfonic acid membrane, Springer, Zawodzinski & Gottesfeld, J. Electrochem. Soc.
/// 138 (1991) 2334: σ = (0.005139·λ − 0.00326)·exp[1268·(1/303 − 1/T)] S/cm, returned in S/m
/// (×100). λ = mol H2O per mol SO3H (≈ 14 vapour-, ≈ 21–22 liquid-equilibrated). λ at or below
/// 0.00326/0.005139 ≈ 0.634 (σ <= 0) is an error; T in K.
double membrane_conductivity_springer(double water_content, double temperature);

// ---------------------------------------------------------------------------------------
// Aqueous potassium hydroxide
// ---------------------------------------------------------------------------------------

/// Density of KOH(aq), kg/m³, Haug, Kreitz, Koj & Turek, Int. J. Hydrogen Energy 42 (2017)
/// 15689 (form as used in public model code citing the paper; not checked against the paper):
/// ρ = (1001.53053 − 0.08343 t − 0.00401 t² + 5.51232e-6 t³ − 8.20994e-10 t⁴)·exp(0.86 w),
/// t in °C, w the KOH mass fraction. Accepted for 273.15..373.15 K and 0 <= w <= 0.5.
double koh_density(double mass_fraction, double temperature);

/// Molarity of KOH(aq), mol/L: w·ρ(w, T)/M_KOH / 1000.
double koh_molarity(double mass_fraction, double temperature);

/// Conductivity of KOH(aq), S/m, Gilliam, Graydon, Kirk & Thorpe, Int. J. Hydrogen Energy 32
/// (2007) 359: σ = −2.041 M − 0.0028 M² + 0.005332 M T + 207.2 M/T + 0.001043 M³
/// − 3.0e-7 M² T² in S/cm (×100 here), M in mol/L, T in K. The coefficients are identical in
/// two independent public model codes that cite the paper; the paper itself was not at hand
/// (validity range from memory: 0..12 mol/L, 0..100 °C, accepted here as 0..12 mol/L and
/// 273.15..373.15 K).
double koh_conductivity_gilliam(double molarity, double temperature);

/// Water activity of KOH(aq), Balej, Int. J. Hydrogen Energy 10 (1985) 233:
/// log10 a_w = −0.02255 m + 0.001434 m² + (1.38 m − 0.9254 m²)/T, m in mol/kg, T in K
/// (form as used in public model code citing the paper; accepted for 0..18 mol/kg and
/// 273.15..474 K, the range that code states). The molality of a mass fraction w is
/// molality_from_mass_fraction(w, molar_mass::KOH) (electrochem/electrolyte.hpp).
double koh_water_activity_balej(double molality, double temperature);

// ---------------------------------------------------------------------------------------
// Gas bubbles in a liquid electrolyte
// ---------------------------------------------------------------------------------------

/// Bruggeman: σ_eff = σ·(1 − ε)^1.5 for a conducting phase holding a volume fraction
/// 0 <= ε <= 1 of non-conducting inclusions (gas bubbles in an electrolyte gap; the polymer
/// around the water network of a membrane). The bubble model caps its own void fraction.
double bruggeman_conductivity(double conductivity, double void_fraction);

/// Void fraction of the gas–electrolyte layer between electrode and separator rising with
/// current density: ε = min(c·j^n, ε_max), j in A/m². The power form with c = (2/3)·0.023
/// and n = 0.3 is the one public alkaline-cell model code attributes to Milewski, Guandalini
/// & Campanari, J. Power Sources 269 (2014) 203 (not checked against the paper).
struct BubbleVoidModel {
    double coefficient;  // c, (A/m²)^-n
    double exponent;     // n
    double maximum;      // ε_max < 1, cap of the power law
};
double bubble_void_fraction(const BubbleVoidModel& model, double current_density);

// ---------------------------------------------------------------------------------------
// Oxide-ion conductors
// ---------------------------------------------------------------------------------------

/// Thermally activated area-specific resistance, ohm m²:
/// ASR(T) = ASR_ref·exp[(E_a/R)·(1/T − 1/T_ref)].
double arrhenius_area_specific_resistance(double asr_reference, double activation_energy,
                                          double reference_temperature, double temperature);

}  // namespace ely
