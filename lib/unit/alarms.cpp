// Alarms: each is a variable of the table (alarm_first .. alarm_last), whose label is the text
// the solve reports when it is raised; alarm.any summarises them.
#include <cstring>
#include <fmt/format.h>
#include <string>

#include "base/error.hpp"
#include "unit/point_result.hpp"

namespace ely {

void check_alarm_levels(double warning, double trip, double lower_flammability_limit) {
    const double levels[] = {warning, trip, lower_flammability_limit};
    for (int k = 0; k < 2; ++k) {
        if (levels[k] < levels[k + 1]) continue;
        const VariableInfo& low = variable_info(Var(par_alarms_h2_in_o2_warning + k));
        const VariableInfo& high = variable_info(Var(par_alarms_h2_in_o2_warning + k + 1));
        const auto key = [](const VariableInfo& v) { return std::strrchr(v.config_key, '.') + 1; };
        throw Error(ErrorKind::invalid_argument, fmt::format("{} {:g} must be below {} {:g} ({}, {})", key(low), levels[k],
                                                             key(high), levels[k + 1], low.name, high.name));
    }
}

void Block::fill_alarms(const PointResult& r) {
    const auto& c = r.cell;
    const double j_rated = v_[par_rated_current_density];
    const double t_max = v_[par_temperature_max];
    const auto flag = [](bool raised) { return raised ? 1.0 : 0.0; };
    v_[alarm_h2_in_o2_warning] = flag(c.h2_in_o2 >= v_[par_alarms_h2_in_o2_warning]);
    v_[alarm_h2_in_o2_trip] = flag(c.h2_in_o2 >= v_[par_alarms_h2_in_o2_trip]);
    v_[alarm_temperature_high] = flag(t_max > 0 && r.temperature > t_max);
    v_[alarm_current_density_high] = flag(c.current_density > j_rated * (1 + 1e-12));
    v_[alarm_load_low] = flag(c.current_density < v_[par_min_load_fraction] * j_rated);
    v_[alarm_extrapolated] = flag(c.warnings != 0);
    bool any = false;
    for (int a = alarm_first; a <= alarm_last; ++a) any |= v_[static_cast<std::size_t>(a)] > 0;
    v_[alarm_any] = flag(any);
}

std::string Block::alarm_message() const {
    // "solved with alarms: a; b" (the labels, separated, nothing after the last).
    std::string m = "solved with alarms:";
    const char* separator = " ";
    for (int a = alarm_first; a <= alarm_last; ++a) {
        if (!(v_[static_cast<std::size_t>(a)] > 0)) continue;
        // The trip level implies the warning level: name the trip only.
        if (a == alarm_h2_in_o2_warning && v_[alarm_h2_in_o2_trip] > 0) continue;
        m += separator;
        m += variable_info(static_cast<Var>(a)).label;
        separator = "; ";
    }
    return m;
}

}  // namespace ely
