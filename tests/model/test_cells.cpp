// What every technology of the registry promises, checked once for all of them: its
// parameter table, its factory and envelope, and that evaluate() allocates nothing.
#include <gtest/gtest.h>

#include <set>
#include <string>

#include "alloc_counter.hpp"
#include "cells/registry.hpp"
#include "config/config.hpp"
#include "support.hpp"

using namespace ely;
using ely::test::all_technologies;
using ely::test::source_path;

class CellTables : public ::testing::TestWithParam<const TechnologyInfo*> {};
class ParameterTables : public ::testing::TestWithParam<const TechnologyInfo*> {};

TEST_P(ParameterTables, EveryParameterHasUnitMeaningSourceAndAValidDefault) {
    const TechnologyInfo& t = *GetParam();
    const auto& infos = cell_parameters(t);
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
    for (const auto& sd : t.stack_defaults) EXPECT_EQ(keys.count(sd.parameter), 1u) << sd.parameter;
}

TEST_P(CellTables, RegistryEntryIsComplete) {
    const TechnologyInfo& t = *GetParam();
    EXPECT_EQ(find_technology(t.name), &t);
    EXPECT_GT(std::string(t.title).size(), 0u);
    // Either a parameter table with its factory, or a reaction table: never half of one.
    EXPECT_EQ(t.parameters == nullptr, t.make == nullptr);
    EXPECT_EQ(t.parameters == nullptr, t.has(kReactionTable));
    EXPECT_FALSE(t.summary.empty());
    // Its minimal example exists and builds its technology.
    const PlantDesign d = load_config_file(source_path(t.example));
    EXPECT_EQ(d.technology, &t);
}

TEST_P(CellTables, FactoryBuildsACellWithASaneEnvelope) {
    const TechnologyInfo& t = *GetParam();
    const auto cell = t.parameters ? make_cell(t, ParameterValues(cell_parameters(t)))
                                   : load_config_file(source_path(t.example)).cell->clone();
    ASSERT_NE(cell, nullptr);
    ASSERT_NE(cell->clone(), nullptr);
    const auto& e = cell->envelope();
    EXPECT_LT(e.temperature_min, e.temperature_max);
    EXPECT_LE(e.temperature_min, e.temperature_fit_min);
    EXPECT_GE(e.temperature_max, e.temperature_fit_max);
    EXPECT_LT(e.pressure_min, e.pressure_max);
    EXPECT_GT(e.current_density_max, 0.0);
}

TEST_P(CellTables, EvaluateDoesNotAllocate) {
    // The inner loop of every spec solve and batch: no heap allocation, at any load.
    const PlantDesign d = load_config_file(source_path(GetParam()->example));
    const Cell& cell = *d.cell;
    const double t = d.configured[in_temperature], pa = d.configured[in_pressure_anode],
                 pc = d.configured[in_pressure_cathode];
    const double j_max = cell.current_density_limit({cell.envelope().current_density_max, t, pa, pc});
    for (double f : {0.2, 0.5, 0.9}) {
        const OperatingPoint p{f * j_max, t, pa, pc};
        CellResult r = cell.evaluate(p);
        const long allocations = ely::test::count_allocations([&] { r = cell.evaluate(p); });
        if (allocations < 0) GTEST_SKIP() << "operator new is replaced elsewhere in this test program; cannot count";
        EXPECT_EQ(allocations, 0) << GetParam()->name << " at " << f << " of the maximum current density";
    }
}

INSTANTIATE_TEST_SUITE_P(Registry, CellTables, ::testing::ValuesIn(all_technologies()), ely::test::technology_name);

std::vector<const TechnologyInfo*> with_parameter_tables() {
    std::vector<const TechnologyInfo*> out;
    for (const auto* t : all_technologies())
        if (t->parameters) out.push_back(t);
    return out;
}
INSTANTIATE_TEST_SUITE_P(Registry, ParameterTables, ::testing::ValuesIn(with_parameter_tables()),
                         ely::test::technology_name);

TEST(Registry, LookupByNameAndUnknownNames) {
    EXPECT_EQ(std::string(technology("brine").name), "brine");
    EXPECT_EQ(find_technology("molten_salt"), nullptr);
    ely::test::expect_error([] { technology("molten_salt"); }, ErrorKind::unknown_name, "pem, alkaline");
    ely::test::expect_error([] { make_cell(technology("custom"), ParameterValues(cell_parameters(technology("pem")))); },
                            ErrorKind::invalid_argument, "reaction table");
}
