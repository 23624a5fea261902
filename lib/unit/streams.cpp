// Streams and balances: the cell, stack and plant outputs, the plant's streams (wet gases through
// their gas coolers, condensate returned, water drained, make-up, sweep air, salt solutions), the
// energy balance and the performance figures, and the outputs the cell adds.
//
// Boundaries. The stacks take in make-up water (feed temperature), the condensate of the gas coolers
// (cooler temperature), steam and sweep air (stack temperature, raised and heated in the plant) and the
// cell's salt solutions; they give off the wet gases, liquid water and solutions at the stack
// temperature. The gas coolers take the wet gases to their outlet temperature; what they condense
// returns to the water loop. The plant boundary is crossed by the make-up water, hydrogen drawn back in
// standby, sweep air and the cell's inlet solutions going in, and by the cooled gases, the water drained,
// the caustic solution and the cell's outlet solutions going out: every one is an output, so mass,
// elements and energy close from the reported streams alone.
#include <algorithm>
#include <cmath>
#include <limits>

#include "cells/custom.hpp"
#include "electrochem/electrolyte.hpp"
#include "thermo/constants.hpp"
#include "thermo/reaction.hpp"
#include "thermo/species.hpp"
#include "thermo/water.hpp"
#include "unit/point_result.hpp"

namespace ely {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
// Oxygen in dry air, mol/mol (U.S. Standard Atmosphere 1976: 20.946 %; argon counted with the nitrogen).
constexpr double kAirOxygenFraction = 0.20946;

// Heating values of hydrogen at 25 °C from the CODATA key values (ΔfH° of liquid water and
// steam), per kg of H2: HHV 141.78 MJ/kg, LHV 119.96 MJ/kg (REFERENCES.md, derived).
double hhv_per_kg() { return -kLiquidWaterFormationEnthalpy / molar_mass::H2; }
double lhv_per_kg() { return -kWaterVapourFormationEnthalpy / molar_mass::H2; }

double air_molar_mass() { return kAirOxygenFraction * molar_mass::O2 + (1.0 - kAirOxygenFraction) * molar_mass::N2; }

/// Water vapour a dry gas of `dry` mol/s carries when saturated at partial pressure pv of water (a_w·p_sat)
/// at total pressure p: n_vap = n_dry·pv/(p − pv).
double saturated_vapour(double dry, double pv, double pressure) { return dry * pv / (pressure - pv); }

/// Water fed at T and p: liquid (IAPWS-IF97 region 1) where that is liquid water, steam (ideal gas) above
/// its boiling point or above region 1's 623.15 K.
double feed_water_enthalpy(double t, double pressure) {
    if (t <= 623.15 && water_saturation_pressure(t) < pressure) return liquid_water(t, pressure).enthalpy;
    return ideal_gas(Species::water_vapour, t).enthalpy;
}

/// Dry gas of one side (H2, O2, Cl2 and nitrogen) per mol/s at T, J/s, with h(species, T) the molar enthalpy.
template <class Enthalpy>
double dry_gas_enthalpy(const Fluxes& gas, double nitrogen, double t, const Enthalpy& h) {
    double sum = 0;
    if (gas[kH2] > 0) sum += gas[kH2] * h(Species::hydrogen, t);
    if (gas[kO2] > 0) sum += gas[kO2] * h(Species::oxygen, t);
    if (gas[kCl2] > 0) sum += gas[kCl2] * h(Species::chlorine, t);
    if (nitrogen > 0) sum += nitrogen * h(Species::nitrogen, t);
    return sum;
}

/// A salt solution of `water` and `solute` mol/s at T: n_w·h_w(T) + n_s·(h°_s(T) + Φ_L(m, T)), the
/// apparent relative molar enthalpy carrying the heats of mixing (n_w L̄1 + n_s L̄2 = n_s Φ_L).
double solution_enthalpy(AqueousSalt salt, double water, double solute, double t, double pressure) {
    const double h_water = water * liquid_water(t, std::max(pressure, water_saturation_pressure(t))).enthalpy;
    if (!(solute > 0)) return h_water;
    const double molality = solute / (water * molar_mass::H2O);
    const Solute standard = salt == AqueousSalt::sodium_chloride ? Solute::sodium_chloride : Solute::sodium_hydroxide;
    return h_water +
           solute * (aqueous_solute(standard, t).enthalpy + aqueous_salt_relative_enthalpies(salt, molality, t).apparent(molality));
}

bool makes_water_gas(const HalfReaction& h) { return h.product == "H2" || h.product == "O2"; }

// The main product of a cell built from a reaction table (the rule of product.main, variables.cpp):
// its index among the result's shares, anode reactions first, then the cathode's.
std::size_t main_reaction(const CustomCellSpec& spec) {
    const std::size_t na = spec.anode.size();
    for (std::size_t k = 0; k < spec.cathode.size(); ++k)
        if (!makes_water_gas(spec.cathode[k])) return na + k;
    for (std::size_t k = 0; k < na; ++k)
        if (!makes_water_gas(spec.anode[k])) return k;
    return na;
}

// kg/mol of a reaction's product: the completed table's (given, or from its species, or the model's own
// for H2, O2, Cl2: complete_custom_spec); NaN when none is known.
double product_molar_mass(const HalfReaction& h) { return h.product_molar_mass > 0 ? h.product_molar_mass : kNaN; }

double per(double numerator, double denominator) { return denominator > 0 ? numerator / denominator : kNaN; }
}  // namespace

double Block::gas_enthalpy(Species species, double t) const {
    // Two temperatures (the stack's and the gas coolers' outlet); a new one replaces the entry not
    // used last, so that the coolers' stays while the stack temperature changes from point to point.
    GasEnthalpies* entry = nullptr;
    for (int k = 0; k < 2; ++k)
        if (gas_enthalpies_[k].temperature == t) {
            entry = &gas_enthalpies_[k];
            gas_enthalpies_next_ = 1 - k;
        }
    if (!entry) {
        entry = &gas_enthalpies_[gas_enthalpies_next_];
        gas_enthalpies_next_ = 1 - gas_enthalpies_next_;
        *entry = GasEnthalpies{};
        entry->temperature = t;
    }
    const auto bit = 1u << static_cast<int>(species);
    if (!(entry->known & bit)) {
        entry->enthalpy[static_cast<int>(species)] = ideal_gas(species, t).enthalpy;
        entry->known |= bit;
    }
    return entry->enthalpy[static_cast<int>(species)];
}

void Block::plant_streams(const PointResult& r, PlantStreams& s) const {
    const auto& c = r.cell;
    const double t = r.temperature, t_cool = std::min(t, v_[par_gas_cooler_temperature]);
    const double pressure[2] = {r.p_cathode, r.p_anode};
    const Fluxes* side[2] = {&r.cathode, &r.anode};
    s.sweep_air = r.anode[kO2] > 0 ? c.oxygen_electrode_sweep * r.anode[kO2] : 0.0;
    s.nitrogen[0] = 0.0;
    s.nitrogen[1] = (1.0 - kAirOxygenFraction) * s.sweep_air;
    s.steam_fed = 0.0;
    s.p_sat_stack = c.gases_saturated ? water_saturation_pressure(t) : 0.0;
    s.p_sat_cool = water_saturation_pressure(t_cool);
    for (int k = 0; k < 2; ++k) {
        const Fluxes& g = *side[k];
        s.gas[k] = g;
        s.gas[k][kH2O] = 0.0;
        if (k == 1) s.gas[k][kO2] += kAirOxygenFraction * s.sweep_air;
        s.dry[k] = s.gas[k][kH2] + s.gas[k][kO2] + s.gas[k][kCl2] + s.nitrogen[k];
        // Leaving the stack: saturated over the electrolyte, or the steam a steam-fed cell carries.
        const double a_w = k == 0 ? c.water_activity_cathode : c.water_activity_anode;
        s.vapour_stack[k] = c.gases_saturated
                                ? (s.dry[k] > 0 ? saturated_vapour(s.dry[k], a_w * s.p_sat_stack, pressure[k]) : 0.0)
                                : g[kH2O];
        // After the gas cooler: at most saturated over the condensate (pure water) at its outlet temperature.
        s.t_out[k] = t_cool;
        s.vapour_out[k] = s.vapour_stack[k];
        if (s.dry[k] > 0 && s.p_sat_cool < pressure[k])
            s.vapour_out[k] = std::min(s.vapour_stack[k], saturated_vapour(s.dry[k], s.p_sat_cool, pressure[k]));
        s.condensate[k] = s.vapour_stack[k] - s.vapour_out[k];
    }
    if (!c.gases_saturated) s.steam_fed = r.consumed[kH2O] + s.vapour_stack[0] + s.vapour_stack[1];

    // Liquid water leaving the plant: drag not returned (PEM); the caustic solution's water (brine).
    s.drag = c.water_drag * r.area_total;
    s.drain = design_.drag_water_returned ? 0.0 : s.drag;
    const double naoh = r.cathode[kNaOH];
    s.caustic_water = (naoh > 0 && c.caustic_mass_fraction > 0)
                          ? naoh * molar_mass::NaOH * (1.0 - c.caustic_mass_fraction) / c.caustic_mass_fraction / molar_mass::H2O
                          : 0.0;
    s.makeup = r.consumed[kH2O] + s.vapour_out[0] + s.vapour_out[1] + s.drain + s.caustic_water;

    s.flows.active_area = r.area_total;
    s.flows.cathode = r.cathode;
    s.flows.anode = r.anode;
    s.flows.consumed = r.consumed;
    s.flows.anode_vapour = s.vapour_stack[1];
    s.flows.drag = s.drag;
    cell_->solution_streams(c, s.flows, s.solutions);
}

Block::EnergyBalance Block::energy_balance(const PointResult& r, const PlantStreams& s) const {
    const auto& c = r.cell;
    const double t = r.temperature, t_feed = r.feed_temperature;
    const double p_liquid = std::max(r.p_anode, r.p_cathode);
    // Liquid water at the stack and cooler temperatures (their vapour pressures known from the streams).
    const double t_cool = s.t_out[0];
    const auto liquid = [&](double temperature, double p_sat) {
        return liquid_water(temperature, std::max(p_liquid, p_sat)).enthalpy;
    };
    const double h_liquid_cool = liquid(t_cool, s.p_sat_cool);
    const auto h_liquid_stack = [&] { return liquid(t, water_saturation_pressure(t)); };
    const auto h = [this](Species species, double temperature) { return gas_enthalpy(species, temperature); };
    const double h_vapour = h(Species::water_vapour, t);
    const double h_gas_stack[2] = {dry_gas_enthalpy(s.gas[0], s.nitrogen[0], t, h),
                                   dry_gas_enthalpy(s.gas[1], s.nitrogen[1], t, h)};
    EnergyBalance e;

    // What enters the stacks.
    double h_in = 0;
    double pure_water_in = s.makeup;  // make-up at the feed temperature, less what enters in solutions
    for (int k = 0; k < s.solutions.count; ++k) {
        const auto& sol = s.solutions.streams[static_cast<std::size_t>(k)];
        pure_water_in -= sol.inlet ? sol.water : -sol.water;
        h_in += sol.inlet ? solution_enthalpy(sol.salt, sol.water, sol.solute, t_feed, p_liquid) : 0.0;
    }
    const double condensate = s.condensate[0] + s.condensate[1];
    if (c.gases_saturated) {
        h_in += pure_water_in * feed_water_enthalpy(t_feed, p_liquid) + condensate * h_liquid_cool;
    } else {
        // Steam and sweep air enter the stacks at their temperature, raised and heated in the plant
        // from the make-up water (feed temperature), the condensate (cooler temperature) and ambient air.
        const double h_air_t = kAirOxygenFraction * h(Species::oxygen, t) +
                               (1.0 - kAirOxygenFraction) * h(Species::nitrogen, t);
        h_in += s.steam_fed * h_vapour + s.sweep_air * h_air_t;
        double h_air_feed = 0;
        if (s.sweep_air > 0)
            h_air_feed = kAirOxygenFraction * ideal_gas(Species::oxygen, t_feed).enthalpy +
                         (1.0 - kAirOxygenFraction) * ideal_gas(Species::nitrogen, t_feed).enthalpy;
        e.feed_heating = s.steam_fed * h_vapour - pure_water_in * feed_water_enthalpy(t_feed, p_liquid) -
                         condensate * h_liquid_cool + s.sweep_air * (h_air_t - h_air_feed);
    }
    if (r.consumed[kNaCl] > 0 && s.solutions.count == 0)  // salt fed without its solution: the standard state
        h_in += r.consumed[kNaCl] * aqueous_solute(Solute::sodium_chloride, t_feed).enthalpy;
    if (r.consumed[kH2] > 0)  // standby: drawn back from the product line after its gas cooler
        h_in += r.consumed[kH2] * h(Species::hydrogen, t_cool);

    // What leaves them at the stack temperature.
    double h_out = 0;
    for (int k = 0; k < 2; ++k) h_out += h_gas_stack[k] + s.vapour_stack[k] * h_vapour;
    if (s.drain > 0) h_out += s.drain * h_liquid_stack();
    if (r.cathode[kNaOH] > 0)
        h_out += solution_enthalpy(AqueousSalt::sodium_hydroxide, s.caustic_water, r.cathode[kNaOH], t, p_liquid);
    for (int k = 0; k < s.solutions.count; ++k) {
        const auto& sol = s.solutions.streams[static_cast<std::size_t>(k)];
        if (!sol.inlet) h_out += solution_enthalpy(sol.salt, sol.water, sol.solute, t, p_liquid);
    }
    // A custom cell's species outside the component list (ions, metals, melts), at the stack temperature.
    h_out += c.other_species_enthalpy * r.area_total;

    e.loss = heat_loss_at(t);
    if (c.heat_from_thermoneutral_voltage) {
        // A reaction table without enthalpy data: the electrical work above the given thermoneutral voltage,
        // N·I·(V − E_tn), its reaction taking liquid water at T; less what the water needs besides: warming the
        // make-up and condensate to T and evaporating the vapour the gases carry.
        const double water_in = pure_water_in * feed_water_enthalpy(t_feed, p_liquid) + condensate * h_liquid_cool;
        const double liquid_out = s.drain + r.consumed[kH2O];
        const double water_out = (s.vapour_stack[0] + s.vapour_stack[1]) * h_vapour +
                                 (liquid_out != 0 ? liquid_out * h_liquid_stack() : 0.0);
        e.released = r.stack_current * design_.cells() * (c.voltage - c.thermoneutral_voltage) - (water_out - water_in);
    } else {
        e.released = r.stack_power + h_in - h_out;
    }
    e.duty = e.released - e.loss;

    // The gas coolers: each gas from the stack temperature to its outlet, less the condensate (nothing when
    // the stack is not warmer than the coolers).
    if (t_cool < t) {
        const double h_vapour_cool = h(Species::water_vapour, t_cool);
        for (int k = 0; k < 2; ++k) {
            if (s.dry[k] + s.vapour_stack[k] <= 0) continue;
            e.gas_coolers += h_gas_stack[k] + s.vapour_stack[k] * h_vapour -
                             dry_gas_enthalpy(s.gas[k], s.nitrogen[k], t_cool, h) - s.vapour_out[k] * h_vapour_cool -
                             s.condensate[k] * h_liquid_cool;
        }
    }
    return e;
}

void Block::fill_outputs(const PointResult& r) {
    const auto& c = r.cell;
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
    const double rated = rectifier_rated_power_;
    const double x = rated > 0 ? r.stack_power / rated : 0.0;
    v_[plant_rectifier_loss] = rated * (v_[par_rectifier_loss_no_load] + v_[par_rectifier_loss_linear] * x +
                                        v_[par_rectifier_loss_quadratic] * x * x);
    v_[plant_rectifier_efficiency] = r.stack_power / (r.stack_power + v_[plant_rectifier_loss]);
    v_[plant_auxiliary_power] = v_[par_auxiliaries_fixed] + v_[par_auxiliaries_proportional] * r.stack_power;
    v_[plant_power] = r.stack_power + v_[plant_rectifier_loss] + v_[plant_auxiliary_power];

    PlantStreams s;
    plant_streams(r, s);
    const auto frac = [](double n, double total) { return total > 0 ? n / total : 0.0; };

    const double naoh = r.cathode[kNaOH];
    v_[product_hydrogen] = r.cathode[kH2] * molar_mass::H2;
    v_[product_oxygen] = r.anode[kO2] * molar_mass::O2;
    v_[product_chlorine] = r.anode[kCl2] * molar_mass::Cl2;
    v_[product_caustic] = naoh * molar_mass::NaOH;
    v_[product_caustic_solution] = c.caustic_mass_fraction > 0 ? v_[product_caustic] / c.caustic_mass_fraction : 0.0;
    v_[feed_water] = s.makeup * molar_mass::H2O;
    v_[feed_salt] = r.consumed[kNaCl] * molar_mass::NaCl;
    v_[feed_hydrogen] = r.consumed[kH2] * molar_mass::H2;
    v_[feed_sweep_air] = s.sweep_air * air_molar_mass();

    // The gases leaving the plant, after their gas coolers.
    const double gas_c = s.dry[0] + s.vapour_out[0], gas_a = s.dry[1] + s.vapour_out[1];
    v_[stream_cathode_mass_flow] =
        s.gas[0][kH2] * molar_mass::H2 + s.gas[0][kO2] * molar_mass::O2 + s.vapour_out[0] * molar_mass::H2O;
    v_[stream_cathode_temperature] = s.t_out[0];
    v_[stream_cathode_pressure] = r.p_cathode;
    v_[stream_cathode_x_h2] = frac(s.gas[0][kH2], gas_c);
    v_[stream_cathode_x_o2] = frac(s.gas[0][kO2], gas_c);
    v_[stream_cathode_x_h2o] = frac(s.vapour_out[0], gas_c);
    v_[stream_anode_mass_flow] = s.gas[1][kO2] * molar_mass::O2 + s.gas[1][kH2] * molar_mass::H2 +
                                 s.gas[1][kCl2] * molar_mass::Cl2 + s.nitrogen[1] * molar_mass::N2 +
                                 s.vapour_out[1] * molar_mass::H2O;
    v_[stream_anode_temperature] = s.t_out[1];
    v_[stream_anode_pressure] = r.p_anode;
    v_[stream_anode_x_o2] = frac(s.gas[1][kO2], gas_a);
    v_[stream_anode_x_h2] = frac(s.gas[1][kH2], gas_a);
    v_[stream_anode_x_cl2] = frac(s.gas[1][kCl2], gas_a);
    v_[stream_anode_x_h2o] = frac(s.vapour_out[1], gas_a);
    v_[stream_anode_x_n2] = frac(s.nitrogen[1], gas_a);
    v_[stream_condensate_mass_flow] = (s.condensate[0] + s.condensate[1]) * molar_mass::H2O;
    v_[stream_drain_mass_flow] = s.drain * molar_mass::H2O;
    v_[stream_dryer_loss_mass_flow] = s.vapour_out[0] * molar_mass::H2O;
    v_[gas_h2_in_o2] = c.h2_in_o2;
    v_[gas_o2_in_h2] = c.o2_in_h2;
    v_[gas_o2_in_cl2] = c.o2_in_cl2;

    const EnergyBalance e = energy_balance(r, s);
    v_[heat_loss] = e.loss;
    v_[heat_duty] = e.duty;
    v_[heat_gas_coolers] = e.gas_coolers;
    v_[heat_feed_heating] = e.feed_heating;

    const double h2 = v_[product_hydrogen];
    const bool makes_h2 = h2 > 0;
    // The energy the plant takes in: DC power and the heat supplied from outside.
    const double energy_in = r.stack_power + e.feed_heating + std::max(0.0, -e.duty);
    v_[perf_specific_energy] = makes_h2 ? r.stack_power / h2 : kNaN;
    v_[perf_specific_energy_plant] = makes_h2 ? v_[plant_power] / h2 : kNaN;
    v_[perf_efficiency_hhv] = energy_in > 0 ? h2 * hhv_per_kg() / energy_in : 0.0;
    v_[perf_efficiency_lhv] = energy_in > 0 ? h2 * lhv_per_kg() / energy_in : 0.0;
    v_[perf_water_per_hydrogen] = makes_h2 ? v_[feed_water] / h2 : kNaN;
    v_[perf_specific_energy_chlorine] = v_[product_chlorine] > 0 ? r.stack_power / v_[product_chlorine] : kNaN;
    v_[perf_load_fraction] = c.current_density / v_[par_rated_current_density];

    // Brine plants: the trade's figures per tonne of chlorine and of caustic (100 % NaOH).
    const double cl2 = v_[product_chlorine], naoh_kg = v_[product_caustic];
    v_[perf_specific_energy_caustic] = per(r.stack_power, naoh_kg);
    v_[perf_salt_per_chlorine] = per(v_[feed_salt], cl2);
    v_[perf_water_per_chlorine] = per(v_[feed_water], cl2);
    v_[perf_salt_per_caustic] = per(v_[feed_salt], naoh_kg);
    v_[perf_water_per_caustic] = per(v_[feed_water], naoh_kg);

    // Cells built from a reaction table: their main product, its current efficiency and energy.
    if (design_.custom) {
        const CustomCellSpec& spec = *design_.custom;
        const std::size_t k = main_reaction(spec), na = spec.anode.size();
        const HalfReaction& h = k < na ? spec.anode[k] : spec.cathode[k - na];
        const double share = c.reaction_current_efficiency[k];
        v_[cell_main_product_efficiency] = share;
        v_[product_main] = custom_product_rate(h, share, c.current_density) * r.area_total * product_molar_mass(h);
        v_[perf_specific_energy_main] = per(r.stack_power, v_[product_main]);
    }

    if (own_count_ > 0) cell_->fill_own_outputs(c, s.flows, v_.data() + kVarCount);
}

}  // namespace ely
