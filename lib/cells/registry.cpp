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

}  // namespace

const std::vector<TechnologyInfo>& technologies() {
    static const std::vector<TechnologyInfo> all = {
        {"pem", "proton-exchange-membrane water electrolysis", kMakesHydrogen | kMakesOxygen, pem_parameters,
         make_pem_cell, {}, water_summary(), "examples/minimal/pem.json", 2.0e4,
         "2 A/cm2: inside the 1-3 A/cm2 nominal current density of PEM electrolysers (IRENA, Green "
         "Hydrogen Cost Reduction, 2020, table of key performance indicators)"},
        {"alkaline", "alkaline (KOH) water electrolysis", kMakesHydrogen | kMakesOxygen, alkaline_parameters,
         make_alkaline_cell,
         {{"shunt_cells", StackQuantity::cells}, {"shunt_cell_area", StackQuantity::active_area}}, water_summary(),
         "examples/minimal/alkaline.json", 4.0e3,
         "0.4 A/cm2: inside the 0.2-0.8 A/cm2 nominal current density of alkaline electrolysers (IRENA, Green "
         "Hydrogen Cost Reduction, 2020)"},
        {"solid_oxide", "solid oxide steam electrolysis", kMakesHydrogen | kMakesOxygen | kSteamFeed, solid_oxide_parameters,
         make_solid_oxide_cell, {}, steam_summary(), "examples/minimal/solid_oxide.json", 1.0e4,
         "1 A/cm2: the upper end of the 0.3-1 A/cm2 nominal current density of solid oxide electrolysers (IRENA, "
         "Green Hydrogen Cost Reduction, 2020; from memory)"},
        {"brine", "chlor-alkali membrane cell (brine electrolysis)", kMakesHydrogen | kBrineProducts, brine_parameters,
         make_brine_cell, {}, brine_summary(), "examples/minimal/brine.json", 5.0e3,
         "5 kA/m2: the middle of the 4-6 kA/m2 of membrane chlor-alkali cells (O'Brien, Bommaraju & Hine, "
         "Handbook of Chlor-Alkali Technology, 2005; from memory)"},
        {"custom", "custom cell from a table of competing half-reactions",
         kMakesHydrogen | kReactionTable, nullptr, nullptr, {}, custom_summary(),
         "examples/minimal/custom.json", 0.0,
         "none: the cell's own maximum current density (cell.current_density_max) unless the plant gives one"},
        {"aem", "anion-exchange-membrane water electrolysis (dilute KOH or pure-water feed)",
         kMakesHydrogen | kMakesOxygen, aem_parameters, make_aem_cell, {}, water_summary(), "examples/minimal/aem.json",
         1.0e4,
         "1 A/cm2: inside the 0.2-2 A/cm2 nominal current density of AEM electrolysers (IRENA, Green Hydrogen Cost "
         "Reduction, 2020)"},
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
