// The block calls of the C interface: thin wrappers over ely::Block, each inside guard().
#include <algorithm>
#include <atomic>
#include <cmath>
#include <cstring>
#include <exception>
#include <limits>
#include <memory>
#include <mutex>
#include <string>
#include <thread>
#include <vector>

#include "base/excerpt.hpp"
#include "config/config.hpp"
#include "elyblock/elyblock.h"
#include "block_handle.hpp"
#include "guard.hpp"
#include "handle.hpp"
#include "batch/pem_batch.hpp"
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

// Batches of fewer points stay on the scalar path (reading the block for the vector kernel costs
// about as much as solving a few points).
constexpr size_t kVectorBatchMinimum = 16;
// Sizes of the versions of ely_variable_info: a caller's struct_size says which members it has.
constexpr size_t kVariableInfoV1 = offsetof(ely_variable_info, description) + sizeof(const char*);
constexpr size_t kVariableInfoV2 = offsetof(ely_variable_info, summary_rank) + sizeof(int32_t);
}  // namespace

namespace {
// The arguments of a batch call, checked (check_batch).
struct BatchArgs {
    const ely_block* block;
    size_t n_points;
    int32_t n_inputs;
    const int32_t* input_indices;
    const double* inputs;
    int32_t n_outputs;
    const int32_t* output_indices;
    double* outputs;
    int32_t* point_status;
    // ely_block_solve_batch_columns: the inputs and outputs as columns (inputs and outputs unused).
    bool by_columns = false;
    const double* const* input_columns = nullptr;
    double* const* output_columns = nullptr;

    bool columns() const { return by_columns; }
    double input(size_t k, int32_t i) const {
        return input_columns ? input_columns[i][k] : inputs[k * static_cast<size_t>(n_inputs) + static_cast<size_t>(i)];
    }
    void output(size_t k, int32_t o, double v) const {
        if (output_columns) output_columns[o][k] = v;
        else outputs[k * static_cast<size_t>(n_outputs) + static_cast<size_t>(o)] = v;
    }
};

void check_batch(const BatchArgs& a) {
    require_pointer(a.block, "block");
    if (!a.columns()) {
        ely::capi::check_table(a.block->model, a.n_points, "n_points", a.n_inputs, a.input_indices, a.inputs, a.n_outputs,
                               a.output_indices, a.outputs, a.point_status, "point_status");
        return;
    }
    // Columns: the counts and indices as for rows; every column whenever there is a point.
    ely::capi::check_table(a.block->model, 0, "n_points", a.n_inputs, a.input_indices, nullptr, a.n_outputs,
                           a.output_indices, nullptr, a.point_status, "point_status");
    if (a.n_points == 0) return;
    require_pointer(a.point_status, "point_status");
    if (a.n_inputs > 0) require_pointer(a.input_columns, "input_columns");
    if (a.n_outputs > 0) require_pointer(a.output_columns, "output_columns");
    for (int32_t i = 0; i < a.n_inputs; ++i)
        require_pointer(a.input_columns[i], ("input_columns[" + std::to_string(i) + "]").c_str());
    for (int32_t o = 0; o < a.n_outputs; ++o)
        require_pointer(a.output_columns[o], ("output_columns[" + std::to_string(o) + "]").c_str());
    if (a.n_points > std::numeric_limits<size_t>::max() / sizeof(double))
        throw Error(ErrorKind::invalid_argument, "n_points is " + std::to_string(a.n_points) +
                                                     ": the value arrays would exceed the address space");
}

// What the points of a range gave: their first failure and warning ("point k: message").
struct BatchTally {
    std::string first_failure, first_warning;
    bool any_warning = false, any_failure = false;
};

// Points [first, last) in order on a working copy of the block at the start of the batch, which returns
// to that state after a failed point (not to the block's last successful solve: inputs, parameters and
// the spec set since then hold for every point). The vectorized batch (lib/batch) where it applies, in
// chunks that divide the progress interval (a point it solves with alarms raised gets the scalar path's
// message from the kernel's alarms); a point it does not take on the scalar path. Points are independent
// (a point's answer depends on its own inputs alone, spec solves included), so the order of the
// working copy's solves is moot. after_point(k) is asked after point k whether to go on; the index of
// the first point not solved is returned.
template <class AfterPoint>
size_t solve_rows(const BatchArgs& a, size_t first, size_t last, BatchTally& tally, AfterPoint&& after_point) {
    ely::Block work = a.block->model;
    work.keep_state_for_rollback();
    const double nan = std::numeric_limits<double>::quiet_NaN();
    const auto solve_scalar = [&](size_t k) {
        return guard([&] {
            for (int32_t i = 0; i < a.n_inputs; ++i) work.set(a.input_indices[i], a.input(k, i));
            const int32_t s = finish_solve(work.solve());
            for (int32_t o = 0; o < a.n_outputs; ++o) a.output(k, o, work.get(a.output_indices[o]));
            return s;
        });
    };
    std::unique_ptr<ely::batch::PemBatch> fast;
    if (last - first >= kVectorBatchMinimum)
        fast = std::make_unique<ely::batch::PemBatch>(a.block->model, a.n_inputs, a.input_indices, a.n_outputs,
                                                      a.output_indices);
    if (fast && !fast->usable()) fast.reset();
    uint8_t verdict[ely::batch::PemBatch::kChunk];
    size_t chunk_first = first, chunk_end = first;
    for (size_t k = first; k < last; ++k) {
        if (fast && k == chunk_end) {
            const size_t count = std::min(ely::batch::PemBatch::kChunk, last - k);
            if (a.columns()) fast->run_columns(a.input_columns, k, count, a.output_columns, verdict);
            else fast->run(a.inputs, k, count, a.outputs, verdict);
            chunk_first = k;
            chunk_end = k + count;
        }
        const uint8_t v = fast ? verdict[k - chunk_first] : 2;
        int32_t status;
        if (v == 0) {
            status = ELY_OK;
        } else if (v >= 4) {  // solved by the kernel with alarms raised: the scalar path's message
            status = ELY_WARNING;
            if (tally.first_warning.empty())
                tally.first_warning = "point " + std::to_string(k) + ": " + ely::batch::PemBatch::alarm_message(v - 4u);
        } else {
            status = solve_scalar(k);
        }
        a.point_status[k] = status;
        if (status < 0 && tally.first_failure.empty())
            tally.first_failure = "point " + std::to_string(k) + ": " + ely_last_error();
        if (status > 0 && tally.first_warning.empty())
            tally.first_warning = "point " + std::to_string(k) + ": " + ely_last_error();
        if (status < 0) {
            tally.any_failure = true;
            for (int32_t o = 0; o < a.n_outputs; ++o) a.output(k, o, nan);
        } else if (status > 0) {
            tally.any_warning = true;
        }
        if (!after_point(k)) return k + 1;
    }
    return last;
}

// Points [first, n_points) were not solved: cancelled.
void mark_cancelled(const BatchArgs& a, size_t first, size_t last) {
    const double nan = std::numeric_limits<double>::quiet_NaN();
    for (size_t k = first; k < last; ++k) {
        a.point_status[k] = ELY_ERR_CANCELLED;
        for (int32_t o = 0; o < a.n_outputs; ++o) a.output(k, o, nan);
    }
}

int32_t finish_batch(const BatchTally& tally, bool cancelled) {
    if (cancelled) {
        // Also when the callback asks to stop at its last call, after every point was solved:
        // the caller asked to cancel, so the call does not report plain success.
        ely::capi::set_last_error("batch cancelled by the progress callback");
        return ELY_ERR_CANCELLED;
    }
    if (tally.any_failure) { ely::capi::set_last_error("some points failed; first: " + tally.first_failure); return ELY_PARTIAL; }
    if (tally.any_warning) { ely::capi::set_last_error("some points warned; first: " + tally.first_warning); return ELY_WARNING; }
    return ELY_OK;
}

// The single-thread batch (rows or columns): checked, every point in order on one working copy, progress
// every 1024 points and after the last.
int32_t solve_batch_one_thread(const BatchArgs& a, ely_progress_fn progress, void* user) {
    check_batch(a);
    BatchTally tally;
    bool cancelled = false;
    const size_t reached = solve_rows(a, 0, a.n_points, tally, [&](size_t k) {
        if (progress && ((k + 1) % 1024 == 0 || k + 1 == a.n_points) && progress(k + 1, a.n_points, user) != 0)
            cancelled = true;
        return !cancelled;
    });
    mark_cancelled(a, reached, a.n_points);
    return finish_batch(tally, cancelled);
}

// Points per piece of a threaded batch: a fixed partition, so results do not depend on the thread count.
constexpr size_t kThreadPiece = 8 * ely::batch::PemBatch::kChunk;
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
        const BatchArgs a{block, n_points, n_inputs, input_indices, inputs, n_outputs, output_indices, outputs, point_status};
        return solve_batch_one_thread(a, progress, user);
    });
}

ELY_API int32_t ely_block_solve_batch_columns(const ely_block* block, size_t n_points, int32_t n_inputs,
                                              const int32_t* input_indices, const double* const* input_columns,
                                              int32_t n_outputs, const int32_t* output_indices,
                                              double* const* output_columns, int32_t* point_status,
                                              ely_progress_fn progress, void* user) {
    return guard([&] {
        BatchArgs a{block, n_points, n_inputs, input_indices, nullptr, n_outputs, output_indices, nullptr, point_status};
        a.by_columns = true;
        a.input_columns = input_columns;
        a.output_columns = output_columns;
        return solve_batch_one_thread(a, progress, user);
    });
}

ELY_API int32_t ely_block_solve_batch_threads(const ely_block* block, size_t n_points, int32_t n_inputs,
                                              const int32_t* input_indices, const double* inputs, int32_t n_outputs,
                                              const int32_t* output_indices, double* outputs, int32_t* point_status,
                                              int32_t threads, ely_progress_fn progress, void* user) {
    return guard([&] {
        const BatchArgs a{block, n_points, n_inputs, input_indices, inputs, n_outputs, output_indices, outputs, point_status};
        check_batch(a);
        if (threads < 0)
            throw Error(ErrorKind::invalid_argument, "threads is " + std::to_string(threads) + "; it must be 0 (one per core) or more");
        size_t n_threads = threads > 0 ? static_cast<size_t>(threads) : std::max(1u, std::thread::hardware_concurrency());
        const size_t pieces = (n_points + kThreadPiece - 1) / kThreadPiece;
        n_threads = std::max<size_t>(1, std::min(n_threads, pieces));
        std::vector<BatchTally> tallies(pieces);
        std::vector<uint8_t> solved(pieces, 0);
        std::atomic<size_t> next{0}, points_done{0};
        std::atomic<bool> stop{false};
        // Each piece on its own working copy of the block at the start of the batch; the calling thread
        // takes pieces too and is the only one that calls progress (after each of its pieces).
        std::exception_ptr failure;  // an exception of a worker (none is expected: points fail inside guard)
        std::mutex failure_mutex;
        size_t reported = 0;
        const auto work = [&](bool caller) {
            try {
                for (;;) {
                    if (stop.load()) return;
                    const size_t p = next.fetch_add(1);
                    if (p >= pieces) return;
                    const size_t first = p * kThreadPiece, last = std::min(n_points, first + kThreadPiece);
                    solve_rows(a, first, last, tallies[p], [](size_t) { return true; });
                    solved[p] = 1;
                    const size_t done = points_done.fetch_add(last - first) + (last - first);
                    if (caller && progress) {
                        reported = done;
                        if (progress(done, n_points, user) != 0) stop.store(true);
                    }
                }
            } catch (...) {
                const std::lock_guard<std::mutex> lock(failure_mutex);
                if (!failure) failure = std::current_exception();
                stop.store(true);
            }
        };
        std::vector<std::thread> pool;
        for (size_t t = 1; t < n_threads; ++t) pool.emplace_back(work, false);
        work(true);
        for (auto& t : pool) t.join();
        if (failure) std::rethrow_exception(failure);
        BatchTally tally;
        for (size_t p = 0; p < pieces; ++p) {
            const size_t first = p * kThreadPiece, last = std::min(n_points, first + kThreadPiece);
            if (!solved[p]) {
                mark_cancelled(a, first, last);
                continue;
            }
            const BatchTally& t = tallies[p];
            if (t.any_failure && tally.first_failure.empty()) tally.first_failure = t.first_failure;
            if (t.any_warning && tally.first_warning.empty()) tally.first_warning = t.first_warning;
            tally.any_failure |= t.any_failure;
            tally.any_warning |= t.any_warning;
        }
        // The callback's last call comes after every piece, as in the single-thread batch.
        bool cancelled = stop.load();
        if (!cancelled && progress && n_points > 0 && reported != n_points && progress(n_points, n_points, user) != 0)
            cancelled = true;
        return finish_batch(tally, cancelled);
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
