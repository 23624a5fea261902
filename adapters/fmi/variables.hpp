#pragma once
// The FMI view of the block's variable table, shared by the FMU binary (value references at run
// time) and `elyblock fmu` (the model description): one mapping, so the two cannot disagree.
// A client of the public C header only.
#include <elyblock/elyblock.h>

#include <cstdint>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace elyfmi {

enum class Causality { input, parameter, calculated_parameter, output };
enum class Variability { fixed, tunable, discrete, continuous };

struct Variable {
    std::string name;
    uint32_t value_reference = 0;
    int32_t index = -1;  // the block's variable index
    Causality causality = Causality::output;
    Variability variability = Variability::continuous;
    bool has_start = false;  // inputs and tunable parameters
    double start = 0, min = 0, max = 0, nominal = 0;
    bool min_exclusive = false;
    std::string unit, description, label, display_unit;
    double display_scale = 1, display_offset = 0;
};

/// The value reference of the independent variable `time` (FMI 3); no table variable gets it.
inline constexpr uint32_t kTimeValueReference = 0;

/// A variable's value reference: the 32-bit FNV-1a hash of its name, top bit cleared (so
/// tools that keep references in a signed int read them right), 0 kept for `time`. It depends on
/// the name alone, so it stays the same across versions of the library and of the plant.
uint32_t value_reference(std::string_view name);

/// The FMI variables of a block, in the table's order. Throws std::runtime_error when two names
/// share a value reference (the message names both).
std::vector<Variable> fmi_variables(const ely_block* block);

/// The instantiation token (FMI 3) or GUID (FMI 2) of an FMU of this plant description: a
/// name-based UUID (RFC 4122 version 5, SHA-1) of the FMI version, the library version and the
/// plant text, in braces. The FMU computes it again from its resources at instantiation.
std::string instantiation_token(std::string_view plant_text, int fmi_version);

/// A C identifier made from a file name's stem: letters, digits and '_' ("demo-plant" →
/// "demo_plant"; a leading digit gets a leading '_').
std::string model_identifier_from(std::string_view stem);

}  // namespace elyfmi
