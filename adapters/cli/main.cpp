// elyblock command line. A client of the public C interface only.
#include <elyblock/elyblock.h>
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "fit_command.hpp"

namespace {

const char* const kCautions =
    "CAUTION: electrolyzers handle hydrogen/oxygen mixtures (flammable from about 4 % H2),\n"
    "DC currents of thousands of amperes, hot caustic electrolytes, chlorine and hot stacks.\n"
    "These are model estimates for study work; design, operation, alarms and trips follow\n"
    "local codes, standards and licensed engineering practice.\n";

const char* const kUsage =
    "usage:\n"
    "  elyblock solve <config.json> [--spec S] [--set NAME=VALUE]... [--format table|json|csv]\n"
    "      solve one operating point; table (default) is a readable summary\n"
    "  elyblock sweep <config.json> --over NAME --from A --to B [--points N] [--spec S]\n"
    "                 [--set NAME=VALUE]... [--columns NAME,NAME,...] [--output FILE]\n"
    "      polarization curve or any one-input sweep, as CSV (stdout unless --output)\n"
    "  elyblock fit <config.json> <data.csv> --free NAME[,NAME...] [--output FITTED.json] [--format table|json]\n"
    "      fit tunable parameters to measured data; elyblock fit --help for more\n"
    "  elyblock variables <config.json>\n"
    "      list the block's variables: name, unit, causality, description\n"
    "  elyblock water <temperature K> <anode pressure Pa> <cathode pressure Pa>\n"
    "      reversible and thermoneutral voltage of water splitting, liquid feed\n"
    "  elyblock version\n"
    "Values are SI (K, Pa, A/m2, W, kg/s, V). Exit status: 0 ok, 1 model error, 2 usage error.\n";

struct UsageError {
    std::string message;
};

struct BlockHandle {
    ely_block* p = nullptr;
    ~BlockHandle() { ely_block_destroy(p); }
};

[[noreturn]] void fail_usage(std::string message) { throw UsageError{std::move(message)}; }

double parse_number(const std::string& text, const char* what) {
    char* end = nullptr;
    const double v = std::strtod(text.c_str(), &end);
    if (text.empty() || end != text.c_str() + text.size() || !std::isfinite(v))
        fail_usage(fmt::format("{} '{}' is not a finite number", what, text));
    return v;
}

// Model failures carry the library's message and exit 1.
struct ModelError {
    std::string message;
};

void check(int32_t status, const char* doing) {
    if (status < 0) throw ModelError{fmt::format("{}: {} ({})", doing, ely_last_error(), ely_status_text(status))};
}

int32_t find(const ely_block* b, const std::string& name) {
    int32_t index = -1;
    check(ely_block_find(b, name.c_str(), &index), "variable lookup");
    return index;
}

struct Options {
    std::string command, config, spec, format = "table", over, columns, output;
    double from = NAN, to = NAN;
    int points = 21;
    std::vector<std::pair<std::string, double>> sets;
};

Options parse_options(int argc, char** argv) {
    Options o;
    o.command = argv[1];
    int i = 2;
    if (i < argc && argv[i][0] != '-') o.config = argv[i++];
    auto value = [&](const char* flag) -> std::string {
        if (i + 1 >= argc) fail_usage(fmt::format("{} needs a value", flag));
        return argv[++i];
    };
    for (; i < argc; ++i) {
        const std::string a = argv[i];
        if (a == "--spec") o.spec = value("--spec");
        else if (a == "--format") o.format = value("--format");
        else if (a == "--over") o.over = value("--over");
        else if (a == "--from") o.from = parse_number(value("--from"), "--from");
        else if (a == "--to") o.to = parse_number(value("--to"), "--to");
        else if (a == "--points") {
            const double n = parse_number(value("--points"), "--points");
            if (n < 2 || n > 1e6 || n != std::floor(n)) fail_usage("--points must be an integer from 2 to 1000000");
            o.points = static_cast<int>(n);
        } else if (a == "--columns") o.columns = value("--columns");
        else if (a == "--output") o.output = value("--output");
        else if (a == "--set") {
            const std::string kv = value("--set");
            const auto eq = kv.find('=');
            if (eq == std::string::npos || eq == 0) fail_usage(fmt::format("--set expects NAME=VALUE, got '{}'", kv));
            o.sets.emplace_back(kv.substr(0, eq), parse_number(kv.substr(eq + 1), kv.substr(0, eq).c_str()));
        } else fail_usage(fmt::format("unknown option '{}'", a));
    }
    if (o.config.empty()) fail_usage(fmt::format("'{}' needs a configuration file", o.command));
    return o;
}

void open_block(const Options& o, BlockHandle& h) {
    check(ely_block_create_from_file(o.config.c_str(), &h.p), "configuration");
    if (!o.spec.empty()) check(ely_block_set_spec(h.p, o.spec.c_str()), "--spec");
    for (const auto& [name, v] : o.sets) check(ely_block_set(h.p, find(h.p, name), v), ("--set " + name).c_str());
}

std::string report(const ely_block* b) {
    size_t n = 0;
    check(ely_block_report_json(b, nullptr, 0, &n), "report");
    std::string text(n, '\0');
    check(ely_block_report_json(b, text.data(), text.size(), &n), "report");
    text.resize(n - 1);
    return text;
}

ely_variable_info variable_info(const ely_block* b, int32_t index) {
    ely_variable_info info{};
    info.struct_size = sizeof info;
    check(ely_block_variable_info(b, index, &info), "variables");
    return info;
}

// The summary is the technology's layout from the variable table: each variable's summary
// section and rank, its label, display unit and conversion. Alarms show only when raised.
void print_summary(const ely_block* b, const std::string& warning) {
    int32_t n = 0;
    check(ely_block_variable_count(b, &n), "variables");
    std::vector<std::pair<int32_t, int32_t>> rows;  // (rank, index)
    for (int32_t i = 0; i < n; ++i) {
        const ely_variable_info info = variable_info(b, i);
        if (info.summary_rank > 0) rows.emplace_back(info.summary_rank, i);
    }
    std::sort(rows.begin(), rows.end());
    std::string group;
    bool alarms_open = false, any_alarm = false;
    const auto close_alarms = [&] {
        if (alarms_open && !any_alarm) fmt::print("  none\n");
        alarms_open = false;
    };
    for (const auto& [rank, i] : rows) {
        const ely_variable_info info = variable_info(b, i);
        if (group != info.summary_group) {
            close_alarms();
            group = info.summary_group;
            fmt::print("{}\n", group);
        }
        double v = NAN;
        check(ely_block_get(b, i, &v), info.name);
        if (std::strncmp(info.name, "alarm.", 6) == 0) {
            alarms_open = true;
            if (v > 0) {
                fmt::print("  RAISED  {}\n", info.name);
                any_alarm = true;
            }
            continue;
        }
        if (!std::isfinite(v)) continue;
        const double shown = v * info.display_scale + info.display_offset;
        const char* unit = std::strcmp(info.display_unit, "1") == 0 ? "" : info.display_unit;
        fmt::print("  {:<40}{:>14.6g} {}\n", info.label, shown, unit);
    }
    close_alarms();
    if (!warning.empty()) fmt::print("  ({})\n", warning);
    fmt::print("\n{}", kCautions);
}

int command_solve(const Options& o) {
    BlockHandle h;
    open_block(o, h);
    const int32_t status = ely_block_solve(h.p);
    check(status, "solve");
    // The warning text belongs to the solve; later calls replace the last-error message.
    const std::string warning = status == ELY_WARNING ? ely_last_error() : "";
    if (o.format == "json") {
        fmt::print("{}\n", report(h.p));
    } else if (o.format == "csv") {
        int32_t n = 0;
        check(ely_block_variable_count(h.p, &n), "variables");
        fmt::print("name,value,unit\n");
        for (int32_t i = 0; i < n; ++i) {
            const ely_variable_info info = variable_info(h.p, i);
            double v = NAN;
            check(ely_block_get(h.p, i, &v), info.name);
            fmt::print("{},{:.10g},{}\n", info.name, v, info.unit);
        }
    } else if (o.format == "table") {
        print_summary(h.p, warning);
    } else {
        fail_usage(fmt::format("--format must be table, json or csv, not '{}'", o.format));
    }
    if (!warning.empty()) fmt::print(stderr, "elyblock: warning: {}\n", warning);
    return 0;
}

std::vector<std::string> split(const std::string& text) {
    std::vector<std::string> out;
    size_t start = 0;
    while (start <= text.size()) {
        const size_t comma = text.find(',', start);
        const std::string item = text.substr(start, comma == std::string::npos ? std::string::npos : comma - start);
        if (!item.empty()) out.push_back(item);
        if (comma == std::string::npos) break;
        start = comma + 1;
    }
    return out;
}

int command_sweep(const Options& o) {
    if (o.over.empty() || !std::isfinite(o.from) || !std::isfinite(o.to))
        fail_usage("sweep needs --over NAME --from A --to B");
    BlockHandle h;
    open_block(o, h);
    const int32_t over = find(h.p, o.over);
    const std::vector<std::string> columns =
        o.columns.empty() ? split("cell.current_density,cell.voltage,cell.reversible_voltage,cell.activation_anode,"
                                  "cell.activation_cathode,cell.ohmic,cell.concentration,cell.faraday_efficiency,"
                                  "gas.h2_in_o2,stack.power,product.hydrogen,perf.specific_energy,heat.duty")
                          : split(o.columns);
    std::vector<int32_t> out_idx;
    for (const auto& c : columns) out_idx.push_back(find(h.p, c));
    const size_t n = static_cast<size_t>(o.points);
    std::vector<double> in(n), out(n * out_idx.size());
    std::vector<int32_t> status(n);
    for (size_t k = 0; k < n; ++k) in[k] = o.from + (o.to - o.from) * static_cast<double>(k) / static_cast<double>(n - 1);
    const int32_t s = ely_block_solve_batch(h.p, n, 1, &over, in.data(), static_cast<int32_t>(out_idx.size()),
                                            out_idx.data(), out.data(), status.data(), nullptr, nullptr);
    check(s, "sweep");
    const std::string batch_message = s != ELY_OK ? ely_last_error() : "";
    std::FILE* f = stdout;
    if (!o.output.empty() && !(f = std::fopen(o.output.c_str(), "w")))
        throw ModelError{fmt::format("cannot write '{}'", o.output)};
    fmt::print(f, "{},status", o.over);
    for (const auto& c : columns) fmt::print(f, ",{}", c);
    fmt::print(f, "\n");
    for (size_t k = 0; k < n; ++k) {
        fmt::print(f, "{:.10g},{}", in[k], ely_status_text(status[k]));
        for (size_t c = 0; c < out_idx.size(); ++c) {
            const double v = out[k * out_idx.size() + c];
            if (std::isfinite(v)) fmt::print(f, ",{:.10g}", v);
            else fmt::print(f, ",");
        }
        fmt::print(f, "\n");
    }
    if (f != stdout) std::fclose(f);
    if (!batch_message.empty()) fmt::print(stderr, "elyblock: {}\n", batch_message);
    return 0;
}

int command_variables(const Options& o) {
    BlockHandle h;
    check(ely_block_create_from_file(o.config.c_str(), &h.p), "configuration");
    int32_t n = 0;
    check(ely_block_variable_count(h.p, &n), "variables");
    const char* causality[] = {"input", "output", "parameter"};
    for (int32_t i = 0; i < n; ++i) {
        const ely_variable_info info = variable_info(h.p, i);
        const bool tunable = info.variability == ELY_VARIABILITY_TUNABLE;
        fmt::print("{:<40} {:<12} {:<9}{} {}\n", info.name, info.unit, causality[info.causality],
                   tunable ? " (tunable)" : "", info.description);
    }
    return 0;
}

int command_water(int argc, char** argv) {
    if (argc != 5) fail_usage("water needs <temperature K> <anode pressure Pa> <cathode pressure Pa>");
    const double t = parse_number(argv[2], "temperature"), pa = parse_number(argv[3], "anode pressure"),
                 pc = parse_number(argv[4], "cathode pressure");
    double p_sat = 0, e_rev = 0, e_tn = 0;
    check(ely_water_saturation_pressure(t, &p_sat), "water");
    check(ely_water_electrolysis_voltages(t, pa, pc, &e_rev, &e_tn), "water");
    fmt::print("water vapour pressure  {:.2f} Pa\nreversible voltage     {:.5f} V\nthermoneutral voltage  {:.5f} V (HHV)\n",
               p_sat, e_rev, e_tn);
    return 0;
}

}  // namespace

int main(int argc, char** argv) {
    if (ely_abi_version() != ELY_ABI_VERSION) {
        fmt::print(stderr, "elyblock: library ABI {} does not match header ABI {}\n", ely_abi_version(), ELY_ABI_VERSION);
        return 1;
    }
    try {
        if (argc < 2) fail_usage("no command given");
        const std::string cmd = argv[1];
        if (cmd == "--help" || cmd == "help" || cmd == "-h") {
            fmt::print("{}", kUsage);
            return 0;
        }
        if (cmd == "version") {
            fmt::print("elyblock {} (ABI {})\n", ely_version(), ely_abi_version());
            return 0;
        }
        if (cmd == "fit") return run_fit_command(argc, argv);
        if (cmd == "water") return command_water(argc, argv);
        if (cmd == "solve") return command_solve(parse_options(argc, argv));
        if (cmd == "sweep") return command_sweep(parse_options(argc, argv));
        if (cmd == "variables") return command_variables(parse_options(argc, argv));
        fail_usage(fmt::format("unknown command '{}'", cmd));
    } catch (const UsageError& e) {
        fmt::print(stderr, "elyblock: {}\n\n{}", e.message, kUsage);
        return 2;
    } catch (const ModelError& e) {
        fmt::print(stderr, "elyblock: {}\n", e.message);
        return 1;
    }
}
