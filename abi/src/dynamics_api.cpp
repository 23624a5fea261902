// The dynamic calls of the C interface: reset, advance, time, saved states, profiles and the run
// summary, thin wrappers over ely::Block (lib/unit/dynamics*.cpp), each inside guard().
#include <algorithm>
#include <cmath>
#include <limits>
#include <string>
#include <string_view>

#include "elyblock/elyblock.h"
#include "elyblock_version.h"
#include "block_handle.hpp"
#include "guard.hpp"
#include "handle.hpp"

namespace {
using ely::Error;
using ely::ErrorKind;
using ely::capi::finish_solve;
using ely::capi::guard;
using ely::capi::require_pointer;

#define ELY_STRINGIFY2(x) #x
#define ELY_STRINGIFY(x) ELY_STRINGIFY2(x)
/// Who saved a state: a state restores only into the library and ABI that wrote it.
constexpr std::string_view kProducer = "elyblock " ELYBLOCK_VERSION_STRING " ABI " ELY_STRINGIFY(ELY_ABI_VERSION);

[[noreturn]] void bad(const std::string& message) { throw Error(ErrorKind::invalid_argument, message); }
}  // namespace

extern "C" {

ELY_API int32_t ely_block_reset(ely_block* block, double start_time_s) {
    return guard([&] {
        require_pointer(block, "block");
        return finish_solve(block->model.reset(start_time_s));
    });
}

ELY_API int32_t ely_block_advance(ely_block* block, double step_s) {
    return guard([&] {
        require_pointer(block, "block");
        return finish_solve(block->model.advance(step_s));
    });
}

ELY_API int32_t ely_block_time(const ely_block* block, double* time_s) {
    return guard([&] {
        require_pointer(block, "block");
        require_pointer(time_s, "time_s");
        *time_s = block->model.time();
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_save_state(const ely_block* block, void* buffer, size_t capacity, size_t* length) {
    return guard([&] {
        require_pointer(block, "block");
        require_pointer(length, "length");
        ely::capi::copy_bytes(block->model.save_state(kProducer), buffer, capacity, length);
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_restore_state(ely_block* block, const void* buffer, size_t length) {
    return guard([&] {
        require_pointer(block, "block");
        require_pointer(buffer, "buffer");
        block->model.restore_state(std::string_view(static_cast<const char*>(buffer), length), kProducer);
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_run_summary_json(const ely_block* block, char* buffer, size_t capacity, size_t* length) {
    return guard([&] {
        require_pointer(block, "block");
        require_pointer(length, "length");
        ely::capi::copy_text(block->model.run_summary_json(), buffer, capacity, length);
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_simulate(ely_block* block, size_t n_rows, const double* times, int32_t n_inputs,
                                   const int32_t* input_indices, const double* inputs, int32_t n_outputs,
                                   const int32_t* output_indices, double* outputs, int32_t* row_status,
                                   ely_progress_fn progress, void* user) {
    return guard([&] {
        require_pointer(block, "block");
        // The checks of ely_block_solve_batch, and the times.
        if (n_rows > 0) require_pointer(times, "times");
        ely::capi::check_table(block->model, n_rows, "n_rows", n_inputs, input_indices, inputs, n_outputs,
                               output_indices, outputs, row_status, "row_status");
        ely::Block& model = block->model;
        for (size_t k = 0; k < n_rows; ++k) {
            if (!std::isfinite(times[k])) bad("times[" + std::to_string(k) + "] is not a finite number");
            if (k > 0 && times[k] < times[k - 1])
                bad("times[" + std::to_string(k) + "] = " + std::to_string(times[k]) + " s is before times[" +
                    std::to_string(k - 1) + "] = " + std::to_string(times[k - 1]) + " s");
        }
        if (n_rows == 0) return ELY_OK;

        const double nan = std::numeric_limits<double>::quiet_NaN();
        std::string first_failure, first_warning;
        bool cancelled = false;
        int32_t failure = ELY_OK;
        size_t run = 0;  // rows run
        for (size_t k = 0; k < n_rows && failure == ELY_OK && !cancelled; ++k) {
            double* out_row = outputs ? outputs + k * static_cast<size_t>(n_outputs) : nullptr;
            const int32_t status = guard([&] {
                // Row k-1's inputs held up to times[k], then row k's applied there.
                if (k > 0) model.advance(times[k] - times[k - 1], false);
                const double* in_row = inputs + k * static_cast<size_t>(n_inputs);
                for (int32_t i = 0; i < n_inputs; ++i) model.set(input_indices[i], in_row[i]);
                const int32_t s = finish_solve(k == 0 ? model.reset(times[0]) : model.advance(0.0));
                for (int32_t o = 0; o < n_outputs; ++o) out_row[o] = model.get(output_indices[o]);
                return s;
            });
            row_status[k] = status;
            if (status < 0) {
                failure = status;
                first_failure = "row " + std::to_string(k) + " (t = " + std::to_string(times[k]) + " s): " + ely_last_error();
                for (int32_t o = 0; o < n_outputs; ++o) out_row[o] = nan;
                // Outputs valid where the block stopped, with the inputs in force there.
                if (k > 0) guard([&] { return finish_solve(model.advance(0.0)); });
            } else if (status > 0 && first_warning.empty()) {
                first_warning = "row " + std::to_string(k) + ": " + ely_last_error();
            }
            run = k + 1;
            if (failure == ELY_OK && progress && (run % 1024 == 0 || run == n_rows) && progress(run, n_rows, user) != 0)
                cancelled = true;
        }
        for (size_t r = run; r < n_rows; ++r) {  // rows not run
            row_status[r] = failure < 0 ? failure : ELY_ERR_CANCELLED;
            for (int32_t o = 0; o < n_outputs; ++o) outputs[r * static_cast<size_t>(n_outputs) + o] = nan;
        }
        if (failure < 0) {
            ely::capi::set_last_error("the run stopped at " + first_failure);
            return run == 1 ? failure : ELY_PARTIAL;
        }
        if (cancelled) {
            // Also when the callback asks to stop at its last call, after every row ran.
            ely::capi::set_last_error("run cancelled by the progress callback");
            return ELY_ERR_CANCELLED;
        }
        if (!first_warning.empty()) {
            ely::capi::set_last_error("some rows warned; first: " + first_warning);
            return ELY_WARNING;
        }
        return ELY_OK;
    });
}

}  // extern "C"
