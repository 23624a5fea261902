// The config layer: unit conversion and JSON → PlantDesign, with every error path.
// Unit definitions are checked against their exact values: SI Brochure, 9th ed. (BIPM 2019),
// prefixes (table 7), min, h, d, L, t (table 8), t/°C = T/K − 273.15 (section 2.3.1); NIST
// SP 811 (2008 ed.), appendix B: 1 bar = 1e5 Pa, 1 atm = 101325 Pa; 1 kWh = 3.6e6 J by
// definition of the watt-hour. (Table numbers from memory.)
//
// The Config tests run against the real cell models: they read each technology's parameter
// table (cell_parameters) and envelope rather than assuming their values.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <fmt/format.h>

#include <cmath>
#include <cstring>
#include <cstdio>
#include <fstream>
#include <limits>
#include <string>

#include "cells/cell.hpp"
#include "cells/registry.hpp"
#include "config/config.hpp"
#include "config/units.hpp"
#include "base/error.hpp"

using namespace ely;
using ::testing::HasSubstr;
using ::testing::Not;
using ::testing::StartsWith;

namespace {

template <class F>
std::string error_of(F&& f, ErrorKind kind) {
    try {
        f();
    } catch (const Error& e) {
        EXPECT_EQ(static_cast<int>(e.kind()), static_cast<int>(kind)) << e.what();
        return e.what();
    }
    ADD_FAILURE() << "no ely::Error thrown";
    return {};
}

/// The config must fail with a message that starts with `path` + ": " and contains `fragment`.
void expect_config_error(const std::string& json, const std::string& path, const std::string& fragment) {
    SCOPED_TRACE(json);
    const std::string message = error_of([&] { parse_config(json); }, ErrorKind::config);
    EXPECT_THAT(message, StartsWith(path + ": "));
    EXPECT_THAT(message, HasSubstr(fragment));
}

double q(const char* text, const char* unit) { return parse_quantity(text, unit); }

const char* kMinimalTail = R"("stack": { "cells": 100, "active_area": 0.1 }, "operating": { "spec": "current_density" })";

std::string minimal(const std::string& technology) {
    return R"({ "technology": ")" + technology + "\", " + kMinimalTail + " }";
}

/// The minimal config with `extra` (one or more "key": value members) added at the top level.
std::string pem_with(const std::string& extra) {
    return std::string(R"({ "technology": "pem", )") + kMinimalTail + ", " + extra + " }";
}

// Two competing-free half-reactions: water oxidation and reduction, E° from the CRC
// electrochemical series (1.229 V and 0 V vs SHE at 25 °C).
const char* kWaterReactions = R"("reactions": {
    "anode": [ { "name": "oxygen evolution", "product": "O2", "electrons": 4, "standard_potential": 1.229,
                 "exchange_current_density": 1e-3, "activation_energy": 60e3, "product_molar_mass": 0.032 } ],
    "cathode": [ { "name": "hydrogen evolution", "product": "H2", "electrons": 2, "standard_potential": 0,
                   "exchange_current_density": 10, "activation_energy": 16e3, "product_molar_mass": 0.002016 } ] })";

std::string custom_minimal(const std::string& extra = "") {
    return std::string(R"({ "technology": "custom", )") + kMinimalTail + ", " + kWaterReactions +
           (extra.empty() ? "" : ", " + extra) + " }";
}

}  // namespace

// --- Units -----------------------------------------------------------------------------------

TEST(Units, ExactDefinitions) {
    // SI Brochure 9th ed. table 8 / NIST SP 811 appendix B: exact by definition.
    EXPECT_EQ(q("1 bar", "Pa"), 1e5);
    EXPECT_EQ(q("30 bar", "Pa"), 3e6);
    EXPECT_EQ(q("1 atm", "Pa"), 101325.0);
    EXPECT_DOUBLE_EQ(q("0 degC", "K"), 273.15);
    EXPECT_DOUBLE_EQ(q("80 degC", "K"), 353.15);
    EXPECT_DOUBLE_EQ(q("-20 °C", "K"), 253.15);
    EXPECT_EQ(q("353.15 K", "K"), 353.15);
    EXPECT_EQ(q("1 A/cm2", "A/m2"), 1e4);
    EXPECT_EQ(q("2 A/cm2", "A/m2"), 2e4);
    EXPECT_EQ(q("20 mA/cm2", "A/m2"), 200.0);
    EXPECT_EQ(q("1 kWh", "J"), 3.6e6);
    EXPECT_EQ(q("1.5 MW", "W"), 1.5e6);
    EXPECT_EQ(q("35 kJ/mol", "J/mol"), 35e3);
    EXPECT_DOUBLE_EQ(q("1 kg/h", "kg/s"), 1.0 / 3600.0);
    EXPECT_DOUBLE_EQ(q("500 kg/h", "kg/s"), 500.0 / 3600.0);
    EXPECT_DOUBLE_EQ(q("1 ohm cm2", "ohm m2"), 1e-4);
    EXPECT_DOUBLE_EQ(q("0.15 ohm cm2", "ohm m2"), 0.15e-4);
    EXPECT_DOUBLE_EQ(q("178 um", "m"), 178e-6);
    EXPECT_DOUBLE_EQ(q("178 µm", "m"), 178e-6);  // micro sign U+00B5
    EXPECT_DOUBLE_EQ(q("178 μm", "m"), 178e-6);  // Greek mu U+03BC
    EXPECT_DOUBLE_EQ(q("32 wt%", "1"), 0.32);
    EXPECT_EQ(q("25 %", "1"), 0.25);
    EXPECT_DOUBLE_EQ(q("50 ppm", "1"), 50e-6);
    EXPECT_EQ(q("1 mol/mol", "1"), 1.0);
    EXPECT_EQ(q("2 min", "s"), 120.0);
    EXPECT_EQ(q("1 d", "h"), 24.0);
    EXPECT_EQ(q("1 L", "m3"), 1e-3);
    EXPECT_EQ(q("1 t", "kg"), 1e3);
    EXPECT_EQ(q("1 g", "kg"), 1e-3);
    EXPECT_EQ(q("2000 cm2", "m2"), 0.2);
    EXPECT_EQ(q("1.3 bar", "Pa"), 1.3e5);
}

TEST(Units, NumberForms) {
    EXPECT_DOUBLE_EQ(q("80degC", "K"), 353.15);  // no space
    EXPECT_EQ(q("  1e5 Pa  ", "Pa"), 1e5);
    EXPECT_EQ(q("+2.5 bar", "Pa"), 2.5e5);
    EXPECT_EQ(q("1.5E6 W", "MW"), 1.5);
    EXPECT_EQ(q("42", "K"), 42.0);  // a bare number is taken in the expected unit
    EXPECT_EQ(q("25%", "1"), 0.25);
}

TEST(Units, CompoundExpressions) {
    EXPECT_EQ(q("3 mol/(m s Pa)", "mol/(m s Pa)"), 3.0);
    EXPECT_EQ(q("3 mol m-1 s-1 Pa-1", "mol/(m s Pa)"), 3.0);
    EXPECT_EQ(q("3 mol/m/s/Pa", "mol/(m s Pa)"), 3.0);
    EXPECT_EQ(q("3 mol/m s Pa", "mol/(m s Pa)"), 3.0);  // after '/', the rest is the denominator
    EXPECT_EQ(q("2 J/mol K", "J/(mol K)"), 2.0);
    EXPECT_EQ(q("2 J*mol^-1*K^-1", "J/(mol*K)"), 2.0);
    EXPECT_EQ(q("1 m^2", "cm2"), 1e4);
    EXPECT_EQ(q("1 m²", "m2"), 1.0);
    EXPECT_EQ(q("4 s⁻¹", "1/s"), 4.0);
    EXPECT_EQ(q("1 m.s-1", "m/s"), 1.0);
    EXPECT_DOUBLE_EQ(q("1 kΩ·cm²", "ohm m2"), 0.1);
    EXPECT_DOUBLE_EQ(q("2 mS/cm", "S/m"), 0.2);
    EXPECT_DOUBLE_EQ(q("10 uV/h", "V/h"), 1e-5);
    EXPECT_DOUBLE_EQ(q("1 mohm m2/h", "ohm m2/h"), 1e-3);
    EXPECT_DOUBLE_EQ(q("1 V", "W/A"), 1.0);
    EXPECT_DOUBLE_EQ(q("1 J", "W s"), 1.0);
    EXPECT_DOUBLE_EQ(q("1 Pa", "kg/(m s2)"), 1.0);
    EXPECT_DOUBLE_EQ(q("1 ohm", "V/A"), 1.0);
    EXPECT_DOUBLE_EQ(q("1 S", "A/V"), 1.0);
    EXPECT_DOUBLE_EQ(q("1 Ah", "C"), 3600.0);
}

TEST(Units, DimensionsOfSymbols) {
    EXPECT_EQ(dimension_text(parse_unit("Pa").dimension), "m-1 kg s-2");
    EXPECT_EQ(dimension_text(parse_unit("ohm m2").dimension), "m4 kg s-3 A-2");
    EXPECT_EQ(dimension_text(parse_unit("mol/mol").dimension), "1");
    EXPECT_EQ(dimension_text(parse_unit("1").dimension), "1");
    EXPECT_EQ(parse_unit("degC").offset, 273.15);
    EXPECT_DOUBLE_EQ(parse_unit("kWh").factor(), 3.6e6);
}

TEST(Units, RoundTrip) {
    const char* pairs[][2] = {{"bar", "Pa"}, {"A/cm2", "A/m2"}, {"kg/h", "kg/s"}, {"ohm cm2", "ohm m2"},
                              {"kJ/mol", "J/mol"}, {"MW", "W"},    {"um", "m"},      {"atm", "kPa"}};
    for (const auto& p : pairs) {
        for (double x : {1e-7, 0.37, 1.0, 12.5, 3.3e5}) {
            const double y = convert_unit(x, p[0], p[1]);
            EXPECT_NEAR(convert_unit(y, p[1], p[0]) / x, 1.0, 4e-16) << p[0] << " " << p[1] << " " << x;
        }
    }
}

TEST(Units, DimensionMismatch) {
    auto m = error_of([] { q("1 bar", "K"); }, ErrorKind::config);
    EXPECT_THAT(m, HasSubstr("expected a quantity in K, got 'bar'"));
    m = error_of([] { q("2 A/cm2", "A"); }, ErrorKind::config);
    EXPECT_THAT(m, HasSubstr("expected a quantity in A, got 'A/cm2'"));
    m = error_of([] { q("5 kg/h", "mol/s"); }, ErrorKind::config);
    EXPECT_THAT(m, HasSubstr("expected a quantity in mol/s"));
    m = error_of([] { q("5 %", "m"); }, ErrorKind::config);
    EXPECT_THAT(m, HasSubstr("got '%'"));
}

// "C" is the coulomb: given for a temperature the message keeps the dimensions and hints at degC;
// a coulomb where a charge is expected stays valid, and other mismatches get no hint.
TEST(Units, CoulombForATemperatureHintsAtDegC) {
    EXPECT_EQ(error_of([] { q("80 C", "K"); }, ErrorKind::config),
              "expected a quantity in K, got 'C' (s A instead of K); did you mean degC?");
    EXPECT_EQ(q("3600 C", "A h"), 1.0);
    EXPECT_THAT(error_of([] { q("80 C", "Pa"); }, ErrorKind::config), Not(HasSubstr("degC")));
    EXPECT_THAT(error_of([] { q("80 bar", "K"); }, ErrorKind::config), Not(HasSubstr("degC")));
}

TEST(Units, ErrorsNameTheUnit) {
    EXPECT_THAT(error_of([] { q("100 degF", "K"); }, ErrorKind::config), HasSubstr("unit 'degF' is not known"));
    EXPECT_THAT(error_of([] { q("1 kg/hr", "kg/s"); }, ErrorKind::config), HasSubstr("unit 'hr' (in 'kg/hr') is not known"));
    EXPECT_THAT(error_of([] { q("1 m^", "m"); }, ErrorKind::config), HasSubstr("no exponent after '^'"));
    EXPECT_THAT(error_of([] { q("1 (m s", "m s"); }, ErrorKind::config), HasSubstr("unclosed '('"));
    EXPECT_THAT(error_of([] { q("1 m//s", "m/s"); }, ErrorKind::config), HasSubstr("unexpected '/'"));
    EXPECT_THAT(error_of([] { q("1 degC/h", "K/h"); }, ErrorKind::config), HasSubstr("stands only on its own"));
    EXPECT_THAT(error_of([] { q("1 degC2", "K"); }, ErrorKind::config), HasSubstr("stands only on its own"));
    EXPECT_THAT(error_of([] { q("5 Nm3/h", "kg/s"); }, ErrorKind::config), HasSubstr("normal or standard cubic metres"));
    EXPECT_THAT(error_of([] { q("bar", "Pa"); }, ErrorKind::config), HasSubstr("expected a number followed by a unit"));
    EXPECT_THAT(error_of([] { q("", "Pa"); }, ErrorKind::config), HasSubstr("expected a number followed by a unit"));
    EXPECT_THAT(error_of([] { q("--1 Pa", "Pa"); }, ErrorKind::config), HasSubstr("expected a number"));
    EXPECT_THAT(error_of([] { q("inf K", "K"); }, ErrorKind::config), HasSubstr("not a finite number"));
    EXPECT_THAT(error_of([] { q("nan K", "K"); }, ErrorKind::config), HasSubstr("not a finite number"));
    EXPECT_THAT(error_of([] { q("1e308 GW", "W"); }, ErrorKind::config), HasSubstr("out of range"));
    EXPECT_THAT(error_of([] { q("1 m999", "m"); }, ErrorKind::config), HasSubstr("exponent out of range"));
    // An expected unit outside the grammar (an empirical fit's unit) takes plain numbers only.
    EXPECT_EQ(q("0.5", "(A/m2)^-n"), 0.5);
    EXPECT_EQ(q(" 0.5 ", "(A/m2)^-n"), 0.5);
    EXPECT_THAT(error_of([] { q("0.5 A/m2", "(A/m2)^-n"); }, ErrorKind::config), HasSubstr("take no unit conversion"));
}

// --- Config: the minimal config and defaults ----------------------------------------------------

TEST(Config, MinimalConfigEveryTechnology) {
    // Runs against the real cell models in the full build: the minimal config of DESIGN.md
    // must give a cell whose default operating point it can evaluate.
    for (const auto& t : technologies()) {
        SCOPED_TRACE(t.name);
        const PlantDesign d = t.has(kReactionTable) ? parse_config(custom_minimal()) : parse_config(minimal(t.name));
        ASSERT_TRUE(d.cell);
        EXPECT_EQ(d.technology, &t);
        EXPECT_EQ(d.cell_parameters == nullptr, t.has(kReactionTable));
        EXPECT_EQ(d.cells(), 100);
        EXPECT_EQ(d.stacks(), 1);
        EXPECT_EQ(d.active_area(), 0.1);
        EXPECT_EQ(d.spec, Spec::current_density);
        const Envelope& e = d.cell->envelope();
        EXPECT_DOUBLE_EQ(d.configured[in_temperature], 0.5 * (e.temperature_fit_min + e.temperature_fit_max));
        EXPECT_GE(d.configured[in_pressure_cathode], e.pressure_min);
        EXPECT_LE(d.configured[in_pressure_cathode], e.pressure_max);
        EXPECT_EQ(d.configured[in_pressure_anode], d.configured[in_pressure_cathode]);
        if (e.pressure_min <= 101325.0) {
            EXPECT_EQ(d.configured[in_pressure_cathode], 101325.0);
        }
        EXPECT_GT(d.configured[in_current_density], 0.0);
        EXPECT_LE(d.configured[in_current_density], 0.5 * e.current_density_max);
        const OperatingPoint point{d.configured[in_current_density], d.configured[in_temperature], d.configured[in_pressure_anode],
                                   d.configured[in_pressure_cathode]};
        EXPECT_NO_THROW(d.cell->evaluate(point));
    }
}

TEST(Config, DefaultsAreTheVariableTableDefaults) {
    // Keys not given take the variable table's default, except the operating point, which the
    // config settles from the cell model (tested above); drive inputs never given stay unset.
    const PlantDesign d = parse_config(minimal("pem"));
    EXPECT_EQ(d.name, "");
    EXPECT_TRUE(d.drag_water_returned);
    for (int i = 0; i < kVarCount; ++i) {
        const auto v = static_cast<Var>(i);
        const VariableInfo& info = variable_info(v);
        if (!info.config_key || v == in_temperature || v == in_pressure_cathode || v == in_pressure_anode ||
            v == in_current_density || v == par_cells || v == par_active_area)
            continue;
        SCOPED_TRACE(info.name);
        if (std::isnan(info.start)) EXPECT_TRUE(std::isnan(d.configured[i]));
        else EXPECT_EQ(d.configured[i], info.start);
    }
    // The documented defaults (typical values, from memory; docs/config.md): rectifier losses
    // 0.5 %, 1 %, 1.5 %; auxiliaries 3 %; minimum load 10 %; alarms 1 %, 2 %, LFL 4 %.
    EXPECT_EQ(d.configured[par_rectifier_loss_no_load], 0.005);
    EXPECT_EQ(d.configured[par_rectifier_loss_linear], 0.010);
    EXPECT_EQ(d.configured[par_rectifier_loss_quadratic], 0.015);
    EXPECT_EQ(d.configured[par_auxiliaries_proportional], 0.03);
    EXPECT_EQ(d.configured[par_min_load_fraction], 0.1);
    EXPECT_EQ(d.configured[par_alarms_h2_in_o2_warning], 0.01);
    EXPECT_EQ(d.configured[par_alarms_h2_in_o2_trip], 0.02);
    EXPECT_EQ(d.configured[par_alarms_lower_flammability_limit], 0.04);
    EXPECT_EQ(d.configured[in_feed_temperature], 298.15);
    EXPECT_EQ(d.stacks(), 1);
}

TEST(Config, FullConfigWithUnits) {
    const std::string json = R"({
      "technology": "pem",
      "name": "test plant",
      "stack": { "cells": 250, "active_area": "2000 cm2", "stacks": 10 },
      "plant": {
        "rectifier": { "rated_power": "12 MW", "loss_no_load": 0.004, "loss_linear": "1 %", "loss_quadratic": 0.02 },
        "auxiliaries": { "fixed": "150 kW", "proportional": "3 %" },
        "limits": { "current_density_max": "2.5 A/cm2", "min_load_fraction": 0.15, "temperature_max": "85 degC" },
        "alarms": { "h2_in_o2_warning": "0.5 mol%", "h2_in_o2_trip": 0.015, "lower_flammability_limit": 0.04 },
        "degradation": { "voltage_rate": "4 uV/h", "resistance_rate": "1e-4 ohm cm2/h" },
        "thermal": { "feed_temperature": "15 degC", "heat_loss_coefficient": "0.2 kW/K", "ambient_temperature": 293.15 },
        "drag_water_returned": false
      },
      "operating": {
        "spec": "power", "current_density": "2 A/cm2", "current": "400 A", "power": "1.2 MW",
        "hydrogen_rate": "500 kg/h", "voltage": "1900 mV", "temperature": "65 degC",
        "pressure_cathode": "30 bar", "pressure_anode": "1.5 bar", "hours_operated": "1 d"
      }
    })";
    const PlantDesign d = parse_config(json);
    EXPECT_EQ(d.name, "test plant");
    EXPECT_EQ(d.cells(), 250);
    EXPECT_EQ(d.stacks(), 10);
    EXPECT_EQ(d.active_area(), 0.2);
    EXPECT_EQ(d.configured[par_rectifier_rated_power], 12e6);
    EXPECT_EQ(d.configured[par_rectifier_loss_no_load], 0.004);
    EXPECT_EQ(d.configured[par_rectifier_loss_linear], 0.01);
    EXPECT_EQ(d.configured[par_rectifier_loss_quadratic], 0.02);
    EXPECT_EQ(d.configured[par_auxiliaries_fixed], 150e3);
    EXPECT_EQ(d.configured[par_auxiliaries_proportional], 0.03);
    EXPECT_EQ(d.configured[par_current_density_max], 2.5e4);
    EXPECT_EQ(d.configured[par_min_load_fraction], 0.15);
    EXPECT_DOUBLE_EQ(d.configured[par_temperature_max], 358.15);
    EXPECT_DOUBLE_EQ(d.configured[par_alarms_h2_in_o2_warning], 0.005);
    EXPECT_EQ(d.configured[par_alarms_h2_in_o2_trip], 0.015);
    EXPECT_DOUBLE_EQ(d.configured[par_degradation_voltage_rate], 4e-6);
    EXPECT_DOUBLE_EQ(d.configured[par_degradation_resistance_rate], 1e-8);
    EXPECT_DOUBLE_EQ(d.configured[in_feed_temperature], 288.15);
    EXPECT_EQ(d.configured[par_heat_loss_coefficient], 200.0);
    EXPECT_EQ(d.configured[in_ambient_temperature], 293.15);
    EXPECT_FALSE(d.drag_water_returned);
    EXPECT_EQ(d.spec, Spec::power);
    EXPECT_EQ(d.configured[in_current_density], 2e4);
    EXPECT_EQ(d.configured[in_current], 400.0);
    EXPECT_EQ(d.configured[in_power], 1.2e6);
    EXPECT_DOUBLE_EQ(d.configured[in_hydrogen_rate], 500.0 / 3600.0);
    EXPECT_DOUBLE_EQ(d.configured[in_voltage], 1.9);
    EXPECT_DOUBLE_EQ(d.configured[in_temperature], 338.15);
    EXPECT_EQ(d.configured[in_pressure_cathode], 30e5);
    EXPECT_EQ(d.configured[in_pressure_anode], 1.5e5);
    EXPECT_EQ(d.configured[in_hours_operated], 24.0);
}

TEST(Config, EverySpecName) {
    for (const auto& info : specs()) {
        const std::string key = std::string(variable_info(info.drive).config_key).substr(std::strlen("$.operating."));
        const std::string json = std::string(R"({ "technology": "pem", "stack": { "cells": 10, "active_area": 0.1 },
            "operating": { "spec": ")") + info.name + "\", \"" + key + "\": 1 } }";
        const PlantDesign d = parse_config(json);
        EXPECT_EQ(d.spec, info.spec);
        EXPECT_EQ(d.configured[info.drive], 1.0);
    }
}

TEST(Config, ASpecWhoseDriveInputIsNotGivenIsAnError) {
    // The spec names the input the solve reads: without its value the plant has no operating
    // point (it once solved at 0 W with only a low-load warning). The message names the config
    // key and the variable.
    for (const auto& info : specs()) {
        if (info.spec == Spec::current_density) continue;  // has a documented default
        SCOPED_TRACE(info.name);
        const std::string json = std::string(R"({ "technology": "pem", "stack": { "cells": 10, "active_area": 0.1 },
            "operating": { "spec": ")") + info.name + "\" } }";
        const std::string key = std::string(variable_info(info.drive).config_key).substr(2);  // "operating.power"
        expect_config_error(json, "$.operating", key + " is not given");
        expect_config_error(json, "$.operating", variable_info(info.drive).name);
    }
}

TEST(Config, CountsAcceptIntegralNumbers) {
    const std::string json = R"({ "technology": "pem", "stack": { "cells": 1e2, "active_area": 0.1, "stacks": 2.0 },
        "operating": { "spec": "current_density" } })";
    const PlantDesign d = parse_config(json);
    EXPECT_EQ(d.cells(), 100);
    EXPECT_EQ(d.stacks(), 2);
}

// Counts follow the rule of quantities: a string holding a plain number reads like the number.
TEST(Config, CountsGivenAsStringsOfDigits) {
    const std::string json = R"({ "technology": "pem", "stack": { "cells": "100", "active_area": 0.1, "stacks": " 2 " },
        "operating": { "spec": "current_density" } })";
    const PlantDesign d = parse_config(json);
    EXPECT_EQ(d.cells(), 100);
    EXPECT_EQ(d.stacks(), 2);
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": "0", "active_area": 0.1 },
        "operating": { "spec": "current_density" } })",
                        "$.stack.cells", "below the lower limit");
}

TEST(Config, CellParametersTakeUnits) {
    // Data-driven over the real parameter table: every key accepts its value in its own SI
    // unit, as a number and as a string, and the cell is still built.
    for (const auto& t : technologies()) {
        if (!t.parameters) continue;
        SCOPED_TRACE(t.name);
        std::string cell;
        for (const auto& p : cell_parameters(t)) {
            bool convertible = true;
            try {
                parse_unit(p.unit);
            } catch (const Error&) {
                convertible = false;  // an empirical unit such as "(A/m2)^-n": plain numbers only
            }
            cell += (cell.empty() ? "" : ", ") +
                    (convertible ? fmt::format(R"("{}": "{:.17g} {}")", p.key, p.default_value, p.unit)
                                 : fmt::format(R"("{}": "{:.17g}")", p.key, p.default_value));
        }
        const std::string json = R"({ "technology": ")" + std::string(t.name) + "\", " + kMinimalTail +
                                 ", \"cell\": {" + cell + "} }";
        EXPECT_TRUE(parse_config(json).cell);
    }
}

TEST(Config, CommentsAreAccepted) {
    const std::string json = "// plant\n{ \"technology\": \"pem\", /* the stack */ " + std::string(kMinimalTail) + " }\n// end\n";
    EXPECT_EQ(parse_config(json).cells(), 100);
}

TEST(Config, CustomCellKeys) {
    const PlantDesign d = parse_config(custom_minimal(R"("cell": { "area_specific_resistance": "0.2 ohm cm2",
        "temperature_min": "10 degC", "temperature_max": "90 degC", "pressure_min": "0.8 bar", "pressure_max": "10 bar",
        "current_density_max": "1 A/cm2" })"));
    ASSERT_TRUE(d.cell);
    const Envelope& e = d.cell->envelope();
    EXPECT_DOUBLE_EQ(e.temperature_min, 283.15);
    EXPECT_DOUBLE_EQ(e.temperature_max, 363.15);
    EXPECT_DOUBLE_EQ(e.temperature_fit_min, 283.15);  // the fitted range follows the hard range
    EXPECT_DOUBLE_EQ(e.temperature_fit_max, 363.15);
    EXPECT_DOUBLE_EQ(e.pressure_min, 0.8e5);
    EXPECT_DOUBLE_EQ(e.current_density_max, 1e4);
    EXPECT_DOUBLE_EQ(d.configured[in_temperature], 323.15);
    EXPECT_EQ(d.configured[in_current_density], 5e3);
}

// --- Config: every error path with its JSON path ---------------------------------------------

TEST(Config, UnknownKeyAtEveryLevel) {
    expect_config_error(pem_with(R"("foo": 1)"), "$", "unknown key 'foo'; known keys: technology, name, stack, cell");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1, "foo": 1 },
        "operating": { "spec": "current_density" } })",
                        "$.stack", "unknown key 'foo'; known keys: cells, active_area, stacks");
    expect_config_error(pem_with(R"("plant": { "foo": 1 })"), "$.plant", "unknown key 'foo'; known keys: rectifier");
    for (const char* s : {"rectifier", "auxiliaries", "limits", "alarms", "degradation", "thermal"}) {
        expect_config_error(pem_with(fmt::format(R"("plant": {{ "{}": {{ "foo": 1 }} }})", s)),
                            std::string("$.plant.") + s, "unknown key 'foo'; known keys: ");
    }
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
        "operating": { "spec": "current_density", "foo": 1 } })",
                        "$.operating", "unknown key 'foo'; known keys: spec, current_density");
    const std::string first_key = cell_parameters(technology("pem")).front().key;
    expect_config_error(pem_with(R"("cell": { "foo": 1 })"), "$.cell", "unknown key 'foo'; known keys: " + first_key);
    expect_config_error(custom_minimal(R"("cell": { "foo": 1 })"), "$.cell",
                        "unknown key 'foo'; known keys: area_specific_resistance");
    std::string json = custom_minimal();
    json.replace(json.find("\"product\": \"O2\""), 0, "\"foo\": 1, ");
    expect_config_error(json, "$.reactions.anode[0]", "unknown key 'foo'; known keys: name, product, electrons");
    json = custom_minimal();
    json.replace(json.find("\"cathode\":"), 0, "\"middle\": [], ");
    expect_config_error(json, "$.reactions", "unknown key 'middle'; known keys: anode, cathode");
}

TEST(Config, WrongTypes) {
    expect_config_error("[1, 2]", "$", "expected an object, got an array");
    expect_config_error(R"({ "technology": 3 })", "$.technology", "expected a string, got 3");
    expect_config_error(pem_with(R"("name": ["a"])"), "$.name", "expected a string, got an array");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": [0.1] },
        "operating": { "spec": "current_density" } })",
                        "$.stack.active_area", "expected a number or a string with a unit, got an array");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": "100 cells", "active_area": 0.1 },
        "operating": { "spec": "current_density" } })",
                        "$.stack.cells",
                        "expected an integer (a count is a plain number and takes no unit), got a string (\"100 cells\")");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": "2.5", "active_area": 0.1 },
        "operating": { "spec": "current_density" } })",
                        "$.stack.cells", "expected an integer, got a string (\"2.5\")");
    expect_config_error(R"({ "technology": "pem", "stack": 5, "operating": { "spec": "current_density" } })", "$.stack",
                        "expected an object, got 5");
    expect_config_error(pem_with(R"("plant": { "drag_water_returned": "yes" })"), "$.plant.drag_water_returned",
                        "expected true or false, got a string");
    expect_config_error(pem_with(R"("plant": { "alarms": null })"), "$.plant.alarms", "expected an object, got null");
    expect_config_error(pem_with(R"("plant": { "thermal": { "feed_temperature": true } })"),
                        "$.plant.thermal.feed_temperature", "expected a number or a string with a unit, got true");
    expect_config_error(pem_with(R"("cell": [])"), "$.cell", "expected an object, got an array");
    const std::string key = cell_parameters(technology("pem")).front().key;
    expect_config_error(pem_with(fmt::format(R"("cell": {{ "{}": {{}} }})", key)), "$.cell." + key,
                        "expected a number or a string with a unit, got an object");
}

TEST(Config, UnitsInsideTheConfig) {
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
        "operating": { "spec": "current_density", "temperature": "100 degF" } })",
                        "$.operating.temperature", "unit 'degF' is not known");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
        "operating": { "spec": "current_density", "temperature": "30 bar" } })",
                        "$.operating.temperature", "expected a quantity in K, got 'bar'");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": "10 m" },
        "operating": { "spec": "current_density" } })",
                        "$.stack.active_area", "expected a quantity in m2, got 'm'");
    // A cell parameter in the wrong dimension names the parameter's own SI unit.
    const auto& p = cell_parameters(technology("pem")).front();
    const std::string given = std::string(p.unit) == "K" ? "1 bar" : "1 K";
    expect_config_error(pem_with(fmt::format(R"("cell": {{ "{}": "{}" }})", p.key, given)), std::string("$.cell.") + p.key,
                        std::string("expected a quantity in ") + p.unit);
}

TEST(Config, OutOfRange) {
    auto stack = [](const std::string& body) {
        return R"({ "technology": "pem", "stack": {)" + body + R"(}, "operating": { "spec": "current_density" } })";
    };
    expect_config_error(stack(R"("cells": 2.5, "active_area": 0.1)"), "$.stack.cells", "expected an integer, got 2.5");
    expect_config_error(stack(R"("cells": 0, "active_area": 0.1)"), "$.stack.cells", "0 is below the lower limit 1");
    expect_config_error(stack(R"("cells": -3, "active_area": 0.1)"), "$.stack.cells", "below the lower limit 1");
    expect_config_error(stack(R"("cells": 10001, "active_area": 0.1)"), "$.stack.cells", "above the upper limit 10000");
    expect_config_error(stack(R"("cells": 1e300, "active_area": 0.1)"), "$.stack.cells", "above the upper limit 10000");
    expect_config_error(stack(R"("cells": 10, "active_area": 0.1, "stacks": 1001)"), "$.stack.stacks",
                        "above the upper limit 1000");
    expect_config_error(stack(R"("cells": 10, "active_area": 0)"), "$.stack.active_area", "below the lower limit 1e-06 m2");
    expect_config_error(stack(R"("cells": 10, "active_area": -0.1)"), "$.stack.active_area", "below the lower limit");
    expect_config_error(stack(R"("cells": 10, "active_area": 5e-324)"), "$.stack.active_area", "below the lower limit");
    expect_config_error(stack(R"("cells": 10, "active_area": 1e400)"), "$.stack.active_area", "not a finite number");
    expect_config_error(pem_with(R"("plant": { "limits": { "min_load_fraction": 1.5 } })"),
                        "$.plant.limits.min_load_fraction", "1.5 is above the upper limit 1");
    expect_config_error(pem_with(R"("plant": { "auxiliaries": { "proportional": "-1 %" } })"),
                        "$.plant.auxiliaries.proportional", "below the lower limit 0");
    expect_config_error(pem_with(R"("plant": { "rectifier": { "loss_quadratic": 2 } })"),
                        "$.plant.rectifier.loss_quadratic", "above the upper limit 1");
    expect_config_error(pem_with(R"("plant": { "alarms": { "h2_in_o2_warning": 0 } })"),
                        "$.plant.alarms.h2_in_o2_warning", "must be above 0");
    expect_config_error(pem_with(R"("plant": { "degradation": { "voltage_rate": "-1 uV/h" } })"),
                        "$.plant.degradation.voltage_rate", "below the lower limit 0 V/h");
    expect_config_error(pem_with(R"("plant": { "thermal": { "feed_temperature": "-10 degC" } })"),
                        "$.plant.thermal.feed_temperature", "below the lower limit 273.15 K");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
        "operating": { "spec": "current_density", "temperature": -5 } })",
                        "$.operating.temperature", "-5 K must be above 0 K");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
        "operating": { "spec": "current_density", "pressure_anode": "0 bar" } })",
                        "$.operating.pressure_anode", "must be above 0 Pa");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
        "operating": { "spec": "current_density", "current": "-1 A" } })",
                        "$.operating.current", "below the lower limit 0 A");
}

TEST(Config, OperatingPointOutsideTheCellEnvelope) {
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
        "operating": { "spec": "current_density", "temperature": 5000 } })",
                        "$.operating.temperature", "above the highest value");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
        "operating": { "spec": "current_density", "pressure_cathode": "1e6 bar" } })",
                        "$.operating.pressure_cathode", "of the pem cell model");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
        "operating": { "spec": "current_density", "current_density": "1000 A/cm2" } })",
                        "$.operating.current_density", "above the highest value");
}

TEST(Config, CellParameterLimitsCarryThePath) {
    // Data-driven: the first parameter with a finite upper limit, set above it.
    for (const auto& t : technologies()) {
        if (!t.parameters) continue;
        SCOPED_TRACE(t.name);
        for (const auto& p : cell_parameters(t)) {
            if (!std::isfinite(p.max)) continue;
            const double too_big = p.max + std::max(1.0, std::fabs(p.max));
            const std::string json = R"({ "technology": ")" + std::string(t.name) + "\", " + kMinimalTail +
                                     fmt::format(R"(, "cell": {{ "{}": {:.17g} }} }})", p.key, too_big);
            expect_config_error(json, std::string("$.cell.") + p.key, "above the limit");
            break;
        }
    }
}

TEST(Config, AlarmOrder) {
    expect_config_error(pem_with(R"("plant": { "alarms": { "h2_in_o2_warning": 0.02, "h2_in_o2_trip": 0.02 } })"),
                        "$.plant.alarms", "h2_in_o2_warning 0.02 must be below h2_in_o2_trip 0.02");
    expect_config_error(pem_with(R"("plant": { "alarms": { "h2_in_o2_warning": 0.03 } })"), "$.plant.alarms",
                        "must be below h2_in_o2_trip");
    expect_config_error(pem_with(R"("plant": { "alarms": { "h2_in_o2_trip": 0.05 } })"), "$.plant.alarms",
                        "h2_in_o2_trip 0.05 must be below lower_flammability_limit 0.04");
    EXPECT_NO_THROW(parse_config(pem_with(R"("plant": { "alarms": { "h2_in_o2_warning": "0.5 %",
        "h2_in_o2_trip": "1 %", "lower_flammability_limit": "4 %" } })")));
}

TEST(Config, MissingRequiredKeys) {
    expect_config_error(R"({ "stack": { "cells": 100, "active_area": 0.1 }, "operating": { "spec": "current_density" } })",
                        "$", "missing required key 'technology'");
    expect_config_error(R"({ "technology": "pem", "operating": { "spec": "current_density" } })", "$",
                        "missing required key 'stack'");
    expect_config_error(R"({ "technology": "pem", "stack": { "active_area": 0.1 }, "operating": { "spec": "current_density" } })",
                        "$.stack", "missing required key 'cells'");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100 }, "operating": { "spec": "current_density" } })",
                        "$.stack", "missing required key 'active_area'");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 } })", "$",
                        "missing required key 'operating'");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 }, "operating": {} })",
                        "$.operating", "missing required key 'spec'");
    expect_config_error(minimal("custom"), "$", "missing required key 'reactions'");
}

TEST(Config, BadChoices) {
    expect_config_error(minimal("pemx"), "$.technology",
                        "'pemx' is not a technology; known: pem, alkaline, solid_oxide, brine, custom");
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
        "operating": { "spec": "amps" } })",
                        "$.operating.spec", "'amps' is not a spec; known: current_density, current, power");
}

TEST(Config, MalformedJsonGivesLineAndColumn) {
    expect_config_error("{ \"technology\": \"pem\",\n  \"stack\": { \"cells\": 100,, \"active_area\": 0.1 } }",
                        "$.stack", "malformed JSON at line 2, column 27: syntax error");
    expect_config_error("{ \"technology\": \"pem\"", "$", "malformed JSON at line 1, column 22");
    expect_config_error("", "$", "malformed JSON at line 1, column 1");
    expect_config_error("{}\n x", "$", "malformed JSON at line 2, column 2: text after the end of the document");
    expect_config_error("{ \"a\": [1, 2, x] }", "$.a[2]", "malformed JSON at line 1, column 15");
}

TEST(Config, DuplicateKeys) {
    expect_config_error(R"({ "technology": "pem", "stack": { "cells": 100, "cells": 200, "active_area": 0.1 } })", "$.stack",
                        "duplicate key 'cells'");
    expect_config_error(R"({ "technology": "pem", "technology": "pem" })", "$", "duplicate key 'technology'");
}

TEST(Config, ReactionsAndTechnology) {
    expect_config_error(pem_with(kWaterReactions), "$.reactions", "only a technology built from a reaction table");
    std::string json = custom_minimal();
    json.replace(json.find("[ { \"name\": \"oxygen"), 0, "[], \"x\": ");
    expect_config_error(json, "$.reactions", "unknown key 'x'");
    json = R"({ "technology": "custom", )" + std::string(kMinimalTail) +
           R"(, "reactions": { "anode": [], "cathode": [] } })";
    expect_config_error(json, "$.reactions.anode", "needs at least one reaction");
    json = R"({ "technology": "custom", )" + std::string(kMinimalTail) + R"(, "reactions": { "anode": {} } })";
    expect_config_error(json, "$.reactions.anode", "expected an array, got an object");
    // At most kMaxReactions per electrode (the cell's share list has a fixed capacity).
    std::string nine;
    for (int k = 0; k < 9; ++k)
        nine += fmt::format(R"({}{{ "name": "r{}", "product": "X", "standard_potential": 0 }})", k ? "," : "", k);
    json = R"({ "technology": "custom", )" + std::string(kMinimalTail) + R"(, "reactions": { "anode": [)" + nine +
           R"(], "cathode": [] } })";
    expect_config_error(json, "$.reactions.anode", "at most 8 per electrode");
    json = R"({ "technology": "custom", )" + std::string(kMinimalTail) +
           R"(, "reactions": { "anode": [ { "name": "x", "product": "O2" } ], "cathode": [] } })";
    expect_config_error(json, "$.reactions.anode[0]", "missing key 'standard_potential'");
    json = custom_minimal();
    json.replace(json.find("\"electrons\": 4"), 14, "\"electrons\": 0");
    expect_config_error(json, "$.reactions.anode[0].electrons", "below the lower limit 1");
    json = custom_minimal();
    json.replace(json.find("\"exchange_current_density\": 10"), 30, "\"exchange_current_density\": -1");
    expect_config_error(json, "$.reactions.cathode[0].exchange_current_density", "must be above 0 A/m2");
    expect_config_error(custom_minimal(R"("cell": { "temperature_min": 400, "temperature_max": 350 })"), "$.cell",
                        "temperature_min 400 K must be below temperature_max 350 K");
}

// Zinc electrowinning written with species: Zn2+(aq) + 2 e- -> Zn(s) against O2 + 4 H+ + 4 e- -> 2 H2O(l), rows of
// the bundled table (NBS 1982 ions, CODATA water, JANAF zinc), and a row the config adds.
const char* kSpeciesReactions = R"json("reactions": {
    "species": [ { "name": "Zn+2", "phase": "melt", "molar_mass": "65.38 g/mol", "charge": 2,
                   "formation_enthalpy": "-153.89 kJ/mol", "entropy": "-112.1 J/(mol K)", "cp_a": 46,
                   "temperature_min": 273.15, "temperature_max": 373.15, "source": "invented test row" } ],
    "anode": [ { "name": "oxygen evolution", "product": "O2", "electrons": 4,
                 "species": [ { "species": "O2", "phase": "gas", "coefficient": -1 },
                              { "species": "H+", "phase": "aqueous", "coefficient": -4 },
                              { "species": "H2O", "phase": "liquid", "coefficient": 2 } ],
                 "exchange_current_density": 1e-3, "activation_energy": 60e3 } ],
    "cathode": [ { "name": "zinc deposition", "product": "Zn", "electrons": 2,
                   "species": [ { "species": "Zn+2", "phase": "aqueous", "coefficient": -1 },
                                { "species": "Zn", "phase": "solid", "coefficient": 1 } ],
                   "exchange_current_density": 10, "activation_energy": 30e3 } ] })json";

TEST(Config, ReactionSpeciesFromTheTableAndTheConfig) {
    const auto swapped = [](std::string text, const std::string& from, const std::string& to) {
        return text.replace(text.find(from), from.size(), to);
    };
    const std::string json = std::string(R"({ "technology": "custom", )") + kMinimalTail + ", " + kSpeciesReactions + " }";
    const PlantDesign d = parse_config(json);
    ASSERT_TRUE(d.custom);
    const auto& oxygen = d.custom->anode[0].species;
    ASSERT_EQ(oxygen.size(), 3u);
    EXPECT_EQ(oxygen[1].species.name, "H+");
    EXPECT_EQ(oxygen[1].coefficient, -4.0);
    const auto& zinc = d.custom->cathode[0].species;
    EXPECT_EQ(zinc[0].species.phase, Phase::aqueous);  // the bundled aqueous row, not the config's melt row
    EXPECT_EQ(zinc[0].species.formation_enthalpy, species_record("Zn+2", Phase::aqueous).formation_enthalpy);
    // The product's molar mass follows from its species (IUPAC 65.38 g/mol).
    const auto r = d.cell->evaluate({400.0, 298.15, 1e5, 1e5});
    EXPECT_NEAR(r.thermoneutral_voltage, 2.27869, 2e-5);  // ΔH from NBS/CODATA by hand (test_custom.cpp)
    // A config row is used where a reaction names it.
    std::string own = json;
    own = swapped(own, R"("species": "Zn+2", "phase": "aqueous")", R"("species": "Zn+2", "phase": "melt")");
    EXPECT_EQ(parse_config(own).custom->cathode[0].species[0].species.source, "invented test row");
    // Errors name the path.
    std::string bad = json;
    bad = swapped(bad, R"("species": "Zn", "phase": "solid")", R"("species": "Zq", "phase": "solid")");
    expect_config_error(bad, "$.reactions.cathode[0].species[1].species", "species 'Zq' (solid) is not in the species table");
    bad = json;
    bad = swapped(bad, R"("phase": "solid")", R"("phase": "plasma")");
    expect_config_error(bad, "$.reactions.cathode[0].species[1].phase", "'plasma' is not a phase");
    bad = json;
    bad = swapped(bad, R"("product": "Zn", "electrons": 2,)", R"("product": "Zn", "electrons": 2, "standard_potential": -0.76,)");
    expect_config_error(bad, "$.reactions.cathode[0].standard_potential", "not both");
    bad = json;
    bad = swapped(bad, R"("source": "invented test row")", R"("sauce": 1)");
    expect_config_error(bad, "$.reactions.species[0]", "unknown key 'sauce'");
    bad = json;
    bad = swapped(bad, R"("name": "Zn+2", "phase": "melt")", R"("name": "Zn+2", "phase": "aqueous")");
    expect_config_error(bad, "$.reactions.species[0].name", "is in the bundled table already");
    bad = json;
    bad = swapped(bad, R"("temperature_max": 373.15)", R"("temperature_max": 200)");
    expect_config_error(bad, "$.reactions.species[0]", "highest temperature");
    // Charges that do not balance the electrons are refused by the cell, with the reaction named.
    bad = json;
    bad = swapped(bad, R"("product": "Zn", "electrons": 2)", R"("product": "Zn", "electrons": 1)");
    expect_config_error(bad, "$.reactions", "charges must sum to -1");
    // A table without enthalpy data (no species, not water splitting) needs its thermoneutral voltage.
    const std::string bare = std::string(R"({ "technology": "custom", )") + kMinimalTail + R"(, "reactions": {
        "anode": [ { "name": "chlorine", "product": "Cl2", "standard_potential": 1.358, "activation_energy": 3e4 } ],
        "cathode": [ { "name": "zinc", "product": "Zn", "standard_potential": -0.762, "activation_energy": 3e4 } ] })";
    expect_config_error(bare + " }", "$.reactions", "give every reaction its species, or the thermoneutral voltage");
    EXPECT_NO_THROW(parse_config(bare + R"(, "cell": { "thermoneutral_voltage": 2.3 } })"));
    // With species everywhere, a thermoneutral voltage given as well is refused (two sources of one heat).
    const std::string both = std::string(R"({ "technology": "custom", )") + kMinimalTail + ", " + kSpeciesReactions +
                             R"(, "cell": { "thermoneutral_voltage": 2.2 } })";
    expect_config_error(both, "$.reactions", "do not give it as well");
}

TEST(Config, LoadFile) {
    const std::string missing = ::testing::TempDir() + "elyblock_no_such_config.json";
    std::remove(missing.c_str());
    auto m = error_of([&] { load_config_file(missing); }, ErrorKind::io);
    EXPECT_THAT(m, HasSubstr(missing));

    const std::string good = ::testing::TempDir() + "elyblock_config_good.json";
    std::ofstream(good) << minimal("pem");
    EXPECT_EQ(load_config_file(good).cells(), 100);

    const std::string bad = ::testing::TempDir() + "elyblock_config_bad.json";
    std::ofstream(bad) << R"({ "technology": "pem", "stack": { "cells": 2.5, "active_area": 0.1 }, "operating": { "spec": "current" } })";
    m = error_of([&] { load_config_file(bad); }, ErrorKind::config);
    EXPECT_THAT(m, StartsWith(bad + ": $.stack.cells: expected an integer"));
    std::remove(good.c_str());
    std::remove(bad.c_str());

    m = error_of([&] { load_config_file(::testing::TempDir()); }, ErrorKind::io);
    EXPECT_THAT(m, HasSubstr("directory"));
}

TEST(Config, SchemaDocumentsEveryKey) {
    const std::string md = config_schema_markdown();
    for (const char* key : {"technology", "name", "stack", "cells", "active_area", "stacks", "cell", "plant", "rectifier",
                            "rated_power", "loss_no_load", "loss_linear", "loss_quadratic", "auxiliaries", "fixed",
                            "proportional", "limits", "current_density_max", "min_load_fraction", "temperature_max",
                            "alarms", "h2_in_o2_warning", "h2_in_o2_trip", "lower_flammability_limit", "degradation",
                            "voltage_rate", "resistance_rate", "thermal", "feed_temperature", "heat_loss_coefficient",
                            "ambient_temperature", "drag_water_returned", "operating", "spec", "current_density",
                            "current", "power", "hydrogen_rate", "voltage", "temperature", "pressure_cathode",
                            "pressure_anode", "hours_operated", "reactions", "standard_potential",
                            "exchange_current_density", "limiting_current_density", "area_specific_resistance"}) {
        EXPECT_THAT(md, HasSubstr(std::string("`") + key + "`")) << key;
    }
    for (const auto& t : technologies()) {
        if (!t.parameters) continue;
        for (const auto& p : cell_parameters(t)) EXPECT_THAT(md, HasSubstr(std::string("`") + p.key + "`")) << p.key;
    }
    EXPECT_THAT(md, HasSubstr("`degC`"));
}
