#include "summary.hpp"

#include <algorithm>
#include <cmath>
#include <cstring>
#include <utility>
#include <vector>

#include "quantities.hpp"

namespace elycli {

const char* const kCautions =
    "CAUTION: electrolyzers handle hydrogen/oxygen mixtures (flammable from about 4 % H2),\n"
    "DC currents of thousands of amperes, hot caustic electrolytes, chlorine and hot stacks.\n"
    "These are model estimates for study work; design, operation, alarms and trips follow\n"
    "local codes, standards and licensed engineering practice.\n";

bool is_alarm(const Variable& v) { return std::strncmp(v.info.name, "alarm.", 6) == 0; }

std::vector<const Variable*> summary_variables(const Block& block) {
    std::vector<const Variable*> rows;
    for (const auto& v : block.variables())
        if (v.info.summary_rank > 0) rows.push_back(&v);
    std::sort(rows.begin(), rows.end(),
              [](const Variable* a, const Variable* b) { return a->info.summary_rank < b->info.summary_rank; });
    return rows;
}

void write_summary(const Block& block, Output& out, const std::string& warning) {
    const std::vector<const Variable*> rows = summary_variables(block);
    std::string group;
    bool alarms_open = false, any_alarm = false;
    const auto close_alarms = [&] {
        if (alarms_open && !any_alarm) out.write("  none\n");
        alarms_open = false;
    };
    for (const Variable* v : rows) {
        if (group != v->info.summary_group) {
            close_alarms();
            group = v->info.summary_group;
            out.print("{}\n", group);
        }
        const double value = block.get(*v);
        if (is_alarm(*v)) {
            alarms_open = true;
            if (value > 0) {
                out.print("  RAISED  {} ({})\n", v->info.label, v->info.name);
                any_alarm = true;
            }
            continue;
        }
        if (!std::isfinite(value)) continue;
        const Shown s = shown(v->info, value, Units::engineering);
        out.print("  {:<44}{:>12.6g} {}\n", v->info.label, s.value, std::strcmp(s.unit, "1") == 0 ? "" : s.unit);
    }
    close_alarms();
    if (!warning.empty()) out.print("  ({})\n", warning);
    out.print("\n{}", kCautions);
}

}  // namespace elycli
