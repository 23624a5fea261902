// Chlor-alkali membrane cell. Anode (dimensionally stable anode): 2 Cl⁻ → Cl2 + 2 e⁻, plus
// the oxidation of hydroxide that back-migrates through the membrane, 4 OH⁻ → O2 + 2 H2O + 4 e⁻;
// cathode (activated nickel): 2 H2O + 2 e⁻ → H2 + 2 OH⁻. Equations and every default with its
// source: docs/cells-brine-custom.md.
#include "cells/brine/brine.hpp"
#include "cells/brine/brine_loop.hpp"

#include <cmath>
#include <fmt/format.h>

#include "cells/cell_support.hpp"
#include "electrochem/conduction.hpp"
#include "electrochem/electrolyte.hpp"
#include "electrochem/kinetics.hpp"
#include "base/check.hpp"
#include "thermo/constants.hpp"
#include "thermo/reaction.hpp"

namespace ely {
namespace {

constexpr double kReferenceCausticMassFraction = 0.32;

// Envelope (common practice of membrane chlor-alkali plants; O'Brien, Bommaraju & Hine,
// Handbook of Chlor-Alkali Technology, 2005, from memory): 60–95 °C hard, the defaults are
// fitted for 70–90 °C; 1–2 bar absolute on each side; up to 7 kA/m².
constexpr Envelope kBrineEnvelope{333.15, 368.15, 1.0e5, 2.0e5, 7000.0, 343.15, 363.15};

const char* const kTypical = "typical value, from memory";
const char* const kHandbook =
    "typical value, from memory (O'Brien, Bommaraju & Hine, Handbook of Chlor-Alkali Technology, 2005)";

struct BrineSettings {
    int voltage_model;  // 0 physics, 1 linear fit
    double linear_intercept, linear_slope;
    double nacl_molality, naoh_mass_fraction;
    double efficiency_at_32wt, efficiency_slope;
    double water_transport_number;
    ElectrodeKinetics anode, cathode;
    double membrane_asr, membrane_activation_energy, membrane_reference_temperature;
    double anolyte_gap, anolyte_void_fraction, catholyte_gap, catholyte_void_fraction;
    ArrheniusConductivity anolyte_conductivity, catholyte_conductivity;
    double contact_asr;
    double feed_nacl_molality;  // resaturated brine fed to the anolyte, mol/kg (brine loop outputs)
};

class BrineCell final : public Cell {
public:
    explicit BrineCell(const BrineSettings& s)
        : s_(s), naoh_molality_(molality_from_mass_fraction(s.naoh_mass_fraction, molar_mass::NaOH)) {}
    const Envelope& envelope() const override { return kBrineEnvelope; }
    std::unique_ptr<Cell> clone() const override { return std::make_unique<BrineCell>(*this); }
    double current_density_limit(const OperatingPoint&) const override { return kBrineEnvelope.current_density_max; }
    CellResult evaluate(const OperatingPoint& point) const override;
    const std::vector<VariableInfo>& own_outputs() const override { return brine_loop_outputs(); }
    void fill_own_outputs(const CellResult& r, const PlantFlows& flows, double* values) const override {
        fill_brine_loop(r, flows, s_.feed_nacl_molality, values);
    }
    // The brine loop as solutions for the energy balance (their heats of mixing).
    void solution_streams(const CellResult& r, const PlantFlows& flows, SolutionStreams& out) const override {
        const BrineLoopFlows loop = brine_loop_flows(r, flows, s_.feed_nacl_molality);
        const double feed = loop.feed_water / molar_mass::H2O, depleted = loop.depleted_water / molar_mass::H2O;
        out.streams[0] = {AqueousSalt::sodium_chloride, feed, loop.feed_water * loop.feed_molality, true};
        out.streams[1] = {AqueousSalt::sodium_chloride, depleted, loop.depleted_water * loop.depleted_molality, false};
        out.count = 2;
    }

private:
    double area_specific_resistance(double temperature) const;
    BrineSettings s_;
    double naoh_molality_;
};

double BrineCell::area_specific_resistance(double t) const {
    const double membrane = arrhenius_area_specific_resistance(s_.membrane_asr, s_.membrane_activation_energy,
                                                               s_.membrane_reference_temperature, t);
    const double anolyte =
        bubbly_gap_resistance(s_.anolyte_gap, arrhenius_conductivity(s_.anolyte_conductivity, t), s_.anolyte_void_fraction);
    const double catholyte = bubbly_gap_resistance(s_.catholyte_gap, arrhenius_conductivity(s_.catholyte_conductivity, t),
                                                   s_.catholyte_void_fraction);
    return membrane + anolyte + catholyte + s_.contact_asr;
}

CellResult BrineCell::evaluate(const OperatingPoint& p) const {
    CellResult r;
    r.warnings = check_envelope(kBrineEnvelope, p, "brine");
    const double t = p.temperature, j = p.current_density;

    // Electrolyte activities (Pitzer): depleted anolyte brine and catholyte caustic.
    const auto anolyte = aqueous_salt_activity(AqueousSalt::sodium_chloride, s_.nacl_molality, t);
    const auto catholyte = aqueous_salt_activity(AqueousSalt::sodium_hydroxide, naoh_molality_, t);
    const double ce = brine_caustic_current_efficiency(s_.naoh_mass_fraction, s_.efficiency_at_32wt, s_.efficiency_slope);

    // Reversible voltage: wet product gases saturated over each side's electrolyte; the dry
    // anode gas is Cl2 with the O2 of the side reaction, x_Cl2 = 2 CE/(1 + CE).
    const double x_cl2 = 2.0 * ce / (1.0 + ce);
    const double p_cl2 = x_cl2 * wet_gas_partial_pressure(p.pressure_anode, t, anolyte.water_activity, "anode pressure");
    const double p_h2 = wet_gas_partial_pressure(p.pressure_cathode, t, catholyte.water_activity, "cathode pressure");
    r.reversible_voltage = reversible_voltage_brine(t, p_cl2, p_h2, catholyte.electrolyte_activity,
                                                    anolyte.electrolyte_activity, catholyte.water_activity);
    // Thermoneutral voltage at the cell's solutions: the heats of mixing of the concentrated caustic and
    // brine included (the consistent pair of the activity-based Nernst voltage above).
    r.thermoneutral_voltage = thermoneutral_voltage(brine_electrolysis_at(t, s_.nacl_molality, naoh_molality_));
    r.current_density = j;

    if (s_.voltage_model == 0) {
        r.activation_anode = activation_overpotential(s_.anode, false, j, t);
        r.activation_cathode = activation_overpotential(s_.cathode, false, j, t);
        r.ohmic = j * area_specific_resistance(t);
    } else {
        // U = U0 + k j: the intercept's excess over E_rev is reported as anode activation, the
        // slope term as ohmic. U0 − E_rev is exact in floating point (Sterbenz) for E/2 <= U0 <= 2E,
        // so the parts add up to U0 + k j bit for bit.
        const double excess = s_.linear_intercept - r.reversible_voltage;
        if (excess >= 0.0) {
            r.activation_anode = excess;
            r.ohmic = s_.linear_slope * j;
        } else {
            r.ohmic = excess + s_.linear_slope * j;
            if (r.ohmic < 0.0)
                throw Error(ErrorKind::out_of_range,
                            fmt::format("brine cell: linear fit U0 + k*j = {:.6g} V at {:g} A/m2 is below the reversible "
                                        "voltage {:.6g} V at {:g} K",
                                        s_.linear_intercept + s_.linear_slope * j, j, r.reversible_voltage, t));
        }
    }
    r.concentration = 0.0;
    r.voltage = r.reversible_voltage + r.activation_anode + r.activation_cathode + r.ohmic + r.concentration;

    // Products per m²: all cathode current makes H2; the share CE of the current is carried
    // through the membrane by Na⁺ (caustic), the rest by OH⁻ moving back to the anode, where
    // it is oxidized to O2 instead of Cl⁻ to Cl2.
    const double n = j / kFaraday;  // mol e⁻/(m² s)
    r.cathode_out[kH2] = 0.5 * n;
    r.cathode_out[kNaOH] = ce * n;
    r.anode_out[kCl2] = 0.5 * (ce * n);
    r.anode_out[kO2] = 0.25 * ((1.0 - ce) * n);
    r.consumed[kNaCl] = ce * n;
    r.consumed[kH2O] = n - 0.5 * ((1.0 - ce) * n);  // cathode water reduction minus water formed at the anode
    r.water_drag = s_.water_transport_number * (ce * n);

    r.faraday_efficiency = 1.0;  // hydrogen basis: no H2 loss modelled
    r.h2_in_o2 = 0.0;            // H2 in the (chlorine) anode gas: none through a membrane cell, as modelled
    r.o2_in_h2 = 0.0;
    r.gases_saturated = true;
    r.water_activity_anode = anolyte.water_activity;
    r.water_activity_cathode = catholyte.water_activity;
    r.caustic_efficiency = ce;
    r.chlorine_efficiency = ce;
    r.caustic_mass_fraction = s_.naoh_mass_fraction;
    r.anolyte_nacl_molality = s_.nacl_molality;
    r.o2_in_cl2 = brine_o2_in_cl2(r);
    return r;
}

}  // namespace

double brine_caustic_current_efficiency(double w, double efficiency_at_32wt, double slope) {
    require_finite(w, "caustic mass fraction");
    require_finite(efficiency_at_32wt, "caustic current efficiency at 32 wt %");
    require_finite(slope, "caustic current efficiency slope");
    const double ce = std::fmin(1.0, efficiency_at_32wt - slope * (w - kReferenceCausticMassFraction));
    if (!(ce > 0.0))
        throw Error(ErrorKind::out_of_range,
                    fmt::format("caustic current efficiency {:g} at NaOH mass fraction {:g} is not positive", ce, w));
    return ce;
}

double brine_o2_in_cl2(const CellResult& r) {
    const double total = r.anode_out[kCl2] + r.anode_out[kO2];
    return total > 0.0 ? r.anode_out[kO2] / total : 0.0;
}

const std::vector<ParameterInfo>& brine_parameters() {
    static const std::vector<ParameterInfo> infos{
        {"voltage_model", "1", 0, 0, 1, "0: physics (Nernst + Butler-Volmer + ohmic); 1: linear fit U = U0 + k*j",
         "model choice"},
        {"linear_voltage_intercept", "V", 2.50, 1.5, 4.0, "U0 of the linear fit (voltage_model 1)", kHandbook},
        {"linear_voltage_slope", "ohm m2", 1.0e-4, 0.0, 1.0e-3,
         "k of the linear fit (voltage_model 1), V per A/m2 (0.1 V per kA/m2)", kHandbook},
        {"anolyte_nacl_molality", "mol/kg", 3.8, 1.0, 6.0,
         "NaCl molality of the depleted anolyte brine (3.8 mol/kg = 18.2 wt % = about 206 g/L at 20 C)", kHandbook},
        {"catholyte_naoh_mass_fraction", "1", 0.32, 0.20, 0.38, "NaOH mass fraction of the catholyte (caustic product)",
         kHandbook},
        {"caustic_efficiency_at_32wt", "1", 0.96, 0.5, 1.0, "caustic current efficiency at 32 wt % NaOH", kHandbook},
        {"caustic_efficiency_slope", "1", 0.25, 0.0, 5.0,
         "fall of the caustic current efficiency per unit NaOH mass fraction above 0.32 (0.0025 per wt %)", kTypical},
        {"water_transport_number", "mol/mol", 4.0, 0.0, 10.0,
         "water carried anolyte -> catholyte per Na+ crossing the membrane", kTypical},
        {"anode_exchange_current_density", "A/m2", 30.0, 1e-6, 1e5,
         "Cl2 evolution on the dimensionally stable anode, geometric area, at the kinetics reference temperature",
         "typical value, from memory: about 0.1 V chlorine overpotential at 4 kA/m2 and 90 C; set with the other "
         "voltage defaults so the cell runs at 2.9-3.1 V over 4-6 kA/m2 (O'Brien, Bommaraju & Hine, Handbook of "
         "Chlor-Alkali Technology, 2005, from memory)"},
        {"anode_transfer_coefficient_forward", "1", 1.5, 0.05, 4.0, "anodic transfer coefficient (Tafel slope 2.303RT/(alpha F): 39 mV/dec at 25 C)",
         kTypical},
        {"anode_transfer_coefficient_backward", "1", 0.5, 0.05, 4.0, "cathodic transfer coefficient of the chlorine electrode", kTypical},
        {"anode_activation_energy", "J/mol", 30000.0, 0.0, 2e5, "Arrhenius activation energy of the anode j0", kTypical},
        {"cathode_exchange_current_density", "A/m2", 30.0, 1e-6, 1e5,
         "H2 evolution on the activated nickel cathode, geometric area, at the kinetics reference temperature",
         "typical value, from memory: about 0.15 V at 4 kA/m2 in 32 wt% caustic at 90 C (see the anode's)"},
        {"cathode_transfer_coefficient_forward", "1", 1.0, 0.05, 4.0, "cathodic transfer coefficient of H2 evolution", kTypical},
        {"cathode_transfer_coefficient_backward", "1", 1.0, 0.05, 4.0, "anodic transfer coefficient of the hydrogen electrode", kTypical},
        {"cathode_activation_energy", "J/mol", 35000.0, 0.0, 2e5, "Arrhenius activation energy of the cathode j0", kTypical},
        {"kinetics_reference_temperature", "K", 363.15, 273.15, 473.15,
         "reference temperature of both j0 and of the membrane and electrolyte conductivities", "model choice (90 C)"},
        {"membrane_asr", "ohm m2", 5.0e-5, 0.0, 1e-2,
         "area-specific resistance of the bilayer perfluorinated cation-exchange membrane at the reference temperature",
         "0.5 ohm cm2 (typical value, from memory; O'Brien, Bommaraju & Hine 2005); see the anode's j0"},
        {"membrane_activation_energy", "J/mol", 18000.0, 0.0, 1e5, "Arrhenius activation energy of membrane conduction",
         kTypical},
        {"anolyte_gap", "m", 0.5e-3, 0.0, 0.01, "effective anolyte path between anode and membrane", kTypical},
        {"anolyte_conductivity", "S/m", 50.0, 1.0, 500.0, "depleted brine conductivity at the reference temperature",
         kTypical},
        {"anolyte_void_fraction", "1", 0.3, 0.0, 0.8, "Cl2 gas void fraction in the anolyte path (Bruggeman)", kTypical},
        {"catholyte_gap", "m", 0.7e-3, 0.0, 0.01, "catholyte gap between membrane and cathode",
         "typical value, from memory: a narrow-gap cell (see the anode's j0)"},
        {"catholyte_conductivity", "S/m", 75.0, 1.0, 500.0, "32 wt % NaOH conductivity at the reference temperature",
         kTypical},
        {"catholyte_void_fraction", "1", 0.1, 0.0, 0.8, "H2 gas void fraction in the catholyte gap (Bruggeman)", kTypical},
        {"electrolyte_conductivity_activation_energy", "J/mol", 15000.0, 0.0, 1e5,
         "Arrhenius activation energy of anolyte and catholyte conductivity (about 1.4 %/K at 90 C)", kTypical},
        {"contact_asr", "ohm m2", 5.0e-6, 0.0, 1e-2, "electronic and contact resistance of electrodes and structure",
         kTypical},
        {"brine_feed_nacl_mass_fraction", "1", 0.26, 0.05, 0.27,
         "NaCl mass fraction of the resaturated brine fed to the anolyte; sets the brine circulation of the brine-loop "
         "outputs (must be stronger than the depleted anolyte)",
         "resaturated brine about 300-310 g/L, 26 wt % (common practice, from memory)"},
    };
    return infos;
}

std::unique_ptr<Cell> make_brine_cell(const ParameterValues& v) {
    BrineSettings s{};
    s.voltage_model = static_cast<int>(read_choice(v, "voltage_model"));
    s.linear_intercept = v.get("linear_voltage_intercept");
    s.linear_slope = v.get("linear_voltage_slope");
    s.nacl_molality = v.get("anolyte_nacl_molality");
    s.naoh_mass_fraction = v.get("catholyte_naoh_mass_fraction");
    s.efficiency_at_32wt = v.get("caustic_efficiency_at_32wt");
    s.efficiency_slope = v.get("caustic_efficiency_slope");
    s.water_transport_number = v.get("water_transport_number");
    const double t_ref = v.get("kinetics_reference_temperature");
    s.anode = read_kinetics(v, "anode", t_ref);
    s.cathode = read_kinetics(v, "cathode", t_ref);
    s.membrane_asr = v.get("membrane_asr");
    s.membrane_activation_energy = v.get("membrane_activation_energy");
    s.membrane_reference_temperature = t_ref;
    s.anolyte_gap = v.get("anolyte_gap");
    s.anolyte_void_fraction = v.get("anolyte_void_fraction");
    s.catholyte_gap = v.get("catholyte_gap");
    s.catholyte_void_fraction = v.get("catholyte_void_fraction");
    const double ea_el = v.get("electrolyte_conductivity_activation_energy");
    s.anolyte_conductivity = {v.get("anolyte_conductivity"), t_ref, ea_el};
    s.catholyte_conductivity = {v.get("catholyte_conductivity"), t_ref, ea_el};
    s.contact_asr = v.get("contact_asr");
    const double feed_fraction = v.get("brine_feed_nacl_mass_fraction");
    s.feed_nacl_molality = molality_from_mass_fraction(feed_fraction, molar_mass::NaCl);
    if (!(s.feed_nacl_molality > s.nacl_molality))
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("brine_feed_nacl_mass_fraction {:g} ({:.4g} mol/kg) is not stronger than the depleted "
                                "anolyte, anolyte_nacl_molality {:.4g} mol/kg",
                                feed_fraction, s.feed_nacl_molality, s.nacl_molality));
    // The efficiency must stay positive at the chosen caustic strength: checked once here.
    brine_caustic_current_efficiency(s.naoh_mass_fraction, s.efficiency_at_32wt, s.efficiency_slope);
    return std::make_unique<BrineCell>(s);
}

}  // namespace ely
