#include "cells/cell_support.hpp"

#include <cmath>
#include <fmt/format.h>
#include <string>

#include "thermo/error.hpp"

namespace ely {

uint32_t read_choice(const ParameterValues& v, const char* key, int max) {
    const double x = v.get(key);
    if (x != std::floor(x) || x < 0.0 || x > max)
        throw Error(ErrorKind::invalid_argument, fmt::format("{} is {:g}; it must be an integer 0..{}", key, x, max));
    return static_cast<uint32_t>(x);
}

ElectrodeKinetics read_kinetics(const ParameterValues& v, const char* electrode, double reference_temperature) {
    const std::string e(electrode);
    return {v.get(e + "_exchange_current_density"), v.get(e + "_activation_energy"), reference_temperature,
            v.get(e + "_transfer_coefficient_forward"), v.get(e + "_transfer_coefficient_backward")};
}

double activation_overpotential(const ElectrodeKinetics& k, bool tafel, double j, double t) {
    const double j0 = exchange_current_density(k, t);
    return tafel ? tafel_overpotential(j, j0, k.alpha_forward, t)
                 : butler_volmer_overpotential(j, j0, k.alpha_forward, k.alpha_backward, t);
}

}  // namespace ely
