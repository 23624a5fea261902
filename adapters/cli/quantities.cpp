#include "quantities.hpp"

#include <cmath>
#include <fmt/format.h>

#include "errors.hpp"

namespace elycli {

double read_quantity(const std::string& text, const char* si_unit, const std::string& what) {
    double value = 0;
    if (ely_parse_quantity(text.c_str(), si_unit, &value) != ELY_OK) throw UsageError{what + ": " + last_error(), ""};
    return value;
}

Shown shown(const ely_variable_info& info, double si_value, Units units) {
    if (units == Units::si) return {si_value, info.unit};
    return {si_value * info.display_scale + info.display_offset, info.display_unit};
}

std::string number_text(double value, Units units) {
    if (!std::isfinite(value)) return {};
    return units == Units::si ? fmt::format("{}", value) : fmt::format("{:.12g}", value);
}

}  // namespace elycli
