#include "cells/cell_support.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <string>

#include "thermo/constants.hpp"
#include "thermo/reaction.hpp"
#include "base/error.hpp"

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

double current_density_cap(double envelope_maximum, double limiting_current_density) {
    return std::min(envelope_maximum, limiting_current_density * (1.0 - 1e-9));
}

double activation_overpotential(const ElectrodeKinetics& k, bool tafel, double j, double t) {
    const double j0 = exchange_current_density(k, t);
    return tafel ? tafel_overpotential(j, j0, k.alpha_forward, t)
                 : butler_volmer_overpotential(j, j0, k.alpha_forward, k.alpha_backward, t);
}

bool start_liquid_water_cell(CellResult& r, const OperatingPoint& p, double a_w) {
    r.current_density = p.current_density;
    r.reversible_voltage = reversible_voltage_liquid_water(p.temperature, p.pressure_anode, p.pressure_cathode, a_w);
    r.thermoneutral_voltage = thermoneutral_voltage_hhv(p.temperature);
    r.gases_saturated = true;
    r.water_activity_anode = r.water_activity_cathode = a_w;
    if (p.current_density != 0.0) return false;
    r.voltage = r.reversible_voltage;
    r.faraday_efficiency = 0.0;
    return true;
}

double crossover_minimum_current_density(const CrossoverFluxes& x, double recombination) {
    return std::max(2.0 * kFaraday * (x.hydrogen + 2.0 * recombination * x.oxygen), 4.0 * kFaraday * x.oxygen);
}

void fill_water_cell_gases(CellResult& r, double j_e, const CrossoverFluxes& x, double recombination, const char* model,
                           const OperatingPoint& p) {
    const double j_min = crossover_minimum_current_density(x, recombination);
    if (!(j_e > j_min)) {
        const std::string electrode =
            j_e == p.current_density ? "" : fmt::format(" (electrode current density {:g} A/m2)", j_e);
        throw Error(ErrorKind::out_of_range,
                    fmt::format("{} cell: current density {:g} A/m2{} is at or below the minimum {:g} A/m2 at which the "
                                "gas produced exceeds the gas crossover ({:g} K, anode {:g} Pa, cathode {:g} Pa)",
                                model, p.current_density, electrode, j_min, p.temperature, p.pressure_anode,
                                p.pressure_cathode));
    }
    const double o2_recombined = recombination * x.oxygen;
    r.cathode_out[kH2] = j_e / (2.0 * kFaraday) - x.hydrogen - 2.0 * o2_recombined;
    r.cathode_out[kO2] = x.oxygen - o2_recombined;
    r.anode_out[kO2] = j_e / (4.0 * kFaraday) - x.oxygen;
    r.anode_out[kH2] = x.hydrogen;
    r.consumed[kH2O] = r.cathode_out[kH2] + r.anode_out[kH2];
    r.faraday_efficiency = r.cathode_out[kH2] / (p.current_density / (2.0 * kFaraday));
    r.h2_in_o2 = r.anode_out[kH2] / (r.anode_out[kO2] + r.anode_out[kH2]);
    r.o2_in_h2 = r.cathode_out[kO2] / (r.cathode_out[kH2] + r.cathode_out[kO2]);
}

}  // namespace ely
