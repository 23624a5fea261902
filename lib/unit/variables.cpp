#include "unit/variables.hpp"

namespace ely {

uint32_t tech_bit(Technology t) { return 1u << static_cast<unsigned>(t); }

namespace {
constexpr Causality I = Causality::input, O = Causality::output, P = Causality::parameter;
constexpr uint32_t A = kTechAll, W = kTechWater, B = kTechBrine;
constexpr uint32_t H2 = kTechWater | kTechBrine | kTechCustom;  // technologies that make hydrogen

const VariableInfo kTable[kVarCount] = {
    {"in.current_density", "A/m2", I, A, "cell current density (drive input when operating.spec = current_density)"},
    {"in.current", "A", I, A, "DC current of all stacks (drive input when operating.spec = current)"},
    {"in.power", "W", I, A, "DC power of all stacks (drive input when operating.spec = power)"},
    {"in.hydrogen_rate", "kg/s", I, H2, "plant hydrogen product (drive input when operating.spec = hydrogen_rate)"},
    {"in.voltage", "V", I, A, "cell voltage (drive input when operating.spec = voltage)"},
    {"in.temperature", "K", I, A, "stack temperature"},
    {"in.pressure_cathode", "Pa", I, A, "cathode (hydrogen side) pressure, absolute"},
    {"in.pressure_anode", "Pa", I, A, "anode (oxygen or chlorine side) pressure, absolute"},
    {"in.hours_operated", "h", I, A, "operating hours, for degradation"},
    {"in.feed_temperature", "K", I, A, "temperature of the make-up water or brine entering the plant"},

    {"param.cells", "1", P, A, "cells in series per stack"},
    {"param.stacks", "1", P, A, "stacks in parallel"},
    {"param.active_area", "m2", P, A, "active area per cell"},
    {"param.current_density_max", "A/m2", P, A, "maximum current density of the plant (configuration)"},

    {"cell.voltage", "V", O, A, "cell voltage: reversible + activation (anode, cathode) + ohmic + concentration"},
    {"cell.reversible_voltage", "V", O, A, "reversible (Nernst) voltage at the operating temperature and pressures"},
    {"cell.thermoneutral_voltage", "V", O, A, "thermoneutral voltage of the cell reaction (HHV basis for liquid feed)"},
    {"cell.activation_anode", "V", O, A, "anode activation overpotential"},
    {"cell.activation_cathode", "V", O, A, "cathode activation overpotential"},
    {"cell.ohmic", "V", O, A, "ohmic loss, including the degradation rise"},
    {"cell.concentration", "V", O, A, "concentration (mass-transport) overpotential"},
    {"cell.degradation", "V", O, A, "part of cell.ohmic due to operating hours"},
    {"cell.current_density", "A/m2", O, A, "cell current density at the solved point"},
    {"cell.faraday_efficiency", "1", O, A, "Faraday efficiency, hydrogen basis"},
    {"cell.caustic_efficiency", "1", O, B, "caustic current efficiency"},
    {"cell.chlorine_efficiency", "1", O, B, "chlorine current efficiency"},

    {"stack.current", "A", O, A, "DC current of all stacks (each stack carries its share)"},
    {"stack.voltage", "V", O, A, "voltage across the stacks (cells in series per stack)"},
    {"stack.power", "W", O, A, "DC power of all stacks"},
    {"plant.power", "W", O, A, "AC power drawn by the plant: stacks, rectifier losses, auxiliaries"},
    {"plant.rectifier_loss", "W", O, A, "rectifier losses"},
    {"plant.rectifier_efficiency", "1", O, A, "DC power over the AC power the rectifier draws"},
    {"plant.auxiliary_power", "W", O, A, "auxiliary (balance-of-plant) power"},

    {"product.hydrogen", "kg/s", O, H2, "hydrogen in the cathode product, dry basis"},
    {"product.oxygen", "kg/s", O, W, "oxygen in the anode product, dry basis"},
    {"product.chlorine", "kg/s", O, B, "chlorine in the anode product, dry basis"},
    {"product.caustic", "kg/s", O, B, "sodium hydroxide made, 100 % basis"},
    {"product.caustic_solution", "kg/s", O, B, "caustic solution leaving at its configured strength"},
    {"feed.water", "kg/s", O, A, "net make-up water: reaction + vapour leaving with the gases + water not returned"},
    {"feed.salt", "kg/s", O, B, "sodium chloride consumed"},

    {"stream.cathode.mass_flow", "kg/s", O, A, "cathode product stream, wet"},
    {"stream.cathode.temperature", "K", O, A, "cathode product stream temperature"},
    {"stream.cathode.pressure", "Pa", O, A, "cathode product stream pressure"},
    {"stream.cathode.x_h2", "mol/mol", O, A, "hydrogen mole fraction of the wet cathode gas"},
    {"stream.cathode.x_o2", "mol/mol", O, A, "oxygen mole fraction of the wet cathode gas"},
    {"stream.cathode.x_h2o", "mol/mol", O, A, "water vapour mole fraction of the wet cathode gas"},
    {"stream.anode.mass_flow", "kg/s", O, A, "anode product stream, wet (gas only)"},
    {"stream.anode.temperature", "K", O, A, "anode product stream temperature"},
    {"stream.anode.pressure", "Pa", O, A, "anode product stream pressure"},
    {"stream.anode.x_o2", "mol/mol", O, A, "oxygen mole fraction of the wet anode gas"},
    {"stream.anode.x_h2", "mol/mol", O, A, "hydrogen mole fraction of the wet anode gas"},
    {"stream.anode.x_cl2", "mol/mol", O, B, "chlorine mole fraction of the wet anode gas"},
    {"stream.anode.x_h2o", "mol/mol", O, A, "water vapour mole fraction of the wet anode gas"},
    {"stream.brine_feed.mass_flow", "kg/s", O, B,
     "resaturated brine fed to the anolyte (internal brine loop; the net feeds are feed.salt and feed.water)"},
    {"stream.depleted_brine.mass_flow", "kg/s", O, B, "depleted brine leaving the anolyte (internal brine loop)"},
    {"stream.depleted_brine.nacl_mass_fraction", "1", O, B, "NaCl mass fraction of the depleted brine"},

    {"gas.h2_in_o2", "mol/mol", O, A, "hydrogen in the dry anode gas"},
    {"gas.o2_in_h2", "mol/mol", O, A, "oxygen in the dry cathode gas"},
    {"gas.o2_in_cl2", "mol/mol", O, B, "oxygen in the dry chlorine (anode) gas"},

    {"heat.duty", "W", O, A, "heat to remove to hold the stack temperature (negative: heat to supply)"},
    {"heat.loss", "W", O, A, "heat lost to ambient"},

    {"perf.specific_energy", "J/kg", O, H2, "DC stack energy per kg of hydrogen product"},
    {"perf.specific_energy_plant", "J/kg", O, H2, "AC plant energy per kg of hydrogen product"},
    {"perf.efficiency_hhv", "1", O, H2, "hydrogen product HHV at 25 degC over DC stack power"},
    {"perf.efficiency_lhv", "1", O, H2, "hydrogen product LHV at 25 degC over DC stack power"},
    {"perf.specific_energy_chlorine", "J/kg", O, B, "DC stack energy per kg of chlorine product"},
    {"perf.load_fraction", "1", O, A, "current density over the maximum current density"},
    {"perf.water_per_hydrogen", "1", O, H2, "make-up water per hydrogen product, kg/kg"},

    {"alarm.h2_in_o2_warning", "1", O, A, "1 when hydrogen in the anode gas is at or above the warning level"},
    {"alarm.h2_in_o2_trip", "1", O, A, "1 when hydrogen in the anode gas is at or above the trip level"},
    {"alarm.temperature_high", "1", O, A, "1 when the stack temperature is above its limit"},
    {"alarm.current_density_high", "1", O, A, "1 when the current density is above the rated maximum"},
    {"alarm.load_low", "1", O, A, "1 when the load is below the minimum load fraction"},
    {"alarm.extrapolated", "1", O, A, "1 when the cell model runs outside the range its parameters were fitted in"},
    {"alarm.any", "1", O, A, "1 when any alarm above is raised"},
};
}  // namespace

const VariableInfo& variable_info(Var v) { return kTable[v]; }

}  // namespace ely
