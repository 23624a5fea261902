#include "thermo/if97.hpp"

#include <array>
#include <cmath>
#include <cstddef>
#include <fmt/format.h>

#include "base/check.hpp"
#include "base/error.hpp"
#include "thermo/thermo_kernels.hpp"

namespace ely::if97 {
namespace {

constexpr double kR = kSpecificGasConstant;
constexpr double kRoundOff = 1e-9;  // relative tolerance on the p_sat and p_B23 limits

constexpr double kTmin = 273.15;       // K
constexpr double kT13 = 623.15;        // K, upper limit of region 1, start of B23
constexpr double kT2B23 = 863.15;      // K, upper end of the B23 line
constexpr double kTmax2 = 1073.15;     // K, upper limit of region 2
constexpr double kPmax = 100e6;        // Pa
constexpr double kPsatMin = 611.213;   // Pa, p_sat at 273.15 K (lower limit of eq. 31)

// Dimensionless Gibbs free energy and the derivatives the properties need.
struct Gamma {
    double g, g_pi, g_tau, g_tautau;
};

// ---------------------------------------------------------------------------------------
// Region 1: IAPWS R7-97(2012), eq. 7, Table 2 (thermo_kernels.hpp): the temperature part of the sums
// grouped by the exponent I, then the pressure part.

using kernel::kRegion1Pressure;
using kernel::kRegion1Temperature;
using Term = Region1Term;  // {I, J, n}

// ---------------------------------------------------------------------------------------
// Region 2: IAPWS R7-97(2012), eqs. 15-17, Tables 10 and 11; p* = 1 MPa, T* = 540 K.

constexpr double kP2 = 1e6;
constexpr double kT2 = kernel::kRegion2Temperature;

// IAPWS R7-97(2012), Table 11: residual part gamma^r, eq. 17.
constexpr std::array<Term, 43> kRegion2Residual{{
    {1, 0, -0.17731742473213e-2},   {1, 1, -0.17834862292358e-1},   {1, 2, -0.45996013696365e-1},
    {1, 3, -0.57581259083432e-1},   {1, 6, -0.50325278727930e-1},   {2, 1, -0.33032641670203e-4},
    {2, 2, -0.18948987516315e-3},   {2, 4, -0.39392777243355e-2},   {2, 7, -0.43797295650573e-1},
    {2, 36, -0.26674547914087e-4},  {3, 0, 0.20481737692309e-7},    {3, 1, 0.43870667284435e-6},
    {3, 3, -0.32277677238570e-4},   {3, 6, -0.15033924542148e-2},   {3, 35, -0.40668253562649e-1},
    {4, 1, -0.78847309559367e-9},   {4, 2, 0.12790717852285e-7},    {4, 3, 0.48225372718507e-6},
    {5, 7, 0.22922076337661e-5},    {6, 3, -0.16714766451061e-10},  {6, 16, -0.21171472321355e-2},
    {6, 35, -0.23895741934104e2},   {7, 0, -0.59059564324270e-17},  {7, 11, -0.12621808899101e-5},
    {7, 25, -0.38946842435739e-1},  {8, 8, 0.11256211360459e-10},   {8, 36, -0.82311340897998e1},
    {9, 13, 0.19809712802088e-7},   {10, 4, 0.10406965210174e-18},  {10, 10, -0.10234747095929e-12},
    {10, 14, -0.10018179379511e-8}, {16, 29, -0.80882908646985e-10}, {16, 50, 0.10693031879409},
    {18, 57, -0.33662250574171},    {20, 20, 0.89185845355421e-24}, {20, 35, 0.30629316876232e-12},
    {20, 48, -0.42002467698208e-5}, {21, 21, -0.59056029685639e-25}, {22, 53, 0.37826947613457e-5},
    {23, 39, -0.12768608934681e-14}, {24, 26, 0.73087610595061e-28}, {24, 40, 0.55414715350778e-16},
    {24, 58, -0.94369707241210e-6},
}};

constexpr int kRegion2MaxI = 24;
constexpr int kRegion2MaxJ = 58;

// gamma^o(pi, tau) = ln pi + sum n^o tau^J^o, eq. 16, with its derivatives (IAPWS R7-97(2012),
// Table 13; sums in thermo_kernels.hpp). g_pi is 1/pi; callers use pi*g_pi = 1 directly.
Gamma region2_ideal_gamma(double pi, double tau) {
    const auto o = kernel::region2_ideal_sums(tau);
    return {std::log(pi) + o.g, 1.0 / pi, o.g_tau, o.g_tautau};
}

// gamma^r(pi, tau) = sum n pi^I (tau - 0.5)^J, eq. 17, with its derivatives
// (IAPWS R7-97(2012), Table 14). With t = n pi^I y^J (y = tau - 0.5):
// gamma^r_pi = sum(I t)/pi, returned here as pi*gamma^r_pi = sum(I t) to avoid the
// division at small pi; gamma^r_tau = sum(J t)/y, gamma^r_tautau = sum(J (J-1) t)/y^2.
Gamma region2_residual_gamma_pi_scaled(double pi, double tau) {
    const double y = tau - 0.5;  // >= 0.0032 for T <= 1073.15 K
    const auto ppi = kernel::powers<kRegion2MaxI + 1>(pi);
    const auto py = kernel::powers<kRegion2MaxJ + 1>(y);
    double g = 0.0, si = 0.0, sj = 0.0, sjj = 0.0;
    for (const Term& t : kRegion2Residual) {
        const double term = t.n * ppi[static_cast<std::size_t>(t.I)] * py[static_cast<std::size_t>(t.J)];
        g += term;
        si += t.I * term;
        sj += t.J * term;
        sjj += t.J * (t.J - 1) * term;
    }
    return {g, si, sj / y, sjj / (y * y)};
}

State region2_state(double T, double p, bool with_residual) {
    const double pi = p / kP2;
    const double tau = kT2 / T;
    const Gamma o = region2_ideal_gamma(pi, tau);
    Gamma r{0.0, 0.0, 0.0, 0.0};  // r.g_pi holds pi * gamma^r_pi
    if (with_residual) r = region2_residual_gamma_pi_scaled(pi, tau);
    const double RT = kR * T;
    State st{};
    st.v = (1.0 + r.g_pi) * RT / p;  // pi*gamma^o_pi = 1
    st.h = tau * (o.g_tau + r.g_tau) * RT;
    st.u = st.h - p * st.v;
    st.s = (tau * (o.g_tau + r.g_tau) - (o.g + r.g)) * kR;
    st.cp = -tau * tau * (o.g_tautau + r.g_tautau) * kR;
    return st;
}

// ---------------------------------------------------------------------------------------
// Region 4: IAPWS R7-97(2012), eqs. 28-31, Table 34.

double saturation_pressure_unchecked(double T) { return kernel::saturation_pressure_eq30(T); }

// ---------------------------------------------------------------------------------------
// B23 boundary: IAPWS R7-97(2012), eq. 5 (n1..n3 of Table 1).

constexpr double kN23[4] = {0.0, 0.34805185628969e3, -0.11671859879975e1, 0.10192970039326e-2};

double boundary23_pressure_unchecked(double T) {
    return (kN23[1] + (kN23[2] + kN23[3] * T) * T) * 1e6;
}

}  // namespace

// ---------------------------------------------------------------------------------------

double saturation_pressure(double temperature) {
    constexpr const char* where = "IF97 region 4";
    require_positive(temperature, {where, "temperature"}, "K");
    require_at_least(temperature, kTmin, {where, "temperature"}, "K");
    require_at_most(temperature, kCriticalTemperature, {where, "temperature"}, "K");
    return saturation_pressure_unchecked(temperature);
}

double saturation_temperature(double pressure) {
    constexpr const char* where = "IF97 region 4";
    require_positive(pressure, {where, "pressure"}, "Pa");
    require_at_least(pressure, kPsatMin, {where, "pressure"}, "Pa");
    require_at_most(pressure, kCriticalPressure, {where, "pressure"}, "Pa");
    const double* n = kernel::kN4;
    const double beta = std::sqrt(std::sqrt(pressure / 1e6));  // eq. 29a
    const double E = (beta + n[3]) * beta + n[6];
    const double F = (n[1] * beta + n[4]) * beta + n[7];
    const double G = (n[2] * beta + n[5]) * beta + n[8];
    const double D = 2.0 * G / (-F - std::sqrt(F * F - 4.0 * E * G));
    const double s = n[10] + D;
    return 0.5 * (s - std::sqrt(s * s - 4.0 * (n[9] + n[10] * D)));  // eq. 31
}

double boundary23_pressure(double temperature) {
    constexpr const char* where = "IF97 B23 boundary";
    require_positive(temperature, {where, "temperature"}, "K");
    require_at_least(temperature, kT13, {where, "temperature"}, "K");
    require_at_most(temperature, kT2B23, {where, "temperature"}, "K");
    return boundary23_pressure_unchecked(temperature);
}

State region1(double temperature, double pressure) {
    constexpr const char* where = "IF97 region 1";
    require_positive(temperature, {where, "temperature"}, "K");
    require_positive(pressure, {where, "pressure"}, "Pa");
    require_at_least(temperature, kTmin, {where, "temperature"}, "K");
    require_at_most(temperature, kT13, {where, "temperature"}, "K");
    require_at_most(pressure, kPmax, {where, "pressure"}, "Pa");
    const double p_sat = saturation_pressure_unchecked(temperature);
    if (pressure < p_sat * (1.0 - kRoundOff))
        throw Error(ErrorKind::out_of_range,
                    fmt::format("{}: pressure {} Pa is below the limit {:.9g} Pa, the saturation pressure at {} K",
                                where, pressure, p_sat, temperature));

    const double T = temperature, p = pressure;
    const double pi = p / kRegion1Pressure;
    const double tau = kRegion1Temperature / T;  // as region1_temperature computes it
    const auto gamma = kernel::region1_gamma(kernel::region1_temperature(T, true), pi, true);
    const Gamma g{gamma.g, gamma.g_pi, gamma.g_tau, gamma.g_tautau};
    const double RT = kR * T;
    State st{};
    st.v = pi * g.g_pi * RT / p;
    st.h = tau * g.g_tau * RT;
    st.u = st.h - p * st.v;
    st.s = (tau * g.g_tau - g.g) * kR;
    st.cp = -tau * tau * g.g_tautau * kR;
    return st;
}

State region2(double temperature, double pressure) {
    constexpr const char* where = "IF97 region 2";
    require_positive(temperature, {where, "temperature"}, "K");
    require_positive(pressure, {where, "pressure"}, "Pa");
    require_at_least(temperature, kTmin, {where, "temperature"}, "K");
    require_at_most(temperature, kTmax2, {where, "temperature"}, "K");
    if (temperature <= kT13) {
        const double p_sat = saturation_pressure_unchecked(temperature);
        if (pressure > p_sat * (1.0 + kRoundOff))
            throw Error(ErrorKind::out_of_range,
                        fmt::format("{}: pressure {} Pa is above the limit {:.9g} Pa, the saturation pressure at {} K",
                                    where, pressure, p_sat, temperature));
    } else if (temperature <= kT2B23) {
        const double p_b23 = boundary23_pressure_unchecked(temperature);
        if (pressure > p_b23 * (1.0 + kRoundOff))
            throw Error(ErrorKind::out_of_range,
                        fmt::format("{}: pressure {} Pa is above the limit {:.9g} Pa, the B23 boundary pressure at {} K",
                                    where, pressure, p_b23, temperature));
    } else {
        require_at_most(pressure, kPmax, {where, "pressure"}, "Pa");
    }
    return region2_state(temperature, pressure, true);
}

State region2_ideal_gas(double temperature, double pressure) {
    constexpr const char* where = "IF97 region 2 ideal gas";
    require_positive(temperature, {where, "temperature"}, "K");
    require_positive(pressure, {where, "pressure"}, "Pa");
    require_at_least(temperature, kTmin, {where, "temperature"}, "K");
    require_at_most(temperature, kTmax2, {where, "temperature"}, "K");
    return region2_state(temperature, pressure, false);
}

}  // namespace ely::if97
