// elyblock run: the plant over a profile in time through ely_block_simulate. The profile is CSV:
// a time column and input columns (a power, current or current-density column drives the plant;
// any other input, such as in.ambient_temperature or in.mode_request, may follow), each header
// naming the column and its unit, "time [h]", "power [MW]". Writes the time series as CSV and
// prints the run summary (ely_block_run_summary_json); a progress bar on a terminal.
#include <CLI/CLI.hpp>
#include <boost/json.hpp>
#include <elyblock/elyblock.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <fstream>
#include <memory>
#include <string>
#include <vector>

#include "command.hpp"
#include "csv.hpp"
#include "errors.hpp"
#include "plant.hpp"
#include "python_plot.hpp"
#include "quantities.hpp"

namespace elycli {
namespace {

struct RunOptions {
    PlantOptions plant;
    std::string profile, output, units;
    std::vector<std::string> columns, plots;
    bool no_progress = false;
};

// The columns a profile may name by a short word, and the input each stands for.
struct Alias {
    const char* word;
    const char* input;
};
constexpr Alias kAliases[] = {{"power", "in.power"}, {"current", "in.current"}, {"current_density", "in.current_density"}};

struct Profile {
    std::vector<double> times;           // s
    std::vector<const Variable*> inputs;  // the columns after the time
    std::vector<double> values;          // row-major, SI
    std::string time_unit;               // as the profile gives it
};

std::string trim(const std::string& s) {
    const auto b = s.find_first_not_of(" \t\r");
    const auto e = s.find_last_not_of(" \t\r");
    return b == std::string::npos ? std::string() : s.substr(b, e - b + 1);
}

std::vector<std::string> split(const std::string& line) {
    std::vector<std::string> out;
    std::size_t start = 0;
    for (;;) {
        const auto comma = line.find(',', start);
        out.push_back(trim(line.substr(start, comma == std::string::npos ? std::string::npos : comma - start)));
        if (comma == std::string::npos) return out;
        start = comma + 1;
    }
}

// "power [MW]" or "power (MW)" → name and unit ("" when none).
std::pair<std::string, std::string> name_and_unit(const std::string& header) {
    for (const auto& [open, close] : {std::pair{'[', ']'}, std::pair{'(', ')'}}) {
        const auto b = header.find(open);
        if (b != std::string::npos && header.back() == close)
            return {trim(header.substr(0, b)), trim(header.substr(b + 1, header.size() - b - 2))};
    }
    return {header, ""};
}

double convert(double value, const std::string& from, const char* to, const std::string& where) {
    if (from.empty() || from == to) return value;
    double out = 0;
    if (ely_convert_unit(value, from.c_str(), to, &out) < 0) throw Failure{where + ": " + last_error()};
    return out;
}

/// The header of a profile: the column names (aliases resolved to input names) and their units.
struct Header {
    std::vector<std::string> names, units, written;  // written: as the header gives them
    std::size_t line = 0;
};

Header read_header(std::istream& in, const std::string& path) {
    Header h;
    std::string line;
    while (std::getline(in, line)) {
        ++h.line;
        const std::string text = trim(line);
        if (text.empty() || text[0] == '#') continue;
        for (const auto& f : split(text)) {
            auto [name, unit] = name_and_unit(f);
            h.written.push_back(name);
            for (const Alias& a : kAliases)
                if (name == a.word) name = a.input;
            h.names.push_back(name);
            h.units.push_back(unit);
        }
        const std::string where = fmt::format("{} line {}", path, h.line);
        if (h.names[0] != "time" && h.names[0] != "t")
            throw Failure{fmt::format("{}: the first column is '{}'; it must be the time, e.g. \"time [h]\"", where,
                                      h.written[0])};
        if (h.names.size() < 2) throw Failure{where + ": no input column after the time"};
        return h;
    }
    throw Failure{fmt::format("the profile '{}' is empty", path)};
}

std::ifstream open_profile(const std::string& path) {
    std::ifstream in(path);
    if (!in) throw Failure{fmt::format("cannot read the profile '{}': {}", path, std::strerror(errno))};
    return in;
}

Profile read_profile(const std::string& path, const Block& block) {
    std::ifstream in = open_profile(path);
    const Header h = read_header(in, path);
    Profile p;
    std::size_t line_number = h.line;
    {
        const std::string where = fmt::format("{} line {}", path, line_number);
        p.time_unit = h.units[0].empty() ? "s" : h.units[0];
        convert(1.0, p.time_unit, "s", where + ", column time");  // a time unit
        for (std::size_t c = 1; c < h.names.size(); ++c) {
            const Variable* v = block.find(h.names[c]);
            if (!v || !v->is_input())
                throw Failure{fmt::format("{}: column '{}' is not an input of the plant; name a column time, power, "
                                          "current, current_density or an input (see 'elyblock variables {}')",
                                          where, h.written[c], block.config_path())};
            if (std::find(p.inputs.begin(), p.inputs.end(), v) != p.inputs.end())
                throw Failure{fmt::format("{}: column '{}' is given twice", where, h.written[c])};
            p.inputs.push_back(v);
        }
    }
    std::string line;
    while (std::getline(in, line)) {
        ++line_number;
        const std::string text = trim(line);
        if (text.empty() || text[0] == '#') continue;
        const std::string where = fmt::format("{} line {}", path, line_number);
        const auto fields = split(text);
        if (fields.size() != h.names.size())
            throw Failure{fmt::format("{}: {} fields; the header has {}", where, fields.size(), h.names.size())};
        for (std::size_t c = 0; c < fields.size(); ++c) {
            const std::string column = fmt::format("{}, column {}", where, h.names[c]);
            char* end = nullptr;
            const double x = std::strtod(fields[c].c_str(), &end);
            if (fields[c].empty() || *end != '\0' || !std::isfinite(x))
                throw Failure{fmt::format("{}: '{}' is not a number", column, fields[c])};
            if (c == 0) {
                const double t = convert(x, p.time_unit, "s", column);
                if (!p.times.empty() && t < p.times.back())
                    throw Failure{fmt::format("{}: the time goes back, to {:g} {}", column, x, p.time_unit)};
                p.times.push_back(t);
            } else {
                p.values.push_back(convert(x, h.units[c], p.inputs[c - 1]->info.unit, column));
            }
        }
    }
    if (p.times.empty()) throw Failure{fmt::format("the profile '{}' has no rows", path)};
    return p;
}

// The columns of the series when none are given.
const char* const kDefaultColumns[] = {"state.mode",       "stack.temperature", "cell.current_density", "cell.voltage",
                                       "stack.power",      "plant.power",       "product.hydrogen",     "gas.h2_in_o2",
                                       "heat.to_coolant",  "alarm.any"};

// What --plot draws (the Python package's RUN_OUTPUTS, elyblock/plots.py), after the series' columns.
const char* const kPlotColumns[] = {"perf.load_fraction", "stack.power", "stack.temperature", "gas.h2_in_o2",
                                    "gas.h2_in_o2_stack", "state.mode"};

// A progress bar on standard error, drawn only on a terminal.
struct Progress {
    bool on;
    int shown = -1;
    static int32_t callback(size_t done, size_t total, void* user) {
        auto* self = static_cast<Progress*>(user);
        const int percent = total ? static_cast<int>(100 * done / total) : 100;
        if (percent == self->shown) return 0;
        self->shown = percent;
        const int width = 40, filled = width * percent / 100;
        std::fprintf(stderr, "\relyblock run: [%.*s%*s] %3d %% (%zu of %zu rows)", filled,
                     "########################################", width - filled, "", percent, done, total);
        std::fflush(stderr);
        return 0;
    }
    void finish() const {
        if (on && shown >= 0) std::fprintf(stderr, "\n");
    }
};

std::string summary_text(const std::string& json) {
    namespace js = boost::json;
    const js::object root = js::parse(json).as_object();
    const auto hours = [&](const char* key) { return root.at(key).to_number<double>() / 3600.0; };
    std::string out = fmt::format("Run of the {} plant from t = {:g} h to {:g} h\n",
                                  js::value_to<std::string>(root.at("technology")), hours("start_time"), hours("end_time"));
    for (const auto& kv : root.at("figures").as_object()) {
        const js::object& f = kv.value().as_object();
        if (f.at("value").is_null()) continue;  // not defined for this run (no voltage limit, no trip, ...)
        const std::string unit = js::value_to<std::string>(f.at("display_unit"));
        const double value = f.at("value").to_number<double>() * f.at("display_scale").to_number<double>() +
                             f.at("display_offset").to_number<double>();
        out += fmt::format("  {:<66}{:>14.6g} {}\n", js::value_to<std::string>(f.at("label")), value,
                           unit == "1" ? "" : unit);
    }
    return out;
}

// The rows of the plotted columns in SI to a temporary CSV, drawn by the Python package with the
// temperature setpoint and the H2-in-O2 alarm levels of the plant.
void plot_run(const Block& block, const Profile& p, const std::vector<const Variable*>& plotted,
              const std::vector<double>& values, std::size_t width, std::size_t first, const std::vector<std::string>& files) {
    TempFile data("elyblock-run");
    {
        Output out(data.path, "--plot");
        std::string line = "time [s]";
        for (const Variable* v : plotted) line += fmt::format(",{} [{}]", v->info.name, v->info.unit);
        out.write(line + "\n");
        for (std::size_t k = 0; k < p.times.size(); ++k) {
            line = fmt::format("{}", p.times[k]);
            for (std::size_t c = 0; c < plotted.size(); ++c) {
                const double x = values[k * width + first + c];
                line += std::isfinite(x) ? fmt::format(",{}", x) : std::string(",");
            }
            out.write(line + "\n");
        }
        out.close();
    }
    const auto value = [&](const char* name) {
        double x = std::nan("");
        if (const Variable* v = block.find(name)) ely_block_get(block.handle(), v->index, &x);
        return fmt::format("{}", x);
    };
    plot_with_python("run", "run", data.path, files,
                     {"--setpoint", value("param.thermal.temperature_setpoint"), "--warning",
                      value("param.alarms.h2_in_o2_warning"), "--trip", value("param.alarms.h2_in_o2_trip")});
    for (const auto& f : files) note("run", "wrote " + f);
}

int run(const RunOptions& o) {
    const Units units = o.units == "engineering" ? Units::engineering : Units::si;
    // A drive input among the profile's columns (power, current, ...) selects the spec that reads it.
    VariedInput drive;
    {
        std::ifstream in = open_profile(o.profile);
        for (const auto& name : read_header(in, o.profile).names)
            if (drive.name.empty() && name.rfind("in.", 0) == 0 && name != "in.temperature")
                for (const char* input : {"in.current_density", "in.current", "in.power", "in.hydrogen_rate", "in.voltage"})
                    if (name == input) drive = {"the profile's column", name};
    }
    const auto block = open_plant(o.plant, "run", drive);
    const Profile p = read_profile(o.profile, *block);
    for (const auto& assignment : o.plant.sets)
        for (const Variable* v : p.inputs)
            if (assignment.rfind(std::string(v->info.name) + "=", 0) == 0)
                throw UsageError{fmt::format("--set {}: the profile has a column of it", v->info.name), ""};

    std::vector<const Variable*> columns;
    if (o.columns.empty()) {
        for (const char* name : kDefaultColumns)
            if (const Variable* v = block->find(name)) columns.push_back(v);
    } else {
        for (const auto& name : o.columns) columns.push_back(&variable_named(*block, name, "--columns"));
    }
    check_plot_files(o.plots, "--plot");
    std::vector<int32_t> in_idx, out_idx;
    for (const Variable* v : p.inputs) in_idx.push_back(v->index);
    for (const Variable* v : columns) out_idx.push_back(v->index);
    std::vector<const Variable*> plotted;  // read after the series' columns
    if (!o.plots.empty())
        for (const char* name : kPlotColumns)
            if (const Variable* v = block->find(name)) {
                plotted.push_back(v);
                out_idx.push_back(v->index);
            }

    const std::size_t rows = p.times.size(), width = out_idx.size();
    std::vector<double> values(rows * width);
    std::vector<int32_t> status(rows);
    Progress progress{!o.no_progress && isatty(fileno(stderr)) != 0};
    const int32_t result = ely_block_simulate(block->handle(), rows, p.times.data(), static_cast<int32_t>(in_idx.size()),
                                              in_idx.data(), p.values.data(), static_cast<int32_t>(width),
                                              out_idx.data(), values.data(), status.data(),
                                              progress.on ? &Progress::callback : nullptr, &progress);
    progress.finish();
    const std::string message = result == ELY_OK ? std::string() : last_error();
    if (result < 0) throw Failure{message};  // the first row failed: no run

    // The series: the time in the profile's unit (SI: s), the status, the columns.
    {
        const bool si_time = units == Units::si;
        const std::string time_unit = si_time ? "s" : p.time_unit;
        std::unique_ptr<Output> out = o.output == "-" ? std::make_unique<Output>()
                                                      : std::make_unique<Output>(o.output, "--output");
        std::string line = fmt::format("time [{}],status", time_unit);
        for (const Variable* v : columns) line += "," + column_name(*v, units);
        out->write(line + "\n");
        for (std::size_t k = 0; k < rows; ++k) {
            const double t = si_time ? p.times[k] : convert(p.times[k], "s", time_unit.c_str(), "time");
            line = number_text(t, units) + "," + ely_status_text(status[k]);
            for (std::size_t c = 0; c < columns.size(); ++c)
                line += "," + number_text(shown(columns[c]->info, values[k * width + c], units).value, units);
            out->write(line + "\n");
        }
        out->close();
    }

    // The summary, on standard output (standard error when the series went there).
    std::size_t length = 0;
    check(ely_block_run_summary_json(block->handle(), nullptr, 0, &length), "run");
    std::string json(length, '\0');
    check(ely_block_run_summary_json(block->handle(), json.data(), length, &length), "run");
    json.resize(length - 1);
    const std::string text = summary_text(json);
    if (o.output == "-") {
        std::fputs(text.c_str(), stderr);
    } else {
        Output out;
        out.write(text);
        out.close();
    }
    if (!o.plots.empty()) plot_run(*block, p, plotted, values, width, columns.size(), o.plots);
    if (result == ELY_PARTIAL) {
        note("run", message + fmt::format(" (the series stops there; the summary covers the rows before)"));
        return kExitFailure;
    }
    if (result == ELY_WARNING) note("run", message);
    return kExitOk;
}

}  // namespace

Command command_run() {
    return {"run", "run the plant over a profile in time (power, current, ...) and summarise the run",
            [](CLI::App& sub) -> std::function<int()> {
                auto o = std::make_shared<RunOptions>();
                add_plant_options(sub, o->plant);
                sub.add_option("profile", o->profile,
                               "the profile, CSV: a time column and input columns, each header naming the column "
                               "and its unit, e.g. \"time [h],power [MW]\"")
                    ->required()
                    ->type_name("PROFILE.csv");
                sub.add_option("--output", o->output,
                               "write the time series to this file (default: run.csv; - for standard output, and the "
                               "summary then goes to standard error)")
                    ->type_name("FILE");
                sub.add_option("--columns", o->columns,
                               "variables of the series, comma-separated (default: mode, temperature, current "
                               "density, voltage, DC and AC power, hydrogen, H2 in the anode gas, heat to coolant, "
                               "alarms)")
                    ->delimiter(',')
                    ->type_name("NAME,...");
                sub.add_option("--units", o->units,
                               "si (default) or engineering (display units: degC, MW, kg/h, ...; the time in the "
                               "profile's unit)")
                    ->check(CLI::IsMember({"si", "engineering"}));
                sub.add_flag("--no-progress", o->no_progress, "no progress bar (there is none when not on a terminal)");
                sub.add_option("--plot", o->plots,
                               "draw the run to this file (.png, .svg or .pdf; may be repeated): the load duration "
                               "curve and the stack temperature and H2-in-O2 traces, by the elyblock Python package "
                               "(python3 with matplotlib)")
                    ->type_name("FILE");
                sub.footer(
                    "The profile: the first column is the time (\"time [h]\", any step, non-decreasing); the others are\n"
                    "inputs: power (in.power, the stacks' DC power), current (in.current) or current_density select\n"
                    "the spec; any input may be a column (in.ambient_temperature [degC], in.mode_request: 0 off,\n"
                    "1 standby, 2 production, 3 automatic). Each row's values hold until the next row.\n"
                    "Example:\n"
                    "  elyblock run examples/demo-plant.json examples/profiles/windsolar-year.csv \\\n"
                    "      --set in.mode_request=3 --output year.csv\n"
                    "Exit status: 0 the whole profile ran, 1 a row failed (the series stops there) or the model or\n"
                    "the output failed, 2 usage.");
                return [o] {
                    if (o->output.empty()) o->output = "run.csv";
                    return run(*o);
                };
            }};
}

}  // namespace elycli
