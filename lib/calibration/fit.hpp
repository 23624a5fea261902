#pragma once
// Calibration: tunable parameters of a block fitted to measured data by weighted nonlinear
// least squares with bounds (Levenberg–Marquardt of Eigen's unsupported LevenbergMarquardt
// module, a translation of MINPACK's lmder). docs/calibration.md gives the method.
//
// The data are rows of operating inputs (any inputs of the block: current density,
// temperature, pressures, ...) with measured values of chosen outputs (cell voltage, Faraday
// efficiency, a purity, ...). For each row the block is set to the row's inputs and solved
// with its spec, exactly as a batch solve does; the residual of a measured value is
// √w·(model − measured). The free parameters are tunable parameters (param.cell.<key>,
// param.<section>.<key>), set through Block::set, so a fit never leaves the limits the config
// enforces. Positive parameters spanning decades are fitted in log space; every bound is
// enforced by a transformation of the fit coordinate (MINUIT's: sine for two bounds, square
// root for one).
//
// Statistics at the optimum, from the Jacobian of the weighted residuals in the fit's natural
// coordinate (ln p or p): covariance s²(JᵀJ)⁻¹ with the residual variance s² = Σr²/(m − n),
// standard errors, 95 % intervals with Student's t (asymmetric for log-space parameters),
// correlations, and warnings naming parameters the data cannot separate.
#include <cstddef>
#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "unit/block.hpp"

namespace ely {

/// How a free parameter is mapped to the fit coordinate.
enum class FitScale : int32_t { automatic = 0, linear = 1, log = 2 };

struct FitProblem {
    std::size_t points = 0;
    std::vector<int32_t> inputs;          // block indices of inputs (causality input)
    std::vector<double> input_values;     // points × inputs, row-major
    std::vector<int32_t> measured;        // block indices of outputs
    std::vector<double> measured_values;  // points × measured, row-major; NaN = not measured
    std::vector<double> weights;          // empty (all 1) or points × measured; finite, >= 0
    /// Names of the free parameters: a variable name ("param.cell.contact_resistance") or the
    /// key of the technology's cell object ("contact_resistance").
    std::vector<std::string> free;
    /// Optional bounds per free parameter (empty, or NaN for the variable's own limit); they
    /// must lie within the variable's limits.
    std::vector<double> lower, upper;
    std::vector<FitScale> scales;         // empty: automatic for all
};

struct FitOptions {
    int max_iterations = 200;   // accepted and rejected Levenberg–Marquardt steps together
    double tolerance = 1e-10;   // relative, on the sum of squares and on the step (MINPACK ftol, xtol)
    /// Called after every step with (step, max_iterations); returning false cancels the fit.
    std::function<bool(std::size_t, std::size_t)> progress;
};

struct FittedParameter {
    std::string name;           // variable name
    const char* config_key;     // JSON path in the plant description
    const char* unit;
    bool log_scale = false;
    double start = 0, value = 0;
    double standard_error = 0;  // NaN when the data do not determine it (no residual variance, singular)
    double interval_low = 0, interval_high = 0;  // 95 %
    double lower = 0, upper = 0;                 // bounds of the fit
    bool at_bound = false;
};

struct FitResult {
    std::vector<FittedParameter> parameters;
    std::vector<std::vector<double>> correlation;  // NaN entries when not available
    double condition_number = 0;  // of the column-scaled Jacobian's normal matrix
    std::vector<std::string> measured_names;
    std::vector<double> fitted;     // points × measured, the model at the optimum
    std::vector<double> residuals;  // points × measured, model − measured (NaN when not measured)
    std::vector<double> rmse;       // per measured variable, unweighted, in its SI unit
    std::size_t points = 0, measurements = 0, degrees_of_freedom = 0;
    double sum_of_squares = 0;      // weighted
    double residual_variance = 0;   // weighted, NaN without degrees of freedom
    int iterations = 0, evaluations = 0;
    std::string termination;        // why the iteration stopped
    std::vector<std::string> warnings;
    std::string plant_json;         // the calibrated plant description; "" when the block has no source text
};

/// Fits the free parameters of `block` to the data, starting from the block's current values.
/// On success `block` holds the fitted values (its inputs and spec unchanged, outputs stale);
/// on any error it is unchanged. Errors: invalid_argument (data, names, bounds; a parameter
/// the measured outputs do not depend on), unknown_name, the error of a data point that fails
/// at the start values (its row named), no_convergence (iteration limit; the message gives the
/// best values), cancelled.
FitResult fit(Block& block, const FitProblem& problem, const FitOptions& options = {});

/// The fit report as JSON text (docs/calibration.md describes the members).
std::string fit_report_json(const FitResult& result);

/// The plant description the block was created from, with the current values of its tunable
/// parameters written at their config keys (those differing from the description and those
/// listed in `always`), as indented JSON. "" when the block was not created from JSON text.
std::string calibrated_plant_json(const Block& block, const std::vector<int32_t>& always);

}  // namespace ely
