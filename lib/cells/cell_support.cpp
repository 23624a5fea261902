#include "cells/cell_support.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <string>

#include "thermo/constants.hpp"
#include "thermo/reaction.hpp"
#include "base/error.hpp"

namespace ely {

uint32_t read_choice(const ParameterValues& v, const char* key) {
    const double x = v.get(key);  // within the table's limits: ParameterValues::set checks them
    double lo = 0.0, hi = 0.0;
    for (const auto& info : v.infos())
        if (std::string(info.key) == key) lo = info.min, hi = info.max;
    if (x != std::floor(x) || x < lo || x > hi)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("{} is {:g}; it must be a whole number {:g}..{:g}", key, x, lo, hi));
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

double crossover_minimum_current_density(const CrossoverFluxes& x, const Recombination& r) {
    // Hydrogen at the cathode: j/2F > N_H2(j) + 2 r_c N_O2, with N_H2 linear in j.
    const double hydrogen = 2.0 * kFaraday * (x.hydrogen + 2.0 * r.oxygen_at_cathode * x.oxygen) /
                            (1.0 - 2.0 * kFaraday * x.hydrogen_per_current_density);
    // Oxygen at the anode: j/4F > N_O2 + ½ r_a N_H2(j).
    const double oxygen = 4.0 * kFaraday * (x.oxygen + 0.5 * r.hydrogen_at_anode * x.hydrogen) /
                          (1.0 - 2.0 * kFaraday * r.hydrogen_at_anode * x.hydrogen_per_current_density);
    return std::max(hydrogen, oxygen);
}

void fill_water_cell_gases(CellResult& r, double j_e, const CrossoverFluxes& x, const Recombination& rc,
                           const char* model, const OperatingPoint& p) {
    const double j_min = crossover_minimum_current_density(x, rc);
    if (!(j_e > j_min)) {
        const std::string electrode =
            j_e == p.current_density ? "" : fmt::format(" (electrode current density {:g} A/m2)", j_e);
        throw Error(ErrorKind::out_of_range,
                    fmt::format("{} cell: current density {:g} A/m2{} is at or below the minimum {:g} A/m2 at which the "
                                "gas produced exceeds the gas crossover ({:g} K, anode {:g} Pa, cathode {:g} Pa)",
                                model, p.current_density, electrode, j_min, p.temperature, p.pressure_anode,
                                p.pressure_cathode));
    }
    const double h2_crossing = x.hydrogen_at(j_e);
    const double o2_recombined = rc.oxygen_at_cathode * x.oxygen;
    const double h2_recombined = rc.hydrogen_at_anode * h2_crossing;
    r.cathode_out[kH2] = j_e / (2.0 * kFaraday) - h2_crossing - 2.0 * o2_recombined;
    r.cathode_out[kO2] = x.oxygen - o2_recombined;
    r.anode_out[kO2] = j_e / (4.0 * kFaraday) - x.oxygen - 0.5 * h2_recombined;
    r.anode_out[kH2] = h2_crossing - h2_recombined;
    r.consumed[kH2O] = r.cathode_out[kH2] + r.anode_out[kH2];
    r.faraday_efficiency = r.cathode_out[kH2] / (p.current_density / (2.0 * kFaraday));
    r.h2_in_o2 = r.anode_out[kH2] / (r.anode_out[kO2] + r.anode_out[kH2]);
    r.o2_in_h2 = r.cathode_out[kO2] / (r.cathode_out[kH2] + r.cathode_out[kO2]);
}

}  // namespace ely
