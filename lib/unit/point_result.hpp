#pragma once
// Everything the plant computes at one current density, shared by the parts of the block
// (spec_solve.cpp evaluates it, streams.cpp and alarms.cpp fill the outputs from it).
#include "unit/block.hpp"

namespace ely {

struct Block::PointResult {
    CellResult cell;
    double degradation = 0;  // V, added to the cell's ohmic part
    double temperature = 0, p_anode = 0, p_cathode = 0, feed_temperature = 0;
    double area_total = 0;  // m², all cells of all stacks
    Fluxes cathode{}, anode{}, consumed{};  // plant totals, mol/s
    double stack_current = 0, stack_voltage = 0, stack_power = 0;
};

/// The plant's streams at one point, mol/s; index 0 the cathode side, 1 the anode side.
struct Block::PlantStreams {
    Fluxes gas[2]{};              // dry gas leaving each side (sweep oxygen included), water entry unused
    double nitrogen[2]{};         // sweep nitrogen (anode side)
    double dry[2]{};              // total dry gas
    double vapour_stack[2]{};     // water vapour (or steam) with it, leaving the stacks at T
    double vapour_out[2]{};       // left after the gas cooler
    double condensate[2]{};       // condensed in the gas cooler, returned
    double t_out[2]{};            // K, gas cooler outlet
    double p_sat_stack = 0, p_sat_cool = 0;  // Pa, water vapour pressure at the stack and cooler temperatures
    double drag = 0, drain = 0;   // water carried to the cathode; of it, leaving the plant
    double caustic_water = 0;     // water of the caustic solution (brine)
    double makeup = 0;            // feed.water
    double steam_fed = 0;         // steam entering the stacks (steam-fed cells)
    double sweep_air = 0;         // air swept over the oxygen electrode
    SolutionStreams solutions;    // the cell's salt solutions
    PlantFlows flows;             // the totals the cell's own outputs and solutions are computed from
};

}  // namespace ely
