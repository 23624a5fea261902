#pragma once
// Description of one variable of the block: the record every host reads (C metadata, docs,
// FMI model description, spreadsheet help, command line). It lives in base/ because the cell
// models describe the outputs they add with it (lib/cells), and the unit layer's variable
// table (lib/unit/variables.cpp) is made of it.
//
// Built with constexpr setters so that tables read like a spec sheet:
//   input("in.temperature", "K", "stack temperature").above(0).nominal(350).display("degC", 1, -273.15)
#include <cstdint>
#include <limits>

namespace ely {

enum class Causality : int32_t { input = 0, output = 1, parameter = 2 };

/// How a variable may change (the FMI meanings): fixed by the plant description; tunable
/// between solves (parameters a host may set); continuous or discrete (0/1, counts) in time.
enum class Variability : int32_t { fixed = 0, tunable = 1, continuous = 2, discrete = 3 };

/// A preferred display unit: display value = SI value · scale + offset.
struct DisplayUnit {
    const char* symbol = nullptr;  // nullptr: the SI unit itself
    double scale = 1.0;
    double offset = 0.0;
};

/// The display units the tables use, each defined once (scale and offset from SI; exact by
/// the definitions of the units: SI Brochure, 9th ed., tables 7 and 8; 1 bar = 1e5 Pa; 1 kWh =
/// 3.6e6 J; t/°C = T/K − 273.15).
namespace display {
constexpr DisplayUnit degC{"degC", 1.0, -273.15};
constexpr DisplayUnit bar{"bar", 1e-5, 0.0};
constexpr DisplayUnit A_per_cm2{"A/cm2", 1e-4, 0.0};
constexpr DisplayUnit kA{"kA", 1e-3, 0.0};
constexpr DisplayUnit kW{"kW", 1e-3, 0.0};
constexpr DisplayUnit MW{"MW", 1e-6, 0.0};
constexpr DisplayUnit kg_per_h{"kg/h", 3600.0, 0.0};
constexpr DisplayUnit kWh_per_kg{"kWh/kg", 1.0 / 3.6e6, 0.0};
constexpr DisplayUnit kWh_per_t{"kWh/t", 1.0 / 3.6e3, 0.0};
constexpr DisplayUnit percent{"%", 100.0, 0.0};
constexpr DisplayUnit kg_per_kg{"kg/kg", 1.0, 0.0};
constexpr DisplayUnit t_per_t{"t/t", 1.0, 0.0};
constexpr DisplayUnit ohm_cm2{"ohm cm2", 1e4, 0.0};
constexpr DisplayUnit uV_per_h{"uV/h", 1e6, 0.0};
constexpr DisplayUnit MJ_per_K{"MJ/K", 1e-6, 0.0};
constexpr DisplayUnit kW_per_K{"kW/K", 1e-3, 0.0};
constexpr DisplayUnit percent_per_s{"%/s", 100.0, 0.0};
constexpr DisplayUnit t_per_h{"t/h", 3.6, 0.0};
constexpr DisplayUnit minutes{"min", 1.0 / 60.0, 0.0};
}  // namespace display

struct VariableInfo {
    const char* name = "";        // "group.quantity"
    const char* unit = "1";       // SI unit ("1" dimensionless)
    Causality causality = Causality::output;
    Variability variability = Variability::continuous;
    uint32_t needs = 0;           // technology features the variable needs (0: every technology)
    double min = -std::numeric_limits<double>::infinity();  // limits Block::set and the config enforce
    double max = std::numeric_limits<double>::infinity();
    bool min_exclusive = false;   // the value must be above min (positive quantities)
    double start = std::numeric_limits<double>::quiet_NaN();  // default of an input or parameter
    double nominal = 1.0;         // typical magnitude, for scaling
    const char* label = "";       // short display label
    DisplayUnit display{};
    const char* config_key = nullptr;  // JSON path that sets its start ("$.operating.temperature")
    const char* description = "";

    constexpr VariableInfo at_least(double lo) const { VariableInfo v = *this; v.min = lo; v.min_exclusive = false; return v; }
    constexpr VariableInfo above(double lo) const { VariableInfo v = *this; v.min = lo; v.min_exclusive = true; return v; }
    constexpr VariableInfo at_most(double hi) const { VariableInfo v = *this; v.max = hi; return v; }
    constexpr VariableInfo within(double lo, double hi) const { return at_least(lo).at_most(hi); }
    constexpr VariableInfo starts(double value) const { VariableInfo v = *this; v.start = value; return v; }
    constexpr VariableInfo scaled(double typical) const { VariableInfo v = *this; v.nominal = typical; return v; }
    constexpr VariableInfo labelled(const char* text) const { VariableInfo v = *this; v.label = text; return v; }
    constexpr VariableInfo shown_in(DisplayUnit unit) const { VariableInfo v = *this; v.display = unit; return v; }
    constexpr VariableInfo configured_by(const char* path) const { VariableInfo v = *this; v.config_key = path; return v; }
    constexpr VariableInfo needing(uint32_t features) const { VariableInfo v = *this; v.needs = features; return v; }
    constexpr VariableInfo with(Variability variability_) const { VariableInfo v = *this; v.variability = variability_; return v; }

    /// The display unit's symbol (the SI unit when no other is preferred).
    constexpr const char* display_symbol() const { return display.symbol ? display.symbol : unit; }
};

constexpr VariableInfo describe(const char* name, const char* unit, Causality causality, const char* description) {
    VariableInfo v;
    v.name = name;
    v.unit = unit;
    v.causality = causality;
    v.variability = causality == Causality::parameter ? Variability::fixed : Variability::continuous;
    v.description = description;
    return v;
}

}  // namespace ely
