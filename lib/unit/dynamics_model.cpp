// Heat-transfer and control laws of the plant in time (dynamics.hpp; docs/dynamics.md).
#include <algorithm>
#include <cmath>

#include "unit/dynamics.hpp"

namespace ely {

CoolantHeat coolant_heat(double ua, double heat_capacity, double flow, double inlet_temperature,
                         double plant_temperature) {
    const double capacity_rate = flow * heat_capacity;  // W/K
    const double span = plant_temperature - inlet_temperature;
    if (!(ua > 0)) return {0.0, inlet_temperature, 0.0};
    if (!(capacity_rate > 0)) return {0.0, inlet_temperature, heat_capacity * span};  // the limit flow → 0
    // ε = 1 − exp(−NTU) for a capacity ratio of 0 (the plant side at one temperature); -expm1
    // keeps it exact when NTU is small (a large flow).
    const double ntu = ua / capacity_rate, effectiveness = -std::expm1(-ntu);
    const double heat = effectiveness * capacity_rate * span;
    // d(ε ṁ c_p)/dṁ = c_p [1 − e^(−NTU) (1 + NTU)]
    const double gain = heat_capacity * span * (effectiveness - ntu * std::exp(-ntu));
    return {heat, inlet_temperature + heat / capacity_rate, gain};
}

ValveControl valve_control(double temperature, double integral, double setpoint, double band, double integral_time,
                           bool active) {
    const double v = (temperature - setpoint) / band + integral;
    const double tracking_time = integral_time;
    if (!active) return {0.0, -v / tracking_time, 0.0};
    const double u = std::clamp(v, 0.0, 1.0);
    const double drive = (temperature - setpoint) / (band * integral_time) + (u - v) / tracking_time;
    return {u, drive, v > 0.0 && v < 1.0 ? 1.0 : 0.0};
}

double heater_output(double rating, double temperature, double target, double band) {
    return rating * std::clamp((target - temperature) / band, 0.0, 1.0);
}

void hermite_interpolate(const RunStep& step, double t, double* x, int n) {
    const double h = step.t_b - step.t_a;
    const double s = h > 0 ? (t - step.t_a) / h : 1.0, s2 = s * s, s3 = s2 * s;
    const double h00 = 2 * s3 - 3 * s2 + 1, h10 = s3 - 2 * s2 + s, h01 = -2 * s3 + 3 * s2, h11 = s3 - s2;
    for (int i = 0; i < n; ++i) {
        const auto k = static_cast<std::size_t>(i);
        x[i] = h00 * step.x_a[k] + h10 * h * step.f_a[k] + h01 * step.x_b[k] + h11 * h * step.f_b[k];
    }
}

}  // namespace ely
