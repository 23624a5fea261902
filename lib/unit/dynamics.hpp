#pragma once
// The plant in time: the state of a dynamic run (Block::reset / Block::advance, dynamics.cpp) and
// the heat-transfer and control laws it is built from. Equations and their sources:
// docs/dynamics.md.
//
// The run's state is plain data (numbers only), so that a block's copy continues exactly as the
// block would and the state can be saved and restored bit for bit (state_io.cpp): the thermal and
// separator states and the integrated totals, the current and its ramp, the mode and its timers,
// the operating hours and starts, the integrator's step-size history and the warm start of the
// current solve, and the figures of the run summary.
#include <array>
#include <cstdint>
#include <limits>

#include "unit/variables.hpp"

namespace ely {

// --- Heat transfer and control laws ------------------------------------------------------------

/// Heat taken by a coolant stream through an exchanger whose other side is the plant, well mixed
/// at one temperature (capacity ratio 0): effectiveness ε = 1 − exp(−NTU), NTU = UA/(ṁ c_p), heat
/// Q = ε ṁ c_p (T_plant − T_in), outlet T_in + Q/(ṁ c_p) (Incropera & DeWitt, Fundamentals of Heat
/// and Mass Transfer, ε–NTU relations, C_r = 0). No flow or no conductance: no heat, outlet = inlet.
struct CoolantHeat {
    double heat;                // W, positive when the coolant is heated (the plant cooled)
    double outlet_temperature;  // K
    double gain;                // W per kg/s: d(heat)/d(flow)
};
CoolantHeat coolant_heat(double ua, double heat_capacity, double flow, double inlet_temperature,
                         double plant_temperature);

/// The plant's temperature controller on the coolant valve: proportional-integral, gain one full
/// travel per band, integral time T_i, anti-windup by back-calculation with a tracking time T_t
/// (Åström & Hägglund, PID Controllers, 2nd ed., 1995, sec. 3.5). The integral term I is a state:
/// the opening is u = clamp((T − T_set)/band + I, 0, 1) and dI/dt = (T − T_set)/(band·T_i) +
/// (u − v)/T_t with v the unclamped value; a controller that is off holds the valve shut (u = 0) and
/// its integral tracks that.
struct ValveControl {
    double opening;  // 0..1
    double drive;    // dI/dt, 1/s
    double slope;    // du/dI: 1 between the stops, 0 at them
};
ValveControl valve_control(double temperature, double integral, double setpoint, double band, double integral_time,
                           bool active);

/// Power of a proportional heater of the given rating that is off at its target and at full power
/// one band below it.
double heater_output(double rating, double temperature, double target, double band);

// --- The state of a run ------------------------------------------------------------------------

/// Components of the integrated vector: the two states, then totals integrated with them.
enum RunComponent : int {
    rc_temperature,  // K, stack (plant) temperature
    rc_separator,    // mol/mol, H2 in the dry gas of the anode separator
    rc_valve,        // 1, the integral term of the coolant valve's controller
    rc_hydrogen,     // kg
    rc_chlorine,     // kg
    rc_water,        // kg, make-up water
    rc_energy_dc,    // J, DC stack energy
    rc_energy_ac,    // J, AC plant energy (rectifier, auxiliaries, heater)
    rc_heat_released,
    rc_heat_to_coolant,
    rc_heat_loss,  // J
    kRunComponents
};
constexpr int kModeCount = 5;

/// Step-size history of the integrator's controller, kept with the state so that a restored run
/// takes the steps the saved one would have taken.
struct IntegratorHistory {
    double next_step = 0;  // s, the controller's proposal (0: none yet)
    double error_old = 0, step_old = 0;
    int32_t first_step = 1, last_rejected = 0;
};

/// A segment of a run: between two events the mode, whether the current ramps or follows its
/// target, and what heats and cools the plant are fixed, so the right-hand side is smooth on it
/// and a pure function of the time and the state (dynamics.cpp).
struct RunSegment {
    double t0 = 0, j0 = 0, hours0 = 0, temperature0 = 0;
    int32_t mode = 0;
    int32_t ramp = 0;                    // −1, 0, +1
    double ramp_speed = 0;               // A/m² per s
    int32_t follows_temperature = 0;     // production with a power, hydrogen-rate or voltage spec
    double target = 0;                   // A/m², when the target does not follow the temperature
    double setpoint = 0;                 // the spec's drive value
    double quantity_scale = 1;
    double j_lo = 0, j_hi = 0, j_rated = 0;  // production window, rated current density
    double j_floor = 0;  // smallest current the cell model takes (crossover below it): the current jumps across 0..j_floor
    int32_t below_minimum = 0;           // a fixed production setpoint below the minimum load
    int32_t current_flows = 0;
    int32_t auxiliaries_on = 0;
    int32_t heater_on = 0;
    double heater_target = 0;
    int32_t coolant_on = 0, valve_controlled = 0;
    double t_ramp_end = 0, t_mode_end = 0;   // time events (+inf: none)
    double separator_moles = 1;
    // Where the search for the current that meets the setpoint starts: its value at temperature0,
    // its change with the temperature there, and the slope of the spec's quantity with the current.
    double guess_current = 0, guess_per_kelvin = 0, guess_slope = 0;
    std::array<double, kRunComponents> scale{};  // integration units: x = y / scale
};

/// The integrator's last accepted step on the open segment, in integration units, with the slopes
/// at both ends: the cubic Hermite interpolant through them gives the state inside the step.
struct RunStep {
    double t_a = 0, t_b = 0;
    std::array<double, kRunComponents> x_a{}, f_a{}, x_b{}, f_b{};
};

/// The cubic Hermite interpolant through (t_a, x_a, f_a) and (t_b, x_b, f_b) at t, for n components.
void hermite_interpolate(const RunStep& step, double t, double* x, int n);

/// What the plant does at one instant: the right-hand side of the run and the figures it reports.
struct RunRates {
    double t = std::numeric_limits<double>::quiet_NaN(), temperature = 0, separator = 0;  // the point
    double current_density = 0, hours = 0;
    double valve = 0;  // the valve controller's integral term (state)
    double stack_heat = 0, heater = 0, to_coolant = 0, loss = 0, coolant_flow = 0, coolant_outlet = 0;
    double valve_drive = 0, valve_slope = 0, coolant_gain = 0;  // dI/dt, du/dI, d(to_coolant)/d(flow)
    double h2_in_o2_stack = 0, anode_gas = 0;  // mol/mol, mol/s (dry)
    double hydrogen = 0, chlorine = 0, water = 0, power_dc = 0, power_ac = 0;  // kg/s, W
    double quantity = 0;  // the spec's drive quantity at this point
    uint32_t warnings = 0;  // the cell model's extrapolation flags (CellWarning)
    bool evaluated = false;  // the cell model was evaluated (not when it cannot be at this temperature without current)
    bool at_minimum = false, at_maximum = false;
};

/// Totals and times of a run since its reset, for the run summary.
struct RunTotals {
    std::array<double, kModeCount> seconds_in_mode{};
    double seconds_at_minimum_load = 0, seconds_operating = 0;
    std::array<double, alarm_last - alarm_first + 1> seconds_alarm{};
    std::array<double, alarm_last - alarm_first + 1> alarm_onsets{};
    double starts_cold = 0, starts_warm = 0;
    double first_trip_time = std::numeric_limits<double>::quiet_NaN();
};

struct RunState {
    int32_t running = 0;
    double start_time = 0, time = 0;
    std::array<double, kRunComponents> y{};  // the integrated vector at `time` (SI)
    double current_density = 0;              // A/m² at `time`
    int32_t mode = static_cast<int32_t>(Mode::production);
    int32_t ramp = 0;            // −1, 0 (at the target, following it), +1
    double mode_since = 0;       // s, when the current mode began (start-up timers)
    double hours = 0;            // operating hours at `time`
    double starts = 0;
    int32_t start_temperature_reached = 0;
    std::array<int32_t, alarm_last - alarm_first + 1> alarm{};  // raised at `time`
    int32_t at_minimum_load = 0;
    int32_t request = static_cast<int32_t>(ModeRequest::production);  // in force over the current step
    int32_t open = 0;  // a segment is open: the next step continues its integration (inputs unchanged)
    int32_t pending_event = -1;  // an event found beyond the time a step asked for, at pending_time
    double pending_time = 0;
    RunSegment segment;
    RunStep step;
    IntegratorHistory integrator;
    RunTotals totals;
    double temperature_at_start = 0;  // K, at reset
    double rated_voltage_new = std::numeric_limits<double>::quiet_NaN();  // V, cell at rated current and the
                                                                          // setpoint without degradation
};

}  // namespace ely
