#include "cells/cell.hpp"

#include <fmt/format.h>

#include "base/check.hpp"

namespace ely {

void ReactionShares::assign(std::size_t n, double value) {
    if (n > values_.size())
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("{} half-reactions: a cell holds at most {} per electrode", n, kMaxReactions));
    count_ = n;
    for (std::size_t k = 0; k < n; ++k) values_[k] = value;
}

double ReactionShares::at(std::size_t k) const {
    if (k >= count_) throw Error(ErrorKind::internal, fmt::format("reaction share {} of {}", k, count_));
    return values_[k];
}

const std::vector<VariableInfo>& Cell::own_outputs() const {
    static const std::vector<VariableInfo> none;
    return none;
}

void Cell::fill_own_outputs(const CellResult&, const PlantFlows&, double*) const {}

void Cell::solution_streams(const CellResult&, const PlantFlows&, SolutionStreams& out) const { out.count = 0; }

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
