#include "electrochem/kinetics.hpp"

#include <cmath>
#include <fmt/format.h>

#include "base/check.hpp"
#include "thermo/constants.hpp"

namespace ely {

double arrhenius_factor(double activation_energy, double reference_temperature, double temperature) {
    return std::exp(-activation_energy / kGasConstant * (1.0 / temperature - 1.0 / reference_temperature));
}

double exchange_current_density(const ElectrodeKinetics& k, double temperature) {
    return k.exchange_current_density * arrhenius_factor(k.activation_energy, k.reference_temperature, temperature);
}

double butler_volmer_current(double overpotential, double j0, double alpha_forward, double alpha_backward,
                             double temperature) {
    const double f = kFaraday / (kGasConstant * temperature);
    return j0 * (std::exp(alpha_forward * f * overpotential) - std::exp(-alpha_backward * f * overpotential));
}

double butler_volmer_overpotential(double current_density, double j0, double alpha_forward, double alpha_backward,
                                   double temperature) {
    require_finite(current_density, "current density");
    require_positive(j0, "exchange current density");
    require_positive(alpha_forward, "forward transfer coefficient");
    require_positive(alpha_backward, "backward transfer coefficient");
    require_positive(temperature, "temperature");
    if (current_density < 0.0)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("current density {:g} A/m2 is negative; electrolysis needs j >= 0", current_density));
    if (current_density == 0.0) return 0.0;
    const double f = kFaraday / (kGasConstant * temperature);
    if (alpha_forward == alpha_backward) return std::asinh(current_density / (2.0 * j0)) / (alpha_forward * f);

    // g(η) = exp(a η) − exp(−b η) − r, strictly increasing; g(0) = −r < 0 and
    // g(ln(r + 1)/a) = 1 − exp(−b η) > 0 bracket the root.
    const double a = alpha_forward * f, b = alpha_backward * f, r = current_density / j0;
    double lo = 0.0, hi = std::log1p(r) / a;
    double eta = std::min(hi, std::asinh(0.5 * r) / (0.5 * (a + b)));  // symmetric guess
    for (int iter = 0; iter < 200; ++iter) {
        const double ea = std::exp(a * eta), eb = std::exp(-b * eta);
        const double g = ea - eb - r;
        if (g > 0) hi = eta; else lo = eta;
        const double dg = a * ea + b * eb;
        double next = eta - g / dg;
        if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);  // Newton left the bracket: bisect
        if (std::fabs(next - eta) <= 4e-16 * std::max(1.0, eta) || hi - lo <= 4e-16 * std::max(1.0, hi))
            return next;
        eta = next;
    }
    throw Error(ErrorKind::no_convergence,
                fmt::format("Butler-Volmer solve did not converge for j = {:g} A/m2, j0 = {:g} A/m2", current_density, j0));
}

double tafel_overpotential(double current_density, double j0, double alpha_forward, double temperature) {
    require_positive(j0, "exchange current density");
    if (current_density <= j0) return 0.0;
    return kGasConstant * temperature / (alpha_forward * kFaraday) * std::log(current_density / j0);
}

double concentration_overpotential(double current_density, double limiting_current_density, double temperature,
                                   int electrons) {
    require_positive(limiting_current_density, "limiting current density");
    if (current_density >= limiting_current_density)
        throw Error(ErrorKind::out_of_range,
                    fmt::format("current density {:g} A/m2 is at or above the limiting current density {:g} A/m2",
                                current_density, limiting_current_density));
    if (current_density <= 0.0) return 0.0;
    return -kGasConstant * temperature / (electrons * kFaraday) * std::log1p(-current_density / limiting_current_density);
}

double product_accumulation_overpotential(double current_density, double product_current_density, double temperature,
                                          int electrons) {
    require_positive(product_current_density, "product current density");
    if (current_density <= 0.0) return 0.0;
    return kGasConstant * temperature / (electrons * kFaraday) * std::log1p(current_density / product_current_density);
}

}  // namespace ely
