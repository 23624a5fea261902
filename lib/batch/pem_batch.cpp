// The vectorized PEM batch: reads the block once, hands chunks of points to the kernel of the widest
// instruction set this machine has, and scatters the results into the caller's rows.
#include "batch/pem_batch.hpp"

#include <algorithm>
#include <iterator>
#include <cmath>
#include <cstring>
#include <limits>

#include "base/error.hpp"
#include "cells/cell.hpp"
#include "thermo/constants.hpp"
#include "thermo/water.hpp"
#include "unit/block.hpp"

namespace ely::batch {
namespace {

struct Isa {
    const char* name;
    PemKernel kernel;
    bool (*available)();
};

bool always() { return true; }
#if defined(ELY_BATCH_WIDE)
bool has_avx2() { return __builtin_cpu_supports("avx2") && __builtin_cpu_supports("fma"); }
bool has_avx512() { return __builtin_cpu_supports("avx512f") && __builtin_cpu_supports("avx2"); }
#endif

const Isa kIsas[] = {
#if defined(ELY_BATCH_WIDE)
    {"avx512", pem_kernel_avx512, has_avx512},
    {"avx2", pem_kernel_avx2, has_avx2},
#endif
    {"sse2", pem_kernel_sse2, always},
};

// Outputs of the table that the kernel does not give (a cell built from a reaction table only).
// The outputs the kernel writes (every put() of pem_kernel.hpp): an allow-list, so that an output
// added to the table later (the plant in time added a dozen) goes to the scalar path until the
// kernel computes it.
constexpr Var kKernelOutputs[] = {
    cell_voltage, cell_reversible_voltage, cell_thermoneutral_voltage, cell_activation_anode,
    cell_activation_cathode, cell_ohmic, cell_concentration, cell_degradation, cell_current_density,
    cell_faraday_efficiency, cell_caustic_efficiency, cell_chlorine_efficiency, stack_current,
    stack_voltage, stack_power, plant_rectifier_loss, plant_rectifier_efficiency,
    plant_auxiliary_power, plant_power, product_hydrogen, product_oxygen, product_chlorine,
    product_caustic, product_caustic_solution, feed_water, feed_salt, feed_hydrogen, feed_sweep_air,
    stream_cathode_mass_flow, stream_cathode_temperature, stream_cathode_pressure,
    stream_cathode_x_h2, stream_cathode_x_o2, stream_cathode_x_h2o, stream_anode_mass_flow,
    stream_anode_temperature, stream_anode_pressure, stream_anode_x_o2, stream_anode_x_h2,
    stream_anode_x_cl2, stream_anode_x_h2o, stream_anode_x_n2, stream_condensate_mass_flow,
    stream_drain_mass_flow, stream_dryer_loss_mass_flow, gas_h2_in_o2, gas_o2_in_h2, gas_o2_in_cl2,
    heat_loss, heat_duty, heat_gas_coolers, heat_feed_heating, perf_specific_energy,
    perf_specific_energy_plant, perf_efficiency_hhv, perf_efficiency_lhv, perf_water_per_hydrogen,
    perf_specific_energy_chlorine, perf_load_fraction, perf_specific_energy_caustic,
    perf_salt_per_chlorine, perf_water_per_chlorine, perf_salt_per_caustic, perf_water_per_caustic,
    alarm_h2_in_o2_warning, alarm_h2_in_o2_trip, alarm_temperature_high, alarm_current_density_high,
    alarm_load_low, alarm_extrapolated, alarm_any};

bool kernel_gives(Var v) {
    return std::find(std::begin(kKernelOutputs), std::end(kKernelOutputs), v) != std::end(kKernelOutputs);
}

}  // namespace

std::string PemBatch::alarm_message(unsigned alarm_bits) {
    // As Block::alarm_message (unit/alarms.cpp): the labels of the alarms raised, the trip level
    // instead of the warning level.
    std::string m = "solved with alarms:";
    const char* separator = " ";
    for (int a = alarm_first; a <= alarm_last; ++a) {
        if (!(alarm_bits & (1u << (a - alarm_first)))) continue;
        if (a == alarm_h2_in_o2_warning && (alarm_bits & (1u << (alarm_h2_in_o2_trip - alarm_first)))) continue;
        m += separator;
        m += variable_info(static_cast<Var>(a)).label;
        separator = "; ";
    }
    return m;
}

std::vector<const char*> instruction_sets() {
    std::vector<const char*> names;
    for (const Isa& isa : kIsas)
        if (isa.available()) names.push_back(isa.name);
    return names;
}

PemBatch::PemBatch(const Block& block, int32_t n_inputs, const int32_t* input_indices, int32_t n_outputs,
                   const int32_t* output_indices, const char* isa) {
    if (std::strcmp(block.technology().name, "pem") != 0) return;
    switch (block.spec()) {
        case Spec::current_density: spec_ = 0; break;
        case Spec::power: spec_ = 1; break;
        case Spec::voltage: spec_ = 2; break;
        default: return;
    }
    if (block.design().custom || !block.cell().own_outputs().empty()) return;
    const ParameterValues* values = block.cell_parameter_values();
    if (!values) return;
    n_inputs_ = n_inputs;
    n_outputs_ = n_outputs;

    // Rows: the four per-point inputs of the kernel, each at most once.
    const Var per_point[4] = {spec_info(block.spec()).drive, in_temperature, in_pressure_cathode, in_pressure_anode};
    for (int32_t i = 0; i < n_inputs; ++i) {
        const int32_t v = block.table_variable(input_indices[i]);
        const auto* it = std::find(per_point, per_point + 4, static_cast<Var>(v));
        if (v < 0 || it == per_point + 4 || column_[it - per_point] >= 0) return;
        column_[it - per_point] = static_cast<int>(i);
        const VariableInfo& info = block.variable(input_indices[i]);
        limits_.push_back({info.min, info.max, info.min_exclusive});
    }
    for (int c = 0; c < 4; ++c) fixed_[c] = block.value(per_point[c]);

    // Outputs: the kernel's (one slot per variable), a row's input, or a value fixed for the batch.
    for (int32_t o = 0; o < n_outputs; ++o) {
        const int32_t v = block.table_variable(output_indices[o]);
        if (v < 0) return;
        const Var var = static_cast<Var>(v);
        const VariableInfo& info = variable_info(var);
        if (info.causality == Causality::output) {
            if (!kernel_gives(var)) return;
            const auto it = std::find(slot_var_.begin(), slot_var_.end(), var);
            const int slot = static_cast<int>(it - slot_var_.begin());
            if (it == slot_var_.end()) slot_var_.push_back(var);
            sources_.push_back({0, slot, 0.0});
        } else {
            const auto* it = std::find(per_point, per_point + 4, var);
            if (it != per_point + 4 && column_[it - per_point] >= 0) sources_.push_back({1, column_[it - per_point], 0.0});
            else sources_.push_back({2, 0, block.value(var)});
        }
    }

    // The cell (cells/pem/pem.cpp): closed-form Butler-Volmer only.
    const auto get = [&](const char* key) { return values->get(key); };
    if (get("kinetics_model") != 0.0) return;
    if (get("anode_transfer_coefficient_forward") != get("anode_transfer_coefficient_backward")) return;
    if (get("cathode_transfer_coefficient_forward") != get("cathode_transfer_coefficient_backward")) return;
    const double reference_temperature = 353.15;  // pem.cpp kReferenceTemperature
    const double sigma_303 = 0.005139 * get("membrane_water_content") - 0.00326;  // Springer et al. 1991, eq. 25
    if (!(sigma_303 > 0.0)) return;
    PemConstants& k = k_;
    k.thickness = get("membrane_thickness");
    k.contact_resistance = get("contact_resistance");
    k.sigma_303_percent = 100.0 * sigma_303;
    k.j0_anode = get("anode_exchange_current_density");
    k.ea_anode = -get("anode_activation_energy") / kGasConstant;
    k.alpha_anode = get("anode_transfer_coefficient_forward");
    k.j0_cathode = get("cathode_exchange_current_density");
    k.ea_cathode = -get("cathode_activation_energy") / kGasConstant;
    k.alpha_cathode = get("cathode_transfer_coefficient_forward");
    k.inverse_reference_temperature = 1.0 / reference_temperature;
    k.limiting_current_density = get("limiting_current_density");
    k.h2_permeability = get("h2_permeability");
    k.h2_ea = -get("h2_permeability_activation_energy") / kGasConstant;
    k.o2_permeability = get("o2_permeability");
    k.o2_ea = -get("o2_permeability_activation_energy") / kGasConstant;
    k.darcy = get("h2_darcy_coefficient");
    k.supersaturation = get("h2_supersaturation_coefficient");
    k.recombination_cathode = get("o2_recombination_fraction");
    k.recombination_anode = get("h2_recombination_fraction_anode");
    k.drag = get("electroosmotic_drag");
    const Envelope& e = block.cell().envelope();
    k.t_min = e.temperature_min;
    k.t_max = e.temperature_max;
    k.p_min = e.pressure_min;
    k.p_max = e.pressure_max;
    k.j_max = e.current_density_max;
    k.t_fit_min = e.temperature_fit_min;
    k.t_fit_max = e.temperature_fit_max;
    const double j_plant = block.value(par_current_density_max);  // Block::max_current_density
    k.j_spec_max = std::min(j_plant, block.cell().current_density_limit({j_plant, fixed_[1], fixed_[3], fixed_[2]}));

    // The plant.
    const PlantDesign& design = block.design();
    k.cells = static_cast<double>(design.cells());
    k.stacks = static_cast<double>(design.stacks());
    k.area = design.active_area();
    k.hours = block.value(in_hours_operated);
    k.degradation_voltage = block.value(par_degradation_voltage_rate);
    k.degradation_resistance = block.value(par_degradation_resistance_rate);
    k.feed_temperature = block.value(in_feed_temperature);
    k.gas_cooler_temperature = block.value(par_gas_cooler_temperature);
    k.ambient_temperature = block.value(in_ambient_temperature);
    k.heat_loss_coefficient = block.value(par_heat_loss_coefficient);
    k.drag_returned = design.drag_water_returned;
    k.rectifier_rated_power = block.rectifier_rated_power();
    k.rectifier_no_load = block.value(par_rectifier_loss_no_load);
    k.rectifier_linear = block.value(par_rectifier_loss_linear);
    k.rectifier_quadratic = block.value(par_rectifier_loss_quadratic);
    k.auxiliaries_fixed = block.value(par_auxiliaries_fixed);
    k.auxiliaries_proportional = block.value(par_auxiliaries_proportional);
    k.h2_in_o2_warning = block.value(par_alarms_h2_in_o2_warning);
    k.h2_in_o2_trip = block.value(par_alarms_h2_in_o2_trip);
    k.temperature_max = block.value(par_temperature_max);
    k.rated_current_density = block.value(par_rated_current_density);
    k.min_load_fraction = block.value(par_min_load_fraction);
    // Make-up water as liquid (streams.cpp feed_water_enthalpy) at a temperature IF97 region 1 covers.
    if (!(k.feed_temperature >= 273.15 && k.feed_temperature <= 623.15)) return;
    try {
        k.thermo = water_thermo_data();
        k.feed_saturation_pressure = water_saturation_pressure(k.feed_temperature);
    } catch (const Error&) {
        return;
    }

    for (const Isa& candidate : kIsas) {
        if (!candidate.available() || (isa && std::strcmp(isa, candidate.name) != 0)) continue;
        kernel_ = candidate.kernel;
        isa_ = candidate.name;
        break;
    }
    for (Var v : slot_var_) {
        energy_ |= v == heat_duty || v == heat_gas_coolers || v == perf_efficiency_hhv || v == perf_efficiency_lhv;
        streams_ |= v == feed_water || v == perf_water_per_hydrogen || (v >= stream_cathode_mass_flow && v <= stream_dryer_loss_mass_flow);
    }
    for (int c = 0; c < 4; ++c)
        if (column_[c] >= 0) {
            const Limit& l = limits_[static_cast<std::size_t>(column_[c])];
            input_limits_[c] = {true, l.min_exclusive, l.min, l.max};
        }
    for (std::size_t o = 0; o < sources_.size(); ++o) {
        const Source& s = sources_[o];
        if (s.kind == 0) {
            from_kernel_.push_back({o, (5 + static_cast<std::size_t>(s.index)) * kStride});
            if (slot_column_.size() <= static_cast<std::size_t>(s.index)) slot_column_.push_back(o);  // its first column
        }
        else if (s.kind == 1) from_row_.push_back({o, static_cast<std::size_t>(s.index)});
        else fixed_outputs_.push_back({o, s.constant});
    }
    work_.assign(kStride * (5 + slot_var_.size()), 0.0);
}

PemChunk PemBatch::chunk_of(std::size_t count) {
    PemChunk chunk{};
    chunk.spec = spec_;
    chunk.energy = energy_;
    chunk.streams = streams_;
    for (int c = 0; c < 4; ++c) chunk.limits[c] = input_limits_[c];
    chunk.verdict = work_.data() + 4 * kStride;
    chunk.count = (count + 7) / 8 * 8;  // whole vectors (the lanes past count repeat the last point)
    return chunk;
}

void PemBatch::run(const double* inputs, std::size_t first, std::size_t count, double* outputs, uint8_t* verdict) {
    // Columns kStride doubles apart: a multiple of the vector width, but not of 4 KiB, so that the
    // sixteen-odd columns do not all fall on the same L1 cache sets.
    constexpr std::size_t n = kStride;
    double* col[4] = {work_.data(), work_.data() + n, work_.data() + 2 * n, work_.data() + 3 * n};
    const double* verdicts = work_.data() + 4 * n;
    PemChunk chunk = chunk_of(count);
    chunk.target = col[0];
    chunk.current_density = col[0];
    chunk.temperature = col[1];
    chunk.pressure_cathode = col[2];
    chunk.pressure_anode = col[3];
    for (std::size_t s = 0; s < slot_var_.size(); ++s) chunk.out[slot_var_[s]] = work_.data() + (5 + s) * n;

    // Rows to columns (the kernel sends an input outside its limits to the scalar path).
    const auto ni = static_cast<std::size_t>(n_inputs_);
    const double* rows = inputs + first * ni;
    for (int c = 0; c < 4; ++c) {
        double* dst = col[c];
        if (column_[c] < 0) {
            std::fill(dst, dst + chunk.count, fixed_[c]);
            continue;
        }
        const double* src = rows + column_[c];
        for (std::size_t r = 0; r < count; ++r) dst[r] = src[r * ni];
        for (std::size_t r = count; r < chunk.count; ++r) dst[r] = dst[count - 1];
    }

    kernel_(k_, chunk);

    for (std::size_t r = 0; r < count; ++r) verdict[r] = static_cast<uint8_t>(verdicts[r]);
    const auto no = static_cast<std::size_t>(n_outputs_);
    if (no == 0 || !outputs) return;
    // Every row's outputs are written; those of the points not taken are overwritten by the scalar path.
    double* out_rows = outputs + first * no;
    for (std::size_t r = 0; r < count; ++r) {
        double* out = out_rows + r * no;
        const double* in = rows + r * ni;
        for (const Copy& cp : from_kernel_) out[cp.output] = work_[cp.offset + r];
        for (const Copy& cp : from_row_) out[cp.output] = in[cp.offset];
        for (const Fixed& f : fixed_outputs_) out[f.output] = f.value;
    }
}

void PemBatch::run_columns(const double* const* inputs, std::size_t first, std::size_t count, double* const* outputs,
                           uint8_t* verdict) {
    constexpr std::size_t n = kStride;
    double* col[4] = {work_.data(), work_.data() + n, work_.data() + 2 * n, work_.data() + 3 * n};
    const double* verdicts = work_.data() + 4 * n;
    PemChunk chunk = chunk_of(count);
    // Whole vectors straight from and into the caller's columns; a last part chunk through the workspace
    // (the kernel reads and writes whole vectors).
    const bool direct = chunk.count == count;
    const double* in[4];
    for (int c = 0; c < 4; ++c) {
        if (column_[c] < 0) {
            std::fill(col[c], col[c] + chunk.count, fixed_[c]);
            in[c] = col[c];
        } else if (direct) {
            in[c] = inputs[column_[c]] + first;
        } else {
            const double* src = inputs[column_[c]] + first;
            std::copy(src, src + count, col[c]);
            std::fill(col[c] + count, col[c] + chunk.count, src[count - 1]);
            in[c] = col[c];
        }
    }
    chunk.target = in[0];
    chunk.current_density = in[0];
    chunk.temperature = in[1];
    chunk.pressure_cathode = in[2];
    chunk.pressure_anode = in[3];
    for (std::size_t s = 0; s < slot_var_.size(); ++s)
        chunk.out[slot_var_[s]] = direct ? outputs[slot_column_[s]] + first : work_.data() + (5 + s) * n;

    kernel_(k_, chunk);  // an input outside its limits (Block::set) goes to the scalar path

    for (std::size_t r = 0; r < count; ++r) verdict[r] = static_cast<uint8_t>(verdicts[r]);
    // Every point's outputs are written; those of the points not taken are overwritten by the scalar path.
    if (!direct)
        for (std::size_t s = 0; s < slot_var_.size(); ++s) {
            const double* src = work_.data() + (5 + s) * n;
            std::copy(src, src + count, outputs[slot_column_[s]] + first);
        }
    for (const Copy& cp : from_kernel_) {
        const std::size_t slot = (cp.offset / kStride) - 5;
        const double* src = outputs[slot_column_[slot]] + first;
        if (slot_column_[slot] != cp.output) std::copy(src, src + count, outputs[cp.output] + first);
    }
    for (const Copy& cp : from_row_) {
        const double* src = inputs[cp.offset] + first;
        std::copy(src, src + count, outputs[cp.output] + first);
    }
    for (const Fixed& f : fixed_outputs_) std::fill(outputs[f.output] + first, outputs[f.output] + first + count, f.value);
}

}  // namespace ely::batch
