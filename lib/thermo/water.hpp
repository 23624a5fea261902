#pragma once
// Liquid water on the same molar reference as the gases (elements at 298.15 K and 1 bar:
// h includes ΔfH°). IAPWS-IF97 region 1 carries the temperature and pressure dependence;
// the CODATA key values (Cox, Wagman & Medvedev 1989) anchor it at 298.15 K and p°:
// ΔfH°(H2O, l) = −285.830 kJ/mol, S°(H2O, l) = 69.950 J/(mol K).
#include "thermo/species.hpp"

namespace ely {

inline constexpr double kLiquidWaterFormationEnthalpy = -285830.0;  // J/mol
inline constexpr double kLiquidWaterEntropy298 = 69.950;            // J/(mol K)
inline constexpr double kWaterVapourFormationEnthalpy = -241826.0;  // J/mol, ΔfH°(H2O, g), CODATA key value
inline constexpr double kWaterVapourEntropy298 = 188.835;            // J/(mol K), S°(H2O, g), CODATA key value

/// Liquid water at (T, p); p must be at or above the saturation pressure at T.
MolarProperties liquid_water(double temperature, double pressure);

/// Liquid water at T on the saturation line when p° is below p_sat(T) (above 372.76 K),
/// otherwise at p°: the state that stands for "liquid water at p°" in reaction data.
MolarProperties liquid_water_standard(double temperature);

/// Saturation pressure of water, Pa (IAPWS-IF97 eq. 30).
double water_saturation_pressure(double temperature);

}  // namespace ely
