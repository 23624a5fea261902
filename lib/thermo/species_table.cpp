#include "thermo/species_table.hpp"

#include <cmath>
#include <fmt/format.h>

#include "base/check.hpp"
#include "thermo/constants.hpp"
#include "thermo/water.hpp"

namespace ely {
namespace {

namespace aw = atomic_weight;

// Sources of the rows (also in docs/cells-brine-custom.md, "Species table"):
const char* const kJanafGas = "NIST-JANAF (Chase 1998) via the NIST WebBook Shomate fits of species.hpp";
const char* const kIf97Water = "IAPWS-IF97 region 1 anchored to the CODATA key values (water.hpp)";
const char* const kNbsIons =
    "NBS tables, Wagman et al., J. Phys. Chem. Ref. Data 11, Suppl. 2 (1982), as reproduced in the CRC Handbook "
    "table 'Thermodynamic properties of aqueous systems' (rows for K+ seen; the others from memory); Cp held at its "
    "298.15 K value";
const char* const kJanafCondensed =
    "NIST-JANAF (Chase 1998): 298.15 K values, melting point and enthalpy of fusion, liquid Cp; solid Cp fitted to the "
    "JANAF table in the Maier-Kelley form (all from memory)";

SpeciesRecord gas_row(const char* name, Species gas) {
    SpeciesRecord r;
    r.name = name;
    r.phase = Phase::gas;
    r.model = SpeciesRecord::Model::ideal_gas;
    r.gas = gas;
    r.molar_mass = species_molar_mass(gas);
    const auto range = ideal_gas_range(gas);
    r.temperature_min = range.lo;
    r.temperature_max = range.hi;
    r.source = kJanafGas;
    return r;
}

// Aqueous ion, constant partial molar Cp; ΔfH° (kJ/mol), S° and Cp° (J/(mol K)) at 298.15 K.
SpeciesRecord ion_row(const char* name, double molar_mass, int charge, double formation_enthalpy_kj, double entropy,
                      double cp) {
    SpeciesRecord r;
    r.name = name;
    r.phase = Phase::aqueous;
    r.molar_mass = molar_mass;
    r.charge = charge;
    r.formation_enthalpy = 1e3 * formation_enthalpy_kj;
    r.entropy = entropy;
    r.segments[0] = {kStandardTemperature, cp, 0.0, 0.0, 0.0};
    r.segment_count = 1;
    r.temperature_min = 273.15;
    r.temperature_max = 373.15;
    r.source = kNbsIons;
    return r;
}

// Solid from 298.15 K to its melting point.
SpeciesRecord solid_row(const char* name, double molar_mass, double formation_enthalpy_kj, double entropy,
                        HeatCapacitySegment solid, double melting_point) {
    SpeciesRecord r;
    r.name = name;
    r.phase = Phase::solid;
    r.molar_mass = molar_mass;
    r.formation_enthalpy = 1e3 * formation_enthalpy_kj;
    r.entropy = entropy;
    r.segments[0] = solid;
    r.segment_count = 1;
    r.temperature_max = melting_point;
    r.source = kJanafCondensed;
    return r;
}

// The melt of a solid row: fusion at its melting point, then the liquid's constant Cp; valid from
// `lowest` (supercooled below the melting point) to `highest`.
SpeciesRecord melt_row(const SpeciesRecord& solid, double fusion_enthalpy_kj, double liquid_cp, double lowest,
                       double highest) {
    SpeciesRecord r = solid;
    r.phase = Phase::melt;
    r.segments[1] = {solid.temperature_max, liquid_cp, 0.0, 0.0, 1e3 * fusion_enthalpy_kj};
    r.segment_count = 2;
    r.temperature_min = lowest;
    r.temperature_max = highest;
    return r;
}

std::vector<SpeciesRecord> build_table() {
    std::vector<SpeciesRecord> t;
    t.push_back(gas_row("H2", Species::hydrogen));
    t.push_back(gas_row("O2", Species::oxygen));
    t.push_back(gas_row("N2", Species::nitrogen));
    t.push_back(gas_row("Cl2", Species::chlorine));
    t.push_back(gas_row("H2O", Species::water_vapour));
    {
        SpeciesRecord w;
        w.name = "H2O";
        w.phase = Phase::liquid;
        w.model = SpeciesRecord::Model::liquid_water;
        w.molar_mass = molar_mass::H2O;
        w.formation_enthalpy = kLiquidWaterFormationEnthalpy;
        w.entropy = kLiquidWaterEntropy298;
        w.temperature_min = 273.16;
        w.temperature_max = 623.15;
        w.source = kIf97Water;
        t.push_back(w);
    }
    // Aqueous ions (NBS 1982): ΔfH° kJ/mol, S° and Cp° J/(mol K).
    t.push_back(ion_row("H+", aw::H, 1, 0.0, 0.0, 0.0));  // the convention of the ionic scale
    t.push_back(ion_row("OH-", aw::O + aw::H, -1, -229.994, -10.75, -148.5));
    t.push_back(ion_row("Cl-", aw::Cl, -1, -167.159, 56.5, -136.4));
    t.push_back(ion_row("Na+", aw::Na, 1, -240.12, 59.0, 46.4));
    t.push_back(ion_row("K+", aw::K, 1, -252.38, 102.5, 21.8));
    t.push_back(ion_row("Zn+2", aw::Zn, 2, -153.89, -112.1, 46.0));
    t.push_back(ion_row("SO4-2", aw::S + 4 * aw::O, -2, -909.27, 20.1, -293.0));
    t.push_back(ion_row("HSO4-", aw::H + aw::S + 4 * aw::O, -1, -887.34, 131.8, -84.0));
    {
        // The chloride ion of a chloride melt: the reference ion of the melt's ionic scale, h = s = cp = 0 by
        // convention at every temperature (as H⁺(aq) in water). Half-reactions of a melt written with it (Cl2 +
        // 2 e⁻ → 2 Cl⁻, NaCl + e⁻ → Na + Cl⁻) have meaningful differences only: it cancels between the electrodes.
        SpeciesRecord r;
        r.name = "Cl-";
        r.phase = Phase::melt;
        r.molar_mass = aw::Cl;
        r.charge = -1;
        r.segments[0] = {kStandardTemperature, 0.0, 0.0, 0.0, 0.0};
        r.segment_count = 1;
        r.temperature_min = 298.15;
        r.temperature_max = 2000.0;
        r.source = "convention: the reference ion of a chloride melt (zero at every temperature; cancels between the "
                   "electrodes)";
        t.push_back(r);
    }
    // Metals and salts (NIST-JANAF, from memory): solid Cp as a + b T + c/T².
    const auto zinc = solid_row("Zn", aw::Zn, 0.0, 41.63, {kStandardTemperature, 22.38, 10.04e-3, 0.0, 0.0}, 692.68);
    t.push_back(zinc);
    const auto sodium = solid_row("Na", aw::Na, 0.0, 51.30, {kStandardTemperature, 28.23, 0.0, 0.0, 0.0}, 370.98);
    t.push_back(sodium);
    t.push_back(melt_row(sodium, 2.60, 30.0, 300.0, 1150.0));
    const auto magnesium = solid_row("Mg", aw::Mg, 0.0, 32.67, {kStandardTemperature, 21.4, 11.4e-3, 0.0, 0.0}, 923.0);
    t.push_back(magnesium);
    t.push_back(melt_row(magnesium, 8.48, 34.31, 700.0, 1360.0));
    const auto salt = solid_row("NaCl", aw::Na + aw::Cl, -411.12, 72.12, {kStandardTemperature, 45.8, 14.9e-3, 0.0, 0.0},
                                1073.8);
    t.push_back(salt);
    t.push_back(melt_row(salt, 28.16, 66.94, 700.0, 1700.0));
    const auto magnesium_chloride = solid_row("MgCl2", aw::Mg + 2 * aw::Cl, -641.62, 89.63,
                                              {kStandardTemperature, 78.0, 6.0e-3, -8.6e5, 0.0}, 987.0);
    t.push_back(magnesium_chloride);
    t.push_back(melt_row(magnesium_chloride, 43.1, 92.05, 800.0, 1690.0));
    return t;
}

// ∫cp dT and ∫cp/T dT of cp = a + b T + c/T² from t1 to t2.
double cp_integral(const HeatCapacitySegment& s, double t1, double t2) {
    return s.a * (t2 - t1) + 0.5 * s.b * (t2 * t2 - t1 * t1) - s.c * (1.0 / t2 - 1.0 / t1);
}
double cp_over_t_integral(const HeatCapacitySegment& s, double t1, double t2) {
    return s.a * std::log(t2 / t1) + s.b * (t2 - t1) - 0.5 * s.c * (1.0 / (t2 * t2) - 1.0 / (t1 * t1));
}
double cp_at(const HeatCapacitySegment& s, double t) { return s.a + s.b * t + s.c / (t * t); }

}  // namespace

const char* phase_name(Phase phase) {
    switch (phase) {
        case Phase::gas: return "gas";
        case Phase::liquid: return "liquid";
        case Phase::aqueous: return "aqueous";
        case Phase::solid: return "solid";
        case Phase::melt: return "melt";
    }
    return "?";
}

bool phase_from_name(std::string_view name, Phase* phase) {
    for (Phase candidate : {Phase::gas, Phase::liquid, Phase::aqueous, Phase::solid, Phase::melt})
        if (name == phase_name(candidate)) {
            *phase = candidate;
            return true;
        }
    return false;
}

const std::vector<SpeciesRecord>& species_table() {
    static const std::vector<SpeciesRecord> table = build_table();
    return table;
}

const SpeciesRecord& species_record(std::string_view name, Phase phase) {
    for (const auto& r : species_table())
        if (r.name == name && r.phase == phase) return r;
    std::string known;
    for (const auto& r : species_table())
        known += fmt::format("{}{} ({})", known.empty() ? "" : ", ", r.name, phase_name(r.phase));
    throw Error(ErrorKind::unknown_name,
                fmt::format("species '{}' ({}) is not in the species table; known: {}", name, phase_name(phase), known));
}

SpeciesRecord user_species_record(std::string name, Phase phase, double molar_mass, int charge,
                                  double formation_enthalpy, double entropy, double cp_a, double cp_b, double cp_c,
                                  double temperature_min, double temperature_max, std::string source) {
    const std::string what = "species '" + name + "'";
    if (name.empty()) throw Error(ErrorKind::invalid_argument, "a species needs a name");
    if (phase == Phase::gas || phase == Phase::liquid)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("{}: user rows describe condensed or aqueous species; gases and liquid water come "
                                "from the bundled fits",
                                what));
    require_positive(molar_mass, (what + ": molar mass").c_str(), "kg/mol");
    require_finite(formation_enthalpy, (what + ": formation enthalpy").c_str(), "J/mol");
    require_finite(entropy, (what + ": entropy").c_str(), "J/(mol K)");
    require_finite(cp_a, (what + ": heat capacity a").c_str());
    require_finite(cp_b, (what + ": heat capacity b").c_str());
    require_finite(cp_c, (what + ": heat capacity c").c_str());
    require_within(temperature_min, 1.0, 5000.0, (what + ": lowest temperature").c_str(), "K");
    require_within(temperature_max, temperature_min, 5000.0, (what + ": highest temperature").c_str(), "K");
    SpeciesRecord r;
    r.name = std::move(name);
    r.phase = phase;
    r.molar_mass = molar_mass;
    r.charge = charge;
    r.formation_enthalpy = formation_enthalpy;
    r.entropy = entropy;
    r.segments[0] = {kStandardTemperature, cp_a, cp_b, cp_c, 0.0};
    r.segment_count = 1;
    r.temperature_min = temperature_min;
    r.temperature_max = temperature_max;
    r.source = std::move(source);
    return r;
}

MolarProperties species_properties(const SpeciesRecord& r, double temperature) {
    require_finite(temperature, "temperature", "K");
    if (temperature < r.temperature_min || temperature > r.temperature_max)
        throw Error(ErrorKind::out_of_range,
                    fmt::format("species {} ({}): temperature {:g} K is outside its data range {:g}..{:g} K", r.name,
                                phase_name(r.phase), temperature, r.temperature_min, r.temperature_max));
    if (r.model == SpeciesRecord::Model::ideal_gas) return ideal_gas(r.gas, temperature);
    if (r.model == SpeciesRecord::Model::liquid_water) return liquid_water_standard(temperature);
    // Condensed: along the path from 298.15 K through each transition to the last segment, whose
    // cp carries on to T (above or below its start).
    double h = r.formation_enthalpy, s = r.entropy, t = kStandardTemperature;
    for (int i = 0; i + 1 < r.segment_count; ++i) {
        const auto& next = r.segments[i + 1];
        h += cp_integral(r.segments[i], t, next.t_start) + next.transition_enthalpy;
        s += cp_over_t_integral(r.segments[i], t, next.t_start) + next.transition_enthalpy / next.t_start;
        t = next.t_start;
    }
    const auto& last = r.segments[r.segment_count - 1];
    MolarProperties p{};
    p.cp = cp_at(last, temperature);
    p.enthalpy = h + cp_integral(last, t, temperature);
    p.entropy = s + cp_over_t_integral(last, t, temperature);
    p.gibbs = p.enthalpy - temperature * p.entropy;
    return p;
}

ReactionProperties reaction_properties(const std::vector<SpeciesTerm>& terms, int electrons, double temperature) {
    double dh = 0.0, ds = 0.0;
    for (const auto& term : terms) {
        const auto p = species_properties(term.species, temperature);
        dh += term.coefficient * p.enthalpy;
        ds += term.coefficient * p.entropy;
    }
    return {dh, ds, dh - temperature * ds, electrons};
}

ReactionProperties half_reaction_per_electron(const std::vector<SpeciesTerm>& reduction_terms, int electrons,
                                              double temperature) {
    if (electrons < 1)
        throw Error(ErrorKind::invalid_argument, fmt::format("half-reaction: {} electrons; it needs at least 1", electrons));
    double charge = 0.0;
    for (const auto& term : reduction_terms) charge += term.coefficient * term.species.charge;
    if (std::fabs(charge + electrons) > 1e-9)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("half-reaction: the charges of its species sum to {:g}, not to -{} (the electrons it "
                                "takes up as a reduction)",
                                charge, electrons));
    const auto r = reaction_properties(reduction_terms, electrons, temperature);
    // The standard hydrogen electrode, per electron: ½ H2(g) → H⁺ + e⁻, H⁺ on the conventional scale (h = s = 0
    // at every temperature: the bookkeeping holds for a melt too, where the terms cancel between electrodes).
    const auto h2 = ideal_gas(Species::hydrogen, temperature);
    const double she_h = -0.5 * h2.enthalpy, she_s = -0.5 * h2.entropy;
    const double n = electrons;
    const double dh = r.enthalpy / n + she_h, ds = r.entropy / n + she_s;
    return {dh, ds, dh - temperature * ds, 1};
}

}  // namespace ely
