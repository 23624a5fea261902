#pragma once
// A subcommand of `elyblock`. Each lives in its own file cmd_<name>.cpp, which defines
//
//     elycli::Command elycli::command_<name>();
//
// and is registered by one line in command_list.hpp. `setup` declares the subcommand's options
// on the CLI11 subcommand it is given (CLI11 then parses them, prints `elyblock <name> --help`
// and reports usage errors) and returns the function that runs the command once the whole
// command line has parsed; that function returns the exit status (errors.hpp: kExitOk, or throws
// UsageError / Failure). Options shared by the commands that solve a plant: plant.hpp.
#include <functional>
#include <string>

namespace CLI {
class App;
}

namespace elycli {

struct Command {
    std::string name;         // the word after `elyblock`
    std::string description;  // one line in `elyblock --help`
    std::function<std::function<int()>(CLI::App& sub)> setup;
};

}  // namespace elycli
