// One cell evaluation per technology at its default parameters: the inner loop of every
// spec solve and batch. Run by hand: build/tests/benchmarks/bench_cells.
#include <benchmark/benchmark.h>

#include "cells/cell.hpp"
#include "cells/custom.hpp"
#include "cells/registry.hpp"

namespace {
void evaluate(benchmark::State& state, const char* name, double t, double j_lo, double j_hi, double p) {
    const auto& technology = ely::technology(name);
    const auto cell = ely::make_cell(technology, ely::ParameterValues(ely::cell_parameters(technology)));
    double j = j_lo;
    for (auto _ : state) {
        benchmark::DoNotOptimize(cell->evaluate({j, t, p, p}).voltage);
        j = j < j_hi ? j * 1.001 : j_lo;
    }
}
}  // namespace

BENCHMARK_CAPTURE(evaluate, pem, "pem", 353.15, 2000.0, 30000.0, 3e5);
BENCHMARK_CAPTURE(evaluate, alkaline, "alkaline", 353.15, 1000.0, 8000.0, 3e5);
BENCHMARK_CAPTURE(evaluate, solid_oxide, "solid_oxide", 1073.15, 1000.0, 15000.0, 1.2e5);
BENCHMARK_CAPTURE(evaluate, brine, "brine", 358.15, 1000.0, 6000.0, 1.2e5);

static void evaluate_custom_zinc(benchmark::State& state) {
    // Two competing cathode reactions (zinc deposition, hydrogen evolution): CRC potentials,
    // invented kinetics (demo numbers), evaluated at the 298.15 K their exchange current densities refer to.
    ely::CustomCellSpec spec;
    ely::HalfReaction o2{"oxygen evolution", "O2", 4, 1.229};
    o2.kinetics.exchange_current_density = 1e-4;
    ely::HalfReaction zn{"zinc deposition", "Zn", 2, -0.7618};
    zn.reactant_activity = 0.1;
    zn.kinetics.exchange_current_density = 20.0;
    zn.limiting_current_density = 1500.0;
    ely::HalfReaction h2{"hydrogen evolution", "H2", 2, 0.0};
    h2.kinetics.exchange_current_density = 3e-7;
    spec.anode = {o2};
    spec.cathode = {zn, h2};
    spec.area_specific_resistance = 5e-5;
    spec.thermoneutral_voltage = 2.279;  // Zn2+ + H2O -> Zn + O2/2 + 2 H+, NBS enthalpies (no species given here)
    const auto cell = ely::make_custom_cell(spec);
    double j = 100.0;
    for (auto _ : state) {
        benchmark::DoNotOptimize(cell->evaluate({j, 298.15, 1e5, 1e5}).voltage);
        j = j < 1200.0 ? j * 1.001 : 100.0;
    }
}
BENCHMARK(evaluate_custom_zinc);
