#pragma once
// The internal brine loop of a chlor-alkali membrane plant: resaturated brine fed to the
// anolyte, depleted brine leaving it (dechlorinated, resaturated and returned outside the
// block). The brine cell reports it as outputs of its own, for sizing the brine circuit.
#include <vector>

#include "cells/cell.hpp"

namespace ely {

/// stream.brine_feed.mass_flow, stream.depleted_brine.mass_flow,
/// stream.depleted_brine.nacl_mass_fraction.
const std::vector<VariableInfo>& brine_loop_outputs();

/// Their values from the anolyte salt and water balances, with feed brine of molality
/// `feed_molality` (mol/kg of water) and the result's depleted anolyte strength:
///   salt   m_in·W_in − m_out·W_out = NaCl consumed,
///   water  W_in − W_out = water carried to the catholyte with Na⁺ + vapour in the chlorine
///          − water formed at the anode by the back-migrated hydroxide (2·H2 made − water consumed).
void fill_brine_loop(const CellResult& result, const PlantFlows& flows, double feed_molality, double* values);

/// The same balances as plant totals, kg/s of water with their molalities (mol/kg of water).
struct BrineLoopFlows {
    double feed_water, feed_molality;          // resaturated brine fed to the anolyte
    double depleted_water, depleted_molality;  // depleted brine leaving it
};
BrineLoopFlows brine_loop_flows(const CellResult& result, const PlantFlows& flows, double feed_molality);

}  // namespace ely
