// The calibrated plant description: the JSON text the block was created from, with the current
// values of its tunable parameters written at their config keys. Loading it gives a block whose
// parameters are those values exactly: each is written as a string "number unit" (the config's
// quantities), the number the shortest text that reads back to the same double through
// std::from_chars, with the SI unit when converting from it is the identity (else the bare
// number, taken in the key's unit). A JSON number would not do: Boost.JSON 1.81 reads numbers
// to within an ulp, not exactly. Comments of the original text are not kept; other members keep
// their text, units included, and their order.
#include <algorithm>
#include <boost/json.hpp>
#include <cstring>
#include <fmt/format.h>
#include <string_view>

#include "base/error.hpp"
#include "calibration/fit.hpp"
#include "calibration/json_text.hpp"
#include "config/json_reader.hpp"
#include "config/units.hpp"

namespace ely {

namespace json = boost::json;

namespace {

/// "1.25e-05 ohm m2", or "2.5" when the unit is "1" or converting from it is not the identity.
std::string quantity_string(double value, const char* unit) {
    std::string text = fmt::format("{}", value);
    if (std::strcmp(unit, "1") == 0) return text;
    try {
        const Unit u = parse_unit(unit);
        if (u.numerator == 1 && u.denominator == 1 && u.exponent10 == 0 && u.offset == 0) text += fmt::format(" {}", unit);
    } catch (const Error&) {
        // an empirical unit outside the grammar: the bare number
    }
    return text;
}

/// Writes `value` at a config key "$.a.b.c", creating the objects on the way that are missing.
void write_at(json::object& root, const char* config_key, const std::string& value) {
    std::string_view path(config_key);
    if (path.substr(0, 2) != "$.")
        throw Error(ErrorKind::internal, fmt::format("config key '{}' is not a path below the root", path));
    path.remove_prefix(2);
    json::object* at = &root;
    for (;;) {
        const auto dot = path.find('.');
        const std::string_view key = path.substr(0, dot);
        if (dot == std::string_view::npos) {
            (*at)[key] = value;
            return;
        }
        json::value& next = (*at)[key];
        if (next.is_null()) next = json::object();
        if (!next.is_object())
            throw Error(ErrorKind::internal, fmt::format("{}: expected an object on the way to write a fitted value", config_key));
        at = &next.get_object();
        path.remove_prefix(dot + 1);
    }
}

}  // namespace

std::string calibrated_plant_json(const Block& block, const std::vector<int32_t>& always) {
    const auto& source = block.design().source_json;
    if (!source) return "";
    json::value root = json_input::parse_json(*source, {});
    for (int32_t i = 0; i < block.variable_count(); ++i) {
        const VariableInfo& info = block.variable(i);
        if (info.causality != Causality::parameter || info.variability != Variability::tunable || !info.config_key)
            continue;
        const double value = block.get(i);
        const bool listed = std::find(always.begin(), always.end(), i) != always.end();
        if (!listed) {
            const double start = block.start(i);
            if (value == start) continue;
            // param.current_density_max holds the cell model's own maximum when the description
            // gives none (0): that is not a value to write.
            if (std::strcmp(info.config_key, variable_info(par_current_density_max).config_key) == 0 && !(start > 0) &&
                value == block.design().cell->envelope().current_density_max)
                continue;
            // Likewise the rated current density holds the technology's default when none is given.
            if (std::strcmp(info.config_key, variable_info(par_rated_current_density).config_key) == 0 &&
                !(start > 0) && value == block.default_rated_current_density())
                continue;
        }
        write_at(root.as_object(), info.config_key, quantity_string(value, info.unit));
    }
    return calibration::indented_json(root);
}

}  // namespace ely
