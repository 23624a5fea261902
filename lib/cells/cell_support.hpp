#pragma once
// Pieces the technology models share: reading switches and electrode kinetics from their
// parameter values, and the activation loss of one electrode.
#include <cstdint>

#include "cells/cell.hpp"
#include "cells/parameters.hpp"
#include "electrochem/kinetics.hpp"

namespace ely {

/// An integer parameter ("kinetics_model", "shunt_cells", ...): its value must be a whole number;
/// the limits are those of its entry in the parameter table (one limit, one place).
uint32_t read_choice(const ParameterValues& values, const char* key);

/// Kinetics of one electrode from "<electrode>_exchange_current_density",
/// "<electrode>_activation_energy", "<electrode>_transfer_coefficient_forward|backward".
ElectrodeKinetics read_kinetics(const ParameterValues& values, const char* electrode, double reference_temperature);

/// Largest current density a cell accepts: its envelope maximum, or just below the limiting
/// current density where the concentration loss diverges, whichever is smaller.
double current_density_cap(double envelope_maximum, double limiting_current_density);

/// Activation overpotential at j: Butler–Volmer solved exactly, or Tafel when `tafel`.
double activation_overpotential(const ElectrodeKinetics& kinetics, bool tafel, double current_density,
                                double temperature);

/// Start of a liquid-fed water cell's evaluation at p: the reversible voltage with the wet product
/// gases over an electrolyte of the given water activity, the HHV thermoneutral voltage, gases
/// leaving saturated. Returns true at open circuit (j = 0), where the voltage is the reversible
/// voltage and every loss is 0; the caller still fills the gases (fill_water_cell_gases at zero
/// electrode current: the crossover of a cell held at temperature and pressure, hot standby).
bool start_liquid_water_cell(CellResult& result, const OperatingPoint& point, double water_activity);

/// Gas crossing the separator of a water cell, mol/(m² s): hydrogen to the anode side, oxygen
/// to the cathode side. The hydrogen flux may rise with the electrode current density j_e
/// (supersaturation of dissolved hydrogen at the cathode): N_H2(j_e) = hydrogen +
/// hydrogen_per_current_density·j_e.
struct CrossoverFluxes {
    double hydrogen;                          // mol/(m² s) at j_e = 0
    double oxygen;                            // mol/(m² s)
    double hydrogen_per_current_density = 0;  // mol/(m² s) per A/m², i.e. mol/(A s)
    double hydrogen_at(double electrode_current_density) const {
        return hydrogen + hydrogen_per_current_density * electrode_current_density;
    }
};

/// What happens to the gas that crosses: a fraction of the oxygen reaching the cathode burns
/// hydrogen there, a fraction of the hydrogen reaching the anode burns oxygen there (a
/// recombination catalyst); both form water that stays in the loop.
struct Recombination {
    double oxygen_at_cathode = 0;    // 0..1
    double hydrogen_at_anode = 0;    // 0..1
};

/// Smallest electrode current density whose gas production still exceeds what crosses and
/// recombines, A/m² (both the hydrogen leaving the cathode and the oxygen leaving the anode
/// stay positive): below it the cell is in standby (fill_water_cell_gases).
double crossover_minimum_current_density(const CrossoverFluxes& crossover, const Recombination& recombination);

/// Gas bookkeeping of a water cell (PEM, alkaline, AEM): from the electrode current density (the
/// current that makes gas, >= 0), the terminal current density and the crossover, fills the product
/// fluxes, the water consumed (one H2O per H2 leaving either side; recombined water stays in the
/// loop), the Faraday efficiency on the terminal current and both purities.
///
/// At any current density, zero included: oxygen can cross or burn hydrogen only as far as the anode
/// makes it (at zero current none crosses and the anode catalyst burns nothing); hydrogen crosses as
/// the membrane passes it. Below the current at which crossover equals production (hot standby, or
/// a very low load) the cathode loses more hydrogen than it makes: nothing leaves as product, the
/// shortfall is drawn back from the product line (consumed[kH2] > 0) and the anode gas is mostly the
/// crossed hydrogen, so h2_in_o2 reports it (1 at zero current). Faraday efficiency: hydrogen
/// delivered over j/2F (0 at or below that current).
void fill_water_cell_gases(CellResult& result, double electrode_current_density, const CrossoverFluxes& crossover,
                           const Recombination& recombination, const OperatingPoint& point);

}  // namespace ely
