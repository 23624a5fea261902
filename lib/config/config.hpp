#pragma once
// The plant description in JSON → a validated PlantDesign with its cell model built.
//
// Every failure is an ely::Error. parse_config throws ErrorKind::config and the message
// starts with the JSON path of the offending value ("$.stack.cells: expected an integer,
// got 2.5"; malformed JSON: "$.stack: malformed JSON at line 3, column 14: syntax error").
// Numbers are SI; a string "number unit" is converted (config/units.hpp). The keys live in
// the key tables (key_tables.cpp), which take the units, limits and defaults of the keys that
// set variables from the variable table; the walk (config.cpp) and config_schema_markdown()
// (config_docs.cpp) read them; docs/config.md holds that text.
#include <string>
#include <string_view>

#include "unit/plant.hpp"

namespace ely {

/// Parses and validates a config and builds its cell (PlantDesign::cell is never null).
PlantDesign parse_config(std::string_view json_text);

/// Reads a file and parses it as parse_config does. Unreadable file: ErrorKind::io naming
/// the file; otherwise errors are parse_config's with "<path>: " in front.
PlantDesign load_config_file(const std::string& path);

/// Markdown documentation of every key: type, unit, default, limits, meaning; the cell
/// parameters of each technology with the sources of their defaults; the accepted units.
std::string config_schema_markdown();

}  // namespace ely
