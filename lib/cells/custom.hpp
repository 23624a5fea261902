#pragma once
// The custom cell: a table of half-reactions per electrode that compete for the current
// (PHYSICS.md, "Competing reactions"). The config layer fills these structures; equations,
// sign conventions and the choice of the mass-transport form: docs/cells-brine-custom.md.
//
// Sign convention: at each electrode the electrolysis direction counts positive — oxidation
// currents at the anode, reduction currents at the cathode. A reaction driven backwards by
// the common electrode potential (a metal redissolving while hydrogen evolves, say) carries a
// negative current and a negative share; the shares of one electrode always sum to 1.
#include <limits>
#include <memory>
#include <string>
#include <vector>

#include "cells/cell.hpp"
#include "electrochem/kinetics.hpp"
#include "thermo/species_table.hpp"

namespace ely {

struct HalfReaction {
    std::string name;     // e.g. "zinc deposition"
    std::string product;  // e.g. "Zn"; "H2", "O2" and "Cl2" also fill the flux arrays
    int electrons = 2;    // n per formula unit of product
    /// E° vs SHE at 298.15 K, V: the reduction potential as tabulated (CRC electrochemical series).
    /// Used when `species` is empty; with species, E°(T) follows from their data instead.
    double standard_potential = 0.0;
    double standard_potential_temperature_coefficient = 0.0;  // dE°/dT, V/K (0: E° held at its 25 °C value)
    /// The half-reaction's species written as a reduction, ox + n e⁻ → red (ox negative, red positive
    /// coefficients; H⁺(aq) where protons take part): E°(T) = −ΔG(T)/(nF) vs SHE and the reaction
    /// enthalpy for the thermoneutral voltage (thermo/species_table.hpp). Empty: the explicit
    /// standard_potential above, and no enthalpy.
    std::vector<SpeciesTerm> species{};
    /// Activities in the Nernst equation E = E° + (RT/nF)·ln(a_ox/a_red), each the product of
    /// its species' activities raised to their stoichiometric coefficients. Reactant: the species
    /// consumed in the electrolysis direction — the oxidized one at the cathode (e.g. Zn²⁺), the
    /// reduced one at the anode (e.g. Cl⁻ squared); product: the other side (solid or gas at unit
    /// activity unless given).
    double reactant_activity = 1.0;
    double product_activity = 1.0;
    /// Kinetics in the electrolysis direction of the electrode (alpha_forward: oxidation at the
    /// anode, reduction at the cathode); j0 on the geometric area, Arrhenius in T. The activation
    /// energy defaults to NaN, "not given": j0 is then known only at its reference temperature, and
    /// evaluating the cell at any other temperature is an error naming the reaction (no silent 0).
    ElectrodeKinetics kinetics{1.0, std::numeric_limits<double>::quiet_NaN(), 298.15, 0.5, 0.5};
    /// Mass-transport limit of the reactant, A/m² (+inf: none), at the kinetics reference temperature. It
    /// makes the share of a metal fall at low ion concentration.
    double limiting_current_density = std::numeric_limits<double>::infinity();
    /// Arrhenius activation energy of the limiting current density (diffusivity, and the solubility of a
    /// dissolved species, rise with T), J/mol; 0 holds it constant.
    double limiting_current_activation_energy = 0.0;
    double product_molar_mass = 0.0;  // kg/mol, for product mass rates (0 if not needed)
};

struct CustomCellSpec {
    std::vector<HalfReaction> anode;    // at least one
    std::vector<HalfReaction> cathode;  // at least one
    double area_specific_resistance = 0.0;  // Ω·m², electrolyte + separator + contacts, at the reference temperature
    /// Arrhenius activation energy of the electrolyte's conductivity: ASR(T) = ASR·exp[(E/R)(1/T − 1/T_ref)],
    /// J/mol; 0 holds the resistance constant.
    double area_specific_resistance_activation_energy = 0.0;
    double area_specific_resistance_reference_temperature = 298.15;  // K
    Envelope envelope{298.15, 373.15, 0.5e5, 5.0e5, 1.0e4, 298.15, 373.15};
    /// Thermoneutral voltage, V. NaN (the default): from the reactions' species, weighted by the
    /// current shares, E_tn = [Σ_cathode share·ΔH_red − Σ_anode share·ΔH_red]/F (ΔH per electron);
    /// a table whose reactions all make H2 or O2 and give no species is water splitting with liquid
    /// water (HHV basis). Any other table without species needs this value (make_custom_cell refuses
    /// it otherwise): N·I·(V − E_tn) is the stack's heat.
    double thermoneutral_voltage = std::numeric_limits<double>::quiet_NaN();
    /// Water activity of the electrolyte the product gases leave saturated over (0..1); 0: a dry
    /// electrolyte (a melt), the gases leave without water. NaN (the default): 1 for an aqueous table (a
    /// species in the aqueous phase or liquid water, or a table without species), 0 otherwise.
    double water_activity = std::numeric_limits<double>::quiet_NaN();
};

/// Checks the table (names, electrons >= 1, finite positive activities, j0 > 0, α > 0, limits > 0,
/// ASR >= 0, a sane envelope) and builds the cell; errors name the electrode, reaction and field.
std::unique_ptr<Cell> make_custom_cell(const CustomCellSpec& spec);

/// The same checks, and the table with its defaults filled in (the water activity; a product's molar
/// mass from its species, or for H2, O2, Cl2): what the cell is built from.
CustomCellSpec complete_custom_spec(const CustomCellSpec& spec);

/// Current through one reaction k at electrode potential Φ relative to its equilibrium
/// potential E_k, in the electrolysis direction (η = Φ − E_k at the anode, E_k − Φ at the
/// cathode), Butler–Volmer with the reactant's mass-transport limit in the exact form
/// j = j0 (e^{α_f f η} − e^{−α_b f η}) / (1 + (j0/j_lim) e^{α_f f η}), f = F/(RT).
double limited_butler_volmer_current(double overpotential, double j0, double alpha_forward, double alpha_backward,
                                     double limiting_current_density, double temperature);

/// Exchange current density of a half-reaction at T, A/m²: Arrhenius from its reference value;
/// an activation energy not given (NaN) is an error at any temperature but the reference one.
double half_reaction_exchange_current_density(const HalfReaction& reaction, bool at_anode, double temperature);

/// Equilibrium (Nernst) potential of a half-reaction at T vs SHE, V.
double half_reaction_equilibrium_potential(const HalfReaction& reaction, bool at_anode, double temperature);

/// Enthalpy of a half-reaction with species, per mol of electrons, as a reduction completed with the
/// standard hydrogen electrode (J/mol); NaN when it has no species.
double half_reaction_enthalpy_per_electron(const HalfReaction& reaction, double temperature);

/// Whether a table is water splitting without species (every product H2 or O2): its heat is then known.
bool water_only_table(const CustomCellSpec& spec);

/// Limiting current density of a half-reaction at T, A/m²: Arrhenius from its reference value about the
/// kinetics reference temperature.
double half_reaction_limiting_current_density(const HalfReaction& reaction, double temperature);

/// Product molar rate of reaction k, mol/(m² s): share_k·j/(n_k F).
double custom_product_rate(const HalfReaction& reaction, double share, double current_density);

/// Product molar rates of every reaction of the spec (anode reactions first, then cathode),
/// mol/(m² s), from a result of the cell built from that spec.
std::vector<double> custom_product_rates(const CustomCellSpec& spec, const CellResult& result);

}  // namespace ely
