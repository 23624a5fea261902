// Streams and balances: the cell, stack and plant outputs, products and feeds, the wet gas
// streams, the energy balance and the performance figures, and the outputs the cell adds.
#include <algorithm>
#include <cmath>
#include <limits>

#include "thermo/constants.hpp"
#include "thermo/reaction.hpp"
#include "thermo/species.hpp"
#include "thermo/water.hpp"
#include "unit/point_result.hpp"

namespace ely {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// Heating values of hydrogen at 25 °C from the CODATA key values (ΔfH° of liquid water and
// steam), per kg of H2: HHV 141.78 MJ/kg, LHV 119.96 MJ/kg (REFERENCES.md, derived).
double hhv_per_kg() { return -kLiquidWaterFormationEnthalpy / molar_mass::H2; }
double lhv_per_kg() { return -kWaterVapourFormationEnthalpy / molar_mass::H2; }
}  // namespace

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
    const double rated = rectifier_rated_power_;
    const double x = rated > 0 ? r.stack_power / rated : 0.0;
    v_[plant_rectifier_loss] = rated * (v_[par_rectifier_loss_no_load] + v_[par_rectifier_loss_linear] * x +
                                        v_[par_rectifier_loss_quadratic] * x * x);
    v_[plant_rectifier_efficiency] = r.stack_power / (r.stack_power + v_[plant_rectifier_loss]);
    v_[plant_auxiliary_power] = v_[par_auxiliaries_fixed] + v_[par_auxiliaries_proportional] * r.stack_power;
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
    const double drag = c.water_drag * r.area_total;
    double liquid_out = 0;
    if (!design_.drag_water_returned) liquid_out += drag;
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
    v_[feed_hydrogen] = r.consumed[kH2] * molar_mass::H2;

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
    h_in += r.consumed[kH2] * h_h2;  // standby: drawn back from the product line
    h_out += (r.cathode[kH2] + r.anode[kH2]) * h_h2;
    if (r.cathode[kO2] + r.anode[kO2] > 0) h_out += (r.cathode[kO2] + r.anode[kO2]) * ideal_gas(Species::oxygen, t).enthalpy;
    if (r.anode[kCl2] > 0) h_out += r.anode[kCl2] * ideal_gas(Species::chlorine, t).enthalpy;
    if (water_c + vap_a > 0) h_out += (water_c + vap_a) * ideal_gas(Species::water_vapour, t).enthalpy;
    if (liquid_out > 0) h_out += liquid_out * liquid_water(t, std::max(r.p_cathode, water_saturation_pressure(t))).enthalpy;
    if (naoh > 0) h_out += naoh * aqueous_solute(Solute::sodium_hydroxide, t).enthalpy;
    const double q_loss = v_[par_heat_loss_coefficient] * design_.stacks() * (t - v_[par_ambient_temperature]);
    v_[heat_loss] = q_loss;
    if (design_.technology->has(kHeatFromThermoneutralVoltage)) {
        // Products without enthalpy data here (metals, ...): the duty is the electrical work
        // above the cell's thermoneutral voltage, N·I·(V − E_tn).
        v_[heat_duty] = r.stack_current * design_.cells() * (c.voltage - c.thermoneutral_voltage) - q_loss;
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
    v_[perf_load_fraction] = c.current_density / v_[par_rated_current_density];

    if (own_count_ > 0) {
        PlantFlows flows;
        flows.active_area = r.area_total;
        flows.cathode = r.cathode;
        flows.anode = r.anode;
        flows.consumed = r.consumed;
        flows.anode_vapour = vap_a;
        flows.drag = drag;
        cell_->fill_own_outputs(c, flows, v_.data() + kVarCount);
    }
}

}  // namespace ely
