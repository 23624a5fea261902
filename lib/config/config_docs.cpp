// The reference part of docs/config.md, generated from the key tables, the technology
// registry (its parameter tables) and the unit table: the text of config_schema_markdown().
#include <cmath>
#include <fmt/format.h>
#include <string>

#include "base/text.hpp"
#include "cells/registry.hpp"
#include "config/config.hpp"
#include "config/key_tables.hpp"
#include "config/units.hpp"

namespace ely {
namespace {

using namespace config_keys;

template <class T>
std::string default_text(const Field<T>& f) {
    if (f.required) return "";
    if (f.default_note) return f.default_note;
    T defaults{};
    if constexpr (std::is_same_v<T, PlantDesign>) {
        if (f.var >= 0) {
            const double x = defaults.configured[static_cast<std::size_t>(f.var)];
            return std::isnan(x) ? "none" : quantity_text(x, f.type == Type::count ? nullptr : f.unit);
        }
    }
    switch (f.type) {
        case Type::quantity: return quantity_text(f.number(defaults), f.unit);
        case Type::count: return std::to_string(f.integer(defaults));
        case Type::flag: return f.flag(defaults) ? "true" : "false";
        case Type::text: return fmt::format("\"{}\"", f.text(defaults));
        default: return "";
    }
}

template <class T>
std::string meaning(const Field<T>& f) {
    std::string text = f.description;
    if constexpr (std::is_same_v<T, PlantDesign>) {
        if (f.var >= 0) text += fmt::format(" (variable `{}`)", variable_info(static_cast<Var>(f.var)).name);
    }
    return markdown_cell(text);
}

template <class T>
void document_fields(std::string& out, const std::vector<Field<T>>& fields, const std::string& title) {
    out += title == "$" ? std::string("### Top level\n\n") : fmt::format("### `{}`\n\n", title);
    out += "| key | type | unit | default | limits | meaning |\n|---|---|---|---|---|---|\n";
    for (const auto& f : fields) {
        std::string type, unit, limits;
        switch (f.type) {
            case Type::quantity:
                type = "quantity";
                unit = f.unit;
                limits = limits_text(f.lo, f.hi, f.lo_open, f.unit);
                break;
            case Type::count:
                type = "integer";
                limits = fmt::format("{:g} … {:g}", f.lo, f.hi);
                break;
            case Type::flag: type = "true/false"; break;
            case Type::text: type = "string"; break;
            case Type::technology:
                type = "string";
                limits = technology_names();
                break;
            case Type::spec:
                type = "string";
                limits = spec_names();
                break;
            case Type::section:
            case Type::cell:
            case Type::reactions: type = "object"; break;
            case Type::list: type = "array"; break;
        }
        if (f.required) type += ", **required**";
        out += fmt::format("| `{}` | {} | {} | {} | {} | {} |\n", f.key, type, unit, markdown_cell(default_text(f)),
                           limits, meaning(f));
    }
    out += '\n';
    for (const auto& f : fields)
        if (f.type == Type::section) document_fields(out, *f.children, title == "$" ? f.key : title + "." + f.key);
}

void document_technologies(std::string& out) {
    out += "## Technologies\n\n"
           "The values of `technology` (the technology registry, `lib/cells/registry.cpp`) and the minimal "
           "plant description of each in the examples:\n\n| technology | what | minimal example |\n|---|---|---|\n";
    for (const auto& t : technologies())
        out += fmt::format("| `{}` | {} | `{}` |\n", t.name, t.title, t.example);
    out += '\n';
}

void document_parameters(std::string& out, const TechnologyInfo& t) {
    out += fmt::format("### `cell` — {}\n\n", t.name);
    out += "| key | unit | default | min | max | meaning | source of the default |\n|---|---|---|---|---|---|---|\n";
    for (const auto& p : cell_parameters(t)) {
        out += fmt::format("| `{}` | {} | {:g} | {:g} | {:g} | {} | {} |\n", p.key, p.unit, p.default_value, p.min,
                           p.max, markdown_cell(p.description), markdown_cell(p.source));
    }
    for (const auto& sd : t.stack_defaults)
        out += fmt::format("\n`{}` defaults to `stack.{}` when not given.\n", sd.parameter,
                           sd.from == StackQuantity::cells ? "cells" : "active_area");
    out += '\n';
}

}  // namespace

std::string config_schema_markdown() {
    std::string out;
    out += "## Keys\n\n"
           "Every key at every level is checked: an unknown key, a duplicate key, a wrong JSON type or a value "
           "outside its limits is an error whose message starts with the JSON path, e.g. "
           "`$.stack.cells: expected an integer, got 2.5`. A *quantity* is a JSON number in the unit of the "
           "table or a string `\"number unit\"` in any unit of the same dimension (see *Units*). A key that sets a "
           "variable of the block names it; the variable has the same unit, limits and meaning, and a tunable "
           "parameter can be changed later through `ely_block_set` with the same checks.\n\n";
    document_fields(out, root_fields(), "$");
    document_technologies(out);
    out += "## Cell parameters\n\n"
           "The keys of `cell` depend on `technology`; each is a quantity in the unit given, checked against "
           "min and max (inclusive), and each is also the tunable parameter `param.cell.<key>` of the block.\n\n";
    for (const auto& t : technologies())
        if (t.parameters) document_parameters(out, t);
    out += "## The custom technology\n\n"
           "`reactions` holds `anode` and `cathode`, each a non-empty array of at most 8 reaction objects, and "
           "optionally `species`, rows the config adds to the bundled species table; the reactions of one electrode "
           "compete for its current at a common electrode potential. Currents count positive in the electrolysis "
           "direction of the electrode (oxidation at the anode, reduction at the cathode). A reaction gives either "
           "its `species` (E°(T) and its enthalpy follow from their data: docs/cells-brine-custom.md, *Species "
           "table*) or its `standard_potential`. `cell` holds the keys of `cell` (custom) below instead of a "
           "technology's parameter list.\n\n";
    document_fields(out, reaction_fields(), "reactions.anode[i], reactions.cathode[i]");
    document_fields(out, species_term_fields(), "reactions.*[i].species[k]");
    document_fields(out, species_row_fields(), "reactions.species[k]");
    document_fields(out, custom_cell_fields(), "cell (custom)");
    out += "## Units\n\n"
           "A quantity string is a number, optional spaces and a unit expression: `\"80 degC\"`, `\"30 bar\"`, "
           "`\"2 A/cm2\"`, `\"0.15 ohm cm2\"`, `\"500 kg/h\"`, `\"25 %\"`. A string holding only a number is taken "
           "in the unit of the table, as a JSON number is. Units multiply with `*`, `.`, `·` or a space and divide "
           "with `/`; everything after a `/` up to the next `/` or `)` is in the denominator (`J/mol K` = "
           "`J/(mol K)`); exponents follow the symbol as digits (`cm2`, `s-1`, `m^2`, `m²`); parentheses group. "
           "`degC` (also `°C`) stands only on its own, as a temperature; compound units and temperature differences "
           "use `K`. A unit of the wrong dimension is an error (`expected a quantity in K, got 'bar'`). Normal "
           "cubic metres are not accepted (they depend on a reference state): give mass rates.\n\n";
    out += units_markdown();
    return out;
}

}  // namespace ely
