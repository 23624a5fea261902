// Proton-exchange-membrane (PEM) water electrolysis cell.
//
// voltage = E_rev + η_act,anode + η_act,cathode + η_ohm + η_conc, each part computed on its own:
//   E_rev   Nernst with the wet product gases (liquid water, a_w = 1), HHV thermoneutral voltage;
//   η_act   Butler–Volmer (or Tafel) per electrode with an Arrhenius exchange current density;
//   η_ohm   j·(δ/σ_Springer(λ, T) + ASR_contact);
//   η_conc  −(RT/2F)·ln(1 − j/j_lim).
// Gas crossover: H2 permeates cathode → anode, driven by its partial pressure raised by the
// supersaturation of dissolved hydrogen in the cathode catalyst layer (which grows with the
// current density, Trinke et al. 2017, 2018), plus a Darcy term when the cathode is above the
// anode pressure (Trinke et al. 2016); it leaves with the oxygen unless a recombination catalyst
// burns a fraction of it at the anode. O2 permeates anode → cathode, where a fraction recombines
// with hydrogen on the catalyst (forming water) and the rest stays in the hydrogen. Equations,
// defaults and sources: docs/cells-water.md.
#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <memory>
#include <string>
#include <vector>

#include "cells/cell_support.hpp"
#include "electrochem/conduction.hpp"
#include "electrochem/crossover.hpp"
#include "electrochem/kinetics.hpp"
#include "base/check.hpp"
#include "thermo/constants.hpp"
#include "thermo/reaction.hpp"
#include "thermo/water.hpp"

namespace ely {
namespace {

constexpr double kReferenceTemperature = 353.15;  // K, where j0 and permeabilities are given

const std::vector<ParameterInfo> kPemParameters = {
    {"membrane_thickness", "m", 177.8e-6, 10e-6, 1e-3, "membrane thickness",
     "7 mil = 177.8 um perfluorosulfonic acid membrane, the long-standing reference grade (common practice)"},
    {"membrane_water_content", "1", 21.0, 2.0, 25.0,
     "membrane water content lambda, mol H2O per mol SO3H, for the Springer conductivity",
     "liquid-equilibrated membrane, lambda about 21-22 (Springer et al., J. Electrochem. Soc. 138 (1991) 2334; from memory)"},
    {"contact_resistance", "ohm m2", 1e-5, 0.0, 1e-3,
     "electronic and contact area-specific resistance of plates, porous transport layers and coatings",
     "0.1 ohm cm2, so that the cell's ohmic resistance with the default membrane is about 0.19 ohm cm2 at 80 C, "
     "the high-frequency resistance of 7-mil membrane cells in a stack (about 0.2 ohm cm2; from memory). The "
     "membrane alone: 0.16 ohm cm2 measured ex situ at 25 C (Slade et al., J. Electrochem. Soc. 149 (2002) A1556)"},
    {"anode_exchange_current_density", "A/m2", 5e-5, 1e-9, 1e3,
     "oxygen evolution exchange current density at 353.15 K, geometric area",
     "5e-9 A/cm2 geometric: the value that puts the default cell at the floor of the state-of-the-art band, "
     "1.75-2.20 V (Carmo et al., Int. J. Hydrogen Energy 38 (2013) 4901, Table 1, seen as reproduced in an "
     "encyclopedia page), at its nominal 1 A/cm2, 80 C and atmospheric pressure (1.756 V); inside the "
     "1e-9..1e-6 A/cm2 reported for iridium-oxide anodes of different loadings (from memory); was 1e-7 A/cm2: "
     "1.696 V there"},
    {"anode_activation_energy", "J/mol", 60e3, 0.0, 200e3, "activation energy of the anode exchange current density",
     "typical value, from memory"},
    {"anode_transfer_coefficient_forward", "1", 1.5, 0.05, 4.0,
     "anodic (oxygen evolution) transfer coefficient",
     "Tafel slope 2.303RT/(alpha F) = 47 mV/dec at 80 C, within the 40-60 mV/dec of iridium-oxide anodes "
     "(Bernt & Gasteiger, J. Electrochem. Soc. 163 (2016) F3179; from memory)"},
    {"anode_transfer_coefficient_backward", "1", 1.5, 0.05, 4.0,
     "transfer coefficient of the reverse (oxygen reduction) direction at the anode; matters only near equilibrium",
     "typical value, from memory (equal to the forward value: closed-form Butler-Volmer)"},
    {"cathode_exchange_current_density", "A/m2", 1e5, 1e-3, 1e7,
     "hydrogen evolution exchange current density at 353.15 K, geometric area (roughness included)",
     "10 A/cm2 geometric: Pt/C hydrogen evolution about 0.2-0.6 A/cm2 of Pt surface at 80 C (Neyerlin et al., "
     "J. Electrochem. Soc. 154 (2007) B631; Durst et al., Energy Environ. Sci. 7 (2014) 2255; values from memory) "
     "times the Pt roughness of a low-loaded cathode, about 20-50 cm2 Pt per cm2; gives about 6 mV at 2 A/cm2"},
    {"cathode_activation_energy", "J/mol", 16e3, 0.0, 200e3, "activation energy of the cathode exchange current density",
     "about 16 kJ/mol for hydrogen evolution/oxidation on Pt/C (Neyerlin et al., J. Electrochem. Soc. 154 (2007) "
     "B631; from memory)"},
    {"cathode_transfer_coefficient_forward", "1", 0.5, 0.05, 4.0, "cathodic (hydrogen evolution) transfer coefficient",
     "typical value, from memory"},
    {"cathode_transfer_coefficient_backward", "1", 0.5, 0.05, 4.0,
     "transfer coefficient of the reverse (hydrogen oxidation) direction at the cathode", "typical value, from memory"},
    {"kinetics_model", "1", 0.0, 0.0, 1.0, "electrode kinetics: 0 = Butler-Volmer, 1 = Tafel", "model choice"},
    {"limiting_current_density", "A/m2", 6e4, 1e3, 1e6,
     "limiting current density of the mass-transport (concentration) loss", "typical value, from memory (6 A/cm2)"},
    {"h2_permeability", "mol/(m s Pa)", 4.44e-14, 0.0, 1e-11,
     "hydrogen permeability of the hydrated membrane at 353.15 K (diffusive part)",
     "2.95e-14 mol/(m s Pa) at 60 C measured in an electrolysis cell (Trinke et al., J. Electrochem. Soc. 163 (2016) "
     "F3164), taken to 80 C with h2_permeability_activation_energy: 4.44e-14"},
    {"h2_permeability_activation_energy", "J/mol", 20e3, 0.0, 100e3, "activation energy of the hydrogen permeability",
     "typical value, from memory"},
    {"o2_permeability", "mol/(m s Pa)", 2.22e-14, 0.0, 1e-11, "oxygen permeability of the hydrated membrane at 353.15 K",
     "half the hydrogen permeability (Schalenbach et al., J. Phys. Chem. C 119 (2015) 25145; ratio from memory)"},
    {"o2_permeability_activation_energy", "J/mol", 25e3, 0.0, 100e3, "activation energy of the oxygen permeability",
     "typical value, from memory"},
    {"h2_darcy_coefficient", "mol/(m s Pa2)", 2e-22, 0.0, 1e-18,
     "pressure-driven hydrogen crossover K = kappa S/mu: N = K p_H2 (p_c - p_a)/delta",
     "kappa ~ 1e-20 m2 hydraulic permeability of the membrane, S ~ 7e-6 mol/(m3 Pa) hydrogen solubility in water "
     "near 80 C, mu = 3.55e-4 Pa s water viscosity at 80 C (typical values, from memory)"},
    {"h2_supersaturation_coefficient", "Pa m2/A", 330.0, 0.0, 1e4,
     "supersaturation of dissolved hydrogen in the cathode catalyst layer, as an added hydrogen pressure per unit "
     "current density: N_H2 = P (p_H2 + s j)/delta",
     "3.3e6 Pa per A/cm2: a rise of 1 A/cm2 raises the permeation as much as a 20 bar higher cathode pressure "
     "(Trinke et al., Int. J. Hydrogen Energy 42 (2017) 14355), counted with the diffusive and convective "
     "coefficients of the same cell (Trinke et al., J. Electrochem. Soc. 163 (2016) F3164)"},
    {"h2_recombination_fraction_anode", "1", 0.0, 0.0, 1.0,
     "fraction of the hydrogen reaching the anode that a recombination catalyst burns with oxygen there (forming water)",
     "none: a plain iridium-oxide anode; recombination catalysts are one of the mitigations Trinke et al., "
     "J. Electrochem. Soc. 165 (2018) F502 discuss"},
    {"o2_recombination_fraction", "1", 1.0, 0.0, 1.0,
     "fraction of the oxygen permeating to the cathode that recombines with hydrogen on the catalyst (forming water)",
     "typical assumption, from memory: platinum catalyses the recombination"},
    {"electroosmotic_drag", "1", 2.5, 0.0, 10.0,
     "electro-osmotic drag coefficient, mol H2O carried anode to cathode per mol H+",
     "liquid-equilibrated membrane (Zawodzinski et al., J. Electrochem. Soc. 140 (1993) 1981; from memory)"},
};

class PemCell final : public Cell {
public:
    explicit PemCell(const ParameterValues& v)
        : thickness_(v.get("membrane_thickness")),
          water_content_(v.get("membrane_water_content")),
          contact_resistance_(v.get("contact_resistance")),
          anode_(read_kinetics(v, "anode", kReferenceTemperature)),
          cathode_(read_kinetics(v, "cathode", kReferenceTemperature)),
          tafel_(read_choice(v, "kinetics_model") == 1),
          limiting_current_density_(v.get("limiting_current_density")),
          h2_{v.get("h2_permeability"), v.get("h2_permeability_activation_energy"), kReferenceTemperature},
          o2_{v.get("o2_permeability"), v.get("o2_permeability_activation_energy"), kReferenceTemperature},
          darcy_(v.get("h2_darcy_coefficient")),
          supersaturation_(v.get("h2_supersaturation_coefficient")),
          recombination_{v.get("o2_recombination_fraction"), v.get("h2_recombination_fraction_anode")},
          drag_(v.get("electroosmotic_drag")) {}

    const Envelope& envelope() const override { return envelope_; }
    std::unique_ptr<Cell> clone() const override { return std::make_unique<PemCell>(*this); }

    double current_density_limit(const OperatingPoint&) const override {
        return current_density_cap(envelope_.current_density_max, limiting_current_density_);
    }

    double current_density_minimum(const OperatingPoint& p) const override {
        return crossover_minimum_current_density(crossover(p), recombination_);
    }

    CellResult evaluate(const OperatingPoint& p) const override {
        CellResult r;
        r.warnings = check_envelope(envelope_, p, "pem");
        const double t = p.temperature, j = p.current_density;
        r.current_density = j;
        r.reversible_voltage = reversible_voltage_liquid_water(t, p.pressure_anode, p.pressure_cathode, 1.0);
        r.thermoneutral_voltage = thermoneutral_voltage_hhv(t);
        r.gases_saturated = true;
        r.water_activity_anode = r.water_activity_cathode = 1.0;
        if (j == 0.0) {  // open circuit (hot standby): no gas made, the membrane still passes hydrogen
            r.voltage = r.reversible_voltage;
            fill_water_cell_gases(r, 0.0, crossover(p), recombination_, p);
            return r;
        }

        r.concentration = concentration_overpotential(j, limiting_current_density_, t, 2);
        if (j > 0.95 * limiting_current_density_) r.warnings |= kWarnNearLimitingCurrent;
        r.activation_anode = activation_overpotential(anode_, tafel_, j, t);
        r.activation_cathode = activation_overpotential(cathode_, tafel_, j, t);
        const double sigma = membrane_conductivity_springer(water_content_, t);
        r.ohmic = j * (thickness_ / sigma + contact_resistance_);
        r.voltage = r.reversible_voltage + r.activation_anode + r.activation_cathode + r.ohmic + r.concentration;

        fill_water_cell_gases(r, j, crossover(p), recombination_, p);
        r.water_drag = drag_ * j / kFaraday;
        return r;
    }

private:
    // Crossover driven by the partial pressures of the wet gases (saturated at T, a_w = 1); the
    // hydrogen side adds the supersaturation s·j of the catalyst layer (linear in j, Trinke 2017).
    CrossoverFluxes crossover(const OperatingPoint& p) const {
        const double t = p.temperature;
        const double p_sat = water_saturation_pressure(t);
        const double p_h2 = p.pressure_cathode - p_sat, p_o2 = p.pressure_anode - p_sat;
        const double h2_permeability = gas_permeability(h2_, t);
        return {permeation_flux(h2_permeability, p_h2, thickness_) +
                    darcy_gas_flux(darcy_, p_h2, p.pressure_cathode - p.pressure_anode, thickness_),
                permeation_flux(gas_permeability(o2_, t), p_o2, thickness_),
                h2_permeability * supersaturation_ / thickness_};
    }

    Envelope envelope_{298.15, 373.15, 8e4, 1e7, 5e4, 323.15, 363.15};
    double thickness_, water_content_, contact_resistance_;
    ElectrodeKinetics anode_, cathode_;
    bool tafel_;
    double limiting_current_density_;
    GasPermeability h2_, o2_;
    double darcy_, supersaturation_;
    Recombination recombination_;
    double drag_;
};

}  // namespace

const std::vector<ParameterInfo>& pem_parameters() { return kPemParameters; }

std::unique_ptr<Cell> make_pem_cell(const ParameterValues& values) { return std::make_unique<PemCell>(values); }

}  // namespace ely
