#pragma once
// The variable table, version 1: the one list of names, units, causalities, variabilities,
// limits, defaults, display labels and units, config keys and descriptions that the C
// interface, the FMU description, the Python wrapper, the spreadsheet functions, the command
// line and the docs all read. Names follow `group.quantity`; units are SI (hours for the
// operating-hours input).
//
// "stack" means the DC side of the plant: the configured stacks are identical and connected
// in parallel on one rectifier bus, so they share stack.voltage, and stack.current and
// stack.power are their totals (so are in.current and in.power). "plant" adds the AC side
// (rectifier losses, auxiliaries). Products, feeds and streams are plant totals.
//
// Which technologies have a variable follows from its `needs` (TechnologyFeature bits of the
// registry, lib/cells/registry.hpp). A block adds, after the table's variables, one tunable
// parameter per key of its technology's parameter table ("param.cell.<key>") and the outputs
// its cell adds (Cell::own_outputs).
#include <cstdint>
#include <string_view>
#include <vector>

#include "base/variable_info.hpp"
#include "cells/registry.hpp"

namespace ely {

// Master identifiers; the order is the table's order and is part of the docs, not the ABI
// (hosts look variables up by name).
enum Var : int {
    // inputs
    in_current_density, in_current, in_power, in_hydrogen_rate, in_voltage,
    in_temperature, in_pressure_cathode, in_pressure_anode, in_hours_operated, in_feed_temperature,
    in_coolant_temperature, in_coolant_flow, in_ambient_temperature, in_mode_request,
    // parameters: structural (fixed by the plant description), then tunable
    par_cells, par_stacks, par_active_area,
    par_current_density_max, par_rated_current_density, par_min_load_fraction, par_temperature_max,
    par_rectifier_rated_power, par_rectifier_loss_no_load, par_rectifier_loss_linear, par_rectifier_loss_quadratic,
    par_auxiliaries_fixed, par_auxiliaries_proportional,
    par_alarms_h2_in_o2_warning, par_alarms_h2_in_o2_trip, par_alarms_lower_flammability_limit,
    par_degradation_voltage_rate, par_degradation_resistance_rate, par_degradation_voltage_limit,
    par_heat_loss_coefficient, par_gas_cooler_temperature,
    // parameters of the plant in time (dynamic runs)
    par_heat_capacity, par_ramp_rate, par_exchanger_ua, par_coolant_heat_capacity, par_temperature_control,
    par_temperature_setpoint, par_control_band, par_integral_time, par_holdup_time,
    par_standby_method, par_standby_temperature, par_heater_power, par_standby_current_fraction,
    par_startup_cold_duration, par_startup_warm_duration, par_startup_temperature, par_dynamics_tolerance,
    // cell
    cell_voltage, cell_reversible_voltage, cell_thermoneutral_voltage, cell_activation_anode,
    cell_activation_cathode, cell_ohmic, cell_concentration, cell_degradation, cell_current_density,
    cell_faraday_efficiency, cell_caustic_efficiency, cell_chlorine_efficiency, cell_main_product_efficiency,
    // stack and plant
    stack_current, stack_voltage, stack_power, stack_temperature, plant_power,
    plant_rectifier_loss, plant_rectifier_efficiency, plant_auxiliary_power,
    // products and feeds (plant totals)
    product_hydrogen, product_oxygen, product_chlorine, product_caustic, product_caustic_solution,
    product_main, feed_water, feed_salt, feed_hydrogen, feed_sweep_air,
    // streams
    stream_cathode_mass_flow, stream_cathode_temperature, stream_cathode_pressure, stream_cathode_x_h2,
    stream_cathode_x_o2, stream_cathode_x_h2o,
    stream_anode_mass_flow, stream_anode_temperature, stream_anode_pressure, stream_anode_x_o2,
    stream_anode_x_h2, stream_anode_x_cl2, stream_anode_x_h2o, stream_anode_x_n2,
    stream_condensate_mass_flow, stream_drain_mass_flow, stream_dryer_loss_mass_flow,
    // purity
    gas_h2_in_o2, gas_h2_in_o2_stack, gas_o2_in_h2, gas_o2_in_cl2,
    // heat
    heat_duty, heat_loss, heat_gas_coolers, heat_feed_heating, heat_released, heat_heater, heat_to_coolant, coolant_flow,
    coolant_outlet_temperature,
    // the state of the plant in time
    state_mode, state_hours_operated, state_starts,
    // performance
    perf_specific_energy, perf_specific_energy_plant, perf_efficiency_hhv, perf_efficiency_lhv,
    perf_specific_energy_chlorine, perf_load_fraction, perf_water_per_hydrogen,
    perf_specific_energy_caustic, perf_salt_per_chlorine, perf_water_per_chlorine, perf_salt_per_caustic,
    perf_water_per_caustic, perf_specific_energy_main,
    // alarms (0 or 1): alarm_first .. alarm_last, then their summary
    alarm_h2_in_o2_warning, alarm_h2_in_o2_trip, alarm_temperature_high, alarm_current_density_high,
    alarm_load_low, alarm_extrapolated, alarm_any,
    kVarCount
};
constexpr Var alarm_first = alarm_h2_in_o2_warning;
constexpr Var alarm_last = alarm_extrapolated;

/// Operating modes (the values of state.mode) and mode requests (in.mode_request: the first three
/// and automatic).
enum class Mode : int { off = 0, standby = 1, production = 2, starting_cold = 3, starting_warm = 4 };
enum class ModeRequest : int { off = 0, standby = 1, production = 2, automatic = 3 };

/// The whole table, indexed by Var.
const VariableInfo& variable_info(Var v);

/// Whether a technology has a variable of the table.
bool technology_has(const TechnologyInfo& technology, const VariableInfo& variable);

/// The tunable parameters a technology adds for the keys of its parameter table,
/// "param.cell.<key>" in the table's order (empty for a technology built from reactions).
/// Built once per technology and never changed: the strings live for the whole program.
const std::vector<VariableInfo>& cell_parameter_variables(const TechnologyInfo& technology);

/// Which drive input the solve reads (config: operating.spec).
enum class Spec { current_density, current, power, hydrogen_rate, voltage };

struct SpecInfo {
    Spec spec;
    const char* name;  // config value and ely_block_set_spec argument
    Var drive;         // the input the solve reads
};
const std::vector<SpecInfo>& specs();
const SpecInfo& spec_info(Spec spec);
const SpecInfo* find_spec(std::string_view name);  // null when unknown
const char* spec_name(Spec spec);
std::string spec_names();  // "current_density, current, ..."

}  // namespace ely
