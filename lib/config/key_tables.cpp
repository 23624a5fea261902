// The key tables of the plant description (see key_tables.hpp).
#include "config/key_tables.hpp"

#include <cstring>

namespace ely::config_keys {

namespace {

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

/// The key that configures variable v: its name is the last part of the variable's config
/// path; unit, limits, default and meaning are the variable's.
PlantField variable(Var v, Type type = Type::quantity) {
    const VariableInfo& info = variable_info(v);
    PlantField f{std::strrchr(info.config_key, '.') + 1, type, info.description};
    f.unit = info.unit;
    f.lo = info.min;
    f.hi = info.max;
    f.lo_open = info.min_exclusive;
    f.var = v;
    return f;
}

const std::vector<PlantField>& stack_fields() {
    static const std::vector<PlantField> fields = {
        variable(par_cells, Type::count).mandatory(),
        variable(par_active_area).mandatory(),
        variable(par_stacks, Type::count),
    };
    return fields;
}

const std::vector<PlantField>& rectifier_fields() {
    static const std::vector<PlantField> fields = {
        variable(par_rectifier_rated_power),
        variable(par_rectifier_loss_no_load),
        variable(par_rectifier_loss_linear),
        variable(par_rectifier_loss_quadratic),
    };
    return fields;
}

const std::vector<PlantField>& auxiliaries_fields() {
    static const std::vector<PlantField> fields = {variable(par_auxiliaries_fixed),
                                                   variable(par_auxiliaries_proportional)};
    return fields;
}

const std::vector<PlantField>& limits_fields() {
    static const std::vector<PlantField> fields = {
        variable(par_current_density_max),
        variable(par_rated_current_density),
        variable(par_min_load_fraction),
        variable(par_temperature_max),
    };
    return fields;
}

const std::vector<PlantField>& alarms_fields() {
    static const std::vector<PlantField> fields = {
        variable(par_alarms_h2_in_o2_warning),
        variable(par_alarms_h2_in_o2_trip),
        variable(par_alarms_lower_flammability_limit),
    };
    return fields;
}

const std::vector<PlantField>& degradation_fields() {
    static const std::vector<PlantField> fields = {variable(par_degradation_voltage_rate),
                                                   variable(par_degradation_resistance_rate),
                                                   variable(par_degradation_voltage_limit)};
    return fields;
}

// Defaults the block settles from the technology (lib/cells/registry.cpp, DynamicDefaults) and the
// plant when the key is not given (lib/unit/dynamics_defaults.cpp; docs/dynamics.md).
constexpr const char* kPerArea = "the technology's value per m2 of cell area x the cell area";

const std::vector<PlantField>& thermal_fields() {
    static const std::vector<PlantField> fields = {
        variable(in_feed_temperature),
        variable(par_heat_loss_coefficient).defaults("the technology's value per m2 of cell area x the cells' area per stack"),
        variable(in_ambient_temperature),
        variable(par_gas_cooler_temperature),
        variable(par_exchanger_ua)
            .defaults("sized with operating.coolant_flow: the open valve takes 110 % of the heat of rated load at the "
                      "temperature setpoint"),
        variable(par_coolant_heat_capacity).defaults("the technology's coolant (water or air)"),
        variable(par_temperature_control, Type::count),
        variable(par_temperature_setpoint).defaults("operating.temperature"),
        variable(par_control_band),
        variable(par_integral_time),
    };
    return fields;
}

const std::vector<PlantField>& separator_fields() {
    static const std::vector<PlantField> fields = {variable(par_holdup_time).defaults("the technology's")};
    return fields;
}

const std::vector<PlantField>& standby_fields() {
    static const std::vector<PlantField> fields = {
        variable(par_standby_method, Type::count),
        variable(par_standby_temperature).defaults("thermal.temperature_setpoint - thermal.control_band"),
        variable(par_heater_power)
            .defaults("heats the plant from ambient to the standby temperature in the technology's heat-up time "
                      "and covers the heat loss there"),
        variable(par_standby_current_fraction).defaults("limits.min_load_fraction"),
    };
    return fields;
}

const std::vector<PlantField>& startup_fields() {
    static const std::vector<PlantField> fields = {
        variable(par_startup_cold_duration).defaults("the technology's"),
        variable(par_startup_warm_duration).defaults("the technology's"),
        variable(par_startup_temperature).defaults("the cell model's lowest temperature"),
    };
    return fields;
}

const std::vector<PlantField>& dynamics_fields() {
    static const std::vector<PlantField> fields = {variable(par_dynamics_tolerance)};
    return fields;
}

const std::vector<PlantField>& plant_fields() {
    static const std::vector<PlantField> fields = {
        section("rectifier", rectifier_fields(), "AC to DC conversion losses"),
        section("auxiliaries", auxiliaries_fields(), "balance-of-plant power"),
        section("limits", limits_fields(), "operating limits"),
        section("alarms", alarms_fields(), "anode-gas purity alarms"),
        section("degradation", degradation_fields(), "ageing"),
        section("thermal", thermal_fields(), "feed, heat loss, coolant exchanger and temperature control"),
        variable(par_heat_capacity).defaults(kPerArea),
        variable(par_ramp_rate).defaults("the technology's"),
        section("separator", separator_fields(), "anode gas separator (dynamic runs)"),
        section("standby", standby_fields(), "hot standby (dynamic runs)"),
        section("startup", startup_fields(), "start-ups from cold and from hot standby (dynamic runs)"),
        section("dynamics", dynamics_fields(), "time integration"),
        flag<PlantDesign>("drag_water_returned", [](PlantDesign& d) -> bool& { return d.drag_water_returned; },
                          "water dragged to the cathode (PEM) is separated and returned to the feed (true) or "
                          "drained and made up (false)"),
    };
    return fields;
}

const std::vector<PlantField>& operating_fields() {
    static const char* const kWhenRead = "none: give it when operating.spec reads it";
    static const std::vector<PlantField> fields = {
        PlantField{"spec", Type::spec, "which drive input the solve reads; its value must be given"}.mandatory(),
        variable(in_current_density)
            .defaults("1e4 A/m2, or half the maximum current density (plant.limits.current_density_max, else "
                      "the cell model's) or the rated current density (plant.limits.rated_current_density, else the "
                      "technology's) if either is lower"),
        variable(in_current).defaults(kWhenRead),
        variable(in_power).defaults(kWhenRead),
        variable(in_hydrogen_rate).defaults(kWhenRead),
        variable(in_voltage).defaults(kWhenRead),
        variable(in_temperature)
            .defaults("the middle of the cell model's fitted temperature range (but not above "
                      "plant.limits.temperature_max when that is set)"),
        variable(in_pressure_cathode).defaults("101325 Pa, or the cell model's lowest pressure if that is higher"),
        variable(in_pressure_anode).defaults("101325 Pa, or the cell model's lowest pressure if that is higher"),
        variable(in_hours_operated),
        variable(in_coolant_temperature).defaults("the technology's coolant inlet temperature"),
        variable(in_coolant_flow)
            .defaults("sized so that the open valve takes 110 % of the heat of rated load at the temperature "
                      "setpoint with the technology's coolant temperature rise"),
        variable(in_mode_request, Type::count),
    };
    return fields;
}

}  // namespace

const std::vector<PlantField>& root_fields() {
    static const std::vector<PlantField> fields = {
        PlantField{"technology", Type::technology, "the cell technology (see *Technologies*)"}.mandatory(),
        text<PlantDesign>("name", [](PlantDesign& d) -> std::string& { return d.name; }, "free text naming the plant"),
        section("stack", stack_fields(), "the stacks").mandatory(),
        PlantField{"cell", Type::cell, "cell-model parameters of the technology, each optional (see below)"},
        section("plant", plant_fields(), "rectifier, auxiliaries, limits, alarms, degradation, heat"),
        section("operating", operating_fields(), "the drive specification and the initial inputs").mandatory(),
        PlantField{"reactions", Type::reactions,
                   "technologies built from a reaction table only (custom), and required there: the half-reactions "
                   "of each electrode"},
    };
    return fields;
}

// The custom cell: its "cell" object and the reaction objects of "reactions".
using ReactionField = Field<HalfReaction>;
#define ELY_MEMBER(expr) [](HalfReaction& r) -> auto& { return r.expr; }

const std::vector<Field<HalfReaction>>& reaction_fields() {
    static const std::vector<ReactionField> fields = {
        text<HalfReaction>("name", ELY_MEMBER(name), "name of the reaction, e.g. \"zinc deposition\"").mandatory(),
        text<HalfReaction>("product", ELY_MEMBER(product),
                           "product formula; \"H2\", \"O2\" and \"Cl2\" also fill the gas streams")
            .mandatory(),
        count<HalfReaction>("electrons", 1, 12, ELY_MEMBER(electrons), "electrons per formula unit of product"),
        Field<HalfReaction>{"species", Type::list,
                            "the half-reaction's species written as a reduction, ox + n e- -> red: an array of "
                            "{species, phase, coefficient} (see reactions.*[i].species[k]); E°(T) and the reaction "
                            "enthalpy follow from their data (the bundled table or reactions.species)"}
            .defaults("none: then standard_potential is required and the heat needs cell.thermoneutral_voltage "
                      "(unless the table is water splitting)"),
        quantity<HalfReaction>("standard_potential", "V", -5, 5, ELY_MEMBER(standard_potential),
                               "standard reduction potential vs SHE at 298.15 K, as tabulated (e.g. the CRC "
                               "electrochemical series); only for a reaction without species")
            .defaults("required when the reaction gives no species"),
        quantity<HalfReaction>("standard_potential_temperature_coefficient", "V/K", -0.01, 0.01,
                               ELY_MEMBER(standard_potential_temperature_coefficient),
                               "dE°/dT; 0 holds E° at its 25 °C value (only for a reaction without species)"),
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
                               "Arrhenius activation energy of the exchange current density")
            .defaults("not given: then the cell must run at the reference temperature"),
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
        quantity<HalfReaction>("limiting_current_activation_energy", "J/mol", 0, 1e6,
                               ELY_MEMBER(limiting_current_activation_energy),
                               "Arrhenius activation energy of the limiting current density about the kinetics "
                               "reference temperature (diffusion and solubility rise with temperature)"),
        quantity<HalfReaction>("product_molar_mass", "kg/mol", 0, 10, ELY_MEMBER(product_molar_mass),
                               "molar mass of the product, for product mass rates")
            .defaults("that of the reaction's species named like the product, or of H2, O2, Cl2 for those "
                      "products; else 0 (the mass rate is then not a number)"),
    };
    return fields;
}

#undef ELY_MEMBER

using CustomField = Field<CustomCellSpec>;
#define ELY_MEMBER(expr) [](CustomCellSpec& c) -> auto& { return c.expr; }

const std::vector<Field<CustomCellSpec>>& custom_cell_fields() {
    static const std::vector<CustomField> fields = {
        quantity<CustomCellSpec>("area_specific_resistance", "ohm m2", 0, 1, ELY_MEMBER(area_specific_resistance),
                                 "electrolyte, separator and contact resistance at the reference temperature"),
        quantity<CustomCellSpec>("resistance_activation_energy", "J/mol", 0, 1e6,
                                 ELY_MEMBER(area_specific_resistance_activation_energy),
                                 "Arrhenius activation energy of the electrolyte's conductivity: ASR(T) = ASR exp[(E/R)"
                                 "(1/T - 1/T_ref)]; 0 holds the resistance constant"),
        quantity<CustomCellSpec>("resistance_reference_temperature", "K", 0, 5000,
                                 ELY_MEMBER(area_specific_resistance_reference_temperature),
                                 "temperature of area_specific_resistance")
            .above(0),
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
                                 "thermoneutral voltage of a table whose reactions give no species: the heat is then "
                                 "N·I·(V − E_tn); refused when every reaction gives its species")
            .defaults("from the species' enthalpies, weighted by the current shares; for a water-splitting table "
                      "without species the liquid-water (HHV) value; any other table without species must give it"),
        quantity<CustomCellSpec>("water_activity", "1", 0, 1, ELY_MEMBER(water_activity),
                                 "water activity of the electrolyte the product gases leave saturated over; 0 = a dry "
                                 "electrolyte (a melt): the gases leave without water")
            .defaults("1 for an aqueous table (an aqueous species or liquid water, or a table without species), 0 "
                      "otherwise"),
    };
    return fields;
}

#undef ELY_MEMBER

#define ELY_MEMBER(expr) [](SpeciesTermInput& t) -> auto& { return t.expr; }
const std::vector<Field<SpeciesTermInput>>& species_term_fields() {
    static const std::vector<Field<SpeciesTermInput>> fields = {
        text<SpeciesTermInput>("species", ELY_MEMBER(species), "the species' formula as the table writes it, e.g. "
                                                               "\"Zn+2\", \"H2O\", \"MgCl2\"")
            .mandatory(),
        text<SpeciesTermInput>("phase", ELY_MEMBER(phase), "gas, liquid, aqueous, solid or melt").mandatory(),
        quantity<SpeciesTermInput>("coefficient", "1", -100, 100, ELY_MEMBER(coefficient),
                                   "stoichiometric coefficient in the reduction ox + n e- -> red: negative for the "
                                   "oxidized side, positive for the reduced side; the charges must sum to -n")
            .mandatory(),
    };
    return fields;
}
#undef ELY_MEMBER

#define ELY_MEMBER(expr) [](SpeciesRowInput& r) -> auto& { return r.expr; }
const std::vector<Field<SpeciesRowInput>>& species_row_fields() {
    static const std::vector<Field<SpeciesRowInput>> fields = {
        text<SpeciesRowInput>("name", ELY_MEMBER(name), "the species' formula, as reactions name it").mandatory(),
        text<SpeciesRowInput>("phase", ELY_MEMBER(phase), "aqueous, solid or melt (gases and liquid water come from "
                                                          "the bundled fits)")
            .mandatory(),
        quantity<SpeciesRowInput>("molar_mass", "kg/mol", 0, 10, ELY_MEMBER(molar_mass), "molar mass")
            .above(0)
            .mandatory(),
        count<SpeciesRowInput>("charge", -10, 10, ELY_MEMBER(charge), "charge of an ion, in elementary charges"),
        quantity<SpeciesRowInput>("formation_enthalpy", "J/mol", -1e7, 1e7, ELY_MEMBER(formation_enthalpy),
                                  "enthalpy of formation at 298.15 K of the phase stable there (conventional scale "
                                  "H+(aq) = 0 for ions)")
            .mandatory(),
        quantity<SpeciesRowInput>("entropy", "J/(mol K)", -1e4, 1e4, ELY_MEMBER(entropy),
                                  "entropy at 298.15 K and 1 bar (absolute; conventional for ions)")
            .mandatory(),
        quantity<SpeciesRowInput>("cp_a", "J/(mol K)", -1e5, 1e5, ELY_MEMBER(cp_a),
                                  "a of the heat capacity cp = a + b T + c/T^2 (constant cp: a alone)")
            .mandatory(),
        quantity<SpeciesRowInput>("cp_b", "J/(mol K2)", -1e3, 1e3, ELY_MEMBER(cp_b), "b of the heat capacity"),
        quantity<SpeciesRowInput>("cp_c", "J K/mol", -1e9, 1e9, ELY_MEMBER(cp_c), "c of the heat capacity"),
        quantity<SpeciesRowInput>("temperature_min", "K", 1, 5000, ELY_MEMBER(temperature_min),
                                  "lowest temperature of the row's data")
            .mandatory(),
        quantity<SpeciesRowInput>("temperature_max", "K", 1, 5000, ELY_MEMBER(temperature_max),
                                  "highest temperature of the row's data")
            .mandatory(),
        text<SpeciesRowInput>("source", ELY_MEMBER(source),
                              "where the numbers come from (a table, a paper; 'from memory' when that is what it is)")
            .mandatory(),
    };
    return fields;
}
#undef ELY_MEMBER

}  // namespace ely::config_keys
