// elyblock fmu: packs a plant into an FMI 2.0 or 3.0 Co-Simulation FMU (adapters/fmi): the
// model description generated from the variable table, the FMU binary of that FMI version and
// the plant description under resources/.
#include <CLI/CLI.hpp>
#include <unistd.h>

#include <cstdlib>
#include <filesystem>
#include <memory>
#include <string>
#include <system_error>
#include <vector>

#include "command.hpp"
#include "errors.hpp"
#include "output.hpp"
#include "package.hpp"
#include "variables.hpp"

#ifndef ELY_FMU_INSTALL_RELATIVE
#define ELY_FMU_INSTALL_RELATIVE "../lib/elyblock"
#endif

namespace elycli {
namespace {

namespace fs = std::filesystem;

struct FmuOptions {
    std::string config, output, model_identifier, binaries;
    int fmi = 0;
};

// The folder of this program (/proc/self/exe), "" when it cannot be read.
fs::path program_folder() {
    std::error_code ec;
    const fs::path exe = fs::read_symlink("/proc/self/exe", ec);
    return ec ? fs::path() : exe.parent_path();
}

// The FMU binary of an FMI version: --binaries, else $ELYBLOCK_FMU_BINARIES, else beside the
// installed program (<prefix>/<libdir>/elyblock), else in the build tree (adapters/fmi).
std::string find_binary(const FmuOptions& o) {
    const std::string file = "elyblock-fmi" + std::to_string(o.fmi) + ".so";
    std::vector<fs::path> folders;
    if (!o.binaries.empty()) {
        folders.push_back(o.binaries);
    } else if (const char* env = std::getenv("ELYBLOCK_FMU_BINARIES"); env && *env) {
        folders.push_back(env);
    } else if (const fs::path here = program_folder(); !here.empty()) {
        folders.push_back(here / ELY_FMU_INSTALL_RELATIVE);
        folders.push_back(here / "../fmi");
    }
    std::string looked;
    for (const fs::path& folder : folders) {
        std::error_code ec;
        if (fs::is_regular_file(folder / file, ec)) return (folder / file).lexically_normal().string();
        looked += (looked.empty() ? "" : ", ") + folder.lexically_normal().string();
    }
    throw Failure{"the FMU binary " + file + " is not in " + (looked.empty() ? std::string("any folder") : looked) +
                  " (give its folder with --binaries)"};
}

int run(const FmuOptions& o) {
    if (!o.model_identifier.empty() && elyfmi::model_identifier_from(o.model_identifier) != o.model_identifier)
        throw UsageError{"--model-identifier: " + o.model_identifier +
                             " is not a C identifier (letters, digits and '_', not starting with a digit)",
                         ""};
    elyfmi::PackageOptions p;
    p.fmi_version = o.fmi;
    p.plant_path = o.config;
    p.model_identifier = o.model_identifier;
    p.output_path = o.output.empty() ? fs::path(o.config).stem().string() + ".fmu" : o.output;
    p.binary_path = find_binary(o);
    std::string identifier;
    try {
        identifier = elyfmi::package_fmu(p);
    } catch (const std::exception& e) {
        throw Failure{e.what()};
    }
    Output out;
    out.print("{}: FMI {}.0 Co-Simulation FMU, model identifier {}, binaries/{}\n", p.output_path, o.fmi, identifier,
              elyfmi::platform_folder(o.fmi));
    out.close();
    return kExitOk;
}

}  // namespace

Command command_fmu() {
    return {"fmu", "pack a plant into an FMI 2.0 or 3.0 co-simulation FMU", [](CLI::App& sub) -> std::function<int()> {
                auto o = std::make_shared<FmuOptions>();
                sub.add_option("config", o->config, "plant description, a JSON file (docs/config.md)")
                    ->required()
                    ->type_name("PLANT.json");
                sub.add_option("--fmi", o->fmi, "FMI version: 2 (FMI 2.0) or 3 (FMI 3.0)")
                    ->required()
                    ->check(CLI::IsMember({2, 3}))
                    ->type_name("2|3");
                sub.add_option("--output,-o", o->output, "the FMU to write (default: PLANT.fmu in the current folder)")
                    ->type_name("FILE.fmu");
                sub.add_option("--model-identifier", o->model_identifier,
                               "name of the FMU's binary and its C identifier (default: from the plant file's name)")
                    ->type_name("NAME");
                sub.add_option("--binaries", o->binaries,
                               "folder holding elyblock-fmi2.so and elyblock-fmi3.so (default: the installed ones)")
                    ->type_name("DIR");
                sub.footer(
                    "The FMU carries the plant description in resources/plant.json; its structure (technology,\n"
                    "cells, stacks, area) comes from there, its tunable parameters can be set before initialization.\n"
                    "Examples:\n  elyblock fmu examples/demo-plant.json --fmi 2 --output demo-plant.fmu\n"
                    "  elyblock fmu examples/demo-plant.json --fmi 3 --output demo-plant-fmi3.fmu");
                return [o] { return run(*o); };
            }};
}

}  // namespace elycli
