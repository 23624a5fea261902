// The block calls of the C interface: thin wrappers over ely::Block, each inside guard().
#include <algorithm>
#include <cmath>
#include <cstring>
#include <limits>
#include <memory>
#include <string>

#include "base/excerpt.hpp"
#include "config/config.hpp"
#include "elyblock/elyblock.h"
#include "block_handle.hpp"
#include "guard.hpp"
#include "handle.hpp"
#include "unit/block.hpp"

namespace {
using ely::Error;
using ely::ErrorKind;
using ely::capi::finish_solve;
using ely::capi::guard;
using ely::capi::require_pointer;

ely::Spec parse_spec(const char* text) {
    if (const ely::SpecInfo* s = ely::find_spec(text)) return s->spec;
    throw Error(ErrorKind::invalid_argument, "unknown spec '" + ely::excerpt(text) + "'; known: " + ely::spec_names());
}

// Sizes of the versions of ely_variable_info: a caller's struct_size says which members it has.
constexpr size_t kVariableInfoV1 = offsetof(ely_variable_info, description) + sizeof(const char*);
constexpr size_t kVariableInfoV2 = offsetof(ely_variable_info, summary_rank) + sizeof(int32_t);
}  // namespace

extern "C" {

ELY_API int32_t ely_block_create(const char* config_json, ely_block** out) {
    return guard([&] {
        require_pointer(out, "out");
        *out = nullptr;
        require_pointer(config_json, "config_json");
        *out = new ely_block(ely::Block(ely::parse_config(config_json)));
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_create_from_file(const char* path, ely_block** out) {
    return guard([&] {
        require_pointer(out, "out");
        *out = nullptr;
        require_pointer(path, "path");
        *out = new ely_block(ely::Block(ely::load_config_file(path)));
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_clone(const ely_block* block, ely_block** out) {
    return guard([&] {
        require_pointer(out, "out");
        *out = nullptr;
        require_pointer(block, "block");
        *out = new ely_block(block->model);
        return ELY_OK;
    });
}

ELY_API void ely_block_destroy(ely_block* block) { delete block; }

ELY_API int32_t ely_block_variable_count(const ely_block* block, int32_t* count) {
    return guard([&] {
        require_pointer(block, "block");
        require_pointer(count, "count");
        *count = block->model.variable_count();
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_variable_info(const ely_block* block, int32_t index, ely_variable_info* info) {
    return guard([&] {
        require_pointer(block, "block");
        require_pointer(info, "info");
        if (info->struct_size < kVariableInfoV1)
            throw Error(ErrorKind::invalid_argument, "info->struct_size is " + std::to_string(info->struct_size) +
                                                         "; set it to sizeof(ely_variable_info)");
        const auto& m = block->model;
        const auto& v = m.variable(index);
        info->causality = static_cast<int32_t>(v.causality);
        info->name = v.name;
        info->unit = v.unit;
        info->description = v.description;
        if (info->struct_size < kVariableInfoV2) return ELY_OK;
        info->variability = static_cast<int32_t>(v.variability);
        info->flags = v.min_exclusive ? ELY_VARIABLE_MIN_EXCLUSIVE : 0u;
        info->min = v.min;
        info->max = v.max;
        info->start = m.start(index);
        info->nominal = v.nominal;
        info->label = v.label;
        info->display_unit = v.display_symbol();
        info->display_scale = v.display.scale;
        info->display_offset = v.display.offset;
        info->summary_group = m.summary_group(index);
        info->config_key = v.config_key ? v.config_key : "";
        info->summary_rank = m.summary_rank(index);
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_find(const ely_block* block, const char* name, int32_t* index) {
    return guard([&] {
        require_pointer(block, "block");
        require_pointer(name, "name");
        require_pointer(index, "index");
        *index = block->model.find(name);
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_set(ely_block* block, int32_t index, double value) {
    return guard([&] {
        require_pointer(block, "block");
        block->model.set(index, value);
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_get(const ely_block* block, int32_t index, double* value) {
    return guard([&] {
        require_pointer(block, "block");
        require_pointer(value, "value");
        *value = block->model.get(index);
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_set_spec(ely_block* block, const char* spec) {
    return guard([&] {
        require_pointer(block, "block");
        require_pointer(spec, "spec");
        block->model.set_spec(parse_spec(spec));
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_get_spec(const ely_block* block, const char** spec) {
    return guard([&] {
        require_pointer(block, "block");
        require_pointer(spec, "spec");
        *spec = ely::spec_name(block->model.spec());
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_solve(ely_block* block) {
    return guard([&] {
        require_pointer(block, "block");
        return finish_solve(block->model.solve());
    });
}

ELY_API int32_t ely_block_solve_batch(const ely_block* block, size_t n_points, int32_t n_inputs,
                                      const int32_t* input_indices, const double* inputs, int32_t n_outputs,
                                      const int32_t* output_indices, double* outputs, int32_t* point_status,
                                      ely_progress_fn progress, void* user) {
    return guard([&] {
        require_pointer(block, "block");
        ely::capi::check_table(block->model, n_points, "n_points", n_inputs, input_indices, inputs, n_outputs,
                               output_indices, outputs, point_status, "point_status");

        // The working copy returns to the block's state at the start of the batch after a failed
        // point (not to the block's last successful solve: inputs, parameters and the spec set
        // since then hold for every point).
        ely::Block work = block->model;
        work.keep_state_for_rollback();
        std::string first_failure, first_warning;
        bool any_warning = false, any_failure = false, cancelled = false;
        const double nan = std::numeric_limits<double>::quiet_NaN();
        for (size_t k = 0; k < n_points; ++k) {
            double* out_row = outputs ? outputs + k * static_cast<size_t>(n_outputs) : nullptr;
            if (cancelled) {
                point_status[k] = ELY_ERR_CANCELLED;
                for (int32_t o = 0; o < n_outputs; ++o) out_row[o] = nan;
                continue;
            }
            const int32_t status = guard([&] {
                const double* in_row = inputs + k * static_cast<size_t>(n_inputs);
                for (int32_t i = 0; i < n_inputs; ++i) work.set(input_indices[i], in_row[i]);
                const int32_t s = finish_solve(work.solve());
                for (int32_t o = 0; o < n_outputs; ++o) out_row[o] = work.get(output_indices[o]);
                return s;
            });
            point_status[k] = status;
            if (status < 0 && first_failure.empty())
                first_failure = "point " + std::to_string(k) + ": " + ely_last_error();
            if (status > 0 && first_warning.empty())
                first_warning = "point " + std::to_string(k) + ": " + ely_last_error();
            if (status < 0) {
                any_failure = true;
                for (int32_t o = 0; o < n_outputs; ++o) out_row[o] = nan;
            } else if (status > 0) {
                any_warning = true;
            }
            if (progress && ((k + 1) % 1024 == 0 || k + 1 == n_points) && progress(k + 1, n_points, user) != 0)
                cancelled = true;
        }
        if (cancelled) {
            // Also when the callback asks to stop at its last call, after every point was solved:
            // the caller asked to cancel, so the call does not report plain success.
            ely::capi::set_last_error("batch cancelled by the progress callback");
            return ELY_ERR_CANCELLED;
        }
        if (any_failure) { ely::capi::set_last_error("some points failed; first: " + first_failure); return ELY_PARTIAL; }
        if (any_warning) { ely::capi::set_last_error("some points warned; first: " + first_warning); return ELY_WARNING; }
        return ELY_OK;
    });
}

ELY_API int32_t ely_block_report_json(const ely_block* block, char* buffer, size_t capacity, size_t* length) {
    return guard([&] {
        require_pointer(block, "block");
        require_pointer(length, "length");
        ely::capi::copy_text(block->model.report_json(), buffer, capacity, length);
        return ELY_OK;
    });
}

}  // extern "C"
