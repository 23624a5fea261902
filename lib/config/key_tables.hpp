#pragma once
// The key tables of the plant description: one entry per JSON key, read by the walk
// (config.cpp) and by the docs generator (config_docs.cpp). A key that sets an input or a
// parameter of the block takes its unit, limits, default and meaning from the variable table
// (lib/unit/variables.cpp), so they are written once; the other keys (the custom cell's
// reaction table, text, switches) carry their own.
#include <limits>
#include <string>
#include <vector>

#include "cells/custom.hpp"
#include "unit/plant.hpp"

namespace ely::config_keys {

constexpr double kInf = std::numeric_limits<double>::infinity();

enum class Type { quantity, count, flag, text, technology, spec, section, cell, reactions, list };

template <class T>
struct Field {
    const char* key;
    Type type;
    const char* description;
    bool required = false;
    const char* unit = nullptr;  // quantity: the SI unit a JSON number is taken in
    double lo = 0, hi = kInf;    // quantity, count: inclusive limits
    bool lo_open = false;        // quantity: lo itself is not allowed
    int var = -1;                // the variable (Var) whose configured value this key sets
    double& (*number)(T&) = nullptr;
    int& (*integer)(T&) = nullptr;
    bool& (*flag)(T&) = nullptr;
    std::string& (*text)(T&) = nullptr;
    const std::vector<Field>* children = nullptr;
    const char* default_note = nullptr;  // docs: a default other than the table's or the member initialiser

    Field mandatory() const {
        Field f = *this;
        f.required = true;
        return f;
    }
    Field above(double limit) const {  // exclusive lower limit
        Field f = *this;
        f.lo = limit;
        f.lo_open = true;
        return f;
    }
    Field defaults(const char* note) const {
        Field f = *this;
        f.default_note = note;
        return f;
    }
};

/// The root of a plant description and its sections.
const std::vector<Field<PlantDesign>>& root_fields();
/// One reaction object of the custom technology's "reactions" arrays.
const std::vector<Field<HalfReaction>>& reaction_fields();
/// The "cell" object of the custom technology.
const std::vector<Field<CustomCellSpec>>& custom_cell_fields();

/// One species of a reaction: {species, phase, coefficient}, looked up in the config's own rows
/// (reactions.species) and the bundled table.
struct SpeciesTermInput {
    std::string species, phase;
    double coefficient = 0.0;
};
const std::vector<Field<SpeciesTermInput>>& species_term_fields();

/// A species row a config adds (reactions.species): one heat-capacity segment cp = a + b·T + c/T².
struct SpeciesRowInput {
    std::string name, phase, source;
    int charge = 0;
    double molar_mass = 0.0, formation_enthalpy = 0.0, entropy = 0.0;
    double cp_a = 0.0, cp_b = 0.0, cp_c = 0.0;
    double temperature_min = 298.15, temperature_max = 298.15;
};
const std::vector<Field<SpeciesRowInput>>& species_row_fields();

}  // namespace ely::config_keys
