#pragma once
// The thermodynamic functions the model evaluates at every point, written once over a number type V
// (base/lanes.hpp): double for one point, a SIMD batch for a batch of points. if97.cpp, species.cpp,
// water.cpp and reaction.cpp compute through them, with their checks and memos around them; the
// batch kernels call them directly. No checks here: callers make sure the inputs are inside the
// validity range (the scalar functions throw outside it; the batch hands such points to them).
//
// Sources: IAPWS R7-97(2012) (IAPWS-IF97) eqs. 7, 16, 30 and Tables 2, 10, 34; NIST Chemistry
// WebBook Shomate equations (Chase, NIST-JANAF Thermochemical Tables, 4th ed., 1998).
#include <array>
#include <cstddef>

#include "base/lanes.hpp"
#include "thermo/constants.hpp"

namespace ely {
/// A term n·x^I·y^J of an IF97 sum.
struct Region1Term {
    int I, J;
    double n;
};

/// NIST Shomate coefficients of one temperature range (K):
/// cp = A + B t + C t² + D t³ + E/t², h − h298 = A t + B t²/2 + C t³/3 + D t⁴/4 − E/t + F − H (kJ/mol),
/// s = A ln t + B t + C t²/2 + D t³/3 − E/(2t²) + G, t = T/1000.
struct ShomateCoefficients {
    double t_lo, t_hi;
    double A, B, C, D, E, F, G, H;
};
/// The constants the molar kernels (water and water splitting) take from the scalar thermodynamics (water.cpp,
/// species.cpp): the anchors of liquid water and water vapour and the Shomate fits of the gases
/// below 500 K (the ranges a liquid-water cell works in).
struct WaterThermoData {
    double liquid_formation_enthalpy, liquid_entropy_298;  // J/mol, J/(mol K)
    double region1_h_ref, region1_s_ref;                  // IF97 region 1 at 298.15 K, p°: J/kg, J/(kg K)
    double vapour_formation_enthalpy;                     // J/mol
    double region2_ideal_h_ref;                           // IF97 region 2 ideal gas at 298.15 K: J/kg
    const ShomateCoefficients* hydrogen;
    const ShomateCoefficients* oxygen;
    const ShomateCoefficients* nitrogen;
    const ShomateCoefficients* water_vapour;  // 500 K and above
};

/// Fills them (water.cpp).
WaterThermoData water_thermo_data();
}  // namespace ely

ELY_KERNEL_BEGIN
namespace kernel {

// Fills pw[k] = x^k for k = 0..N-1 by repeated multiplication: the integer powers of IF97 without pow.
template <std::size_t N, class V>
inline std::array<V, N> powers(const V& x) {
    std::array<V, N> pw;  // every element assigned below (no zeroing: this runs at every point)
    pw[0] = V(1.0);
    for (std::size_t k = 1; k < N; ++k) pw[k] = pw[k - 1] * x;
    return pw;
}

// ---- IAPWS-IF97 region 4: saturation pressure, eq. 30 (Table 34) ---------------------------------
inline constexpr double kN4[11] = {
    0.0,  // index 0 unused so that kN4[i] is n_i of Table 34
    0.11670521452767e4,  -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5,
    -0.32325550322333e7, 0.14915108613530e2,  -0.48232657361591e4, 0.40511340542057e6,
    -0.23855557567849,   0.65017534844798e3,
};

/// p_sat(T), Pa; 273.15 K <= T <= 647.096 K.
template <class V>
inline V saturation_pressure_eq30(const V& T) {
    const double* n = kN4;
    const V theta = T + n[9] / (T - n[10]);  // eq. 29b
    const V A = (theta + n[1]) * theta + n[2];
    const V B = (n[3] * theta + n[4]) * theta + n[5];
    const V C = (n[6] * theta + n[7]) * theta + n[8];
    const V q = 2.0 * C / (-B + lanes::sqrt(B * B - 4.0 * A * C));  // eq. 30
    const V q2 = q * q;
    return q2 * q2 * 1e6;
}

// ---- IAPWS-IF97 region 1 (compressed liquid), eq. 7, Table 2; p* = 16.53 MPa, T* = 1386 K ---------
inline constexpr double kRegion1Pressure = 16.53e6;
inline constexpr double kRegion1Temperature = 1386.0;

// IAPWS R7-97(2012), Table 2 (sorted by I, as published).
inline constexpr std::array<Region1Term, 34> kRegion1{{
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
inline constexpr int kRegion1Groups = 13;  // distinct exponents I of Table 2
inline constexpr int kRegion1MaxI = 32;
inline constexpr int kRegion1MaxJ = 17;
inline constexpr int kRegion1MinJ = -41;

/// The part of eq. 7 that depends on the temperature alone: with y = tau - 1.222 and the terms grouped
/// by their exponent I, the sums over each group of n y^J, n J y^J and n J (J-1) y^J. A batch at one
/// temperature computes it once; the pressure part (region1_sums) is a short sum over the 13 groups.
template <class V>
struct Region1Temperature {
    V temperature, tau, y;
    std::array<int, kRegion1Groups> I{};
    std::array<V, kRegion1Groups> p, d, dd;  // each group's set to zero where the group starts
};

/// At T (K); dd is filled only with second_derivative (for cp).
template <class V>
inline Region1Temperature<V> region1_temperature(const V& temperature, bool second_derivative) {
    Region1Temperature<V> t;
    t.temperature = temperature;
    t.tau = kRegion1Temperature / temperature;
    t.y = t.tau - 1.222;  // >= 1.0 for T <= 623.15 K
    // The powers of Table 2 only, by short chains of products (a chain of 41 products is 41 latencies).
    // Only the powers Table 2 uses are assigned and read (no zeroing of the rest: this runs at every point).
    std::array<V, kRegion1MaxJ + 1> py;
    std::array<V, -kRegion1MinJ + 1> pyinv;
    {
        const V y = t.y, r = V(1.0) / t.y;
        py[0] = V(1.0), py[1] = y, py[2] = y * y, py[3] = py[2] * y, py[4] = py[2] * py[2];
        py[5] = py[4] * y, py[6] = py[3] * py[3], py[10] = py[5] * py[5], py[17] = py[10] * (py[6] * y);
        V* n = pyinv.data();
        n[1] = r, n[2] = r * r, n[3] = n[2] * r, n[4] = n[2] * n[2], n[5] = n[4] * r, n[6] = n[3] * n[3];
        n[7] = n[4] * n[3], n[8] = n[4] * n[4], n[9] = n[8] * r, n[11] = n[8] * n[3];
        const V n18 = n[9] * n[9];
        n[29] = n18 * n[11], n[31] = n18 * (n[11] * n[2]), n[38] = n[29] * n[9], n[39] = n[29] * (n[9] * r);
        n[40] = n[29] * n[11], n[41] = n[31] * (n[5] * n[5]);
    }
    int g = -1, last = -1;
#if defined(__clang__)
#pragma unroll
#elif defined(__GNUC__)
#pragma GCC unroll 34
#endif
    for (const Region1Term& term : kRegion1) {
        if (term.I != last) {
            ++g;
            last = term.I;
            t.I[static_cast<std::size_t>(g)] = term.I;
            t.p[static_cast<std::size_t>(g)] = t.d[static_cast<std::size_t>(g)] = t.dd[static_cast<std::size_t>(g)] = V(0.0);
        }
        const auto k = static_cast<std::size_t>(g);
        const V yj = term.J >= 0 ? py[static_cast<std::size_t>(term.J)] : pyinv[static_cast<std::size_t>(-term.J)];
        const V ny = term.n * yj;
        t.p[k] = t.p[k] + ny;
        t.d[k] = t.d[k] + static_cast<double>(term.J) * ny;
        if (second_derivative) t.dd[k] = t.dd[k] + static_cast<double>(term.J * (term.J - 1)) * ny;
    }
    return t;
}

/// gamma and the sums behind its derivatives (IAPWS R7-97(2012), Table 4) at x = 7.1 - pi:
/// gamma = sum x^I p_I, gamma_pi = -sum(I x^I p_I)/x, gamma_tau = sum(x^I d_I)/y,
/// gamma_tautau = sum(x^I dd_I)/y^2.
template <class V>
struct Region1Gamma {
    V g, g_pi, g_tau, g_tautau;
};

template <class V, class W>
inline Region1Gamma<V> region1_gamma(const Region1Temperature<W>& t, const V& pi, bool all) {
    const V x = 7.1 - pi;  // >= 1.05 for p <= 100 MPa
    // The exponents I of Table 2 (0..5, 8, 21, 23, 29..32) by short chains of products.
    std::array<V, kRegion1MaxI + 1> px;  // only the exponents of Table 2 are assigned and read
    px[0] = V(1.0), px[1] = x, px[2] = x * x, px[3] = px[2] * x, px[4] = px[2] * px[2], px[5] = px[4] * x;
    px[8] = px[4] * px[4];
    const V x16 = px[8] * px[8];
    px[21] = x16 * px[5], px[23] = x16 * (px[5] * px[2]), px[29] = x16 * (px[8] * px[5]), px[30] = x16 * (px[8] * (px[5] * x));
    px[31] = x16 * (px[8] * (px[5] * px[2])), px[32] = x16 * x16;
    V g(0.0), si(0.0), sj(0.0), sjj(0.0);
    for (std::size_t k = 0; k < static_cast<std::size_t>(kRegion1Groups); ++k) {
        const V xi = px[static_cast<std::size_t>(t.I[k])];
        const V xp = xi * t.p[k];
        g = g + xp;
        sj = sj + xi * t.d[k];
        if (all) {
            si = si + static_cast<double>(t.I[k]) * xp;
            sjj = sjj + xi * t.dd[k];
        }
    }
    const V y = V(t.y);
    return {g, -si / x, sj / y, sjj / (y * y)};
}

/// Specific enthalpy, J/kg, and entropy, J/(kg K), of region 1 (IAPWS R7-97(2012), Table 3).
inline constexpr double kWaterGasConstant = 461.526;  // J/(kg K), IAPWS R7-97(2012) eq. 1

template <class V, class W>
inline V region1_enthalpy(const Region1Temperature<W>& t, const V& pressure) {
    const auto g = region1_gamma(t, pressure / kRegion1Pressure, false);
    return t.tau * g.g_tau * (kWaterGasConstant * t.temperature);
}

template <class V>
struct EnthalpyEntropy {
    V enthalpy, entropy;
};

template <class V, class W>
inline EnthalpyEntropy<V> region1_enthalpy_entropy(const Region1Temperature<W>& t, const V& pressure) {
    const auto g = region1_gamma(t, pressure / kRegion1Pressure, false);
    return {t.tau * g.g_tau * (kWaterGasConstant * t.temperature), (t.tau * g.g_tau - g.g) * kWaterGasConstant};
}

// ---- IAPWS-IF97 region 2, ideal-gas part, eq. 16, Table 10; p* = 1 MPa, T* = 540 K ----------------
inline constexpr double kRegion2Temperature = 540.0;
inline constexpr std::array<Region1Term, 9> kRegion2Ideal{{
    {0, 0, -0.96927686500217e1}, {0, 1, 0.10086655968018e2},  {0, -5, -0.56087911283020e-2},
    {0, -4, 0.71452738081455e-1}, {0, -3, -0.40710498223928}, {0, -2, 0.14240819171444e1},
    {0, -1, -0.43839511319450e1}, {0, 2, -0.28408632460772},  {0, 3, 0.21268463753307e-1},
}};

/// Sums of gamma^o over Table 10 at tau (gamma^o = ln pi + g): g = sum n tau^J, gamma^o_tau = sj/tau,
/// gamma^o_tautau = sjj/tau^2.
template <class V>
struct Region2IdealSums {
    V g, g_tau, g_tautau;
};

template <class V>
inline Region2IdealSums<V> region2_ideal_sums(const V& tau) {
    const V inv = V(1.0) / tau;
    const auto pt = powers<4>(tau);
    const auto pinv = powers<6>(inv);
    V g(0.0), sj(0.0), sjj(0.0);
    for (const Region1Term& t : kRegion2Ideal) {
        const V tj = t.J >= 0 ? pt[static_cast<std::size_t>(t.J)] : pinv[static_cast<std::size_t>(-t.J)];
        const V term = t.n * tj;
        g = g + term;
        sj = sj + static_cast<double>(t.J) * term;
        sjj = sjj + static_cast<double>(t.J * (t.J - 1)) * term;
    }
    return {g, sj * inv, sjj * inv * inv};
}

// ---- NIST Shomate equations (ShomateCoefficients) -------------------------------------------------

/// Molar enthalpy J/mol on the elements' reference (formation enthalpy added), from t = T/1000.
template <class V>
inline V shomate_enthalpy(const ShomateCoefficients& c, double formation_enthalpy, const V& t) {
    const V t2 = t * t, t3 = t2 * t, t4 = t3 * t;
    return 1000.0 * (c.A * t + c.B * t2 / 2.0 + c.C * t3 / 3.0 + c.D * t4 / 4.0 - c.E / t + c.F - c.H) +
           formation_enthalpy;
}

/// Molar entropy J/(mol K) at p°, from t = T/1000 and ln t.
template <class V>
inline V shomate_entropy(const ShomateCoefficients& c, const V& t, const V& log_t) {
    const V t2 = t * t, t3 = t2 * t;
    return c.A * log_t + c.B * t + c.C * t2 / 2.0 + c.D * t3 / 3.0 - c.E / (2.0 * t2) + c.G;
}

/// Molar heat capacity J/(mol K).
template <class V>
inline V shomate_heat_capacity(const ShomateCoefficients& c, const V& t) {
    const V t2 = t * t, t3 = t2 * t;
    return c.A + c.B * t + c.C * t2 + c.D * t3 + c.E / t2;
}

// ---- Water and water splitting on the molar reference of thermo/species.hpp ------------------------
// (elements at 298.15 K and p° have h = 0; liquid water anchored at the CODATA key values, water.hpp)

/// Liquid water, J/mol, at the temperature of t and pressure p (p >= p_sat).
template <class V, class W>
inline V liquid_water_enthalpy(const WaterThermoData& d, const Region1Temperature<W>& t, const V& pressure) {
    return d.liquid_formation_enthalpy + molar_mass::H2O * (region1_enthalpy(t, pressure) - d.region1_h_ref);
}

/// Water vapour as an ideal gas below 500 K, J/mol: IAPWS-IF97 region 2, ideal-gas part.
template <class V>
inline V water_vapour_enthalpy_low(const WaterThermoData& d, const V& temperature) {
    const V tau = kRegion2Temperature / temperature;
    const auto o = region2_ideal_sums(tau);
    const V h = tau * (o.g_tau + 0.0) * (kWaterGasConstant * temperature);
    return d.vapour_formation_enthalpy + molar_mass::H2O * (h - d.region2_ideal_h_ref);
}

/// H2O(l) -> H2 + ½ O2, every species at p° (liquid water at p_sat where that is above p°): ΔH, ΔS.
template <class V>
inline EnthalpyEntropy<V> water_splitting_liquid(const WaterThermoData& d, const V& temperature) {
    const V t = temperature / 1000.0;
    const V log_t = lanes::log(t);
    const V h_h2 = shomate_enthalpy(*d.hydrogen, 0.0, t), s_h2 = shomate_entropy(*d.hydrogen, t, log_t);
    const V h_o2 = shomate_enthalpy(*d.oxygen, 0.0, t), s_o2 = shomate_entropy(*d.oxygen, t, log_t);
    const V pressure = lanes::max(V(kStandardPressure), saturation_pressure_eq30(temperature));
    const auto w = region1_enthalpy_entropy(region1_temperature(temperature, false), pressure);
    const V h_w = d.liquid_formation_enthalpy + molar_mass::H2O * (w.enthalpy - d.region1_h_ref);
    const V s_w = d.liquid_entropy_298 + molar_mass::H2O * (w.entropy - d.region1_s_ref);
    return {h_h2 + 0.5 * h_o2 - h_w, s_h2 + 0.5 * s_o2 - s_w};
}

}  // namespace kernel
ELY_KERNEL_END
