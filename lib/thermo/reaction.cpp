#include "thermo/reaction.hpp"

#include <cmath>
#include <fmt/format.h>

#include "base/check.hpp"
#include "thermo/constants.hpp"
#include "thermo/species.hpp"
#include "thermo/water.hpp"

namespace ely {
namespace {

constexpr double kBrineTemperatureLow = 298.0;   // H2 and Cl2 fits start at 298 K
constexpr double kBrineTemperatureHigh = 473.15;

ReactionProperties combine(double temperature, double enthalpy, double entropy, int electrons) {
    return {enthalpy, entropy, enthalpy - temperature * entropy, electrons};
}

}  // namespace

ReactionProperties water_splitting(double temperature, WaterFeed feed) {
    // Spec solves and batches call this many times at one temperature: a one-entry memo per
    // thread and feed returns the identical result without recomputing IF97 (pure function;
    // thread_local keeps handles on different threads independent).
    thread_local double memo_temperature[2] = {-1.0, -1.0};
    thread_local ReactionProperties memo_result[2];
    const int slot = feed == WaterFeed::liquid ? 0 : 1;
    if (temperature == memo_temperature[slot]) return memo_result[slot];
    const auto h2 = ideal_gas(Species::hydrogen, temperature);
    const auto o2 = ideal_gas(Species::oxygen, temperature);
    const auto water =
        feed == WaterFeed::liquid ? liquid_water_standard(temperature) : ideal_gas(Species::water_vapour, temperature);
    const auto r = combine(temperature, h2.enthalpy + 0.5 * o2.enthalpy - water.enthalpy,
                           h2.entropy + 0.5 * o2.entropy - water.entropy, 2);
    memo_temperature[slot] = temperature;
    memo_result[slot] = r;
    return r;
}

ReactionProperties brine_electrolysis(double temperature) {
    require_within(temperature, kBrineTemperatureLow, kBrineTemperatureHigh, "brine reaction: temperature", "K");
    const auto h2 = ideal_gas(Species::hydrogen, temperature);
    const auto cl2 = ideal_gas(Species::chlorine, temperature);
    const auto water = liquid_water_standard(temperature);
    const auto naoh = aqueous_solute(Solute::sodium_hydroxide, temperature);
    const auto nacl = aqueous_solute(Solute::sodium_chloride, temperature);
    const double solute_h = 2.0 * (naoh.enthalpy - nacl.enthalpy);
    const double solute_s = 2.0 * (naoh.entropy - nacl.entropy);
    return combine(temperature, h2.enthalpy + cl2.enthalpy + solute_h - 2.0 * water.enthalpy,
                   h2.entropy + cl2.entropy + solute_s - 2.0 * water.entropy, 2);
}

double reversible_voltage_standard(const ReactionProperties& r) { return r.gibbs / (r.electrons * kFaraday); }

double thermoneutral_voltage(const ReactionProperties& r) { return r.enthalpy / (r.electrons * kFaraday); }

double thermoneutral_voltage_hhv(double temperature) {
    return thermoneutral_voltage(water_splitting(temperature, WaterFeed::liquid));
}

double thermoneutral_voltage_lhv(double temperature) {
    return thermoneutral_voltage(water_splitting(temperature, WaterFeed::steam));
}

double wet_gas_partial_pressure(double total_pressure, double temperature, double water_activity,
                                const char* what) {
    require_positive(total_pressure, what);
    require_within(water_activity, 0.0, 1.0, "water activity", "");
    const double p_vapour = water_activity * water_saturation_pressure(temperature);
    if (total_pressure <= p_vapour)
        throw Error(ErrorKind::out_of_range,
                    fmt::format("{} {:g} Pa is not above the water vapour pressure {:g} Pa at {:g} K: "
                                "the gas space would hold only steam",
                                what, total_pressure, p_vapour, temperature));
    return total_pressure - p_vapour;
}

double reversible_voltage_liquid_water(double temperature, double pressure_anode, double pressure_cathode,
                                       double water_activity) {
    require_positive(water_activity, "water activity");
    const double p_h2 = wet_gas_partial_pressure(pressure_cathode, temperature, water_activity, "cathode pressure");
    const double p_o2 = wet_gas_partial_pressure(pressure_anode, temperature, water_activity, "anode pressure");
    const double e0 = reversible_voltage_standard(water_splitting(temperature, WaterFeed::liquid));
    const double q = (p_h2 / kStandardPressure) * std::sqrt(p_o2 / kStandardPressure) / water_activity;
    return e0 + kGasConstant * temperature / (2.0 * kFaraday) * std::log(q);
}

double reversible_voltage_steam(double temperature, double p_h2, double p_h2o, double p_o2) {
    require_positive(p_h2, "hydrogen partial pressure");
    require_positive(p_h2o, "steam partial pressure");
    require_positive(p_o2, "oxygen partial pressure");
    const double e0 = reversible_voltage_standard(water_splitting(temperature, WaterFeed::steam));
    const double q = (p_h2 / kStandardPressure) * std::sqrt(p_o2 / kStandardPressure) / (p_h2o / kStandardPressure);
    return e0 + kGasConstant * temperature / (2.0 * kFaraday) * std::log(q);
}

double reversible_voltage_brine(double temperature, double p_cl2, double p_h2, double activity_naoh,
                                double activity_nacl, double water_activity_catholyte) {
    require_positive(p_cl2, "chlorine partial pressure");
    require_positive(p_h2, "hydrogen partial pressure");
    require_positive(activity_naoh, "NaOH activity");
    require_positive(activity_nacl, "NaCl activity");
    require_positive(water_activity_catholyte, "catholyte water activity");
    const double e0 = reversible_voltage_standard(brine_electrolysis(temperature));
    const double q = (p_cl2 / kStandardPressure) * (p_h2 / kStandardPressure) * activity_naoh * activity_naoh /
                     (activity_nacl * activity_nacl * water_activity_catholyte * water_activity_catholyte);
    return e0 + kGasConstant * temperature / (2.0 * kFaraday) * std::log(q);
}

}  // namespace ely
