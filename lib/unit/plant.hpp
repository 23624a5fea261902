#pragma once
// Plant description: the technology and its cell model, the stacks, and the configured values
// of every input and parameter of the variable table (rectifier, auxiliaries, limits, alarms,
// degradation, heat loss, the initial operating point). Everything is SI and validated by the
// config layer (lib/config); the units, limits and defaults are the variable table's.
#include <array>
#include <memory>
#include <string>

#include "cells/cell.hpp"
#include "cells/custom.hpp"
#include "cells/parameters.hpp"
#include "cells/registry.hpp"
#include "unit/variables.hpp"

namespace ely {

struct PlantDesign {
    PlantDesign();

    std::string name;
    const TechnologyInfo* technology = nullptr;
    Spec spec = Spec::current_density;
    /// The value of each input and parameter of the variable table, by Var: the configured one,
    /// else the table's default (NaN where there is none: a drive input never given). NaN for outputs.
    std::array<double, kVarCount> configured;
    bool drag_water_returned = true;  // water dragged to the cathode is separated and returned (PEM)

    /// The cell model (immutable, shared by clones of a block) and the parameter values it was
    /// built from (null for a technology built from a reaction table).
    std::shared_ptr<const Cell> cell;
    std::shared_ptr<const ParameterValues> cell_parameters;
    std::shared_ptr<const CustomCellSpec> custom;  // the reaction table of a custom cell, else null
    /// The JSON text the description was read from (null when built otherwise); a calibrated
    /// plant description is this text with the fitted values written in (lib/calibration).
    std::shared_ptr<const std::string> source_json;

    int cells() const { return static_cast<int>(configured[par_cells]); }
    int stacks() const { return static_cast<int>(configured[par_stacks]); }
    double active_area() const { return configured[par_active_area]; }
};

/// The alarm levels keep their order, warning < trip < lower flammability limit (values of
/// par_alarms_h2_in_o2_warning, _trip, _lower_flammability_limit): throws invalid_argument
/// naming the keys and variables otherwise. The config and Block::set both check with it.
void check_alarm_levels(double warning, double trip, double lower_flammability_limit);

}  // namespace ely
