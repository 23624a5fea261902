#include "electrochem/crossover.hpp"

#include <cmath>
#include <fmt/format.h>
#include <vector>

#include "electrochem/kinetics.hpp"
#include "base/check.hpp"
#include "thermo/constants.hpp"

namespace ely {

double gas_permeability(const GasPermeability& gas, double temperature) {
    require_positive(temperature, "temperature");
    return gas.permeability * arrhenius_factor(gas.activation_energy, gas.reference_temperature, temperature);
}

double permeation_flux(double permeability, double partial_pressure, double thickness) {
    require_positive(thickness, "membrane thickness");
    if (partial_pressure <= 0.0) return 0.0;
    return permeability * partial_pressure / thickness;
}

double darcy_gas_flux(double coefficient, double gas_partial_pressure, double pressure_difference, double thickness) {
    require_positive(thickness, "membrane thickness");
    if (pressure_difference <= 0.0 || gas_partial_pressure <= 0.0) return 0.0;
    return coefficient * gas_partial_pressure * pressure_difference / thickness;
}

double faraday_efficiency_ulleberg(double current_density, double f1, double f2) {
    require_finite(current_density, "current density");
    require_positive(f1, "Ulleberg coefficient f1");
    require_within(f2, 0.0, 1.0, "Ulleberg coefficient f2", "");
    if (current_density <= 0.0) return 0.0;
    const double j2 = current_density * current_density;
    return j2 / (f1 + j2) * f2;
}

double shunt_loss_factor(int cells, double rho) {
    if (cells < 1 || cells > 100000)
        throw Error(ErrorKind::out_of_range, fmt::format("shunt network: {} cells is outside 1..100000", cells));
    require_finite(rho, "manifold-to-channel resistance ratio");
    if (rho < 0.0)
        throw Error(ErrorKind::out_of_range,
                    fmt::format("shunt network: manifold-to-channel resistance ratio {:g} is negative", rho));
    const std::size_t n = static_cast<std::size_t>(cells);
    // Electrolyte potential of cell k for V = 1: u_k = −k (cell 0 at the positive end).
    std::vector<double> u(n), m(n);
    for (std::size_t k = 0; k < n; ++k) u[k] = -static_cast<double>(k);
    if (rho == 0.0 || n == 1) {
        double mean = 0.0;
        for (double x : u) mean += x;
        mean /= static_cast<double>(n);
        for (auto& x : m) x = mean;
    } else {
        // Node k (R_ch = 1): (u_k − m_k) + (m_{k−1} − m_k)/ρ + (m_{k+1} − m_k)/ρ = 0, i.e.
        // (ρ + n_k)·m_k − m_{k−1} − m_{k+1} = ρ·u_k, n_k the number of neighbours. Thomas algorithm.
        std::vector<double> c(n), d(n);
        auto diag = [&](std::size_t k) { return rho + ((k == 0 || k == n - 1) ? 1.0 : 2.0); };
        c[0] = -1.0 / diag(0);
        d[0] = rho * u[0] / diag(0);
        for (std::size_t k = 1; k < n; ++k) {
            const double denom = diag(k) + c[k - 1];
            c[k] = -1.0 / denom;
            d[k] = (rho * u[k] + d[k - 1]) / denom;
        }
        m[n - 1] = d[n - 1];
        for (std::size_t k = n - 1; k-- > 0;) m[k] = d[k] - c[k] * m[k + 1];
    }
    double s = 0.0, total = 0.0;
    for (std::size_t k = 0; k < n; ++k) {
        s += u[k] - m[k];  // channel current leaving cell k
        total += s;
    }
    return total;
}

}  // namespace ely
