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

}  // namespace ely
