// Cost of the thermodynamic core that every solve calls: IF97 saturation, region 1,
// reversible voltage with Nernst terms.
#include <benchmark/benchmark.h>

#include "thermo/if97.hpp"
#include "thermo/reaction.hpp"

static void saturation_pressure(benchmark::State& state) {
    double t = 330.0;
    for (auto _ : state) {
        benchmark::DoNotOptimize(ely::if97::saturation_pressure(t));
        t = t < 360.0 ? t + 0.001 : 330.0;
    }
}
BENCHMARK(saturation_pressure);

static void liquid_region1(benchmark::State& state) {
    double t = 330.0;
    for (auto _ : state) {
        benchmark::DoNotOptimize(ely::if97::region1(t, 3.0e6));
        t = t < 360.0 ? t + 0.001 : 330.0;
    }
}
BENCHMARK(liquid_region1);

static void reversible_voltage_liquid(benchmark::State& state) {
    double t = 330.0;
    for (auto _ : state) {
        benchmark::DoNotOptimize(ely::reversible_voltage_liquid_water(t, 1.0e5, 3.0e6));
        t = t < 360.0 ? t + 0.001 : 330.0;
    }
}
BENCHMARK(reversible_voltage_liquid);
