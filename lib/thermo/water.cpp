#include "thermo/water.hpp"

#include <algorithm>

#include "thermo/constants.hpp"
#include "thermo/if97.hpp"
#include "thermo/thermo_kernels.hpp"

namespace ely {

MolarProperties liquid_water(double temperature, double pressure) {
    // A few entries of memo per thread (pure function; see water_splitting in reaction.cpp): the plant's
    // balance takes water at the feed temperature, the gas coolers' outlet and the stack temperature at
    // every point. The entry used longest ago is replaced, so that the feed's and the coolers' entries,
    // asked for at every point, stay while the stack temperature changes from point to point.
    constexpr int kEntries = 4;
    struct Memo {
        double t[kEntries] = {-1.0, -1.0, -1.0, -1.0}, p[kEntries] = {-1.0, -1.0, -1.0, -1.0};
        MolarProperties value[kEntries]{};
        unsigned long used[kEntries] = {0, 0, 0, 0};
        unsigned long clock = 0;
    };
    thread_local Memo memo;
    ++memo.clock;
    int next = 0;
    for (int k = 0; k < kEntries; ++k) {
        if (temperature == memo.t[k] && pressure == memo.p[k]) {
            memo.used[k] = memo.clock;
            return memo.value[k];
        }
        if (memo.used[k] < memo.used[next]) next = k;
    }
    const double M = molar_mass::H2O;
    static const auto ref = if97::region1(kStandardTemperature, kStandardPressure);
    const auto st = if97::region1(temperature, pressure);
    MolarProperties p{};
    p.cp = M * st.cp;
    p.enthalpy = kLiquidWaterFormationEnthalpy + M * (st.h - ref.h);
    p.entropy = kLiquidWaterEntropy298 + M * (st.s - ref.s);
    p.gibbs = p.enthalpy - temperature * p.entropy;
    memo.t[next] = temperature;
    memo.p[next] = pressure;
    memo.value[next] = p;
    memo.used[next] = memo.clock;
    return p;
}

MolarProperties liquid_water_standard(double temperature) {
    const double p_sat = if97::saturation_pressure(temperature);
    return liquid_water(temperature, std::max(kStandardPressure, p_sat));
}

double water_saturation_pressure(double temperature) { return if97::saturation_pressure(temperature); }

WaterThermoData water_thermo_data() {
    // The anchors liquid_water() and the ideal-gas water vapour below 500 K use (species.cpp), and the
    // gases' low-temperature Shomate fits (each reaches at least 500 K).
    const auto liquid = if97::region1(kStandardTemperature, kStandardPressure);
    WaterThermoData d{};
    d.liquid_formation_enthalpy = kLiquidWaterFormationEnthalpy;
    d.liquid_entropy_298 = kLiquidWaterEntropy298;
    d.region1_h_ref = liquid.h;
    d.region1_s_ref = liquid.s;
    d.vapour_formation_enthalpy = kWaterVapourFormationEnthalpy;
    d.region2_ideal_h_ref = if97::region2_ideal_gas(kStandardTemperature, kStandardPressure).h;
    d.hydrogen = &shomate_fit(Species::hydrogen, kStandardTemperature);
    d.oxygen = &shomate_fit(Species::oxygen, kStandardTemperature);
    d.nitrogen = &shomate_fit(Species::nitrogen, kStandardTemperature);
    d.water_vapour = &shomate_fit(Species::water_vapour, 500.0);
    return d;
}

}  // namespace ely
