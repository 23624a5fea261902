#pragma once
// Reaction thermodynamics of the cell reactions and their reversible and thermoneutral
// voltages. Sign convention: the reactions are written as electrolysis (decomposition),
// so ΔG > 0 and the reversible voltage E_rev = ΔG/(zF) is positive: it is the least voltage
// an external source must apply. The galvanic cell's emf is its negative.
namespace ely {

struct ReactionProperties {
    double enthalpy;  // ΔH, J per mol of reaction as written
    double entropy;   // ΔS, J/(mol K)
    double gibbs;     // ΔG, J/mol
    int electrons;    // z, electrons per mol of reaction
};

enum class WaterFeed { liquid, steam };

/// H2O(l or g) → H2(g) + ½ O2(g), every species in its standard state (p° = 1 bar) at T.
/// Liquid: 298..623.15 K (the H2 fit starts at 298 K; IF97 region 1 ends at 623.15 K);
/// steam: 298..1700 K.
ReactionProperties water_splitting(double temperature, WaterFeed feed);

/// 2 NaCl(aq) + 2 H2O(l) → Cl2(g) + H2(g) + 2 NaOH(aq), standard states (solutes: 1 mol/kg,
/// ideal-dilute reference), 298..473 K.
ReactionProperties brine_electrolysis(double temperature);

double reversible_voltage_standard(const ReactionProperties& reaction);  // ΔG/(zF), V
double thermoneutral_voltage(const ReactionProperties& reaction);        // ΔH/(zF), V

/// Thermoneutral voltage of water splitting with liquid feed (higher heating value basis)
/// and with steam feed (lower heating value basis), V.
double thermoneutral_voltage_hhv(double temperature);
double thermoneutral_voltage_lhv(double temperature);

/// Partial pressure of the product gas in a wet gas saturated with water vapour at T over an
/// electrolyte of water activity a_w: p − a_w·p_sat(T). A total pressure at or below the
/// water vapour pressure is an error (the gas would be pure steam), not a NaN.
double wet_gas_partial_pressure(double total_pressure, double temperature, double water_activity,
                                const char* what);

/// Water splitting, liquid feed: Nernst equation with the partial pressures of the wet
/// product gases (each saturated at T over water of activity a_w):
/// E = E°(T) + (RT/2F)·ln[(p_H2/p°)(p_O2/p°)^½ / a_w].
double reversible_voltage_liquid_water(double temperature, double pressure_anode, double pressure_cathode,
                                       double water_activity = 1.0);

/// Water splitting, steam feed: E = E°(T) + (RT/2F)·ln[(p_H2/p°)(p_O2/p°)^½ / (p_H2O/p°)],
/// partial pressures in Pa (H2 and H2O at the cathode, O2 at the anode).
double reversible_voltage_steam(double temperature, double p_h2, double p_h2o, double p_o2);

/// Brine electrolysis with an ideal cation-exchange membrane:
/// E = E°(T) + (RT/2F)·ln[(p_Cl2/p°)(p_H2/p°)·a_NaOH² / (a_NaCl²·a_H2O²)], where a_NaOH and
/// a_NaCl are the electrolyte activities (m·γ±/m°)² in catholyte and anolyte, and a_H2O the
/// catholyte water activity.
double reversible_voltage_brine(double temperature, double p_cl2, double p_h2, double activity_naoh,
                                double activity_nacl, double water_activity_catholyte);

}  // namespace ely
