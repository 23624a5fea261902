#pragma once
// Ideal-gas species properties on one enthalpy reference: the elements in their standard
// states at 298.15 K and p° = 1 bar have h = 0, so h includes the enthalpy of formation.
// Entropies are absolute (third law) at p°; gibbs = h − T·s.
namespace ely {

enum class Species { hydrogen, oxygen, nitrogen, chlorine, water_vapour };
inline constexpr int kSpeciesCount = 5;

struct MolarProperties {
    double cp;       // J/(mol K)
    double enthalpy; // J/mol
    double entropy;  // J/(mol K), at p°
    double gibbs;    // J/mol, at p°
};

struct TemperatureRange {
    double lo, hi;  // K
};

const char* species_name(Species species);
double species_molar_mass(Species species);  // kg/mol
TemperatureRange ideal_gas_range(Species species);

/// Properties at temperature T (K) and p°. Throws ely::Error (out_of_range) outside the
/// range of the published fit; water vapour below 500 K comes from the ideal-gas part of
/// IAPWS-IF97 region 2 anchored to the CODATA key values at 298.15 K.
MolarProperties ideal_gas(Species species, double temperature);

/// The Shomate coefficients that apply at T (the fit's range containing it; water vapour: 500 K and
/// above) and the formation enthalpy at 298.15 K, J/mol, for kernels that evaluate the fit themselves.
struct ShomateCoefficients;
const ShomateCoefficients& shomate_fit(Species species, double temperature);
double formation_enthalpy(Species species);

/// Aqueous solutes of the brine cell, standard state 1 mol/kg (ideal dilute).
enum class Solute { sodium_chloride, sodium_hydroxide };

/// Standard partial molar properties of an aqueous solute at T (298..473 K): NBS tables
/// (Wagman et al., J. Phys. Chem. Ref. Data 11, Suppl. 2, 1982; from memory), with a
/// constant partial molar heat capacity. Heats of dilution of concentrated solutions are
/// not included.
MolarProperties aqueous_solute(Solute solute, double temperature);
double solute_molar_mass(Solute solute);  // kg/mol

}  // namespace ely
