// The spec solves (power, hydrogen rate, voltage) give a point the same answer whatever the block solved
// before: a sequence of points on one block, failing points among them, against each point on a block of
// its own. Regression: the solve used to bracket the root around the previous point's current density,
// so the digits of an answer (within the solver's tolerance) depended on the point before; next to the
// rollback of a failed solve (which takes a block back to its last good solve's spec too) this was
// taken for other roots at the voltage spec of the brine and custom cells.
#include <cmath>
#include <random>
#include <string>

#include <gtest/gtest.h>

#include "capi_support.hpp"

namespace {
using capi_test::Block;

const char* const kOutputs[] = {"cell.current_density", "cell.voltage", "stack.power", "product.hydrogen",
                                "heat.duty", "gas.h2_in_o2"};

struct Result {
    int32_t status;
    double values[6];
};

// The point (drive, T, p_c, p_a) on `b`: status and outputs (NaN after a failure).
Result solve_point(const Block& b, const char* drive, const double* point) {
    const char* names[] = {drive, "in.temperature", "in.pressure_cathode", "in.pressure_anode"};
    Result r{ELY_OK, {}};
    for (int i = 0; i < 4 && r.status >= 0; ++i) r.status = ely_block_set(b.get(), b.index(names[i]), point[i]);
    if (r.status >= 0) r.status = ely_block_solve(b.get());
    for (int o = 0; o < 6; ++o) {
        r.values[o] = std::nan("");
        if (r.status >= 0) {
            EXPECT_EQ(ely_block_get(b.get(), b.index(kOutputs[o]), &r.values[o]), ELY_OK);
        }
    }
    return r;
}

}  // namespace

TEST(SpecSolveHistory, AnswerDoesNotDependOnThePreviousPoint) {
    const char* const techs[] = {"pem", "aem", "alkaline", "solid_oxide", "brine", "custom"};
    const char* const specs[] = {"power", "hydrogen_rate", "voltage"};
    const char* const drives[] = {"in.power", "in.hydrogen_rate", "in.voltage"};
    const char* const meets[] = {"stack.power", "product.hydrogen", "cell.voltage"};
    std::mt19937_64 rng(20261203);
    std::uniform_real_distribution<double> u(0.0, 1.0);
    int compared = 0, failed = 0;
    for (const char* tech : techs) {
        const std::string config = capi_test::minimal_config(tech);
        Block ref(config);
        ASSERT_GE(ely_block_solve(ref.get()), 0) << tech << ": " << ely_last_error();
        const double t0 = ref.value("in.temperature"), pc0 = ref.value("in.pressure_cathode"),
                     pa0 = ref.value("in.pressure_anode");
        for (int s = 0; s < 3; ++s) {
            const double q0 = ref.value(meets[s]), e0 = ref.value("cell.reversible_voltage");
            // A block at the spec, solved once at the configured point (so that a failed point takes it back
            // to this spec).
            const auto at_spec = [&](const Block& b) {
                if (ely_block_set_spec(b.get(), specs[s]) != ELY_OK) return false;
                b.set(drives[s], q0);
                EXPECT_GE(ely_block_solve(b.get()), 0) << tech << " at " << specs[s] << ": " << ely_last_error();
                return true;
            };
            Block sequence(config);
            if (!at_spec(sequence)) continue;  // a drive the technology lacks
            for (int k = 0; k < 40; ++k) {
                const double x = u(rng);
                double point[4] = {s == 2 ? e0 + (q0 - e0) * (0.3 + 1.2 * x) : q0 * (0.05 + 1.3 * x),
                                   t0 + 20.0 * (u(rng) - 0.5), pc0 * (1.0 + 2.0 * u(rng)), pa0 * (1.0 + 0.5 * u(rng))};
                if (k % 5 == 1) point[0] *= 50.0;  // beyond what the plant reaches: fails
                if (k % 7 == 3) point[2] = 100e5;   // above the cathode pressure limit of some cells: fails
                const Result a = solve_point(sequence, drives[s], point);
                Block fresh(config);
                ASSERT_TRUE(at_spec(fresh));
                const Result b = solve_point(fresh, drives[s], point);
                const std::string what = std::string(tech) + " at " + specs[s] + " point " + std::to_string(k);
                ASSERT_EQ(a.status, b.status) << what;
                failed += a.status < 0;
                for (int o = 0; o < 6; ++o) {
                    // Bit for bit (NaN where both have none).
                    EXPECT_TRUE(a.values[o] == b.values[o] || (std::isnan(a.values[o]) && std::isnan(b.values[o])))
                        << what << " " << kOutputs[o] << ": after the sequence " << a.values[o] << ", alone "
                        << b.values[o];
                }
                ++compared;
            }
        }
    }
    EXPECT_GT(compared, 500);
    EXPECT_GT(failed, 100);  // failing points were among them
}
