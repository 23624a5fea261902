// Calibration through the C interface (ely_block_fit): six cell parameters fitted to a
// 100-point polarization data set at four temperatures (target: at most 50 ms per fit), and
// three parameters to a 20-point curve. Run by hand: build/tests/benchmarks/bench_calibration.
// Never timed by a test.
#include <benchmark/benchmark.h>
#include <elyblock/elyblock.h>

#include <cmath>
#include <cstdint>
#include <random>
#include <string>
#include <vector>

namespace {

const char* const kPem = R"({"technology":"pem","stack":{"cells":100,"active_area":0.1},)"
                         R"("cell":{"cathode_exchange_current_density":30,"h2_recombination_fraction_anode":0.9},)"
                         R"("operating":{"spec":"current_density","temperature":353.15}})";

struct Data {
    ely_block* truth = nullptr;
    std::vector<int32_t> inputs, measured;
    std::vector<double> input_values, voltages;
    size_t points = 0;

    Data(std::size_t per_temperature, const std::vector<double>& temperatures) {
        ely_block_create(kPem, &truth);
        inputs = {index("in.current_density"), index("in.temperature")};
        measured = {index("cell.voltage")};
        for (double t : temperatures)
            for (std::size_t k = 0; k < per_temperature; ++k)
                input_values.insert(input_values.end(),
                                    {5000.0 + 15000.0 * static_cast<double>(k) / static_cast<double>(per_temperature - 1), t});
        points = input_values.size() / 2;
        voltages.resize(points);
        std::vector<int32_t> status(points);
        ely_block_solve_batch(truth, points, 2, inputs.data(), input_values.data(), 1, measured.data(), voltages.data(),
                              status.data(), nullptr, nullptr);
        std::mt19937_64 engine(11);
        std::normal_distribution<double> noise(0.0, 0.002);  // 2 mV, a typical test-bench scatter (invented for the benchmark)
        for (double& v : voltages) v += noise(engine);
    }
    ~Data() { ely_block_destroy(truth); }
    int32_t index(const char* name) const {
        int32_t i = -1;
        ely_block_find(truth, name, &i);
        return i;
    }

    /// A copy of the true block with the free parameters 10 % off.
    ely_block* start(const std::vector<const char*>& names) const {
        ely_block* b = nullptr;
        ely_block_clone(truth, &b);
        for (const char* name : names) {
            const int32_t i = index((std::string("param.cell.") + name).c_str());
            double v = 0;
            ely_block_get(b, i, &v);
            ely_block_set(b, i, 1.1 * v);
        }
        return b;
    }
};

void run(benchmark::State& state, const Data& d, const std::vector<const char*>& names) {
    int64_t iterations = 0;
    for (auto _ : state) {
        state.PauseTiming();
        ely_block* b = d.start(names);
        state.ResumeTiming();
        ely_fit* fit = nullptr;
        const int32_t s = ely_block_fit(b, d.points, 2, d.inputs.data(), d.input_values.data(), 1, d.measured.data(),
                                        d.voltages.data(), nullptr, static_cast<int32_t>(names.size()), names.data(),
                                        nullptr, nullptr, nullptr, &fit);
        if (s < 0) state.SkipWithError(ely_last_error());
        state.PauseTiming();
        ely_fit_destroy(fit);
        ely_block_destroy(b);
        state.ResumeTiming();
        ++iterations;
    }
    state.counters["points"] = static_cast<double>(d.points);
}

}  // namespace

static void fit_six_parameters_100_points(benchmark::State& state) {
    const Data d(25, {323.15, 338.15, 353.15, 363.15});
    run(state, d,
        {"anode_exchange_current_density", "anode_transfer_coefficient_forward", "anode_activation_energy",
         "contact_resistance", "membrane_water_content", "cathode_exchange_current_density"});
}
BENCHMARK(fit_six_parameters_100_points)->Unit(benchmark::kMillisecond);

static void fit_three_parameters_20_points(benchmark::State& state) {
    const Data d(20, {353.15});
    run(state, d, {"anode_exchange_current_density", "anode_transfer_coefficient_forward", "contact_resistance"});
}
BENCHMARK(fit_three_parameters_20_points)->Unit(benchmark::kMillisecond);
