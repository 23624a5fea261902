#pragma once
// Plant description: stacks of cells, rectifier, auxiliaries, limits, alarms, degradation.
// Everything here is SI and already validated by the config layer (lib/config).
#include <memory>
#include <string>

#include "cells/cell.hpp"
#include "cells/custom.hpp"

namespace ely {

/// Which drive input the solve reads (config: operating.spec).
enum class Spec { current_density, current, power, hydrogen_rate, voltage };
const char* spec_name(Spec spec);

struct StackDesign {
    int cells = 100;          // cells in series per stack
    int stacks = 1;           // identical stacks in parallel
    double active_area = 0.1;  // m² per cell
};

/// Rectifier (AC → DC) losses: P_loss = P_rated·(a0 + a1·x + a2·x²), x = P_DC/P_rated, the
/// usual no-load / linear / quadratic split of converter losses (common practice).
struct Rectifier {
    double rated_power = 0;        // W DC per plant; 0 = sized to the stacks at maximum current density
    double loss_no_load = 0.005;   // of rated power (typical value, from memory)
    double loss_linear = 0.010;    // (typical value, from memory)
    double loss_quadratic = 0.015; // (typical value, from memory): ≈ 97 % at rated load
};

/// Auxiliary (balance-of-plant) power, AC: fixed + proportional to DC stack power.
struct Auxiliaries {
    double fixed = 0;           // W
    double proportional = 0.03; // of plant DC power (typical value, from memory)
};

struct Limits {
    double current_density_max = 0;  // A/m²; 0 = the cell model's own maximum
    double min_load_fraction = 0.1;  // of the maximum current density, below: alarm
    double temperature_max = 0;      // K; 0 = the cell model's envelope
};

/// Anode-gas purity alarms. Defaults: lower flammability limit of H2 in O2 ≈ 4 mol % (from
/// memory), trip at half of it, warning at a quarter (common practice).
struct Alarms {
    double h2_in_o2_warning = 0.01;
    double h2_in_o2_trip = 0.02;
    double lower_flammability_limit = 0.04;
};

/// Ageing: a cell-voltage rise per operating hour and an area-specific-resistance rise per
/// hour; both add to the ohmic part of the breakdown.
struct Degradation {
    double voltage_rate = 0;     // V/h per cell
    double resistance_rate = 0;  // Ω·m²/h
};

struct Thermal {
    double feed_temperature = 298.15;  // K, make-up water (or brine) entering the plant
    double heat_loss_coefficient = 0;  // W/K per stack, to ambient
    double ambient_temperature = 298.15;  // K
};

struct OperatingDefaults {
    Spec spec = Spec::current_density;
    double current_density = 1.0e4;  // A/m²
    double current = 0;              // A, DC, all stacks
    double power = 0;                // W, DC, all stacks
    double hydrogen_rate = 0;        // kg/s, plant
    double voltage = 0;              // V per cell
    double temperature = 353.15;     // K
    double pressure_cathode = 1.0e5; // Pa
    double pressure_anode = 1.0e5;   // Pa
    double hours_operated = 0;       // h
};

struct PlantDesign {
    std::string name;
    Technology technology = Technology::pem;
    StackDesign stack;
    Rectifier rectifier;
    Auxiliaries auxiliaries;
    Limits limits;
    Alarms alarms;
    Degradation degradation;
    Thermal thermal;
    OperatingDefaults operating;
    bool drag_water_returned = true;  // PEM: water dragged to the cathode is separated and returned
    /// Brine cells: NaCl mass fraction of the resaturated brine fed to the anolyte. Typical
    /// resaturated brine ≈ 300–310 g/L, about 26 wt % (common practice, from memory).
    double brine_feed_nacl_mass_fraction = 0.26;
    std::shared_ptr<const Cell> cell;  // the cell model (immutable after creation, shared by clones)
    std::shared_ptr<const CustomCellSpec> custom;  // the reaction table of a custom cell, else null
};

}  // namespace ely
