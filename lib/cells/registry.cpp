// The one list of technologies. Each entry names the functions its folder defines: the
// parameter table (with the sources of its defaults) and the factory.
#include "cells/registry.hpp"

#include <fmt/format.h>

#include "base/error.hpp"

namespace ely {

// Defined in lib/cells/<name>/.
const std::vector<ParameterInfo>& pem_parameters();
std::unique_ptr<Cell> make_pem_cell(const ParameterValues& values);
const std::vector<ParameterInfo>& alkaline_parameters();
std::unique_ptr<Cell> make_alkaline_cell(const ParameterValues& values);
const std::vector<ParameterInfo>& solid_oxide_parameters();
std::unique_ptr<Cell> make_solid_oxide_cell(const ParameterValues& values);
const std::vector<ParameterInfo>& brine_parameters();
std::unique_ptr<Cell> make_brine_cell(const ParameterValues& values);
const std::vector<ParameterInfo>& aem_parameters();
std::unique_ptr<Cell> make_aem_cell(const ParameterValues& values);

namespace {

// Summary sections that several technologies share.
SummaryGroup operating_point() {
    return {"Operating point",
            {"in.temperature", "in.pressure_cathode", "in.pressure_anode", "cell.current_density", "perf.load_fraction"}};
}
SummaryGroup voltage_breakdown() {
    return {"Cell voltage breakdown",
            {"cell.reversible_voltage", "cell.activation_anode", "cell.activation_cathode", "cell.ohmic",
             "cell.concentration", "cell.voltage", "cell.thermoneutral_voltage"}};
}
SummaryGroup stacks_and_plant() {
    return {"Stacks and plant",
            {"stack.current", "stack.voltage", "stack.power", "plant.power", "plant.rectifier_efficiency"}};
}

std::vector<SummaryGroup> water_summary() {
    return {operating_point(),
            voltage_breakdown(),
            stacks_and_plant(),
            {"Products and feeds",
             {"product.hydrogen", "product.oxygen", "feed.water", "perf.water_per_hydrogen",
              "stream.condensate.mass_flow", "feed.hydrogen"}},
            {"Efficiency and heat",
             {"cell.faraday_efficiency", "perf.specific_energy", "perf.specific_energy_plant", "perf.efficiency_hhv",
              "heat.duty", "heat.gas_coolers"}},
            {"Gas purity", {"gas.h2_in_o2", "gas.o2_in_h2"}}};
}

// A steam-fed cell: its plant raises the steam and heats the sweep air; no crossover purity to show.
std::vector<SummaryGroup> steam_summary() {
    return {operating_point(),
            voltage_breakdown(),
            stacks_and_plant(),
            {"Products and feeds",
             {"product.hydrogen", "product.oxygen", "feed.water", "perf.water_per_hydrogen",
              "stream.condensate.mass_flow", "feed.sweep_air"}},
            {"Efficiency and heat",
             {"cell.faraday_efficiency", "perf.specific_energy", "perf.specific_energy_plant", "perf.efficiency_hhv",
              "heat.duty", "heat.feed_heating", "heat.gas_coolers"}}};
}

std::vector<SummaryGroup> brine_summary() {
    return {operating_point(),
            voltage_breakdown(),
            stacks_and_plant(),
            {"Products and feeds",
             {"product.chlorine", "product.caustic", "product.caustic_solution", "feed.salt", "feed.water"}},
            {"Per tonne of chlorine and of caustic",
             {"perf.specific_energy_chlorine", "perf.specific_energy_caustic", "perf.salt_per_chlorine",
              "perf.salt_per_caustic", "perf.water_per_chlorine", "perf.water_per_caustic"}},
            {"Efficiency and heat", {"cell.chlorine_efficiency", "cell.caustic_efficiency", "heat.duty"}},
            {"Hydrogen (by-product)", {"product.hydrogen"}},
            {"Gas purity", {"gas.o2_in_cl2", "gas.h2_in_o2"}},
            {"Brine loop", {}, true}};
}

std::vector<SummaryGroup> custom_summary() {
    return {operating_point(),
            voltage_breakdown(),
            stacks_and_plant(),
            {"Main product", {"product.main", "cell.main_product_efficiency", "perf.specific_energy_main"}},
            {"Reactions (share of each electrode's current, product made)", {}, true},
            {"Hydrogen (a by-product unless it is the main product), water and heat",
             {"product.hydrogen", "feed.water", "heat.duty"}}};
}

// --- Dynamic defaults (DynamicDefaults, registry.hpp) ---------------------------------------
// Water cooling: coolant at 25 °C with a 10 K rise across the exchanger at rated load (cooling-
// water practice, common practice); its heat capacity 4181 J/(kg·K) is liquid water at 25 °C and
// 0.1 MPa (IAPWS-IF97 region 1 gives 4181.3 J/(kg·K)). Heat loss: the natural cooling time
// constant C/UA of about 29 h that Ulleberg reports for an alkaline unit (Int. J. Hydrogen Energy
// 28 (2003) 21: thermal capacity 625 kJ/K, thermal resistance 0.167 K/W for 21 cells of 0.25 m²;
// from memory) is kept for the other liquid-electrolyte plants. Start-up, ramp and separator
// figures are the order of magnitude of IRENA, Green Hydrogen Cost Reduction (2020), KPI table
// (cold start to nominal load: PEM < 20 min, alkaline < 50 min) and of Buttler & Spliethoff,
// Renew. Sustain. Energy Rev. 82 (2018) 2440 (load gradients, warm starts; from memory).
constexpr double kWaterCoolantTemperature = 298.15;  // K
constexpr double kWaterHeatCapacity = 4181.0;        // J/(kg K)
constexpr double kWaterCoolantRise = 10.0;           // K
constexpr double kNaturalCoolingTime = 29.0 * 3600;  // s (Ulleberg 2003, from memory)

DynamicDefaults water_cooled(double heat_capacity_per_area, double ramp_rate, double holdup_time,
                             double cold_start_duration, double warm_start_duration, double heat_up_time,
                             const char* source) {
    return {heat_capacity_per_area, heat_capacity_per_area / kNaturalCoolingTime, kWaterCoolantTemperature,
            kWaterHeatCapacity, kWaterCoolantRise, ramp_rate, holdup_time, cold_start_duration, warm_start_duration,
            heat_up_time, source};
}

// PEM: about 10 kJ/(K·m²) of stack hardware (titanium plates, porous layers) and 160 kJ/(K·m²)
// of circulating water (about 40 L of loop water per m² of cell area): an estimate, from memory,
// which heats a plant from 15 °C to 65 °C at rated load in about ten minutes (IRENA 2020: cold
// start < 20 min). Ramps of 10–100 %/s, warm start in seconds (Buttler & Spliethoff 2018, from
// memory): 10 %/s and 10 s; purge and pressurisation 5 min.
DynamicDefaults pem_dynamics() {
    return water_cooled(1.7e5, 0.1, 120, 300, 10, 3600,
                        "estimate from stack hardware and loop water (from memory); IRENA 2020 start-up times");
}
// Alkaline: Ulleberg's 625 kJ/K over 21 cells of 0.25 m² = 1.19e5 J/(K·m²) and 5.99 W/K over
// the same area = 1.14 W/(K·m²) (from memory). Ramps of 0.2–20 %/s, warm start in minutes
// (Buttler & Spliethoff 2018, from memory): 2 %/s and 2 min; 20 min of purge and pressurisation
// within IRENA's < 50 min cold start.
DynamicDefaults alkaline_dynamics() {
    DynamicDefaults d = water_cooled(1.19e5, 0.02, 300, 1200, 120, 7200,
                                     "Ulleberg 2003 thermal capacity and resistance (from memory); IRENA 2020");
    d.heat_loss_per_area = 1.14;
    return d;
}
// Solid oxide: ceramic cells and steel interconnects, no liquid loop, about 20 kJ/(K·m²); hot-box
// insulation with a natural cooling time of about 10 h; cooled by the air sweep, preheated to
// 650 °C, with a 50 K rise (an estimate: stacks keep air temperature rises below about 100 K,
// from memory); air at about 950 K: 1140 J/(kg·K) (0.79 N2 + 0.21 O2, NIST Shomate). Heat-up
// limited to about 1 K/min (12 h), warm start 15 min, ramps of about 0.5 %/s (from memory).
DynamicDefaults solid_oxide_dynamics() {
    return {2.0e4, 2.0e4 / (10.0 * 3600), 923.15, 1140.0, 50.0, 0.005, 60, 1800, 900, 12 * 3600.0,
            "estimate from cell and interconnect mass (from memory); air sweep as coolant"};
}
// Brine (membrane chlor-alkali): large anolyte and catholyte loops, about 200 kJ/(K·m²); slow
// load changes of about 0.5 %/s, start-up in about an hour (typical values, from memory).
DynamicDefaults brine_dynamics() {
    return water_cooled(2.0e5, 0.005, 120, 3600, 600, 4 * 3600.0, "typical values, from memory");
}
// AEM: a PEM-like stack with a dilute-lye or water loop (typical values, from memory).
DynamicDefaults aem_dynamics() {
    return water_cooled(1.5e5, 0.1, 120, 300, 10, 3600, "as PEM (typical values, from memory)");
}
// Custom cells (electrowinning and other liquid-electrolyte cells): the alkaline figures.
DynamicDefaults custom_dynamics() {
    DynamicDefaults d = alkaline_dynamics();
    d.source = "the alkaline figures (typical values, from memory)";
    return d;
}

}  // namespace

const std::vector<TechnologyInfo>& technologies() {
    static const std::vector<TechnologyInfo> all = {
        {"pem", "proton-exchange-membrane water electrolysis", kMakesHydrogen | kMakesOxygen, pem_parameters,
         make_pem_cell, {}, water_summary(), "examples/minimal/pem.json", 2.0e4,
         "2 A/cm2: inside the 1-3 A/cm2 nominal current density of PEM electrolysers (IRENA, Green "
         "Hydrogen Cost Reduction, 2020, table of key performance indicators)",
         pem_dynamics()},
        {"alkaline", "alkaline (KOH) water electrolysis", kMakesHydrogen | kMakesOxygen, alkaline_parameters,
         make_alkaline_cell,
         {{"shunt_cells", StackQuantity::cells}, {"shunt_cell_area", StackQuantity::active_area}}, water_summary(),
         "examples/minimal/alkaline.json", 4.0e3,
         "0.4 A/cm2: inside the 0.2-0.8 A/cm2 nominal current density of alkaline electrolysers (IRENA, Green "
         "Hydrogen Cost Reduction, 2020)",
         alkaline_dynamics()},
        {"solid_oxide", "solid oxide steam electrolysis", kMakesHydrogen | kMakesOxygen | kSteamFeed, solid_oxide_parameters,
         make_solid_oxide_cell, {}, steam_summary(), "examples/minimal/solid_oxide.json", 1.0e4,
         "1 A/cm2: the upper end of the 0.3-1 A/cm2 nominal current density of solid oxide electrolysers (IRENA, "
         "Green Hydrogen Cost Reduction, 2020, as reproduced by Chen et al., Energy Mater. 5 (2025) 500045, Table 1)",
         solid_oxide_dynamics()},
        {"brine", "chlor-alkali membrane cell (brine electrolysis)", kMakesHydrogen | kBrineProducts, brine_parameters,
         make_brine_cell, {}, brine_summary(), "examples/minimal/brine.json", 5.0e3,
         "5 kA/m2: the middle of the 4-6 kA/m2 of membrane chlor-alkali cells (O'Brien, Bommaraju & Hine, "
         "Handbook of Chlor-Alkali Technology, 2005; from memory)",
         brine_dynamics()},
        {"custom", "custom cell from a table of competing half-reactions",
         kMakesHydrogen | kReactionTable, nullptr, nullptr, {}, custom_summary(),
         "examples/minimal/custom.json", 0.0,
         "none: the cell's own maximum current density (cell.current_density_max) unless the plant gives one",
         custom_dynamics()},
        {"aem", "anion-exchange-membrane water electrolysis (dilute KOH or pure-water feed)",
         kMakesHydrogen | kMakesOxygen, aem_parameters, make_aem_cell, {}, water_summary(), "examples/minimal/aem.json",
         1.0e4,
         "1 A/cm2: inside the 0.2-2 A/cm2 nominal current density of AEM electrolysers (IRENA, Green Hydrogen Cost "
         "Reduction, 2020)",
         aem_dynamics()},
    };
    return all;
}

const TechnologyInfo* find_technology(std::string_view name) {
    for (const auto& t : technologies())
        if (name == t.name) return &t;
    return nullptr;
}

std::string technology_names() {
    std::string out;
    for (const auto& t : technologies()) out += (out.empty() ? "" : ", ") + std::string(t.name);
    return out;
}

const TechnologyInfo& technology(std::string_view name) {
    if (const auto* t = find_technology(name)) return *t;
    throw Error(ErrorKind::unknown_name, fmt::format("unknown technology '{}'; known: {}", name, technology_names()));
}

const std::vector<ParameterInfo>& cell_parameters(const TechnologyInfo& t) {
    if (!t.parameters)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("the {} technology has no parameter table; it is built from its reaction table", t.name));
    return t.parameters();
}

std::unique_ptr<Cell> make_cell(const TechnologyInfo& t, const ParameterValues& values) {
    if (!t.make)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("the {} technology is built from its reaction table, not from parameters", t.name));
    return t.make(values);
}

}  // namespace ely
