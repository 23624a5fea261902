#include "unit/block.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <limits>

#include "base/check.hpp"
#include "base/excerpt.hpp"
#include "thermo/constants.hpp"
#include "thermo/reaction.hpp"
#include "thermo/species.hpp"
#include "thermo/water.hpp"
#include "unit/root.hpp"
#include "cells/custom.hpp"
#include "electrochem/electrolyte.hpp"

namespace ely {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// Heating values of hydrogen at 25 °C from the CODATA key values (ΔfH° of liquid water and
// steam), per kg of H2: HHV 141.78 MJ/kg, LHV 119.96 MJ/kg (REFERENCES.md, derived).
double hhv_per_kg() { return -kLiquidWaterFormationEnthalpy / molar_mass::H2; }
double lhv_per_kg() { return -kWaterVapourFormationEnthalpy / molar_mass::H2; }

bool is_drive_input(Var v) {
    return v == in_current_density || v == in_current || v == in_power || v == in_hydrogen_rate || v == in_voltage;
}

Var drive_input(Spec s) {
    switch (s) {
        case Spec::current_density: return in_current_density;
        case Spec::current: return in_current;
        case Spec::power: return in_power;
        case Spec::hydrogen_rate: return in_hydrogen_rate;
        case Spec::voltage: return in_voltage;
    }
    return in_current_density;
}
}  // namespace

// Everything the plant computes at one current density; outputs are filled from it.
struct Block::PointResult {
    CellResult cell;
    double degradation = 0;
    double temperature = 0, p_anode = 0, p_cathode = 0, feed_temperature = 0;
    // plant totals, mol/s
    double cells_total = 0;
    Fluxes cathode{}, anode{}, consumed{};
    double stack_current = 0, stack_voltage = 0, stack_power = 0;
};

Block::Block(PlantDesign design)
    : design_(std::move(design)), spec_(design_.operating.spec), last_good_spec_(design_.operating.spec) {
    if (!design_.cell) throw Error(ErrorKind::internal, "block created without a cell model");
    const uint32_t bit = tech_bit(design_.technology);
    for (int i = 0; i < kVarCount; ++i) {
        const auto v = static_cast<Var>(i);
        if (variable_info(v).technologies & bit) index_to_var_.push_back(v);
    }
    add_reaction_variables();
    v_.assign(kVarCount + (extra_ ? extra_->info.size() : 0), kNaN);
    const auto& op = design_.operating;
    v_[in_current_density] = op.current_density;
    v_[in_current] = op.current;
    v_[in_power] = op.power;
    v_[in_hydrogen_rate] = op.hydrogen_rate;
    v_[in_voltage] = op.voltage;
    v_[in_temperature] = op.temperature;
    v_[in_pressure_cathode] = op.pressure_cathode;
    v_[in_pressure_anode] = op.pressure_anode;
    v_[in_hours_operated] = op.hours_operated;
    v_[in_feed_temperature] = design_.thermal.feed_temperature;
    v_[par_cells] = design_.stack.cells;
    v_[par_stacks] = design_.stack.stacks;
    v_[par_active_area] = design_.stack.active_area;
    const auto& env = design_.cell->envelope();
    v_[par_current_density_max] =
        design_.limits.current_density_max > 0 ? design_.limits.current_density_max : env.current_density_max;

    // Rectifier sized to the DC power at the rated current density at the configured
    // operating temperature and pressures, unless a rating is given.
    rectifier_rated_power_ = design_.rectifier.rated_power;
    if (!(rectifier_rated_power_ > 0)) {
        const double j_max = max_current_density(op.temperature, op.pressure_anode, op.pressure_cathode);
        const auto r = design_.cell->evaluate({j_max, op.temperature, op.pressure_anode, op.pressure_cathode});
        rectifier_rated_power_ = r.voltage * j_max * design_.stack.active_area * design_.stack.cells * design_.stack.stacks;
    }
    last_good_ = v_;
}

void Block::add_reaction_variables() {
    if (!design_.custom) return;
    auto extra = std::make_shared<ExtraVariables>();
    auto add_for = [&](const std::vector<HalfReaction>& reactions, const char* electrode) {
        for (std::size_t k = 0; k < reactions.size(); ++k) {
            const auto& r = reactions[k];
            const std::string base = fmt::format("reaction.{}_{}.", electrode, k + 1);
            const auto keep = [&](std::string text) -> const char* { return extra->text.emplace_back(std::move(text)).c_str(); };
            extra->info.push_back({keep(base + "current_efficiency"), "1", Causality::output, kTechCustom,
                                   keep(fmt::format("share of the {} current carried by '{}' (product {})", electrode,
                                                    r.name, r.product))});
            extra->info.push_back({keep(base + "product_rate"), "kg/s", Causality::output, kTechCustom,
                                   keep(fmt::format("{} made by '{}', plant total (NaN without its molar mass)",
                                                    r.product, r.name))});
        }
    };
    add_for(design_.custom->anode, "anode");
    add_for(design_.custom->cathode, "cathode");
    for (std::size_t i = 0; i < extra->info.size(); ++i) index_to_var_.push_back(static_cast<Var>(kVarCount + i));
    extra_ = std::move(extra);
}

const VariableInfo& Block::variable(int32_t index) const {
    const Var v = var_of(index);
    return v < kVarCount ? variable_info(v) : extra_->info[static_cast<std::size_t>(v - kVarCount)];
}

Var Block::var_of(int32_t index) const {
    if (index < 0 || index >= variable_count())
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("variable index {} is outside 0..{}", index, variable_count() - 1));
    return index_to_var_[static_cast<std::size_t>(index)];
}

int32_t Block::find(std::string_view name) const {
    for (int32_t i = 0; i < variable_count(); ++i)
        if (name == variable(i).name) return i;
    for (int i = 0; i < kVarCount; ++i)
        if (name == variable_info(static_cast<Var>(i)).name)
            throw Error(ErrorKind::unknown_name, fmt::format("variable '{}' does not exist for technology '{}'",
                                                             name, technology_name(design_.technology)));
    throw Error(ErrorKind::unknown_name, fmt::format("unknown variable '{}'", excerpt(name)));
}

void Block::set(int32_t index, double value) {
    const Var v = var_of(index);
    const auto& info = variable(index);
    if (info.causality != Causality::input)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("'{}' is {}; only inputs can be set", info.name,
                                info.causality == Causality::output ? "an output" : "a parameter fixed by the configuration"));
    require_finite(value, info.name);
    const bool positive = v == in_temperature || v == in_pressure_cathode || v == in_pressure_anode ||
                          v == in_feed_temperature || v == in_voltage;
    if (positive) require_positive(value, info.name);
    else if (value < 0.0)
        throw Error(ErrorKind::invalid_argument, fmt::format("{} is {:g} {}; it must not be negative", info.name, value, info.unit));
    if (is_drive_input(v) && v != drive_input(spec_))
        throw Error(ErrorKind::wrong_state,
                    fmt::format("'{}' is not read while the spec is '{}'; set '{}' or change the spec first", info.name,
                                spec_name(spec_), variable_info(drive_input(spec_)).name));
    v_[v] = value;
    outputs_current_ = false;
}

double Block::get(int32_t index) const {
    const Var v = var_of(index);
    const auto& info = variable(index);
    if (info.causality == Causality::output && !outputs_current_)
        throw Error(ErrorKind::wrong_state,
                    has_solution_ ? fmt::format("'{}' is stale: inputs changed since the last solve; solve first", info.name)
                                  : fmt::format("'{}' has no value yet: the block has not been solved", info.name));
    return v_[static_cast<std::size_t>(v)];
}

void Block::set_spec(Spec spec) {
    spec_ = spec;
    outputs_current_ = false;
}

double Block::max_current_density(double temperature, double p_anode, double p_cathode) const {
    const auto& env = design_.cell->envelope();
    double j_max = design_.limits.current_density_max > 0 ? design_.limits.current_density_max : env.current_density_max;
    j_max = std::min(j_max, design_.cell->current_density_limit({j_max, temperature, p_anode, p_cathode}));
    return j_max;
}

void Block::evaluate_at(double j, PointResult& out) const {
    const double t = v_[in_temperature], pa = v_[in_pressure_anode], pc = v_[in_pressure_cathode];
    out.cell = design_.cell->evaluate({j, t, pa, pc});
    auto& c = out.cell;
    // Ageing adds to the ohmic part so that the breakdown still sums to the voltage.
    const double hours = v_[in_hours_operated];
    out.degradation = design_.degradation.voltage_rate * hours + design_.degradation.resistance_rate * hours * j;
    c.ohmic += out.degradation;
    c.voltage = c.reversible_voltage + c.activation_anode + c.activation_cathode + c.ohmic + c.concentration;
    out.temperature = t;
    out.p_anode = pa;
    out.p_cathode = pc;
    out.feed_temperature = v_[in_feed_temperature];

    const auto& s = design_.stack;
    const double area_total = static_cast<double>(s.cells) * s.stacks * s.active_area;
    out.cells_total = static_cast<double>(s.cells) * s.stacks;
    for (int k = 0; k < kComponentCount; ++k) {
        out.cathode[k] = c.cathode_out[k] * area_total;
        out.anode[k] = c.anode_out[k] * area_total;
        out.consumed[k] = c.consumed[k] * area_total;
    }
    out.stack_current = j * s.active_area * s.stacks;
    out.stack_voltage = c.voltage * s.cells;
    out.stack_power = out.stack_current * out.stack_voltage;
}

double Block::solve_current_density(double j_max) {
    const double target = v_[drive_input(spec_)];
    const auto& s = design_.stack;
    switch (spec_) {
        case Spec::current_density: return target;
        case Spec::current: return target / (s.active_area * s.stacks);
        default: break;
    }
    if (!std::isfinite(target))
        throw Error(ErrorKind::invalid_argument, fmt::format("'{}' has not been set", variable_info(drive_input(spec_)).name));
    PointResult pr;
    auto quantity = [&](double j) {
        evaluate_at(j, pr);
        switch (spec_) {
            case Spec::power: return pr.stack_power;
            case Spec::hydrogen_rate: return pr.cathode[kH2] * molar_mass::H2;
            default: return pr.cell.voltage;
        }
    };
    if (target == 0.0 && spec_ != Spec::voltage) return 0.0;  // open circuit
    const auto& info = variable_info(drive_input(spec_));
    const double q_max = quantity(j_max);
    if (q_max < target)
        throw Error(ErrorKind::infeasible,
                    fmt::format("{} = {:.6g} {} is above what the plant reaches at its maximum current density "
                                "{:.6g} A/m2 ({:.6g} {})",
                                info.name, target, info.unit, j_max, q_max, info.unit));
    // Lower end of the bracket: the smallest current density the cell accepts (below it the
    // gas crossing the separator exceeds the gas made); the cell's hint, widened if needed.
    const OperatingPoint op{j_max, v_[in_temperature], v_[in_pressure_anode], v_[in_pressure_cathode]};
    double j_lo = design_.cell->current_density_minimum(op) * (1.0 + 1e-9);
    double q_lo = 0.0;
    for (int tries = 0;; ++tries) {
        try {
            q_lo = quantity(j_lo);
            break;
        } catch (const Error& e) {
            if (e.kind() != ErrorKind::out_of_range || tries >= 60) throw;
            j_lo = j_lo > 0 ? std::min(j_max, j_lo * 1.5) : 1e-9 * j_max;
        }
    }
    if (q_lo > target)
        throw Error(ErrorKind::infeasible,
                    fmt::format("{} = {:.6g} {} is below what the plant gives at its smallest current density "
                                "{:.6g} A/m2 ({:.6g} {}): below it the gas crossing the separator exceeds the gas made",
                                info.name, target, info.unit, j_lo, q_lo, info.unit));
    auto f = [&](double j) { return quantity(j) - target; };
    // Warm start: bracket around the last solution when it still brackets the root.
    double a = j_lo, b = j_max, fa = q_lo - target, fb = q_max - target;
    if (last_current_density_ * 0.98 > j_lo && last_current_density_ * 1.02 < j_max) {
        const double lo = last_current_density_ * 0.98, hi = last_current_density_ * 1.02;
        const double flo = f(lo);
        if (flo <= 0) {
            const double fhi = f(hi);
            if (fhi >= 0) { a = lo; b = hi; fa = flo; fb = fhi; }
            else { a = hi; fa = fhi; }
        } else {
            b = lo; fb = flo;
        }
    }
    return brent_root(f, a, b, fa, fb, 1e-13 * j_max);
}

SolveOutcome Block::solve() {
    try {
        const double t = v_[in_temperature], pa = v_[in_pressure_anode], pc = v_[in_pressure_cathode];
        const double j_max = max_current_density(t, pa, pc);
        // Current-density and current specs are checked against the envelope and the limiting
        // current by the cell itself.
        const double j = solve_current_density(j_max);
        PointResult pr;
        evaluate_at(j, pr);
        fill_outputs(pr);
        last_current_density_ = j;
        has_solution_ = true;
        outputs_current_ = true;
        last_good_ = v_;
        last_good_spec_ = spec_;
    } catch (...) {
        // Roll back to the last consistent state (spec, inputs and outputs of the last good solve).
        v_ = last_good_;
        spec_ = last_good_spec_;
        outputs_current_ = has_solution_;
        throw;
    }
    SolveOutcome out;
    out.warning = v_[alarm_any] > 0;
    if (out.warning) {
        std::string m = "solved with alarms:";
        const auto add = [&](Var v, const char* text) { if (v_[v] > 0) m += std::string(" ") + text + ";"; };
        add(alarm_h2_in_o2_trip, "hydrogen in the anode gas at or above the trip level");
        if (!(v_[alarm_h2_in_o2_trip] > 0)) add(alarm_h2_in_o2_warning, "hydrogen in the anode gas at or above the warning level");
        add(alarm_temperature_high, "stack temperature above its limit");
        add(alarm_current_density_high, "current density above the rated maximum");
        add(alarm_load_low, "load below the minimum load");
        add(alarm_extrapolated, "cell model extrapolated beyond its fitted range");
        out.message = m;
    }
    return out;
}

void Block::fill_outputs(const PointResult& r) {
    const auto& c = r.cell;
    const double t = r.temperature;
    v_[cell_voltage] = c.voltage;
    v_[cell_reversible_voltage] = c.reversible_voltage;
    v_[cell_thermoneutral_voltage] = c.thermoneutral_voltage;
    v_[cell_activation_anode] = c.activation_anode;
    v_[cell_activation_cathode] = c.activation_cathode;
    v_[cell_ohmic] = c.ohmic;
    v_[cell_concentration] = c.concentration;
    v_[cell_degradation] = r.degradation;
    v_[cell_current_density] = c.current_density;
    v_[cell_faraday_efficiency] = c.faraday_efficiency;
    v_[cell_caustic_efficiency] = c.caustic_efficiency;
    v_[cell_chlorine_efficiency] = c.chlorine_efficiency;

    v_[stack_current] = r.stack_current;
    v_[stack_voltage] = r.stack_voltage;
    v_[stack_power] = r.stack_power;
    const double x = rectifier_rated_power_ > 0 ? r.stack_power / rectifier_rated_power_ : 0.0;
    const auto& rect = design_.rectifier;
    v_[plant_rectifier_loss] = rectifier_rated_power_ * (rect.loss_no_load + rect.loss_linear * x + rect.loss_quadratic * x * x);
    v_[plant_rectifier_efficiency] = r.stack_power / (r.stack_power + v_[plant_rectifier_loss]);
    v_[plant_auxiliary_power] = design_.auxiliaries.fixed + design_.auxiliaries.proportional * r.stack_power;
    v_[plant_power] = r.stack_power + v_[plant_rectifier_loss] + v_[plant_auxiliary_power];

    // Streams. Wet gases leave saturated at stack temperature over the electrolyte's water
    // activity (vapour partial pressure a_w·p_sat) unless the cell carries its steam itself.
    double vap_c = 0, vap_a = 0;
    double dry_c = r.cathode[kH2] + r.cathode[kO2];
    double dry_a = r.anode[kO2] + r.anode[kH2] + r.anode[kCl2];
    double steam_c = 0;
    if (c.gases_saturated) {
        const double p_sat = water_saturation_pressure(t);
        const double pv_c = c.water_activity_cathode * p_sat, pv_a = c.water_activity_anode * p_sat;
        vap_c = dry_c * pv_c / (r.p_cathode - pv_c);
        vap_a = dry_a * pv_a / (r.p_anode - pv_a);
    } else {
        steam_c = r.cathode[kH2O];
    }
    const double gas_c = dry_c + vap_c + steam_c, gas_a = dry_a + vap_a;
    const double water_c = vap_c + steam_c;
    auto frac = [](double n, double total) { return total > 0 ? n / total : 0.0; };

    // Liquid water leaving: drag not returned (PEM), water of the caustic solution (brine).
    double liquid_out = 0;
    if (!design_.drag_water_returned) liquid_out += c.water_drag * (r.cells_total * design_.stack.active_area);
    const double naoh = r.cathode[kNaOH];
    if (naoh > 0 && c.caustic_mass_fraction > 0)
        liquid_out += naoh * molar_mass::NaOH * (1.0 - c.caustic_mass_fraction) / c.caustic_mass_fraction / molar_mass::H2O;
    const double water_in = r.consumed[kH2O] + vap_c + vap_a + steam_c + liquid_out;

    v_[product_hydrogen] = r.cathode[kH2] * molar_mass::H2;
    v_[product_oxygen] = r.anode[kO2] * molar_mass::O2;
    v_[product_chlorine] = r.anode[kCl2] * molar_mass::Cl2;
    v_[product_caustic] = naoh * molar_mass::NaOH;
    v_[product_caustic_solution] = c.caustic_mass_fraction > 0 ? v_[product_caustic] / c.caustic_mass_fraction : 0.0;
    v_[feed_water] = water_in * molar_mass::H2O;
    v_[feed_salt] = r.consumed[kNaCl] * molar_mass::NaCl;

    v_[stream_cathode_mass_flow] = r.cathode[kH2] * molar_mass::H2 + r.cathode[kO2] * molar_mass::O2 + water_c * molar_mass::H2O;
    v_[stream_cathode_temperature] = t;
    v_[stream_cathode_pressure] = r.p_cathode;
    v_[stream_cathode_x_h2] = frac(r.cathode[kH2], gas_c);
    v_[stream_cathode_x_o2] = frac(r.cathode[kO2], gas_c);
    v_[stream_cathode_x_h2o] = frac(water_c, gas_c);
    v_[stream_anode_mass_flow] = r.anode[kO2] * molar_mass::O2 + r.anode[kH2] * molar_mass::H2 +
                                 r.anode[kCl2] * molar_mass::Cl2 + vap_a * molar_mass::H2O;
    v_[stream_anode_temperature] = t;
    v_[stream_anode_pressure] = r.p_anode;
    v_[stream_anode_x_o2] = frac(r.anode[kO2], gas_a);
    v_[stream_anode_x_h2] = frac(r.anode[kH2], gas_a);
    v_[stream_anode_x_cl2] = frac(r.anode[kCl2], gas_a);
    v_[stream_anode_x_h2o] = frac(vap_a, gas_a);
    if (design_.technology == Technology::brine) {
        // Brine loop (internal: resaturated and returned). Anolyte balances with feed brine of
        // molality m_in and depleted brine of m_out: salt m_in·W_in − m_out·W_out = NaCl consumed;
        // water W_in − W_out = water carried to the catholyte with Na⁺ + vapour in the chlorine −
        // water formed at the anode by the back-migrated hydroxide (2·H2 made − water consumed).
        const double m_in = molality_from_mass_fraction(design_.brine_feed_nacl_mass_fraction, molar_mass::NaCl);
        const double m_out = c.anolyte_nacl_molality;
        if (!(m_in > m_out))
            throw Error(ErrorKind::config,
                        fmt::format("$.plant.brine_feed_nacl_mass_fraction: feed brine of {:.4g} mol/kg is not stronger "
                                    "than the depleted anolyte of {:.4g} mol/kg",
                                    m_in, m_out));
        const double formed = 2.0 * r.cathode[kH2] - r.consumed[kH2O];
        const double drag = c.water_drag * r.cells_total * design_.stack.active_area;
        const double water_out_kg = (drag + vap_a - formed) * molar_mass::H2O;  // kg/s
        const double feed_water_kg = (r.consumed[kNaCl] - m_out * water_out_kg) / (m_in - m_out);
        const double depleted_water_kg = feed_water_kg - water_out_kg;
        v_[stream_brine_feed_mass_flow] = feed_water_kg * (1.0 + m_in * molar_mass::NaCl);
        v_[stream_depleted_brine_mass_flow] = depleted_water_kg * (1.0 + m_out * molar_mass::NaCl);
        v_[stream_depleted_brine_nacl_mass_fraction] = mass_fraction_from_molality(m_out, molar_mass::NaCl);
    }
    v_[gas_h2_in_o2] = c.h2_in_o2;
    v_[gas_o2_in_h2] = c.o2_in_h2;
    v_[gas_o2_in_cl2] = c.o2_in_cl2;

    // Energy balance around the stacks, one enthalpy reference for all species (elements at
    // 298.15 K and 1 bar; formation enthalpies included): P_DC + H_feed = H_products + Q + Q_loss.
    const double t_feed = r.feed_temperature;
    const double p_feed = std::max(r.p_anode, r.p_cathode);
    double h_in = 0, h_out = 0;
    if (c.gases_saturated) {
        h_in += water_in * liquid_water(t_feed, std::max(p_feed, water_saturation_pressure(t_feed))).enthalpy;
    } else {
        h_in += water_in * ideal_gas(Species::water_vapour, t).enthalpy;  // steam raised outside the block
    }
    if (r.consumed[kNaCl] > 0) h_in += r.consumed[kNaCl] * aqueous_solute(Solute::sodium_chloride, t_feed).enthalpy;
    const double h_h2 = ideal_gas(Species::hydrogen, t).enthalpy;
    h_out += (r.cathode[kH2] + r.anode[kH2]) * h_h2;
    if (r.cathode[kO2] + r.anode[kO2] > 0) h_out += (r.cathode[kO2] + r.anode[kO2]) * ideal_gas(Species::oxygen, t).enthalpy;
    if (r.anode[kCl2] > 0) h_out += r.anode[kCl2] * ideal_gas(Species::chlorine, t).enthalpy;
    if (water_c + vap_a > 0) h_out += (water_c + vap_a) * ideal_gas(Species::water_vapour, t).enthalpy;
    if (liquid_out > 0) h_out += liquid_out * liquid_water(t, std::max(r.p_cathode, water_saturation_pressure(t))).enthalpy;
    if (naoh > 0) h_out += naoh * aqueous_solute(Solute::sodium_hydroxide, t).enthalpy;
    const double q_loss = design_.thermal.heat_loss_coefficient * design_.stack.stacks * (t - design_.thermal.ambient_temperature);
    v_[heat_loss] = q_loss;
    if (design_.technology == Technology::custom) {
        // Products of a custom cell (metals, ...) have no enthalpy data here: the duty is the
        // electrical work above the cell's thermoneutral voltage, N·I·(V − E_tn).
        v_[heat_duty] = r.stack_current * design_.stack.cells * (c.voltage - c.thermoneutral_voltage) - q_loss;
    } else {
        v_[heat_duty] = r.stack_power + h_in - h_out - q_loss;
    }

    const double h2 = v_[product_hydrogen];
    const bool makes_h2 = h2 > 0;
    v_[perf_specific_energy] = makes_h2 ? r.stack_power / h2 : kNaN;
    v_[perf_specific_energy_plant] = makes_h2 ? v_[plant_power] / h2 : kNaN;
    v_[perf_efficiency_hhv] = r.stack_power > 0 ? h2 * hhv_per_kg() / r.stack_power : 0.0;
    v_[perf_efficiency_lhv] = r.stack_power > 0 ? h2 * lhv_per_kg() / r.stack_power : 0.0;
    v_[perf_water_per_hydrogen] = makes_h2 ? v_[feed_water] / h2 : kNaN;
    v_[perf_specific_energy_chlorine] = v_[product_chlorine] > 0 ? r.stack_power / v_[product_chlorine] : kNaN;

    const double j_rated = v_[par_current_density_max];
    v_[perf_load_fraction] = c.current_density / j_rated;
    const auto& al = design_.alarms;
    v_[alarm_h2_in_o2_warning] = c.h2_in_o2 >= al.h2_in_o2_warning ? 1.0 : 0.0;
    v_[alarm_h2_in_o2_trip] = c.h2_in_o2 >= al.h2_in_o2_trip ? 1.0 : 0.0;
    v_[alarm_temperature_high] = design_.limits.temperature_max > 0 && t > design_.limits.temperature_max ? 1.0 : 0.0;
    v_[alarm_current_density_high] = c.current_density > j_rated * (1 + 1e-12) ? 1.0 : 0.0;
    v_[alarm_load_low] = c.current_density < design_.limits.min_load_fraction * j_rated ? 1.0 : 0.0;
    v_[alarm_extrapolated] = c.warnings != 0 ? 1.0 : 0.0;
    if (extra_) {
        // Custom cell: each reaction's share of its electrode current and its product rate.
        const auto& spec = *design_.custom;
        const auto rates = custom_product_rates(spec, c);
        const double area_total = r.cells_total * design_.stack.active_area;
        std::size_t slot = kVarCount;
        std::size_t k = 0;
        for (const auto* list : {&spec.anode, &spec.cathode})
            for (const auto& reaction : *list) {
                v_[slot++] = c.reaction_current_efficiency.at(k);
                v_[slot++] = reaction.product_molar_mass > 0 ? rates.at(k) * area_total * reaction.product_molar_mass : kNaN;
                ++k;
            }
    }
    v_[alarm_any] = (v_[alarm_h2_in_o2_warning] + v_[alarm_h2_in_o2_trip] + v_[alarm_temperature_high] +
                     v_[alarm_current_density_high] + v_[alarm_load_low] + v_[alarm_extrapolated]) > 0 ? 1.0 : 0.0;
}

std::string Block::report_json() const {
    if (!outputs_current_)
        throw Error(ErrorKind::wrong_state, "no report: the block has no solution for its current inputs; solve first");
    std::string out = fmt::format("{{\"technology\":\"{}\",\"spec\":\"{}\",\"name\":\"", technology_name(design_.technology),
                                  spec_name(spec_));
    for (char ch : design_.name) {
        if (ch == '"' || ch == '\\') out += '\\';
        if (static_cast<unsigned char>(ch) >= 0x20) out += ch;
    }
    out += "\",\"variables\":{";
    bool first = true;
    for (int32_t i = 0; i < variable_count(); ++i) {
        const auto& info = variable(i);
        const std::size_t v = static_cast<std::size_t>(index_to_var_[static_cast<std::size_t>(i)]);
        out += first ? "" : ",";
        first = false;
        if (std::isfinite(v_[v])) out += fmt::format("\"{}\":{{\"value\":{:.17g},\"unit\":\"{}\"}}", info.name, v_[v], info.unit);
        else out += fmt::format("\"{}\":{{\"value\":null,\"unit\":\"{}\"}}", info.name, info.unit);
    }
    out += "}}";
    return out;
}

}  // namespace ely
