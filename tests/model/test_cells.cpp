// What every technology's parameter table and factory promise, checked once for all of them.
#include <gtest/gtest.h>

#include <set>
#include <string>

#include "cells/cell.hpp"
#include "cells/technologies.hpp"

using namespace ely;

class CellTables : public ::testing::TestWithParam<Technology> {};

TEST_P(CellTables, EveryParameterHasUnitMeaningSourceAndAValidDefault) {
    const auto& infos = cell_parameters(GetParam());
    ASSERT_FALSE(infos.empty());
    std::set<std::string> keys;
    for (const auto& p : infos) {
        EXPECT_TRUE(keys.insert(p.key).second) << "duplicate key " << p.key;
        EXPECT_GT(std::string(p.unit).size(), 0u) << p.key;
        EXPECT_GT(std::string(p.description).size(), 0u) << p.key;
        EXPECT_GT(std::string(p.source).size(), 0u) << p.key;
        EXPECT_LE(p.min, p.max) << p.key;
        EXPECT_GE(p.default_value, p.min) << p.key;
        EXPECT_LE(p.default_value, p.max) << p.key;
    }
}

TEST_P(CellTables, FactoryBuildsItsTechnologyFromTheDefaults) {
    const auto cell = make_cell(GetParam(), ParameterValues(cell_parameters(GetParam())));
    ASSERT_NE(cell, nullptr);
    EXPECT_EQ(cell->technology(), GetParam());
    EXPECT_EQ(cell->clone()->technology(), GetParam());
    const auto& e = cell->envelope();
    EXPECT_LT(e.temperature_min, e.temperature_max);
    EXPECT_LE(e.temperature_min, e.temperature_fit_min);
    EXPECT_GE(e.temperature_max, e.temperature_fit_max);
    EXPECT_LT(e.pressure_min, e.pressure_max);
    EXPECT_GT(e.current_density_max, 0.0);
}

INSTANTIATE_TEST_SUITE_P(AllTechnologies, CellTables,
                         ::testing::Values(Technology::pem, Technology::alkaline, Technology::solid_oxide,
                                           Technology::brine),
                         [](const ::testing::TestParamInfo<Technology>& info) {
                             return std::string(technology_name(info.param));
                         });
