#pragma once
// Losses of hydrogen-producing current: gas permeation through the membrane or separator
// (diffusive, plus a pressure-driven Darcy term for a cathode above the anode), the empirical
// Faraday efficiency of Ulleberg (2003), and shunt (bypass) currents through the common
// electrolyte manifolds of bipolar alkaline stacks. SI units: fluxes in mol/(m² s) of cell
// area, permeabilities in mol/(m s Pa), current densities in A/m².
namespace ely {

/// Permeability of a gas through a membrane or electrolyte-filled separator with an Arrhenius
/// temperature dependence: P(T) = P_ref·exp[−(E/R)·(1/T − 1/T_ref)].
struct GasPermeability {
    double permeability;           // P_ref, mol/(m s Pa)
    double activation_energy;      // E, J/mol
    double reference_temperature;  // T_ref, K
};
double gas_permeability(const GasPermeability& gas, double temperature);

/// Diffusive (Fickian) permeation across a layer of thickness δ with the partial pressure
/// p_partial on one side and ≈ 0 on the other: N = P·p_partial/δ, mol/(m² s).
double permeation_flux(double permeability, double partial_pressure, double thickness);

/// Pressure-driven (Darcy) transport of dissolved gas with the water pushed through the
/// membrane by a cathode pressure above the anode pressure (Δp = p_c − p_a > 0):
/// N = K·p_gas·Δp/δ with K = κ·S/μ (hydraulic permeability κ, Henry solubility S, water
/// viscosity μ) in mol/(m s Pa²); zero for Δp <= 0.
double darcy_gas_flux(double coefficient, double gas_partial_pressure, double pressure_difference, double thickness);

/// Empirical Faraday efficiency of alkaline stacks, Ulleberg, Int. J. Hydrogen Energy 28
/// (2003) 21: η_F = (j²/(f1 + j²))·f2. Ulleberg gives j in mA/cm² and f1 in (mA/cm²)²; here j
/// is in A/m² and f1 in (A/m²)² (1 (mA/cm²)² = 100 (A/m²)²), which leaves η_F unchanged.
double faraday_efficiency_ulleberg(double current_density, double f1, double f2);

/// Shunt currents of a bipolar stack of N identical cells whose electrolyte reaches a common
/// manifold through one port (channel) per cell; manifold segments join neighbouring ports.
/// Cells are ideal voltage sources of equal voltage V (cell resistance small against the
/// channels); channel resistance R_ch, manifold segment resistance R_m = ρ·R_ch. Kirchhoff's
/// laws for the manifold nodes give a tridiagonal system; the electrode current of cell k is
/// I − S_k with S_k the sum of channel currents leaving cells 0..k. Returns the loss factor
/// G = Σ_k S_k/(V/R_ch), so that the hydrogen-producing current lost over the whole stack is
/// G·V/R_ch and the mean lost current density per cell is G·V/(N·R_ch·A). Several manifolds
/// of the same layout (anolyte/catholyte, inlet/outlet) act in parallel: use the parallel R_ch
/// and R_m (ρ unchanged). ρ = 0 (ideal manifold) is allowed. Allocates: call at setup.
double shunt_loss_factor(int cells, double manifold_to_channel_resistance_ratio);

}  // namespace ely
