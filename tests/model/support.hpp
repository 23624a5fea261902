#pragma once
// Helpers shared by the model tests.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <boost/json.hpp>
#include <cmath>
#include <fstream>
#include <sstream>

#include <initializer_list>
#include <memory>
#include <ostream>
#include <string>
#include <utility>
#include <vector>

#include "base/error.hpp"
#include "cells/cell.hpp"
#include "cells/registry.hpp"

namespace ely {
/// Parameterised tests over the registry print a technology by its name, never as a pointer.
inline void PrintTo(const TechnologyInfo* t, std::ostream* os) { *os << t->name; }
}  // namespace ely

namespace ely::test {

/// Every technology of the registry, as test parameters.
inline std::vector<const TechnologyInfo*> all_technologies() {
    std::vector<const TechnologyInfo*> out;
    for (const auto& t : technologies()) out.push_back(&t);
    return out;
}

/// Test names of parameterised tests over the registry: the technology's name.
inline std::string technology_name(const ::testing::TestParamInfo<const TechnologyInfo*>& info) {
    return info.param->name;
}

/// The path of a file of the source tree (examples, docs).
inline std::string source_path(const std::string& relative) { return std::string(ELY_SOURCE_DIR) + "/" + relative; }

/// The text of a file.
inline std::string read_file(const std::string& path) {
    std::ifstream in(path);
    std::stringstream ss;
    ss << in.rdbuf();
    return ss.str();
}

/// Merges the members of `extra` into `target`: objects member by member, other values replaced.
inline void merge_json(boost::json::object& target, const boost::json::object& extra) {
    for (const auto& kv : extra) {
        boost::json::value& slot = target[kv.key()];
        if (slot.is_object() && kv.value().is_object()) merge_json(slot.as_object(), kv.value().as_object());
        else slot = kv.value();
    }
}

/// |a/b − 1|
inline double rel(double a, double b) { return std::fabs(a / b - 1.0); }

/// Expects f() to throw ely::Error of `kind` whose message contains `fragment`.
template <class F>
void expect_error(F&& f, ErrorKind kind, const char* fragment) {
    try {
        f();
        ADD_FAILURE() << "no ely::Error thrown; expected one containing '" << fragment << "'";
    } catch (const Error& e) {
        EXPECT_EQ(e.kind(), kind) << e.what();
        EXPECT_THAT(e.what(), ::testing::HasSubstr(fragment));
    }
}

/// A cell of the technology named `technology` (registry) with its default parameters, the
/// given ones changed.
inline std::unique_ptr<Cell> cell_with(const char* technology,
                                       std::initializer_list<std::pair<const char*, double>> settings = {}) {
    const TechnologyInfo& t = ely::technology(technology);
    ParameterValues values(cell_parameters(t));
    for (const auto& [key, value] : settings) values.set(key, value);
    return make_cell(t, values);
}

/// Property test of a liquid-electrolyte cell: at each pressure pair and temperature the
/// voltage rises with current density; at each current density in `warm_js` it falls as the
/// temperature rises (faster kinetics, better conduction, lower E°).
template <class Pressures, class Temperatures, class CurrentDensities>
void expect_voltage_monotone(const Cell& cell, const Pressures& pressures, const Temperatures& temperatures,
                             const CurrentDensities& current_densities, std::initializer_list<double> warm_js) {
    for (const auto& [pa, pc] : pressures) {
        for (double t : temperatures) {
            double previous = 0.0;
            for (double j : current_densities) {
                const double v = cell.evaluate({j, t, pa, pc}).voltage;
                EXPECT_GT(v, previous) << "j " << j << " T " << t;
                previous = v;
            }
        }
        for (double j : warm_js) {
            double previous = 1e9;
            for (double t : temperatures) {
                const double v = cell.evaluate({j, t, pa, pc}).voltage;
                EXPECT_LT(v, previous) << "j " << j << " T " << t;
                previous = v;
            }
        }
    }
}

}  // namespace ely::test
