// The batch through the C interface on the points of the shared numpy peer (tests/benchmarks/peer_cases.py):
// a PEM stack of 100 cells x 0.1 m2, current density, temperature, cathode and anode pressure drawn per
// point from the peer's ranges; eleven outputs. Also the single solve with the temperature changing at
// every call, and the scalar cell evaluation. Run by hand: build/tests/benchmarks/bench_batch. Never
// timed by a test.
#include <benchmark/benchmark.h>
#include <elyblock/elyblock.h>

#include <cstdint>
#include <random>
#include <string>
#include <vector>

namespace {
// The peer's stack and the cell parameters the peer shares (peer_cases.py writes the same plant).
std::string plant(const char* spec) {
    return std::string(R"({"technology":"pem","stack":{"cells":100,"active_area":0.1},"cell":{)"
                       R"("membrane_thickness":178e-6,"membrane_water_content":21,"contact_resistance":2e-6,)"
                       R"("anode_exchange_current_density":1e-2,"anode_activation_energy":52e3,)"
                       R"("anode_transfer_coefficient_forward":1,"anode_transfer_coefficient_backward":1,)"
                       R"("cathode_exchange_current_density":5e3,"cathode_activation_energy":18e3,)"
                       R"("cathode_transfer_coefficient_forward":0.5,"cathode_transfer_coefficient_backward":0.5,)"
                       R"("limiting_current_density":6e4,"h2_permeability":5e-14,"h2_permeability_activation_energy":21e3},)"
                       R"("operating":{"spec":")") +
           spec + R"(","power":1e5}})";
}

const char* const kOutputs[] = {"cell.voltage", "cell.reversible_voltage", "cell.activation_anode",
                                "cell.activation_cathode", "cell.ohmic", "cell.concentration",
                                "cell.faraday_efficiency", "product.hydrogen", "stack.power",
                                "perf.specific_energy", "gas.h2_in_o2"};
constexpr int kOutputCount = 11;

struct Block {
    ely_block* b = nullptr;
    explicit Block(const char* spec) { ely_block_create(plant(spec).c_str(), &b); }
    ~Block() { ely_block_destroy(b); }
    int32_t idx(const char* n) const {
        int32_t i = -1;
        ely_block_find(b, n, &i);
        return i;
    }
};

// Points in the peer's ranges (peer_bench.make_inputs): j 0.05..3 A/cm2, T 30..90 C, p_c 1..40 bar,
// p_a 1..3 bar. With `power`, the first column is the stack power the current-density solve gives.
struct Points {
    std::vector<double> in;
    std::vector<double> out;
    std::vector<int32_t> status;
    size_t n;
    Points(size_t count, Block* power_from) : in(4 * count), out(kOutputCount * count), status(count), n(count) {
        std::mt19937_64 rng(20261201);
        std::uniform_real_distribution<double> j(500.0, 3.0e4), t(303.15, 363.15), pc(1e5, 40e5), pa(1e5, 3e5);
        for (size_t k = 0; k < n; ++k) {
            in[4 * k] = j(rng);
            in[4 * k + 1] = t(rng);
            in[4 * k + 2] = pc(rng);
            in[4 * k + 3] = pa(rng);
        }
        if (power_from) {
            Block ev("current_density");
            const int32_t ii[] = {ev.idx("in.current_density"), ev.idx("in.temperature"), ev.idx("in.pressure_cathode"),
                                  ev.idx("in.pressure_anode")};
            const int32_t op = ev.idx("stack.power");
            std::vector<double> p(n);
            ely_block_solve_batch(ev.b, n, 4, ii, in.data(), 1, &op, p.data(), status.data(), nullptr, nullptr);
            for (size_t k = 0; k < n; ++k) in[4 * k] = p[k];
        }
    }
};

// A block at the spec, the points, and the indices of the four inputs and eleven outputs.
struct Study {
    Block blk;
    Points pts;
    int32_t ii[4], oi[kOutputCount];
    Study(size_t n, const char* spec, const char* drive)
        : blk(spec), pts(n, std::string(spec) == "power" ? &blk : nullptr),
          ii{blk.idx(drive), blk.idx("in.temperature"), blk.idx("in.pressure_cathode"), blk.idx("in.pressure_anode")} {
        for (int o = 0; o < kOutputCount; ++o) oi[o] = blk.idx(kOutputs[o]);
    }
};

void run_batch(benchmark::State& state, const char* spec, const char* drive) {
    Study study(static_cast<size_t>(state.range(0)), spec, drive);
    Block& blk = study.blk;
    Points& pts = study.pts;
    const int32_t* ii = study.ii;
    const int32_t* oi = study.oi;
    for (auto _ : state) {
        const int32_t rc = ely_block_solve_batch(blk.b, pts.n, 4, ii, pts.in.data(), kOutputCount, oi, pts.out.data(),
                                                 pts.status.data(), nullptr, nullptr);
        if (rc < 0 || rc == ELY_PARTIAL) state.SkipWithError(ely_last_error());
        benchmark::DoNotOptimize(pts.out.data());
    }
    state.SetItemsProcessed(static_cast<int64_t>(state.iterations()) * static_cast<int64_t>(pts.n));
}

// The same points through ely_block_solve_batch_columns (inputs and outputs as columns, as numpy keeps them).
void run_columns(benchmark::State& state, const char* spec, const char* drive) {
    Study study(static_cast<size_t>(state.range(0)), spec, drive);
    Block& blk = study.blk;
    Points& pts = study.pts;
    const int32_t* ii = study.ii;
    const int32_t* oi = study.oi;
    std::vector<std::vector<double>> in(4, std::vector<double>(pts.n)), out(kOutputCount, std::vector<double>(pts.n));
    for (size_t k = 0; k < pts.n; ++k)
        for (size_t c = 0; c < 4; ++c) in[c][k] = pts.in[4 * k + c];
    const double* in_ptr[4] = {in[0].data(), in[1].data(), in[2].data(), in[3].data()};
    double* out_ptr[kOutputCount];
    for (int o = 0; o < kOutputCount; ++o) out_ptr[o] = out[static_cast<size_t>(o)].data();
    for (auto _ : state) {
        const int32_t rc = ely_block_solve_batch_columns(blk.b, pts.n, 4, ii, in_ptr, kOutputCount, oi, out_ptr,
                                                         pts.status.data(), nullptr, nullptr);
        if (rc < 0 || rc == ELY_PARTIAL) state.SkipWithError(ely_last_error());
        benchmark::DoNotOptimize(out_ptr[0]);
    }
    state.SetItemsProcessed(static_cast<int64_t>(state.iterations()) * static_cast<int64_t>(pts.n));
}
}  // namespace

static void batch_peer_points_current_density_columns(benchmark::State& state) {
    run_columns(state, "current_density", "in.current_density");
}
BENCHMARK(batch_peer_points_current_density_columns)->Arg(4096)->Arg(100000)->Unit(benchmark::kMillisecond);

static void batch_peer_points_power_columns(benchmark::State& state) { run_columns(state, "power", "in.power"); }
BENCHMARK(batch_peer_points_power_columns)->Arg(4096)->Arg(100000)->Unit(benchmark::kMillisecond);

static void batch_peer_points_current_density(benchmark::State& state) {
    run_batch(state, "current_density", "in.current_density");
}
BENCHMARK(batch_peer_points_current_density)->Arg(4096)->Arg(100000)->Unit(benchmark::kMillisecond);

static void batch_peer_points_power(benchmark::State& state) { run_batch(state, "power", "in.power"); }
BENCHMARK(batch_peer_points_power)->Arg(4096)->Arg(100000)->Unit(benchmark::kMillisecond);

// One point per call through the C interface, the temperature changing at every call (as a
// co-simulation step or a host's own loop would set it): set + solve + get. The drive input moves
// by `step` (added for the current density, a factor for the power) between `lo` and `hi`.
static void single_solve(benchmark::State& state, const char* spec, const char* drive, double lo, double hi,
                         double step, bool factor) {
    Block blk(spec);
    const int32_t id = blk.idx(drive), it = blk.idx("in.temperature"), iv = blk.idx("cell.voltage");
    double x = lo, t = 333.15, v = 0;
    for (auto _ : state) {
        ely_block_set(blk.b, id, x);
        ely_block_set(blk.b, it, t);
        ely_block_solve(blk.b);
        ely_block_get(blk.b, iv, &v);
        benchmark::DoNotOptimize(v);
        x = x < hi ? (factor ? x * step : x + step) : lo;
        t = t < 353.15 ? t + 0.0137 : 333.15;
    }
}

static void single_solve_temperature_changing(benchmark::State& state) {
    single_solve(state, "current_density", "in.current_density", 1000.0, 25000.0, 1.0, false);
}
BENCHMARK(single_solve_temperature_changing);

static void single_power_solve_temperature_changing(benchmark::State& state) {
    single_solve(state, "power", "in.power", 40e3, 400e3, 1.013, true);
}
BENCHMARK(single_power_solve_temperature_changing);
