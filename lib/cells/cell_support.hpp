#pragma once
// Pieces the technology models share: reading switches and electrode kinetics from their
// parameter values, and the activation loss of one electrode.
#include <cstdint>

#include "cells/parameters.hpp"
#include "electrochem/kinetics.hpp"

namespace ely {

/// An integer switch parameter 0..max ("kinetics_model", ...): anything else is an error.
uint32_t read_choice(const ParameterValues& values, const char* key, int max);

/// Kinetics of one electrode from "<electrode>_exchange_current_density",
/// "<electrode>_activation_energy", "<electrode>_transfer_coefficient_forward|backward".
ElectrodeKinetics read_kinetics(const ParameterValues& values, const char* electrode, double reference_temperature);

/// Activation overpotential at j: Butler–Volmer solved exactly, or Tafel when `tafel`.
double activation_overpotential(const ElectrodeKinetics& kinetics, bool tafel, double current_density,
                                double temperature);

}  // namespace ely
