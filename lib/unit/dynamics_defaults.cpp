// What the plant in time takes from its technology (DynamicDefaults, lib/cells/registry.cpp) and
// from the plant's own rating where the plant description leaves a value out: heat capacity and
// heat loss per m² of cell area, the coolant and its exchanger sized at rated load, the heater
// sized from the heat-up time, the set points (docs/dynamics.md).
//
// Values settled so stay automatic, like the rectifier's rating: a tunable parameter set later
// (a cell parameter, the maximum current density, the setpoint, ...) settles them again, until a
// host sets one of them itself. The sizing evaluates the new plant (no operating hours) at the
// plant description's pressures and feed, so that setting a parameter gives the plant that
// configuring it would.
#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <limits>

#include "base/error.hpp"
#include "unit/lend.hpp"
#include "unit/point_result.hpp"
#include "unit/root.hpp"

namespace ely {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kValveMargin = 1.1;  // the open valve takes this share of the heat of rated load

}  // namespace

void Block::settle_dynamic_defaults() {
    const bool initial = !automatic_.any();
    if (initial) {
        for (int i = 0; i < kVarCount; ++i) {
            const auto v = static_cast<Var>(i);
            const auto& info = variable_info(v);
            if (std::isnan(v_[v]) && (info.causality == Causality::parameter || v == in_coolant_temperature ||
                                      v == in_coolant_flow))
                automatic_.set(static_cast<std::size_t>(i));
        }
        if (!automatic_.any()) return;
    }
    const DynamicDefaults& d = design_.technology->dynamics;
    const double cells = design_.cells(), stacks = design_.stacks(), area = design_.active_area();
    const auto is_auto = [&](Var v) { return automatic_.test(static_cast<std::size_t>(v)); };
    const auto settle = [&](Var v, double value) {
        if (!is_auto(v)) return;
        v_[v] = value;
        if (initial) design_.configured[static_cast<std::size_t>(v)] = value;  // the start value
    };
    settle(par_heat_loss_coefficient, d.heat_loss_per_area * cells * area);
    settle(par_heat_capacity, d.heat_capacity_per_area * cells * area * stacks);
    settle(par_ramp_rate, d.ramp_rate);
    settle(par_holdup_time, d.holdup_time);
    settle(par_startup_cold_duration, d.cold_start_duration);
    settle(par_startup_warm_duration, d.warm_start_duration);
    settle(in_coolant_temperature, d.coolant_temperature);
    settle(par_coolant_heat_capacity, d.coolant_heat_capacity);
    settle(par_standby_current_fraction, v_[par_min_load_fraction]);
    settle(par_startup_temperature, cell_->envelope().temperature_min);
    settle(par_temperature_setpoint, design_.configured[in_temperature]);  // the description's operating temperature
    const double setpoint = v_[par_temperature_setpoint];
    const Envelope& e = cell_->envelope();
    if (setpoint < e.temperature_min || setpoint > e.temperature_max)
        throw Error(initial ? ErrorKind::config : ErrorKind::out_of_range,
                    fmt::format("{}param.thermal.temperature_setpoint {:g} K is outside the {} cell model's range "
                                "{:g}..{:g} K",
                                initial ? "$.plant.thermal.temperature_setpoint: " : "", setpoint,
                                design_.technology->name, e.temperature_min, e.temperature_max));
    settle(par_standby_temperature, setpoint - v_[par_control_band]);

    // The plant as described: its pressures, feed and ambient, new (no operating hours).
    const auto& described = design_.configured;
    Lend pa(v_[in_pressure_anode], described[in_pressure_anode]), pc(v_[in_pressure_cathode], described[in_pressure_cathode]),
        feed(v_[in_feed_temperature], described[in_feed_temperature]),
        ambient(v_[in_ambient_temperature], described[in_ambient_temperature]),
        coolant(v_[in_coolant_temperature], is_auto(in_coolant_temperature) ? v_[in_coolant_temperature]
                                                                             : described[in_coolant_temperature]);

    // The heater lifts the plant from ambient to the standby temperature in the technology's
    // heat-up time and covers the heat loss there.
    const double lift = std::max(0.0, v_[par_standby_temperature] - v_[in_ambient_temperature]);
    settle(par_heater_power,
           lift > 0 ? v_[par_heat_capacity] * lift / d.heat_up_time + heat_loss_at(v_[par_standby_temperature]) : 0.0);

    if (!is_auto(in_coolant_flow) && !is_auto(par_exchanger_ua)) return;
    // The coolant and its exchanger: through the open valve they take 110 % of the heat of rated
    // load at the temperature setpoint, Q = ε ṁ c_p (T_set − T_in) (dynamics.hpp, coolant_heat), so
    // that the plant's controller holds the setpoint at rated load with the valve short of its stop
    // (a margin of 10 %, common practice for control valves).
    double duty = 0;
    {
        const std::vector<double> outputs(v_.begin(), v_.end());  // the sizing leaves no outputs behind
        try {
            const double j_rated = std::min(rated_current_density(),
                                            max_current_density(setpoint, v_[in_pressure_anode], v_[in_pressure_cathode]));
            PointResult pr;
            evaluate_point(setpoint, 0.0, j_rated, pr);
            duty = kValveMargin * v_[heat_duty];
        } catch (const Error& err) {
            v_ = outputs;
            throw Error(initial ? ErrorKind::config : err.kind(),
                        fmt::format("sizing the coolant at rated load and the temperature setpoint {:g} K: {}", setpoint,
                                    err.what()));
        }
        for (int i = 0; i < kVarCount; ++i)
            if (variable_info(static_cast<Var>(i)).causality == Causality::output)
                v_[static_cast<std::size_t>(i)] = outputs[static_cast<std::size_t>(i)];
        std::copy(outputs.begin() + kVarCount, outputs.end(), v_.begin() + kVarCount);
    }
    const double cp = v_[par_coolant_heat_capacity];
    const double span = setpoint - v_[in_coolant_temperature];
    if (!(duty > 0) || !(span > 0)) {  // nothing to remove at rated load, or a coolant too warm to remove it
        settle(in_coolant_flow, 0.0);
        settle(par_exchanger_ua, 0.0);
        return;
    }
    const double rise = std::min(d.coolant_temperature_rise, 0.5 * span);
    // NTU = −ln(1 − ε); ε at most 0.99 when a given flow or conductance is too small for the duty
    // (the plant then settles above its setpoint at rated load, the valve open).
    const auto ua_for = [&](double flow) {
        const double effectiveness = std::min(duty / (flow * cp * span), 0.99);
        return -std::log1p(-effectiveness) * flow * cp;
    };
    if (is_auto(in_coolant_flow) && is_auto(par_exchanger_ua)) {
        const double flow = duty / (cp * rise);
        settle(in_coolant_flow, flow);
        settle(par_exchanger_ua, ua_for(flow));
    } else if (is_auto(par_exchanger_ua)) {
        const double flow = v_[in_coolant_flow];
        settle(par_exchanger_ua, flow > 0 ? ua_for(flow) : 0.0);
    } else {
        const double ua = v_[par_exchanger_ua];
        const double target = std::min(duty, 0.99 * ua * span);  // an exchanger takes at most UA·(T − T_in)
        if (!(target > 0)) {
            settle(in_coolant_flow, duty / (cp * rise));
            return;
        }
        const double inlet = v_[in_coolant_temperature];
        const auto excess = [&](double flow) { return coolant_heat(ua, cp, flow, inlet, setpoint).heat - target; };
        const double lo = target / (cp * span);
        double hi = 2 * lo;
        // The heat taken grows with the flow towards UA·(T − T_in) > target, so a bracket exists; a
        // conductance so small that the heat underflows has none (found by fuzzing: UA = 5e-324 W/K).
        for (int doubling = 0; !(excess(hi) >= 0); ++doubling) {
            if (!(lo > 0) || doubling > 2100 || !std::isfinite(hi))
                throw Error(ErrorKind::infeasible,
                            fmt::format("param.thermal.exchanger_ua = {:g} W/K: no coolant flow removes the plant's "
                                        "heat at rated load ({:g} W) at its setpoint {:g} K",
                                        ua, duty, setpoint));
            hi *= 2;
        }
        settle(in_coolant_flow, brent_root(excess, lo, hi, excess(lo), excess(hi), 1e-12 * hi));
    }
}

}  // namespace ely
