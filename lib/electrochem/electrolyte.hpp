#pragma once
// Concentrated aqueous NaCl and NaOH: mean activity coefficient, osmotic coefficient and
// water activity from the Pitzer ion-interaction model for a single 1-1 salt, and a simple
// conductivity model for the liquid gaps of a cell.
//
// Pitzer model (Pitzer, "Ion interaction approach", in Activity Coefficients in Electrolyte
// Solutions, 2nd ed., CRC 1991; Pitzer & Mayorga, J. Phys. Chem. 77 (1973) 2300), 1-1 salt
// at molality m, ionic strength I = m, b = 1.2 kg^½/mol^½, α1 = 2 kg^½/mol^½:
//   f^γ   = −A_φ [√I/(1 + b√I) + (2/b) ln(1 + b√I)]
//   B^γ   = 2β0 + (2β1/(α1² I)) [1 − (1 + α1√I − α1² I/2) exp(−α1√I)]
//   ln γ± = f^γ + m B^γ + (3/2) m² C^φ
//   φ − 1 = −A_φ √I/(1 + b√I) + m (β0 + β1 exp(−α1√I)) + m² C^φ
//   ln a_w = −ν m M_w φ,  ν = 2
// Temperature dependence: A_φ(T), β0(T), β1(T), C^φ(T) from published fits (see the .cpp):
// Møller, Geochim. Cosmochim. Acta 52 (1988) 821, eq. 13 for A_φ and NaCl (273.15–573.15 K);
// Pabalan & Pitzer, Geochim. Cosmochim. Acta 51 (1987) 829 for NaOH (298.15–523.15 K).
// The 25 °C single-salt values of Pitzer & Mayorga (1973), Table I, are kept for checks.
#include "thermo/reaction.hpp"

namespace ely {

/// Single 1-1 salt parameters of the Pitzer model at one temperature.
struct PitzerSaltParameters {
    double beta0;  // kg/mol
    double beta1;  // kg/mol
    double c_phi;  // kg²/mol²
};

enum class AqueousSalt { sodium_chloride, sodium_hydroxide };

const char* aqueous_salt_name(AqueousSalt salt);
double aqueous_salt_molar_mass(AqueousSalt salt);  // kg/mol

/// Pitzer & Mayorga (1973), Table I, 25 °C: NaCl β0 0.0765, β1 0.2664, C^φ 0.00127;
/// NaOH β0 0.0864, β1 0.253, C^φ 0.0044.
PitzerSaltParameters pitzer_parameters_25c(AqueousSalt salt);

/// Temperature-dependent parameters (Møller 1988 for NaCl, 273.15–573.15 K; Pabalan &
/// Pitzer 1987 for NaOH, 298.15–523.15 K). Outside the fit range: out_of_range.
PitzerSaltParameters pitzer_parameters(AqueousSalt salt, double temperature);

/// Debye–Hückel osmotic coefficient slope A_φ (kg^½/mol^½), Møller (1988) eq. 13 fit,
/// 273.15–573.15 K; 0.3915 at 25 °C.
double debye_huckel_osmotic_slope(double temperature);

/// Largest molality the functions below accept for a salt, mol/kg (NaCl: 6.7, about the
/// saturation molality at 100 °C, from memory; NaOH: 16, about 39 wt %).
double aqueous_salt_molality_max(AqueousSalt salt);

struct ElectrolyteActivity {
    double mean_activity_coefficient;  // γ± (molality scale)
    double osmotic_coefficient;        // φ
    double water_activity;             // a_w
    double electrolyte_activity;       // a = (m γ± / m°)², the activity of the salt as a whole
};

/// Pitzer single-salt equations for a 1-1 salt with given parameters and slope A_φ.
ElectrolyteActivity pitzer_activity(const PitzerSaltParameters& parameters, double osmotic_slope, double molality);

/// The same with the temperature-dependent parameters and A_φ(T) above.
ElectrolyteActivity aqueous_salt_activity(AqueousSalt salt, double molality, double temperature);

/// Relative partial molar enthalpies of a 1-1 salt solution against infinite dilution, J/mol:
/// L̄2 of the salt (per mol of salt) and L̄1 of the water, from the temperature dependence of the
/// activity model by Gibbs–Helmholtz: L̄2 = −2RT²(∂ln γ±/∂T)_m, L̄1 = −RT²(∂ln a_w/∂T)_m
/// = 2 m M_w R T² (∂φ/∂T)_m. The heat given off when a solution is diluted, and the heat of
/// mixing the brine cell's reaction sees at plant concentrations, follow from these. Derivatives by
/// central differences of ±0.01 K (one-sided at the ends of the fits' temperature ranges).
struct RelativeEnthalpies {
    double solute;  // L̄2, J per mol of salt
    double water;   // L̄1, J per mol of water
    /// Apparent relative molar enthalpy Φ_L = L̄2 + L̄1/(m M_w), J per mol of salt: the heat given off
    /// per mol of salt when the solution is diluted without limit (dilution heat = −Φ_L).
    double apparent(double molality) const;
};
RelativeEnthalpies aqueous_salt_relative_enthalpies(AqueousSalt salt, double molality, double temperature);

/// 2 NaCl(anolyte, m_NaCl) + 2 H2O(catholyte) → Cl2 + H2 + 2 NaOH(catholyte, m_NaOH) at T, the gases at
/// p°, each solution species at its partial molar state in the given solutions (NaCl(aq) and NaOH(aq)
/// ideal-dilute standard states of thermo/reaction.hpp plus the relative partial molar enthalpies
/// and the activities above): ΔH = ΔH° + 2 L̄2(NaOH) − 2 L̄2(NaCl) − 2 L̄1(catholyte water),
/// ΔG = ΔG° + RT ln[a_NaOH²/(a_NaCl² a_w²)], ΔS = (ΔH − ΔG)/T; z = 2. E_tn = ΔH/2F includes the
/// heats of mixing of the concentrated solutions (the consistent pair of the Nernst voltage).
ReactionProperties brine_electrolysis_at(double temperature, double nacl_molality, double naoh_molality);

/// Molality (mol per kg of water) of a binary solution of mass fraction w: w/((1 − w)·M).
double molality_from_mass_fraction(double mass_fraction, double molar_mass);
/// Mass fraction of a binary solution of molality m: m·M/(1 + m·M).
double mass_fraction_from_molality(double molality, double molar_mass);

/// Conductivity of a liquid electrolyte of fixed composition near its operating point,
/// Arrhenius in temperature: σ(T) = σ_ref·exp[−(E_a/R)(1/T − 1/T_ref)].
struct ArrheniusConductivity {
    double reference_conductivity;  // S/m at the reference temperature
    double reference_temperature;   // K
    double activation_energy;       // J/mol
};
double arrhenius_conductivity(const ArrheniusConductivity& model, double temperature);

/// Area-specific resistance (Ω·m²) of a liquid gap of width δ filled with electrolyte of
/// conductivity σ carrying a gas void fraction ε, Bruggeman: δ / (σ·(1 − ε)^1.5).
double bubbly_gap_resistance(double gap, double conductivity, double void_fraction);

}  // namespace ely
