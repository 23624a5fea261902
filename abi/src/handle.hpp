#pragma once
// What the block calls of the C interface share beyond the handle (block_handle.hpp): the status of
// a solve or step, and the checks of a table of rows (a batch, a profile).
#include <algorithm>
#include <cstdint>
#include <cstring>
#include <limits>
#include <string>

#include "block_handle.hpp"
#include "elyblock/elyblock.h"
#include "guard.hpp"
#include "unit/block.hpp"

namespace ely::capi {

/// The status of a successful solve or step: a warning (with its message) when an alarm is raised.
inline int32_t finish_solve(const SolveOutcome& outcome) {
    if (outcome.warning) {
        set_last_error(outcome.message);
        return ELY_WARNING;
    }
    return ELY_OK;
}

/// The arrays of a table of rows (a batch's points, a profile's rows), checked before anything is
/// written, for every count, zero included: an index array is read whenever its count is positive
/// (its indices are checked even for zero rows), a data array whenever there is a row to read or
/// write; the arrays of n_rows rows must be addressable; input indices name inputs.
inline void check_table(const ely::Block& model, size_t n_rows, const char* rows_name, int32_t n_inputs,
                        const int32_t* input_indices, const double* inputs, int32_t n_outputs,
                        const int32_t* output_indices, const double* outputs, const int32_t* status,
                        const char* status_name) {
    if (n_inputs < 0)
        throw Error(ErrorKind::invalid_argument, "n_inputs is " + std::to_string(n_inputs) + "; it must not be negative");
    if (n_outputs < 0)
        throw Error(ErrorKind::invalid_argument, "n_outputs is " + std::to_string(n_outputs) + "; it must not be negative");
    if (n_inputs > 0) require_pointer(input_indices, "input_indices");
    if (n_outputs > 0) require_pointer(output_indices, "output_indices");
    if (n_rows > 0) {
        require_pointer(status, status_name);
        if (n_inputs > 0) require_pointer(inputs, "inputs");
        if (n_outputs > 0) require_pointer(outputs, "outputs");
    }
    const size_t row_bytes = std::max(sizeof(int32_t), sizeof(double) * static_cast<size_t>(std::max(n_inputs, n_outputs)));
    if (n_rows > std::numeric_limits<size_t>::max() / row_bytes)
        throw Error(ErrorKind::invalid_argument, std::string(rows_name) + " is " + std::to_string(n_rows) +
                                                     ": the value arrays would exceed the address space");
    for (int32_t i = 0; i < n_inputs; ++i) {
        const auto& info = model.variable(input_indices[i]);
        if (info.causality != Causality::input)
            throw Error(ErrorKind::invalid_argument, std::string("input_indices[") + std::to_string(i) + "] is '" +
                                                         info.name + "', which is not an input");
    }
    for (int32_t o = 0; o < n_outputs; ++o) model.variable(output_indices[o]);
}

}  // namespace ely::capi
