// Alkaline (KOH) water electrolysis cell, zero-gap or with an electrolyte gap at each electrode.
//
// voltage = E_rev + η_act,anode + η_act,cathode + η_ohm + η_conc, each part computed on its own,
// at the current the electrodes carry: j less the shunt currents that bypass them through the
// manifolds (shunt options), or the full j with Ulleberg's efficiency (its loss is parasitic):
//   E_rev   Nernst with the wet product gases over KOH(aq) of water activity a_w (Balej 1985),
//           HHV thermoneutral voltage;
//   η_act   Butler–Volmer (or Tafel) per electrode with an Arrhenius exchange current density;
//   η_ohm   j_e·[(gap_a + gap_c)/σ_eff + N_M·δ_sep/σ + ASR_electrode], σ of KOH(aq) from Gilliam
//           et al. (2007), σ_eff = σ(1 − ε)^1.5 (Bruggeman) with a void fraction ε(j_e);
//   η_conc  −(RT/2F)·ln(1 − j_e/j_lim).
// Gas crossover through the separator by permeation of dissolved gas (H2 to the anode gas,
// O2 to the cathode gas, optionally recombining there), driven by the gas partial pressure plus
// an effective supersaturation pressure. Faraday efficiency from crossover physics, with
// optional shunt currents (a fraction, or a resistor network of the manifolds), or Ulleberg's
// (2003) empirical efficiency. Equations, defaults, sources: docs/cells-water.md.
#include <algorithm>
#include <cmath>
#include <fmt/format.h>
#include <memory>
#include <string>
#include <vector>

#include "cells/cell_support.hpp"
#include "electrochem/conduction.hpp"
#include "electrochem/crossover.hpp"
#include "electrochem/electrolyte.hpp"
#include "electrochem/kinetics.hpp"
#include "base/check.hpp"
#include "thermo/constants.hpp"
#include "thermo/reaction.hpp"
#include "thermo/water.hpp"

namespace ely {
namespace {

constexpr double kReferenceTemperature = 353.15;  // K, where j0 and permeabilities are given
// Ulleberg's table of Faraday-efficiency parameters spans 40..80 °C; f1, f2 are given at 80 °C.
constexpr double kUllebergReferenceTemperature = 353.15, kUllebergTableLow = 313.15, kUllebergTableHigh = 353.15;

const std::vector<ParameterInfo> kAlkalineParameters = {
    {"koh_mass_fraction", "kg/kg", 0.30, 0.05, 0.45, "KOH mass fraction of the electrolyte",
     "25-30 wt% KOH (IRENA, Green Hydrogen Cost Reduction, 2020; common practice)"},
    {"gap_anode", "m", 0.0, 0.0, 0.01, "electrolyte gap between anode and separator (0: zero-gap)",
     "zero-gap design (common practice of current designs)"},
    {"gap_cathode", "m", 0.0, 0.0, 0.01, "electrolyte gap between cathode and separator (0: zero-gap)",
     "zero-gap design (common practice of current designs)"},
    {"separator_thickness", "m", 500e-6, 10e-6, 5e-3, "thickness of the porous separator (diaphragm)",
     "500 um polysulfone-zirconia separator (common practice)"},
    {"separator_macmullin_number", "1", 4.0, 1.0, 100.0,
     "MacMullin number of the electrolyte-filled separator: sigma_KOH / sigma_separator",
     "typical value, from memory (about 0.3 ohm cm2 for 500 um in 30 wt% KOH at 30 C)"},
    {"electrode_resistance", "ohm m2", 1e-5, 0.0, 1e-3,
     "electronic and contact area-specific resistance of electrodes, current collectors and plates",
     "typical value, from memory (0.1 ohm cm2)"},
    {"bubble_void_coefficient", "(A/m2)^-n", 0.023 * 2.0 / 3.0, 0.0, 1.0,
     "c in the gap void fraction epsilon = min(c j^n, epsilon_max), j in A/m2",
     "(2/3)(0.023): form attributed to Milewski et al., J. Power Sources 269 (2014) 203, in public model code; "
     "not checked against the paper"},
    {"bubble_void_exponent", "1", 0.3, 0.0, 1.0, "n in the gap void fraction epsilon = min(c j^n, epsilon_max)",
     "as bubble_void_coefficient"},
    {"bubble_void_max", "1", 0.5, 0.0, 0.9, "cap epsilon_max of the gap void fraction", "typical value, from memory"},
    {"anode_exchange_current_density", "A/m2", 1.0, 1e-9, 1e3,
     "oxygen evolution exchange current density at 353.15 K, geometric area",
     "typical value, from memory: nickel-based anodes, 1e-5..1e-3 A/cm2"},
    {"anode_activation_energy", "J/mol", 42e3, 0.0, 200e3, "activation energy of the anode exchange current density",
     "typical value, from memory"},
    {"anode_transfer_coefficient_forward", "1", 0.8, 0.05, 4.0, "anodic (oxygen evolution) transfer coefficient",
     "typical value, from memory: Tafel slope 88 mV/dec at 80 C"},
    {"anode_transfer_coefficient_backward", "1", 0.8, 0.05, 4.0,
     "transfer coefficient of the reverse direction at the anode; matters only near equilibrium",
     "typical value, from memory (equal to the forward value: closed-form Butler-Volmer)"},
    {"cathode_exchange_current_density", "A/m2", 120.0, 1e-6, 1e4,
     "hydrogen evolution exchange current density at 353.15 K, geometric area (roughness included)",
     "activated (Raney-type) nickel cathodes, 1.2e-2 A/cm2 geometric: gives about 0.2 V at 0.3 A/cm2 and 80 C with "
     "the 140 mV/dec of alpha = 0.5, the upper end of the 0.1-0.2 V such cathodes show in 30 wt% KOH (from memory)"},
    {"cathode_activation_energy", "J/mol", 23e3, 0.0, 200e3,
     "activation energy of the cathode exchange current density", "typical value, from memory"},
    {"cathode_transfer_coefficient_forward", "1", 0.5, 0.05, 4.0, "cathodic (hydrogen evolution) transfer coefficient",
     "typical value, from memory"},
    {"cathode_transfer_coefficient_backward", "1", 0.5, 0.05, 4.0,
     "transfer coefficient of the reverse direction at the cathode", "typical value, from memory"},
    {"kinetics_model", "1", 0.0, 0.0, 1.0, "electrode kinetics: 0 = Butler-Volmer, 1 = Tafel", "model choice"},
    {"limiting_current_density", "A/m2", 2.5e4, 1e3, 1e6,
     "limiting current density of the mass-transport (concentration) loss", "typical value, from memory (2.5 A/cm2)"},
    {"h2_permeability", "mol/(m s Pa)", 3.2e-15, 0.0, 1e-11,
     "effective hydrogen permeability of the electrolyte-filled separator at 353.15 K (dissolved-gas diffusion and "
     "electrolyte carry-over together)",
     "effective value set with supersaturation_pressure so that gas purity limits the part load as published: at "
     "30 bar the 2 % trip is reached at about 12 % of 0.4 A/cm2 (part load limited to about 10-40 %: Haug, PhD "
     "thesis, Clausthal 2019), at 8 bar 10 % load stays below it (de Groot, Kraakman & Barros, Int. J. Hydrogen "
     "Energy 47 (2022) 34773); diffusion of dissolved hydrogen alone through the separator gives about a third"},
    {"h2_permeability_activation_energy", "J/mol", 15e3, 0.0, 100e3,
     "activation energy of the hydrogen permeability", "typical value, from memory"},
    {"o2_permeability", "mol/(m s Pa)", 1.6e-15, 0.0, 1e-11,
     "effective oxygen permeability of the electrolyte-filled separator at 353.15 K",
     "typical value, from memory: about half the hydrogen value (lower diffusivity, stronger salting-out)"},
    {"o2_permeability_activation_energy", "J/mol", 15e3, 0.0, 100e3, "activation energy of the oxygen permeability",
     "typical value, from memory"},
    {"supersaturation_pressure", "Pa", 7.5e5, 0.0, 1e7,
     "effective supersaturation of dissolved gas at the gas-evolving electrodes, added to each gas's partial pressure "
     "in the crossover: N = P (p_gas + p_ss)/delta",
     "set with h2_permeability (see there); supersaturation of dissolved gas at the separator drives much of the "
     "crossover (de Groot, Kraakman & Barros, Int. J. Hydrogen Energy 47 (2022) 34773; Trinke et al., "
     "J. Electrochem. Soc. 165 (2018) F502), which also find electrolyte mixing dominant at 1 bar, lumped in here"},
    {"o2_recombination_fraction", "1", 0.0, 0.0, 1.0,
     "fraction of the oxygen permeating to the cathode that recombines with hydrogen (forming water)",
     "typical assumption: nickel cathodes recombine little; the oxygen stays in the hydrogen (from memory)"},
    {"faraday_model", "1", 0.0, 0.0, 1.0,
     "Faraday efficiency: 0 = gas crossover (+ shunt option), 1 = Ulleberg 2003 empirical", "model choice"},
    {"ulleberg_f1", "A2/m4", 2.5e4, 1.0, 1e8,
     "Ulleberg f1 at 80 C in (A/m2)^2 (250 (mA/cm2)^2 = 2.5e4 (A/m2)^2); j in eta_F = j^2/(f1 + j^2) f2 is the "
     "current density",
     "Ulleberg, Int. J. Hydrogen Energy 28 (2003) 21, table of Faraday-efficiency parameters: f1 = 150, 200, 250 "
     "mA2/cm4 at 40, 60, 80 C (from memory)"},
    {"ulleberg_f1_temperature_coefficient", "A2/(m4 K)", 250.0, -1e6, 1e6,
     "change of f1 per kelvin (linear in T about 80 C)",
     "the same table: 2.5 (mA/cm2)^2 per K = 250 (A/m2)^2 per K, linear through all three rows"},
    {"ulleberg_f2", "1", 0.98, 0.5, 1.0, "Ulleberg f2 at 80 C",
     "the same table: f2 = 0.990, 0.985, 0.980 at 40, 60, 80 C (from memory)"},
    {"ulleberg_f2_temperature_coefficient", "1/K", -2.5e-4, -0.01, 0.01,
     "change of f2 per kelvin (linear in T about 80 C)", "the same table: -0.00025 per K through all three rows"},
    {"shunt_model", "1", 0.0, 0.0, 2.0,
     "shunt currents (faraday_model 0 only): 0 = none, 1 = fixed fraction, 2 = manifold resistor network",
     "model choice"},
    {"shunt_current_fraction", "1", 0.0, 0.0, 0.5, "fraction of the current bypassing the electrodes (shunt_model 1)",
     "off by default"},
    {"shunt_cells", "1", 100.0, 1.0, 10000.0,
     "cells of the stack for the shunt network (shunt_model 2; default: stack.cells, whose limit is the same)",
     "typical value, from memory"},
    {"shunt_channel_length_per_area", "1/m", 2500.0, 1.0, 1e8,
     "length over cross-section of one cell's electrolyte ports, all in parallel: R_channel = value/sigma_KOH",
     "typical value, from memory: four ports of 0.1 m length and 10 mm2 section"},
    {"shunt_manifold_length_per_area", "1/m", 1.25, 0.0, 1e6,
     "length over cross-section of the manifold segment between neighbouring cells, all manifolds in parallel",
     "typical value, from memory: four manifolds of 1000 mm2 section, 5 mm cell pitch"},
    {"shunt_cell_area", "m2", 2.5, 1e-4, 100.0, "active area of one cell, for the shunt network (default: stack.active_area)",
     "typical value, from memory"},
};

struct Losses {
    double activation_anode, activation_cathode, ohmic, concentration;
    double sum() const { return activation_anode + activation_cathode + ohmic + concentration; }
};

class AlkalineCell final : public Cell {
public:
    explicit AlkalineCell(const ParameterValues& v)
        : mass_fraction_(v.get("koh_mass_fraction")),
          molality_(molality_from_mass_fraction(mass_fraction_, molar_mass::KOH)),
          gap_(v.get("gap_anode") + v.get("gap_cathode")),
          separator_thickness_(v.get("separator_thickness")),
          macmullin_(v.get("separator_macmullin_number")),
          electrode_resistance_(v.get("electrode_resistance")),
          bubbles_{v.get("bubble_void_coefficient"), v.get("bubble_void_exponent"), v.get("bubble_void_max")},
          anode_(read_kinetics(v, "anode", kReferenceTemperature)),
          cathode_(read_kinetics(v, "cathode", kReferenceTemperature)),
          tafel_(read_choice(v, "kinetics_model") == 1),
          limiting_current_density_(v.get("limiting_current_density")),
          h2_{v.get("h2_permeability"), v.get("h2_permeability_activation_energy"), kReferenceTemperature},
          o2_{v.get("o2_permeability"), v.get("o2_permeability_activation_energy"), kReferenceTemperature},
          supersaturation_(v.get("supersaturation_pressure")),
          recombination_{v.get("o2_recombination_fraction"), 0.0},
          ulleberg_(read_choice(v, "faraday_model") == 1),
          f1_(v.get("ulleberg_f1")),
          f1_slope_(v.get("ulleberg_f1_temperature_coefficient")),
          f2_(v.get("ulleberg_f2")),
          f2_slope_(v.get("ulleberg_f2_temperature_coefficient")),
          shunt_model_(read_choice(v, "shunt_model")),
          shunt_fraction_(v.get("shunt_current_fraction")) {
        if (shunt_model_ == 2) {
            const int cells = static_cast<int>(read_choice(v, "shunt_cells"));
            const double channel = v.get("shunt_channel_length_per_area");
            const double factor = shunt_loss_factor(cells, v.get("shunt_manifold_length_per_area") / channel);
            // Mean lost current density per cell = G·V/(N·R_ch·A) with R_ch = channel/σ.
            shunt_conductance_factor_ = factor / (cells * channel * v.get("shunt_cell_area"));
        }
    }

    const Envelope& envelope() const override { return envelope_; }
    std::unique_ptr<Cell> clone() const override { return std::make_unique<AlkalineCell>(*this); }

    // Conservative: bypass currents keep the electrode current below the terminal current.
    double current_density_limit(const OperatingPoint&) const override {
        return current_density_cap(envelope_.current_density_max, limiting_current_density_);
    }

    // Where the electrode current just makes up for the gas crossing the separator; with bypass
    // currents the terminal current must be larger (exact for the fixed shunt fraction, a lower
    // bound otherwise, which the unit layer widens).
    double current_density_minimum(const OperatingPoint& p) const override {
        const double j_min = crossover_minimum_current_density(
            crossover(p, koh_water_activity_balej(molality_, p.temperature)), recombination_);
        return (!ulleberg_ && shunt_model_ == 1) ? j_min / (1.0 - shunt_fraction_) : j_min;
    }

    CellResult evaluate(const OperatingPoint& p) const override {
        CellResult r;
        r.warnings = check_envelope(envelope_, p, "alkaline");
        const double t = p.temperature, j = p.current_density;
        r.current_density = j;
        const double sigma = koh_conductivity_gilliam(koh_molarity(mass_fraction_, t), t);
        const double a_w = koh_water_activity_balej(molality_, t);
        r.reversible_voltage = reversible_voltage_liquid_water(t, p.pressure_anode, p.pressure_cathode, a_w);
        r.thermoneutral_voltage = thermoneutral_voltage_hhv(t);
        r.gases_saturated = true;
        r.water_activity_anode = r.water_activity_cathode = a_w;
        const CrossoverFluxes x = crossover(p, a_w);
        if (j == 0.0) {  // open circuit (hot standby): no gas made, the separator still passes hydrogen
            r.voltage = r.reversible_voltage;
            fill_water_cell_gases(r, 0.0, x, recombination_, p);
            return r;
        }

        const double h2_lost = x.hydrogen + 2.0 * recombination_.oxygen_at_cathode * x.oxygen;

        // Electrode current density: the terminal current less bypass currents that make no gas.
        // Ulleberg's efficiency lumps parasitic currents that bypass the electrodes without
        // lowering the current they carry: the losses stay at the terminal current.
        double j_e = j, j_losses = j;
        if (ulleberg_) {
            // Bypass current that brings the hydrogen delivered down to Ulleberg's efficiency; none
            // when crossover alone already loses more.
            const double bypass =
                (1.0 - ulleberg_faraday_efficiency(j, t, &r.warnings)) * j / (2.0 * kFaraday) - h2_lost;
            if (bypass > 0.0) j_e = j - 2.0 * kFaraday * bypass;
        } else if (shunt_model_ == 1) {
            j_e = j_losses = j * (1.0 - shunt_fraction_);
        } else if (shunt_model_ == 2) {
            // Shunt current ∝ cell voltage, which depends weakly on j_e: fixed-point iteration from
            // the reversible voltage (contraction factor k·dV/dj_e, about 1e-5 at nominal load and
            // 1e-3 near the minimum load for practical stacks).
            const double k = shunt_conductance_factor_ * sigma;
            j_e = j - k * r.reversible_voltage;
            for (int iter = 0; iter < 12 && j_e > 0.0; ++iter) {
                const double next = j - k * (r.reversible_voltage + compute_losses(j_e, t, sigma).sum());
                const bool converged = std::fabs(next - j_e) <= 1e-15 * j;
                j_e = next;
                if (converged) break;
            }
            j_losses = j_e;
        }
        if (!(j_e > 0.0))
            throw Error(ErrorKind::out_of_range,
                        fmt::format("alkaline cell: at {:g} A/m2 the shunt currents would carry the whole current "
                                    "({:g} K); raise the current density or lower the shunt model's share",
                                    j, t));
        fill_water_cell_gases(r, j_e, x, recombination_, p);
        const Losses losses = compute_losses(j_losses, t, sigma);
        if (j_losses > 0.95 * limiting_current_density_) r.warnings |= kWarnNearLimitingCurrent;
        r.activation_anode = losses.activation_anode;
        r.activation_cathode = losses.activation_cathode;
        r.ohmic = losses.ohmic;
        r.concentration = losses.concentration;
        r.voltage = r.reversible_voltage + r.activation_anode + r.activation_cathode + r.ohmic + r.concentration;
        return r;
    }

private:
    // Ulleberg (2003) with f1 and f2 linear in temperature about 80 °C, as his table at 40, 60 and
    // 80 °C gives them; outside 40..80 °C the result carries the extrapolation flag.
    double ulleberg_faraday_efficiency(double j, double t, uint32_t* warnings) const {
        const double dt = t - kUllebergReferenceTemperature;
        if (t < kUllebergTableLow || t > kUllebergTableHigh) *warnings |= kWarnTemperatureExtrapolated;
        return faraday_efficiency_ulleberg(j, f1_ + f1_slope_ * dt, std::min(1.0, f2_ + f2_slope_ * dt));
    }

    // Crossover driven by the partial pressures of the wet gases over the electrolyte (water
    // activity a_w) plus the supersaturation of the dissolved gas at the electrodes.
    CrossoverFluxes crossover(const OperatingPoint& p, double a_w) const {
        const double t = p.temperature;
        const double p_vapour = a_w * water_saturation_pressure(t);
        return {permeation_flux(gas_permeability(h2_, t), p.pressure_cathode - p_vapour + supersaturation_,
                                separator_thickness_),
                permeation_flux(gas_permeability(o2_, t), p.pressure_anode - p_vapour + supersaturation_,
                                separator_thickness_)};
    }

    Losses compute_losses(double j_e, double t, double sigma) const {
        Losses l{};
        l.concentration = concentration_overpotential(j_e, limiting_current_density_, t, 2);
        l.activation_anode = activation_overpotential(anode_, tafel_, j_e, t);
        l.activation_cathode = activation_overpotential(cathode_, tafel_, j_e, t);
        double asr = macmullin_ * separator_thickness_ / sigma + electrode_resistance_;
        if (gap_ > 0.0) asr += gap_ / bruggeman_conductivity(sigma, bubble_void_fraction(bubbles_, j_e));
        l.ohmic = j_e * asr;
        return l;
    }

    Envelope envelope_{298.15, 373.15, 8e4, 5e6, 2e4, 323.15, 363.15};
    double mass_fraction_, molality_, gap_, separator_thickness_, macmullin_, electrode_resistance_;
    BubbleVoidModel bubbles_;
    ElectrodeKinetics anode_, cathode_;
    bool tafel_;
    double limiting_current_density_;
    GasPermeability h2_, o2_;
    double supersaturation_;
    Recombination recombination_;
    bool ulleberg_;
    double f1_, f1_slope_, f2_, f2_slope_;
    uint32_t shunt_model_;
    double shunt_fraction_;
    double shunt_conductance_factor_ = 0.0;  // G/(N·(L/A)_channel·A_cell), 1/m: j_shunt = factor·σ·V
};

}  // namespace

const std::vector<ParameterInfo>& alkaline_parameters() { return kAlkalineParameters; }

std::unique_ptr<Cell> make_alkaline_cell(const ParameterValues& values) {
    return std::make_unique<AlkalineCell>(values);
}

}  // namespace ely
