#include "cells/brine/brine_loop.hpp"

#include "thermo/constants.hpp"
#include "electrochem/electrolyte.hpp"

namespace ely {

const std::vector<VariableInfo>& brine_loop_outputs() {
    static const std::vector<VariableInfo> outputs = {
        describe("stream.brine_feed.mass_flow", "kg/s", Causality::output,
                 "resaturated brine fed to the anolyte (internal brine loop; the net feeds are feed.salt and "
                 "feed.water)")
            .at_least(0)
            .scaled(1.0)
            .labelled("brine fed to the anolyte")
            .shown_in(display::kg_per_h),
        describe("stream.depleted_brine.mass_flow", "kg/s", Causality::output,
                 "depleted brine leaving the anolyte (internal brine loop)")
            .at_least(0)
            .scaled(1.0)
            .labelled("depleted brine leaving")
            .shown_in(display::kg_per_h),
        describe("stream.depleted_brine.nacl_mass_fraction", "1", Causality::output,
                 "NaCl mass fraction of the depleted brine")
            .within(0, 1)
            .scaled(0.2)
            .labelled("depleted brine NaCl")
            .shown_in(display::percent),
    };
    return outputs;
}

BrineLoopFlows brine_loop_flows(const CellResult& c, const PlantFlows& f, double m_in) {
    const double m_out = c.anolyte_nacl_molality;
    const double formed = 2.0 * f.cathode[kH2] - f.consumed[kH2O];
    const double water_out_kg = (f.drag + f.anode_vapour - formed) * molar_mass::H2O;  // kg/s
    const double feed_water_kg = (f.consumed[kNaCl] - m_out * water_out_kg) / (m_in - m_out);
    return {feed_water_kg, m_in, feed_water_kg - water_out_kg, m_out};
}

void fill_brine_loop(const CellResult& c, const PlantFlows& f, double m_in, double* values) {
    const BrineLoopFlows loop = brine_loop_flows(c, f, m_in);
    values[0] = loop.feed_water * (1.0 + loop.feed_molality * molar_mass::NaCl);
    values[1] = loop.depleted_water * (1.0 + loop.depleted_molality * molar_mass::NaCl);
    values[2] = mass_fraction_from_molality(loop.depleted_molality, molar_mass::NaCl);
}

}  // namespace ely
