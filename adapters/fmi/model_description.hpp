#pragma once
// modelDescription.xml of an FMU of a plant, FMI 2.0 or 3.0 Co-Simulation, generated from the
// block's variable table (variables.hpp) with libxml2's text writer. Used by `elyblock fmu`.
#include <elyblock/elyblock.h>

#include <string>

namespace elyfmi {

struct DescriptionOptions {
    int fmi_version = 2;           // 2 or 3
    std::string model_identifier;  // the binary's name without extension, a C identifier
    std::string model_name;        // the plant's name
    std::string description;
    std::string plant_text;        // resources/plant.json, for the instantiation token
    std::string generation_time;   // xs:dateTime, UTC
};

/// The model description of the block created from options.plant_text. Throws std::runtime_error
/// naming the problem (a unit the SI reader does not know, two names with one value reference).
std::string model_description(const ely_block* block, const DescriptionOptions& options);

}  // namespace elyfmi
