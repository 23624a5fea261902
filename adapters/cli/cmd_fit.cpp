// elyblock fit: fits tunable parameters of a plant to measured data in a CSV file (ely_block_fit)
// and writes the calibrated plant description.
//
// The data file: lines starting with '#' are comments (a source, a note). The first other line
// names the columns: variable names, each optionally followed by its unit in brackets
// ("in.current_density [A/cm2]", "in.temperature [degC]", "cell.voltage [mV]") in any unit a plant
// description accepts; without brackets the values are SI. Inputs (in.*) are the operating points,
// outputs are measured values (an empty cell: not measured at that row), and a column
// "weight:<output>" gives that output's weights. Every other line is one row of numbers. The
// input columns are inputs the command varies, like sweep's --over: one that is the drive input
// of another spec selects that spec (plant.hpp).
#include <CLI/CLI.hpp>
#include <elyblock/elyblock.h>

#include <cerrno>
#include <cmath>
#include <cstdlib>
#include <fstream>
#include <memory>
#include <string>
#include <vector>

#include "command.hpp"
#include "errors.hpp"
#include "output.hpp"
#include "plant.hpp"
#include "quantities.hpp"

namespace elycli {
namespace {

struct FitOptions {
    PlantOptions plant;
    std::string data, output, format = "table";
    std::vector<std::string> free, bounds;
    int max_iterations = 0;
};

std::string trim(const std::string& s) {
    const auto b = s.find_first_not_of(" \t\r");
    if (b == std::string::npos) return "";
    return s.substr(b, s.find_last_not_of(" \t\r") - b + 1);
}

// The fields of a CSV line (RFC 4180 quoting), each trimmed.
std::vector<std::string> fields(const std::string& line) {
    std::vector<std::string> out(1);
    bool quoted = false;
    for (std::size_t i = 0; i < line.size(); ++i) {
        const char c = line[i];
        if (quoted) {
            if (c != '"') out.back() += c;
            else if (i + 1 < line.size() && line[i + 1] == '"') out.back() += line[++i];
            else quoted = false;
        } else if (c == '"') {
            quoted = true;
        } else if (c == ',') {
            out.emplace_back();
        } else {
            out.back() += c;
        }
    }
    for (auto& f : out) f = trim(f);
    return out;
}

// A data cell: a plain number in its column's unit.
double cell_number(const std::string& text, const std::string& where) {
    char* end = nullptr;
    errno = 0;
    const double v = std::strtod(text.c_str(), &end);
    if (end != text.c_str() + text.size() || !std::isfinite(v) || errno == ERANGE)
        throw Failure{fmt::format("{}: '{}' is not a finite number (the unit goes in the header: NAME [UNIT])", where, text)};
    return v;
}

/// The data file, its columns assigned to the inputs, measured outputs and weights; values in SI.
struct Data {
    std::string path;
    std::vector<int32_t> inputs, measured;
    std::vector<std::string> input_names;
    std::vector<double> input_values, measured_values, weights;
    std::size_t points = 0;
};

Data read_data(const Block& block, const std::string& path) {
    std::ifstream in(path);
    if (!in) throw Failure{fmt::format("cannot read the data file '{}'", path)};
    enum class Role { input, measured, weight };
    struct Column {
        Role role;
        std::size_t slot;  // position among the inputs / the measured outputs
        std::string name;  // variable name (for a weight: the measured output's)
        std::string unit;  // the header's unit, "" for SI
        const Variable* variable;
    };
    std::vector<Column> columns;
    Data d;
    d.path = path;
    std::string line;
    std::size_t line_number = 0;
    bool header = false;
    while (std::getline(in, line)) {
        ++line_number;
        const std::string t = trim(line);
        if (t.empty() || t[0] == '#') continue;
        const auto cells = fields(t);
        const std::string where = fmt::format("{}:{}", path, line_number);
        if (!header) {
            header = true;
            for (const auto& cell : cells) {
                std::string name = cell, unit;
                if (const auto open = cell.find('['); open != std::string::npos) {
                    const auto close = cell.find(']', open);
                    if (close == std::string::npos || !trim(cell.substr(close + 1)).empty())
                        throw Failure{fmt::format("{}: column '{}': write the unit as NAME [UNIT]", where, cell)};
                    name = trim(cell.substr(0, open));
                    unit = trim(cell.substr(open + 1, close - open - 1));
                }
                if (name.rfind("weight:", 0) == 0) {
                    if (!unit.empty())
                        throw Failure{fmt::format("{}: column '{}': weights take no unit (they are 1/SI²)", where, cell)};
                    columns.push_back({Role::weight, 0, name.substr(7), "", nullptr});
                    continue;
                }
                const Variable* v = block.find(name);
                if (!v) {
                    int32_t index = -1;
                    ely_block_find(block.handle(), name.c_str(), &index);
                    throw Failure{fmt::format("{}: column '{}': {}", where, name, last_error())};
                }
                for (const auto& c : columns)
                    if (c.role != Role::weight && c.name == name)
                        throw Failure{fmt::format("{}: column '{}' is given twice", where, name)};
                if (!unit.empty()) {  // the header's unit must convert to the variable's: checked once, here
                    double x = 0;
                    check(ely_convert_unit(1.0, unit.c_str(), v->info.unit, &x), fmt::format("{}: column '{}'", where, name));
                }
                if (v->is_input()) {
                    columns.push_back({Role::input, d.inputs.size(), name, unit, v});
                    d.inputs.push_back(v->index);
                    d.input_names.push_back(name);
                } else if (v->is_output()) {
                    columns.push_back({Role::measured, d.measured.size(), name, unit, v});
                    d.measured.push_back(v->index);
                } else {
                    throw Failure{fmt::format("{}: column '{}' is a parameter: a data column is an input or a "
                                              "measured output (fit parameters with --free)",
                                              where, name)};
                }
            }
            for (auto& c : columns) {
                if (c.role != Role::weight) continue;
                bool found = false;
                for (const auto& m : columns)
                    if (m.role == Role::measured && m.name == c.name) {
                        c.slot = m.slot;
                        found = true;
                    }
                if (!found)
                    throw Failure{fmt::format("{}: column 'weight:{}' has no measured column '{}'", where, c.name, c.name)};
            }
            if (d.measured.empty()) throw Failure{fmt::format("{}: no measured output among the columns", where)};
            continue;
        }
        if (cells.size() != columns.size())
            throw Failure{fmt::format("{}: {} values for {} columns", where, cells.size(), columns.size())};
        const std::size_t row = d.points++;
        d.input_values.resize(d.points * d.inputs.size());
        d.measured_values.resize(d.points * d.measured.size(), NAN);
        d.weights.resize(d.points * d.measured.size(), 1.0);
        for (std::size_t k = 0; k < cells.size(); ++k) {
            const Column& c = columns[k];
            const std::string what =
                fmt::format("{}: column '{}'", where, c.role == Role::weight ? "weight:" + c.name : c.name);
            if (cells[k].empty()) {
                if (c.role == Role::input) throw Failure{what + ": an input needs a value in every row"};
                continue;  // not measured / weight 1
            }
            double v = cell_number(cells[k], what);
            if (!c.unit.empty()) check(ely_convert_unit(v, c.unit.c_str(), c.variable->info.unit, &v), what);
            switch (c.role) {
                case Role::input: d.input_values[row * d.inputs.size() + c.slot] = v; break;
                case Role::measured: d.measured_values[row * d.measured.size() + c.slot] = v; break;
                case Role::weight: d.weights[row * d.measured.size() + c.slot] = v; break;
            }
        }
    }
    if (!header) throw Failure{fmt::format("{}: no header line naming the columns", path)};
    if (d.points == 0) throw Failure{fmt::format("{}: no data rows", path)};
    return d;
}

/// A --free or --bound name: a variable name, or a key of the technology's cell object.
const Variable& free_parameter(const Block& block, const std::string& name, const std::string& option) {
    const Variable* v = name.find('.') == std::string::npos ? block.find("param.cell." + name) : nullptr;
    const Variable& p = v ? *v : variable_named(block, name, option);
    if (!p.is_tunable())
        throw UsageError{fmt::format("{}: '{}' is {}; fit tunable parameters (param.…)", option, name,
                                     p.is_input()    ? "an input"
                                     : p.is_output() ? "an output"
                                                     : "a fixed parameter"),
                         fmt::format("see 'elyblock variables {}' for the plant's tunable parameters", block.config_path())};
    return p;
}

struct Bounds {
    std::vector<double> lower, upper;  // per free parameter, SI; NaN keeps the variable's limit
};

Bounds read_bounds(const Block& block, const std::vector<const Variable*>& free, const std::vector<std::string>& given) {
    Bounds b{std::vector<double>(free.size(), NAN), std::vector<double>(free.size(), NAN)};
    for (const std::string& text : given) {
        const auto eq = text.find('=');
        const auto colon = eq == std::string::npos ? eq : text.find(':', eq);
        if (eq == 0 || colon == std::string::npos)
            throw UsageError{fmt::format("--bound: expected NAME=LOW:HIGH (quantities; leave a side empty to keep the "
                                         "variable's limit), got '{}'",
                                         text),
                             ""};
        const std::string name = text.substr(0, eq), option = "--bound " + name;
        const Variable& p = free_parameter(block, name, "--bound");
        std::size_t k = 0;
        while (k < free.size() && free[k] != &p) ++k;
        if (k == free.size()) throw UsageError{fmt::format("{}: not among the --free parameters", option), ""};
        const std::string low = trim(text.substr(eq + 1, colon - eq - 1)), high = trim(text.substr(colon + 1));
        if (!low.empty()) b.lower[k] = read_quantity(low, p.info.unit, option);
        if (!high.empty()) b.upper[k] = read_quantity(high, p.info.unit, option);
    }
    return b;
}

// The fitted values with their standard errors, and the RMSE of each measured variable.
void write_table(Output& out, const Block& block, const std::vector<const Variable*>& free, const ely_fit* fit,
                 const Data& d) {
    out.print("{:<48} {:>14} {:>12}  {}\n", "parameter", "value", "std. error", "unit");
    for (std::size_t k = 0; k < free.size(); ++k) {
        double value = NAN, se = NAN;
        check(ely_fit_parameter(fit, static_cast<int32_t>(k), &value, &se), "result");
        out.print("{:<48} {:>14.6g} {:>12.3g}  {}\n", free[k]->info.name, value, se, free[k]->info.unit);
    }
    for (std::size_t m = 0; m < d.measured.size(); ++m) {
        double rmse = NAN;
        size_t rows = 0;
        check(ely_fit_rmse(fit, static_cast<int32_t>(m), &rmse, &rows), "result");
        const Variable& v = block.variables()[static_cast<std::size_t>(d.measured[m])];
        out.print("RMSE of {} over {} rows: {:.4g} {}\n", v.info.name, rows, rmse, v.info.unit);
    }
}

int run(const FitOptions& o) {
    Data d;
    const auto block = open_plant(o.plant, "fit", [&](const Block& b) {
        d = read_data(b, o.data);
        std::vector<VariedInput> varied;
        for (const auto& name : d.input_names) varied.push_back({"data column", name});
        return varied;
    });
    std::vector<const Variable*> free;
    for (const auto& name : o.free) {
        const Variable* p = &free_parameter(*block, name, "--free");
        for (const Variable* q : free)
            if (q == p) throw UsageError{fmt::format("--free: '{}' is given twice", p->info.name), ""};
        free.push_back(p);
    }
    const Bounds bounds = read_bounds(*block, free, o.bounds);
    std::vector<const char*> names;
    for (const Variable* p : free) names.push_back(p->info.name);

    ely_fit_options options{};
    options.struct_size = sizeof options;
    options.max_iterations = o.max_iterations;
    options.lower = bounds.lower.data();
    options.upper = bounds.upper.data();
    std::unique_ptr<ely_fit, void (*)(ely_fit*)> fit{nullptr, ely_fit_destroy};
    ely_fit* result = nullptr;
    const int32_t status = check(
        ely_block_fit(block->handle(), d.points, static_cast<int32_t>(d.inputs.size()), d.inputs.data(),
                      d.input_values.data(), static_cast<int32_t>(d.measured.size()), d.measured.data(),
                      d.measured_values.data(), d.weights.data(), static_cast<int32_t>(names.size()), names.data(),
                      &options, nullptr, nullptr, &result),
        "");
    fit.reset(result);
    // The warning text belongs to the fit; later calls replace the last-error message.
    const std::string warning = status == ELY_WARNING ? last_error() : "";
    if (!o.output.empty()) {
        Output file(o.output, "--output");
        file.write(buffer_text(&ely_fit_plant_json, fit.get(), "calibrated plant"));
        file.close();
    }
    Output out;
    if (o.format == "json") out.print("{}\n", buffer_text(&ely_fit_report_json, fit.get(), "report"));
    else write_table(out, *block, free, fit.get(), d);
    out.close();
    if (!warning.empty()) note("fit", "warning: " + warning);
    return kExitOk;
}

}  // namespace

Command command_fit() {
    return {"fit", "fit tunable parameters to measured data (a CSV file) and write the calibrated plant",
            [](CLI::App& sub) -> std::function<int()> {
                auto o = std::make_shared<FitOptions>();
                add_plant_options(sub, o->plant);
                sub.add_option("data", o->data,
                               "measured data, CSV: a header of variable names with optional units "
                               "(in.current_density [A/cm2], in.temperature [degC], cell.voltage [mV], "
                               "weight:cell.voltage), then one row per point; '#' lines are comments")
                    ->required()
                    ->type_name("DATA.csv");
                sub.add_option("--free", o->free,
                               "the parameters to fit, comma-separated: keys of the plant's cell object "
                               "(anode_exchange_current_density) or tunable variables (param.cell.contact_resistance)")
                    ->required()
                    ->delimiter(',')
                    ->type_name("NAME,...");
                sub.add_option("--bound", o->bounds,
                               "bounds of a free parameter, quantities as in a plant description (\"0.01 ohm cm2\"); "
                               "an empty side keeps the variable's limit (repeatable)")
                    ->type_name("NAME=LOW:HIGH")
                    ->expected(1)
                    ->multi_option_policy(CLI::MultiOptionPolicy::TakeAll);
                sub.add_option("--output", o->output, "write the calibrated plant description (JSON) to this file")
                    ->type_name("FILE");
                sub.add_option("--format", o->format,
                               "table (fitted values and RMSE, default) or json (the full report: standard errors, "
                               "intervals, correlation, residuals, warnings)")
                    ->check(CLI::IsMember({"table", "json"}));
                sub.add_option("--max-iterations", o->max_iterations, "Levenberg-Marquardt iterations (default 200)")
                    ->check(CLI::Range(1, 1000000))
                    ->type_name("N");
                sub.footer(
                    "Examples:\n"
                    "  elyblock fit plant.json bench.csv --free contact_resistance --output fitted.json\n"
                    "  elyblock fit plant.json bench.csv --free anode_exchange_current_density,contact_resistance \\\n"
                    "      --bound contact_resistance=\"0.01 ohm cm2\":\"1 ohm cm2\" --format json\n"
                    "An input column that is the drive input of another spec (e.g. in.power) selects that spec unless\n"
                    "--spec is given. Method, statistics and warnings: docs/calibration.md. Exit status: 0 fitted\n"
                    "(warnings on standard error), 1 the model, the data or the output failed, 2 usage.");
                return [o] { return run(*o); };
            }};
}

}  // namespace elycli
