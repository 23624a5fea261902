#include "thermo/water.hpp"

#include <algorithm>

#include "thermo/constants.hpp"
#include "thermo/if97.hpp"

namespace ely {

MolarProperties liquid_water(double temperature, double pressure) {
    // One-entry memo per thread (pure function; see water_splitting in reaction.cpp).
    thread_local double memo_t = -1.0, memo_p = -1.0;
    thread_local MolarProperties memo{};
    if (temperature == memo_t && pressure == memo_p) return memo;
    const double M = molar_mass::H2O;
    static const auto ref = if97::region1(kStandardTemperature, kStandardPressure);
    const auto st = if97::region1(temperature, pressure);
    MolarProperties p{};
    p.cp = M * st.cp;
    p.enthalpy = kLiquidWaterFormationEnthalpy + M * (st.h - ref.h);
    p.entropy = kLiquidWaterEntropy298 + M * (st.s - ref.s);
    p.gibbs = p.enthalpy - temperature * p.entropy;
    memo_t = temperature;
    memo_p = pressure;
    memo = p;
    return p;
}

MolarProperties liquid_water_standard(double temperature) {
    const double p_sat = if97::saturation_pressure(temperature);
    return liquid_water(temperature, std::max(kStandardPressure, p_sat));
}

double water_saturation_pressure(double temperature) { return if97::saturation_pressure(temperature); }

}  // namespace ely
