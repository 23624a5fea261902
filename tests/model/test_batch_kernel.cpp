// The vectorized PEM batch (lib/batch) with each instruction set this machine runs (the C interface
// takes the widest; tests/capi/test_batch_equals_scalar.cpp compares it over every output there):
// every kernel gives the scalar solve's outputs to 1e-12 relative, marks the points it does not take,
// and says when it does not apply.
#include <gtest/gtest.h>

#include <cmath>
#include <random>
#include <string>
#include <vector>

#include "batch/pem_batch.hpp"
#include "config/config.hpp"
#include "support.hpp"
#include "unit/block.hpp"

namespace ely {
namespace {

TEST(BatchKernel, EveryInstructionSetEqualsTheScalarSolve) {
    const Block block(load_config_file(test::source_path("examples/minimal/pem.json")));
    const int32_t in[] = {block.find("in.current_density"), block.find("in.temperature"),
                          block.find("in.pressure_cathode"), block.find("in.pressure_anode")};
    // With an output of the energy balance (heat.gas_coolers) and without (the kernel leaves it out).
    const int32_t with_heat[] = {block.find("cell.voltage"), block.find("product.hydrogen"), block.find("gas.h2_in_o2"),
                                 block.find("heat.gas_coolers"), block.find("in.temperature"), block.find("param.cells")};
    const int32_t without_heat[] = {block.find("cell.voltage"), block.find("product.hydrogen"), block.find("gas.h2_in_o2"),
                                    block.find("perf.specific_energy"), block.find("in.temperature"), block.find("param.cells")};
    constexpr std::size_t kPoints = 301;  // a part-filled last vector
    std::mt19937_64 rng(11);
    std::uniform_real_distribution<double> j(100.0, 4.0e4), t(300.0, 370.0), pc(1e5, 40e5), pa(1e5, 3e5);
    std::vector<double> rows;
    for (std::size_t k = 0; k < kPoints; ++k) rows.insert(rows.end(), {j(rng), t(rng), pc(rng), pa(rng)});
    rows[4 * 5] = 0.0;       // open circuit: not taken
    rows[4 * 9 + 1] = 500.0; // outside the envelope: not taken
    rows[4 * 12] = 7e4;      // above the limiting current density: not taken

    const auto isas = batch::instruction_sets();
    ASSERT_FALSE(isas.empty());
    for (const char* isa : isas)
      for (const int32_t* out : {with_heat, without_heat}) {
        batch::PemBatch fast(block, 4, in, 6, out, isa);
        ASSERT_TRUE(fast.usable()) << isa;
        EXPECT_STREQ(fast.instruction_set(), isa);
        std::vector<double> values(6 * kPoints);
        std::vector<uint8_t> verdict(kPoints);
        fast.run(rows.data(), 0, kPoints, values.data(), verdict.data());
        Block scalar = block;
        int alarmed = 0;
        for (std::size_t k = 0; k < kPoints; ++k) {
            bool ok = true;
            SolveOutcome outcome;
            try {
                for (int i = 0; i < 4; ++i) scalar.set(in[i], rows[4 * k + static_cast<std::size_t>(i)]);
                outcome = scalar.solve();
            } catch (const Error&) {
                ok = false;
            }
            if (k == 5 || k == 9 || k == 12) {
                EXPECT_EQ(verdict[k], 2) << isa << " point " << k;
                continue;
            }
            ASSERT_TRUE(ok) << isa << " point " << k;
            // 0, or 4 + the alarms raised (bit a: alarm_first + a), worded as the scalar solve words them.
            ASSERT_TRUE(verdict[k] == 0 || verdict[k] >= 4) << isa << " point " << k << ": " << int(verdict[k]);
            EXPECT_EQ(verdict[k] >= 4, scalar.get(block.find("alarm.any")) > 0) << isa << " point " << k;
            if (verdict[k] >= 4) {
                ++alarmed;
                for (int a = alarm_first; a <= alarm_last; ++a)
                    EXPECT_EQ(((verdict[k] - 4) >> (a - alarm_first)) & 1, scalar.value(static_cast<Var>(a)) > 0 ? 1 : 0)
                        << isa << " point " << k << " alarm " << a;
                EXPECT_EQ(batch::PemBatch::alarm_message(verdict[k] - 4u), outcome.message) << isa << " point " << k;
            }
            for (int o = 0; o < 6; ++o) {
                const double want = scalar.get(out[o]), got = values[6 * k + static_cast<std::size_t>(o)];
                EXPECT_NEAR(got, want, 1e-12 * std::fabs(want) + 1e-300) << isa << " point " << k << " output " << o;
            }
        }
        EXPECT_GT(alarmed, 0) << isa;  // points with alarms among them
    }
}

TEST(BatchKernel, AppliesOnlyWhereItComputesWhatTheScalarPathDoes) {
    const Block pem(load_config_file(test::source_path("examples/minimal/pem.json")));
    const int32_t j = pem.find("in.current_density"), v = pem.find("cell.voltage");
    EXPECT_TRUE(batch::PemBatch(pem, 1, &j, 1, &v).usable());
    // Another input per row, another spec, another technology: the scalar path.
    const int32_t hours = pem.find("in.hours_operated");
    EXPECT_FALSE(batch::PemBatch(pem, 1, &hours, 1, &v).usable());
    Block power = pem;
    power.set_spec(Spec::power);
    EXPECT_FALSE(batch::PemBatch(power, 1, &j, 1, &v).usable());
    const Block alkaline(load_config_file(test::source_path("examples/minimal/alkaline.json")));
    const int32_t ja = alkaline.find("in.current_density"), va = alkaline.find("cell.voltage");
    EXPECT_FALSE(batch::PemBatch(alkaline, 1, &ja, 1, &va).usable());
    // Tafel kinetics are not in the kernel.
    Block tafel = pem;
    tafel.set(tafel.find("param.cell.kinetics_model"), 1.0);
    EXPECT_FALSE(batch::PemBatch(tafel, 1, &j, 1, &v).usable());
}

}  // namespace
}  // namespace ely
