#pragma once
// Chlor-alkali membrane cell (brine electrolysis): helpers beside the factory that the
// technology registry names (brine_parameters(), make_brine_cell()). Equations, defaults and
// their sources: docs/cells-brine-custom.md.
#include "cells/cell.hpp"

namespace ely {

/// Caustic current efficiency of the membrane (typical linear relation, see the docs):
/// CE = CE_ref − s·(w − w_ref), clipped to at most 1; w_ref = 0.32. Throws when CE <= 0.
double brine_caustic_current_efficiency(double naoh_mass_fraction, double efficiency_at_32wt, double slope_per_mass_fraction);

/// O2 in the dry anode gas, mol/mol: O2/(Cl2 + O2) from a brine result's anode_out.
/// With the model's stoichiometry this is (1 − CE)/(1 + CE). (CellResult has no field for it
/// yet; h2_in_o2 carries H2 in the anode gas, zero for a membrane cell.)
double brine_o2_in_cl2(const CellResult& result);

}  // namespace ely
