// elyblock solve: one operating point, as a summary, the JSON report or CSV.
#include <CLI/CLI.hpp>
#include <elyblock/elyblock.h>
#include <memory>

#include "command.hpp"
#include "csv.hpp"
#include "errors.hpp"
#include "plant.hpp"
#include "summary.hpp"

namespace elycli {
namespace {

struct SolveOptions {
    PlantOptions plant;
    std::string format = "table";
    std::string units;
};

int run(const SolveOptions& o) {
    if (!o.units.empty() && o.format != "csv")
        throw UsageError{"--units: the table shows engineering units and the JSON report SI units; --units goes with "
                         "--format csv",
                         ""};
    const auto block = open_plant(o.plant, "solve");
    const int32_t status = check(ely_block_solve(block->handle()), "solve");
    // The warning text belongs to the solve; later calls replace the last-error message.
    const std::string warning = status == ELY_WARNING ? last_error() : "";
    Output out;
    if (o.format == "json") out.print("{}\n", buffer_text(&ely_block_report_json, block->handle(), "report"));
    else if (o.format == "csv") write_variables_csv(*block, out, o.units == "engineering" ? Units::engineering : Units::si);
    else write_summary(*block, out, warning);
    out.close();
    if (!warning.empty()) note("solve", "warning: " + warning);
    return kExitOk;
}

}  // namespace

Command command_solve() {
    return {"solve", "solve one operating point; print a summary (default), the JSON report or CSV",
            [](CLI::App& sub) -> std::function<int()> {
                auto o = std::make_shared<SolveOptions>();
                add_plant_options(sub, o->plant);
                sub.add_option("--format", o->format, "table (a readable summary), json (every variable, SI) or csv")
                    ->check(CLI::IsMember({"table", "json", "csv"}));
                sub.add_option("--units", o->units,
                               "units of the CSV: si (default) or engineering (the display units of the variable "
                               "table: degC, bar, kg/h, kWh/kg, ...)")
                    ->check(CLI::IsMember({"si", "engineering"}));
                sub.footer(
                    "Examples:\n"
                    "  elyblock solve plant.json\n"
                    "  elyblock solve plant.json --set in.current_density=\"1.5 A/cm2\" --set in.temperature=\"70 degC\"\n"
                    "  elyblock solve plant.json --spec power --set in.power=\"12 MW\" --format csv --units engineering\n"
                    "Setting the drive input of another spec (e.g. in.power) selects that spec unless --spec is given.\n"
                    "Exit status: 0 solved (alarms go to standard error), 1 the model or the output failed, 2 usage.");
                return [o] { return run(*o); };
            }};
}

}  // namespace elycli
