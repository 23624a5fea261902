// elyblock, the command line: a client of the public C interface only (elyblock/elyblock.h).
// The subcommands live in cmd_<name>.cpp and are listed in command_list.hpp; this file builds the
// CLI11 program from them, runs the chosen one and turns every failure into a message and an
// exit status: 0 ok, 1 the model or the output failed, 2 the command line is wrong.
#include <CLI/CLI.hpp>
#include <elyblock/elyblock.h>
#include <fmt/format.h>

#include <cstdio>
#include <exception>
#include <sstream>
#include <utility>
#include <vector>

#include "command.hpp"
#include "command_list.hpp"
#include "errors.hpp"
#include "output.hpp"
#include "version.hpp"

namespace elycli {
#define ELYBLOCK_DECLARE_COMMAND(name) Command command_##name();
ELYBLOCK_COMMANDS(ELYBLOCK_DECLARE_COMMAND)
#undef ELYBLOCK_DECLARE_COMMAND
}  // namespace elycli

namespace {

using namespace elycli;

void print_error(const std::string& message) { std::fprintf(stderr, "elyblock: %s\n", message.c_str()); }

// "elyblock solve" for the subcommand being parsed, "elyblock" before one is known.
std::string command_path(const CLI::App& app) {
    const auto chosen = app.get_subcommands();
    return chosen.empty() ? "elyblock" : "elyblock " + chosen.front()->get_name();
}

// CLI11's own errors: help and --version are written to standard output (checked like any
// output); a usage error is one line naming the problem and where to get help.
int parse_error(const CLI::App& app, const CLI::ParseError& e) {
    if (e.get_exit_code() == static_cast<int>(CLI::ExitCodes::Success)) {
        std::ostringstream text, ignored;
        app.exit(e, text, ignored);
        Output out;
        out.write(text.str());
        out.close();
        close_standard_output();
        return kExitOk;
    }
    const std::string path = command_path(app);
    print_error(fmt::format("{}{} (see '{} --help')", path == "elyblock" ? "" : path.substr(9) + ": ", e.what(), path));
    return kExitUsage;
}

int run(int argc, char** argv) {
    CLI::App app{"elyblock: an electrolyzer as one block (PEM, alkaline, AEM, solid oxide, brine, custom cells).\n"
                 "Values on the command line take units as in a plant description (\"2 A/cm2\", \"80 degC\")."};
    app.name("elyblock");
    app.set_version_flag("--version", version_text(), "print the version and exit");
    app.require_subcommand(1);
    app.footer("Run 'elyblock <command> --help' for the options of a command. Plant descriptions: docs/config.md;\n"
               "variables: docs/variables.md. Exit status: 0 ok, 1 the model or the output failed, 2 usage.");
    std::vector<std::pair<CLI::App*, std::function<int()>>> commands;
#define ELYBLOCK_COMMAND_ENTRY(name) command_##name(),
    for (const Command& c : {ELYBLOCK_COMMANDS(ELYBLOCK_COMMAND_ENTRY)}) {
#undef ELYBLOCK_COMMAND_ENTRY
        CLI::App* sub = app.add_subcommand(c.name, c.description);
        commands.emplace_back(sub, c.setup(*sub));
    }
    // A first word that is no option and no command: name it (CLI11 would only say that a
    // command is required).
    if (argc > 1 && argv[1][0] != '-') {
        const std::string word = argv[1];
        std::string known;
        bool found = false;
        for (const auto& [sub, command] : commands) {
            known += (known.empty() ? "" : ", ") + sub->get_name();
            found = found || sub->get_name() == word;
        }
        if (!found) {
            print_error(fmt::format("unknown command '{}'; the commands are {} (see 'elyblock --help')", word, known));
            return kExitUsage;
        }
    }
    try {
        app.parse(argc, argv);
    } catch (const CLI::ParseError& e) {
        return parse_error(app, e);
    }
    for (const auto& [sub, command] : commands) {
        if (!sub->parsed()) continue;
        try {
            const int status = command();
            close_standard_output();
            return status;
        } catch (const UsageError& e) {
            print_error(fmt::format("{}: {} ({})", sub->get_name(), e.message,
                                    e.hint.empty() ? fmt::format("see 'elyblock {} --help'", sub->get_name()) : e.hint));
            return kExitUsage;
        } catch (const Failure& e) {
            print_error(fmt::format("{}: {}", sub->get_name(), e.message));
            return kExitFailure;
        }
    }
    return kExitUsage;  // require_subcommand(1) makes this unreachable
}

}  // namespace

int main(int argc, char** argv) {
    if (ely_abi_version() != ELY_ABI_VERSION) {
        std::fprintf(stderr, "elyblock: library ABI %d does not match header ABI %d\n", static_cast<int>(ely_abi_version()),
                     ELY_ABI_VERSION);
        return kExitFailure;
    }
    // Nothing escapes main: a failure writing help or a version, memory running out, a bug.
    try {
        return run(argc, argv);
    } catch (const Failure& e) {
        print_error(e.message);
    } catch (const std::bad_alloc&) {
        print_error("out of memory");
    } catch (const std::exception& e) {
        print_error(fmt::format("internal error: {}", e.what()));
    } catch (...) {
        print_error("internal error: unknown exception");
    }
    return kExitFailure;
}
