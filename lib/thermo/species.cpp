#include "thermo/species.hpp"

#include <cmath>
#include <fmt/format.h>

#include "base/check.hpp"
#include "thermo/constants.hpp"
#include "thermo/if97.hpp"
#include "thermo/thermo_kernels.hpp"
#include "thermo/water.hpp"

namespace ely {
namespace {

// NIST Chemistry WebBook (Chase, NIST-JANAF Thermochemical Tables, 4th ed., 1998),
// Shomate form with t = T/1000 (ShomateCoefficients, thermo_kernels.hpp):
//   cp = A + B t + C t² + D t³ + E/t²                       J/(mol K)
//   h − h298 = A t + B t²/2 + C t³/3 + D t⁴/4 − E/t + F − H  kJ/mol
//   s = A ln t + B t + C t²/2 + D t³/3 − E/(2t²) + G         J/(mol K)
using Shomate = ShomateCoefficients;

// Each species: up to two adjacent ranges. Water vapour has no published fit below 500 K.
struct SpeciesData {
    const char* name;
    double molar_mass;
    double formation_enthalpy;  // J/mol at 298.15 K
    int n;
    Shomate fit[2];
};

constexpr SpeciesData kData[kSpeciesCount] = {
    {"H2", molar_mass::H2, 0.0, 2,
     {{298.0, 1000.0, 33.066178, -11.363417, 11.432816, -2.772874, -0.158558, -9.980797, 172.707974, 0.0},
      {1000.0, 2500.0, 18.563083, 12.257357, -2.859786, 0.268238, 1.977990, -1.147438, 156.288133, 0.0}}},
    {"O2", molar_mass::O2, 0.0, 2,
     {{100.0, 700.0, 31.32234, -20.23531, 57.86644, -36.50624, -0.007374, -8.903471, 246.7945, 0.0},
      {700.0, 2000.0, 30.03235, 8.772972, -3.988133, 0.788313, -0.741599, -11.32468, 236.1663, 0.0}}},
    {"N2", molar_mass::N2, 0.0, 2,
     {{100.0, 500.0, 28.98641, 1.853978, -9.647459, 16.63537, 0.000117, -8.671914, 226.4168, 0.0},
      {500.0, 2000.0, 19.50583, 19.88705, -8.598535, 1.369784, 0.527601, -4.935202, 212.3900, 0.0}}},
    {"Cl2", molar_mass::Cl2, 0.0, 2,
     {{298.0, 1000.0, 33.05060, 12.22940, -12.06510, 4.385330, -0.159494, -10.83480, 259.0290, 0.0},
      {1000.0, 3000.0, 42.67730, -5.009570, 1.904621, -0.165641, -2.098480, -17.28980, 269.8400, 0.0}}},
    {"H2O(g)", molar_mass::H2O, kWaterVapourFormationEnthalpy, 1,
     {{500.0, 1700.0, 30.09200, 6.832514, 6.793435, -2.534480, 0.082139, -250.8810, 223.3967, -241.8264},
      {0, 0, 0, 0, 0, 0, 0, 0, 0, 0}}},
};

// The published ranges start at 298 K for H2 and Cl2; 298.15 K, where the tables are
// anchored, is inside them. Temperatures are accepted from the lowest bound of the first
// range to the highest bound of the last (no extrapolation).
MolarProperties from_shomate(const Shomate& c, double formation_enthalpy, double temperature) {
    const double t = temperature / 1000.0;
    MolarProperties p{};
    p.cp = kernel::shomate_heat_capacity(c, t);
    // The table's H term is ΔfH° in kJ/mol; (h − h298) + ΔfH° puts h on the elements' reference.
    p.enthalpy = kernel::shomate_enthalpy(c, formation_enthalpy, t);
    p.entropy = kernel::shomate_entropy(c, t, std::log(t));
    p.gibbs = p.enthalpy - temperature * p.entropy;
    return p;
}

// Water vapour below 500 K: the ideal-gas part of IAPWS-IF97 region 2 (IAPWS R7-97(2012),
// eq. 16, Table 10) is ideal-gas steam; it is anchored to the CODATA key values
// ΔfH°(H2O, g) = −241.826 kJ/mol and S°(H2O, g) = 188.835 J/(mol K) at 298.15 K
// (Cox, Wagman & Medvedev 1989).
constexpr double kWaterVapourLowLimit = 273.15;

MolarProperties water_vapour_low(double temperature) {
    const double M = molar_mass::H2O;
    static const auto ref = if97::region2_ideal_gas(kStandardTemperature, kStandardPressure);
    const auto st = if97::region2_ideal_gas(temperature, kStandardPressure);
    MolarProperties p{};
    p.cp = M * st.cp;
    p.enthalpy = kWaterVapourFormationEnthalpy + M * (st.h - ref.h);
    p.entropy = kWaterVapourEntropy298 + M * (st.s - ref.s);
    p.gibbs = p.enthalpy - temperature * p.entropy;
    return p;
}

// Aqueous solutes at 298.15 K, 1 mol/kg: ΔfH° J/mol, S° J/(mol K), Cp° J/(mol K)
// (NBS tables, Wagman et al. 1982; from memory). Cp° is taken as constant: the difference
// NaOH − NaCl (that is OH⁻ − Cl⁻), the only one that enters the cell reaction, changes
// little with temperature below 100 °C.
struct SoluteData {
    double formation_enthalpy, entropy, cp, molar_mass;
};
constexpr SoluteData kSolutes[2] = {
    {-407270.0, 115.5, -90.0, molar_mass::NaCl},
    {-470114.0, 48.1, -102.1, molar_mass::NaOH},
};
constexpr double kSoluteTemperatureLow = 273.15, kSoluteTemperatureHigh = 473.15;

}  // namespace

MolarProperties aqueous_solute(Solute solute, double temperature) {
    require_within(temperature, kSoluteTemperatureLow, kSoluteTemperatureHigh, "aqueous solute: temperature", "K");
    const auto& d = kSolutes[static_cast<int>(solute)];
    MolarProperties p{};
    p.cp = d.cp;
    p.enthalpy = d.formation_enthalpy + d.cp * (temperature - kStandardTemperature);
    p.entropy = d.entropy + d.cp * std::log(temperature / kStandardTemperature);
    p.gibbs = p.enthalpy - temperature * p.entropy;
    return p;
}

double solute_molar_mass(Solute solute) { return kSolutes[static_cast<int>(solute)].molar_mass; }

const char* species_name(Species species) { return kData[static_cast<int>(species)].name; }

const ShomateCoefficients& shomate_fit(Species species, double temperature) {
    const auto& d = kData[static_cast<int>(species)];
    return (d.n == 2 && temperature > d.fit[0].t_hi) ? d.fit[1] : d.fit[0];
}

double formation_enthalpy(Species species) { return kData[static_cast<int>(species)].formation_enthalpy; }

double species_molar_mass(Species species) { return kData[static_cast<int>(species)].molar_mass; }

TemperatureRange ideal_gas_range(Species species) {
    const auto& d = kData[static_cast<int>(species)];
    if (species == Species::water_vapour) return {kWaterVapourLowLimit, d.fit[0].t_hi};
    return {d.fit[0].t_lo, d.fit[d.n - 1].t_hi};
}

MolarProperties ideal_gas(Species species, double temperature) {
    const auto& d = kData[static_cast<int>(species)];
    const auto range = ideal_gas_range(species);
    require_finite(temperature, "temperature");
    if (temperature < range.lo || temperature > range.hi)
        throw Error(ErrorKind::out_of_range,
                    fmt::format("{} ideal-gas properties: temperature {:g} K is outside the valid range "
                                "{:g}..{:g} K of the NIST Shomate fit",
                                d.name, temperature, range.lo, range.hi));
    if (species == Species::water_vapour && temperature < d.fit[0].t_lo) return water_vapour_low(temperature);
    return from_shomate(shomate_fit(species, temperature), d.formation_enthalpy, temperature);
}

}  // namespace ely
