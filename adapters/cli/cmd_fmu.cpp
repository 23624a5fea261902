// elyblock fmu: packs a plant into an FMI 2.0 or 3.0 Co-Simulation FMU (adapters/fmi): the
// model description generated from the variable table, the FMU binary of that FMI version and
// the plant description under resources/.
#include <CLI/CLI.hpp>
#include <unistd.h>

#include <cstdio>
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
    std::string config, output, model_identifier, binaries, windows_binaries;
    bool no_windows = false;
    int fmi = 0;
};

// The folder of this program (/proc/self/exe), "" when it cannot be read.
fs::path program_folder() {
    std::error_code ec;
    const fs::path exe = fs::read_symlink("/proc/self/exe", ec);
    return ec ? fs::path() : exe.parent_path();
}

// The first of `folders` that holds `file`: its path, or "" with `where` naming the folders looked in.
std::string first_in(const std::vector<fs::path>& folders, const std::string& file, std::string& where) {
    where.clear();
    for (const fs::path& folder : folders) {
        std::error_code ec;
        if (fs::is_regular_file(folder / file, ec)) return (folder / file).lexically_normal().string();
        where += (where.empty() ? "" : ", ") + folder.lexically_normal().string();
    }
    if (where.empty()) where = "any folder";
    return "";
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
    std::string where;
    if (std::string found = first_in(folders, file, where); !found.empty()) return found;
    throw Failure{"the FMU binary " + file + " is not in " + where + " (give its folder with --binaries)"};
}

// The Windows build of the FMU binary (elyblock-fmi2.dll / elyblock-fmi3.dll, cross-built by
// scripts/windows): --windows-binaries, else $ELYBLOCK_FMU_WINDOWS_BINARIES, else beside the Linux
// binaries given with --binaries, else beside the installed program (<prefix>/<libdir>/elyblock),
// else in the build tree's cross build (<build>/windows/adapters/fmi). "" when --no-windows or when
// none is found: the FMU then holds the Linux binary only, and `note` says so (for stderr).
std::string find_windows_binary(const FmuOptions& o, std::string& note) {
    if (o.no_windows) return "";
    const std::string file = "elyblock-fmi" + std::to_string(o.fmi) + ".dll";
    std::vector<fs::path> folders;
    bool explicit_folder = false;
    if (!o.windows_binaries.empty()) {
        folders.push_back(o.windows_binaries);
        explicit_folder = true;
    } else if (const char* env = std::getenv("ELYBLOCK_FMU_WINDOWS_BINARIES"); env && *env) {
        folders.push_back(env);
        explicit_folder = true;
    } else if (!o.binaries.empty()) {
        folders.push_back(o.binaries);
    } else if (const fs::path here = program_folder(); !here.empty()) {
        folders.push_back(here / ELY_FMU_INSTALL_RELATIVE);
        folders.push_back(here / "../../windows/adapters/fmi");
    }
    std::string where;
    if (std::string found = first_in(folders, file, where); !found.empty()) return found;
    if (explicit_folder) throw Failure{"the Windows FMU binary " + file + " is not in " + where};
    note = "elyblock fmu: no Windows binary (" + file + " is not in " + where +
           "): the FMU holds the Linux binary only; scripts/windows builds it, --windows-binaries DIR names its "
           "folder, --no-windows packs Linux only without this note\n";
    return "";
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
    std::string note;
    p.windows_binary_path = find_windows_binary(o, note);
    std::string identifier;
    try {
        identifier = elyfmi::package_fmu(p);
    } catch (const std::exception& e) {
        throw Failure{e.what()};
    }
    if (!note.empty()) std::fputs(note.c_str(), stderr);
    Output out;
    out.print("{}: FMI {}.0 Co-Simulation FMU, model identifier {}, binaries/{}{}{}\n", p.output_path, o.fmi, identifier,
              elyfmi::platform_folder(o.fmi), p.windows_binary_path.empty() ? "" : " and binaries/",
              p.windows_binary_path.empty() ? "" : elyfmi::windows_platform_folder(o.fmi));
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
                auto* windows = sub.add_option("--windows-binaries", o->windows_binaries,
                                               "folder holding the Windows builds elyblock-fmi2.dll and elyblock-fmi3.dll "
                                               "(default: beside the Linux ones, else the build tree's cross build)")
                                    ->type_name("DIR");
                sub.add_flag("--no-windows", o->no_windows, "pack the Linux binary only")->excludes(windows);
                sub.footer(
                    "The FMU carries the plant description in resources/plant.json; its structure (technology,\n"
                    "cells, stacks, area) comes from there, its tunable parameters can be set before initialization.\n"
                    "The Linux binary goes to binaries/linux64 (FMI 2) or binaries/x86_64-linux (FMI 3); the Windows\n"
                    "one, when found, to binaries/win64 or binaries/x86_64-windows.\n"
                    "Examples:\n  elyblock fmu examples/demo-plant.json --fmi 2 --output demo-plant.fmu\n"
                    "  elyblock fmu examples/demo-plant.json --fmi 3 --output demo-plant-fmi3.fmu");
                return [o] { return run(*o); };
            }};
}

}  // namespace elycli
