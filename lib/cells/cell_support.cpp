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
                           const OperatingPoint& p) {
    const double j_gas = std::max(j_e, 0.0);
    const double h2_made = j_gas / (2.0 * kFaraday), o2_made = j_gas / (4.0 * kFaraday);
    const double h2_crossing = x.hydrogen_at(j_gas);
    // Oxygen burnt by the anode catalyst and oxygen crossing to the cathode: at most what the anode makes.
    const double o2_burnt_at_anode = std::min(0.5 * rc.hydrogen_at_anode * h2_crossing, o2_made);
    const double o2_crossing = std::min(x.oxygen, o2_made - o2_burnt_at_anode);
    const double o2_recombined = rc.oxygen_at_cathode * o2_crossing;
    const double h2_net = h2_made - h2_crossing - 2.0 * o2_recombined;  // < 0: standby
    r.cathode_out[kH2] = std::max(h2_net, 0.0);
    r.consumed[kH2] = std::max(-h2_net, 0.0);  // drawn back from the product line
    r.cathode_out[kO2] = o2_crossing - o2_recombined;
    r.anode_out[kO2] = o2_made - o2_crossing - o2_burnt_at_anode;
    r.anode_out[kH2] = h2_crossing - 2.0 * o2_burnt_at_anode;
    r.consumed[kH2O] = r.cathode_out[kH2] + r.anode_out[kH2] - r.consumed[kH2];
    r.faraday_efficiency = p.current_density > 0.0 ? r.cathode_out[kH2] / (p.current_density / (2.0 * kFaraday)) : 0.0;
    const auto fraction = [](double part, double other) { return part > 0.0 ? part / (part + other) : 0.0; };
    r.h2_in_o2 = fraction(r.anode_out[kH2], r.anode_out[kO2]);
    r.o2_in_h2 = fraction(r.cathode_out[kO2], r.cathode_out[kH2]);
}

}  // namespace ely
