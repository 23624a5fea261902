#pragma once
// Text for messages and generated docs, shared by every layer that writes them.
#include <cmath>
#include <cstring>
#include <fmt/format.h>
#include <string>
#include <string_view>

namespace ely {

/// "2.5 m2", or "2.5" for a dimensionless value (unit "1" or none).
inline std::string quantity_text(double value, const char* unit) {
    if (unit == nullptr || std::strcmp(unit, "1") == 0) return fmt::format("{:g}", value);
    return fmt::format("{:g} {}", value, unit);
}

/// "≥ 0 Pa, ≤ 1e+07 Pa", "> 0 K": the finite limits of a value.
inline std::string limits_text(double lo, double hi, bool lo_exclusive, const char* unit) {
    std::string out;
    if (std::isfinite(lo)) out = (lo_exclusive ? "> " : "≥ ") + quantity_text(lo, unit);
    if (std::isfinite(hi)) out += (out.empty() ? "≤ " : ", ≤ ") + quantity_text(hi, unit);
    return out;
}

/// Text for a cell of a Markdown table: '|' escaped.
inline std::string markdown_cell(std::string_view s) {
    std::string out;
    for (char c : s) {
        if (c == '|') out += "\\|";
        else out += c;
    }
    return out;
}

}  // namespace ely
