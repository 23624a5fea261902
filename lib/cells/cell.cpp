#include "cells/cell.hpp"

#include <fmt/format.h>

#include "cells/technologies.hpp"
#include "base/check.hpp"

namespace ely {

const char* technology_name(Technology t) {
    switch (t) {
        case Technology::pem: return "pem";
        case Technology::alkaline: return "alkaline";
        case Technology::solid_oxide: return "solid_oxide";
        case Technology::brine: return "brine";
        case Technology::custom: return "custom";
    }
    return "?";
}

const std::vector<ParameterInfo>& cell_parameters(Technology technology) {
    switch (technology) {
        case Technology::pem: return pem_parameters();
        case Technology::alkaline: return alkaline_parameters();
        case Technology::solid_oxide: return solid_oxide_parameters();
        case Technology::brine: return brine_parameters();
        case Technology::custom: break;
    }
    throw Error(ErrorKind::invalid_argument, "the custom cell has no fixed parameter list; it is built from its reaction table");
}

std::unique_ptr<Cell> make_cell(Technology technology, const ParameterValues& values) {
    switch (technology) {
        case Technology::pem: return make_pem_cell(values);
        case Technology::alkaline: return make_alkaline_cell(values);
        case Technology::solid_oxide: return make_solid_oxide_cell(values);
        case Technology::brine: return make_brine_cell(values);
        case Technology::custom: break;
    }
    throw Error(ErrorKind::invalid_argument, "the custom cell is built by make_custom_cell");
}

uint32_t check_envelope(const Envelope& e, const OperatingPoint& p, const char* model) {
    const auto inside = [](double v, double lo, double hi) { return v >= lo && v <= hi; };  // false for NaN
    if (!(inside(p.temperature, e.temperature_min, e.temperature_max) &&
          inside(p.pressure_anode, e.pressure_min, e.pressure_max) &&
          inside(p.pressure_cathode, e.pressure_min, e.pressure_max) &&
          inside(p.current_density, 0.0, e.current_density_max))) {
        const std::string m(model);
        require_within(p.temperature, e.temperature_min, e.temperature_max, (m + " cell: temperature").c_str(), "K");
        require_within(p.pressure_anode, e.pressure_min, e.pressure_max, (m + " cell: anode pressure").c_str(), "Pa");
        require_within(p.pressure_cathode, e.pressure_min, e.pressure_max, (m + " cell: cathode pressure").c_str(), "Pa");
        require_within(p.current_density, 0.0, e.current_density_max, (m + " cell: current density").c_str(), "A/m2");
    }
    uint32_t w = 0;
    if (p.temperature < e.temperature_fit_min || p.temperature > e.temperature_fit_max) w |= kWarnTemperatureExtrapolated;
    return w;
}

}  // namespace ely
