// The walk: JSON text → a validated PlantDesign with its cell built. The keys it accepts, with
// their units, limits and defaults, are the key tables (key_tables.cpp); every error names the
// JSON path.
#include "config/config.hpp"

#include <algorithm>
#include <boost/json.hpp>
#include <cerrno>
#include <cmath>
#include <cstring>
#include <filesystem>
#include <fmt/format.h>
#include <fstream>
#include <iterator>
#include <limits>
#include <type_traits>
#include <vector>

#include "base/error.hpp"
#include "base/excerpt.hpp"
#include "base/text.hpp"
#include "cells/custom.hpp"
#include "cells/registry.hpp"
#include "config/json_reader.hpp"
#include "config/key_tables.hpp"
#include "config/units.hpp"

namespace ely {
namespace {

namespace json = boost::json;
using namespace json_input;
using namespace config_keys;

constexpr double kAtmosphere = 101325.0;  // Pa (NIST SP 811, B.8): default operating pressure

// ---------------------------------------------------------------------------------------------
// Values

/// A number (taken in `unit`) or a string "number unit", converted to `unit`.
double quantity_value(const json::value& v, const char* unit, const std::string& path) {
    double x = 0;
    switch (v.kind()) {
        case json::kind::int64: x = static_cast<double>(v.get_int64()); break;
        case json::kind::uint64: x = static_cast<double>(v.get_uint64()); break;
        case json::kind::double_: x = v.get_double(); break;
        case json::kind::string: {
            const auto& s = v.get_string();
            try {
                x = parse_quantity(std::string_view(s.data(), s.size()), unit);
            } catch (const Error& e) {
                fail(path, e.what());
            }
            break;
        }
        default: fail(path, "expected a number or a string with a unit, got " + got(v));
    }
    if (!std::isfinite(x)) fail(path, fmt::format("{} is not a finite number", x));
    return x;
}

void check_range(double x, double lo, double hi, bool lo_open, const char* unit, const std::string& path) {
    if (lo_open && !(x > lo)) fail(path, fmt::format("{} must be above {}", quantity_text(x, unit), quantity_text(lo, unit)));
    if (x < lo) fail(path, fmt::format("{} is below the lower limit {}", quantity_text(x, unit), quantity_text(lo, unit)));
    if (x > hi) fail(path, fmt::format("{} is above the upper limit {}", quantity_text(x, unit), quantity_text(hi, unit)));
}

/// A count: an integral JSON number, or a string holding one ("100"), as a quantity may be a
/// string holding a plain number; a count takes no unit.
int count_value(const json::value& v, double lo, double hi, const std::string& path) {
    double x = 0;
    switch (v.kind()) {
        case json::kind::int64: x = static_cast<double>(v.get_int64()); break;
        case json::kind::uint64: x = static_cast<double>(v.get_uint64()); break;
        case json::kind::double_: x = v.get_double(); break;
        case json::kind::string: {
            const auto& s = v.get_string();
            try {
                x = parse_plain_number(std::string_view(s.data(), s.size()));
            } catch (const Error&) {
                fail(path, "expected an integer (a count is a plain number and takes no unit), got " + got(v));
            }
            break;
        }
        default: fail(path, "expected an integer, got " + got(v));
    }
    if (!std::isfinite(x) || x != std::floor(x)) fail(path, "expected an integer, got " + got(v));
    check_range(x, lo, hi, false, nullptr, path);
    return static_cast<int>(x);
}

std::string key_list(const std::vector<std::string_view>& keys) {
    std::string out;
    for (const auto& k : keys) {
        if (!out.empty()) out += ", ";
        out += k;
    }
    return out;
}

[[noreturn]] void unknown_key(const std::string& path, std::string_view key, const std::vector<std::string_view>& known) {
    fail(path, fmt::format("unknown key '{}'; known keys: {}", excerpt(key), key_list(known)));
}

template <class T>
void check_keys(const json::object& obj, const std::vector<Field<T>>& fields, const std::string& path) {
    for (const auto& kv : obj) {
        const std::string_view key(kv.key().data(), kv.key().size());
        const bool known = std::any_of(fields.begin(), fields.end(), [&](const Field<T>& f) { return key == f.key; });
        if (!known) {
            std::vector<std::string_view> names;
            for (const auto& f : fields) names.emplace_back(f.key);
            unknown_key(path, key, names);
        }
    }
}

// ---------------------------------------------------------------------------------------------
// The walk

/// Values of the root object that are read after the walk, once the technology is known.
struct Deferred {
    const json::value* cell = nullptr;
    const json::value* reactions = nullptr;
};

void read_choice_field(const Field<PlantDesign>& f, const json::value& item, const std::string& p, PlantDesign& out,
                       Deferred& deferred) {
    switch (f.type) {
        case Type::technology: {
            const auto name = expect_string(item, p);
            out.technology = find_technology(name);
            if (!out.technology)
                fail(p, fmt::format("'{}' is not a technology; known: {}", excerpt(name), technology_names()));
            break;
        }
        case Type::spec: {
            const auto name = expect_string(item, p);
            const SpecInfo* s = find_spec(name);
            if (!s) fail(p, fmt::format("'{}' is not a spec; known: {}", excerpt(name), spec_names()));
            out.spec = s->spec;
            break;
        }
        case Type::cell: deferred.cell = &item; break;
        case Type::reactions: deferred.reactions = &item; break;
        default: break;
    }
}

template <class T>
void parse_fields(const json::value& v, const std::vector<Field<T>>& fields, const std::string& path, T& out,
                  Deferred* deferred) {
    const json::object& obj = expect_object(v, path);
    check_keys(obj, fields, path);
    for (const Field<T>& f : fields) {
        const json::value* item = obj.if_contains(f.key);
        if (item == nullptr) {
            if (f.required) fail(path, fmt::format("missing required key '{}'", f.key));
            continue;
        }
        const std::string p = child(path, f.key);
        double x = 0;
        switch (f.type) {
            case Type::quantity:
                x = quantity_value(*item, f.unit, p);
                check_range(x, f.lo, f.hi, f.lo_open, f.unit, p);
                break;
            case Type::count: x = count_value(*item, f.lo, f.hi, p); break;
            case Type::flag: f.flag(out) = expect_bool(*item, p); continue;
            case Type::text: f.text(out) = std::string(expect_string(*item, p)); continue;
            case Type::section: parse_fields(*item, *f.children, p, out, deferred); continue;
            default:
                if constexpr (std::is_same_v<T, PlantDesign>) read_choice_field(f, *item, p, out, *deferred);
                continue;
        }
        if constexpr (std::is_same_v<T, PlantDesign>) {
            if (f.var >= 0) {
                out.configured[static_cast<std::size_t>(f.var)] = x;
                continue;
            }
        }
        if (f.type == Type::count) f.integer(out) = static_cast<int>(x);
        else f.number(out) = x;
    }
}

bool has(const json::value* object, std::string_view key) {
    return object != nullptr && object->is_object() && object->get_object().contains(key);
}

ParameterValues parse_cell_parameters(const std::vector<ParameterInfo>& infos, const json::value* cell,
                                      const std::string& path) {
    ParameterValues values(infos);
    if (cell == nullptr) return values;
    const json::object& obj = expect_object(*cell, path);
    for (const auto& kv : obj) {
        const std::string key(kv.key().data(), kv.key().size());
        const auto info = std::find_if(infos.begin(), infos.end(), [&](const ParameterInfo& i) { return key == i.key; });
        if (info == infos.end()) {
            std::vector<std::string_view> names;
            for (const auto& i : infos) names.emplace_back(i.key);
            unknown_key(path, key, names);
        }
        const std::string p = child(path, key);
        const double x = quantity_value(kv.value(), info->unit, p);
        try {
            values.set(key, x);
        } catch (const Error& e) {
            fail(p, e.what());
        }
    }
    return values;
}

/// A technology with a parameter table: its values (stack geometry defaults included) and its cell.
void build_cell(const json::value* cell, PlantDesign& d) {
    const TechnologyInfo& tech = *d.technology;
    ParameterValues values = parse_cell_parameters(cell_parameters(tech), cell, "$.cell");
    for (const auto& sd : tech.stack_defaults) {
        if (has(cell, sd.parameter)) continue;
        const double x = sd.from == StackQuantity::cells ? d.cells() : d.active_area();
        try {
            values.set(sd.parameter, x);
        } catch (const Error& e) {
            fail("$.stack", fmt::format("as the default of cell.{}: {}", sd.parameter, e.what()));
        }
    }
    try {
        d.cell = make_cell(tech, values);
    } catch (const Error& e) {
        fail("$.cell", e.what());
    }
    d.cell_parameters = std::make_shared<const ParameterValues>(std::move(values));
}

Phase phase_at(const std::string& name, const std::string& path) {
    Phase phase{};
    if (!phase_from_name(name, &phase))
        fail(path, fmt::format("'{}' is not a phase; known: gas, liquid, aqueous, solid, melt", excerpt(name)));
    return phase;
}

/// The species rows a config adds (reactions.species), each checked by user_species_record.
std::vector<SpeciesRecord> parse_species_rows(const json::object& reactions) {
    std::vector<SpeciesRecord> rows;
    const json::value* list = reactions.if_contains("species");
    if (list == nullptr) return rows;
    const std::string path = "$.reactions.species";
    const json::array& items = expect_array(*list, path);
    for (std::size_t i = 0; i < items.size(); ++i) {
        const std::string p = element(path, i);
        SpeciesRowInput in;
        parse_fields(items[i], species_row_fields(), p, in, nullptr);
        const Phase phase = phase_at(in.phase, child(p, "phase"));
        for (const auto& bundled : species_table())
            if (bundled.name == in.name && bundled.phase == phase)
                fail(child(p, "name"), fmt::format("species '{}' ({}) is in the bundled table already; give another name",
                                                   excerpt(in.name), in.phase));
        for (const auto& other : rows)
            if (other.name == in.name && other.phase == phase)
                fail(child(p, "name"), fmt::format("species '{}' ({}) appears twice", excerpt(in.name), in.phase));
        try {
            rows.push_back(user_species_record(in.name, phase, in.molar_mass, in.charge, in.formation_enthalpy,
                                               in.entropy, in.cp_a, in.cp_b, in.cp_c, in.temperature_min,
                                               in.temperature_max, in.source));
        } catch (const Error& e) {
            fail(p, e.what());
        }
    }
    return rows;
}

/// A reaction's species: {species, phase, coefficient} from the config's rows, else the bundled table.
std::vector<SpeciesTerm> parse_species_terms(const json::value& list, const std::string& path,
                                             const std::vector<SpeciesRecord>& rows) {
    const json::array& items = expect_array(list, path);
    if (items.empty()) fail(path, "a reaction's species list is empty; leave it out to give a standard potential");
    std::vector<SpeciesTerm> terms;
    for (std::size_t i = 0; i < items.size(); ++i) {
        const std::string p = element(path, i);
        SpeciesTermInput in;
        parse_fields(items[i], species_term_fields(), p, in, nullptr);
        const Phase phase = phase_at(in.phase, child(p, "phase"));
        if (in.coefficient == 0.0) fail(child(p, "coefficient"), "a coefficient of 0 leaves the species out");
        const auto own = std::find_if(rows.begin(), rows.end(),
                                      [&](const SpeciesRecord& r) { return r.name == in.species && r.phase == phase; });
        try {
            terms.push_back({own != rows.end() ? *own : species_record(in.species, phase), in.coefficient});
        } catch (const Error& e) {
            fail(child(p, "species"), std::string(e.what()) + " (or add it under $.reactions.species)");
        }
    }
    return terms;
}

std::vector<HalfReaction> parse_reactions(const json::object& reactions, const char* electrode,
                                          const std::vector<SpeciesRecord>& rows) {
    const std::string path = child("$.reactions", electrode);
    const json::value* list = reactions.if_contains(electrode);
    if (list == nullptr) fail("$.reactions", fmt::format("missing required key '{}'", electrode));
    const json::array& items = expect_array(*list, path);
    if (items.empty()) fail(path, fmt::format("the {} needs at least one reaction", electrode));
    if (items.size() > kMaxReactions)
        fail(path, fmt::format("{} reactions; a cell holds at most {} per electrode", items.size(), kMaxReactions));
    std::vector<HalfReaction> out;
    out.reserve(items.size());
    for (std::size_t i = 0; i < items.size(); ++i) {
        HalfReaction r;
        const std::string p = element(path, i);
        parse_fields(items[i], reaction_fields(), p, r, nullptr);
        const json::object& obj = items[i].as_object();
        const bool potential_given = obj.contains("standard_potential");
        if (const json::value* species = obj.if_contains("species")) {
            if (potential_given || obj.contains("standard_potential_temperature_coefficient"))
                fail(child(p, "standard_potential"),
                     "give either the species (E° follows from their data) or the standard potential, not both");
            r.species = parse_species_terms(*species, child(p, "species"), rows);
        } else if (!potential_given) {
            fail(p, "missing key 'standard_potential': a reaction without species needs its standard potential");
        }
        if (r.name.empty()) fail(child(element(path, i), "name"), "the name is empty");
        if (r.product.empty()) fail(child(element(path, i), "product"), "the product is empty");
        for (const auto& other : out)
            if (other.name == r.name)
                fail(child(element(path, i), "name"), fmt::format("reaction '{}' appears twice at the {}", excerpt(r.name), electrode));
        out.push_back(std::move(r));
    }
    return out;
}

/// A technology built from a reaction table: the table, the "cell" object, and the cell.
void build_reaction_cell(const json::value* cell, const json::value* reactions, PlantDesign& d) {
    if (reactions == nullptr)
        fail("$", fmt::format("missing required key 'reactions': the {} technology is built from its reaction table",
                              d.technology->name));
    CustomCellSpec spec;
    const json::object& table = expect_object(*reactions, "$.reactions");
    for (const auto& kv : table) {
        const std::string_view key(kv.key().data(), kv.key().size());
        if (key != "anode" && key != "cathode" && key != "species")
            unknown_key("$.reactions", key, {"anode", "cathode", "species"});
    }
    const std::vector<SpeciesRecord> rows = parse_species_rows(table);
    spec.anode = parse_reactions(table, "anode", rows);
    spec.cathode = parse_reactions(table, "cathode", rows);
    if (cell != nullptr) parse_fields(*cell, custom_cell_fields(), "$.cell", spec, nullptr);
    // The fitted range follows the hard range unless given.
    Envelope& e = spec.envelope;
    if (!has(cell, "temperature_fit_min")) e.temperature_fit_min = e.temperature_min;
    if (!has(cell, "temperature_fit_max")) e.temperature_fit_max = e.temperature_max;
    if (!(e.temperature_min < e.temperature_max))
        fail("$.cell", fmt::format("temperature_min {:g} K must be below temperature_max {:g} K", e.temperature_min,
                                   e.temperature_max));
    if (!(e.temperature_fit_min < e.temperature_fit_max))
        fail("$.cell", fmt::format("temperature_fit_min {:g} K must be below temperature_fit_max {:g} K",
                                   e.temperature_fit_min, e.temperature_fit_max));
    if (e.temperature_fit_min < e.temperature_min || e.temperature_fit_max > e.temperature_max)
        fail("$.cell", fmt::format("the fitted range {:g}..{:g} K must lie within temperature_min..temperature_max "
                                   "{:g}..{:g} K",
                                   e.temperature_fit_min, e.temperature_fit_max, e.temperature_min, e.temperature_max));
    if (!(e.pressure_min < e.pressure_max))
        fail("$.cell", fmt::format("pressure_min {:g} Pa must be below pressure_max {:g} Pa", e.pressure_min,
                                   e.pressure_max));
    try {
        auto complete = std::make_shared<const CustomCellSpec>(complete_custom_spec(spec));
        d.cell = make_custom_cell(*complete);
        d.custom = std::move(complete);
    } catch (const Error& e) {
        fail("$.reactions", e.what());
    }
}

void check_alarms(const PlantDesign& d) {
    const auto& c = d.configured;
    try {
        check_alarm_levels(c[par_alarms_h2_in_o2_warning], c[par_alarms_h2_in_o2_trip],
                           c[par_alarms_lower_flammability_limit]);
    } catch (const Error& e) {
        fail("$.plant.alarms", e.what());
    }
}

/// The spec reads a drive input that exists for the technology and has a value.
void check_spec(const PlantDesign& d) {
    const SpecInfo& s = spec_info(d.spec);
    const VariableInfo& drive = variable_info(s.drive);
    if (!technology_has(*d.technology, drive))
        fail("$.operating.spec", fmt::format("spec '{}' reads {}, which the {} technology does not have", s.name,
                                             drive.name, d.technology->name));
    if (std::isnan(d.configured[static_cast<std::size_t>(s.drive)]))
        fail("$.operating", fmt::format("spec '{}' reads {}, but {} is not given", s.name, drive.name,
                                        drive.config_key + 2));  // without "$."
}

void check_in_envelope(double x, double lo, double hi, const char* unit, const std::string& path,
                       const TechnologyInfo& t) {
    if (x < lo)
        fail(path, fmt::format("{} is below the lowest value {} of the {} cell model", quantity_text(x, unit),
                               quantity_text(lo, unit), t.name));
    if (x > hi)
        fail(path, fmt::format("{} is above the highest value {} of the {} cell model", quantity_text(x, unit),
                               quantity_text(hi, unit), t.name));
}

/// Technology-dependent defaults of the operating point, then the point against the hard
/// envelope of the cell model.
void settle_operating_point(const json::value& root, PlantDesign& d) {
    const Envelope& e = d.cell->envelope();
    auto& c = d.configured;
    const json::value* given = root.get_object().if_contains("operating");
    // Keys of the operating section, as the variable table names them.
    const auto given_key = [&](Var v) { return has(given, std::strrchr(variable_info(v).config_key, '.') + 1); };
    if (!given_key(in_temperature)) {
        c[in_temperature] = 0.5 * (e.temperature_fit_min + e.temperature_fit_max);
        if (c[par_temperature_max] > 0) c[in_temperature] = std::min(c[in_temperature], c[par_temperature_max]);
    }
    const double p_default = std::min(std::max(kAtmosphere, e.pressure_min), e.pressure_max);
    if (!given_key(in_pressure_cathode)) c[in_pressure_cathode] = p_default;
    if (!given_key(in_pressure_anode)) c[in_pressure_anode] = p_default;
    if (!given_key(in_current_density)) {
        const double j_max = c[par_current_density_max] > 0 ? std::min(c[par_current_density_max], e.current_density_max)
                                                            : e.current_density_max;
        c[in_current_density] = std::min(c[in_current_density], 0.5 * j_max);
        // Not above the plant's rated current density (given, else the technology's).
        const double rated = c[par_rated_current_density] > 0 ? c[par_rated_current_density]
                                                              : d.technology->rated_current_density;
        if (rated > 0) c[in_current_density] = std::min(c[in_current_density], rated);
    }
    const TechnologyInfo& t = *d.technology;
    const auto check = [&](Var v, double lo, double hi) {
        const VariableInfo& info = variable_info(v);
        check_in_envelope(c[v], lo, hi, info.unit, info.config_key, t);
    };
    check(in_temperature, e.temperature_min, e.temperature_max);
    check(in_pressure_cathode, e.pressure_min, e.pressure_max);
    check(in_pressure_anode, e.pressure_min, e.pressure_max);
    check(in_current_density, 0, e.current_density_max);
}

}  // namespace

PlantDesign parse_config(std::string_view json_text) {
    unsigned char buffer[8192];
    json::monotonic_resource resource(buffer, sizeof buffer);
    const json::value root = parse_json(json_text, &resource);

    PlantDesign d;
    Deferred deferred;
    parse_fields(root, root_fields(), "$", d, &deferred);
    check_alarms(d);
    check_spec(d);

    if (d.technology->has(kReactionTable)) {
        build_reaction_cell(deferred.cell, deferred.reactions, d);
    } else {
        if (deferred.reactions != nullptr)
            fail("$.reactions", fmt::format("only a technology built from a reaction table (custom) takes reactions; "
                                            "technology is '{}'",
                                            d.technology->name));
        build_cell(deferred.cell, d);
    }
    if (!d.cell) throw Error(ErrorKind::internal, "$.cell: the cell model factory returned no cell");
    settle_operating_point(root, d);
    d.source_json = std::make_shared<const std::string>(json_text);
    return d;
}

PlantDesign load_config_file(const std::string& path) {
    const std::string text = json_input::read_document_file(path);  // regular files of at most 4 MiB
    try {
        return parse_config(text);
    } catch (const Error& e) {
        throw Error(e.kind(), fmt::format("{}: {}", excerpt(path, 256), e.what()));
    }
}

}  // namespace ely
