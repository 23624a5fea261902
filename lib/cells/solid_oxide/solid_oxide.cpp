// Solid oxide steam electrolysis cell (oxide-ion conducting electrolyte, steam + H2 at the
// cathode; at the anode pure O2, or a sweep gas such as air of a given mean oxygen fraction).
//
// voltage = E_rev + η_act,anode + η_act,cathode + η_ohm + η_conc, each part computed on its own:
//   E_rev   Nernst for steam at the arithmetic mean of the inlet and outlet cathode compositions
//           for the steam utilisation U (x_H2O,in given, rest H2), p_O2 = x_O2·anode pressure;
//           LHV thermoneutral voltage;
//   η_act   Butler–Volmer (or Tafel) per electrode with an Arrhenius exchange current density;
//   η_ohm   j·(ASR_electrolyte(T) + ASR_contact), ASR_electrolyte Arrhenius;
//   η_conc  −(RT/2F)·ln(1 − j/j_lim) + (RT/2F)·ln(1 + j/j_H2): steam depleted and hydrogen
//           accumulated at the reaction zone by binary diffusion through the cathode support, both at
//           the outlet composition (x_H2O,out = x_H2O,in·(1 − U)).
// Faraday efficiency 1 − electronic leakage fraction. The feed steam follows the current at
// fixed utilisation: consumed[H2O] = steam reacted, cathode_out[H2] = hydrogen produced,
// cathode_out[H2O] = unreacted steam (feed = consumed + unreacted); the hydrogen fed with the
// steam passes through and is not in the fluxes. Equations, defaults, sources:
// docs/cells-water.md.
#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <memory>
#include <string>
#include <vector>

#include "cells/cell_support.hpp"
#include "electrochem/conduction.hpp"
#include "electrochem/kinetics.hpp"
#include "base/check.hpp"
#include "thermo/constants.hpp"
#include "thermo/reaction.hpp"

namespace ely {
namespace {

constexpr double kReferenceTemperature = 1073.15;  // K (800 °C), where j0, ASR and diffusivity are given
// Oxygen in dry air, mol/mol: 20.946 % (U.S. Standard Atmosphere 1976; argon counted with the nitrogen).
constexpr double kAirOxygenFraction = 0.20946;

const std::vector<ParameterInfo> kSolidOxideParameters = {
    {"steam_inlet_fraction", "1", 0.9, 0.05, 1.0, "steam mole fraction of the cathode inlet, the rest hydrogen",
     "typical value, from memory (about 10 % hydrogen keeps the nickel cathode reduced)"},
    {"steam_utilisation", "1", 0.7, 0.05, 0.95, "steam utilisation U: steam reacted / steam fed",
     "typical value, from memory"},
    {"electrolyte_asr", "ohm m2", 5e-6, 0.0, 1e-2,
     "ohmic area-specific resistance of the electrolyte (with interlayers) at 1073.15 K",
     "0.05 ohm cm2: 8 mol% yttria-stabilised zirconia about 10 um thick (about 0.03 ohm cm2 at 800 C) with its ceria "
     "barrier layer (from memory); the cell as a whole is checked against published fuel-electrode-supported cells "
     "(Schefold et al., docs/cells-water.md)"},
    {"electrolyte_activation_energy", "J/mol", 80e3, 0.0, 300e3,
     "activation energy of the electrolyte area-specific resistance",
     "oxide-ion conduction in yttria-stabilised zirconia, about 80 kJ/mol (typical value, from memory)"},
    {"contact_resistance", "ohm m2", 0.0, 0.0, 1e-3,
     "temperature-independent contact area-specific resistance of interconnects and current collectors",
     "none assumed"},
    {"anode_exchange_current_density", "A/m2", 2e4, 1e-3, 1e6,
     "oxygen electrode exchange current density at 1073.15 K, geometric area",
     "2 A/cm2, a polarisation resistance RT/(2 alpha F j0) of about 0.05 ohm cm2 at 800 C, as for strontium-doped "
     "cobaltite-ferrite oxygen electrodes (from memory); the cell as a whole is checked against published cells"},
    {"anode_activation_energy", "J/mol", 120e3, 0.0, 300e3,
     "activation energy of the oxygen electrode exchange current density", "typical value, from memory"},
    {"anode_transfer_coefficient_forward", "1", 0.5, 0.05, 4.0, "oxygen electrode transfer coefficient, oxidation",
     "typical value, from memory"},
    {"anode_transfer_coefficient_backward", "1", 0.5, 0.05, 4.0, "oxygen electrode transfer coefficient, reduction",
     "typical value, from memory"},
    {"cathode_exchange_current_density", "A/m2", 1e4, 1e-3, 1e6,
     "fuel electrode exchange current density at 1073.15 K, geometric area",
     "1 A/cm2, a polarisation resistance of about 0.09 ohm cm2 at 800 C, as for nickel-zirconia cermet fuel "
     "electrodes in steam (from memory); the cell as a whole is checked against published cells"},
    {"cathode_activation_energy", "J/mol", 100e3, 0.0, 300e3,
     "activation energy of the fuel electrode exchange current density", "typical value, from memory"},
    {"cathode_transfer_coefficient_forward", "1", 0.5, 0.05, 4.0, "fuel electrode transfer coefficient, reduction",
     "typical value, from memory"},
    {"cathode_transfer_coefficient_backward", "1", 0.5, 0.05, 4.0, "fuel electrode transfer coefficient, oxidation",
     "typical value, from memory"},
    {"kinetics_model", "1", 0.0, 0.0, 1.0, "electrode kinetics: 0 = Butler-Volmer, 1 = Tafel", "model choice"},
    {"cathode_effective_diffusivity", "m2/s", 2e-5, 1e-8, 1e-2,
     "effective steam diffusivity in the cathode support at 1073.15 K and 1 bar (scales as T^1.75/p)",
     "typical value, from memory: binary H2-H2O diffusivity about 8e-4 m2/s at 800 C times porosity/tortuosity "
     "about 0.03"},
    {"cathode_support_thickness", "m", 400e-6, 1e-6, 5e-3, "diffusion length of the cathode (support) layer",
     "typical value, from memory (cathode-supported cells)"},
    {"oxygen_electrode_o2_fraction", "1", 1.0, 0.01, 1.0,
     "mean oxygen mole fraction of the gas at the oxygen electrode: 1 = pure oxygen (no sweep); with an air sweep "
     "enriched by the oxygen made, the mean of the inlet (air) and outlet fractions, above 0.20946 and at most 0.605 "
     "(the sweep air flow follows from it and leaves with the oxygen)",
     "pure oxygen: the anode delivers oxygen as a product (model choice); set an air sweep here"},
    {"electronic_leakage_fraction", "1", 0.0, 0.0, 0.5,
     "fraction of the current carried by electrons through the electrolyte (produces no gas)",
     "zero: dense zirconia electrolyte (typical assumption)"},
};

class SolidOxideCell final : public Cell {
public:
    explicit SolidOxideCell(const ParameterValues& v)
        : x_steam_in_(v.get("steam_inlet_fraction")),
          utilisation_(v.get("steam_utilisation")),
          electrolyte_asr_(v.get("electrolyte_asr")),
          electrolyte_activation_energy_(v.get("electrolyte_activation_energy")),
          contact_resistance_(v.get("contact_resistance")),
          anode_(read_kinetics(v, "anode", kReferenceTemperature)),
          cathode_(read_kinetics(v, "cathode", kReferenceTemperature)),
          tafel_(read_choice(v, "kinetics_model") == 1),
          diffusivity_(v.get("cathode_effective_diffusivity")),
          support_thickness_(v.get("cathode_support_thickness")),
          x_o2_(v.get("oxygen_electrode_o2_fraction")),
          leakage_(v.get("electronic_leakage_fraction")) {
        // Arithmetic mean of inlet and outlet: each mol of steam reacted gives one mol of H2.
        x_steam_mean_ = x_steam_in_ * (1.0 - 0.5 * utilisation_);
        x_h2_mean_ = 1.0 - x_steam_mean_;
        x_steam_out_ = x_steam_in_ * (1.0 - utilisation_);
        // An air sweep whose oxygen fraction is the arithmetic mean of air at the inlet and x_out at the
        // outlet: (air x_a + O2 made)/(air + O2 made) = x_out = 2 x_mean − x_a, i.e. air per O2 made =
        // (1 − x_out)/(x_out − x_a). Air reaches only means between its own fraction and (1 + x_a)/2.
        if (x_o2_ < 1.0) {
            const double x_out = 2.0 * x_o2_ - kAirOxygenFraction;
            if (!(x_o2_ > kAirOxygenFraction && x_out <= 1.0))
                throw Error(ErrorKind::invalid_argument,
                            fmt::format("oxygen_electrode_o2_fraction {:g}: an air sweep gives mean oxygen fractions "
                                        "above air's {:g} and at most {:g} (the mean of air and pure oxygen); 1 = no "
                                        "sweep",
                                        x_o2_, kAirOxygenFraction, 0.5 * (1.0 + kAirOxygenFraction)));
            sweep_per_oxygen_ = (1.0 - x_out) / (x_out - kAirOxygenFraction);
        }
    }

    const Envelope& envelope() const override { return envelope_; }
    std::unique_ptr<Cell> clone() const override { return std::make_unique<SolidOxideCell>(*this); }

    double current_density_limit(const OperatingPoint& p) const override {
        require_positive(p.temperature, "solid_oxide cell: temperature");
        // The limit applies to the ionic share of the current.
        return current_density_cap(envelope_.current_density_max,
                                   limiting_current_density(p.temperature) / (1.0 - leakage_));
    }

    /// Steam diffusion limit through the cathode support at the outlet composition:
    /// j_lim = 2F·D_eff(T, p)·c_H2O/δ with c_H2O = x_out·p/(RT) and D_eff ∝ T^1.75/p, so that
    /// j_lim = 2F·D_ref·(T/T_ref)^1.75·p°·x_out/(R·T·δ), independent of the pressure.
    double limiting_current_density(double t) const { return diffusion_current_density(t, x_steam_out_); }

    /// 2F·D_eff(T, p)·c/δ for a gas of mole fraction x at the support's outer face, c = x·p/(RT):
    /// 2F·D_ref·(T/T_ref)^1.75·p°·x/(R·T·δ), independent of the pressure (D ∝ 1/p).
    double diffusion_current_density(double t, double mole_fraction) const {
        const double d = diffusivity_ * std::pow(t / kReferenceTemperature, 1.75);
        return 2.0 * kFaraday * d * kStandardPressure * mole_fraction / (kGasConstant * t * support_thickness_);
    }

    CellResult evaluate(const OperatingPoint& p) const override {
        CellResult r;
        r.warnings = check_envelope(envelope_, p, "solid_oxide");
        const double t = p.temperature, j = p.current_density;
        r.current_density = j;
        r.gases_saturated = false;
        r.reversible_voltage = reversible_voltage_steam(t, p.pressure_cathode * x_h2_mean_,
                                                        p.pressure_cathode * x_steam_mean_, x_o2_ * p.pressure_anode);
        r.thermoneutral_voltage = thermoneutral_voltage_lhv(t);
        r.faraday_efficiency = 1.0 - leakage_;

        const double j_ion = j * (1.0 - leakage_);
        const double j_lim = limiting_current_density(t);
        r.concentration = concentration_overpotential(j_ion, j_lim, t, 2) +
                          product_accumulation_overpotential(j_ion, diffusion_current_density(t, 1.0 - x_steam_out_), t, 2);
        if (j_ion > 0.95 * j_lim) r.warnings |= kWarnNearLimitingCurrent;
        r.activation_anode = activation_overpotential(anode_, tafel_, j_ion, t);
        r.activation_cathode = activation_overpotential(cathode_, tafel_, j_ion, t);
        const double asr = arrhenius_area_specific_resistance(electrolyte_asr_, electrolyte_activation_energy_,
                                                              kReferenceTemperature, t);
        r.ohmic = j_ion * (asr + contact_resistance_);
        r.voltage = r.reversible_voltage + r.activation_anode + r.activation_cathode + r.ohmic + r.concentration;

        const double reacted = j_ion / (2.0 * kFaraday);
        r.consumed[kH2O] = reacted;
        r.cathode_out[kH2] = reacted;
        r.anode_out[kO2] = j_ion / (4.0 * kFaraday);
        r.cathode_out[kH2O] = reacted * (1.0 / utilisation_ - 1.0);  // unreacted steam
        r.oxygen_electrode_sweep = sweep_per_oxygen_;
        return r;
    }

private:
    Envelope envelope_{873.15, 1173.15, 5e4, 2.5e6, 2e4, 973.15, 1123.15};
    double x_steam_in_, utilisation_;
    double electrolyte_asr_, electrolyte_activation_energy_, contact_resistance_;
    ElectrodeKinetics anode_, cathode_;
    bool tafel_;
    double diffusivity_, support_thickness_, x_o2_, leakage_;
    double x_steam_mean_ = 0, x_h2_mean_ = 0, x_steam_out_ = 0;
    double sweep_per_oxygen_ = 0;  // mol of sweep air per mol of O2 made
};

}  // namespace

const std::vector<ParameterInfo>& solid_oxide_parameters() { return kSolidOxideParameters; }

std::unique_ptr<Cell> make_solid_oxide_cell(const ParameterValues& values) {
    return std::make_unique<SolidOxideCell>(values);
}

}  // namespace ely
