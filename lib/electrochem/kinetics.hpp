#pragma once
// Electrode kinetics: Butler–Volmer solved exactly, Tafel as an option, Arrhenius exchange
// current density, and the concentration loss near a limiting current density.
//
// Sign convention: j >= 0 and η >= 0 in the electrode's electrolysis direction (oxidation at
// the anode, reduction at the cathode); "forward" is that direction.
namespace ely {

struct ElectrodeKinetics {
    double exchange_current_density;  // j0 at the reference temperature, A/m² of geometric area
    double activation_energy;         // J/mol, Arrhenius temperature dependence of j0
    double reference_temperature;     // K
    double alpha_forward;             // transfer coefficient of the forward (electrolysis) direction
    double alpha_backward;            // transfer coefficient of the reverse direction
};

/// Arrhenius factor exp[−(E_a/R)(1/T − 1/T_ref)]: a rate, conductivity or permeability at T
/// over its value at T_ref (a resistance scales with the factor of −E_a).
double arrhenius_factor(double activation_energy, double reference_temperature, double temperature);

/// j0(T) = j0_ref·exp[−(E_a/R)(1/T − 1/T_ref)].
double exchange_current_density(const ElectrodeKinetics& k, double temperature);

/// Butler–Volmer current density, A/m²: j = j0·[exp(α_f·Fη/RT) − exp(−α_b·Fη/RT)].
double butler_volmer_current(double overpotential, double j0, double alpha_forward, double alpha_backward,
                             double temperature);

/// Overpotential η >= 0 that drives j >= 0 by Butler–Volmer. α_f = α_b: closed form
/// η = (RT/(αF))·asinh(j/(2 j0)); otherwise a bracketed, safeguarded Newton solve on the
/// monotone BV curve (converges to machine precision; always terminates).
double butler_volmer_overpotential(double current_density, double j0, double alpha_forward, double alpha_backward,
                                   double temperature);

/// Tafel: η = (RT/(α_f F))·ln(j/j0) for j > j0, else 0 (the form is meaningless below j0).
double tafel_overpotential(double current_density, double j0, double alpha_forward, double temperature);

/// Concentration loss η = −(RT/(zF))·ln(1 − j/j_lim); j >= j_lim is an error (out_of_range)
/// naming both values, never a NaN.
double concentration_overpotential(double current_density, double limiting_current_density, double temperature,
                                   int electrons);

/// Concentration loss of a product gas that accumulates at the electrode, diffusing away against
/// the reactant: η = (RT/(zF))·ln(1 + j/j_p), with j_p = zF·D·c_p/δ the current density that would
/// double the product's concentration at the reaction zone (the counterpart of the limiting current
/// of the reactant). It has no limit; j_p <= 0 is an error.
double product_accumulation_overpotential(double current_density, double product_current_density, double temperature,
                                          int electrons);

}  // namespace ely
