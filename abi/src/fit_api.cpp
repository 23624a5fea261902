// The calibration calls of the C interface (ely_block_fit, the ely_fit result): thin wrappers
// over lib/calibration, each inside guard(). Unit conversion is in units_api.cpp.
#include <cmath>
#include <cstring>
#include <limits>
#include <memory>
#include <string>

#include "block_handle.hpp"
#include "calibration/fit.hpp"
#include "elyblock/elyblock.h"
#include "guard.hpp"

struct ely_fit {
    ely::FitResult result;
    std::string report;  // JSON, written once
};

namespace {
using ely::Error;
using ely::ErrorKind;
using ely::capi::guard;
using ely::capi::require_pointer;

// Size of the first version of ely_fit_options: a caller's struct_size says which members it has.
constexpr size_t kFitOptionsV1 = offsetof(ely_fit_options, scales) + sizeof(const int32_t*);

void require_count(int32_t count, const char* what, int32_t at_least) {
    if (count < at_least)
        throw Error(ErrorKind::invalid_argument,
                    std::string(what) + " is " + std::to_string(count) + "; it must be at least " + std::to_string(at_least));
}

}  // namespace

extern "C" {

ELY_API int32_t ely_block_fit(ely_block* block, size_t n_points, int32_t n_inputs, const int32_t* input_indices,
                              const double* inputs, int32_t n_measured, const int32_t* measured_indices,
                              const double* measured, const double* weights, int32_t n_free,
                              const char* const* free_names, const ely_fit_options* options,
                              ely_progress_fn progress, void* user, ely_fit** result) {
    return guard([&] {
        require_pointer(result, "result");
        *result = nullptr;
        require_pointer(block, "block");
        if (n_points == 0) throw Error(ErrorKind::invalid_argument, "n_points is 0; a fit needs data");
        require_count(n_inputs, "n_inputs", 0);
        require_count(n_measured, "n_measured", 1);
        require_count(n_free, "n_free", 1);
        if (n_inputs > 0) {
            require_pointer(input_indices, "input_indices");
            require_pointer(inputs, "inputs");
        }
        require_pointer(measured_indices, "measured_indices");
        require_pointer(measured, "measured");
        require_pointer(free_names, "free_names");
        const size_t widest = static_cast<size_t>(n_inputs > n_measured ? n_inputs : n_measured);
        if (n_points > std::numeric_limits<size_t>::max() / (sizeof(double) * widest))
            throw Error(ErrorKind::invalid_argument,
                        "n_points is " + std::to_string(n_points) + ": the value arrays would exceed the address space");
        ely::FitOptions fit_options;
        ely::FitProblem p;
        if (options) {
            if (options->struct_size < kFitOptionsV1)
                throw Error(ErrorKind::invalid_argument, "options->struct_size is " + std::to_string(options->struct_size) +
                                                             "; set it to sizeof(ely_fit_options)");
            if (options->max_iterations < 0)
                throw Error(ErrorKind::invalid_argument, "options->max_iterations is " +
                                                             std::to_string(options->max_iterations) + "; it must be >= 0");
            if (options->max_iterations > 0) fit_options.max_iterations = options->max_iterations;
            if (options->tolerance != 0) fit_options.tolerance = options->tolerance;  // NaN is refused by the fit
            if (options->lower) p.lower.assign(options->lower, options->lower + n_free);
            if (options->upper) p.upper.assign(options->upper, options->upper + n_free);
            if (options->scales)
                for (int32_t k = 0; k < n_free; ++k) {
                    const int32_t s = options->scales[k];
                    if (s != ELY_FIT_SCALE_AUTO && s != ELY_FIT_SCALE_LINEAR && s != ELY_FIT_SCALE_LOG)
                        throw Error(ErrorKind::invalid_argument, "options->scales[" + std::to_string(k) + "] is " +
                                                                     std::to_string(s) + "; use an ELY_FIT_SCALE_* value");
                    p.scales.push_back(static_cast<ely::FitScale>(s));
                }
        }
        for (int32_t k = 0; k < n_free; ++k) {
            if (free_names[k] == nullptr)
                throw Error(ErrorKind::invalid_argument, "free_names[" + std::to_string(k) + "] is NULL");
            p.free.emplace_back(free_names[k]);
        }
        const auto& model = block->model;
        for (int32_t i = 0; i < n_inputs; ++i) model.variable(input_indices[i]);  // checks the index
        for (int32_t o = 0; o < n_measured; ++o) model.variable(measured_indices[o]);
        p.points = n_points;
        p.inputs.assign(input_indices, input_indices + n_inputs);
        p.measured.assign(measured_indices, measured_indices + n_measured);
        if (n_inputs > 0) p.input_values.assign(inputs, inputs + n_points * static_cast<size_t>(n_inputs));
        p.measured_values.assign(measured, measured + n_points * static_cast<size_t>(n_measured));
        if (weights) p.weights.assign(weights, weights + n_points * static_cast<size_t>(n_measured));
        if (progress)
            fit_options.progress = [&](size_t done, size_t total) { return progress(done, total, user) == 0; };

        auto fit = std::make_unique<ely_fit>();
        fit->result = ely::fit(block->model, p, fit_options);
        fit->report = ely::fit_report_json(fit->result);
        const auto& warnings = fit->result.warnings;
        *result = fit.release();
        if (warnings.empty()) return ELY_OK;
        std::string message;
        for (const auto& w : warnings) message += (message.empty() ? "" : "; ") + w;
        ely::capi::set_last_error(message);
        return ELY_WARNING;
    });
}

ELY_API int32_t ely_fit_report_json(const ely_fit* fit, char* buffer, size_t capacity, size_t* length) {
    return guard([&] {
        require_pointer(fit, "fit");
        require_pointer(length, "length");
        ely::capi::copy_text(fit->report, buffer, capacity, length);
        return ELY_OK;
    });
}

ELY_API int32_t ely_fit_plant_json(const ely_fit* fit, char* buffer, size_t capacity, size_t* length) {
    return guard([&] {
        require_pointer(fit, "fit");
        require_pointer(length, "length");
        if (fit->result.plant_json.empty())
            throw Error(ErrorKind::wrong_state, "the fitted block was not created from JSON text: no plant description to write");
        ely::capi::copy_text(fit->result.plant_json, buffer, capacity, length);
        return ELY_OK;
    });
}

ELY_API int32_t ely_fit_parameter(const ely_fit* fit, int32_t k, double* value, double* standard_error) {
    return guard([&] {
        require_pointer(fit, "fit");
        if (value == nullptr && standard_error == nullptr)
            throw Error(ErrorKind::invalid_argument, "value and standard_error are both NULL");
        const auto& params = fit->result.parameters;
        if (k < 0 || static_cast<size_t>(k) >= params.size())
            throw Error(ErrorKind::invalid_argument,
                        "parameter " + std::to_string(k) + " is outside 0.." + std::to_string(params.size() - 1));
        if (value) *value = params[static_cast<size_t>(k)].value;
        if (standard_error) *standard_error = params[static_cast<size_t>(k)].standard_error;
        return ELY_OK;
    });
}

ELY_API int32_t ely_fit_rmse(const ely_fit* fit, int32_t o, double* rmse, size_t* rows) {
    return guard([&] {
        require_pointer(fit, "fit");
        if (rmse == nullptr && rows == nullptr) throw Error(ErrorKind::invalid_argument, "rmse and rows are both NULL");
        const auto& r = fit->result;
        const size_t n = r.measured_names.size();
        if (o < 0 || static_cast<size_t>(o) >= n)
            throw Error(ErrorKind::invalid_argument,
                        "measured variable " + std::to_string(o) + " is outside 0.." + std::to_string(n - 1));
        const auto at = static_cast<size_t>(o);
        if (rmse) *rmse = r.rmse[at];
        if (rows) {
            size_t count = 0;  // the rows the residuals cover: where the variable was measured
            for (size_t i = 0; i < r.points; ++i) count += std::isnan(r.residuals[i * n + at]) ? 0 : 1;
            *rows = count;
        }
        return ELY_OK;
    });
}

ELY_API void ely_fit_destroy(ely_fit* fit) { delete fit; }

}  // extern "C"
