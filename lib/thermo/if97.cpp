#include "thermo/if97.hpp"

#include <array>
#include <cmath>
#include <cstddef>
#include <fmt/format.h>

#include "base/check.hpp"
#include "base/error.hpp"

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

// Fills pw[k] = x^k for k = 0..N-1 by repeated multiplication.
template <std::size_t N>
std::array<double, N> powers(double x) {
    std::array<double, N> pw{};
    pw[0] = 1.0;
    for (std::size_t k = 1; k < N; ++k) pw[k] = pw[k - 1] * x;
    return pw;
}

// Dimensionless Gibbs free energy and the derivatives the properties need.
struct Gamma {
    double g, g_pi, g_tau, g_tautau;
};

// ---------------------------------------------------------------------------------------
// Region 1: IAPWS R7-97(2012), eq. 7, Table 2; p* = 16.53 MPa, T* = 1386 K.

constexpr double kP1 = 16.53e6;
constexpr double kT1 = 1386.0;

struct Term {
    int I, J;
    double n;
};

// IAPWS R7-97(2012), Table 2: coefficients and exponents of eq. 7.
constexpr std::array<Term, 34> kRegion1{{
    {0, -2, 0.14632971213167},     {0, -1, -0.84548187169114},    {0, 0, -0.37563603672040e1},
    {0, 1, 0.33855169168385e1},    {0, 2, -0.95791963387872},     {0, 3, 0.15772038513228},
    {0, 4, -0.16616417199501e-1},  {0, 5, 0.81214629983568e-3},   {1, -9, 0.28319080123804e-3},
    {1, -7, -0.60706301565874e-3}, {1, -1, -0.18990068218419e-1}, {1, 0, -0.32529748770505e-1},
    {1, 1, -0.21841717175414e-1},  {1, 3, -0.52838357969930e-4},  {2, -3, -0.47184321073267e-3},
    {2, 0, -0.30001780793026e-3},  {2, 1, 0.47661393906987e-4},   {2, 3, -0.44141845330846e-5},
    {2, 17, -0.72694996297594e-15}, {3, -4, -0.31679644845054e-4}, {3, 0, -0.28270797985312e-5},
    {3, 6, -0.85205128120103e-9},  {4, -5, -0.22425281908000e-5}, {4, -2, -0.65171222895601e-6},
    {4, 10, -0.14341729937924e-12}, {5, -8, -0.40516996860117e-6}, {8, -11, -0.12734301741641e-8},
    {8, -6, -0.17424871230634e-9}, {21, -29, -0.68762131295531e-18}, {23, -31, 0.14478307828521e-19},
    {29, -38, 0.26335781662795e-22}, {30, -39, -0.11947622640071e-22}, {31, -40, 0.18228094581404e-23},
    {32, -41, -0.93537087292458e-25},
}};

constexpr int kRegion1MaxI = 32;
constexpr int kRegion1MaxJ = 17;
constexpr int kRegion1MinJ = -41;

// gamma(pi, tau) = sum n (7.1 - pi)^I (tau - 1.222)^J, eq. 7, with its derivatives
// (IAPWS R7-97(2012), Table 4). With t = n x^I y^J (x = 7.1 - pi, y = tau - 1.222):
// gamma_pi = -sum(I t)/x, gamma_tau = sum(J t)/y, gamma_tautau = sum(J (J-1) t)/y^2.
Gamma region1_gamma(double pi, double tau) {
    const double x = 7.1 - pi;   // >= 1.05 for p <= 100 MPa
    const double y = tau - 1.222;  // >= 1.0 for T <= 623.15 K
    const auto px = powers<kRegion1MaxI + 1>(x);
    const auto py = powers<kRegion1MaxJ + 1>(y);
    const auto pyinv = powers<-kRegion1MinJ + 1>(1.0 / y);
    double g = 0.0, si = 0.0, sj = 0.0, sjj = 0.0;
    for (const Term& t : kRegion1) {
        const double yj = t.J >= 0 ? py[static_cast<std::size_t>(t.J)] : pyinv[static_cast<std::size_t>(-t.J)];
        const double term = t.n * px[static_cast<std::size_t>(t.I)] * yj;
        g += term;
        si += t.I * term;
        sj += t.J * term;
        sjj += t.J * (t.J - 1) * term;
    }
    return {g, -si / x, sj / y, sjj / (y * y)};
}

// ---------------------------------------------------------------------------------------
// Region 2: IAPWS R7-97(2012), eqs. 15-17, Tables 10 and 11; p* = 1 MPa, T* = 540 K.

constexpr double kP2 = 1e6;
constexpr double kT2 = 540.0;

// IAPWS R7-97(2012), Table 10: ideal-gas part gamma^o, eq. 16 (exponents J^o, n^o).
constexpr std::array<Term, 9> kRegion2Ideal{{
    {0, 0, -0.96927686500217e1},
    {0, 1, 0.10086655968018e2},
    {0, -5, -0.56087911283020e-2},
    {0, -4, 0.71452738081455e-1},
    {0, -3, -0.40710498223928},
    {0, -2, 0.14240819171444e1},
    {0, -1, -0.43839511319450e1},
    {0, 2, -0.28408632460772},
    {0, 3, 0.21268463753307e-1},
}};

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

// gamma^o(pi, tau) = ln pi + sum n^o tau^J^o, eq. 16, with its derivatives
// (IAPWS R7-97(2012), Table 13). g_pi is 1/pi; callers use pi*g_pi = 1 directly.
Gamma region2_ideal_gamma(double pi, double tau) {
    const double inv = 1.0 / tau;
    const auto pt = powers<4>(tau);
    const auto pinv = powers<6>(inv);
    double g = 0.0, sj = 0.0, sjj = 0.0;
    for (const Term& t : kRegion2Ideal) {
        const double tj = t.J >= 0 ? pt[static_cast<std::size_t>(t.J)] : pinv[static_cast<std::size_t>(-t.J)];
        const double term = t.n * tj;
        g += term;
        sj += t.J * term;
        sjj += t.J * (t.J - 1) * term;
    }
    return {std::log(pi) + g, 1.0 / pi, sj * inv, sjj * inv * inv};
}

// gamma^r(pi, tau) = sum n pi^I (tau - 0.5)^J, eq. 17, with its derivatives
// (IAPWS R7-97(2012), Table 14). With t = n pi^I y^J (y = tau - 0.5):
// gamma^r_pi = sum(I t)/pi, returned here as pi*gamma^r_pi = sum(I t) to avoid the
// division at small pi; gamma^r_tau = sum(J t)/y, gamma^r_tautau = sum(J (J-1) t)/y^2.
Gamma region2_residual_gamma_pi_scaled(double pi, double tau) {
    const double y = tau - 0.5;  // >= 0.0032 for T <= 1073.15 K
    const auto ppi = powers<kRegion2MaxI + 1>(pi);
    const auto py = powers<kRegion2MaxJ + 1>(y);
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

constexpr double kN4[11] = {
    0.0,  // index 0 unused so that kN4[i] is n_i of Table 34
    0.11670521452767e4,  -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5,
    -0.32325550322333e7, 0.14915108613530e2,  -0.48232657361591e4, 0.40511340542057e6,
    -0.23855557567849,   0.65017534844798e3,
};

double saturation_pressure_unchecked(double T) {
    const double* n = kN4;
    const double theta = T + n[9] / (T - n[10]);  // eq. 29b
    const double A = (theta + n[1]) * theta + n[2];
    const double B = (n[3] * theta + n[4]) * theta + n[5];
    const double C = (n[6] * theta + n[7]) * theta + n[8];
    const double q = 2.0 * C / (-B + std::sqrt(B * B - 4.0 * A * C));  // eq. 30
    const double q2 = q * q;
    return q2 * q2 * 1e6;
}

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
    const double* n = kN4;
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
    const double pi = p / kP1;
    const double tau = kT1 / T;
    const Gamma g = region1_gamma(pi, tau);
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
