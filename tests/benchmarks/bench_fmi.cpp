// The FMUs (adapters/fmi) as an importer drives them: one doStep of 1 s on the demo plant (the
// real-time factor is the "sim_s_per_s" counter: simulated seconds per second of computing), and a
// day at 1-s steps with the current density moving. Run by hand: build/tests/benchmarks/bench_fmi.
// Never timed by a test. Loads the build's FMU binaries (ELY_FMU_DIR) with the demo plant as resource.
#include <benchmark/benchmark.h>
#include <dlfcn.h>
#include <unistd.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <memory>
#include <stdexcept>
#include <string>

#include <elyblock/elyblock.h>

#include "fmi2_api.h"
#include "fmi3_api.h"
#include "variables.hpp"

namespace {

namespace fs = std::filesystem;

std::string read(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    return std::string(std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>());
}

// resources/plant.json of the demo plant in a scratch folder, as an FMU unpacked there would have it.
const std::string& resource_dir() {
    static const std::string dir = [] {
        const fs::path root = fs::temp_directory_path() / ("elyblock-bench-fmi-" + std::to_string(::getpid()));
        fs::create_directories(root / "resources");
        fs::copy_file(ELY_SOURCE_DIR "/examples/demo-plant.json", root / "resources" / "plant.json",
                      fs::copy_options::overwrite_existing);
        return (root / "resources").string();
    }();
    return dir;
}

template <class T>
T* symbol(void* lib, const char* name) {
    void* f = dlsym(lib, name);
    if (!f) throw std::runtime_error(name);
    return reinterpret_cast<T*>(f);
}

// One FMU instance of FMI version 2 or 3, initialised at t = 0, with the demo plant's inputs.
struct Fmu {
    int version;
    void* lib = nullptr;
    void* instance = nullptr;
    double time = 0;
    unsigned vr_j = elyfmi::value_reference("in.current_density");
    unsigned vr_v = elyfmi::value_reference("cell.voltage");

    explicit Fmu(int v) : version(v) {
        const std::string binary = std::string(ELY_FMU_DIR) + "/elyblock-fmi" + std::to_string(v) + ".so";
        lib = dlopen(binary.c_str(), RTLD_NOW | RTLD_LOCAL);
        if (!lib) throw std::runtime_error(dlerror());
        const std::string token = elyfmi::instantiation_token(read(resource_dir() + "/plant.json"), v);
        if (v == 2) {
            static fmi2CallbackFunctions callbacks = {nullptr, nullptr, nullptr, nullptr, nullptr};
            const std::string uri = "file://" + resource_dir();
            instance = symbol<decltype(fmi2Instantiate)>(lib, "fmi2Instantiate")("bench", fmi2CoSimulation, token.c_str(),
                                                                                uri.c_str(), &callbacks, 0, 0);
            symbol<decltype(fmi2SetupExperiment)>(lib, "fmi2SetupExperiment")(instance, 0, 0, 0, 0, 0);
            symbol<decltype(fmi2EnterInitializationMode)>(lib, "fmi2EnterInitializationMode")(instance);
            symbol<decltype(fmi2ExitInitializationMode)>(lib, "fmi2ExitInitializationMode")(instance);
        } else {
            instance = symbol<decltype(fmi3InstantiateCoSimulation)>(lib, "fmi3InstantiateCoSimulation")(
                "bench", token.c_str(), (resource_dir() + "/").c_str(), false, false, false, false, nullptr, 0, nullptr,
                nullptr, nullptr);
            symbol<decltype(fmi3EnterInitializationMode)>(lib, "fmi3EnterInitializationMode")(instance, false, 0, 0,
                                                                                             false, 0);
            symbol<decltype(fmi3ExitInitializationMode)>(lib, "fmi3ExitInitializationMode")(instance);
        }
        if (!instance) throw std::runtime_error("instantiation failed");
    }
    ~Fmu() {
        if (version == 2)
            symbol<decltype(fmi2FreeInstance)>(lib, "fmi2FreeInstance")(instance);
        else
            symbol<decltype(fmi3FreeInstance)>(lib, "fmi3FreeInstance")(instance);
        dlclose(lib);
    }
    int step(double h) {
        int s;
        if (version == 2) {
            static auto* f = symbol<decltype(fmi2DoStep)>(lib, "fmi2DoStep");
            s = f(instance, time, h, fmi2True);
        } else {
            static auto* f = symbol<decltype(fmi3DoStep)>(lib, "fmi3DoStep");
            bool e, t, r;
            double last;
            s = f(instance, time, h, true, &e, &t, &r, &last);
        }
        time += h;
        return s;
    }
    void set_current_density(double j) {
        if (version == 2)
            symbol<decltype(fmi2SetReal)>(lib, "fmi2SetReal")(instance, &vr_j, 1, &j);
        else
            symbol<decltype(fmi3SetFloat64)>(lib, "fmi3SetFloat64")(instance, &vr_j, 1, &j, 1);
    }
    double voltage() {
        double v = 0;
        if (version == 2)
            symbol<decltype(fmi2GetReal)>(lib, "fmi2GetReal")(instance, &vr_v, 1, &v);
        else
            symbol<decltype(fmi3GetFloat64)>(lib, "fmi3GetFloat64")(instance, &vr_v, 1, &v, 1);
        return v;
    }
};

// One doStep of 1 s at constant inputs, then reading the cell voltage, as a master does each step.
void BM_DoStep1s(benchmark::State& state) {
    Fmu fmu(static_cast<int>(state.range(0)));
    for (int k = 0; k < 100; ++k) fmu.step(1.0);  // past the start-up transient
    for (auto _ : state) {
        if (fmu.step(1.0) != 0) state.SkipWithError("doStep failed");
        benchmark::DoNotOptimize(fmu.voltage());
    }
    state.counters["sim_s_per_s"] = benchmark::Counter(static_cast<double>(state.iterations()), benchmark::Counter::kIsRate);
}
BENCHMARK(BM_DoStep1s)->Arg(2)->Arg(3)->Unit(benchmark::kMicrosecond);

// A day at 1-s steps: the current density set every step, following a load that moves between 40 %
// and 100 % of rated over the day (invented profile), the voltage read every step.
void BM_Day1s(benchmark::State& state) {
    for (auto _ : state) {
        state.PauseTiming();
        auto fmu = std::make_unique<Fmu>(static_cast<int>(state.range(0)));
        state.ResumeTiming();
        for (int k = 0; k < 86400; ++k) {
            fmu->set_current_density(25000.0 * (0.7 + 0.3 * std::sin(2 * M_PI * k / 86400.0)));
            if (fmu->step(1.0) != 0) state.SkipWithError("doStep failed");
            benchmark::DoNotOptimize(fmu->voltage());
        }
        state.PauseTiming();
        fmu.reset();
        state.ResumeTiming();
    }
    state.counters["sim_s_per_s"] =
        benchmark::Counter(86400.0 * static_cast<double>(state.iterations()), benchmark::Counter::kIsRate);
}
BENCHMARK(BM_Day1s)->Arg(2)->Arg(3)->Unit(benchmark::kMillisecond)->Iterations(3);

// The same day through the library's own calls (ely_block_set, ely_block_advance, ely_block_get):
// what the model costs without the FMI glue.
void BM_Day1sLibrary(benchmark::State& state) {
    const std::string plant = read(resource_dir() + "/plant.json");
    for (auto _ : state) {
        state.PauseTiming();
        ely_block* b = nullptr;
        ely_block_create(plant.c_str(), &b);
        int32_t j = -1, v = -1;
        ely_block_find(b, "in.current_density", &j);
        ely_block_find(b, "cell.voltage", &v);
        ely_block_reset(b, 0);
        state.ResumeTiming();
        for (int k = 0; k < 86400; ++k) {
            ely_block_set(b, j, 25000.0 * (0.7 + 0.3 * std::sin(2 * M_PI * k / 86400.0)));
            if (ely_block_advance(b, 1.0) < 0) state.SkipWithError("advance failed");
            double voltage = 0;
            ely_block_get(b, v, &voltage);
            benchmark::DoNotOptimize(voltage);
        }
        state.PauseTiming();
        ely_block_destroy(b);
        state.ResumeTiming();
    }
    state.counters["sim_s_per_s"] =
        benchmark::Counter(86400.0 * static_cast<double>(state.iterations()), benchmark::Counter::kIsRate);
}
BENCHMARK(BM_Day1sLibrary)->Unit(benchmark::kMillisecond)->Iterations(3);

}  // namespace
