#pragma once
// Physical constants and atomic weights. Everything in SI.
namespace ely {

// CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021); exact in the 2019 SI.
inline constexpr double kElementaryCharge = 1.602176634e-19;  // C
inline constexpr double kAvogadro = 6.02214076e23;            // 1/mol
inline constexpr double kBoltzmann = 1.380649e-23;            // J/K
inline constexpr double kFaraday = kElementaryCharge * kAvogadro;  // C/mol = 96485.33212...
inline constexpr double kGasConstant = kBoltzmann * kAvogadro;     // J/(mol K) = 8.314462618...

// Standard state: p° = 1 bar (IUPAC since 1982), not 1 atm.
inline constexpr double kStandardPressure = 1.0e5;     // Pa
inline constexpr double kStandardTemperature = 298.15;  // K
inline constexpr double kZeroCelsius = 273.15;          // K
inline constexpr double kNormalPressure = 101325.0;     // Pa, for "normal" gas volumes (0 °C, 1 atm)

// IUPAC standard atomic weights, conventional values (Meija et al., Pure Appl. Chem. 88,
// 265, 2016), in kg/mol. One pinned table: every molar mass in the project derives from it.
namespace atomic_weight {
inline constexpr double H = 1.008e-3;
inline constexpr double N = 14.007e-3;
inline constexpr double O = 15.999e-3;
inline constexpr double Na = 22.98976928e-3;
inline constexpr double Mg = 24.305e-3;
inline constexpr double S = 32.06e-3;
inline constexpr double Cl = 35.45e-3;
inline constexpr double K = 39.0983e-3;
inline constexpr double Zn = 65.38e-3;
}  // namespace atomic_weight

namespace molar_mass {
inline constexpr double H2 = 2 * atomic_weight::H;
inline constexpr double O2 = 2 * atomic_weight::O;
inline constexpr double N2 = 2 * atomic_weight::N;
inline constexpr double Cl2 = 2 * atomic_weight::Cl;
inline constexpr double H2O = 2 * atomic_weight::H + atomic_weight::O;
inline constexpr double NaCl = atomic_weight::Na + atomic_weight::Cl;
inline constexpr double NaOH = atomic_weight::Na + atomic_weight::O + atomic_weight::H;
inline constexpr double KOH = atomic_weight::K + atomic_weight::O + atomic_weight::H;
}  // namespace molar_mass

}  // namespace ely
