#pragma once
// The technology registry: one entry per cell technology. The config (technology names, the
// keys of "cell"), the variable table (which variables a technology has), the docs, the
// command-line summary and the parameterised tests all iterate over it.
//
// Adding a technology: its folder lib/cells/<name>/ (the cell model, its parameter table with
// the sources of its defaults, its factory), one entry in registry.cpp, its tests, its docs
// and a minimal example. Nothing else changes.
#include <cstdint>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "cells/cell.hpp"
#include "cells/parameters.hpp"

namespace ely {

/// What a technology's cell makes or how it is built. A variable exists for a technology when
/// the technology has every feature the variable needs (VariableInfo::needs).
enum TechnologyFeature : uint32_t {
    kMakesHydrogen = 1u << 0,   // a hydrogen product: the hydrogen-rate spec, figures per kg of hydrogen
    kMakesOxygen = 1u << 1,     // an oxygen product (the anode gas of water cells)
    kBrineProducts = 1u << 2,   // chlorine, caustic soda and a salt feed
    kReactionTable = 1u << 3,   // built from the config's table of half-reactions instead of a parameter table
    kSteamFeed = 1u << 5,       // fed steam: steam raising and an oxygen-electrode sweep in the plant balances
};

/// A cell parameter whose default is taken from the plant description's stack section, so
/// that the stack geometry has one source.
enum class StackQuantity { cells, active_area };
struct StackDefault {
    const char* parameter;
    StackQuantity from;
};

/// One section of the summary a host prints: a heading and the variables it shows, in order.
struct SummaryGroup {
    const char* title;
    std::vector<const char*> variables;
    bool own_outputs = false;  // followed by the outputs the cell adds (Cell::own_outputs)
};

/// What the plant in time (dynamic runs: reset, advance, lib/unit/dynamics*.cpp) takes from the
/// technology where the variable table has no one value: thermal mass, heat loss, coolant,
/// ramp, separator and start-up data. Values per m² scale with the plant's total active area
/// (cells × active area × stacks). Sources are named beside each entry (registry.cpp) and in
/// docs/dynamics.md.
struct DynamicDefaults {
    double heat_capacity_per_area;    // J/(K·m²): stacks, electrolyte or water loop, separators
    double heat_loss_per_area;        // W/(K·m²) to ambient (the stacks' share: param.thermal.heat_loss_coefficient)
    double coolant_temperature;       // K, coolant at the exchanger inlet
    double coolant_heat_capacity;     // J/(kg·K)
    double coolant_temperature_rise;  // K across the exchanger at rated load: sizes the coolant flow
    double ramp_rate;                 // 1/s, fraction of the rated current per second
    double holdup_time;               // s, anode separator gas volume over the anode gas flow at rated load
    double cold_start_duration;       // s, purge and pressurisation before current may flow after a start from cold
    double warm_start_duration;       // s, from hot standby to production
    double heat_up_time;              // s, sizes the standby heater: ambient to standby temperature
    const char* source;               // where the numbers come from
};

struct TechnologyInfo {
    const char* name;   // the config's "technology" value
    const char* title;  // one line for docs and messages
    uint32_t features;  // TechnologyFeature bits
    /// The parameter table (keys of the config's "cell" object, defaults with sources) and the
    /// factory; both null for a technology built from a reaction table.
    const std::vector<ParameterInfo>& (*parameters)();
    std::unique_ptr<Cell> (*make)(const ParameterValues& values);
    std::vector<StackDefault> stack_defaults;
    std::vector<SummaryGroup> summary;
    const char* example;  // a minimal plant description, path relative to the source tree
    /// The rated (nominal) current density a plant of this technology runs at, A/m², with its
    /// source: the default of plant.limits.rated_current_density, against which load, minimum load
    /// and the current-density alarm are counted. Distinct from the cell model's validity limit
    /// (its envelope). 0: no single value fits the technology (the custom cell: its envelope maximum).
    double rated_current_density = 0.0;
    const char* rated_current_density_source = "";
    DynamicDefaults dynamics;

    bool has(uint32_t wanted) const { return (features & wanted) == wanted; }
};

/// Every technology, in the order of the docs.
const std::vector<TechnologyInfo>& technologies();

/// The entry of a technology by name, or null.
const TechnologyInfo* find_technology(std::string_view name);

/// The entry of a technology by name; throws unknown_name listing the known names.
const TechnologyInfo& technology(std::string_view name);

/// "pem, alkaline, ..." (the known names, for messages and docs).
std::string technology_names();

/// The parameter table of a technology; throws invalid_argument for one built from a reaction table.
const std::vector<ParameterInfo>& cell_parameters(const TechnologyInfo& technology);

/// Builds a cell from validated parameter values; throws invalid_argument for a technology
/// built from a reaction table (the custom cell: make_custom_cell, cells/custom.hpp).
std::unique_ptr<Cell> make_cell(const TechnologyInfo& technology, const ParameterValues& values);

}  // namespace ely
