// elyblock sweep: one input varied over a range (a polarization curve, a temperature or pressure
// series), as CSV; alarms and failed points are summarised once on standard error after the data.
#include <CLI/CLI.hpp>
#include <elyblock/elyblock.h>

#include <algorithm>
#include <cstdio>
#include <cstring>
#include <memory>
#include <vector>

#include "command.hpp"
#include "csv.hpp"
#include "errors.hpp"
#include "output.hpp"
#include "plant.hpp"
#include "python_plot.hpp"
#include "quantities.hpp"
#include "summary.hpp"

namespace elycli {
namespace {

struct SweepOptions {
    PlantOptions plant;
    std::string over, from, to, output, units;
    int points = 21;
    std::vector<std::string> columns, plots;
};

// What --plot draws (the Python package's VOLTAGE_OUTPUTS, elyblock/plots.py): the cell voltage and
// its parts, after the columns and the alarms.
const char* const kVoltageParts[] = {"cell.reversible_voltage", "cell.activation_anode", "cell.activation_cathode",
                                     "cell.ohmic", "cell.degradation", "cell.concentration", "cell.voltage"};

// The columns when none are given: the variables of the technology's summary layout (what
// `solve` shows), in its order, without the alarms (they are summarised after the sweep).
std::vector<const Variable*> summary_columns(const Block& block, const Variable& over) {
    std::vector<const Variable*> out;
    for (const Variable* v : summary_variables(block))
        if (v->index != over.index && !is_alarm(*v)) out.push_back(v);
    return out;
}

// The alarms, each 0 or 1 at every point; alarm.any only repeats them.
std::vector<const Variable*> alarm_columns(const Block& block) {
    std::vector<const Variable*> out;
    for (const auto& v : block.variables())
        if (is_alarm(v) && std::strcmp(v.info.name, "alarm.any") != 0) out.push_back(&v);
    return out;
}

std::string shown_text(const Variable& v, double si_value) {
    const Shown s = shown(v.info, si_value, Units::engineering);
    return std::strcmp(s.unit, "1") == 0 ? fmt::format("{:.6g}", s.value) : fmt::format("{:.6g} {}", s.value, s.unit);
}

// Why the first failed point failed, in the library's words: solved again on its own.
std::string failure_reason(const Block& block, const Variable& over, double value, int32_t batch_status) {
    ely_block* copy = nullptr;
    std::string reason = ely_status_text(batch_status);
    if (ely_block_clone(block.handle(), &copy) != ELY_OK) return reason;
    int32_t s = ely_block_set(copy, over.index, value);
    if (s >= 0) s = ely_block_solve(copy);
    if (s < 0) reason = last_error();
    ely_block_destroy(copy);
    return reason;
}

int run(const SweepOptions& o) {
    const Units units = o.units == "engineering" ? Units::engineering : Units::si;
    const auto block = open_plant(o.plant, "sweep", {"--over", o.over});
    const Variable& over = *block->find(o.over);
    const double from = read_quantity(o.from, over.info.unit, "--from");
    const double to = read_quantity(o.to, over.info.unit, "--to");

    std::vector<const Variable*> columns{&over};
    if (o.columns.empty()) {
        const auto rest = summary_columns(*block, over);
        columns.insert(columns.end(), rest.begin(), rest.end());
    } else {
        for (const auto& name : o.columns) columns.push_back(&variable_named(*block, name, "--columns"));
    }
    const std::vector<const Variable*> alarms = alarm_columns(*block);
    std::vector<int32_t> wanted;
    for (std::size_t c = 1; c < columns.size(); ++c) wanted.push_back(columns[c]->index);
    for (const Variable* a : alarms) wanted.push_back(a->index);
    check_plot_files(o.plots, "--plot");
    std::vector<const Variable*> plotted;
    if (!o.plots.empty())
        for (const char* name : kVoltageParts) plotted.push_back(&variable_named(*block, name, "--plot"));
    const std::size_t plot_first = wanted.size();
    for (const Variable* v : plotted) wanted.push_back(v->index);

    const auto n = static_cast<std::size_t>(o.points);
    const std::size_t width = wanted.size();
    std::vector<double> in(n), values(n * width);
    std::vector<int32_t> status(n);
    for (std::size_t k = 0; k < n; ++k)
        in[k] = k + 1 == n ? to : from + (to - from) * static_cast<double>(k) / static_cast<double>(n - 1);
    check(ely_block_solve_batch(block->handle(), n, 1, &over.index, in.data(), static_cast<int32_t>(width),
                                wanted.data(), values.data(), status.data(), nullptr, nullptr),
          "sweep");

    {
        std::unique_ptr<Output> out = o.output.empty() ? std::make_unique<Output>()
                                                       : std::make_unique<Output>(o.output, "--output");
        CsvTable table(*out, units);
        table.header(columns, "status");
        std::vector<double> row(columns.size());
        for (std::size_t k = 0; k < n; ++k) {
            row[0] = in[k];
            std::copy_n(values.begin() + static_cast<std::ptrdiff_t>(k * width), columns.size() - 1, row.begin() + 1);
            table.row(columns, row.data(), ely_status_text(status[k]));
        }
        out->close();
    }

    // --plot: the solved points' voltage breakdown in SI, drawn by the Python package.
    if (!o.plots.empty()) {
        TempFile data("elyblock-sweep");
        {
            Output out(data.path, "--plot");
            std::string line = fmt::format("{} [{}]", over.info.name, over.info.unit);
            for (const Variable* v : plotted) line += fmt::format(",{} [{}]", v->info.name, v->info.unit);
            out.write(line + "\n");
            for (std::size_t k = 0; k < n; ++k) {
                if (status[k] < 0) continue;
                line = fmt::format("{}", in[k]);
                for (std::size_t c = 0; c < plotted.size(); ++c) line += fmt::format(",{}", values[k * width + plot_first + c]);
                out.write(line + "\n");
            }
            out.close();
        }
        plot_with_python("sweep", "sweep", data.path, o.plots, {});
        for (const auto& f : o.plots) note("sweep", "wrote " + f);
    }

    // After the data, once: which alarms were raised where, and how many points failed.
    const auto count = [&](auto pred) { return std::count_if(status.begin(), status.end(), pred); };
    const auto warned = count([](int32_t s) { return s > 0; });
    if (warned > 0) {
        note("sweep", fmt::format("{} of {} points solved with alarms:", warned, n));
        for (std::size_t a = 0; a < alarms.size(); ++a) {
            std::size_t raised = 0;
            double lo = 0, hi = 0;
            for (std::size_t k = 0; k < n; ++k) {
                if (status[k] < 0 || !(values[k * width + (columns.size() - 1) + a] > 0)) continue;
                lo = raised == 0 ? in[k] : std::min(lo, in[k]);
                hi = raised == 0 ? in[k] : std::max(hi, in[k]);
                ++raised;
            }
            if (raised == 0) continue;
            const std::string where = raised == 1 ? fmt::format("at {} = {}", over.info.name, shown_text(over, lo))
                                                  : fmt::format("{} points, {} {} to {}", raised, over.info.name,
                                                                shown_text(over, lo), shown_text(over, hi));
            std::fprintf(stderr, "  %s: %s\n", alarms[a]->info.label, where.c_str());
        }
    }
    const auto failed = count([](int32_t s) { return s < 0; });
    if (failed > 0) {
        const auto first = static_cast<std::size_t>(
            std::find_if(status.begin(), status.end(), [](int32_t s) { return s < 0; }) - status.begin());
        note("sweep", fmt::format("{} of {} points failed (the status column names each failure); the first, at {} = {}: {}",
                                  failed, n, over.info.name, shown_text(over, in[first]),
                                  failure_reason(*block, over, in[first], status[first])));
        return kExitFailure;
    }
    return kExitOk;
}

}  // namespace

Command command_sweep() {
    return {"sweep", "vary one input over a range (a polarization curve, ...) and write CSV",
            [](CLI::App& sub) -> std::function<int()> {
                auto o = std::make_shared<SweepOptions>();
                add_plant_options(sub, o->plant);
                sub.add_option("--over", o->over, "the input to vary, e.g. in.current_density, in.temperature")
                    ->required()
                    ->type_name("NAME");
                sub.add_option("--from", o->from, "first value: \"0.1 A/cm2\", or a number in the input's SI unit")
                    ->required()
                    ->type_name("QUANTITY");
                sub.add_option("--to", o->to, "last value, as --from")->required()->type_name("QUANTITY");
                sub.add_option("--points", o->points, "number of points, evenly spaced (default 21)")
                    ->check(CLI::Range(2, 1000000));
                sub.add_option("--columns", o->columns,
                               "variables to write after the input, comma-separated (default: those of the "
                               "technology's summary)")
                    ->delimiter(',')
                    ->type_name("NAME,...");
                sub.add_option("--output", o->output, "write the CSV to this file instead of standard output")
                    ->type_name("FILE");
                sub.add_option("--units", o->units,
                               "si (default) or engineering (the variable table's display units: A/cm2, degC, bar, "
                               "kg/h, kWh/kg, ...)")
                    ->check(CLI::IsMember({"si", "engineering"}));
                sub.add_option("--plot", o->plots,
                               "draw the cell voltage and its parts (stacked) against the swept input to this file "
                               "(.png, .svg or .pdf; may be repeated; over in.current_density: the polarization "
                               "curve), by the elyblock Python package (python3 with matplotlib)")
                    ->type_name("FILE");
                sub.footer(
                    "Examples:\n"
                    "  elyblock sweep plant.json --over in.current_density --from \"0.1 A/cm2\" --to \"2.5 A/cm2\" "
                    "--points 25\n"
                    "  elyblock sweep plant.json --over in.temperature --from \"50 degC\" --to \"80 degC\" "
                    "--columns cell.voltage,perf.specific_energy --units engineering --output t.csv\n"
                    "Sweeping the drive input of another spec (e.g. in.power) selects that spec unless --spec is given.\n"
                    "Alarms are summarised on standard error after the data. Exit status: 0 every point solved,\n"
                    "1 some point failed (its row says why) or the model or the output failed, 2 usage.");
                return [o] { return run(*o); };
            }};
}

}  // namespace elycli
