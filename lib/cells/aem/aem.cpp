// Anion-exchange-membrane (AEM) water electrolysis cell: a hydroxide-conducting polymer
// membrane between nickel-based (platinum-group-metal-free) electrodes, fed dilute KOH or pure
// water. Anode 4 OH⁻ → O2 + 2 H2O + 4 e⁻, cathode 4 H2O + 4 e⁻ → 2 H2 + 4 OH⁻.
//
// voltage = E_rev + η_act,anode + η_act,cathode + η_ohm + η_conc, each part computed on its own:
//   E_rev   Nernst with the wet product gases over the feed of water activity a_w (Balej 1985
//           for KOH, 1 for pure water), HHV thermoneutral voltage;
//   η_act   Butler–Volmer (or Tafel) per electrode with an Arrhenius exchange current density;
//   η_ohm   j·(δ/σ + ASR_contact), σ = σ_OH⁻(λ, T) of the membrane (Nernst–Einstein, see aem.hpp)
//           + the KOH of the feed in the same water network, σ_KOH(Gilliam 2007)·φ_w^1.5;
//   η_conc  −(RT/2F)·ln(1 − j/j_lim).
// Gas crossover by permeation of the dissolved gases (H2 to the anode gas, O2 to the cathode gas,
// a fraction recombining there), driven by the partial pressures of the wet gases. Equations,
// defaults with their sources and the envelope: docs/cells-aem.md.
#include "cells/aem/aem.hpp"

#include <cmath>
#include <memory>
#include <vector>

#include "base/check.hpp"
#include "cells/cell_support.hpp"
#include "electrochem/conduction.hpp"
#include "electrochem/crossover.hpp"
#include "electrochem/electrolyte.hpp"
#include "electrochem/kinetics.hpp"
#include "thermo/constants.hpp"
#include "thermo/water.hpp"

namespace ely {

namespace {

constexpr double kReferenceTemperature = 298.15;  // K, where j0 and D_OH⁻ are given
constexpr double kPermeabilityReferenceTemperature = 333.15;  // K (60 °C)
constexpr double kWaterDensity = 997.0;  // kg/m³ at 25 °C (IAPWS-95, from memory), for the swelling volume

const char* const kMemory = "typical value, from memory";

const std::vector<ParameterInfo> kAemParameters = {
    {"feed_koh_mass_fraction", "1", 0.0535, 0.0, 0.15,
     "KOH mass fraction of the feed (0: pure water); it sets the water activity and adds the conduction of the "
     "imbibed electrolyte",
     "1 M KOH (5.35 wt %, about 1.047 kg/L), the electrolyte of the IRENA 2020 AEM key-performance table (IRENA, "
     "Green Hydrogen Cost Reduction, 2020)"},
    {"membrane_thickness", "m", 50e-6, 10e-6, 500e-6, "membrane thickness",
     "50 um, the thickness of the commercial AEMs reviewed by Henkensmeier et al., J. Electrochem. Energy Convers. "
     "Storage 18 (2021) 024001 (from memory)"},
    {"membrane_ion_exchange_capacity", "mol/kg", 2.0, 0.5, 4.0,
     "ion-exchange capacity of the dry membrane (mmol of quaternary-ammonium groups per g)",
     "typical value, from memory: quaternary-ammonium AEMs, 1.5-2.5 mmol/g"},
    {"membrane_water_content", "1", 12.0, 1.0, 40.0,
     "membrane water content lambda, mol H2O per fixed cation, in liquid water",
     "typical value, from memory: water uptake of 40-50 % at 2 mmol/g"},
    {"membrane_dry_density", "kg/m3", 1200.0, 800.0, 2000.0, "density of the dry membrane polymer",
     "typical value, from memory: aromatic polymers 1.1-1.3 g/cm3"},
    {"hydroxide_diffusivity", "m2/s", 5.273e-9, 1e-10, 1e-8,
     "diffusion coefficient of OH- in water at 298.15 K, the mobility of the membrane's hydroxide before tortuosity",
     "CRC Handbook of Chemistry and Physics, Vanysek, 'Ionic conductivity and diffusion at infinite dilution' "
     "(5.273e-5 cm2/s, lambda = 198 S cm2/mol; the value from memory)"},
    {"hydroxide_diffusivity_activation_energy", "J/mol", 18e3, 0.0, 60e3,
     "activation energy of the hydroxide diffusivity",
     "ionic conductivities rise 2-3 %/K from 25 C (CRC Handbook, same table); with sigma ~ D/T that is 17-25 kJ/mol, "
     "18 kJ/mol gives 2.1 %/K"},
    {"contact_resistance", "ohm m2", 5e-6, 0.0, 1e-3,
     "electronic and contact area-specific resistance of porous transport layers and plates",
     "typical value, from memory (0.05 ohm cm2, nickel porous transport layers)"},
    {"anode_exchange_current_density", "A/m2", 2.9e-3, 1e-9, 1e3,
     "oxygen evolution exchange current density at 298.15 K, geometric area (nickel-iron oxide anode)",
     "NiFe double hydroxide in 1 M KOH: 220 mV at 10 mA/cm2 with a 48.5 mV/dec Tafel slope (Chen, Xiao, Luo & Wu, "
     "Ceramics International, 2023, doi:10.1016/j.ceramint.2023.11.392), j0 = 10 mA/cm2 x 10^(-220/48.5)"},
    {"anode_activation_energy", "J/mol", 45e3, 0.0, 200e3, "activation energy of the anode exchange current density",
     kMemory},
    {"anode_transfer_coefficient_forward", "1", 1.22, 0.05, 4.0, "anodic (oxygen evolution) transfer coefficient",
     "48.5 mV/dec at 298.15 K (Chen et al. 2023, see anode_exchange_current_density): 2.303RT/(bF) = 1.22"},
    {"anode_transfer_coefficient_backward", "1", 1.22, 0.05, 4.0,
     "transfer coefficient of the reverse direction at the anode; matters only near equilibrium",
     "equal to the forward value (closed-form Butler-Volmer)"},
    {"cathode_exchange_current_density", "A/m2", 200.0, 1e-6, 1e4,
     "hydrogen evolution exchange current density at 298.15 K, geometric area (nickel-molybdenum cathode)",
     "nickel-molybdenum cathodes in hydroxide-exchange-membrane cells run about 100 mV above platinum-group cathodes "
     "at > 1 A/cm2 and reach a mass activity above 80 mA/mg at 100 mV (Patil et al., Energy Adv. 2 (2023), "
     "doi:10.1039/d3ya00140g, abstract seen); with a platinum-group cathode near 50 mV (from memory) that is "
     "0.15 V at 1 A/cm2 and 60 C, which 2e-2 A/cm2 gives (the mass activity then needs 1.7 mg/cm2, inside the "
     "usual 1-5 mg/cm2, from memory); was 1e-3 A/cm2: 0.36 V at 2 A/cm2"},
    {"cathode_activation_energy", "J/mol", 30e3, 0.0, 200e3,
     "activation energy of the cathode exchange current density", kMemory},
    {"cathode_transfer_coefficient_forward", "1", 0.5, 0.05, 4.0, "cathodic (hydrogen evolution) transfer coefficient",
     "typical value, from memory: about 120 mV/dec on nickel at 25 C"},
    {"cathode_transfer_coefficient_backward", "1", 0.5, 0.05, 4.0,
     "transfer coefficient of the reverse direction at the cathode", kMemory},
    {"kinetics_model", "1", 0.0, 0.0, 1.0, "electrode kinetics: 0 = Butler-Volmer, 1 = Tafel", "model choice"},
    {"limiting_current_density", "A/m2", 3e4, 1e3, 1e6,
     "limiting current density of the mass-transport (concentration) loss", "typical value, from memory (3 A/cm2)"},
    {"h2_permeability", "mol/(m s Pa)", 1e-14, 0.0, 1e-11,
     "hydrogen permeability of the hydrated membrane at 333.15 K",
     "typical value, from memory: hydrated hydrocarbon AEMs, about half a perfluorinated membrane's"},
    {"h2_permeability_activation_energy", "J/mol", 20e3, 0.0, 100e3,
     "activation energy of the hydrogen permeability", kMemory},
    {"o2_permeability", "mol/(m s Pa)", 5e-15, 0.0, 1e-11, "oxygen permeability of the hydrated membrane at 333.15 K",
     "typical value, from memory: about half the hydrogen permeability"},
    {"o2_permeability_activation_energy", "J/mol", 25e3, 0.0, 100e3, "activation energy of the oxygen permeability",
     kMemory},
    {"o2_recombination_fraction", "1", 0.0, 0.0, 1.0,
     "fraction of the oxygen permeating to the cathode that recombines with hydrogen (forming water)",
     "typical assumption, from memory: nickel cathodes recombine little; the oxygen stays in the hydrogen"},
};

class AemCell final : public Cell {
public:
    explicit AemCell(const ParameterValues& v)
        : feed_mass_fraction_(v.get("feed_koh_mass_fraction")),
          feed_molality_(molality_from_mass_fraction(feed_mass_fraction_, molar_mass::KOH)),
          thickness_(v.get("membrane_thickness")),
          membrane_{v.get("membrane_ion_exchange_capacity"), v.get("membrane_water_content"),
                    v.get("membrane_dry_density")},
          water_fraction_(membrane_water_volume_fraction(membrane_)),
          diffusivity_(v.get("hydroxide_diffusivity")),
          diffusivity_activation_energy_(v.get("hydroxide_diffusivity_activation_energy")),
          contact_resistance_(v.get("contact_resistance")),
          anode_(read_kinetics(v, "anode", kReferenceTemperature)),
          cathode_(read_kinetics(v, "cathode", kReferenceTemperature)),
          tafel_(read_choice(v, "kinetics_model") == 1),
          limiting_current_density_(v.get("limiting_current_density")),
          h2_{v.get("h2_permeability"), v.get("h2_permeability_activation_energy"), kPermeabilityReferenceTemperature},
          o2_{v.get("o2_permeability"), v.get("o2_permeability_activation_energy"), kPermeabilityReferenceTemperature},
          recombination_{v.get("o2_recombination_fraction"), 0.0} {}

    const Envelope& envelope() const override { return envelope_; }
    std::unique_ptr<Cell> clone() const override { return std::make_unique<AemCell>(*this); }

    double current_density_limit(const OperatingPoint&) const override {
        return current_density_cap(envelope_.current_density_max, limiting_current_density_);
    }

    double current_density_minimum(const OperatingPoint& p) const override {
        return crossover_minimum_current_density(crossover(p, water_activity(p.temperature)), recombination_);
    }

    CellResult evaluate(const OperatingPoint& p) const override {
        CellResult r;
        r.warnings = check_envelope(envelope_, p, "aem");
        const double t = p.temperature, j = p.current_density;
        const double a_w = water_activity(t);
        if (start_liquid_water_cell(r, p, a_w)) {  // open circuit (hot standby): only the crossover
            fill_water_cell_gases(r, 0.0, crossover(p, a_w), recombination_, p);
            return r;
        }
        r.concentration = concentration_overpotential(j, limiting_current_density_, t, 2);
        if (j > 0.95 * limiting_current_density_) r.warnings |= kWarnNearLimitingCurrent;
        r.activation_anode = activation_overpotential(anode_, tafel_, j, t);
        r.activation_cathode = activation_overpotential(cathode_, tafel_, j, t);
        r.ohmic = j * (thickness_ / conductivity(t) + contact_resistance_);
        r.voltage = r.reversible_voltage + r.activation_anode + r.activation_cathode + r.ohmic + r.concentration;
        fill_water_cell_gases(r, j, crossover(p, a_w), recombination_, p);
        return r;
    }

private:
    double water_activity(double t) const {
        return feed_molality_ > 0.0 ? koh_water_activity_balej(feed_molality_, t) : 1.0;
    }

    // The membrane's own hydroxide, and the feed's KOH in the same water network.
    double conductivity(double t) const {
        const double membrane = hydroxide_membrane_conductivity(membrane_, diffusivity_, diffusivity_activation_energy_, t);
        if (!(feed_mass_fraction_ > 0.0)) return membrane;
        const double electrolyte = koh_conductivity_gilliam(koh_molarity(feed_mass_fraction_, t), t);
        return membrane + bruggeman_conductivity(electrolyte, 1.0 - water_fraction_);
    }

    // Crossover driven by the partial pressures of the wet gases over the feed (water activity a_w).
    CrossoverFluxes crossover(const OperatingPoint& p, double a_w) const {
        const double t = p.temperature;
        const double p_vapour = a_w * water_saturation_pressure(t);
        return {permeation_flux(gas_permeability(h2_, t), p.pressure_cathode - p_vapour, thickness_),
                permeation_flux(gas_permeability(o2_, t), p.pressure_anode - p_vapour, thickness_)};
    }

    // Envelope: 25-80 C hard (quaternary-ammonium AEMs degrade faster above, from memory), the
    // defaults are for 40-60 C (IRENA 2020 AEM operating temperature); below 35 bar (IRENA 2020:
    // cell pressure < 35 bar) on each side; up to 2.5 A/cm2 (IRENA 2020: nominal 0.2-2 A/cm2).
    Envelope envelope_{298.15, 353.15, 8e4, 3.5e6, 2.5e4, 313.15, 333.15};
    double feed_mass_fraction_, feed_molality_, thickness_;
    HydroxideMembrane membrane_;
    double water_fraction_, diffusivity_, diffusivity_activation_energy_, contact_resistance_;
    ElectrodeKinetics anode_, cathode_;
    bool tafel_;
    double limiting_current_density_;
    GasPermeability h2_, o2_;
    Recombination recombination_;  // oxygen at the cathode only: no anode recombination catalyst
};

}  // namespace

double membrane_water_volume_fraction(const HydroxideMembrane& m) {
    require_positive(m.ion_exchange_capacity, "AEM ion-exchange capacity", "mol/kg");
    require_positive(m.water_content, "AEM water content", "");
    require_positive(m.dry_density, "AEM dry density", "kg/m3");
    const double water = m.water_content * m.ion_exchange_capacity * molar_mass::H2O / kWaterDensity;  // m³/kg polymer
    return water / (water + 1.0 / m.dry_density);
}

double hydroxide_membrane_conductivity(const HydroxideMembrane& m, double diffusivity_298, double activation_energy,
                                       double temperature) {
    require_positive(temperature, "AEM conductivity: temperature", "K");
    require_positive(diffusivity_298, "AEM conductivity: hydroxide diffusivity", "m2/s");
    const double phi = membrane_water_volume_fraction(m);
    // Fixed charges per volume of swollen membrane: IEC per (volume of polymer + its water).
    const double concentration = m.ion_exchange_capacity /
                                 (1.0 / m.dry_density + m.water_content * m.ion_exchange_capacity * molar_mass::H2O /
                                                            kWaterDensity);  // mol/m³
    const double diffusivity =
        diffusivity_298 * std::exp(-activation_energy / kGasConstant * (1.0 / temperature - 1.0 / kReferenceTemperature));
    const double free = kFaraday * kFaraday * concentration * diffusivity / (kGasConstant * temperature);
    return bruggeman_conductivity(free, 1.0 - phi);
}

const std::vector<ParameterInfo>& aem_parameters() { return kAemParameters; }

std::unique_ptr<Cell> make_aem_cell(const ParameterValues& values) { return std::make_unique<AemCell>(values); }

}  // namespace ely
