// Alarms: each is a variable of the table (alarm_first .. alarm_last), whose label is the text
// the solve reports when it is raised; alarm.any summarises them.
#include <string>

#include "unit/point_result.hpp"

namespace ely {

void Block::fill_alarms(const PointResult& r) {
    const auto& c = r.cell;
    const double j_rated = v_[par_current_density_max];
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
    std::string m = "solved with alarms:";
    for (int a = alarm_first; a <= alarm_last; ++a) {
        if (!(v_[static_cast<std::size_t>(a)] > 0)) continue;
        // The trip level implies the warning level: name the trip only.
        if (a == alarm_h2_in_o2_warning && v_[alarm_h2_in_o2_trip] > 0) continue;
        m += std::string(" ") + variable_info(static_cast<Var>(a)).label + ";";
    }
    return m;
}

}  // namespace ely
