// The plant in time: reset, advance, the modes and ramps, and the integration of the stack
// temperature, the separator gas and the totals with their events (docs/dynamics.md).
//
// Integrator: Boost.Odeint's Rosenbrock method of order 4 (rosenbrock4, Shampine's coefficients,
// with its embedded error estimate and its controller), a linearly implicit method that stays
// stable on stiff problems: the plant's temperature controllers make the thermal state stiff
// against an hour-long step. Header-only, so the library depends on nothing new. Events (a ramp
// reaching its target, a start-up's temperature, a purity or temperature alarm, the minimum load)
// are found after each accepted step from the state there and located inside the step on the
// method's dense output; time events (timers, ramps towards a fixed target) end a step exactly.
//
// Between events the run is a segment: the mode, whether the current ramps or follows its target,
// and what heats and cools the plant are fixed, so the right-hand side is smooth on it.
#include <algorithm>
#include <boost/numeric/odeint/stepper/rosenbrock4.hpp>
#include <boost/numeric/odeint/stepper/rosenbrock4_controller.hpp>
#include <cmath>
#include <fmt/format.h>
#include <limits>

#include "base/check.hpp"
#include "thermo/constants.hpp"
#include "unit/lend.hpp"
#include "unit/point_result.hpp"
#include "unit/root.hpp"

namespace ely {

namespace {
namespace odeint = boost::numeric::odeint;
using Vector = boost::numeric::ublas::vector<double>;
using Matrix = boost::numeric::ublas::matrix<double>;

/// The coefficients of Hairer & Wanner's RODAS (Solving Ordinary Differential Equations II, 2nd
/// ed., 1996, sec. IV.7; their code rodas.f), which odeint's rosenbrock4 uses, with d4 = −0.0362:
/// odeint (Boost 1.81) carries it as +0.0362, so that a right-hand side depending on time itself is
/// integrated to second order only (y' = 2t from 0 to 1 in one step gives 1.068). With the sign of
/// rodas.f the step is exact for that problem (tests/model/test_dynamics.cpp checks the run's
/// energy balance across a ramp, where the current depends on time).
struct RodasCoefficients {
    using value_type = double;
    using order_type = unsigned short;
    const double gamma = 0.25;
    const double d1 = 0.25, d2 = -0.1043, d3 = 0.1035, d4 = -0.3620000000000023e-01;
    const double c2 = 0.386, c3 = 0.21, c4 = 0.63;
    const double c21 = -0.5668800000000000e+01;
    const double a21 = 0.1544000000000000e+01;
    const double c31 = -0.2430093356833875e+01, c32 = -0.2063599157091915e+00;
    const double a31 = 0.9466785280815826e+00, a32 = 0.2557011698983284e+00;
    const double c41 = -0.1073529058151375e+00, c42 = -0.9594562251023355e+01, c43 = -0.2047028614809616e+02;
    const double a41 = 0.3314825187068521e+01, a42 = 0.2896124015972201e+01, a43 = 0.9986419139977817e+00;
    const double c51 = 0.7496443313967647e+01, c52 = -0.1024680431464352e+02, c53 = -0.3399990352819905e+02,
                 c54 = 0.1170890893206160e+02;
    const double a51 = 0.1221224509226641e+01, a52 = 0.6019134481288629e+01, a53 = 0.1253708332932087e+02,
                 a54 = -0.6878860361058950e+00;
    const double c61 = 0.8083246795921522e+01, c62 = -0.7981132988064893e+01, c63 = -0.3152159432874371e+02,
                 c64 = 0.1631930543123136e+02, c65 = -0.6058818238834054e+01;
    const double d21 = 0.1012623508344586e+02, d22 = -0.7487995877610167e+01, d23 = -0.3480091861555747e+02,
                 d24 = -0.7992771707568823e+01, d25 = 0.1025137723295662e+01;
    const double d31 = -0.6762803392801253e+00, d32 = 0.6087714651680015e+01, d33 = 0.1643084320892478e+02,
                 d34 = 0.2476722511418386e+02, d35 = -0.6594389125716872e+01;
    static const order_type stepper_order = 4;
    static const order_type error_order = 3;
};
using Stepper = odeint::rosenbrock4<double, RodasCoefficients>;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kEps = std::numeric_limits<double>::epsilon();
constexpr double kMaxStep = 3600.0;  // s

/// Odeint's controller with its step-size history readable and settable, so that the history
/// travels with the run's state.
class Controller : public odeint::rosenbrock4_controller<Stepper> {
public:
    Controller() : odeint::rosenbrock4_controller<Stepper>(1e-8, 1e-8) {}
    void load(const IntegratorHistory& h, double tolerance) {
        m_atol = tolerance;
        m_rtol = tolerance;
        m_first_step = h.first_step != 0;
        m_err_old = h.error_old;
        m_dt_old = h.step_old;
        m_last_rejected = h.last_rejected != 0;
    }
    void store(IntegratorHistory& h) const {
        h.first_step = m_first_step ? 1 : 0;
        h.error_old = m_err_old;
        h.step_old = m_dt_old;
        h.last_rejected = m_last_rejected ? 1 : 0;
    }
};

enum Event : int { ev_none = -1, ev_warning, ev_trip, ev_temperature_high, ev_start_temperature, ev_ramp, ev_minimum };
constexpr int kEventCount = 6;
constexpr int kWarning = alarm_h2_in_o2_warning - alarm_first, kTrip = alarm_h2_in_o2_trip - alarm_first,
              kTemperatureHigh = alarm_temperature_high - alarm_first, kLoadLow = alarm_load_low - alarm_first;

}  // namespace


struct Block::RunWorkspace {
    Controller controller;
    Vector x = Vector(kRunComponents), x_old = Vector(kRunComponents), x_probe = Vector(kRunComponents);
    Vector f0 = Vector(kRunComponents), f1 = Vector(kRunComponents);
    RunRates last;  // the last point evaluated (the method asks for the same point again)
    bool last_valid = false;
};

Block::WorkspaceSlot::WorkspaceSlot() = default;
Block::WorkspaceSlot::WorkspaceSlot(const WorkspaceSlot&) {}
Block::WorkspaceSlot& Block::WorkspaceSlot::operator=(const WorkspaceSlot&) { return *this; }
Block::WorkspaceSlot::WorkspaceSlot(WorkspaceSlot&&) noexcept = default;
Block::WorkspaceSlot& Block::WorkspaceSlot::operator=(WorkspaceSlot&&) noexcept = default;
Block::WorkspaceSlot::~WorkspaceSlot() = default;
Block::RunWorkspace& Block::WorkspaceSlot::get() {
    if (!w_) w_ = std::make_unique<RunWorkspace>();
    return *w_;
}

// --- The plant at one point ----------------------------------------------------------------------

void Block::forget_rates() { workspace_.get().last_valid = false; }

void Block::evaluate_point(double temperature, double hours, double current_density, PointResult& out) {
    Lend t(v_[in_temperature], temperature), h(v_[in_hours_operated], hours);
    evaluate_at(current_density, out);
    fill_outputs(out);
}

double Block::rated_current_density() const { return v_[par_rated_current_density]; }

double Block::time() const {
    if (!running()) throw Error(ErrorKind::wrong_state, "no dynamic run: the block has not been reset");
    return run_.time;
}

/// The current density that meets the spec's setpoint at a temperature, within the production
/// window [j_lo, j_hi]: Newton's method (secant slopes) from where the segment says to start, Brent's
/// method if that fails. A pure function of the segment and the temperature, so that a restored run
/// computes what the saved one would. `pr` holds the plant at the returned current density.
double Block::target_current_density(const RunSegment& seg, double temperature, double hours, PointResult& pr,
                                     double tolerance, double* slope_out) {
    const double lo = seg.j_lo, hi = seg.j_hi, sp = seg.setpoint;
    const auto quantity = [&](double x) {
        evaluate_point(temperature, hours, x, pr);
        return drive_quantity(pr);
    };
    double j = std::isfinite(seg.guess_current)
                   ? seg.guess_current + seg.guess_per_kelvin * (temperature - seg.temperature0)
                   : 0.5 * (lo + hi);
    j = std::clamp(j, lo, hi);
    double slope = seg.guess_slope;
    if (!(slope > 0)) {  // no slope known: a difference quotient
        const double dj = 1e-6 * seg.j_rated;
        const double x = j + dj <= hi ? j + dj : j - dj;
        slope = (quantity(x) - quantity(j)) / (x - j);
    }
    double result = kNaN, j_prev = kNaN, q_prev = kNaN;
    for (int k = 0; k < 30 && slope > 0; ++k) {
        const double q = quantity(j);
        if (k > 0 && j != j_prev) {
            const double secant = (q - q_prev) / (j - j_prev);
            if (secant > 0 && std::isfinite(secant)) slope = secant;
        }
        const double step = -(q - sp) / slope;
        if ((j <= lo && step <= 0) || (j >= hi && step >= 0) || std::fabs(step) <= tolerance) {
            result = j;
            break;
        }
        j_prev = j;
        q_prev = q;
        j = std::clamp(j + step, lo, hi);
    }
    if (std::isnan(result)) {  // the bracketing solve of the steady spec
        const double q_lo = quantity(lo);
        if (q_lo >= sp) {
            result = lo;
        } else {
            const double q_hi = quantity(hi);
            if (q_hi <= sp) {
                result = hi;
            } else {
                result = brent_root([&](double x) { return quantity(x) - sp; }, lo, hi, q_lo - sp, q_hi - sp, tolerance);
                quantity(result);
            }
        }
    }
    if (slope_out) *slope_out = slope;
    return result;
}

/// The run at time t and state y on a segment: the right-hand side and the figures it reports. A
/// pure function of (segment, t, y); `final` fills the block's outputs with the current solved
/// to full precision.
void Block::rates_at(const RunSegment& seg, double t, const double* y, RunRates& r, bool final) {
    RunWorkspace& w = workspace_.get();
    const double temperature = y[rc_temperature], separator = y[rc_separator];
    const double valve = y[rc_valve];
    if (!final && w.last_valid && w.last.t == t && w.last.temperature == temperature && w.last.separator == separator &&
        w.last.valve == valve) {
        r = w.last;
        return;
    }
    w.last_valid = false;
    if (!std::isfinite(temperature) || !std::isfinite(separator))
        throw Error(ErrorKind::out_of_range, fmt::format("the integration left the finite range at t = {:g} s", t));
    r = RunRates{};
    r.t = t;
    r.temperature = temperature;
    r.separator = separator;
    r.valve = valve;
    r.hours = seg.hours0 + (seg.current_flows ? (t - seg.t0) / 3600.0 : 0.0);
    PointResult pr;
    double j = seg.target;
    if (seg.ramp != 0) {
        j = std::max(0.0, seg.j0 + seg.ramp * seg.ramp_speed * (t - seg.t0));
    } else if (seg.follows_temperature) {
        const double tolerance = (final ? 1e-13 : 1e-2 * v_[par_dynamics_tolerance]) * seg.j_rated;
        j = target_current_density(seg, temperature, r.hours, pr, tolerance, nullptr);
        r.evaluated = true;
        r.at_minimum = j <= seg.j_lo;
        r.at_maximum = j >= seg.j_hi;
    }
    r.current_density = j;
    if (j > 0 && !r.evaluated) {
        evaluate_point(temperature, r.hours, j, pr);
        r.evaluated = true;
    }
    if (j > 0) {
        r.stack_heat = v_[heat_duty] + v_[heat_loss];  // the block's energy balance: released = duty + loss
        r.power_dc = v_[stack_power];
        r.power_ac = v_[plant_power];
        r.hydrogen = v_[product_hydrogen];
        r.chlorine = v_[product_chlorine];
        r.water = v_[feed_water];
        r.h2_in_o2_stack = v_[gas_h2_in_o2];
        r.anode_gas = pr.anode[kO2] + pr.anode[kH2] + pr.anode[kCl2];
        r.quantity = drive_quantity(pr);
        r.warnings = pr.cell.warnings;
    } else {
        r.power_ac = seg.auxiliaries_on ? v_[par_auxiliaries_fixed] : 0.0;
        r.h2_in_o2_stack = kNaN;
        if (final) {
            // Open circuit, where the cell model can be evaluated at this temperature.
            try {
                evaluate_point(temperature, r.hours, 0.0, pr);
                r.h2_in_o2_stack = v_[gas_h2_in_o2];
                r.warnings = pr.cell.warnings;
                r.evaluated = true;
            } catch (const Error& e) {
                if (e.kind() != ErrorKind::out_of_range) throw;
            }
        }
    }
    const double band = v_[par_control_band];
    r.heater = seg.heater_on ? heater_output(v_[par_heater_power], temperature, seg.heater_target, band) : 0.0;
    r.power_ac += r.heater;
    double opening = 1.0;
    if (seg.valve_controlled) {
        const ValveControl vc = valve_control(temperature, valve, v_[par_temperature_setpoint], band,
                                              v_[par_integral_time], seg.coolant_on != 0);
        opening = vc.opening;
        r.valve_drive = vc.drive;
        r.valve_slope = vc.slope;
    }
    r.coolant_flow = seg.coolant_on ? opening * v_[in_coolant_flow] : 0.0;
    const CoolantHeat c = coolant_heat(v_[par_exchanger_ua], v_[par_coolant_heat_capacity], r.coolant_flow,
                                       v_[in_coolant_temperature], temperature);
    r.to_coolant = c.heat;
    r.coolant_outlet = c.outlet_temperature;
    r.coolant_gain = c.gain;
    r.loss = heat_loss_at(temperature);
    if (!final) {
        w.last = r;
        w.last_valid = true;
    }
}

/// The time derivative of the integrated vector (integration units) from the rates at a point:
/// C dT/dt = released − to coolant − loss; the separator gas mixes at the anode gas flow over the
/// gas it holds; the totals grow at their rates.
void Block::derivative_of(const RunSegment& seg, const RunRates& r, const double* x, double* dxdt) const {
    dxdt[rc_temperature] = (r.stack_heat + r.heater - r.to_coolant - r.loss) / v_[par_heat_capacity];
    dxdt[rc_separator] =
        r.current_density > 0 ? r.anode_gas / seg.separator_moles * (r.h2_in_o2_stack - x[rc_separator]) : 0.0;
    dxdt[rc_valve] = r.valve_drive;
    const double rates[] = {r.hydrogen, r.chlorine, r.water, r.power_dc, r.power_ac, r.stack_heat + r.heater,
                            r.to_coolant, r.loss};
    for (int k = rc_hydrogen; k < kRunComponents; ++k)
        dxdt[k] = rates[k - rc_hydrogen] / seg.scale[static_cast<std::size_t>(k)];
}

// --- Modes, targets, segments -------------------------------------------------------------------

ModeRequest Block::effective_request(double temperature) {
    const auto request = static_cast<ModeRequest>(static_cast<int>(v_[in_mode_request]));
    if (request != ModeRequest::automatic) return request;
    // Production while the setpoint reaches the minimum load at the plant's temperature.
    const double j_min = v_[par_min_load_fraction] * rated_current_density();
    const double sp = v_[spec_info(spec_).drive];
    if (!(sp > 0)) return ModeRequest::standby;
    switch (spec_) {
        case Spec::current_density: return sp >= j_min ? ModeRequest::production : ModeRequest::standby;
        case Spec::current:
            return sp / (design_.active_area() * design_.stacks()) >= j_min ? ModeRequest::production
                                                                            : ModeRequest::standby;
        default: break;
    }
    try {
        PointResult pr;
        evaluate_point(temperature, run_.hours, j_min, pr);
        return drive_quantity(pr) <= sp ? ModeRequest::production : ModeRequest::standby;
    } catch (const Error& e) {
        if (e.kind() != ErrorKind::out_of_range) throw;
        return ModeRequest::standby;  // too cold (or hot) for current: keep warm first
    }
}

/// The segment that starts at time t from the run's state (its ramp and guess are settled by
/// open_segment).
RunSegment Block::make_segment(double t, double temperature) const {
    RunSegment s;
    s.t0 = t;
    s.temperature0 = temperature;
    s.j0 = run_.current_density;
    s.hours0 = run_.hours;
    s.mode = run_.mode;
    s.ramp = run_.ramp;
    s.j_rated = rated_current_density();
    s.ramp_speed = v_[par_ramp_rate] * s.j_rated;
    s.t_ramp_end = s.t_mode_end = kInf;
    s.guess_current = kNaN;
    const Mode mode = static_cast<Mode>(s.mode);
    const bool heater_standby = v_[par_standby_method] == 0;
    const bool production = mode == Mode::production;
    const bool standby_current = !heater_standby && (mode == Mode::standby || mode == Mode::starting_warm);
    if (production || standby_current || s.j0 > 0) {
        // Below the cell model's smallest current density the gas crossing the separator exceeds
        // the gas made: the rectifier switches the current on at, and off from, just above it.
        const OperatingPoint op{s.j_rated, temperature, v_[in_pressure_anode], v_[in_pressure_cathode]};
        s.j_floor = std::min(1.05 * cell_->current_density_minimum(op), 0.5 * s.j_rated);
        s.j_hi = std::max(max_current_density(temperature, v_[in_pressure_anode], v_[in_pressure_cathode]), s.j_floor);
        s.j_lo = std::clamp(v_[par_min_load_fraction] * s.j_rated, s.j_floor, s.j_hi);
    }
    if (production) {
        const Var drive = spec_info(spec_).drive;
        const double sp = v_[drive];
        if (std::isnan(sp))
            throw Error(ErrorKind::invalid_argument,
                        fmt::format("the spec '{}' reads {}, which has no value: give {} in the plant description or "
                                    "set it",
                                    spec_name(spec_), variable_info(drive).name, variable_info(drive).config_key));
        if (spec_ == Spec::current_density || spec_ == Spec::current) {
            const double j = spec_ == Spec::current ? sp / (design_.active_area() * design_.stacks()) : sp;
            s.target = std::clamp(j, s.j_lo, s.j_hi);
            s.below_minimum = j < s.j_lo;
        } else {
            s.follows_temperature = 1;
            s.setpoint = sp;
            s.quantity_scale = std::max(std::fabs(sp), 1e-300);
        }
    } else if (standby_current) {
        const double j = v_[par_standby_current_fraction] * s.j_rated;
        s.target = j > 0 ? std::clamp(j, s.j_floor, s.j_hi) : 0.0;
    }
    s.auxiliaries_on = mode != Mode::off;
    const double band = v_[par_control_band];
    if (mode == Mode::starting_cold) {
        s.heater_on = 1;
        s.heater_target = std::max(v_[par_startup_temperature] + band, v_[par_standby_temperature]);
        const double ready = run_.mode_since + v_[par_startup_cold_duration];
        if (ready > t) s.t_mode_end = ready;
    } else if ((mode == Mode::standby || mode == Mode::starting_warm) && heater_standby) {
        s.heater_on = 1;
        s.heater_target = v_[par_standby_temperature];
    }
    if (mode == Mode::starting_warm) s.t_mode_end = std::max(t, run_.mode_since + v_[par_startup_warm_duration]);
    s.valve_controlled = v_[par_temperature_control] != 0;
    s.coolant_on = !s.valve_controlled || mode != Mode::off;
    // The separator's gas: hold-up time × the anode gas at rated current (oxygen: 4 F per mol;
    // chlorine: 2 F per mol).
    const double area = design_.active_area() * design_.cells() * design_.stacks();
    const double electrons = design_.technology->has(kBrineProducts) ? 2.0 : 4.0;
    s.separator_moles = std::max(v_[par_holdup_time] * s.j_rated * area / (electrons * kFaraday), 1e-300);
    // Totals since the reset are integrated in units of an hour at rated current (and at rated DC
    // power), so that the relative tolerance holds for them as they grow.
    const double hour_mol = s.j_rated * area / (2 * kFaraday) * 3600.0;
    const double hour_energy = std::max(rectifier_rated_power_, 1.0) * 3600.0;
    s.scale[rc_temperature] = s.scale[rc_separator] = s.scale[rc_valve] = 1.0;
    s.scale[rc_hydrogen] = hour_mol * molar_mass::H2;
    s.scale[rc_chlorine] = hour_mol * molar_mass::Cl2;
    s.scale[rc_water] = hour_mol * molar_mass::H2O;
    for (int k : {rc_energy_dc, rc_energy_ac, rc_heat_released, rc_heat_to_coolant, rc_heat_loss})
        s.scale[static_cast<std::size_t>(k)] = hour_energy;
    return s;
}

/// Opens the segment that starts at time t: whether the current ramps (and which way) or is at its
/// target, where the search for a temperature-dependent target starts, the integrator's first point.
void Block::open_segment(double t) {
    forget_rates();  // the right-hand side changes with the segment
    const double temperature = run_.y[rc_temperature];
    RunSegment s = make_segment(t, temperature);
    double target = s.target;
    bool at_minimum = false;
    if (s.follows_temperature) {
        s.guess_current = run_.segment.follows_temperature ? run_.segment.guess_current : run_.current_density;
        s.guess_slope = run_.segment.follows_temperature ? run_.segment.guess_slope : kNaN;
        s.guess_per_kelvin = 0.0;
        PointResult pr;
        double slope = kNaN;
        target = target_current_density(s, temperature, run_.hours, pr, 1e-13 * s.j_rated, &slope);
        s.guess_current = target;
        s.guess_slope = slope;
        at_minimum = target <= s.j_lo;
        // How the target moves with the temperature, from a second solve 0.1 K away (within the
        // window only: at its ends the target does not move).
        if (target > s.j_lo && target < s.j_hi) {
            const double dT = temperature + 0.1 <= cell_->envelope().temperature_max ? 0.1 : -0.1;
            const double moved = target_current_density(s, temperature + dT, run_.hours, pr, 1e-13 * s.j_rated, nullptr);
            s.guess_per_kelvin = (moved - target) / dT;
        }
    }
    // Switched on at the floor; at the target (within a billionth of the rated current) it follows it.
    if (run_.current_density < s.j_floor && target > run_.current_density)
        run_.current_density = std::min(s.j_floor, target);
    if (std::fabs(run_.current_density - target) <= 1e-9 * s.j_rated) {
        run_.ramp = 0;
        run_.current_density = target;
        if (!s.follows_temperature) at_minimum = static_cast<Mode>(s.mode) == Mode::production && s.below_minimum;
    } else {
        run_.ramp = target > run_.current_density ? 1 : -1;
        at_minimum = false;
    }
    s.j0 = run_.current_density;
    s.ramp = run_.ramp;
    s.current_flows = s.j0 > 0 || s.ramp > 0;
    // A ramp towards a fixed target ends at a known time; one going to zero ends at the floor,
    // where the current is switched off.
    if (s.ramp != 0 && !s.follows_temperature)
        s.t_ramp_end = t + std::fabs(std::max(s.target, s.j_floor) - s.j0) / s.ramp_speed;
    run_.at_minimum_load = at_minimum;
    run_.alarm[kLoadLow] = at_minimum;
    run_.segment = s;
    run_.open = 1;
    run_.pending_event = ev_none;
    // The integrator's first point, with its slope.
    RunStep& step = run_.step;
    step.t_a = step.t_b = t;
    for (std::size_t k = 0; k < step.x_b.size(); ++k) step.x_b[k] = run_.y[k] / s.scale[k];
    RunRates r;
    rates_at(s, t, step.x_b.data(), r, false);
    derivative_of(s, r, step.x_b.data(), step.f_b.data());
    step.x_a = step.x_b;
    step.f_a = step.f_b;
}

void Block::begin_start(double t, Mode mode) {
    run_.mode = static_cast<int32_t>(mode);
    run_.mode_since = t;
    run_.starts += 1;
    (mode == Mode::starting_cold ? run_.totals.starts_cold : run_.totals.starts_warm) += 1;
    run_.start_temperature_reached = run_.y[rc_temperature] >= v_[par_startup_temperature] ? 1 : 0;
}

void Block::set_mode(double t, Mode mode) {
    run_.mode = static_cast<int32_t>(mode);
    run_.mode_since = t;
}

/// Mode changes the request asks for at time t: they take effect at once; start-ups run their
/// sequence.
void Block::apply_request(double t) {
    const auto request = static_cast<ModeRequest>(run_.request);
    const bool heater_standby = v_[par_standby_method] == 0;
    switch (static_cast<Mode>(run_.mode)) {
        case Mode::off:
            if (request == ModeRequest::production || (request == ModeRequest::standby && !heater_standby))
                begin_start(t, Mode::starting_cold);
            else if (request == ModeRequest::standby)
                set_mode(t, Mode::standby);
            break;
        case Mode::standby:
            if (request == ModeRequest::production) begin_start(t, Mode::starting_warm);
            else if (request == ModeRequest::off) set_mode(t, Mode::off);
            break;
        case Mode::production:
            if (request == ModeRequest::standby) set_mode(t, Mode::standby);
            else if (request == ModeRequest::off) set_mode(t, Mode::off);
            break;
        case Mode::starting_cold:
            if (request == ModeRequest::off) set_mode(t, Mode::off);
            else if (request == ModeRequest::standby && heater_standby) set_mode(t, Mode::standby);
            break;
        case Mode::starting_warm:
            if (request == ModeRequest::off) set_mode(t, Mode::off);
            else if (request == ModeRequest::standby) set_mode(t, Mode::standby);
            break;
    }
}

/// A start-up that has met its conditions at time t ends: production (or, from cold with a standby
/// request, hot standby by minimum current). A start from cold has purged the separator.
void Block::complete_startup(double t) {
    const auto mode = static_cast<Mode>(run_.mode);
    if (mode == Mode::starting_cold && run_.start_temperature_reached &&
        t >= run_.mode_since + v_[par_startup_cold_duration]) {
        set_mode(t, static_cast<ModeRequest>(run_.request) == ModeRequest::standby ? Mode::standby : Mode::production);
        run_.y[rc_separator] = 0.0;
        run_.alarm[kWarning] = run_.alarm[kTrip] = 0;
    } else if (mode == Mode::starting_warm && t >= run_.mode_since + v_[par_startup_warm_duration]) {
        set_mode(t, Mode::production);
    }
}

// --- Events --------------------------------------------------------------------------------------

/// A function of the state whose sign tells whether the event's condition holds (>= 0: it holds).
double Block::event_function(int event, const RunSegment& seg, double t, const double* y) {
    const double sep = y[rc_separator], temperature = y[rc_temperature];
    const auto toward = [](int32_t raised, double g) { return raised ? -g : g; };  // the change from the flag
    switch (event) {
        case ev_warning: return toward(run_.alarm[kWarning], sep - v_[par_alarms_h2_in_o2_warning]);
        case ev_trip: return toward(run_.alarm[kTrip], sep - v_[par_alarms_h2_in_o2_trip]);
        case ev_temperature_high: return toward(run_.alarm[kTemperatureHigh], temperature - v_[par_temperature_max]);
        case ev_start_temperature: return temperature - v_[par_startup_temperature];
        case ev_ramp: {
            RunRates r;
            rates_at(seg, t, y, r, false);
            const double j = r.current_density, jr = seg.j_rated, q = (r.quantity - seg.setpoint) / seg.quantity_scale;
            return seg.ramp > 0 ? std::max((j - seg.j_hi) / jr, std::min((j - seg.j_lo) / jr, q))
                                : std::max((seg.j_lo - j) / jr, std::min((seg.j_hi - j) / jr, -q));
        }
        case ev_minimum: {
            PointResult pr;
            const double hours = seg.hours0 + (seg.current_flows ? (t - seg.t0) / 3600.0 : 0.0);
            evaluate_point(temperature, hours, seg.j_lo, pr);
            return toward(run_.at_minimum_load, (drive_quantity(pr) - seg.setpoint) / seg.quantity_scale);
        }
        default: break;
    }
    return -1.0;
}

/// Whether an event's condition holds at the end of an accepted step (the rates there are known).
bool Block::event_detected(int event, const RunSegment& seg, const double* y, const RunRates& r) const {
    const double sep = y[rc_separator], temperature = y[rc_temperature];
    switch (event) {
        case ev_warning: return (sep >= v_[par_alarms_h2_in_o2_warning]) != (run_.alarm[kWarning] != 0);
        case ev_trip: return (sep >= v_[par_alarms_h2_in_o2_trip]) != (run_.alarm[kTrip] != 0);
        case ev_temperature_high:
            return v_[par_temperature_max] > 0 &&
                   (temperature >= v_[par_temperature_max]) != (run_.alarm[kTemperatureHigh] != 0);
        case ev_start_temperature:
            return static_cast<Mode>(seg.mode) == Mode::starting_cold && !run_.start_temperature_reached &&
                   temperature >= v_[par_startup_temperature];
        case ev_ramp: {
            if (seg.ramp == 0 || !seg.follows_temperature) return false;
            const double j = r.current_density;
            const bool reached = seg.ramp > 0 ? r.quantity >= seg.setpoint : r.quantity <= seg.setpoint;
            return seg.ramp > 0 ? (j >= seg.j_hi || (j >= seg.j_lo && reached))
                                : (j <= seg.j_lo || (j <= seg.j_hi && reached));
        }
        case ev_minimum:
            return static_cast<Mode>(seg.mode) == Mode::production && seg.ramp == 0 && seg.follows_temperature &&
                   r.at_minimum != (run_.at_minimum_load != 0);
        default: break;
    }
    return false;
}

void Block::handle_event(int event, double t) {
    const auto flip = [&](int a) {
        run_.alarm[static_cast<std::size_t>(a)] = !run_.alarm[static_cast<std::size_t>(a)];
        if (!run_.alarm[static_cast<std::size_t>(a)]) return;
        run_.totals.alarm_onsets[static_cast<std::size_t>(a)] += 1;
        if (a == kTrip && std::isnan(run_.totals.first_trip_time)) run_.totals.first_trip_time = t;
    };
    switch (event) {
        case ev_warning: flip(kWarning); break;
        case ev_trip: flip(kTrip); break;
        case ev_temperature_high: flip(kTemperatureHigh); break;
        case ev_start_temperature: run_.start_temperature_reached = 1; break;
        case ev_ramp: run_.ramp = 0; break;
        case ev_minimum: run_.at_minimum_load = !run_.at_minimum_load; break;
        default: break;
    }
}

// --- Integration ---------------------------------------------------------------------------------

/// Integrates the open segment until its last step reaches t_want (steps may go beyond it, not
/// beyond the segment's time events), or until an event inside a step. Returns the event and sets
/// t_event to its time (ev_none: the step covers t_want).
int Block::extend_segment(double t_want, double& t_event) {
    const RunSegment& seg = run_.segment;
    RunStep& step = run_.step;
    t_event = t_want;
    if (run_.pending_event != ev_none && t_want >= run_.pending_time) {  // found by an earlier call
        const int event = run_.pending_event;
        t_event = run_.pending_time;
        run_.pending_event = ev_none;
        return event;
    }
    if (!(t_want > step.t_b)) return ev_none;
    RunWorkspace& w = workspace_.get();
    const double t_limit = std::min(seg.t_ramp_end, seg.t_mode_end);
    RunRates r;
    const auto derivative = [&](const Vector& state, Vector& dxdt, double time) {
        if (time == step.t_b && state(rc_temperature) == step.x_b[rc_temperature] &&
            state(rc_separator) == step.x_b[rc_separator] && state(rc_valve) == step.x_b[rc_valve]) {
            std::copy(step.f_b.begin(), step.f_b.end(), dxdt.begin());  // the slope at the step's start, known
            return;
        }
        rates_at(seg, time, &state(0), r, false);
        derivative_of(seg, r, &state(0), &dxdt(0));
    };
    // The Jacobian: the temperature column by a difference quotient, the separator's and the valve
    // controller's columns exactly, the totals do not act back; the explicit time dependence (a
    // ramping current, the ageing) by a difference quotient in time, inside the segment.
    const double heat_capacity = v_[par_heat_capacity], full_flow = v_[in_coolant_flow];
    const auto jacobian = [&](const Vector& state, Matrix& jac, const double& time, Vector& dfdt) {
        derivative(state, w.f0, time);
        rates_at(seg, time, &state(0), r, false);
        const double separator_rate = r.current_density > 0 ? r.anode_gas / seg.separator_moles : 0.0;
        const double cooling_per_integral = r.coolant_gain * full_flow * r.valve_slope;  // d(to_coolant)/dI
        jac.clear();
        jac(rc_temperature, rc_valve) = -cooling_per_integral / heat_capacity;
        if (seg.valve_controlled)
            jac(rc_valve, rc_valve) = (seg.coolant_on ? r.valve_slope - 1.0 : -1.0) / v_[par_integral_time];
        jac(rc_heat_to_coolant, rc_valve) = cooling_per_integral / seg.scale[rc_heat_to_coolant];
        w.x_probe = state;
        w.x_probe(rc_temperature) += std::sqrt(kEps) * std::max(std::fabs(state(rc_temperature)), 1.0);
        const double dT = w.x_probe(rc_temperature) - state(rc_temperature);
        derivative(w.x_probe, w.f1, time);
        for (int i = 0; i < kRunComponents; ++i) jac(i, rc_temperature) = (w.f1(i) - w.f0(i)) / dT;
        jac(rc_separator, rc_separator) = -separator_rate;
        dfdt.clear();
        // Time enters through a ramping current and through the operating hours (the degradation).
        const bool ages = seg.current_flows &&
                          (v_[par_degradation_voltage_rate] > 0 || v_[par_degradation_resistance_rate] > 0);
        if (seg.ramp != 0 || ages) {
            double dt = seg.ramp != 0 ? 1e-3 : 1.0;
            const double room_after = t_limit - time, room_before = time - seg.t0;
            if (room_after < 2 * dt) dt = room_before > room_after ? -std::min(dt, 0.5 * room_before) : 0.5 * room_after;
            if (dt == 0) return;
            derivative(state, w.f1, time + dt);
            for (int i = 0; i < kRunComponents; ++i) dfdt(i) = (w.f1(i) - w.f0(i)) / dt;
        }
    };
    auto system = std::make_pair(derivative, jacobian);

    // The step-size history of the controller (its prediction from the last two steps) holds inside
    // a segment; a new segment starts it afresh.
    Controller& ctl = w.controller;
    if (step.t_b == seg.t0) run_.integrator.first_step = 1;
    ctl.load(run_.integrator, v_[par_dynamics_tolerance]);
    Vector& x = w.x;
    double t = step.t_b;
    std::copy(step.x_b.begin(), step.x_b.end(), x.begin());
    const double h_min = std::max(1e-9, 64 * kEps * std::fabs(t)), h_min_ramp = 1e-3;
    double h = run_.integrator.next_step > 0 ? run_.integrator.next_step : 1.0;
    // A ramp changes the plant on its own time scale: its first step is a fraction of it.
    if (t == seg.t0 && seg.ramp != 0) {
        const double ramp_time = std::fabs(seg.follows_temperature ? seg.j_hi - seg.j_lo : seg.target - seg.j0) / seg.ramp_speed;
        h = std::min(h, std::max(0.125 * ramp_time, h_min_ramp));
    }
    int rejected = 0, event = ev_none;
    std::array<bool, kEventCount> detected{};
    while (t < t_want) {
        // At most an hour a step: outputs inside a step come from its interpolant, which carries the
        // state at the step's start; a settled run takes one step an hour.
        h = std::min(h, kMaxStep);
        const double remaining = t_limit - t;
        const bool last = h * 1.01 >= remaining;
        const double h_proposed = h;
        if (last) h = remaining;
        else if (h > 0.5 * remaining) h = 0.5 * remaining;  // two even steps rather than a sliver
        std::copy(x.begin(), x.end(), w.x_old.begin());
        const double t_old = t, h_try = h;
        odeint::controlled_step_result result;
        try {
            result = ctl.try_step(system, x, t, h);
        } catch (const Error& e) {
            if (e.kind() == ErrorKind::internal) throw;
            std::copy(w.x_old.begin(), w.x_old.end(), x.begin());
            t = t_old;
            h = 0.25 * h_try;
            if (++rejected > 200 || h < h_min)
                throw Error(e.kind(), fmt::format("at t = {:g} s, stack temperature {:g} K: {}", t, x(rc_temperature),
                                                  e.what()));
            continue;
        }
        if (result != odeint::success) {
            if (++rejected > 200 || h < h_min)
                throw Error(ErrorKind::no_convergence,
                            fmt::format("the integration could not meet its tolerance {:g} at t = {:g} s (step {:g} s)",
                                        v_[par_dynamics_tolerance], t, h));
            continue;
        }
        rejected = 0;
        if (last) {
            t = t_limit;                  // exactly, whatever the rounding of t + h
            h = std::max(h, h_proposed);  // an end that cut the step short does not shrink the next one
        }
        // The accepted step, with the slope at its end (the next step's first evaluation).
        step.t_a = t_old;
        step.x_a = step.x_b;
        step.f_a = step.f_b;
        step.t_b = t;
        std::copy(x.begin(), x.end(), step.x_b.begin());
        rates_at(seg, t, step.x_b.data(), r, false);
        derivative_of(seg, r, step.x_b.data(), step.f_b.data());
        // Events: the conditions at the end of the step against the flags in force; each located
        // in the step on the interpolant (Illinois' regula falsi), the earliest taken.
        bool any = false;
        for (int k = 0; k < kEventCount; ++k)
            any |= detected[static_cast<std::size_t>(k)] = event_detected(k, seg, step.x_b.data(), r);
        if (!any) continue;
        std::array<double, kRunComponents> y{};
        for (int k = 0; k < kEventCount; ++k) {
            if (!detected[static_cast<std::size_t>(k)]) continue;
            const auto g = [&](double time) {
                hermite_interpolate(step, time, y.data(), 2);
                return event_function(k, seg, time, y.data());
            };
            double a = step.t_a, b = step.t_b, ga = g(a), gb = std::max(g(b), 0.0);
            if (ga >= 0) b = a;
            int side = 0;
            const double tolerance = 1e-9 + 4 * kEps * std::fabs(b);
            for (int it = 0; it < 200 && b - a > tolerance; ++it) {
                double c = gb - ga > 0 ? b - gb * (b - a) / (gb - ga) : 0.5 * (a + b);
                c = std::clamp(c, a + 0.01 * (b - a), b - 0.01 * (b - a));
                const double gc = g(c);
                if (gc >= 0) {
                    b = c;
                    gb = gc;
                    if (side == 1) ga *= 0.5;
                    side = 1;
                } else {
                    a = c;
                    ga = gc;
                    if (side == -1) gb *= 0.5;
                    side = -1;
                }
            }
            if (event == ev_none || b < t_event) {
                t_event = b;
                event = k;
            }
        }
        if (t_event > t_want) {
            // The event lies beyond the time asked for: the step is cut at it and the event kept
            // for the call that reaches it.
            std::array<double, kRunComponents> x_event{};
            hermite_interpolate(step, t_event, x_event.data(), kRunComponents);
            step.t_b = t_event;
            step.x_b = x_event;
            rates_at(seg, t_event, step.x_b.data(), r, false);
            derivative_of(seg, r, step.x_b.data(), step.f_b.data());
            run_.pending_event = event;
            run_.pending_time = t_event;
            event = ev_none;
            t_event = t_want;
        }
        break;
    }
    ctl.store(run_.integrator);
    run_.integrator.next_step = h;
    return event;
}

/// The run's state at time t inside the open segment's last step; accounts the time since the
/// state before.
void Block::move_to(double t, bool need_current) {
    const RunSegment& seg = run_.segment;
    const RunStep& step = run_.step;
    std::array<double, kRunComponents> x{};
    if (t == step.t_b) x = step.x_b;
    else hermite_interpolate(step, t, x.data(), kRunComponents);
    account(seg, run_.time, t);
    run_.time = t;
    for (std::size_t k = 0; k < x.size(); ++k) run_.y[k] = x[k] * seg.scale[k];
    if (seg.current_flows) run_.hours = seg.hours0 + (t - seg.t0) / 3600.0;
    if (seg.ramp != 0) {
        run_.current_density = std::max(0.0, seg.j0 + seg.ramp * seg.ramp_speed * (t - seg.t0));
    } else if (!seg.follows_temperature) {
        run_.current_density = seg.target;
    } else if (need_current) {
        PointResult pr;
        run_.current_density = target_current_density(seg, run_.y[rc_temperature], run_.hours, pr,
                                                      1e-13 * seg.j_rated, nullptr);
    }
}

/// Totals of [t0, t1] inside one segment (its flags are constant there).
void Block::account(const RunSegment& seg, double t0, double t1) {
    const double dt = t1 - t0;
    if (!(dt > 0)) return;
    RunTotals& tot = run_.totals;
    tot.seconds_in_mode[static_cast<std::size_t>(seg.mode)] += dt;
    if (seg.current_flows) tot.seconds_operating += dt;
    if (static_cast<Mode>(seg.mode) == Mode::production && run_.at_minimum_load) tot.seconds_at_minimum_load += dt;
    for (std::size_t a = 0; a < tot.seconds_alarm.size(); ++a)
        if (run_.alarm[a]) tot.seconds_alarm[a] += dt;
}

// --- Outputs -------------------------------------------------------------------------------------

void Block::finish_step_outputs() {
    const RunSegment& seg = run_.segment;
    RunRates r;
    rates_at(seg, run_.time, run_.y.data(), r, true);
    run_.current_density = r.current_density;
    if (!r.evaluated) {
        // Too cold (or hot) for the cell model and no current: only what the plant does is known.
        for (int i = 0; i < kVarCount; ++i)
            if (variable_info(static_cast<Var>(i)).causality == Causality::output) v_[static_cast<std::size_t>(i)] = kNaN;
        std::fill(v_.begin() + kVarCount, v_.end(), kNaN);
        for (Var v : {cell_current_density, stack_current, stack_power, product_hydrogen, product_oxygen, product_chlorine,
                      product_caustic, product_caustic_solution, feed_water, feed_salt, stream_cathode_mass_flow,
                      stream_anode_mass_flow, perf_load_fraction})
            v_[v] = 0.0;
        v_[stream_cathode_temperature] = v_[stream_anode_temperature] = r.temperature;
        v_[stream_cathode_pressure] = v_[in_pressure_cathode];
        v_[stream_anode_pressure] = v_[in_pressure_anode];
    }
    if (!(r.current_density > 0)) {
        v_[plant_rectifier_loss] = 0.0;
        v_[plant_rectifier_efficiency] = kNaN;
        v_[plant_auxiliary_power] = seg.auxiliaries_on ? v_[par_auxiliaries_fixed] : 0.0;
    }
    v_[plant_power] = r.power_ac;
    v_[stack_temperature] = r.temperature;
    v_[gas_h2_in_o2] = r.separator;
    v_[gas_h2_in_o2_stack] = r.h2_in_o2_stack;
    v_[heat_released] = r.stack_heat + r.heater;
    v_[heat_heater] = r.heater;
    v_[heat_to_coolant] = r.to_coolant;
    v_[heat_loss] = r.loss;
    v_[heat_duty] = v_[heat_released] - r.loss;
    v_[coolant_flow] = r.coolant_flow;
    v_[coolant_outlet_temperature] = r.coolant_outlet;
    v_[state_mode] = static_cast<double>(run_.mode);
    v_[state_hours_operated] = r.hours;
    v_[state_starts] = run_.starts;

    // Alarms: the separator's anode gas, the temperature, a setpoint below the minimum load
    // holding the current there, the cell model's range.
    const auto flag = [](bool raised) { return raised ? 1.0 : 0.0; };
    const double t_max = v_[par_temperature_max];
    const Envelope& e = cell_->envelope();
    v_[alarm_h2_in_o2_warning] = flag(r.separator >= v_[par_alarms_h2_in_o2_warning]);
    v_[alarm_h2_in_o2_trip] = flag(r.separator >= v_[par_alarms_h2_in_o2_trip]);
    v_[alarm_temperature_high] = flag(t_max > 0 && r.temperature > t_max);
    v_[alarm_current_density_high] = flag(r.current_density > rated_current_density() * (1 + 1e-12));
    v_[alarm_load_low] = flag(static_cast<Mode>(seg.mode) == Mode::production && seg.ramp == 0 &&
                              (seg.follows_temperature ? r.at_minimum : seg.below_minimum != 0));
    v_[alarm_extrapolated] = flag(r.evaluated ? r.warnings != 0
                                              : r.temperature < e.temperature_fit_min || r.temperature > e.temperature_fit_max);
    bool any = false;
    for (int a = alarm_first; a <= alarm_last; ++a) any |= v_[static_cast<std::size_t>(a)] > 0;
    v_[alarm_any] = flag(any);
}

SolveOutcome Block::dynamic_outcome() const {
    SolveOutcome out;
    out.warning = v_[alarm_any] > 0;
    if (out.warning) out.message = alarm_message();
    return out;
}

// --- Reset and advance ---------------------------------------------------------------------------

SolveOutcome Block::reset(double start_time) {
    require_finite(start_time, "start_time", "s");
    const RunState before = run_;
    forget_rates();
    try {
        run_ = RunState{};
        run_.running = 1;
        run_.start_time = run_.time = start_time;
        run_.y[rc_temperature] = run_.temperature_at_start = v_[in_temperature];
        run_.hours = v_[in_hours_operated];
        // The new cell's voltage at rated current and the temperature setpoint: the run summary's
        // stack-replacement point adds the degradation to it.
        try {
            PointResult pr;
            const double t_set = v_[par_temperature_setpoint];
            evaluate_point(t_set, 0.0,
                           std::min(rated_current_density(),
                                    max_current_density(t_set, v_[in_pressure_anode], v_[in_pressure_cathode])),
                           pr);
            run_.rated_voltage_new = pr.cell.voltage;
        } catch (const Error& e) {
            if (e.kind() != ErrorKind::out_of_range) throw;
        }
        // The requested mode at once, at its target, without a start-up sequence.
        run_.request = static_cast<int32_t>(effective_request(v_[in_temperature]));
        const auto request = static_cast<ModeRequest>(run_.request);
        run_.mode = static_cast<int32_t>(request == ModeRequest::production ? Mode::production
                                         : request == ModeRequest::standby ? Mode::standby
                                                                           : Mode::off);
        run_.mode_since = start_time;
        run_.start_temperature_reached = run_.y[rc_temperature] >= v_[par_startup_temperature];
        open_segment(start_time);
        if (run_.ramp != 0) {
            run_.current_density = run_.segment.follows_temperature ? run_.segment.guess_current : run_.segment.target;
            open_segment(start_time);
        }
        // The separator holds the gas the stacks make now (none without current).
        if (run_.current_density > 0) {
            RunRates r;
            rates_at(run_.segment, start_time, run_.y.data(), r, false);
            run_.y[rc_separator] = r.h2_in_o2_stack;
            open_segment(start_time);
        }
        // The valve's controller starts with the opening that balances the plant's heat now as its
        // integral term: a plant reset at its setpoint starts settled.
        if (run_.segment.valve_controlled && run_.segment.coolant_on) {
            RunRates r;
            rates_at(run_.segment, start_time, run_.y.data(), r, false);
            const double excess = r.stack_heat + r.heater - r.loss, full_flow = v_[in_coolant_flow];
            const auto cooling = [&](double u) {
                return coolant_heat(v_[par_exchanger_ua], v_[par_coolant_heat_capacity], u * full_flow,
                                    v_[in_coolant_temperature], run_.y[rc_temperature])
                    .heat;
            };
            double u = 0.0;
            if (cooling(1.0) <= excess) u = 1.0;
            else if (cooling(0.0) < excess)
                u = brent_root([&](double x) { return cooling(x) - excess; }, 0.0, 1.0, cooling(0.0) - excess,
                               cooling(1.0) - excess, 1e-14);
            run_.y[rc_valve] = u;
            open_segment(start_time);
        }
        run_.alarm[kWarning] = run_.y[rc_separator] >= v_[par_alarms_h2_in_o2_warning];
        run_.alarm[kTrip] = run_.y[rc_separator] >= v_[par_alarms_h2_in_o2_trip];
        run_.alarm[kTemperatureHigh] = v_[par_temperature_max] > 0 && run_.y[rc_temperature] >= v_[par_temperature_max];
        for (std::size_t a = 0; a < run_.alarm.size(); ++a)
            if (run_.alarm[a]) run_.totals.alarm_onsets[a] += 1;
        if (run_.alarm[kTrip]) run_.totals.first_trip_time = start_time;
        finish_step_outputs();
        commit_good_state();
    } catch (...) {
        run_ = before;
        roll_back();
        throw;
    }
    return dynamic_outcome();
}

SolveOutcome Block::advance(double step) { return advance(step, true); }

SolveOutcome Block::advance(double step, bool finish) {
    if (!running()) throw Error(ErrorKind::wrong_state, "no dynamic run: call reset before advance");
    require_finite(step, "step", "s");
    if (step < 0) throw Error(ErrorKind::invalid_argument, fmt::format("step {:g} s is negative", step));
    const RunState before = run_;
    try {
        const double t_end = run_.time + step;
        if (!run_.open) {
            // New inputs take effect now: the mode request, then the ramp towards the new target.
            run_.request = static_cast<int32_t>(effective_request(run_.y[rc_temperature]));
            apply_request(run_.time);
            complete_startup(run_.time);
            open_segment(run_.time);
        }
        for (int idle = 0;;) {
            const RunSegment seg = run_.segment;
            const double t_segment_end = std::min(seg.t_ramp_end, seg.t_mode_end);
            double t_event = t_end;
            const int event = extend_segment(std::min(t_end, t_segment_end), t_event);
            const bool ends = event != ev_none || t_event >= t_segment_end;
            const double t_before = run_.time;
            move_to(t_event, ends || !finish);
            idle = t_event > t_before ? 0 : idle + 1;
            if (idle > 1000) throw Error(ErrorKind::internal, fmt::format("the run makes no progress at t = {:g} s", t_event));
            if (ends) {
                if (event != ev_none) handle_event(event, t_event);
                else if (t_event == seg.t_ramp_end) run_.current_density = seg.target;  // at the floor a current going to zero is off
                complete_startup(t_event);
                open_segment(t_event);
            }
            if (t_event >= t_end) break;
        }
        if (finish) {
            finish_step_outputs();
            commit_good_state();
        } else {
            outputs_current_ = false;
        }
    } catch (...) {
        run_ = before;
        roll_back();
        throw;
    }
    return dynamic_outcome();
}

}  // namespace ely
