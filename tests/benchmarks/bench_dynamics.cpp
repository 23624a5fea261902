// The plant in time through the C interface: a year at 1-minute steps through ely_block_simulate,
// and one ely_block_advance of 1 s. Run by hand: build/tests/benchmarks/bench_dynamics. Never timed
// by a test. The plant is the demo plant (examples/demo-plant.json, written out here so that the
// program runs from any directory); the profiles are invented, with a fixed seed.
#include <benchmark/benchmark.h>
#include <elyblock/elyblock.h>

#include <cmath>
#include <random>
#include <vector>

namespace {

// examples/demo-plant.json
const char* const kDemo = R"({"technology":"pem","name":"demo plant",
  "stack":{"cells":250,"active_area":"2000 cm2","stacks":10},"cell":{"h2_recombination_fraction_anode":0.9},
  "plant":{"rectifier":{"loss_no_load":0.005,"loss_linear":0.01,"loss_quadratic":0.015},
           "auxiliaries":{"fixed":"150 kW","proportional":0.03},
           "limits":{"current_density_max":"2.5 A/cm2","rated_current_density":"2.5 A/cm2","min_load_fraction":0.1,"temperature_max":"85 degC"},
           "degradation":{"voltage_rate":"4 uV/h"},"thermal":{"feed_temperature":"15 degC"}},
  "operating":{"spec":"power","power":"12 MW","temperature":"65 degC","pressure_cathode":"30 bar",
               "pressure_anode":"1.5 bar","hours_operated":8000,"mode_request":3}})";

struct Block {
    ely_block* b = nullptr;
    Block() { ely_block_create(kDemo, &b); }
    ~Block() { ely_block_destroy(b); }
    int32_t idx(const char* n) const {
        int32_t i = -1;
        ely_block_find(b, n, &i);
        return i;
    }
};

/// An hourly power profile of wind and sun (invented: a wind-like autoregressive series and a
/// daily solar arc), W DC, capped at the plant's rated 25.6 MW.
std::vector<double> hourly_power() {
    std::mt19937_64 rng(20240611);
    std::normal_distribution<double> normal;
    std::vector<double> p(8760);
    double wind = 0;
    for (std::size_t h = 0; h < p.size(); ++h) {
        wind = 0.97 * wind + 0.243 * normal(rng);
        const double w = std::clamp(0.45 + 0.35 * wind, 0.0, 1.0);
        const double sun = std::max(0.0, std::sin(M_PI * (static_cast<double>(h % 24) - 6.0) / 12.0));
        p[h] = std::min(25.6e6, 24e6 * w * w + 16e6 * sun);
    }
    return p;
}

/// A year at 1-minute rows: the hourly values held over each hour, or (interpolate) a new value
/// every minute between them.
void year_at_one_minute(benchmark::State& state, bool interpolate) {
    const std::vector<double> hourly = hourly_power();
    const std::size_t rows = 8760 * 60;
    std::vector<double> times(rows), inputs(rows);
    for (std::size_t k = 0; k < rows; ++k) {
        times[k] = 60.0 * static_cast<double>(k);
        const std::size_t h = k / 60;
        const double s = interpolate ? static_cast<double>(k % 60) / 60.0 : 0.0;
        inputs[k] = (1 - s) * hourly[h] + s * hourly[std::min(h + 1, hourly.size() - 1)];
    }
    std::vector<double> outputs(rows * 3);
    std::vector<int32_t> status(rows);
    for (auto _ : state) {
        Block blk;
        const int32_t in_idx[] = {blk.idx("in.power")};
        const int32_t out_idx[] = {blk.idx("product.hydrogen"), blk.idx("stack.temperature"), blk.idx("plant.power")};
        const int32_t s = ely_block_simulate(blk.b, rows, times.data(), 1, in_idx, inputs.data(), 3, out_idx,
                                             outputs.data(), status.data(), nullptr, nullptr);
        if (s < 0) state.SkipWithError(ely_last_error());
        benchmark::DoNotOptimize(outputs.data());
    }
    state.SetItemsProcessed(static_cast<int64_t>(state.iterations()) * static_cast<int64_t>(rows));
}

void year_one_minute_rows_hourly_power(benchmark::State& state) { year_at_one_minute(state, false); }
void year_one_minute_rows_power_each_minute(benchmark::State& state) { year_at_one_minute(state, true); }

/// One ely_block_advance(1 s) of the demo plant settled at 12 MW, as a co-simulation master calls
/// it (setting its inputs, unchanged, before each step), reading two outputs.
void advance_one_second(benchmark::State& state) {
    Block blk;
    const int32_t ip = blk.idx("in.power"), ih = blk.idx("product.hydrogen"), it = blk.idx("stack.temperature");
    ely_block_reset(blk.b, 0.0);
    ely_block_advance(blk.b, 7200.0);
    double h2 = 0, t = 0;
    for (auto _ : state) {
        ely_block_set(blk.b, ip, 12e6);
        ely_block_advance(blk.b, 1.0);
        ely_block_get(blk.b, ih, &h2);
        ely_block_get(blk.b, it, &t);
        benchmark::DoNotOptimize(h2 + t);
    }
}

/// The same with the setpoint stepping by 2 % every minute: the integrator restarts each time.
void advance_one_second_setpoint_moving(benchmark::State& state) {
    Block blk;
    const int32_t ip = blk.idx("in.power"), ih = blk.idx("product.hydrogen");
    ely_block_reset(blk.b, 0.0);
    double h2 = 0;
    long k = 0;
    for (auto _ : state) {
        if (k % 60 == 0) ely_block_set(blk.b, ip, (k / 60) % 2 ? 12e6 : 12.24e6);
        ++k;
        ely_block_advance(blk.b, 1.0);
        ely_block_get(blk.b, ih, &h2);
        benchmark::DoNotOptimize(h2);
    }
}

}  // namespace

BENCHMARK(year_one_minute_rows_hourly_power)->Unit(benchmark::kMillisecond)->Iterations(1)->Repetitions(3);
BENCHMARK(year_one_minute_rows_power_each_minute)->Unit(benchmark::kMillisecond)->Iterations(1)->Repetitions(3);
BENCHMARK(advance_one_second);
BENCHMARK(advance_one_second_setpoint_moving);
