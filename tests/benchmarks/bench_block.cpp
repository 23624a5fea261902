// The block through the C interface: single solve, batch per point, power-spec solve, and
// config parse. Run by hand: build/tests/benchmarks/bench_block. Never timed by a test.
#include <benchmark/benchmark.h>
#include <elyblock/elyblock.h>

#include <vector>

#include "config/config.hpp"

namespace {
const char* const kPem =
    R"({"technology":"pem","stack":{"cells":100,"active_area":0.1},"operating":{"spec":"current_density"}})";

struct Block {
    ely_block* b = nullptr;
    Block() { ely_block_create(kPem, &b); }
    ~Block() { ely_block_destroy(b); }
    int32_t idx(const char* n) const { int32_t i = -1; ely_block_find(b, n, &i); return i; }
};
}  // namespace

static void single_solve_current_density(benchmark::State& state) {
    Block blk;
    const int32_t ij = blk.idx("in.current_density"), iv = blk.idx("cell.voltage");
    double j = 1000.0, v = 0;
    for (auto _ : state) {
        ely_block_set(blk.b, ij, j);
        ely_block_solve(blk.b);
        ely_block_get(blk.b, iv, &v);
        benchmark::DoNotOptimize(v);
        j = j < 25000.0 ? j + 1.0 : 1000.0;
    }
}
BENCHMARK(single_solve_current_density);

static void batch_per_point(benchmark::State& state) {
    Block blk;
    const int32_t ij = blk.idx("in.current_density");
    const int32_t out_idx[] = {blk.idx("cell.voltage"), blk.idx("product.hydrogen"), blk.idx("heat.duty")};
    const size_t n = static_cast<size_t>(state.range(0));
    std::vector<double> in(n), out(3 * n);
    std::vector<int32_t> st(n);
    for (size_t k = 0; k < n; ++k) in[k] = 1000.0 + 24000.0 * static_cast<double>(k) / static_cast<double>(n);
    for (auto _ : state) {
        ely_block_solve_batch(blk.b, n, 1, &ij, in.data(), 3, out_idx, out.data(), st.data(), nullptr, nullptr);
        benchmark::DoNotOptimize(out.data());
    }
    state.SetItemsProcessed(static_cast<int64_t>(state.iterations()) * static_cast<int64_t>(n));
}
BENCHMARK(batch_per_point)->Arg(10000);

static void batch_per_point_varying_temperature(benchmark::State& state) {
    Block blk;
    const int32_t in_idx[] = {blk.idx("in.current_density"), blk.idx("in.temperature")};
    const int32_t out_idx[] = {blk.idx("cell.voltage")};
    const size_t n = 10000;
    std::vector<double> in(2 * n), out(n);
    std::vector<int32_t> st(n);
    for (size_t k = 0; k < n; ++k) {
        in[2 * k] = 1000.0 + 24000.0 * static_cast<double>(k) / static_cast<double>(n);
        in[2 * k + 1] = 323.15 + 30.0 * static_cast<double>(k % 97) / 97.0;
    }
    for (auto _ : state) {
        ely_block_solve_batch(blk.b, n, 2, in_idx, in.data(), 1, out_idx, out.data(), st.data(), nullptr, nullptr);
        benchmark::DoNotOptimize(out.data());
    }
    state.SetItemsProcessed(static_cast<int64_t>(state.iterations()) * static_cast<int64_t>(n));
}
BENCHMARK(batch_per_point_varying_temperature);

static void power_spec_solve(benchmark::State& state) {
    Block blk;
    ely_block_set_spec(blk.b, "power");
    const int32_t ip = blk.idx("in.power");
    // A setpoint that changes every call (a power profile), so no solve starts at its answer.
    double p = 20e3;
    for (auto _ : state) {
        ely_block_set(blk.b, ip, p);
        benchmark::DoNotOptimize(ely_block_solve(blk.b));
        p = p < 300e3 ? p * 1.013 : 20e3;
    }
}
BENCHMARK(power_spec_solve);

static void power_spec_solve_cold(benchmark::State& state) {
    Block blk;
    ely_block_set_spec(blk.b, "power");
    const int32_t ip = blk.idx("in.power");
    // Setpoints that jump across the range, so the ±2 % warm-start bracket never holds.
    const double setpoints[] = {25e3, 240e3, 60e3, 180e3, 35e3, 280e3, 110e3};
    size_t k = 0;
    for (auto _ : state) {
        ely_block_set(blk.b, ip, setpoints[k]);
        benchmark::DoNotOptimize(ely_block_solve(blk.b));
        k = (k + 1) % 7;
    }
}
BENCHMARK(power_spec_solve_cold);

static void config_parse(benchmark::State& state) {
    for (auto _ : state) benchmark::DoNotOptimize(ely::parse_config(kPem));
}
BENCHMARK(config_parse);

static void create_block(benchmark::State& state) {
    for (auto _ : state) {
        ely_block* b = nullptr;
        ely_block_create(kPem, &b);
        ely_block_destroy(b);
    }
}
BENCHMARK(create_block);
