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

#include "cells/custom.hpp"
#include "config/json_reader.hpp"
#include "base/excerpt.hpp"
#include "config/units.hpp"
#include "base/error.hpp"

namespace ely {
namespace {

namespace json = boost::json;
using namespace json_input;

constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kAtmosphere = 101325.0;  // Pa (NIST SP 811, B.8): default operating pressure

// ---------------------------------------------------------------------------------------------
// The key tables: one entry per key, read by the parser and by config_schema_markdown(). A
// table fills one target type T (PlantDesign, HalfReaction, CustomCellSpec) through accessor
// functions; the defaults in the docs are read from a default-constructed T.

enum class Type { quantity, count, flag, text, technology, spec, section, cell, reactions };

template <class T>
struct Field {
    const char* key;
    Type type;
    const char* description;
    bool required = false;
    const char* unit = nullptr;  // quantity: the SI unit a JSON number is taken in
    double lo = 0, hi = kInf;    // quantity, count: inclusive limits
    bool lo_open = false;        // quantity: lo itself is not allowed
    double& (*number)(T&) = nullptr;
    int& (*integer)(T&) = nullptr;
    bool& (*flag)(T&) = nullptr;
    std::string& (*text)(T&) = nullptr;
    const std::vector<Field>* children = nullptr;
    const char* default_note = nullptr;  // docs: a default other than the member initialiser

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

template <class T>
Field<T> quantity(const char* key, const char* unit, double lo, double hi, double& (*number)(T&),
                  const char* description) {
    Field<T> f{key, Type::quantity, description};
    f.unit = unit;
    f.lo = lo;
    f.hi = hi;
    f.number = number;
    return f;
}

template <class T>
Field<T> count(const char* key, int lo, int hi, int& (*integer)(T&), const char* description) {
    Field<T> f{key, Type::count, description};
    f.lo = lo;
    f.hi = hi;
    f.integer = integer;
    return f;
}

template <class T>
Field<T> flag(const char* key, bool& (*accessor)(T&), const char* description) {
    Field<T> f{key, Type::flag, description};
    f.flag = accessor;
    return f;
}

template <class T>
Field<T> text(const char* key, std::string& (*accessor)(T&), const char* description) {
    Field<T> f{key, Type::text, description};
    f.text = accessor;
    return f;
}

template <class T>
Field<T> section(const char* key, const std::vector<Field<T>>& children, const char* description) {
    Field<T> f{key, Type::section, description};
    f.children = &children;
    return f;
}

using PlantField = Field<PlantDesign>;
#define ELY_MEMBER(expr) [](PlantDesign& d) -> auto& { return d.expr; }

const std::vector<PlantField>& stack_fields() {
    static const std::vector<PlantField> fields = {
        count<PlantDesign>("cells", 1, 10000, ELY_MEMBER(stack.cells), "cells in series per stack").mandatory(),
        // 1e-6 m2 (0.01 cm2) is far below a laboratory cell (common practice: lab cells have a few cm2).
        quantity<PlantDesign>("active_area", "m2", 1e-6, 100, ELY_MEMBER(stack.active_area), "active area per cell")
            .mandatory(),
        count<PlantDesign>("stacks", 1, 1000, ELY_MEMBER(stack.stacks), "identical stacks in parallel"),
    };
    return fields;
}

const std::vector<PlantField>& rectifier_fields() {
    static const std::vector<PlantField> fields = {
        quantity<PlantDesign>("rated_power", "W", 0, kInf, ELY_MEMBER(rectifier.rated_power),
                              "rated DC power of the plant's rectifier; 0 = sized to the stacks at their "
                              "maximum current density"),
        quantity<PlantDesign>("loss_no_load", "1", 0, 1, ELY_MEMBER(rectifier.loss_no_load),
                              "a0 of P_loss = P_rated (a0 + a1 x + a2 x^2), x = P_DC/P_rated, the usual "
                              "split of converter losses (common practice; default typical value, from memory)"),
        quantity<PlantDesign>("loss_linear", "1", 0, 1, ELY_MEMBER(rectifier.loss_linear),
                              "a1 (typical value, from memory)"),
        quantity<PlantDesign>("loss_quadratic", "1", 0, 1, ELY_MEMBER(rectifier.loss_quadratic),
                              "a2 (typical value, from memory)"),
    };
    return fields;
}

const std::vector<PlantField>& auxiliaries_fields() {
    static const std::vector<PlantField> fields = {
        quantity<PlantDesign>("fixed", "W", 0, kInf, ELY_MEMBER(auxiliaries.fixed), "fixed balance-of-plant power, AC"),
        quantity<PlantDesign>("proportional", "1", 0, 1, ELY_MEMBER(auxiliaries.proportional),
                              "balance-of-plant power as a fraction of the DC stack power (typical value, from "
                              "memory)"),
    };
    return fields;
}

const std::vector<PlantField>& limits_fields() {
    static const std::vector<PlantField> fields = {
        quantity<PlantDesign>("current_density_max", "A/m2", 0, kInf, ELY_MEMBER(limits.current_density_max),
                              "highest current density of the plant; 0 = the cell model's own maximum"),
        quantity<PlantDesign>("min_load_fraction", "1", 0, 1, ELY_MEMBER(limits.min_load_fraction),
                              "minimum load as a fraction of the maximum current density; below it an alarm is "
                              "raised"),
        quantity<PlantDesign>("temperature_max", "K", 0, kInf, ELY_MEMBER(limits.temperature_max),
                              "highest stack temperature of the plant; 0 = the cell model's envelope"),
    };
    return fields;
}

const std::vector<PlantField>& alarms_fields() {
    static const std::vector<PlantField> fields = {
        quantity<PlantDesign>("h2_in_o2_warning", "1", 0, 1, ELY_MEMBER(alarms.h2_in_o2_warning),
                              "H2 in the dry anode gas, mol/mol, that raises a warning (a quarter of the LFL, "
                              "common practice); must be below the trip level")
            .above(0),
        quantity<PlantDesign>("h2_in_o2_trip", "1", 0, 1, ELY_MEMBER(alarms.h2_in_o2_trip),
                              "H2 in the dry anode gas, mol/mol, that trips the plant (half the LFL, common "
                              "practice); must be below the lower flammability limit")
            .above(0),
        quantity<PlantDesign>("lower_flammability_limit", "1", 0, 1, ELY_MEMBER(alarms.lower_flammability_limit),
                              "lower flammability limit of H2 in O2, mol/mol (about 4 %, from memory)")
            .above(0),
    };
    return fields;
}

const std::vector<PlantField>& degradation_fields() {
    static const std::vector<PlantField> fields = {
        quantity<PlantDesign>("voltage_rate", "V/h", 0, kInf, ELY_MEMBER(degradation.voltage_rate),
                              "cell-voltage rise per operating hour (added to the ohmic loss)"),
        quantity<PlantDesign>("resistance_rate", "ohm m2/h", 0, kInf, ELY_MEMBER(degradation.resistance_rate),
                              "area-specific-resistance rise per operating hour"),
    };
    return fields;
}

const std::vector<PlantField>& thermal_fields() {
    static const std::vector<PlantField> fields = {
        quantity<PlantDesign>("feed_temperature", "K", 273.15, 1273.15, ELY_MEMBER(thermal.feed_temperature),
                              "temperature of the make-up water (or brine, or steam) entering the plant"),
        quantity<PlantDesign>("heat_loss_coefficient", "W/K", 0, kInf, ELY_MEMBER(thermal.heat_loss_coefficient),
                              "heat loss to ambient per stack and kelvin of stack-to-ambient difference"),
        quantity<PlantDesign>("ambient_temperature", "K", 223.15, 373.15, ELY_MEMBER(thermal.ambient_temperature),
                              "ambient temperature for the heat loss"),
    };
    return fields;
}

const std::vector<PlantField>& plant_fields() {
    static const std::vector<PlantField> fields = {
        section("rectifier", rectifier_fields(), "AC to DC conversion losses"),
        section("auxiliaries", auxiliaries_fields(), "balance-of-plant power"),
        section("limits", limits_fields(), "operating limits"),
        section("alarms", alarms_fields(), "anode-gas purity alarms"),
        section("degradation", degradation_fields(), "ageing"),
        section("thermal", thermal_fields(), "feed and heat-loss data"),
        flag<PlantDesign>("drag_water_returned", ELY_MEMBER(drag_water_returned),
                          "PEM: water dragged to the cathode is separated and returned to the feed (true) or "
                          "drained and made up (false)"),
        quantity<PlantDesign>("brine_feed_nacl_mass_fraction", "1", 0.05, 0.27, ELY_MEMBER(brine_feed_nacl_mass_fraction),
                              "brine cells: NaCl mass fraction of the resaturated brine fed to the anolyte; sets the "
                              "brine circulation (must exceed the depleted anolyte strength)"),
    };
    return fields;
}

const std::vector<PlantField>& operating_fields() {
    static const std::vector<PlantField> fields = {
        PlantField{"spec", Type::spec,
                   "which drive input the solve reads: current_density, current, power, hydrogen_rate or voltage"}
            .mandatory(),
        quantity<PlantDesign>("current_density", "A/m2", 0, kInf, ELY_MEMBER(operating.current_density),
                              "cell current density (in.current_density); at most the cell model's maximum")
            .defaults("1e4 A/m2, or half the maximum current density (plant.limits.current_density_max, else "
                      "the cell model's) if that is lower"),
        quantity<PlantDesign>("current", "A", 0, kInf, ELY_MEMBER(operating.current), "stack current (in.current)"),
        quantity<PlantDesign>("power", "W", 0, kInf, ELY_MEMBER(operating.power), "DC power per stack (in.power)"),
        quantity<PlantDesign>("hydrogen_rate", "kg/s", 0, kInf, ELY_MEMBER(operating.hydrogen_rate),
                              "hydrogen production of the plant (in.hydrogen_rate)"),
        quantity<PlantDesign>("voltage", "V", 0, kInf, ELY_MEMBER(operating.voltage), "cell voltage (in.voltage)"),
        quantity<PlantDesign>("temperature", "K", 0, kInf, ELY_MEMBER(operating.temperature),
                              "stack temperature (in.temperature); within the cell model's envelope")
            .above(0)
            .defaults("the middle of the cell model's fitted temperature range (but not above "
                      "plant.limits.temperature_max when that is set)"),
        quantity<PlantDesign>("pressure_cathode", "Pa", 0, kInf, ELY_MEMBER(operating.pressure_cathode),
                              "absolute cathode pressure (in.pressure_cathode); within the cell model's envelope")
            .above(0)
            .defaults("101325 Pa, or the cell model's lowest pressure if that is higher"),
        quantity<PlantDesign>("pressure_anode", "Pa", 0, kInf, ELY_MEMBER(operating.pressure_anode),
                              "absolute anode pressure (in.pressure_anode); within the cell model's envelope")
            .above(0)
            .defaults("101325 Pa, or the cell model's lowest pressure if that is higher"),
        quantity<PlantDesign>("hours_operated", "h", 0, kInf, ELY_MEMBER(operating.hours_operated),
                              "operating hours so far, for the degradation"),
    };
    return fields;
}

const std::vector<PlantField>& root_fields() {
    static const std::vector<PlantField> fields = {
        PlantField{"technology", Type::technology, "cell technology: pem, alkaline, solid_oxide, brine or custom"}
            .mandatory(),
        text<PlantDesign>("name", ELY_MEMBER(name), "free text naming the plant"),
        section("stack", stack_fields(), "the stacks").mandatory(),
        PlantField{"cell", Type::cell, "cell-model parameters of the technology, each optional (see below)"},
        section("plant", plant_fields(), "rectifier, auxiliaries, limits, alarms, degradation, heat"),
        section("operating", operating_fields(), "the drive specification and the initial inputs").mandatory(),
        PlantField{"reactions", Type::reactions,
                   "custom technology only, and required there: the half-reactions of each electrode"},
    };
    return fields;
}

#undef ELY_MEMBER

// The custom cell: its "cell" object and the reaction objects of "reactions".
using ReactionField = Field<HalfReaction>;
#define ELY_MEMBER(expr) [](HalfReaction& r) -> auto& { return r.expr; }

const std::vector<ReactionField>& reaction_fields() {
    static const std::vector<ReactionField> fields = {
        text<HalfReaction>("name", ELY_MEMBER(name), "name of the reaction, e.g. \"zinc deposition\"").mandatory(),
        text<HalfReaction>("product", ELY_MEMBER(product),
                           "product formula; \"H2\", \"O2\" and \"Cl2\" also fill the gas streams")
            .mandatory(),
        count<HalfReaction>("electrons", 1, 12, ELY_MEMBER(electrons), "electrons per formula unit of product"),
        quantity<HalfReaction>("standard_potential", "V", -5, 5, ELY_MEMBER(standard_potential),
                               "standard reduction potential vs SHE at 298.15 K, as tabulated (e.g. the CRC "
                               "electrochemical series)")
            .mandatory(),
        quantity<HalfReaction>("standard_potential_temperature_coefficient", "V/K", -0.01, 0.01,
                               ELY_MEMBER(standard_potential_temperature_coefficient),
                               "dE°/dT; 0 holds E° at its 25 °C value"),
        quantity<HalfReaction>("reactant_activity", "1", 0, 1e6, ELY_MEMBER(reactant_activity),
                               "activity product of the species consumed in the electrolysis direction (the "
                               "oxidized one at the cathode, the reduced one at the anode)")
            .above(0),
        quantity<HalfReaction>("product_activity", "1", 0, 1e6, ELY_MEMBER(product_activity),
                               "activity product of the other side (solid or gas at unit activity)")
            .above(0),
        quantity<HalfReaction>("exchange_current_density", "A/m2", 0, 1e6, ELY_MEMBER(kinetics.exchange_current_density),
                               "exchange current density at the reference temperature, geometric area")
            .above(0),
        quantity<HalfReaction>("activation_energy", "J/mol", 0, 1e6, ELY_MEMBER(kinetics.activation_energy),
                               "Arrhenius activation energy of the exchange current density"),
        quantity<HalfReaction>("reference_temperature", "K", 0, 2000, ELY_MEMBER(kinetics.reference_temperature),
                               "temperature of the exchange current density")
            .above(0),
        quantity<HalfReaction>("alpha_forward", "1", 0, 4, ELY_MEMBER(kinetics.alpha_forward),
                               "transfer coefficient in the electrolysis direction (oxidation at the anode, "
                               "reduction at the cathode)")
            .above(0),
        quantity<HalfReaction>("alpha_backward", "1", 0, 4, ELY_MEMBER(kinetics.alpha_backward),
                               "transfer coefficient of the reverse direction")
            .above(0),
        quantity<HalfReaction>("limiting_current_density", "A/m2", 0, kInf, ELY_MEMBER(limiting_current_density),
                               "mass-transport limit of the reactant")
            .above(0)
            .defaults("none (no mass-transport limit)"),
        quantity<HalfReaction>("product_molar_mass", "kg/mol", 0, 10, ELY_MEMBER(product_molar_mass),
                               "molar mass of the product, for product mass rates (0: not needed)"),
    };
    return fields;
}

#undef ELY_MEMBER

using CustomField = Field<CustomCellSpec>;
#define ELY_MEMBER(expr) [](CustomCellSpec& c) -> auto& { return c.expr; }

const std::vector<CustomField>& custom_cell_fields() {
    static const std::vector<CustomField> fields = {
        quantity<CustomCellSpec>("area_specific_resistance", "ohm m2", 0, 1, ELY_MEMBER(area_specific_resistance),
                                 "electrolyte, separator and contact resistance"),
        quantity<CustomCellSpec>("temperature_min", "K", 0, 2000, ELY_MEMBER(envelope.temperature_min),
                                 "lowest temperature the model accepts")
            .above(0),
        quantity<CustomCellSpec>("temperature_max", "K", 0, 2000, ELY_MEMBER(envelope.temperature_max),
                                 "highest temperature the model accepts")
            .above(0),
        quantity<CustomCellSpec>("temperature_fit_min", "K", 0, 2000, ELY_MEMBER(envelope.temperature_fit_min),
                                 "lowest temperature of the data behind the parameters; below it results are "
                                 "flagged as extrapolated")
            .above(0)
            .defaults("temperature_min"),
        quantity<CustomCellSpec>("temperature_fit_max", "K", 0, 2000, ELY_MEMBER(envelope.temperature_fit_max),
                                 "highest temperature of the data behind the parameters")
            .above(0)
            .defaults("temperature_max"),
        quantity<CustomCellSpec>("pressure_min", "Pa", 0, 1e9, ELY_MEMBER(envelope.pressure_min),
                                 "lowest absolute pressure of each electrode")
            .above(0),
        quantity<CustomCellSpec>("pressure_max", "Pa", 0, 1e9, ELY_MEMBER(envelope.pressure_max),
                                 "highest absolute pressure of each electrode")
            .above(0),
        quantity<CustomCellSpec>("current_density_max", "A/m2", 0, 1e6, ELY_MEMBER(envelope.current_density_max),
                                 "highest current density the model accepts")
            .above(0),
        quantity<CustomCellSpec>("thermoneutral_voltage", "V", 0, 10, ELY_MEMBER(thermoneutral_voltage),
                                 "thermoneutral voltage to report")
            .defaults("the liquid-water (HHV) value when the main products are H2 and O2, else unknown (0 "
                      "reported)"),
    };
    return fields;
}

#undef ELY_MEMBER

constexpr Technology kTechnologies[] = {Technology::pem, Technology::alkaline, Technology::solid_oxide,
                                        Technology::brine, Technology::custom};
constexpr Spec kSpecs[] = {Spec::current_density, Spec::current, Spec::power, Spec::hydrogen_rate,
                           Spec::voltage};

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

std::string with_unit(double value, const char* unit) {
    if (unit == nullptr || std::strcmp(unit, "1") == 0) return fmt::format("{:g}", value);
    return fmt::format("{:g} {}", value, unit);
}

void check_range(double x, double lo, double hi, bool lo_open, const char* unit, const std::string& path) {
    if (lo_open && !(x > lo)) fail(path, fmt::format("{} must be above {}", with_unit(x, unit), with_unit(lo, unit)));
    if (x < lo) fail(path, fmt::format("{} is below the lower limit {}", with_unit(x, unit), with_unit(lo, unit)));
    if (x > hi) fail(path, fmt::format("{} is above the upper limit {}", with_unit(x, unit), with_unit(hi, unit)));
}

int count_value(const json::value& v, double lo, double hi, const std::string& path) {
    double x = 0;
    switch (v.kind()) {
        case json::kind::int64: x = static_cast<double>(v.get_int64()); break;
        case json::kind::uint64: x = static_cast<double>(v.get_uint64()); break;
        case json::kind::double_:
            x = v.get_double();
            if (!std::isfinite(x) || x != std::floor(x)) fail(path, "expected an integer, got " + got(v));
            break;
        default: fail(path, "expected an integer, got " + got(v));
    }
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

template <class E, std::size_t N, class Name>
E choice(const json::value& v, const E (&options)[N], Name name, const char* what, const std::string& path) {
    const auto s = expect_string(v, path);
    std::vector<std::string_view> names;
    for (E e : options) {
        if (s == name(e)) return e;
        names.emplace_back(name(e));
    }
    fail(path, fmt::format("'{}' is not a {}; known: {}", excerpt(s), what, key_list(names)));
}

// ---------------------------------------------------------------------------------------------
// The walk

/// Values of the root object that are read after the walk, once the technology is known.
struct Deferred {
    const json::value* cell = nullptr;
    const json::value* reactions = nullptr;
};

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
        switch (f.type) {
            case Type::quantity: {
                const double x = quantity_value(*item, f.unit, p);
                check_range(x, f.lo, f.hi, f.lo_open, f.unit, p);
                f.number(out) = x;
                break;
            }
            case Type::count: f.integer(out) = count_value(*item, f.lo, f.hi, p); break;
            case Type::flag: f.flag(out) = expect_bool(*item, p); break;
            case Type::text: f.text(out) = std::string(expect_string(*item, p)); break;
            case Type::section: parse_fields(*item, *f.children, p, out, deferred); break;
            case Type::technology:
            case Type::spec:
            case Type::cell:
            case Type::reactions:
                if constexpr (std::is_same_v<T, PlantDesign>) {
                    if (f.type == Type::technology)
                        out.technology = choice(*item, kTechnologies, technology_name, "technology", p);
                    else if (f.type == Type::spec)
                        out.operating.spec = choice(*item, kSpecs, spec_name, "spec", p);
                    else if (f.type == Type::cell)
                        deferred->cell = item;
                    else
                        deferred->reactions = item;
                }
                break;
        }
    }
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

bool has(const json::value* object, std::string_view key) {
    return object != nullptr && object->is_object() && object->get_object().contains(key);
}

std::vector<HalfReaction> parse_reactions(const json::object& reactions, const char* electrode) {
    const std::string path = child("$.reactions", electrode);
    const json::value* list = reactions.if_contains(electrode);
    if (list == nullptr) fail("$.reactions", fmt::format("missing required key '{}'", electrode));
    const json::array& items = expect_array(*list, path);
    if (items.empty()) fail(path, fmt::format("the {} needs at least one reaction", electrode));
    std::vector<HalfReaction> out;
    out.reserve(items.size());
    for (std::size_t i = 0; i < items.size(); ++i) {
        HalfReaction r;
        parse_fields(items[i], reaction_fields(), element(path, i), r, nullptr);
        if (r.name.empty()) fail(child(element(path, i), "name"), "the name is empty");
        if (r.product.empty()) fail(child(element(path, i), "product"), "the product is empty");
        for (const auto& other : out)
            if (other.name == r.name)
                fail(child(element(path, i), "name"), fmt::format("reaction '{}' appears twice at the {}", excerpt(r.name), electrode));
        out.push_back(std::move(r));
    }
    return out;
}

std::shared_ptr<const Cell> build_custom_cell(const json::value* cell, const json::value* reactions,
                                              std::shared_ptr<const CustomCellSpec>& spec_out) {
    if (reactions == nullptr)
        fail("$", "missing required key 'reactions': the custom technology is built from its reaction table");
    CustomCellSpec spec;
    const json::object& table = expect_object(*reactions, "$.reactions");
    for (const auto& kv : table) {
        const std::string_view key(kv.key().data(), kv.key().size());
        if (key != "anode" && key != "cathode") unknown_key("$.reactions", key, {"anode", "cathode"});
    }
    spec.anode = parse_reactions(table, "anode");
    spec.cathode = parse_reactions(table, "cathode");
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
        auto built = make_custom_cell(spec);
        spec_out = std::make_shared<const CustomCellSpec>(std::move(spec));
        return built;
    } catch (const Error& e) {
        fail("$.reactions", e.what());
    }
}

void check_alarms(const Alarms& a) {
    if (!(a.h2_in_o2_warning < a.h2_in_o2_trip))
        fail("$.plant.alarms", fmt::format("h2_in_o2_warning {:g} must be below h2_in_o2_trip {:g}", a.h2_in_o2_warning,
                                           a.h2_in_o2_trip));
    if (!(a.h2_in_o2_trip < a.lower_flammability_limit))
        fail("$.plant.alarms", fmt::format("h2_in_o2_trip {:g} must be below lower_flammability_limit {:g}",
                                           a.h2_in_o2_trip, a.lower_flammability_limit));
}

void check_in_envelope(double x, double lo, double hi, const char* unit, const std::string& path, Technology t) {
    if (x < lo)
        fail(path, fmt::format("{} is below the lowest value {} of the {} cell model", with_unit(x, unit),
                               with_unit(lo, unit), technology_name(t)));
    if (x > hi)
        fail(path, fmt::format("{} is above the highest value {} of the {} cell model", with_unit(x, unit),
                               with_unit(hi, unit), technology_name(t)));
}

/// Technology-dependent defaults of the operating point, then the point against the hard
/// envelope of the cell model.
void settle_operating_point(const json::value& root, PlantDesign& d) {
    const Envelope& e = d.cell->envelope();
    OperatingDefaults& op = d.operating;
    const json::value* given = root.get_object().if_contains("operating");
    if (!has(given, "temperature")) {
        op.temperature = 0.5 * (e.temperature_fit_min + e.temperature_fit_max);
        if (d.limits.temperature_max > 0) op.temperature = std::min(op.temperature, d.limits.temperature_max);
    }
    const double p_default = std::min(std::max(kAtmosphere, e.pressure_min), e.pressure_max);
    if (!has(given, "pressure_cathode")) op.pressure_cathode = p_default;
    if (!has(given, "pressure_anode")) op.pressure_anode = p_default;
    if (!has(given, "current_density")) {
        const double j_max = d.limits.current_density_max > 0
                                 ? std::min(d.limits.current_density_max, e.current_density_max)
                                 : e.current_density_max;
        op.current_density = std::min(op.current_density, 0.5 * j_max);
    }
    const Technology t = d.technology;
    check_in_envelope(op.temperature, e.temperature_min, e.temperature_max, "K", "$.operating.temperature", t);
    check_in_envelope(op.pressure_cathode, e.pressure_min, e.pressure_max, "Pa", "$.operating.pressure_cathode", t);
    check_in_envelope(op.pressure_anode, e.pressure_min, e.pressure_max, "Pa", "$.operating.pressure_anode", t);
    check_in_envelope(op.current_density, 0, e.current_density_max, "A/m2", "$.operating.current_density", t);
}

// ---------------------------------------------------------------------------------------------
// Documentation

std::string md_escape(std::string_view s) {
    std::string out;
    for (char c : s) {
        if (c == '|') out += "\\|";
        else out += c;
    }
    return out;
}

std::string limit_text(double lo, double hi, bool lo_open, const char* unit) {
    std::string out = lo_open ? "> " + with_unit(lo, unit) : "≥ " + with_unit(lo, unit);
    if (std::isfinite(hi)) out += ", ≤ " + with_unit(hi, unit);
    return out;
}

template <class T>
std::string default_text(const Field<T>& f) {
    if (f.required) return "";
    if (f.default_note) return f.default_note;
    T defaults{};
    switch (f.type) {
        case Type::quantity: return with_unit(f.number(defaults), f.unit);
        case Type::count: return std::to_string(f.integer(defaults));
        case Type::flag: return f.flag(defaults) ? "true" : "false";
        case Type::text: return f.required ? "" : fmt::format("\"{}\"", f.text(defaults));
        default: return "";
    }
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
                limits = limit_text(f.lo, f.hi, f.lo_open, f.unit);
                break;
            case Type::count:
                type = "integer";
                limits = fmt::format("{:g} … {:g}", f.lo, f.hi);
                break;
            case Type::flag: type = "true/false"; break;
            case Type::text: type = "string"; break;
            case Type::technology:
                type = "string";
                for (auto t : kTechnologies) limits += (limits.empty() ? "" : ", ") + std::string(technology_name(t));
                break;
            case Type::spec:
                type = "string";
                for (auto s : kSpecs) limits += (limits.empty() ? "" : ", ") + std::string(spec_name(s));
                break;
            case Type::section:
            case Type::cell:
            case Type::reactions: type = "object"; break;
        }
        if (f.required) type += ", **required**";
        out += fmt::format("| `{}` | {} | {} | {} | {} | {} |\n", f.key, type, unit, md_escape(default_text(f)),
                           limits, md_escape(f.description));
    }
    out += '\n';
    for (const auto& f : fields)
        if (f.type == Type::section) document_fields(out, *f.children, title == "$" ? f.key : title + "." + f.key);
}

void document_parameters(std::string& out, Technology t) {
    out += fmt::format("### `cell` — {}\n\n", technology_name(t));
    out += "| key | unit | default | min | max | meaning | source of the default |\n|---|---|---|---|---|---|---|\n";
    for (const auto& p : cell_parameters(t)) {
        out += fmt::format("| `{}` | {} | {:g} | {:g} | {:g} | {} | {} |\n", p.key, p.unit, p.default_value, p.min,
                           p.max, md_escape(p.description), md_escape(p.source));
    }
    out += '\n';
}

}  // namespace

PlantDesign parse_config(std::string_view json_text) {
    unsigned char buffer[8192];
    json::monotonic_resource resource(buffer, sizeof buffer);
    const json::value root = parse_json(json_text, &resource);

    PlantDesign d;
    Deferred deferred;
    parse_fields(root, root_fields(), "$", d, &deferred);
    check_alarms(d.alarms);

    if (d.technology == Technology::custom) {
        d.cell = build_custom_cell(deferred.cell, deferred.reactions, d.custom);
    } else {
        if (deferred.reactions != nullptr)
            fail("$.reactions", fmt::format("only the custom technology takes reactions; technology is '{}'",
                                            technology_name(d.technology)));
        ParameterValues values = parse_cell_parameters(cell_parameters(d.technology), deferred.cell, "$.cell");
        // The shunt-current network of an alkaline stack needs the stack's geometry: taken from
        // `stack` unless the cell object gives it (one source of truth for the plant).
        if (d.technology == Technology::alkaline) {
            try {
                if (!has(deferred.cell, "shunt_cells")) values.set("shunt_cells", d.stack.cells);
                if (!has(deferred.cell, "shunt_cell_area")) values.set("shunt_cell_area", d.stack.active_area);
            } catch (const Error& e) {
                fail("$.stack", std::string("as the shunt-network geometry: ") + e.what());
            }
        }
        try {
            d.cell = make_cell(d.technology, values);
        } catch (const Error& e) {
            fail("$.cell", e.what());
        }
    }
    if (!d.cell) throw Error(ErrorKind::internal, "$.cell: the cell model factory returned no cell");
    settle_operating_point(root, d);
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

std::string config_schema_markdown() {
    std::string out;
    out += "## Keys\n\n"
           "Every key at every level is checked: an unknown key, a duplicate key, a wrong JSON type or a value "
           "outside its limits is an error whose message starts with the JSON path, e.g. "
           "`$.stack.cells: expected an integer, got 2.5`. A *quantity* is a JSON number in the unit of the "
           "table or a string `\"number unit\"` in any unit of the same dimension (see *Units*).\n\n";
    document_fields(out, root_fields(), "$");
    out += "## Cell parameters\n\n"
           "The keys of `cell` depend on `technology`; each is a quantity in the unit given, checked against "
           "min and max (inclusive).\n\n";
    for (auto t : kTechnologies)
        if (t != Technology::custom) document_parameters(out, t);
    out += "## The custom technology\n\n"
           "`reactions` holds `anode` and `cathode`, each a non-empty array of reaction objects; the reactions of "
           "one electrode compete for its current at a common electrode potential. Currents count positive in the "
           "electrolysis direction of the electrode (oxidation at the anode, reduction at the cathode). `cell` "
           "holds the keys of `cell` (custom) below instead of a technology's parameter list.\n\n";
    document_fields(out, reaction_fields(), "reactions.anode[i], reactions.cathode[i]");
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
