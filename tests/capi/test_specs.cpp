// The C interface end to end: every spec mode on every technology, the warning and
// no-convergence statuses, rollback of a failed solve, and a clone that outlives its original.
#include <gmock/gmock.h>

#include <cmath>
#include <cstring>
#include <string>
#include <vector>

#include "capi_support.hpp"

using ::testing::HasSubstr;
using capi_test::Block;

namespace {

// A current density well inside each technology's default envelope (docs/cells-*.md).
double mid_current_density(const std::string& technology) {
    if (technology == "pem") return 15000;
    if (technology == "alkaline") return 3000;
    if (technology == "solid_oxide") return 4000;
    if (technology == "brine") return 4000;
    return 1500;  // custom
}

struct Point {
    double j, current, power, hydrogen, voltage;
};

Point read_point(const Block& b) {
    return {b.value("cell.current_density"), b.value("stack.current"), b.value("stack.power"),
            b.value("product.hydrogen"), b.value("cell.voltage")};
}

}  // namespace

// Each spec mode, given the drive value that a current-density solve produced, must find that
// same operating point again: the inverse solves (Brent on the current density) against the
// direct evaluation they invert.
TEST(SpecModes, EverySpecFindsTheCurrentDensityPointAgain) {
    for (const auto& tech : capi_test::technologies()) {
        SCOPED_TRACE(tech);
        Block b(capi_test::minimal_config(tech));
        ASSERT_NE(b.get(), nullptr);
        b.set("in.current_density", mid_current_density(tech));
        const int32_t s0 = ely_block_solve(b.get());
        ASSERT_GE(s0, 0) << ely_last_error();
        const Point ref = read_point(b);
        ASSERT_EQ(ref.j, mid_current_density(tech));
        const struct {
            const char* spec;
            const char* input;
            double value;
        } specs[] = {{"current", "in.current", ref.current},
                     {"power", "in.power", ref.power},
                     {"hydrogen_rate", "in.hydrogen_rate", ref.hydrogen},
                     {"voltage", "in.voltage", ref.voltage},
                     {"current_density", "in.current_density", ref.j}};
        for (const auto& s : specs) {
            SCOPED_TRACE(s.spec);
            ASSERT_EQ(ely_block_set_spec(b.get(), s.spec), ELY_OK) << ely_last_error();
            b.set(s.input, s.value);
            const int32_t status = ely_block_solve(b.get());
            ASSERT_GE(status, 0) << ely_last_error();
            EXPECT_EQ(status, s0);  // the same point raises the same alarms
            const Point p = read_point(b);
            EXPECT_NEAR(p.j / ref.j, 1.0, 1e-9);
            EXPECT_NEAR(p.voltage / ref.voltage, 1.0, 1e-9);
            EXPECT_NEAR(p.power / ref.power, 1.0, 1e-9);
            EXPECT_NEAR(p.hydrogen / ref.hydrogen, 1.0, 1e-9);
            EXPECT_EQ(b.value(s.input), s.value);  // the drive input reads back as set
        }
    }
}

TEST(SpecModes, CurrentSpecMeetsTheStackCurrentOfTwoStacks) {
    // Two stacks in parallel on one bus: in.current is their total (DEVELOPERS.md), so the
    // current density is I / (2 A).
    Block b(R"({"technology":"pem","stack":{"cells":50,"active_area":0.2,"stacks":2},"operating":{"spec":"current","current":"2 kA"}})");
    b.set("in.current", 4000.0);
    ASSERT_GE(ely_block_solve(b.get()), 0) << ely_last_error();
    EXPECT_NEAR(b.value("cell.current_density"), 4000.0 / (2 * 0.2), 1e-9 * 10000.0);
    EXPECT_EQ(b.value("stack.current"), 4000.0);
}

TEST(Statuses, AnAlarmIsAWarningWithValidOutputs) {
    // With an anode recombination catalyst the anode gas stays below the warning level at
    // 1.5 A/cm2, so the only alarm at 200 A/m2 is the low load.
    Block b(R"({"technology":"pem","stack":{"cells":100,"active_area":0.1},)"
            R"("cell":{"h2_recombination_fraction_anode":0.9},"operating":{"spec":"current_density"}})");
    b.set("in.current_density", 200.0);  // far below the default minimum load
    EXPECT_EQ(ely_block_solve(b.get()), ELY_WARNING);
    EXPECT_THAT(ely_last_error(), HasSubstr("load below the minimum load"));
    EXPECT_EQ(b.value("alarm.load_low"), 1.0);
    EXPECT_EQ(b.value("alarm.any"), 1.0);
    EXPECT_GT(b.value("cell.voltage"), b.value("cell.reversible_voltage"));
    b.set("in.current_density", 15000.0);
    EXPECT_EQ(ely_block_solve(b.get()), ELY_OK);
    EXPECT_STREQ(ely_last_error(), "");
    EXPECT_EQ(b.value("alarm.any"), 0.0);
}

TEST(Statuses, NoConvergenceComesThroughAndRollsBack) {
    // A custom anode whose exchange current density is so small that no potential carries
    // 5000 A/m2: its current saturates near j0·e^600 ≈ 3.8e3 A/m2 (the exponent clamp of
    // lib/cells/custom.cpp), while the rated maximum of 1000 A/m2 lets the plant be built.
    const std::string json = R"({"technology":"custom","stack":{"cells":10,"active_area":0.1},
      "plant":{"limits":{"current_density_max":1000}},
      "operating":{"spec":"current_density","current_density":800},
      "reactions":{"anode":[{"name":"slow oxygen evolution","product":"O2","electrons":4,
                             "standard_potential":"1.229 V","exchange_current_density":1e-257,
                             "activation_energy":0}],
                   "cathode":[{"name":"hydrogen evolution","product":"H2","electrons":2,"standard_potential":"0 V",
                               "activation_energy":0}]}})";
    Block b(json);
    ASSERT_NE(b.get(), nullptr);
    ASSERT_GE(ely_block_solve(b.get()), 0) << ely_last_error();
    const double v = b.value("cell.voltage");
    b.set("in.current_density", 5000.0);
    EXPECT_EQ(ely_block_solve(b.get()), ELY_ERR_NO_CONVERGENCE);
    EXPECT_THAT(ely_last_error(), HasSubstr("5000 A/m2"));
    EXPECT_EQ(b.value("in.current_density"), 800.0);  // rolled back to the last successful solve
    EXPECT_EQ(b.value("cell.voltage"), v);
}

TEST(Statuses, AFailedFirstSolveRollsBackToTheCreatedState) {
    Block b(capi_test::minimal_config("pem"));
    const double t0 = b.value("in.temperature");
    b.set("in.temperature", 500.0);  // outside the PEM envelope
    EXPECT_EQ(ely_block_solve(b.get()), ELY_ERR_OUT_OF_RANGE);
    EXPECT_EQ(b.value("in.temperature"), t0);
    double v = 0;
    EXPECT_EQ(ely_block_get(b.get(), b.index("cell.voltage"), &v), ELY_ERR_WRONG_STATE);
    EXPECT_GE(ely_block_solve(b.get()), 0) << ely_last_error();
}

TEST(Clone, OutlivesItsOriginal) {
    ely_block* original = nullptr;
    ASSERT_EQ(ely_block_create(capi_test::minimal_config("alkaline").c_str(), &original), ELY_OK);
    int32_t ij = -1, iv = -1, count = 0;
    ASSERT_EQ(ely_block_find(original, "in.current_density", &ij), ELY_OK);
    ASSERT_EQ(ely_block_find(original, "cell.voltage", &iv), ELY_OK);
    ASSERT_EQ(ely_block_set(original, ij, 2500.0), ELY_OK);
    ASSERT_GE(ely_block_solve(original), 0);
    double v_original = 0;
    ASSERT_EQ(ely_block_get(original, iv, &v_original), ELY_OK);
    ASSERT_EQ(ely_block_variable_count(original, &count), ELY_OK);
    std::vector<ely_variable_info> infos(static_cast<size_t>(count));
    for (int32_t i = 0; i < count; ++i) {
        infos[i].struct_size = sizeof(ely_variable_info);
        ASSERT_EQ(ely_block_variable_info(original, i, &infos[i]), ELY_OK);
    }

    ely_block* clone = nullptr;
    ASSERT_EQ(ely_block_clone(original, &clone), ELY_OK);
    ely_block_destroy(original);  // the clone lives on alone

    // Strings handed out for the original stay valid while a clone exists (header promise).
    for (int32_t i = 0; i < count; ++i) {
        int32_t back = -1;
        ASSERT_EQ(ely_block_find(clone, infos[i].name, &back), ELY_OK) << i;
        EXPECT_EQ(back, i);
        EXPECT_GT(std::strlen(infos[i].unit), 0u);
    }
    double v = 0;
    ASSERT_EQ(ely_block_get(clone, iv, &v), ELY_OK);
    EXPECT_EQ(v, v_original);
    ASSERT_EQ(ely_block_set(clone, ij, 4000.0), ELY_OK);
    ASSERT_GE(ely_block_solve(clone), 0) << ely_last_error();
    ASSERT_EQ(ely_block_get(clone, iv, &v), ELY_OK);
    EXPECT_GT(v, v_original);  // more current, more voltage
    size_t n = 0;
    EXPECT_EQ(ely_block_report_json(clone, nullptr, 0, &n), ELY_OK);
    ely_block_destroy(clone);
}
