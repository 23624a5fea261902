#pragma once
// A small table of species in every phase an electrolysis cell meets — gases, liquid water,
// aqueous ions, solid metals and salts, molten metals and salts — on the one enthalpy reference
// of lib/thermo (elements in their standard states at 298.15 K and p° = 1 bar have h = 0; s is
// absolute; aqueous ions use the conventional scale with H⁺(aq) = 0 for h, s and cp, the
// hypothetical ideal 1 mol/kg solution as standard state). Each row names its source. From
// species and stoichiometry follow ΔH(T), ΔS(T), ΔG(T) of a reaction and hence E_rev(T), E_tn(T).
//
// Heat capacity of a condensed phase: cp = a + b·T + c/T² (J/(mol K), T in K; the Maier–Kelley
// form, constant cp with b = c = 0), one segment per phase along the path from the phase stable
// at 298.15 K: a molten salt or metal is the solid to its melting point, the enthalpy of fusion,
// then the liquid's cp — above or below the melting point (a supercooled melt, the usual standard
// state of a salt dissolved in a chloride bath). Gases use the NIST Shomate fits of species.hpp,
// liquid water IAPWS-IF97 (water.hpp).
#include <array>
#include <string>
#include <string_view>
#include <vector>

#include "thermo/reaction.hpp"
#include "thermo/species.hpp"

namespace ely {

enum class Phase { gas, liquid, aqueous, solid, melt };
const char* phase_name(Phase phase);
/// The phase named by phase_name's text ("gas", "liquid", "aqueous", "solid", "melt"); false if none.
bool phase_from_name(std::string_view name, Phase* phase);

/// One phase along a condensed species' path: cp = a + b·T + c/T² from t_start on; entering this
/// segment adds transition_enthalpy (J/mol; fusion, say) at t_start (and its entropy ΔH/t_start).
struct HeatCapacitySegment {
    double t_start;              // K
    double a, b, c;              // J/(mol K), J/(mol K²), J K/mol
    double transition_enthalpy;  // J/mol, 0 for the first segment
};

struct SpeciesRecord {
    enum class Model { condensed, ideal_gas, liquid_water };
    std::string name;                 // formula as written in configs: "Zn+2", "MgCl2", "H2O"
    Phase phase = Phase::solid;
    Model model = Model::condensed;
    Species gas = Species::hydrogen;  // Model::ideal_gas only
    double molar_mass = 0;            // kg/mol
    int charge = 0;                   // aqueous ions: in units of the elementary charge
    double formation_enthalpy = 0;    // J/mol at 298.15 K, of the phase stable there (condensed)
    double entropy = 0;               // J/(mol K) at 298.15 K, p° (absolute; conventional for ions)
    std::array<HeatCapacitySegment, 3> segments{};  // condensed: the path from 298.15 K
    int segment_count = 0;
    double temperature_min = 298.15, temperature_max = 298.15;  // K, where the row is valid
    std::string source;
};

/// The bundled rows (sources in each row and in docs/cells-brine-custom.md).
const std::vector<SpeciesRecord>& species_table();

/// The bundled row of a species in a phase; unknown_name, listing the known ones, if absent.
const SpeciesRecord& species_record(std::string_view name, Phase phase);

/// A row given by a user (a config extending the table): one constant-or-Maier–Kelley cp segment.
/// Checks the numbers (finite, M > 0, T range inside 1..5000 K); errors name the species.
SpeciesRecord user_species_record(std::string name, Phase phase, double molar_mass, int charge,
                                  double formation_enthalpy, double entropy, double cp_a, double cp_b, double cp_c, double temperature_min,
                                  double temperature_max, std::string source);

/// Molar properties of a row at T (K) and p°: h includes ΔfH°, s is absolute, g = h − T·s.
/// Outside [temperature_min, temperature_max]: out_of_range naming the species and the range.
MolarProperties species_properties(const SpeciesRecord& species, double temperature);

/// A species with its stoichiometric coefficient: positive for products, negative for reactants.
struct SpeciesTerm {
    SpeciesRecord species;
    double coefficient;
};

/// ΔH, ΔS, ΔG of Σ ν_i·species_i at T, each species in its standard state (J per mol of reaction as
/// written; `electrons` is carried into the result for the voltages of reaction.hpp).
ReactionProperties reaction_properties(const std::vector<SpeciesTerm>& terms, int electrons, double temperature);

/// A half-reaction written as a reduction, ox + n e⁻ → red (terms: ox negative, red positive),
/// completed with the standard hydrogen electrode, (n/2) H2 → n H⁺ + n e⁻, so that it balances
/// elements and charge: ΔH, ΔS, ΔG per mol of electrons. E°(T) vs SHE = −ΔG/F; the cell's
/// decomposition voltage is E°_anode − E°_cathode and its thermoneutral voltage
/// (ΔH_cathode − ΔH_anode)/F (the SHE terms cancel). The charges must balance (Σ ν·z = −n):
/// invalid_argument otherwise. Formulas are not parsed: the element balance is the writer's.
ReactionProperties half_reaction_per_electron(const std::vector<SpeciesTerm>& reduction_terms, int electrons,
                                              double temperature);

}  // namespace ely
