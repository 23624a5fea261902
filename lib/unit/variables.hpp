#pragma once
// The variable table, version 1: the one list of names, units, descriptions and causalities
// that the C interface, the FMU description, the Python wrapper, the spreadsheet functions,
// the command line and the docs all read. Names follow `group.quantity`; units are SI
// (hours for the operating-hours input).
//
// "stack" means the DC side of the plant: the configured stacks are identical and connected
// in parallel on one rectifier bus, so they share stack.voltage, and stack.current and
// stack.power are their totals. "plant" adds the AC side (rectifier losses, auxiliaries).
// Products, feeds and streams are plant totals.
#include <cstdint>

#include "cells/cell.hpp"

namespace ely {

enum class Causality : int32_t { input = 0, output = 1, parameter = 2 };

/// Which technologies carry a variable (bit per Technology).
enum TechMask : uint32_t {
    kTechPem = 1u << 0,
    kTechAlkaline = 1u << 1,
    kTechSolidOxide = 1u << 2,
    kTechBrine = 1u << 3,
    kTechCustom = 1u << 4,
    kTechWater = kTechPem | kTechAlkaline | kTechSolidOxide,
    kTechAll = 0x1f,
};
uint32_t tech_bit(Technology t);

struct VariableInfo {
    const char* name;
    const char* unit;
    Causality causality;
    uint32_t technologies;
    const char* description;
};

// Master identifiers; the order is the table's order and is part of the docs, not the ABI
// (hosts look variables up by name).
enum Var : int {
    // inputs
    in_current_density, in_current, in_power, in_hydrogen_rate, in_voltage,
    in_temperature, in_pressure_cathode, in_pressure_anode, in_hours_operated, in_feed_temperature,
    // parameters (from the configuration; read-only)
    par_cells, par_stacks, par_active_area, par_current_density_max,
    // cell
    cell_voltage, cell_reversible_voltage, cell_thermoneutral_voltage, cell_activation_anode,
    cell_activation_cathode, cell_ohmic, cell_concentration, cell_degradation, cell_current_density,
    cell_faraday_efficiency, cell_caustic_efficiency, cell_chlorine_efficiency,
    // stack and plant
    stack_current, stack_voltage, stack_power, plant_power,
    plant_rectifier_loss, plant_rectifier_efficiency, plant_auxiliary_power,
    // products and feeds (plant totals)
    product_hydrogen, product_oxygen, product_chlorine, product_caustic, product_caustic_solution,
    feed_water, feed_salt,
    // streams
    stream_cathode_mass_flow, stream_cathode_temperature, stream_cathode_pressure, stream_cathode_x_h2,
    stream_cathode_x_o2, stream_cathode_x_h2o,
    stream_anode_mass_flow, stream_anode_temperature, stream_anode_pressure, stream_anode_x_o2,
    stream_anode_x_h2, stream_anode_x_cl2, stream_anode_x_h2o,
    stream_brine_feed_mass_flow, stream_depleted_brine_mass_flow, stream_depleted_brine_nacl_mass_fraction,
    // purity
    gas_h2_in_o2, gas_o2_in_h2, gas_o2_in_cl2,
    // heat
    heat_duty, heat_loss,
    // performance
    perf_specific_energy, perf_specific_energy_plant, perf_efficiency_hhv, perf_efficiency_lhv,
    perf_specific_energy_chlorine, perf_load_fraction, perf_water_per_hydrogen,
    // alarms (0 or 1)
    alarm_h2_in_o2_warning, alarm_h2_in_o2_trip, alarm_temperature_high, alarm_current_density_high,
    alarm_load_low, alarm_extrapolated, alarm_any,
    kVarCount
};

/// The whole table, indexed by Var.
const VariableInfo& variable_info(Var v);

}  // namespace ely
