#pragma once
// Helpers shared by the model tests.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>

#include <initializer_list>
#include <memory>
#include <utility>

#include "cells/cell.hpp"
#include "base/error.hpp"

namespace ely::test {

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

/// A cell of `technology` with its default parameters, the given ones changed.
inline std::unique_ptr<Cell> cell_with(Technology technology,
                                       std::initializer_list<std::pair<const char*, double>> settings = {}) {
    ParameterValues values(cell_parameters(technology));
    for (const auto& [key, value] : settings) values.set(key, value);
    return make_cell(technology, values);
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
