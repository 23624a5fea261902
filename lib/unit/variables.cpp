#include "unit/variables.hpp"

#include <deque>
#include <fmt/format.h>
#include <iterator>
#include <map>
#include <string>

namespace ely {

namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kNotGiven = std::numeric_limits<double>::quiet_NaN();

constexpr VariableInfo input(const char* name, const char* unit, const char* description) {
    return describe(name, unit, Causality::input, description);
}
constexpr VariableInfo output(const char* name, const char* unit, const char* description) {
    return describe(name, unit, Causality::output, description);
}
/// Fixed by the plant description (structural): readable, not settable.
constexpr VariableInfo structural(const char* name, const char* unit, const char* description) {
    return describe(name, unit, Causality::parameter, description);
}
/// Settable between solves through Block::set with the config's limits.
constexpr VariableInfo tunable(const char* name, const char* unit, const char* description) {
    return describe(name, unit, Causality::parameter, description).with(Variability::tunable);
}
/// An alarm: 0 or 1; its label is the text the solve's warning message gives when it is raised.
constexpr VariableInfo alarm(const char* name, const char* message, const char* description) {
    return describe(name, "1", Causality::output, description).with(Variability::discrete).within(0, 1).labelled(message);
}
constexpr VariableInfo fraction(const char* name, const char* description) {
    return output(name, "mol/mol", description).within(0, 1).scaled(0.1).shown_in(display::percent);
}

constexpr uint32_t H2 = kMakesHydrogen, O2 = kMakesOxygen, BRINE = kBrineProducts, TABLE = kReactionTable,
                   STEAM = kSteamFeed;

// The main product of a cell built from a reaction table (product.main and the figures per kg of
// it); the rule is also in docs/cells-brine-custom.md.
#define ELY_MAIN_PRODUCT_RULE                                                                        \
    "the product of the first reaction, cathode list first, that makes neither hydrogen nor oxygen; " \
    "when every reaction makes one of them, the first cathode reaction's product"

struct Entry {
    Var var;
    VariableInfo info;
};

// clang-format off
constexpr Entry kTable[] = {
    {in_current_density, input("in.current_density", "A/m2", "cell current density (the drive input when operating.spec is current_density)")
        .at_least(0).starts(1e4).scaled(1e4).labelled("current density (set)").shown_in(display::A_per_cm2)
        .configured_by("$.operating.current_density")},
    {in_current, input("in.current", "A", "DC current of all stacks together (the drive input when operating.spec is current)")
        .at_least(0).starts(kNotGiven).scaled(1e4).labelled("DC current, all stacks (set)").shown_in(display::kA)
        .configured_by("$.operating.current")},
    {in_power, input("in.power", "W", "DC power of all stacks together (the drive input when operating.spec is power)")
        .at_least(0).starts(kNotGiven).scaled(1e6).labelled("DC power, all stacks (set)").shown_in(display::MW)
        .configured_by("$.operating.power")},
    {in_hydrogen_rate, input("in.hydrogen_rate", "kg/s", "hydrogen product of the plant (the drive input when operating.spec is hydrogen_rate)")
        .needing(H2).at_least(0).starts(kNotGiven).scaled(1e-2).labelled("hydrogen rate (set)").shown_in(display::kg_per_h)
        .configured_by("$.operating.hydrogen_rate")},
    {in_voltage, input("in.voltage", "V", "cell voltage (the drive input when operating.spec is voltage)")
        .above(0).starts(kNotGiven).scaled(2).labelled("cell voltage (set)").configured_by("$.operating.voltage")},
    {in_temperature, input("in.temperature", "K", "stack temperature; within the cell model's envelope")
        .above(0).scaled(350).labelled("stack temperature").shown_in(display::degC)
        .configured_by("$.operating.temperature")},
    {in_pressure_cathode, input("in.pressure_cathode", "Pa", "cathode (hydrogen side) pressure, absolute; within the cell model's envelope")
        .above(0).starts(101325).scaled(1e5).labelled("cathode pressure").shown_in(display::bar)
        .configured_by("$.operating.pressure_cathode")},
    {in_pressure_anode, input("in.pressure_anode", "Pa", "anode (oxygen or chlorine side) pressure, absolute; within the cell model's envelope")
        .above(0).starts(101325).scaled(1e5).labelled("anode pressure").shown_in(display::bar)
        .configured_by("$.operating.pressure_anode")},
    {in_hours_operated, input("in.hours_operated", "h", "operating hours so far, for the degradation")
        .at_least(0).starts(0).scaled(1e4).labelled("operating hours").configured_by("$.operating.hours_operated")},
    {in_feed_temperature, input("in.feed_temperature", "K", "temperature of the make-up water (or brine, or steam) entering the plant")
        .within(273.15, 1273.15).starts(298.15).scaled(300).labelled("feed temperature").shown_in(display::degC)
        .configured_by("$.plant.thermal.feed_temperature")},
    {in_coolant_temperature, input("in.coolant_temperature", "K",
        "coolant temperature at the inlet of the plant's exchanger (dynamic runs)")
        .above(0).starts(kNotGiven).scaled(300).labelled("coolant inlet temperature").shown_in(display::degC)
        .configured_by("$.operating.coolant_temperature")},
    {in_coolant_flow, input("in.coolant_flow", "kg/s",
        "coolant flow to the plant's exchanger (dynamic runs): the flow itself when param.thermal.temperature_control "
        "is 0; the flow through the fully open valve when the plant's temperature control throttles it (default: "
        "sized so that it takes 110 % of the heat of rated load at the temperature setpoint)")
        .at_least(0).starts(kNotGiven).scaled(10).labelled("coolant flow").shown_in(display::t_per_h)
        .configured_by("$.operating.coolant_flow")},
    {in_ambient_temperature, input("in.ambient_temperature", "K", "ambient temperature for the heat loss")
        .within(223.15, 373.15).starts(298.15).scaled(300).labelled("ambient temperature").shown_in(display::degC)
        .configured_by("$.plant.thermal.ambient_temperature")},
    {in_mode_request, input("in.mode_request", "1",
        "operating mode the host asks for in dynamic runs: 0 off, 1 hot standby, 2 production, 3 automatic "
        "(production while the setpoint reaches the minimum load, else hot standby); steady solves ignore it")
        .with(Variability::discrete).within(0, 3).starts(2).scaled(2).labelled("mode request")
        .configured_by("$.operating.mode_request")},

    {par_cells, structural("param.cells", "1", "cells in series per stack")
        .within(1, 10000).scaled(100).labelled("cells per stack").configured_by("$.stack.cells")},
    {par_stacks, structural("param.stacks", "1", "identical stacks in parallel")
        .within(1, 1000).starts(1).labelled("stacks").configured_by("$.stack.stacks")},
    // 1e-6 m2 (0.01 cm2) is far below a laboratory cell (common practice: lab cells have a few cm2).
    {par_active_area, structural("param.active_area", "m2", "active area per cell")
        .within(1e-6, 100).scaled(0.1).labelled("active area per cell").configured_by("$.stack.active_area")},
    {par_current_density_max, tunable("param.current_density_max", "A/m2",
        "highest current density the plant may be driven to (the spec solves stay at or below it); 0 in the plant "
        "description (or when set) = the cell model's own maximum (its validity limit), which is then the value")
        .at_least(0).starts(0).scaled(2e4).labelled("highest current density").shown_in(display::A_per_cm2)
        .configured_by("$.plant.limits.current_density_max")},
    {par_rated_current_density, tunable("param.limits.rated_current_density", "A/m2",
        "rated (nominal) current density of the plant: load, minimum load, the current-density alarm and the "
        "automatic rectifier rating count against it; 0 = the technology's documented rated value (docs/variables.md, "
        "technology registry), for a custom cell its maximum current density")
        .at_least(0).starts(0).scaled(1e4).labelled("rated current density").shown_in(display::A_per_cm2)
        .configured_by("$.plant.limits.rated_current_density")},
    {par_min_load_fraction, tunable("param.limits.min_load_fraction", "1",
        "minimum load as a fraction of the rated current density; below it an alarm is raised")
        .within(0, 1).starts(0.1).scaled(0.1).labelled("minimum load").shown_in(display::percent)
        .configured_by("$.plant.limits.min_load_fraction")},
    {par_temperature_max, tunable("param.limits.temperature_max", "K",
        "highest stack temperature of the plant, above it an alarm; 0 = the cell model's envelope")
        .at_least(0).starts(0).scaled(350).labelled("temperature limit").configured_by("$.plant.limits.temperature_max")},
    {par_rectifier_rated_power, tunable("param.rectifier.rated_power", "W",
        "rated DC power of the plant's rectifier; 0 = sized to the stacks at the rated current density at the "
        "configured operating point")
        .at_least(0).starts(0).scaled(1e6).labelled("rectifier rating").shown_in(display::MW)
        .configured_by("$.plant.rectifier.rated_power")},
    {par_rectifier_loss_no_load, tunable("param.rectifier.loss_no_load", "1",
        "a0 of the rectifier losses P_rated (a0 + a1 x + a2 x^2), x = P_DC/P_rated, the usual split of converter "
        "losses (common practice; default typical value, from memory)")
        .within(0, 1).starts(0.005).scaled(0.01).labelled("rectifier no-load loss").shown_in(display::percent)
        .configured_by("$.plant.rectifier.loss_no_load")},
    {par_rectifier_loss_linear, tunable("param.rectifier.loss_linear", "1", "a1 of the rectifier losses (typical value, from memory)")
        .within(0, 1).starts(0.010).scaled(0.01).labelled("rectifier linear loss").shown_in(display::percent)
        .configured_by("$.plant.rectifier.loss_linear")},
    {par_rectifier_loss_quadratic, tunable("param.rectifier.loss_quadratic", "1",
        "a2 of the rectifier losses (typical value, from memory: about 97 % efficiency at rated load with a0, a1)")
        .within(0, 1).starts(0.015).scaled(0.01).labelled("rectifier quadratic loss").shown_in(display::percent)
        .configured_by("$.plant.rectifier.loss_quadratic")},
    {par_auxiliaries_fixed, tunable("param.auxiliaries.fixed", "W", "fixed balance-of-plant power, AC")
        .at_least(0).starts(0).scaled(1e4).labelled("auxiliaries, fixed").shown_in(display::kW)
        .configured_by("$.plant.auxiliaries.fixed")},
    {par_auxiliaries_proportional, tunable("param.auxiliaries.proportional", "1",
        "balance-of-plant power as a fraction of the DC stack power (typical value, from memory)")
        .within(0, 1).starts(0.03).scaled(0.03).labelled("auxiliaries, proportional").shown_in(display::percent)
        .configured_by("$.plant.auxiliaries.proportional")},
    {par_alarms_h2_in_o2_warning, tunable("param.alarms.h2_in_o2_warning", "1",
        "H2 in the dry anode gas, mol/mol, that raises a warning (a quarter of the lower flammability limit, common "
        "practice); must be below the trip level")
        .above(0).at_most(1).starts(0.01).scaled(0.01).labelled("H2-in-O2 warning level").shown_in(display::percent)
        .configured_by("$.plant.alarms.h2_in_o2_warning")},
    {par_alarms_h2_in_o2_trip, tunable("param.alarms.h2_in_o2_trip", "1",
        "H2 in the dry anode gas, mol/mol, that trips the plant (half the lower flammability limit, common practice); "
        "must be below the lower flammability limit")
        .above(0).at_most(1).starts(0.02).scaled(0.02).labelled("H2-in-O2 trip level").shown_in(display::percent)
        .configured_by("$.plant.alarms.h2_in_o2_trip")},
    {par_alarms_lower_flammability_limit, tunable("param.alarms.lower_flammability_limit", "1",
        "lower flammability limit of H2 in O2, mol/mol (about 4 %, from memory)")
        .above(0).at_most(1).starts(0.04).scaled(0.04).labelled("H2-in-O2 flammability limit").shown_in(display::percent)
        .configured_by("$.plant.alarms.lower_flammability_limit")},
    {par_degradation_voltage_rate, tunable("param.degradation.voltage_rate", "V/h",
        "cell-voltage rise per operating hour (added to the ohmic loss)")
        .at_least(0).starts(0).scaled(1e-6).labelled("voltage degradation rate").shown_in(display::uV_per_h)
        .configured_by("$.plant.degradation.voltage_rate")},
    {par_degradation_resistance_rate, tunable("param.degradation.resistance_rate", "ohm m2/h",
        "area-specific-resistance rise per operating hour")
        .at_least(0).starts(0).scaled(1e-9).labelled("resistance degradation rate")
        .configured_by("$.plant.degradation.resistance_rate")},
    {par_degradation_voltage_limit, tunable("param.degradation.voltage_limit", "V",
        "cell voltage at the rated current density and the temperature setpoint at which the stacks are replaced: "
        "the run summary gives the operating hours when it is reached; 0 = no limit")
        .at_least(0).starts(0).scaled(2).labelled("stack replacement voltage")
        .configured_by("$.plant.degradation.voltage_limit")},
    {par_heat_loss_coefficient, tunable("param.thermal.heat_loss_coefficient", "W/K",
        "heat loss to ambient per stack and kelvin of stack-to-ambient difference (default: the technology's value "
        "per m2 of cell area, docs/dynamics.md)")
        .at_least(0).starts(kNotGiven).scaled(10).labelled("heat loss coefficient per stack")
        .configured_by("$.plant.thermal.heat_loss_coefficient")},
    {par_gas_cooler_temperature, tunable("param.thermal.gas_cooler_temperature", "K",
        "outlet temperature of the gas coolers: the wet product gases are cooled to it (not below the stack "
        "temperature's own value when that is lower) and the water they condense returns to the water loop "
        "(default 30 degC: cooling water at 20-25 degC with a 5-10 K approach, common practice; value from memory; "
        "not below 25 degC, where the gas property fits start)")
        .within(298.15, 373.15).starts(303.15).scaled(300).labelled("gas cooler outlet temperature").shown_in(display::degC)
        .configured_by("$.plant.thermal.gas_cooler_temperature")},

    {par_heat_capacity, tunable("param.heat_capacity", "J/K",
        "heat capacity of the whole plant: stacks, electrolyte or water loop, separators (dynamic runs; default: "
        "the technology's value per m2 of cell area)")
        .above(0).starts(kNotGiven).scaled(1e7).labelled("heat capacity").shown_in(display::MJ_per_K)
        .configured_by("$.plant.heat_capacity")},
    {par_ramp_rate, tunable("param.ramp_rate", "1/s",
        "fastest change of the current in dynamic runs, as a fraction of the rated current (param.limits.rated_current_density "
        "x active area x stacks) per second (default: the technology's)")
        .above(0).at_most(1e3).starts(kNotGiven).scaled(0.01).labelled("ramp rate").shown_in(display::percent_per_s)
        .configured_by("$.plant.ramp_rate")},
    {par_exchanger_ua, tunable("param.thermal.exchanger_ua", "W/K",
        "conductance UA of the coolant exchanger, effectiveness 1 - exp(-UA/(coolant flow x heat capacity)); default: "
        "sized with in.coolant_flow so that the open valve takes 110 % of the heat of rated load at the temperature "
        "setpoint")
        .at_least(0).starts(kNotGiven).scaled(1e5).labelled("exchanger UA").shown_in(display::kW_per_K)
        .configured_by("$.plant.thermal.exchanger_ua")},
    {par_coolant_heat_capacity, tunable("param.thermal.coolant_heat_capacity", "J/(kg K)",
        "specific heat capacity of the coolant (default: the technology's coolant, water or air)")
        .above(0).starts(kNotGiven).scaled(4000).labelled("coolant heat capacity")
        .configured_by("$.plant.thermal.coolant_heat_capacity")},
    {par_temperature_control, tunable("param.thermal.temperature_control", "1",
        "1: the plant's controller (proportional-integral) throttles the coolant valve to hold the temperature "
        "setpoint, and shuts it when the plant is off; 0: the coolant flows at in.coolant_flow whatever the "
        "temperature and mode (the host controls it)")
        .within(0, 1).starts(1).labelled("plant temperature control (0/1)")
        .configured_by("$.plant.thermal.temperature_control")},
    {par_temperature_setpoint, tunable("param.thermal.temperature_setpoint", "K",
        "stack temperature the plant's controller holds with the coolant valve (default: the plant description's "
        "operating temperature, operating.temperature)")
        .above(0).starts(kNotGiven).scaled(350).labelled("temperature setpoint").shown_in(display::degC)
        .configured_by("$.plant.thermal.temperature_setpoint")},
    {par_control_band, tunable("param.thermal.control_band", "K",
        "proportional band of the plant's temperature controllers: the coolant valve's proportional action moves it "
        "through its full travel over this many kelvin, and the standby heater goes from off to full power over it "
        "(a few kelvin, common practice)")
        .within(0.01, 100).starts(2).scaled(2).labelled("temperature control band")
        .configured_by("$.plant.thermal.control_band")},
    {par_integral_time, tunable("param.thermal.integral_time", "s",
        "integral time of the coolant valve's controller, which removes the offset of the proportional action (a "
        "few minutes for a slow thermal loop, common practice)")
        .above(0).starts(300).scaled(300).labelled("temperature control integral time").shown_in(display::minutes)
        .configured_by("$.plant.thermal.integral_time")},
    {par_holdup_time, tunable("param.separator.holdup_time", "s",
        "gas hold-up time of the anode separator at rated load: its gas volume holds this many seconds of the anode "
        "gas made at the rated current, and mixes as one volume (default: the technology's)")
        .above(0).starts(kNotGiven).scaled(100).labelled("separator gas hold-up at rated load")
        .configured_by("$.plant.separator.holdup_time")},
    {par_standby_method, tunable("param.standby.method", "1",
        "how hot standby keeps the plant warm: 0 an electric heater holding param.standby.temperature, 1 a minimum "
        "current (param.standby.current_fraction)")
        .within(0, 1).starts(0).labelled("standby by heater (0) or minimum current (1)")
        .configured_by("$.plant.standby.method")},
    {par_standby_temperature, tunable("param.standby.temperature", "K",
        "temperature the heater holds in hot standby and after a start from cold (default: the temperature setpoint "
        "less the control band)")
        .above(0).starts(kNotGiven).scaled(350).labelled("standby temperature").shown_in(display::degC)
        .configured_by("$.plant.standby.temperature")},
    {par_heater_power, tunable("param.standby.heater_power", "W",
        "rating of the standby heater (default: heats the plant from ambient to the standby temperature in the "
        "technology's heat-up time while covering the heat loss there)")
        .at_least(0).starts(kNotGiven).scaled(1e5).labelled("heater rating").shown_in(display::kW)
        .configured_by("$.plant.standby.heater_power")},
    {par_standby_current_fraction, tunable("param.standby.current_fraction", "1",
        "current of hot standby by minimum current, as a fraction of the rated current (default: the minimum load "
        "fraction)")
        .within(0, 1).starts(kNotGiven).scaled(0.1).labelled("standby current").shown_in(display::percent)
        .configured_by("$.plant.standby.current_fraction")},
    {par_startup_cold_duration, tunable("param.startup.cold_duration", "s",
        "shortest start from cold (purge, pressurisation) before current flows (default: the technology's)")
        .at_least(0).starts(kNotGiven).scaled(600).labelled("start from cold, duration").shown_in(display::minutes)
        .configured_by("$.plant.startup.cold_duration")},
    {par_startup_warm_duration, tunable("param.startup.warm_duration", "s",
        "duration of a start from hot standby (default: the technology's)")
        .at_least(0).starts(kNotGiven).scaled(60).labelled("start from standby, duration").shown_in(display::minutes)
        .configured_by("$.plant.startup.warm_duration")},
    {par_startup_temperature, tunable("param.startup.temperature", "K",
        "lowest stack temperature at which current may flow after a start from cold; the heater raises the plant "
        "to it (default: the cell model's lowest temperature)")
        .above(0).starts(kNotGiven).scaled(350).labelled("start from cold, temperature").shown_in(display::degC)
        .configured_by("$.plant.startup.temperature")},
    {par_dynamics_tolerance, tunable("param.dynamics.tolerance", "1",
        "error tolerance of the time integration, relative (and absolute on states scaled to order one)")
        .within(1e-12, 1e-3).starts(1e-6).scaled(1e-6).labelled("integration tolerance")
        .configured_by("$.plant.dynamics.tolerance")},

    {cell_voltage, output("cell.voltage", "V", "cell voltage: reversible + activation (anode, cathode) + ohmic + concentration")
        .scaled(2).labelled("cell voltage")},
    {cell_reversible_voltage, output("cell.reversible_voltage", "V", "reversible (Nernst) voltage at the operating temperature and pressures")
        .scaled(1.2).labelled("reversible voltage")},
    {cell_thermoneutral_voltage, output("cell.thermoneutral_voltage", "V", "thermoneutral voltage of the cell reaction (HHV basis for liquid feed)")
        .scaled(1.5).labelled("thermoneutral voltage")},
    {cell_activation_anode, output("cell.activation_anode", "V", "anode activation overpotential")
        .scaled(0.3).labelled("anode activation")},
    {cell_activation_cathode, output("cell.activation_cathode", "V", "cathode activation overpotential")
        .scaled(0.1).labelled("cathode activation")},
    {cell_ohmic, output("cell.ohmic", "V", "ohmic loss, including the degradation rise")
        .scaled(0.2).labelled("ohmic (incl. degradation)")},
    {cell_concentration, output("cell.concentration", "V", "concentration (mass-transport) overpotential")
        .scaled(0.01).labelled("concentration")},
    {cell_degradation, output("cell.degradation", "V", "part of cell.ohmic due to operating hours")
        .scaled(0.01).labelled("degradation (part of ohmic)")},
    {cell_current_density, output("cell.current_density", "A/m2", "cell current density at the solved point")
        .scaled(1e4).labelled("current density").shown_in(display::A_per_cm2)},
    {cell_faraday_efficiency, output("cell.faraday_efficiency", "1", "Faraday efficiency, hydrogen basis")
        .labelled("Faraday efficiency").shown_in(display::percent)},
    {cell_caustic_efficiency, output("cell.caustic_efficiency", "1", "caustic current efficiency")
        .needing(BRINE).labelled("caustic current efficiency").shown_in(display::percent)},
    {cell_chlorine_efficiency, output("cell.chlorine_efficiency", "1", "chlorine current efficiency")
        .needing(BRINE).labelled("chlorine current efficiency").shown_in(display::percent)},
    {cell_main_product_efficiency, output("cell.main_product_efficiency", "1",
        "current efficiency of the main product (its share of its electrode's current); main product: " ELY_MAIN_PRODUCT_RULE)
        .needing(TABLE).labelled("current efficiency, main product").shown_in(display::percent)},

    {stack_current, output("stack.current", "A", "DC current of all stacks together (each stack carries its share)")
        .scaled(1e4).labelled("DC current (all stacks)").shown_in(display::kA)},
    {stack_voltage, output("stack.voltage", "V", "voltage across the stacks (cells in series per stack)")
        .scaled(200).labelled("stack voltage")},
    {stack_power, output("stack.power", "W", "DC power of all stacks together")
        .scaled(1e6).labelled("DC power").shown_in(display::MW)},
    {stack_temperature, output("stack.temperature", "K",
        "stack temperature: the thermal state of dynamic runs; in.temperature after a steady solve")
        .scaled(350).labelled("stack temperature (state)").shown_in(display::degC)},
    {plant_power, output("plant.power", "W", "AC power drawn by the plant: stacks, rectifier losses, auxiliaries")
        .scaled(1e6).labelled("AC power (rectifier, auxiliaries)").shown_in(display::MW)},
    {plant_rectifier_loss, output("plant.rectifier_loss", "W", "rectifier losses")
        .scaled(1e4).labelled("rectifier loss").shown_in(display::kW)},
    {plant_rectifier_efficiency, output("plant.rectifier_efficiency", "1", "DC power over the AC power the rectifier draws")
        .labelled("rectifier efficiency").shown_in(display::percent)},
    {plant_auxiliary_power, output("plant.auxiliary_power", "W", "auxiliary (balance-of-plant) power")
        .scaled(1e4).labelled("auxiliary power").shown_in(display::kW)},

    {product_hydrogen, output("product.hydrogen", "kg/s", "hydrogen in the cathode product, dry basis")
        .needing(H2).scaled(1e-2).labelled("hydrogen").shown_in(display::kg_per_h)},
    {product_oxygen, output("product.oxygen", "kg/s", "oxygen in the anode product, dry basis")
        .needing(O2).scaled(1e-1).labelled("oxygen").shown_in(display::kg_per_h)},
    {product_chlorine, output("product.chlorine", "kg/s", "chlorine in the anode product, dry basis")
        .needing(BRINE).scaled(1e-1).labelled("chlorine").shown_in(display::kg_per_h)},
    {product_caustic, output("product.caustic", "kg/s", "sodium hydroxide made, 100 % basis")
        .needing(BRINE).scaled(1e-1).labelled("caustic (100 % NaOH)").shown_in(display::kg_per_h)},
    {product_caustic_solution, output("product.caustic_solution", "kg/s", "caustic solution leaving at its configured strength")
        .needing(BRINE).scaled(1e-1).labelled("caustic solution").shown_in(display::kg_per_h)},
    {product_main, output("product.main", "kg/s",
        "main product made, plant total (NaN when its reaction gives no product_molar_mass); main product: " ELY_MAIN_PRODUCT_RULE)
        .needing(TABLE).scaled(1e-2).labelled("main product made").shown_in(display::kg_per_h)},
    {feed_water, output("feed.water", "kg/s",
        "make-up water the plant takes in at the feed temperature: the water reacted + the vapour still in the gases "
        "after their gas coolers (stream.dryer_loss and the vented anode gas's) + water drained (stream.drain) + the "
        "water of the caustic solution (brine); the gas coolers' condensate returns to the loop")
        .scaled(1e-1).labelled("make-up water").shown_in(display::kg_per_h)},
    {feed_salt, output("feed.salt", "kg/s", "sodium chloride consumed")
        .needing(BRINE).scaled(1e-1).labelled("salt").shown_in(display::kg_per_h)},
    {feed_hydrogen, output("feed.hydrogen", "kg/s",
        "hydrogen drawn back from the product line: in hot standby (no current) or below the current density at "
        "which the gas crossing the separator equals the gas made, the cathode loses more hydrogen to the anode side "
        "than it makes, and the plant holding its cathode pressure feeds the difference; 0 in production")
        .needing(H2).at_least(0).scaled(1e-4).labelled("hydrogen drawn back (standby)").shown_in(display::kg_per_h)},
    {feed_sweep_air, output("feed.sweep_air", "kg/s",
        "air swept over the oxygen electrode (cell.oxygen_electrode_o2_fraction below 1); it enters at the feed "
        "temperature, is heated to the stack temperature (heat.feed_heating) and leaves with the oxygen")
        .needing(STEAM).at_least(0).scaled(1e-1).labelled("sweep air").shown_in(display::kg_per_h)},

    {stream_cathode_mass_flow, output("stream.cathode.mass_flow", "kg/s",
        "cathode (hydrogen-side) product gas leaving the plant after its gas cooler, wet: saturated at the cooler "
        "outlet temperature")
        .scaled(1e-2).labelled("cathode gas (wet, cooled)").shown_in(display::kg_per_h)},
    {stream_cathode_temperature, output("stream.cathode.temperature", "K",
        "cathode product gas temperature after its gas cooler (the stack temperature when that is lower)")
        .scaled(350).labelled("cathode gas temperature").shown_in(display::degC)},
    {stream_cathode_pressure, output("stream.cathode.pressure", "Pa", "cathode product stream pressure")
        .scaled(1e5).labelled("cathode gas pressure").shown_in(display::bar)},
    {stream_cathode_x_h2, fraction("stream.cathode.x_h2", "hydrogen mole fraction of the wet cathode gas").labelled("cathode gas H2")},
    {stream_cathode_x_o2, fraction("stream.cathode.x_o2", "oxygen mole fraction of the wet cathode gas").labelled("cathode gas O2")},
    {stream_cathode_x_h2o, fraction("stream.cathode.x_h2o", "water vapour mole fraction of the wet cathode gas").labelled("cathode gas H2O")},
    {stream_anode_mass_flow, output("stream.anode.mass_flow", "kg/s",
        "anode product gas leaving the plant after its gas cooler, wet (gas only; with the sweep air of a swept "
        "oxygen electrode)")
        .scaled(1e-1).labelled("anode gas (wet, cooled)").shown_in(display::kg_per_h)},
    {stream_anode_temperature, output("stream.anode.temperature", "K",
        "anode product gas temperature after its gas cooler (the stack temperature when that is lower)")
        .scaled(350).labelled("anode gas temperature").shown_in(display::degC)},
    {stream_anode_pressure, output("stream.anode.pressure", "Pa", "anode product stream pressure")
        .scaled(1e5).labelled("anode gas pressure").shown_in(display::bar)},
    {stream_anode_x_o2, fraction("stream.anode.x_o2", "oxygen mole fraction of the wet anode gas").labelled("anode gas O2")},
    {stream_anode_x_h2, fraction("stream.anode.x_h2", "hydrogen mole fraction of the wet anode gas").labelled("anode gas H2")},
    {stream_anode_x_cl2, fraction("stream.anode.x_cl2", "chlorine mole fraction of the wet anode gas").needing(BRINE).labelled("anode gas Cl2")},
    {stream_anode_x_h2o, fraction("stream.anode.x_h2o", "water vapour mole fraction of the wet anode gas").labelled("anode gas H2O")},
    {stream_anode_x_n2, fraction("stream.anode.x_n2", "nitrogen mole fraction of the wet anode gas (sweep air; argon counted with it)")
        .needing(STEAM).labelled("anode gas N2")},
    {stream_condensate_mass_flow, output("stream.condensate.mass_flow", "kg/s",
        "water condensed from both product gases in their gas coolers and returned to the water loop (internal: "
        "neither make-up nor product)")
        .at_least(0).scaled(1e-1).labelled("condensate returned").shown_in(display::kg_per_h)},
    {stream_drain_mass_flow, output("stream.drain.mass_flow", "kg/s",
        "liquid water leaving the plant at the stack temperature: water dragged to the cathode when it is not "
        "returned (plant.drag_water_returned false)")
        .at_least(0).scaled(1e-1).labelled("water drained").shown_in(display::kg_per_h)},
    {stream_dryer_loss_mass_flow, output("stream.dryer_loss.mass_flow", "kg/s",
        "water vapour left in the cooled hydrogen-side gas (part of stream.cathode), which its dryer removes and "
        "discharges: lost from the plant's water")
        .needing(H2).at_least(0).scaled(1e-3).labelled("water lost in the dryer").shown_in(display::kg_per_h)},

    {gas_h2_in_o2, fraction("gas.h2_in_o2", "hydrogen in the dry anode gas; in dynamic runs the gas of the anode separator, "
        "which the alarms watch").scaled(0.01).labelled("H2 in anode gas (dry)")},
    {gas_h2_in_o2_stack, fraction("gas.h2_in_o2_stack", "hydrogen in the dry anode gas as it leaves the stacks, before it "
        "mixes into the separator's gas volume").scaled(0.01).labelled("H2 in anode gas leaving the stacks (dry)")},
    {gas_o2_in_h2, fraction("gas.o2_in_h2", "oxygen in the dry cathode gas").scaled(0.001).labelled("O2 in cathode gas (dry)")},
    {gas_o2_in_cl2, fraction("gas.o2_in_cl2", "oxygen in the dry chlorine (anode) gas").needing(BRINE).scaled(0.01).labelled("O2 in chlorine (dry)")},

    {heat_duty, output("heat.duty", "W",
        "heat to remove from the stacks to hold their temperature (negative: heat to supply): DC power + the enthalpy "
        "of what enters the stacks (make-up water at the feed temperature, condensate at the gas cooler temperature, "
        "steam and sweep air at the stack temperature, salt solutions) - the enthalpy of what leaves them at the stack "
        "temperature - heat.loss")
        .scaled(1e5).labelled("heat duty (+ remove, - supply)").shown_in(display::kW)},
    {heat_loss, output("heat.loss", "W", "heat lost to ambient")
        .scaled(1e3).labelled("heat lost to ambient").shown_in(display::kW)},
    {heat_gas_coolers, output("heat.gas_coolers", "W",
        "heat removed in the gas coolers: both product gases cooled from the stack temperature to the cooler outlet "
        "temperature, with the condensation of the water they lose")
        .scaled(1e4).labelled("heat removed in the gas coolers").shown_in(display::kW)},
    {heat_feed_heating, output("heat.feed_heating", "W",
        "heat supplied to raise the steam fed to a steam-fed cell from the make-up water (feed temperature) and the "
        "returned condensate (gas cooler temperature), and to heat the sweep air, to the stack temperature; no heat "
        "is recovered from the products here (heat.gas_coolers is what they give off)")
        .needing(STEAM).scaled(1e5).labelled("heat to raise steam and sweep air").shown_in(display::kW)},
    {heat_released, output("heat.released", "W",
        "heat released in the plant: the stacks' net heat at their temperature (electrical input less the enthalpy "
        "rise from the feed at its own temperature to the products at stack temperature; heat.duty + heat.loss) plus "
        "the heater's; param.heat_capacity x d(stack.temperature)/dt = heat.released - heat.to_coolant - heat.loss")
        .scaled(1e5).labelled("heat released").shown_in(display::kW)},
    {heat_heater, output("heat.heater", "W", "heat from the standby heater (part of heat.released and of plant.power)")
        .scaled(1e4).labelled("heater").shown_in(display::kW)},
    {heat_to_coolant, output("heat.to_coolant", "W",
        "heat taken by the coolant; after a steady solve the heat duty, all of it removed by the coolant")
        .scaled(1e5).labelled("heat to coolant").shown_in(display::kW)},
    {coolant_flow, output("coolant.flow", "kg/s",
        "coolant flow through the exchanger (dynamic runs; not a number after a steady solve)")
        .at_least(0).scaled(10).labelled("coolant flow").shown_in(display::t_per_h)},
    {coolant_outlet_temperature, output("coolant.outlet_temperature", "K",
        "coolant temperature leaving the exchanger (dynamic runs; the inlet temperature when no coolant flows; not a "
        "number after a steady solve)")
        .scaled(300).labelled("coolant outlet temperature").shown_in(display::degC)},
    {state_mode, output("state.mode", "1",
        "operating mode: 0 off, 1 hot standby, 2 production, 3 starting from cold, 4 starting from hot standby "
        "(2 after a steady solve)")
        .with(Variability::discrete).within(0, 4).scaled(2).labelled("mode")},
    {state_hours_operated, output("state.hours_operated", "h",
        "operating hours, counted while current flows: in.hours_operated at reset, then accumulating; the "
        "degradation's clock (in.hours_operated after a steady solve)")
        .at_least(0).scaled(1e4).labelled("operating hours (state)")},
    {state_starts, output("state.starts", "1", "start-ups since reset, from cold and from hot standby (0 after a steady solve)")
        .with(Variability::discrete).at_least(0).scaled(10).labelled("start-ups")},

    {perf_specific_energy, output("perf.specific_energy", "J/kg", "DC stack energy per kg of hydrogen product")
        .needing(H2).scaled(2e8).labelled("specific energy, DC stack").shown_in(display::kWh_per_kg)},
    {perf_specific_energy_plant, output("perf.specific_energy_plant", "J/kg", "AC plant energy per kg of hydrogen product")
        .needing(H2).scaled(2e8).labelled("specific energy, AC plant").shown_in(display::kWh_per_kg)},
    {perf_efficiency_hhv, output("perf.efficiency_hhv", "1",
        "hydrogen product HHV at 25 degC over the energy the plant takes in to make it: DC stack power plus the heat "
        "supplied from outside (heat.feed_heating of a steam-fed cell, and the heat a stack run below thermoneutral "
        "needs, -heat.duty when negative); at most 1 on this basis")
        .needing(H2).labelled("efficiency (HHV; DC + heat supplied)").shown_in(display::percent)},
    {perf_efficiency_lhv, output("perf.efficiency_lhv", "1",
        "hydrogen product LHV at 25 degC over the same energy as perf.efficiency_hhv (DC stack power plus the heat "
        "supplied from outside)")
        .needing(H2).labelled("efficiency (LHV; DC + heat supplied)").shown_in(display::percent)},
    {perf_specific_energy_chlorine, output("perf.specific_energy_chlorine", "J/kg", "DC stack energy per kg of chlorine product")
        .needing(BRINE).scaled(1e7).labelled("DC energy per tonne of chlorine").shown_in(display::kWh_per_t)},
    {perf_load_fraction, output("perf.load_fraction", "1", "current density over the rated current density")
        .scaled(0.5).labelled("load (of rated current density)").shown_in(display::percent)},
    {perf_water_per_hydrogen, output("perf.water_per_hydrogen", "1", "make-up water per hydrogen product, kg/kg")
        .needing(H2).scaled(9).labelled("water per hydrogen").shown_in(display::kg_per_kg)},
    {perf_specific_energy_caustic, output("perf.specific_energy_caustic", "J/kg", "DC stack energy per kg of caustic product (100 % NaOH)")
        .needing(BRINE).scaled(9e6).labelled("DC energy per tonne of caustic (100 % NaOH)").shown_in(display::kWh_per_t)},
    {perf_salt_per_chlorine, output("perf.salt_per_chlorine", "1", "salt consumed per chlorine product, kg/kg (t/t)")
        .needing(BRINE).scaled(1.7).labelled("salt per tonne of chlorine").shown_in(display::t_per_t)},
    {perf_water_per_chlorine, output("perf.water_per_chlorine", "1", "make-up water per chlorine product, kg/kg (t/t)")
        .needing(BRINE).scaled(3).labelled("make-up water per tonne of chlorine").shown_in(display::t_per_t)},
    {perf_salt_per_caustic, output("perf.salt_per_caustic", "1", "salt consumed per caustic product (100 % NaOH), kg/kg (t/t)")
        .needing(BRINE).scaled(1.5).labelled("salt per tonne of caustic").shown_in(display::t_per_t)},
    {perf_water_per_caustic, output("perf.water_per_caustic", "1", "make-up water per caustic product (100 % NaOH), kg/kg (t/t)")
        .needing(BRINE).scaled(3).labelled("make-up water per tonne of caustic").shown_in(display::t_per_t)},
    {perf_specific_energy_main, output("perf.specific_energy_main", "J/kg",
        "DC stack energy per kg of the main product (NaN without its product_molar_mass); main product: " ELY_MAIN_PRODUCT_RULE)
        .needing(TABLE).scaled(1e7).labelled("DC energy per kg of main product").shown_in(display::kWh_per_kg)},

    {alarm_h2_in_o2_warning, alarm("alarm.h2_in_o2_warning", "hydrogen in the anode gas at or above the warning level",
        "1 when hydrogen in the anode gas is at or above the warning level")},
    {alarm_h2_in_o2_trip, alarm("alarm.h2_in_o2_trip", "hydrogen in the anode gas at or above the trip level",
        "1 when hydrogen in the anode gas is at or above the trip level")},
    {alarm_temperature_high, alarm("alarm.temperature_high", "stack temperature above its limit",
        "1 when the stack temperature is above its limit")},
    {alarm_current_density_high, alarm("alarm.current_density_high", "current density above the rated current density",
        "1 when the current density is above the rated current density")},
    {alarm_load_low, alarm("alarm.load_low", "load below the minimum load",
        "1 when the current density is below the minimum load fraction of the rated current density")},
    {alarm_extrapolated, alarm("alarm.extrapolated", "cell model extrapolated beyond its fitted range",
        "1 when the cell model runs outside the range its parameters were fitted in")},
    {alarm_any, alarm("alarm.any", "an alarm is raised", "1 when any alarm above is raised")},
};
// clang-format on
#undef ELY_MAIN_PRODUCT_RULE

constexpr bool in_enum_order() {
    for (int i = 0; i < static_cast<int>(std::size(kTable)); ++i)
        if (kTable[i].var != i) return false;
    return true;
}
static_assert(std::size(kTable) == kVarCount, "one table entry per Var");
static_assert(in_enum_order(), "table entries in the order of the Var enum");

std::string label_of_key(const char* key) {
    std::string s(key);
    for (char& c : s)
        if (c == '_') c = ' ';
    return s;
}

// The text behind cell_parameter_variables(): built once for every technology of the registry.
struct CellParameterTables {
    std::deque<std::string> text;
    std::map<const TechnologyInfo*, std::vector<VariableInfo>> variables;
};

const CellParameterTables& cell_parameter_tables() {
    static const CellParameterTables tables = [] {
        CellParameterTables t;
        const auto keep = [&](std::string s) { return t.text.emplace_back(std::move(s)).c_str(); };
        for (const auto& tech : technologies()) {
            auto& list = t.variables[&tech];
            if (!tech.parameters) continue;
            for (const auto& p : tech.parameters()) {
                VariableInfo v = tunable(keep(fmt::format("param.cell.{}", p.key)), p.unit,
                                         keep(fmt::format("{} (default: {})", p.description, p.source)))
                                     .within(p.min, p.max)
                                     .starts(p.default_value)
                                     .scaled(p.default_value != 0.0 ? std::fabs(p.default_value)
                                                                    : (p.max > 0 && std::isfinite(p.max) ? p.max : 1.0))
                                     .labelled(keep(label_of_key(p.key)))
                                     .configured_by(keep(fmt::format("$.cell.{}", p.key)));
                list.push_back(v);
            }
        }
        return t;
    }();
    return tables;
}

}  // namespace

const VariableInfo& variable_info(Var v) { return kTable[v].info; }

bool technology_has(const TechnologyInfo& technology, const VariableInfo& variable) {
    return technology.has(variable.needs);
}

const std::vector<VariableInfo>& cell_parameter_variables(const TechnologyInfo& technology) {
    return cell_parameter_tables().variables.at(&technology);
}

const std::vector<SpecInfo>& specs() {
    static const std::vector<SpecInfo> all = {
        {Spec::current_density, "current_density", in_current_density},
        {Spec::current, "current", in_current},
        {Spec::power, "power", in_power},
        {Spec::hydrogen_rate, "hydrogen_rate", in_hydrogen_rate},
        {Spec::voltage, "voltage", in_voltage},
    };
    return all;
}

const SpecInfo& spec_info(Spec spec) { return specs()[static_cast<std::size_t>(spec)]; }

const SpecInfo* find_spec(std::string_view name) {
    for (const auto& s : specs())
        if (name == s.name) return &s;
    return nullptr;
}

const char* spec_name(Spec spec) { return spec_info(spec).name; }

std::string spec_names() {
    std::string out;
    for (const auto& s : specs()) out += (out.empty() ? "" : ", ") + std::string(s.name);
    return out;
}

}  // namespace ely
