#pragma once
// The one interface every cell technology implements. A cell turns an operating point into
// its voltage breakdown, Faraday efficiency, gas purities and the molar fluxes (per m² of
// active area) that leave each side — everything the unit layer needs for its balances.
//
// Sign conventions: current density j >= 0 in electrolysis; every loss term is >= 0; the
// voltage is the sum voltage = reversible + activation_anode + activation_cathode + ohmic
// + concentration, exactly (the cells compute the parts and add them, never back out one).
#include <array>
#include <cstddef>
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "base/variable_info.hpp"
#include "cells/parameters.hpp"
#include "electrochem/electrolyte.hpp"

namespace ely {

/// Components carried in the streams. Aqueous NaOH/NaCl are solutes of the brine cell.
enum Component : int { kH2 = 0, kO2, kH2O, kCl2, kNaOH, kNaCl, kComponentCount };
using Fluxes = std::array<double, kComponentCount>;  // mol/(m² s)

/// Shares of the half-reactions of a custom cell: a fixed-capacity list, so that evaluate()
/// allocates nothing. At most kMaxReactions reactions per electrode (the config checks it).
constexpr std::size_t kMaxReactions = 8;
class ReactionShares {
public:
    void assign(std::size_t n, double value);  // throws when n > 2·kMaxReactions
    std::size_t size() const { return count_; }
    bool empty() const { return count_ == 0; }
    double* data() { return values_.data(); }
    const double* data() const { return values_.data(); }
    double& operator[](std::size_t k) { return values_[k]; }
    double operator[](std::size_t k) const { return values_[k]; }
    double at(std::size_t k) const;  // throws out of range
    const double* begin() const { return values_.data(); }
    const double* end() const { return values_.data() + count_; }

private:
    std::array<double, 2 * kMaxReactions> values_;  // only the first count_ are set
    std::size_t count_ = 0;
};

struct OperatingPoint {
    double current_density;   // A/m² of active area, >= 0
    double temperature;       // K, stack (cell) temperature
    double pressure_anode;    // Pa, absolute
    double pressure_cathode;  // Pa, absolute
};

/// Validity envelope of a cell model. Outside [lo, hi]: error. Between the "recommended"
/// and hard limits: the result carries a warning flag (extrapolated).
struct Envelope {
    double temperature_min, temperature_max;          // K, hard
    double pressure_min, pressure_max;                // Pa, hard, each electrode
    double current_density_max;                       // A/m², hard
    double temperature_fit_min, temperature_fit_max;  // K, where the defaults were fitted
};

enum CellWarning : uint32_t {
    kWarnTemperatureExtrapolated = 1u << 0,  // outside the range of the fitted parameters
    kWarnNearLimitingCurrent = 1u << 1,      // j > 0.95 j_lim
    kWarnConcentrationExtrapolated = 1u << 2,
};

struct CellResult {
    // Voltages, V
    double voltage = 0;
    double reversible_voltage = 0;
    double thermoneutral_voltage = 0;
    double activation_anode = 0;
    double activation_cathode = 0;
    double ohmic = 0;
    double concentration = 0;
    double current_density = 0;  // A/m² (echo of the input)

    double faraday_efficiency = 1;  // hydrogen basis: H2 leaving in the cathode product / (j/2F)
    double h2_in_o2 = 0;            // mol/mol, dry anode gas (H2 in the main anode gas, Cl2 for brine)
    double o2_in_h2 = 0;            // mol/mol, dry cathode gas
    double o2_in_cl2 = 0;           // mol/mol, dry anode gas of brine cells: O2/(Cl2 + O2)

    // Dry products leaving each side and components taken from the feed, mol/(m² s).
    // Element balances over feed → cathode_out + anode_out close exactly (tested).
    Fluxes cathode_out{};
    Fluxes anode_out{};
    Fluxes consumed{};

    // Wet gases leave saturated at stack temperature over an electrolyte of this water
    // activity (liquid-electrolyte cells); solid oxide carries its steam in cathode_out and
    // sets gases_saturated = false.
    bool gases_saturated = true;
    double water_activity_anode = 1;
    double water_activity_cathode = 1;
    double water_drag = 0;  // mol/(m² s) of liquid water carried anode → cathode (PEM)

    // Brine cells: current efficiencies of caustic and chlorine; 1 for the others.
    double caustic_efficiency = 1;
    double chlorine_efficiency = 1;
    double caustic_mass_fraction = 0;  // catholyte NaOH strength, kg/kg
    double anolyte_nacl_molality = 0;  // depleted anolyte brine strength, mol/kg of water

    // Solid oxide: mol of sweep air entering the oxygen electrode per mol of O2 made (0: no sweep, the
    // anode gas is the oxygen made).
    double oxygen_electrode_sweep = 0;

    // Custom cells: the enthalpy flow of the reactions' species outside the component list (ions, metals,
    // melts; products positive, reactants negative) at the cell temperature, W/m²; and, for a table without
    // enthalpy data, that the heat must come from the thermoneutral voltage, N·I·(V − E_tn).
    double other_species_enthalpy = 0;
    bool heat_from_thermoneutral_voltage = false;

    uint32_t warnings = 0;  // CellWarning bits

    // Custom cells: one entry per half-reaction, its share of its electrode's current.
    ReactionShares reaction_current_efficiency;
};

/// Plant totals the unit layer hands a cell for the outputs the cell adds (all cells of all
/// stacks): what leaves each side and what is consumed, mol/s, and the water moving with them.
struct PlantFlows {
    double active_area = 0;  // m², all cells of all stacks
    Fluxes cathode{}, anode{}, consumed{};
    double anode_vapour = 0;  // mol/s of water vapour in the wet anode gas
    double drag = 0;          // mol/s of liquid water carried anode → cathode
};

/// A salt solution a cell takes in or gives off besides its products, plant totals in mol/s: the brine
/// cell's resaturated brine (in) and depleted brine (out). The unit layer's energy balance counts each at
/// its composition (heats of mixing included): an inlet at the feed temperature, an outlet at the stack
/// temperature. The water of an inlet is part of feed.water (the plant's net make-up), that of an outlet
/// is returned to it.
struct SolutionStream {
    AqueousSalt salt;
    double water;   // mol/s
    double solute;  // mol/s
    bool inlet;
};
struct SolutionStreams {
    std::array<SolutionStream, 2> streams{};
    int count = 0;
};

class Cell {
public:
    virtual ~Cell() = default;
    virtual const Envelope& envelope() const = 0;
    /// Throws ely::Error for a point outside the hard envelope (naming the limit) and for a
    /// current density at or above the limiting current density.
    virtual CellResult evaluate(const OperatingPoint& point) const = 0;
    virtual std::unique_ptr<Cell> clone() const = 0;
    /// Largest current density the model accepts at this temperature/pressure, A/m².
    virtual double current_density_limit(const OperatingPoint& point) const = 0;
    /// Smallest positive current density the model accepts (where the gas produced still
    /// exceeds the gas crossing the separator), A/m²; a hint, 0 when there is no such limit.
    /// Between 0 (open circuit, always accepted) and this value evaluate() throws.
    virtual double current_density_minimum(const OperatingPoint&) const { return 0.0; }

    /// Outputs this cell adds to the block's variables beyond the common table (a brine cell's
    /// brine loop, a custom cell's reaction shares): descriptions valid while the cell lives,
    /// the same for every cell built from one plant description.
    virtual const std::vector<VariableInfo>& own_outputs() const;
    /// Their values at a result, in own_outputs() order; allocates nothing.
    virtual void fill_own_outputs(const CellResult& result, const PlantFlows& flows, double* values) const;
    /// The salt solutions the cell exchanges at a result (none by default); allocates nothing.
    virtual void solution_streams(const CellResult& result, const PlantFlows& flows, SolutionStreams& out) const;
};

/// Checks a point against an envelope: throws out_of_range naming the limit; returns the
/// extrapolation warning bits for the soft limits.
uint32_t check_envelope(const Envelope& envelope, const OperatingPoint& point, const char* model);

}  // namespace ely
