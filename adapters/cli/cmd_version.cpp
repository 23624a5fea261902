// elyblock version (also `elyblock --version`).
#include <CLI/CLI.hpp>

#include "command.hpp"
#include "errors.hpp"
#include "output.hpp"
#include "version.hpp"

namespace elycli {

Command command_version() {
    return {"version", "print the version of the command line and of the library it runs on",
            [](CLI::App&) -> std::function<int()> {
                return [] {
                    Output out;
                    out.print("{}\n", version_text());
                    out.close();
                    return kExitOk;
                };
            }};
}

}  // namespace elycli
