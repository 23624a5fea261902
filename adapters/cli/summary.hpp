#pragma once
// The readable summary of a solved plant: the technology's summary layout from the variable
// table (each variable's summary_group and summary_rank), labels and display units from the
// table, the alarms raised, and the cautions.
#include <string>
#include <vector>

#include "block.hpp"
#include "output.hpp"

namespace elycli {

/// The variables of the technology's summary layout, in its order (alarms included).
std::vector<const Variable*> summary_variables(const Block& block);

/// An alarm output (alarm.*), 0 or 1.
bool is_alarm(const Variable& v);

/// `warning`: the solve's warning message, "" when it returned ELY_OK.
void write_summary(const Block& block, Output& out, const std::string& warning);

/// What every summary ends with: the model is no safety system.
extern const char* const kCautions;

}  // namespace elycli
