#pragma once
// IAPWS-IF97 (IAPWS R7-97(2012)): regions 1 (compressed liquid), 2 (vapour) and 4
// (saturation line) of ordinary water, with the B23 boundary equation.
// SI units throughout: K, Pa, m3/kg, J/kg, J/(kg K).
// Every function throws ely::Error (base/error.hpp): ErrorKind::invalid_argument for a
// NaN or infinite input or a non-positive temperature or pressure, ErrorKind::out_of_range
// for an input outside the validity range of the equation.
#include <string>

namespace ely::if97 {

constexpr double kSpecificGasConstant = 461.526;  // J/(kg K), IAPWS R7-97(2012) eq. 1
constexpr double kCriticalTemperature = 647.096;  // K, IAPWS R7-97(2012) eq. 2
constexpr double kCriticalPressure = 22.064e6;    // Pa, IAPWS R7-97(2012) eq. 3

/// Specific volume, enthalpy, entropy, internal energy and isobaric heat capacity.
struct State {
    double v, h, s, u, cp;
};

/// Saturation pressure, Pa (region 4, eq. 30); valid 273.15 K <= T <= 647.096 K.
double saturation_pressure(double temperature);

/// Saturation temperature, K (region 4, eq. 31); valid 611.213 Pa <= p <= 22.064 MPa.
double saturation_temperature(double pressure);

/// Compressed liquid (region 1, eq. 7); valid 273.15 K <= T <= 623.15 K and
/// p_sat(T) <= p <= 100 MPa (p_sat with a relative round-off tolerance of 1e-9).
State region1(double temperature, double pressure);

/// Vapour (region 2, eq. 15); valid 0 < p and
///   273.15 K <= T <= 623.15 K:  p <= p_sat(T),
///   623.15 K <  T <= 863.15 K:  p <= p_B23(T),
///   863.15 K <  T <= 1073.15 K: p <= 100 MPa
/// (the upper limits p_sat and p_B23 with a relative round-off tolerance of 1e-9).
State region2(double temperature, double pressure);

/// The ideal-gas part gamma^o of region 2 alone (eq. 16): ideal-gas steam;
/// valid 273.15 K <= T <= 1073.15 K, p > 0.
State region2_ideal_gas(double temperature, double pressure);

/// Pressure on the boundary between regions 2 and 3, Pa (eq. 5);
/// valid 623.15 K <= T <= 863.15 K.
double boundary23_pressure(double temperature);

}  // namespace ely::if97
