// `elyblock fit`: fits tunable parameters of a plant to measured data in a CSV file and writes
// the calibrated plant description. A client of the public C interface only (ely_block_fit).
//
//   elyblock fit PLANT.json DATA.csv --free NAME[,NAME...] [--output FITTED.json]
//                [--format table|json] [--spec S] [--set NAME=VALUE]... [--bound NAME=LOW:HIGH]...
//                [--max-iterations N]
//
// DATA.csv: lines starting with '#' are comments (a source, a note). The first other line names
// the columns: variable names, each optionally followed by its unit in brackets
// ("in.current_density [A/cm2]", "in.temperature [degC]", "cell.voltage [V]") in any unit the
// plant description accepts; without brackets the values are SI. Inputs (in.*) are the operating
// points, outputs are measured values (an empty cell: not measured at that row), and a column
// "weight:<output>" gives that output's weights. Each following line is one row.
#include <elyblock/elyblock.h>
#include <fmt/format.h>

#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <fstream>
#include <sstream>
#include <string>
#include <utility>
#include <vector>

#include "fit_command.hpp"

namespace {

const char* const kFitUsage =
    "usage: elyblock fit <plant.json> <data.csv> --free NAME[,NAME...] [--output FITTED.json]\n"
    "                    [--format table|json] [--spec S] [--set NAME=VALUE]... [--bound NAME=LOW:HIGH]...\n"
    "                    [--max-iterations N]\n"
    "  fit tunable parameters (cell keys such as anode_exchange_current_density, or variable\n"
    "  names such as param.cell.contact_resistance) to the measured outputs in data.csv, whose\n"
    "  header names the variables, each with an optional unit: in.current_density [A/cm2],\n"
    "  in.temperature [degC], cell.voltage [V], weight:cell.voltage; '#' lines are comments.\n"
    "  --output writes the calibrated plant description. Exit status: 0 ok (warnings on stderr),\n"
    "  1 model or data error, 2 usage error.\n";

struct Usage {
    std::string message;
};
struct Failure {
    std::string message;
};

void check(int32_t status, const std::string& doing) {
    if (status < 0) throw Failure{fmt::format("{}: {} ({})", doing, ely_last_error(), ely_status_text(status))};
}

double number(const std::string& text, const std::string& what) {
    char* end = nullptr;
    errno = 0;
    const double v = std::strtod(text.c_str(), &end);
    if (text.empty() || end != text.c_str() + text.size() || !std::isfinite(v) || errno == ERANGE)
        throw Usage{fmt::format("{}: '{}' is not a finite number", what, text)};
    return v;
}

std::string trim(const std::string& s) {
    const auto b = s.find_first_not_of(" \t\r");
    if (b == std::string::npos) return "";
    const auto e = s.find_last_not_of(" \t\r");
    return s.substr(b, e - b + 1);
}

std::vector<std::string> split(const std::string& line, char by) {
    std::vector<std::string> out;
    std::string item;
    std::istringstream in(line);
    while (std::getline(in, item, by)) out.push_back(trim(item));
    if (!line.empty() && line.back() == by) out.emplace_back();
    return out;
}

struct Options {
    std::string plant, data, output, format = "table", spec;
    std::vector<std::string> free;
    std::vector<std::pair<std::string, double>> sets;
    std::vector<std::pair<std::string, std::pair<double, double>>> bounds;
    int32_t max_iterations = 0;
};

Options parse(int argc, char** argv) {
    Options o;
    std::vector<std::string> positional;
    for (int i = 2; i < argc; ++i) {
        const std::string a = argv[i];
        const auto value = [&]() -> std::string {
            if (i + 1 >= argc) throw Usage{fmt::format("{} needs a value", a)};
            return argv[++i];
        };
        if (a == "--free") {
            for (const auto& name : split(value(), ','))
                if (!name.empty()) o.free.push_back(name);
        } else if (a == "--output") {
            o.output = value();
        } else if (a == "--format") {
            o.format = value();
            if (o.format != "table" && o.format != "json") throw Usage{fmt::format("--format must be table or json, not '{}'", o.format)};
        } else if (a == "--spec") {
            o.spec = value();
        } else if (a == "--set") {
            const std::string kv = value();
            const auto eq = kv.find('=');
            if (eq == std::string::npos || eq == 0) throw Usage{fmt::format("--set expects NAME=VALUE, got '{}'", kv)};
            o.sets.emplace_back(kv.substr(0, eq), number(kv.substr(eq + 1), kv.substr(0, eq)));
        } else if (a == "--bound") {
            const std::string kv = value();
            const auto eq = kv.find('='), colon = kv.find(':', eq == std::string::npos ? 0 : eq);
            if (eq == std::string::npos || eq == 0 || colon == std::string::npos)
                throw Usage{fmt::format("--bound expects NAME=LOW:HIGH (SI; leave a side empty to keep the limit), got '{}'", kv)};
            const std::string name = kv.substr(0, eq), lo = kv.substr(eq + 1, colon - eq - 1), hi = kv.substr(colon + 1);
            o.bounds.push_back({name, {lo.empty() ? NAN : number(lo, "--bound " + name), hi.empty() ? NAN : number(hi, "--bound " + name)}});
        } else if (a == "--max-iterations") {
            const double n = number(value(), a);
            if (n < 1 || n > 1e6 || n != std::floor(n)) throw Usage{"--max-iterations must be an integer from 1 to 1000000"};
            o.max_iterations = static_cast<int32_t>(n);
        } else if (a == "--help" || a == "-h") {
            fmt::print("{}", kFitUsage);
            std::exit(0);
        } else if (!a.empty() && a[0] == '-') {
            throw Usage{fmt::format("unknown option '{}'", a)};
        } else {
            positional.push_back(a);
        }
    }
    if (positional.size() != 2) throw Usage{"fit needs a plant description and a data file"};
    o.plant = positional[0];
    o.data = positional[1];
    if (o.free.empty()) throw Usage{"fit needs --free NAME[,NAME...]: the parameters to fit"};
    return o;
}

struct Block {
    ely_block* p = nullptr;
    ~Block() { ely_block_destroy(p); }
    int32_t find(const std::string& name) const {
        int32_t i = -1;
        check(ely_block_find(p, name.c_str(), &i), "variable '" + name + "'");
        return i;
    }
    ely_variable_info info(int32_t index) const {
        ely_variable_info v{};
        v.struct_size = sizeof v;
        check(ely_block_variable_info(p, index, &v), "variables");
        return v;
    }
};

struct Fit {
    ely_fit* p = nullptr;
    ~Fit() { ely_fit_destroy(p); }
};

/// The data file, columns assigned to inputs, measured outputs and weights, values in SI.
struct Data {
    std::vector<int32_t> inputs, measured;
    std::vector<double> input_values, measured_values, weights;
    std::vector<std::string> input_names;
    std::size_t points = 0;
};

Data read_data(const Block& b, const std::string& path) {
    std::ifstream in(path);
    if (!in) throw Failure{fmt::format("cannot read '{}'", path)};
    enum class Role { input, measured, weight };
    struct Column {
        Role role;
        std::size_t slot;     // position among the inputs / measured
        std::string unit;     // the header's unit ("" = SI)
        std::string si_unit;
        std::string name;
    };
    std::vector<Column> columns;
    std::vector<std::pair<std::string, std::size_t>> weight_of;  // measured name → weight column
    Data d;
    std::string line;
    std::size_t line_number = 0;
    bool header = false;
    while (std::getline(in, line)) {
        ++line_number;
        const std::string t = trim(line);
        if (t.empty() || t[0] == '#') continue;
        const auto cells = split(t, ',');
        const std::string where = fmt::format("{}:{}", path, line_number);
        if (!header) {
            header = true;
            for (const auto& cell : cells) {
                std::string name = cell, unit;
                const auto open = cell.find('[');
                if (open != std::string::npos) {
                    const auto close = cell.find(']', open);
                    if (close == std::string::npos || trim(cell.substr(close + 1)) != "")
                        throw Failure{fmt::format("{}: column '{}': write the unit as NAME [UNIT]", where, cell)};
                    name = trim(cell.substr(0, open));
                    unit = trim(cell.substr(open + 1, close - open - 1));
                }
                if (name.rfind("weight:", 0) == 0) {
                    if (!unit.empty()) throw Failure{fmt::format("{}: column '{}': weights take no unit (they are 1/SI²)", where, cell)};
                    columns.push_back({Role::weight, 0, "", "", name.substr(7)});
                    continue;
                }
                int32_t index = -1;
                if (ely_block_find(b.p, name.c_str(), &index) != ELY_OK)
                    throw Failure{fmt::format("{}: column '{}': {}", where, name, ely_last_error())};
                const ely_variable_info info = b.info(index);
                for (const auto& c : columns)
                    if (c.name == name && c.role != Role::weight) throw Failure{fmt::format("{}: column '{}' is given twice", where, name)};
                if (info.causality == ELY_CAUSALITY_INPUT) {
                    columns.push_back({Role::input, d.inputs.size(), unit, info.unit, name});
                    d.inputs.push_back(index);
                    d.input_names.push_back(name);
                } else if (info.causality == ELY_CAUSALITY_OUTPUT) {
                    columns.push_back({Role::measured, d.measured.size(), unit, info.unit, name});
                    d.measured.push_back(index);
                } else {
                    throw Failure{fmt::format("{}: column '{}' is a parameter: a data column is an input or a measured output", where, name)};
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
                if (!found) throw Failure{fmt::format("{}: column 'weight:{}' has no measured column '{}'", where, c.name, c.name)};
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
            const std::string what = fmt::format("{}: column '{}'", where, c.role == Role::weight ? "weight:" + c.name : c.name);
            if (cells[k].empty()) {
                if (c.role == Role::input) throw Failure{what + ": an input needs a value in every row"};
                continue;  // not measured / weight 1
            }
            double v = 0;
            try {
                v = number(cells[k], what);
            } catch (const Usage& u) {
                throw Failure{u.message};
            }
            if (!c.unit.empty()) check(ely_convert_unit(v, c.unit.c_str(), c.si_unit.c_str(), &v), what);
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

/// The spec follows the data: when the block's spec reads a drive input the data do not give,
/// and the data give exactly one drive input, that one's spec.
void choose_spec(const Block& b, const Data& d) {
    const char* spec = nullptr;
    check(ely_block_get_spec(b.p, &spec), "spec");
    const std::string reads = std::string("in.") + spec;
    const char* const drives[] = {"current_density", "current", "power", "hydrogen_rate", "voltage"};
    std::vector<std::string> given;
    for (const auto& name : d.input_names) {
        if (name == reads) return;
        for (const char* drive : drives)
            if (name == std::string("in.") + drive) given.emplace_back(drive);
    }
    if (given.size() == 1) check(ely_block_set_spec(b.p, given[0].c_str()), "spec from the data's " + given[0]);
}

std::string text_of(int32_t (*call)(const ely_fit*, char*, size_t, size_t*), const ely_fit* fit, const char* what) {
    size_t n = 0;
    check(call(fit, nullptr, 0, &n), what);
    std::string text(n, '\0');
    check(call(fit, text.data(), text.size(), &n), what);
    text.resize(n - 1);
    return text;
}

void print_table(const Block& b, const std::vector<std::string>& free, const ely_fit* fit, const Data& d) {
    fmt::print("{:<48} {:>14} {:>12}  {}\n", "parameter", "value", "std. error", "unit");
    for (std::size_t k = 0; k < free.size(); ++k) {
        double value = NAN, se = NAN;
        check(ely_fit_parameter(fit, static_cast<int32_t>(k), &value, &se), "result");
        int32_t index = -1;
        std::string name = free[k];
        if (ely_block_find(b.p, name.c_str(), &index) != ELY_OK) name = "param.cell." + name;
        index = b.find(name);
        const ely_variable_info info = b.info(index);
        fmt::print("{:<48} {:>14.6g} {:>12.3g}  {}\n", name, value, se, info.unit);
    }
    // The root mean square deviation of each measured variable: the calibrated block solved at
    // the data's rows.
    std::vector<double> model(d.points * d.measured.size());
    std::vector<int32_t> row_status(d.points);
    check(ely_block_solve_batch(b.p, d.points, static_cast<int32_t>(d.inputs.size()), d.inputs.data(), d.input_values.data(),
                                static_cast<int32_t>(d.measured.size()), d.measured.data(), model.data(), row_status.data(),
                                nullptr, nullptr),
          "the fitted model at the data's rows");
    for (std::size_t m = 0; m < d.measured.size(); ++m) {
        double sum = 0;
        std::size_t count = 0;
        for (std::size_t i = 0; i < d.points; ++i) {
            const double measured = d.measured_values[i * d.measured.size() + m];
            if (std::isnan(measured)) continue;
            const double r = model[i * d.measured.size() + m] - measured;
            sum += r * r;
            ++count;
        }
        const ely_variable_info info = b.info(d.measured[m]);
        fmt::print("RMSE of {} over {} rows: {:.4g} {}\n", info.name, count, std::sqrt(sum / static_cast<double>(count)), info.unit);
    }
}

int run(int argc, char** argv) {
    const Options o = parse(argc, argv);
    Block b;
    check(ely_block_create_from_file(o.plant.c_str(), &b.p), "plant description");
    if (!o.spec.empty()) check(ely_block_set_spec(b.p, o.spec.c_str()), "--spec");
    for (const auto& [name, v] : o.sets) check(ely_block_set(b.p, b.find(name), v), "--set " + name);
    const Data d = read_data(b, o.data);
    if (o.spec.empty()) choose_spec(b, d);

    std::vector<const char*> names;
    for (const auto& n : o.free) names.push_back(n.c_str());
    std::vector<double> lower(names.size(), NAN), upper(names.size(), NAN);
    for (const auto& [name, range] : o.bounds) {
        bool found = false;
        for (std::size_t k = 0; k < o.free.size(); ++k)
            if (o.free[k] == name || "param.cell." + o.free[k] == name || o.free[k] == "param.cell." + name) {
                lower[k] = range.first;
                upper[k] = range.second;
                found = true;
            }
        if (!found) throw Usage{fmt::format("--bound {}: not among the --free parameters", name)};
    }
    ely_fit_options options{};
    options.struct_size = sizeof options;
    options.max_iterations = o.max_iterations;
    options.lower = lower.data();
    options.upper = upper.data();
    Fit fit;
    const int32_t status = ely_block_fit(b.p, d.points, static_cast<int32_t>(d.inputs.size()), d.inputs.data(),
                                         d.input_values.data(), static_cast<int32_t>(d.measured.size()), d.measured.data(),
                                         d.measured_values.data(), d.weights.data(), static_cast<int32_t>(names.size()),
                                         names.data(), &options, nullptr, nullptr, &fit.p);
    check(status, "fit");
    const std::string warnings = status == ELY_WARNING ? ely_last_error() : "";
    if (!o.output.empty()) {
        const std::string plant = text_of(&ely_fit_plant_json, fit.p, "calibrated plant");
        std::FILE* f = std::fopen(o.output.c_str(), "w");
        if (!f || std::fputs(plant.c_str(), f) < 0 || std::fclose(f) != 0)
            throw Failure{fmt::format("cannot write '{}'", o.output)};
    }
    if (o.format == "json") fmt::print("{}", text_of(&ely_fit_report_json, fit.p, "report"));
    else print_table(b, o.free, fit.p, d);
    if (!warnings.empty()) fmt::print(stderr, "elyblock: warning: {}\n", warnings);
    return 0;
}

}  // namespace

int run_fit_command(int argc, char** argv) {
    try {
        return run(argc, argv);
    } catch (const Usage& e) {
        fmt::print(stderr, "elyblock: {}\n\n{}", e.message, kFitUsage);
        return 2;
    } catch (const Failure& e) {
        fmt::print(stderr, "elyblock: {}\n", e.message);
        return 1;
    }
}
