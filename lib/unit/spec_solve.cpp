// Spec solving: the current density at which the plant meets the spec's drive input (current
// density or current directly; power, hydrogen rate or cell voltage by Brent's method).
#include <algorithm>
#include <cmath>
#include <fmt/format.h>

#include "thermo/constants.hpp"
#include "unit/point_result.hpp"
#include "unit/root.hpp"

namespace ely {

namespace {
// Brent stops when the bracket is narrower than 4.4e-16·j + ½·kRootTolerance·j_max: the root to a few
// ulps. The bracket is the point's own (no warm start from the previous point), so a block gives a
// point the same answer, bit for bit, whatever it solved before.
constexpr double kRootTolerance = 1e-15;
}  // namespace

double Block::max_current_density(double temperature, double p_anode, double p_cathode) const {
    const double j_max = v_[par_current_density_max];
    return std::min(j_max, cell_->current_density_limit({j_max, temperature, p_anode, p_cathode}));
}

void Block::evaluate_at(double j, PointResult& out) const {
    const double t = v_[in_temperature], pa = v_[in_pressure_anode], pc = v_[in_pressure_cathode];
    out.cell = cell_->evaluate({j, t, pa, pc});
    auto& c = out.cell;
    // Ageing adds to the ohmic part so that the breakdown still sums to the voltage.
    const double hours = v_[in_hours_operated];
    out.degradation = v_[par_degradation_voltage_rate] * hours + v_[par_degradation_resistance_rate] * hours * j;
    c.ohmic += out.degradation;
    c.voltage = c.reversible_voltage + c.activation_anode + c.activation_cathode + c.ohmic + c.concentration;
    out.temperature = t;
    out.p_anode = pa;
    out.p_cathode = pc;
    out.feed_temperature = v_[in_feed_temperature];

    const double cells = static_cast<double>(design_.cells()), stacks = static_cast<double>(design_.stacks());
    const double area = design_.active_area();
    out.area_total = cells * stacks * area;
    for (int k = 0; k < kComponentCount; ++k) {
        out.cathode[k] = c.cathode_out[k] * out.area_total;
        out.anode[k] = c.anode_out[k] * out.area_total;
        out.consumed[k] = c.consumed[k] * out.area_total;
    }
    out.stack_current = j * area * stacks;
    out.stack_voltage = c.voltage * cells;
    out.stack_power = out.stack_current * out.stack_voltage;
}

double Block::drive_quantity(const PointResult& pr) const {
    switch (spec_) {
        case Spec::current_density: return pr.cell.current_density;
        case Spec::current: return pr.stack_current;
        case Spec::power: return pr.stack_power;
        case Spec::hydrogen_rate: return pr.cathode[kH2] * molar_mass::H2;
        case Spec::voltage: break;
    }
    return pr.cell.voltage;
}

double Block::solve_current_density(double j_max) {
    const Var drive = spec_info(spec_).drive;
    const auto& info = variable_info(drive);
    const double target = v_[drive];
    if (std::isnan(target))
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("the spec '{}' reads {}, which has no value: {} was not given in the plant description "
                                "and {} has not been set",
                                spec_name(spec_), info.name, info.config_key, info.name));
    switch (spec_) {
        case Spec::current_density: return target;
        case Spec::current: return target / (design_.active_area() * design_.stacks());
        default: break;
    }
    PointResult pr;
    auto quantity = [&](double j) {
        evaluate_at(j, pr);
        return drive_quantity(pr);
    };
    if (target == 0.0 && spec_ != Spec::voltage) return 0.0;  // open circuit
    const double q_max = quantity(j_max);
    if (q_max < target)
        throw Error(ErrorKind::infeasible,
                    fmt::format("{} = {:.6g} {} is above what the plant reaches at its maximum current density "
                                "{:.6g} A/m2 ({:.6g} {})",
                                info.name, target, info.unit, j_max, q_max, info.unit));
    // Lower end of the bracket: the smallest current density the cell accepts (below it the
    // gas crossing the separator exceeds the gas made); the cell's hint, widened if needed.
    const OperatingPoint op{j_max, v_[in_temperature], v_[in_pressure_anode], v_[in_pressure_cathode]};
    double j_lo = cell_->current_density_minimum(op) * (1.0 + 1e-9);
    double q_lo = 0.0;
    for (int tries = 0;; ++tries) {
        try {
            q_lo = quantity(j_lo);
            break;
        } catch (const Error& e) {
            if (e.kind() != ErrorKind::out_of_range || tries >= 60) throw;
            j_lo = j_lo > 0 ? std::min(j_max, j_lo * 1.5) : 1e-9 * j_max;
        }
    }
    auto f = [&](double j) { return quantity(j) - target; };
    double a = j_lo, b = j_max, fa = q_lo - target, fb = q_max - target;
    if (q_lo > target) {
        // Below the smallest current density of production the cell is in standby (the gas crossing the
        // separator exceeds the gas made, purity alarms raised): the target may still lie between open
        // circuit and there.
        const double q_0 = quantity(0.0);
        if (q_0 > target)
            throw Error(ErrorKind::infeasible,
                        fmt::format("{} = {:.6g} {} is below what the plant gives at open circuit ({:.6g} {})", info.name,
                                    target, info.unit, q_0, info.unit));
        b = j_lo;
        fb = q_lo - target;
        a = 0.0;
        fa = q_0 - target;
        return brent_root(f, a, b, fa, fb, kRootTolerance * j_max);
    }
    // No warm start from the previous point: the bracket, and so the root and every digit of it, depend on
    // this point alone (a block's answer does not depend on what it solved before, a batch's not on how its
    // points are cut into pieces for threads).
    return brent_root(f, a, b, fa, fb, kRootTolerance * j_max);
}

}  // namespace ely
