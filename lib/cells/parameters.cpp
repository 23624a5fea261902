#include "cells/parameters.hpp"

#include <fmt/format.h>

#include "base/check.hpp"
#include "base/error.hpp"

namespace ely {

ParameterValues::ParameterValues(const std::vector<ParameterInfo>& infos) : infos_(&infos) {
    values_.reserve(infos.size());
    for (const auto& i : infos) values_.push_back(i.default_value);
}

namespace {
std::size_t index_of(const std::vector<ParameterInfo>& infos, const std::string& key) {
    for (std::size_t i = 0; i < infos.size(); ++i)
        if (key == infos[i].key) return i;
    std::string known;
    for (const auto& i : infos) known += (known.empty() ? "" : ", ") + std::string(i.key);
    throw Error(ErrorKind::unknown_name, fmt::format("unknown parameter '{}'; known: {}", key, known));
}
}  // namespace

void ParameterValues::set(const std::string& key, double value) {
    const auto i = index_of(*infos_, key);
    const auto& info = (*infos_)[i];
    require_within(value, info.min, info.max, info.key, info.unit);
    values_[i] = value;
}

double ParameterValues::get(const std::string& key) const { return values_[index_of(*infos_, key)]; }

}  // namespace ely
