#pragma once
// Quantities on the command line and in what the commands print. Values given on the command
// line ("2 A/cm2", "80 degC", "30 bar", or a bare number in SI) are read by the library's own
// unit parser (ely_parse_quantity), so they mean what they mean in a plant description. Values
// printed are SI or, with --units engineering, in the display unit the variable table gives each
// variable (ely_variable_info: display_unit, display_scale, display_offset) — never from a list
// kept here.
#include <elyblock/elyblock.h>

#include <string>

namespace elycli {

/// Reads a quantity into `si_unit`; UsageError "<what>: <library's message>" when it does not read.
double read_quantity(const std::string& text, const char* si_unit, const std::string& what);

enum class Units { si, engineering };

/// A value as it is shown: in SI or in the variable's display unit.
struct Shown {
    double value;
    const char* unit;  // "1" for a dimensionless SI value
};
Shown shown(const ely_variable_info& info, double si_value, Units units);

/// Numbers in output files. SI: the shortest text that reads back to the same double (338.15);
/// engineering units: 12 significant digits (a display conversion is not exact anyway). Not a
/// number: empty.
std::string number_text(double value, Units units);

}  // namespace elycli
