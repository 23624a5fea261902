// The run summary: what a dynamic run made and used since its reset, as JSON. One table of figures
// (name, SI unit, label, display unit) that every host shows the same way: the command line's
// summary, the spreadsheet functions, Python (docs/dynamics.md, "Run summary").
#include <boost/json.hpp>
#include <cmath>
#include <fmt/format.h>
#include <vector>

#include "base/error.hpp"
#include "unit/block.hpp"

namespace ely {

namespace {

struct Figure {
    const char* name;
    const char* unit;
    const char* label;
    const char* display_unit;  // nullptr: the SI unit
    double display_scale;
    double value;
};

constexpr double kHour = 3600.0, kMWh = 3.6e9, kYear = 365.25 * 86400.0;  // s, J, s (Julian year)
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

std::string quoted(std::string_view text) { return boost::json::serialize(boost::json::string(text)); }
std::string number(double x) { return std::isfinite(x) ? fmt::format("{}", x) : "null"; }

}  // namespace

std::string Block::run_summary_json() const {
    if (!running()) throw Error(ErrorKind::wrong_state, "no run summary: the block has not been reset");
    const RunState& s = run_;
    const RunTotals& t = s.totals;
    const double duration = s.time - s.start_time;
    const double h2 = s.y[rc_hydrogen], e_dc = s.y[rc_energy_dc], e_ac = s.y[rc_energy_ac];
    const bool makes_h2 = design_.technology->has(kMakesHydrogen), brine = design_.technology->has(kBrineProducts);
    const double per_kg = 1.0 / 3.6e6;  // J/kg → kWh/kg
    const auto hours = [](double seconds) { return seconds / kHour; };
    const auto alarm = [&](Var a) { return static_cast<std::size_t>(a - alarm_first); };

    // Degradation at rated current density, and where the cell voltage there reaches the limit.
    const double j_rated = rated_current_density();
    const double per_hour = v_[par_degradation_voltage_rate] + v_[par_degradation_resistance_rate] * j_rated;  // V/h
    const double limit = v_[par_degradation_voltage_limit];
    double replacement_hours = kNaN, replacement_after = kNaN;
    if (limit > 0 && per_hour > 0 && std::isfinite(s.rated_voltage_new)) {
        replacement_hours = std::max(0.0, (limit - s.rated_voltage_new) / per_hour);
        const double operating_share = duration > 0 ? t.seconds_operating / duration : 0.0;
        if (operating_share > 0)
            replacement_after = std::max(0.0, replacement_hours - s.hours) * kHour / operating_share;
    }
    const double thermal_balance = v_[par_heat_capacity] * (s.y[rc_temperature] - s.temperature_at_start) -
                                   (s.y[rc_heat_released] - s.y[rc_heat_to_coolant] - s.y[rc_heat_loss]);

    std::vector<Figure> f = {
        {"duration", "s", "duration", "h", 1 / kHour, duration},
    };
    if (makes_h2) f.push_back({"hydrogen", "kg", "hydrogen made", "t", 1e-3, h2});
    if (brine) f.push_back({"chlorine", "kg", "chlorine made", "t", 1e-3, s.y[rc_chlorine]});
    f.push_back({"water", "kg", "make-up water", "t", 1e-3, s.y[rc_water]});
    f.push_back({"energy_dc", "J", "DC energy (stacks)", "MWh", 1 / kMWh, e_dc});
    f.push_back({"energy_ac", "J", "AC energy (plant: rectifier, auxiliaries, heater)", "MWh", 1 / kMWh, e_ac});
    if (makes_h2) {
        f.push_back({"specific_energy_dc", "J/kg", "specific energy, DC", "kWh/kg", per_kg, h2 > 0 ? e_dc / h2 : kNaN});
        f.push_back({"specific_energy_ac", "J/kg", "specific energy, AC", "kWh/kg", per_kg, h2 > 0 ? e_ac / h2 : kNaN});
    }
    if (brine && s.y[rc_chlorine] > 0)
        f.push_back({"specific_energy_chlorine", "J/kg", "DC energy per tonne of chlorine", "kWh/t", 1e3 / 3.6e6,
                     e_dc / s.y[rc_chlorine]});
    const std::vector<Figure> rest = {
        {"full_load_hours", "h", "full-load hours (DC energy / rated DC power)", nullptr, 1,
         hours(e_dc / std::max(rectifier_rated_power_, 1e-300))},
        {"operating_hours", "h", "hours with current", nullptr, 1, hours(t.seconds_operating)},
        {"hours_production", "h", "hours in production", nullptr, 1, hours(t.seconds_in_mode[2])},
        {"hours_standby", "h", "hours in hot standby", nullptr, 1, hours(t.seconds_in_mode[1])},
        {"hours_off", "h", "hours off", nullptr, 1, hours(t.seconds_in_mode[0])},
        {"hours_starting_cold", "h", "hours starting from cold", nullptr, 1, hours(t.seconds_in_mode[3])},
        {"hours_starting_warm", "h", "hours starting from hot standby", nullptr, 1, hours(t.seconds_in_mode[4])},
        {"starts", "1", "start-ups", nullptr, 1, t.starts_cold + t.starts_warm},
        {"starts_cold", "1", "start-ups from cold", nullptr, 1, t.starts_cold},
        {"starts_warm", "1", "start-ups from hot standby", nullptr, 1, t.starts_warm},
        {"hours_at_minimum_load", "h", "hours held at minimum load (setpoint below it)", nullptr, 1,
         hours(t.seconds_at_minimum_load)},
        {"hours_h2_in_o2_warning", "h", "hours with H2 in the anode gas at the warning level", nullptr, 1,
         hours(t.seconds_alarm[alarm(alarm_h2_in_o2_warning)])},
        {"hours_h2_in_o2_trip", "h", "hours with H2 in the anode gas at the trip level", nullptr, 1,
         hours(t.seconds_alarm[alarm(alarm_h2_in_o2_trip)])},
        {"alarms_h2_in_o2_warning", "1", "H2-in-O2 warnings raised", nullptr, 1,
         t.alarm_onsets[alarm(alarm_h2_in_o2_warning)]},
        {"alarms_h2_in_o2_trip", "1", "H2-in-O2 trips raised", nullptr, 1, t.alarm_onsets[alarm(alarm_h2_in_o2_trip)]},
        {"first_trip_time", "s", "first H2-in-O2 trip (time)", "h", 1 / kHour, t.first_trip_time},
        {"hours_temperature_high", "h", "hours above the temperature limit", nullptr, 1,
         hours(t.seconds_alarm[alarm(alarm_temperature_high)])},
        {"heat_released", "J", "heat released (stacks and heater)", "MWh", 1 / kMWh, s.y[rc_heat_released]},
        {"heat_to_coolant", "J", "heat to coolant", "MWh", 1 / kMWh, s.y[rc_heat_to_coolant]},
        {"heat_loss", "J", "heat lost to ambient", "MWh", 1 / kMWh, s.y[rc_heat_loss]},
        {"thermal_balance", "J", "heat capacity x temperature change - net heat (a check: zero)", "MWh",
         1 / kMWh, thermal_balance},
        {"temperature_start", "K", "stack temperature at the start", "degC", 1, s.temperature_at_start},
        {"temperature_end", "K", "stack temperature at the end", "degC", 1, s.y[rc_temperature]},
        {"hours_operated_end", "h", "operating hours at the end", nullptr, 1, s.hours},
        {"degradation_end", "V", "cell-voltage rise by ageing at rated current density, at the end", "mV", 1e3,
         per_hour * s.hours},
        {"replacement_hours", "h", "operating hours when the cell voltage at rated current reaches the limit",
         nullptr, 1, replacement_hours},
        {"replacement_after", "s", "time from the end of the run to the stack replacement, at this run's share of "
         "operating hours", "year", 1 / kYear, replacement_after},
    };
    f.insert(f.end(), rest.begin(), rest.end());

    std::string out = fmt::format("{{\"technology\":{},\"name\":{},\"start_time\":{},\"end_time\":{},\"figures\":{{",
                                  quoted(design_.technology->name), quoted(design_.name), number(s.start_time),
                                  number(s.time));
    for (std::size_t k = 0; k < f.size(); ++k) {
        const Figure& x = f[k];
        // Temperatures shown in degC: display = K - 273.15.
        const bool celsius = std::string_view(x.unit) == "K";
        out += fmt::format("{}{}:{{\"value\":{},\"unit\":{},\"label\":{},\"display_unit\":{},\"display_scale\":{},"
                           "\"display_offset\":{}}}",
                           k ? "," : "", quoted(x.name), number(x.value), quoted(x.unit), quoted(x.label),
                           quoted(x.display_unit ? x.display_unit : x.unit), number(x.display_scale),
                           number(celsius ? -273.15 : 0.0));
    }
    out += "}}";
    return out;
}

}  // namespace ely
