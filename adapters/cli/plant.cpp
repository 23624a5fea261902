#include "plant.hpp"

#include <CLI/CLI.hpp>
#include <cstdio>
#include <fmt/format.h>

#include "errors.hpp"
#include "quantities.hpp"

namespace elycli {

void add_plant_options(CLI::App& sub, PlantOptions& o) {
    sub.add_option("config", o.config, "plant description, a JSON file (docs/config.md)")
        ->required()
        ->type_name("PLANT.json");
    sub.add_option("--spec", o.spec,
                   "which drive input the solve reads: current_density, current, power, hydrogen_rate or voltage "
                   "(default: the plant description's operating.spec)")
        ->type_name("SPEC");
    sub.add_option("--set", o.sets,
                   "set an input or a tunable parameter before solving; QUANTITY as in a plant description: "
                   "\"2 A/cm2\", \"80 degC\", \"30 bar\", or a number in SI units (repeatable)")
        ->type_name("NAME=QUANTITY")
        ->expected(1)
        ->multi_option_policy(CLI::MultiOptionPolicy::TakeAll);
}

void note(const std::string& command, const std::string& text) {
    std::fprintf(stderr, "elyblock: %s: %s\n", command.c_str(), text.c_str());
}

const Variable& variable_named(const Block& block, const std::string& name, const std::string& option) {
    if (const Variable* v = block.find(name)) return *v;
    int32_t index = -1;
    const std::string why = ely_block_find(block.handle(), name.c_str(), &index) < 0
                                ? last_error()
                                : fmt::format("unknown variable '{}'", name);
    throw UsageError{fmt::format("{}: {}", option, why),
                     fmt::format("see 'elyblock variables {}' for the plant's variables", block.config_path())};
}

namespace {

// Whether `spec` is a spec the library knows; the block's spec is left as it was.
bool is_spec(Block& block, const std::string& spec) {
    const std::string before = block.spec();
    if (!block.try_set_spec(spec)) return false;
    block.try_set_spec(before);
    return true;
}

// The spec whose drive input `name` is, or "" when it is no drive input.
std::string spec_reading(Block& block, const Variable& v) {
    const std::string name = v.info.name;
    if (!v.is_input() || name.rfind("in.", 0) != 0) return {};
    const std::string spec = name.substr(3);
    return drive_input_of(spec) == name && is_spec(block, spec) ? spec : std::string();
}

// "sweeping", "fitting", "solving": what the command does with the spec it chose.
std::string doing(const std::string& command) {
    if (command == "sweep") return "sweeping";
    if (command == "fit") return "fitting";
    return "solving";
}

struct DriveRequest {
    std::string by;    // "--set in.power", "--over in.current_density"
    std::string spec;  // the spec that reads it
};

void choose_spec(Block& block, const PlantOptions& o, const std::string& command,
                 const std::vector<DriveRequest>& requests) {
    const std::string in_force = block.spec();
    const DriveRequest* wanted = nullptr;
    for (const auto& r : requests) {
        if (r.spec == in_force) continue;
        if (!o.spec.empty())
            throw UsageError{fmt::format("{}: --spec {} does not read {}; give --spec {}, or leave --spec out", r.by,
                                         in_force, drive_input_of(r.spec), r.spec),
                             ""};
        if (wanted && wanted->spec != r.spec)
            throw UsageError{fmt::format("{} and {} are drive inputs of two specs ({}, {}); a solve reads one: "
                                         "choose it with --spec",
                                         wanted->by, r.by, wanted->spec, r.spec),
                             ""};
        wanted = &r;
    }
    if (!wanted) return;
    for (const auto& r : requests)  // the spec in force is read by one request, the other wants another
        if (r.spec == in_force)
            throw UsageError{fmt::format("{} and {} are drive inputs of two specs ({}, {}); a solve reads one: "
                                         "choose it with --spec",
                                         r.by, wanted->by, r.spec, wanted->spec),
                             ""};
    check(ely_block_set_spec(block.handle(), wanted->spec.c_str()), "spec");
    note(command, fmt::format("the plant's spec {} does not read {}; {} with spec {} (choose one with --spec)",
                              in_force, drive_input_of(wanted->spec), doing(command),
                              wanted->spec));
}

}  // namespace

std::unique_ptr<Block> open_plant(const PlantOptions& o, const std::string& command, const VariedInput& varied) {
    return open_plant(o, command, [&varied](const Block&) {
        return varied.name.empty() ? std::vector<VariedInput>{} : std::vector<VariedInput>{varied};
    });
}

std::unique_ptr<Block> open_plant(const PlantOptions& o, const std::string& command,
                                  const std::function<std::vector<VariedInput>(const Block&)>& varied_of) {
    auto block = std::make_unique<Block>(o.config);
    const std::vector<VariedInput> varied = varied_of(*block);
    std::vector<DriveRequest> requests;
    for (const VariedInput& in : varied) {
        const Variable& v = variable_named(*block, in.name, in.option);
        if (!v.is_input())
            throw UsageError{fmt::format("{}: '{}' is {}; {} an input: {}", in.option, in.name,
                                         v.is_output() ? "an output" : "a parameter", command,
                                         block->names_where([](const Variable& x) { return x.is_input(); })),
                             ""};
        const std::string spec = spec_reading(*block, v);
        if (!spec.empty()) requests.push_back({in.option + " " + in.name, spec});
    }
    if (!o.spec.empty() && !block->try_set_spec(o.spec)) throw UsageError{"--spec: " + last_error(), ""};
    for (const auto& assignment : o.sets) {
        const auto eq = assignment.find('=');
        if (eq == std::string::npos || eq == 0)
            throw UsageError{fmt::format("--set: expected NAME=QUANTITY (e.g. in.temperature=\"80 degC\"), got '{}'",
                                         assignment),
                             ""};
        const std::string name = assignment.substr(0, eq);
        const std::string option = "--set " + name;
        const Variable& v = variable_named(*block, name, "--set");
        if (v.is_output())
            throw UsageError{fmt::format("{}: '{}' is an output; set an input (in.…) or a tunable parameter (param.…)",
                                         option, name),
                             ""};
        for (const VariedInput& in : varied)
            if (name == in.name) throw UsageError{fmt::format("{}: {} already varies it", option, in.option), ""};
        const double value = read_quantity(assignment.substr(eq + 1), v.info.unit, option);
        if (ely_block_set(block->handle(), v.index, value) < 0) throw UsageError{option + ": " + last_error(), ""};
        const std::string spec = spec_reading(*block, v);
        if (!spec.empty()) requests.push_back({option, spec});
    }
    choose_spec(*block, o, command, requests);
    return block;
}

}  // namespace elycli
