// elyblock variables: the plant's variables (from the variable table through ely_variable_info).
#include <CLI/CLI.hpp>
#include <memory>

#include "command.hpp"
#include "errors.hpp"
#include "output.hpp"
#include "plant.hpp"

namespace elycli {
namespace {

int run(const std::string& config) {
    const Block block(config);
    Output out;
    for (const auto& v : block.variables()) {
        const char* causality = v.is_input() ? "input" : v.is_output() ? "output" : "parameter";
        out.print("{:<40} {:<12} {:<9}{} {}\n", v.info.name, v.info.unit, causality, v.is_tunable() ? " (tunable)" : "",
                  v.info.description);
    }
    out.close();
    return kExitOk;
}

}  // namespace

Command command_variables() {
    return {"variables", "list the plant's variables: name, SI unit, causality, description",
            [](CLI::App& sub) -> std::function<int()> {
                auto config = std::make_shared<std::string>();
                sub.add_option("config", *config, "plant description, a JSON file (docs/config.md)")
                    ->required()
                    ->type_name("PLANT.json");
                sub.footer("Inputs (in.*) and tunable parameters can be given with solve/sweep --set; outputs are read.");
                return [config] { return run(*config); };
            }};
}

}  // namespace elycli
