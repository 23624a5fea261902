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
