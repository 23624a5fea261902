#pragma once
// What every command that solves the plant takes: the plant description, --spec and --set, and
// how the spec is chosen when the command line names a drive input the plant's spec does not read.
#include <functional>
#include <memory>
#include <string>
#include <vector>

#include "block.hpp"

namespace CLI {
class App;
}

namespace elycli {

struct PlantOptions {
    std::string config;             // plant description (JSON file)
    std::string spec;               // --spec; empty: the plant description's own
    std::vector<std::string> sets;  // --set NAME=QUANTITY, in order
};

/// Declares the positional plant description, --spec and --set on a subcommand.
void add_plant_options(CLI::App& sub, PlantOptions& options);

/// An input a command varies itself (sweep --over): the option that names it and the name.
struct VariedInput {
    std::string option;
    std::string name;
};

/// Opens the plant, checks `varied` (an input of the plant), applies --spec and --set. A drive
/// input that the spec in force does not read (--set in.power on a current-density plant, or the
/// varied input) selects the spec that reads it when --spec is not given, and a note on stderr
/// says so; with --spec given, or two drive inputs of different specs, it is a UsageError.
std::unique_ptr<Block> open_plant(const PlantOptions& options, const std::string& command,
                                  const VariedInput& varied = {});

/// As above for a command that varies several inputs known only once the plant is open (fit: the
/// input columns of its data file): `varied_of` is called with the block before --spec and --set
/// are applied, and each input it returns is treated as `varied` above.
std::unique_ptr<Block> open_plant(const PlantOptions& options, const std::string& command,
                                  const std::function<std::vector<VariedInput>(const Block&)>& varied_of);

/// The variable of that name; UsageError "<option>: <library's message>" pointing at the
/// `variables` command when the plant has none.
const Variable& variable_named(const Block& block, const std::string& name, const std::string& option);

/// A note on standard error: "elyblock: <command>: <text>".
void note(const std::string& command, const std::string& text);

}  // namespace elycli
