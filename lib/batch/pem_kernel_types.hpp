#pragma once
// The plain data a vector kernel of the PEM batch takes and gives (no SIMD type here): the constants of
// the block at the start of the batch, one chunk of points in structure-of-arrays form, and where each
// output goes. Shared by pem_batch.cpp (which fills it) and the kernel translation units (kernel_*.cpp).
#include <cstddef>

#include "thermo/thermo_kernels.hpp"
#include "unit/variables.hpp"

namespace ely::batch {

/// Everything of the block that is the same for every point of the batch.
struct PemConstants {
    // Cell (cells/pem/pem.cpp): membrane, kinetics (closed-form Butler-Volmer), mass transport, crossover.
    double thickness, contact_resistance, sigma_303_percent;  // m, ohm m², 100·σ(303 K) of Springer, S/m
    double j0_anode, ea_anode, alpha_anode;                   // A/m², −E/R (K), transfer coefficient
    double j0_cathode, ea_cathode, alpha_cathode;
    double inverse_reference_temperature;  // 1/K
    double limiting_current_density;
    double h2_permeability, h2_ea, o2_permeability, o2_ea;  // mol/(m s Pa), −E/R (K)
    double darcy, supersaturation, recombination_cathode, recombination_anode, drag;
    // Envelope of the cell model.
    double t_min, t_max, p_min, p_max, j_max, t_fit_min, t_fit_max;
    double j_spec_max;  // A/m², the spec solves' upper end (Block::max_current_density)
    // Plant (variables of the block at the start of the batch).
    double cells, stacks, area, hours, degradation_voltage, degradation_resistance;
    double feed_temperature, gas_cooler_temperature, ambient_temperature, heat_loss_coefficient;
    bool drag_returned;
    double rectifier_rated_power, rectifier_no_load, rectifier_linear, rectifier_quadratic;
    double auxiliaries_fixed, auxiliaries_proportional;
    double h2_in_o2_warning, h2_in_o2_trip, temperature_max, rated_current_density, min_load_fraction;
    WaterThermoData thermo;
    double feed_saturation_pressure;  // Pa, at feed_temperature
};

/// The limits of a per-point input (its variable's: Block::set refuses a value outside them).
struct InputLimit {
    bool check;  // the input is per point (a column of the batch)
    bool min_exclusive;
    double min, max;
};

/// One chunk of points: inputs (padded to a whole number of lanes), the outputs wanted (out[v] null
/// when variable v is not asked for) and a verdict per point: 0 solved, 2 not taken (outside what the
/// kernel covers: the caller solves that point on the scalar path), 4 + b solved with alarms raised,
/// bit a of b for the alarm variable alarm_first + a.
struct PemChunk {
    int spec;     // 0 current density given, 1 stack power given, 2 cell voltage given
    bool energy;   // an output that needs the energy balance is asked for (heat duty, gas coolers, efficiencies)
    bool streams;  // an output that needs the water vapour of the streams is asked for (feed water, streams)
    InputLimit limits[4];  // of the drive value, temperature, cathode and anode pressure
    const double* target;  // spec 1, 2: the drive value per point
    const double* current_density;
    const double* temperature;
    const double* pressure_cathode;
    const double* pressure_anode;
    double* out[kVarCount];
    double* verdict;
    std::size_t count;  // a multiple of the widest lane count (8)
};

using PemKernel = void (*)(const PemConstants&, const PemChunk&);

// One per instruction set (kernel_*.cpp); pem_batch.cpp picks one at run time.
void pem_kernel_sse2(const PemConstants&, const PemChunk&);
void pem_kernel_avx2(const PemConstants&, const PemChunk&);
void pem_kernel_avx512(const PemConstants&, const PemChunk&);

}  // namespace ely::batch
