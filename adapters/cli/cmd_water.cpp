// elyblock water: reversible and thermoneutral voltage of water splitting with liquid feed.
#include <CLI/CLI.hpp>
#include <elyblock/elyblock.h>
#include <memory>

#include "command.hpp"
#include "errors.hpp"
#include "output.hpp"
#include "quantities.hpp"

namespace elycli {
namespace {

struct WaterOptions {
    std::string temperature, pressure_anode, pressure_cathode;
};

int run(const WaterOptions& o) {
    const double t = read_quantity(o.temperature, "K", "temperature");
    const double pa = read_quantity(o.pressure_anode, "Pa", "anode pressure");
    const double pc = read_quantity(o.pressure_cathode, "Pa", "cathode pressure");
    double p_sat = 0, e_rev = 0, e_tn = 0;
    check(ely_water_saturation_pressure(t, &p_sat), "water");
    check(ely_water_electrolysis_voltages(t, pa, pc, &e_rev, &e_tn), "water");
    Output out;
    out.print("water vapour pressure  {:.2f} Pa\nreversible voltage     {:.5f} V\nthermoneutral voltage  {:.5f} V (HHV)\n",
              p_sat, e_rev, e_tn);
    out.close();
    return kExitOk;
}

}  // namespace

Command command_water() {
    return {"water", "reversible and thermoneutral voltage of water splitting with liquid feed (IAPWS-IF97)",
            [](CLI::App& sub) -> std::function<int()> {
                auto o = std::make_shared<WaterOptions>();
                sub.add_option("temperature", o->temperature, "stack temperature: \"80 degC\", or a number in K")
                    ->required()
                    ->type_name("QUANTITY");
                sub.add_option("anode_pressure", o->pressure_anode, "absolute: \"1.5 bar\", or a number in Pa")
                    ->required()
                    ->type_name("QUANTITY");
                sub.add_option("cathode_pressure", o->pressure_cathode, "absolute: \"30 bar\", or a number in Pa")
                    ->required()
                    ->type_name("QUANTITY");
                sub.footer("Example:\n  elyblock water \"80 degC\" \"1 bar\" \"30 bar\"");
                return [o] { return run(*o); };
            }};
}

}  // namespace elycli
