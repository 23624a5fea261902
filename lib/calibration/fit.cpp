// The fit: checks of the problem, the residuals (one block solve per data row), the
// Levenberg–Marquardt iteration of Eigen (unsupported/Eigen/LevenbergMarquardt, MINPACK's lmder),
// the statistics at the optimum and the warnings. docs/calibration.md describes the method.
#include "calibration/fit.hpp"

#include <Eigen/Dense>
#include <algorithm>
#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <fmt/format.h>
#include <limits>
#include <unsupported/Eigen/LevenbergMarquardt>

#include "base/error.hpp"
#include "base/excerpt.hpp"
#include "base/text.hpp"
#include "calibration/bound_map.hpp"

namespace ely {

namespace {

using Eigen::MatrixXd;
using Eigen::VectorXd;
using calibration::BoundMap;

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kInf = std::numeric_limits<double>::infinity();

// Scale rule of FitScale::automatic: positive parameters whose limits span at least three
// decades (or, with a lower limit of 0, two decades above their nominal value) are fitted in
// log space.
constexpr double kLogSpanDecadesLimits = 1e3;
constexpr double kLogSpanAboveNominal = 1e2;
// Relative finite-difference steps in the fit coordinate: forward differences during the
// iteration, central differences for the statistics at the optimum. The model's own solves are
// exact to a few ulps, so these steps leave derivative errors near 1e-6 and 1e-10.
constexpr double kForwardStep = 1e-6;
constexpr double kCentralStep = 1e-5;
// A residual vector for a trial point the model cannot solve: so large that the iteration
// rejects the step and shortens it.
constexpr double kPenalty = 1e100;
// Warnings: a column-scaled Jacobian this ill-conditioned is singular to working precision
// (finite differences are good to about 1e-8 relative); estimates this correlated are named.
constexpr double kSingular = 1e-8;
constexpr double kConditionWarning = 1e3;
constexpr double kCorrelationWarning = 0.999;

std::string value_text(double x, const char* unit) { return quantity_text(x, unit); }

struct Free {
    int32_t index;
    const VariableInfo* info;
    bool log;
    double nominal;
    double start;
    double lower, upper;  // SI bounds of the fit
    BoundMap map;         // bounds in the fit coordinate θ

    double theta_of(double p) const { return log ? std::log(p) : p / nominal; }
    double value_of(double theta) const { return log ? std::exp(theta) : theta * nominal; }
};

int32_t resolve_free(const Block& block, const std::string& name) {
    try {
        return block.find(name);
    } catch (const Error& e) {
        if (e.kind() != ErrorKind::unknown_name || name.find('.') != std::string::npos) throw;
        try {
            return block.find("param.cell." + name);
        } catch (const Error&) {
            throw Error(ErrorKind::unknown_name,
                        fmt::format("free parameter '{}' is neither a variable nor a key of the cell object of "
                                    "technology '{}'",
                                    excerpt(name), block.technology().name));
        }
    }
}

bool automatic_log(const VariableInfo& v, double start) {
    if (!(start > 0) || v.min < 0) return false;
    if (v.min > 0) return v.max / v.min >= kLogSpanDecadesLimits;
    return v.max / v.nominal >= kLogSpanAboveNominal;
}

std::vector<Free> check_free(const Block& block, const FitProblem& p) {
    const std::size_t n = p.free.size();
    if (n == 0) throw Error(ErrorKind::invalid_argument, "no free parameters: name at least one tunable parameter to fit");
    if (!p.lower.empty() && p.lower.size() != n)
        throw Error(ErrorKind::invalid_argument, fmt::format("{} lower bounds for {} free parameters", p.lower.size(), n));
    if (!p.upper.empty() && p.upper.size() != n)
        throw Error(ErrorKind::invalid_argument, fmt::format("{} upper bounds for {} free parameters", p.upper.size(), n));
    if (!p.scales.empty() && p.scales.size() != n)
        throw Error(ErrorKind::invalid_argument, fmt::format("{} scales for {} free parameters", p.scales.size(), n));
    std::vector<Free> out;
    for (std::size_t k = 0; k < n; ++k) {
        const int32_t index = resolve_free(block, p.free[k]);
        const VariableInfo& v = block.variable(index);
        if (v.causality != Causality::parameter || v.variability != Variability::tunable)
            throw Error(ErrorKind::invalid_argument,
                        fmt::format("free parameter '{}' is not a tunable parameter; only parameters of variability "
                                    "tunable (param.cell.<key>, param.<section>.<key>) can be fitted",
                                    v.name));
        for (const Free& f : out)
            if (f.index == index)
                throw Error(ErrorKind::invalid_argument, fmt::format("free parameter '{}' is named twice", v.name));
        const double start = block.get(index);
        // A bound given (not NaN) replaces the variable's limit, within it.
        const auto bound = [&](const std::vector<double>& given, double limit, const char* which) {
            const double b = given.empty() ? kNaN : given[k];
            if (std::isnan(b)) return limit;
            if (!std::isfinite(b) || b < v.min || b > v.max)
                throw Error(ErrorKind::invalid_argument,
                            fmt::format("{} bound {} of {} is outside its limits ({})", which, value_text(b, v.unit),
                                        v.name, limits_text(v.min, v.max, v.min_exclusive, v.unit)));
            return b;
        };
        const double lo = bound(p.lower, v.min, "lower"), hi = bound(p.upper, v.max, "upper");
        if (!(lo < hi))
            throw Error(ErrorKind::invalid_argument, fmt::format("bounds of {}: lower {} is not below upper {}", v.name,
                                                                 value_text(lo, v.unit), value_text(hi, v.unit)));
        if (start < lo || start > hi)
            throw Error(ErrorKind::invalid_argument,
                        fmt::format("start value {} of {} is outside its bounds [{}, {}]; set a start value within them",
                                    value_text(start, v.unit), v.name, value_text(lo, v.unit), value_text(hi, v.unit)));
        const FitScale scale = p.scales.empty() ? FitScale::automatic : p.scales[k];
        bool log = false;
        switch (scale) {
            case FitScale::automatic: log = automatic_log(v, start) && lo >= 0; break;
            case FitScale::linear: log = false; break;
            case FitScale::log:
                if (!(start > 0) || lo < 0)
                    throw Error(ErrorKind::invalid_argument,
                                fmt::format("{} cannot be fitted in log space: its start value {} and lower bound {} "
                                            "must be positive (a lower bound of 0 is allowed)",
                                            v.name, value_text(start, v.unit), value_text(lo, v.unit)));
                log = true;
                break;
            default: throw Error(ErrorKind::invalid_argument, fmt::format("scale of {} is not automatic, linear or log", v.name));
        }
        const double nominal = v.nominal > 0 ? v.nominal : 1.0;
        const double theta_lo = log ? (lo > 0 ? std::log(lo) : -kInf) : lo / nominal;
        const double theta_hi = log ? (std::isfinite(hi) ? std::log(hi) : kInf) : hi / nominal;
        out.push_back({index, &v, log, nominal, start, lo, hi, BoundMap(theta_lo, theta_hi)});
    }
    return out;
}

/// The data and the residuals: √w·(model − measured) for every measured value given (not NaN)
/// with a positive weight.
class Residuals {
public:
    Residuals(const Block& base, const FitProblem& p, std::vector<Free> free) : base_(base), p_(p), free_(std::move(free)) {
        check_data();
        for (std::size_t i = 0; i < p_.points; ++i)
            for (std::size_t o = 0; o < p_.measured.size(); ++o) {
                const std::size_t at = i * p_.measured.size() + o;
                const double w = p_.weights.empty() ? 1.0 : p_.weights[at];
                if (!std::isnan(p_.measured_values[at]) && w > 0) used_.push_back({at, std::sqrt(w)});
            }
        if (used_.size() < free_.size())
            throw Error(ErrorKind::invalid_argument,
                        fmt::format("{} measured values (given, with a positive weight) for {} free parameters; a fit "
                                    "needs at least as many values as parameters",
                                    used_.size(), free_.size()));
    }

    const std::vector<Free>& free() const { return free_; }
    std::size_t count() const { return used_.size(); }
    int evaluations() const { return evaluations_; }

    /// Residuals at the fit coordinates θ; false (and `why`) when a value cannot be set or a
    /// data row cannot be solved. `model` (points × measured) receives the model's values.
    bool evaluate(const VectorXd& theta, VectorXd& r, std::string* why, std::vector<double>* model = nullptr) {
        ++evaluations_;
        r.resize(static_cast<Eigen::Index>(used_.size()));
        Block work = base_;
        std::size_t k = 0;
        try {
            for (; k < free_.size(); ++k) work.set(free_[k].index, free_[k].value_of(theta[static_cast<Eigen::Index>(k)]));
        } catch (const Error& e) {
            if (why) *why = e.what();
            kind_ = e.kind();
            return false;
        }
        const std::size_t n_in = p_.inputs.size(), n_out = p_.measured.size();
        values_.resize(p_.points * n_out);
        for (std::size_t i = 0; i < p_.points; ++i) {
            try {
                for (std::size_t j = 0; j < n_in; ++j) work.set(p_.inputs[j], p_.input_values[i * n_in + j]);
                work.solve();
                for (std::size_t o = 0; o < n_out; ++o) {
                    const double y = work.get(p_.measured[o]);
                    if (!std::isfinite(y))
                        throw Error(ErrorKind::out_of_range,
                                    fmt::format("{} has no finite value", work.variable(p_.measured[o]).name));
                    values_[i * n_out + o] = y;
                }
            } catch (const Error& e) {
                if (why) *why = fmt::format("data row {}: {}", i + 1, e.what());
                kind_ = e.kind();
                return false;
            }
        }
        for (std::size_t s = 0; s < used_.size(); ++s)
            r[static_cast<Eigen::Index>(s)] = used_[s].sqrt_weight * (values_[used_[s].at] - p_.measured_values[used_[s].at]);
        if (model) *model = values_;
        return true;
    }

    ErrorKind last_failure_kind() const { return kind_; }

private:
    /// Each index names a variable of the causality, and none twice.
    void check_indices(const std::vector<int32_t>& indices, Causality causality, const char* role, const char* kind) const {
        for (std::size_t k = 0; k < indices.size(); ++k) {
            const VariableInfo& v = base_.variable(indices[k]);
            if (v.causality != causality)
                throw Error(ErrorKind::invalid_argument, fmt::format("{} {} '{}' is not {}", role, k + 1, v.name, kind));
            for (std::size_t k2 = 0; k2 < k; ++k2)
                if (indices[k2] == indices[k])
                    throw Error(ErrorKind::invalid_argument, fmt::format("{} '{}' is given twice", role, v.name));
        }
    }

    void check_data() const {
        const Block& b = base_;
        if (p_.points == 0) throw Error(ErrorKind::invalid_argument, "no data points");
        const std::size_t n_in = p_.inputs.size(), n_out = p_.measured.size();
        if (n_out == 0) throw Error(ErrorKind::invalid_argument, "no measured outputs: name at least one output that was measured");
        check_indices(p_.inputs, Causality::input, "data input", "an input");
        check_indices(p_.measured, Causality::output, "measured variable", "an output");
        if (p_.input_values.size() != p_.points * n_in)
            throw Error(ErrorKind::internal, "input values do not fill points × inputs");
        if (p_.measured_values.size() != p_.points * n_out)
            throw Error(ErrorKind::internal, "measured values do not fill points × measured");
        if (!p_.weights.empty() && p_.weights.size() != p_.points * n_out)
            throw Error(ErrorKind::internal, "weights do not fill points × measured");
        for (std::size_t i = 0; i < p_.points; ++i) {
            for (std::size_t j = 0; j < n_in; ++j)
                if (!std::isfinite(p_.input_values[i * n_in + j]))
                    throw Error(ErrorKind::invalid_argument,
                                fmt::format("data row {}: {} is {}; inputs must be finite", i + 1,
                                            b.variable(p_.inputs[j]).name, p_.input_values[i * n_in + j]));
            for (std::size_t o = 0; o < n_out; ++o) {
                const double y = p_.measured_values[i * n_out + o];
                if (std::isinf(y))
                    throw Error(ErrorKind::invalid_argument,
                                fmt::format("data row {}: measured {} is {}; give a finite value, or NaN for not measured",
                                            i + 1, b.variable(p_.measured[o]).name, y));
                if (!p_.weights.empty()) {
                    const double w = p_.weights[i * n_out + o];
                    if (!std::isfinite(w) || w < 0)
                        throw Error(ErrorKind::invalid_argument,
                                    fmt::format("data row {}: weight {} of {} is not a finite number >= 0", i + 1, w,
                                                b.variable(p_.measured[o]).name));
                }
            }
        }
    }

    struct Used {
        std::size_t at;  // in points × measured
        double sqrt_weight;
    };
    const Block& base_;
    const FitProblem& p_;
    std::vector<Free> free_;
    std::vector<Used> used_;
    std::vector<double> values_;
    int evaluations_ = 0;
    ErrorKind kind_ = ErrorKind::internal;
};

/// ∂r/∂θ at θ by finite differences (forward, or central when `central`); a step that would
/// cross a bound, or that the model cannot solve, is taken the other way.
bool jacobian(Residuals& res, const VectorXd& theta, const VectorXd& r0, bool central, MatrixXd& J, std::string* why) {
    const auto n = theta.size();
    J.resize(r0.size(), n);
    VectorXd t = theta, r_plus, r_minus;
    for (Eigen::Index k = 0; k < n; ++k) {
        const BoundMap& map = res.free()[static_cast<std::size_t>(k)].map;
        const double h = (central ? kCentralStep : kForwardStep) * std::max(std::fabs(theta[k]), 1.0);
        const bool up_ok = theta[k] + h <= map.hi(), down_ok = theta[k] - h >= map.lo();
        bool have_plus = false, have_minus = false;
        if (up_ok) {
            t[k] = theta[k] + h;
            have_plus = res.evaluate(t, r_plus, why);
        }
        if (down_ok && (central || !have_plus)) {
            t[k] = theta[k] - h;
            have_minus = res.evaluate(t, r_minus, why);
        }
        t[k] = theta[k];
        if (have_plus && have_minus) J.col(k) = (r_plus - r_minus) / (2 * h);
        else if (have_plus) J.col(k) = (r_plus - r0) / h;
        else if (have_minus) J.col(k) = (r0 - r_minus) / h;
        else return false;
    }
    return true;
}

/// Eigen's functor: residuals and Jacobian in the unconstrained coordinate z.
struct LmFunctor : Eigen::DenseFunctor<double> {
    LmFunctor(Residuals& res, int values) : DenseFunctor<double>(static_cast<int>(res.free().size()), values), res(res) {}

    VectorXd theta_of(const VectorXd& z) const {
        VectorXd theta(z.size());
        for (Eigen::Index k = 0; k < z.size(); ++k) theta[k] = res.free()[static_cast<std::size_t>(k)].map.theta(z[k]);
        return theta;
    }

    int operator()(const VectorXd& z, VectorXd& f) {
        if (res.evaluate(theta_of(z), f, nullptr)) {
            const double norm = f.stableNorm();
            if (!(best_norm <= norm)) {  // the iteration accepts only points that lower the norm
                best_norm = norm;
                best_z = z;
                best_f = f;
            }
        } else {
            f.setConstant(kPenalty);
        }
        return 0;
    }

    int df(const VectorXd& z, MatrixXd& J) {
        VectorXd f0;
        if (best_z.size() == z.size() && best_z == z) f0 = best_f;
        else if (!res.evaluate(theta_of(z), f0, nullptr)) return -1;
        if (!jacobian(res, theta_of(z), f0, false, J, nullptr)) return -1;
        for (Eigen::Index k = 0; k < z.size(); ++k) J.col(k) *= res.free()[static_cast<std::size_t>(k)].map.dtheta_dz(z[k]);
        return 0;
    }

    Residuals& res;
    double best_norm = kInf;
    VectorXd best_z, best_f;
};

const char* termination_text(Eigen::LevenbergMarquardtSpace::Status s) {
    using namespace Eigen::LevenbergMarquardtSpace;
    switch (s) {
        case RelativeReductionTooSmall: return "the sum of squares changes by less than the tolerance";
        case RelativeErrorTooSmall: return "the step is smaller than the tolerance relative to the parameters";
        case RelativeErrorAndReductionTooSmall:
            return "the sum of squares and the step both change by less than the tolerance";
        case CosinusTooSmall: return "the residuals are orthogonal to the Jacobian (zero gradient)";
        case FtolTooSmall:
        case XtolTooSmall:
        case GtolTooSmall: return "no further reduction of the sum of squares is possible at machine precision";
        default: return "stopped";
    }
}

std::string names_of(const std::vector<Free>& free, const std::vector<std::size_t>& which) {
    std::string out;
    for (std::size_t i = 0; i < which.size(); ++i) {
        if (i) out += i + 1 == which.size() ? " and " : ", ";
        out += free[which[i]].info->name;
    }
    return out;
}

/// Standard errors, intervals, correlations, condition number and warnings at the optimum.
void statistics(Residuals& res, const VectorXd& theta, const VectorXd& r, FitResult& out) {
    const auto& free = res.free();
    const auto n = theta.size();
    const auto m = r.size();
    MatrixXd J;
    std::string why;
    if (!jacobian(res, theta, r, true, J, &why))
        throw Error(ErrorKind::no_convergence, "the Jacobian at the optimum cannot be evaluated: " + why);
    out.sum_of_squares = r.squaredNorm();
    out.degrees_of_freedom = static_cast<std::size_t>(m - n);
    out.residual_variance = m > n ? out.sum_of_squares / static_cast<double>(m - n) : kNaN;
    if (m == n)
        out.warnings.push_back("as many measured values as free parameters: no residual variance, so no standard errors");

    VectorXd norms = J.colwise().norm();
    std::vector<std::size_t> insensitive;
    for (Eigen::Index k = 0; k < n; ++k)
        if (!(norms[k] > 0)) insensitive.push_back(static_cast<std::size_t>(k));
    if (!insensitive.empty())
        out.warnings.push_back(fmt::format("the measured values do not depend on {} at the optimum: {} not determined",
                                           names_of(free, insensitive), insensitive.size() > 1 ? "they are" : "it is"));
    MatrixXd Js = J;
    for (Eigen::Index k = 0; k < n; ++k) Js.col(k) /= norms[k] > 0 ? norms[k] : 1.0;
    Eigen::JacobiSVD<MatrixXd> svd(Js, Eigen::ComputeThinV);
    const VectorXd sv = svd.singularValues();
    out.condition_number = sv[n - 1] > 0 ? sv[0] / sv[n - 1] : kInf;
    const bool singular = !insensitive.empty() || !(sv[n - 1] > kSingular * sv[0]);

    out.correlation.assign(static_cast<std::size_t>(n), std::vector<double>(static_cast<std::size_t>(n), kNaN));
    VectorXd se_theta = VectorXd::Constant(n, kNaN);
    if (!singular) {
        const MatrixXd V = svd.matrixV();
        const MatrixXd scaled_cov = V * sv.cwiseInverse().cwiseAbs2().asDiagonal() * V.transpose();
        for (Eigen::Index i = 0; i < n; ++i) {
            if (m > n) se_theta[i] = std::sqrt(out.residual_variance * scaled_cov(i, i)) / norms[i];
            for (Eigen::Index j = 0; j < n; ++j)
                out.correlation[static_cast<std::size_t>(i)][static_cast<std::size_t>(j)] =
                    scaled_cov(i, j) / std::sqrt(scaled_cov(i, i) * scaled_cov(j, j));
        }
    }
    if (singular && insensitive.empty()) {
        // The direction the data do not see: the right singular vector of the smallest singular value.
        const VectorXd v = svd.matrixV().col(n - 1);
        std::vector<std::size_t> involved;
        for (Eigen::Index k = 0; k < n; ++k)
            if (std::fabs(v[k]) >= 0.1 * v.cwiseAbs().maxCoeff()) involved.push_back(static_cast<std::size_t>(k));
        out.warnings.push_back(fmt::format(
            "the data cannot separate {}: only a combination of them is determined (condition number {:.3g}); no "
            "standard errors. Fix all but one of them, or add data that tell them apart (another temperature, a wider "
            "range of current density, another measured output)",
            names_of(free, involved), out.condition_number));
    } else if (!singular && out.condition_number > kConditionWarning) {
        const VectorXd v = svd.matrixV().col(n - 1);
        std::vector<std::size_t> involved;
        for (Eigen::Index k = 0; k < n; ++k)
            if (std::fabs(v[k]) >= 0.1 * v.cwiseAbs().maxCoeff()) involved.push_back(static_cast<std::size_t>(k));
        out.warnings.push_back(fmt::format("the fit is ill-conditioned (condition number {:.3g}): the data hardly "
                                           "separate {}",
                                           out.condition_number, names_of(free, involved)));
    }
    for (Eigen::Index i = 0; i < n; ++i)
        for (Eigen::Index j = i + 1; j < n; ++j) {
            const double rho = out.correlation[static_cast<std::size_t>(i)][static_cast<std::size_t>(j)];
            if (std::fabs(rho) >= kCorrelationWarning)
                out.warnings.push_back(fmt::format("the data hardly separate {} and {}: their estimates are "
                                                   "correlated (correlation {:.4f})",
                                                   free[static_cast<std::size_t>(i)].info->name,
                                                   free[static_cast<std::size_t>(j)].info->name, rho));
        }

    const double t = m > n ? boost::math::quantile(boost::math::complement(
                                 boost::math::students_t(static_cast<double>(m - n)), 0.025))
                           : kNaN;
    for (Eigen::Index k = 0; k < n; ++k) {
        const Free& f = free[static_cast<std::size_t>(k)];
        FittedParameter& q = out.parameters[static_cast<std::size_t>(k)];
        const double s = se_theta[k];
        if (f.log) {
            q.standard_error = q.value * s;  // delta method: dp = p·d(ln p)
            q.interval_low = q.value * std::exp(-t * s);
            q.interval_high = q.value * std::exp(t * s);
        } else {
            q.standard_error = f.nominal * s;
            q.interval_low = q.value - t * q.standard_error;
            q.interval_high = q.value + t * q.standard_error;
        }
        const double width = std::isfinite(f.map.hi() - f.map.lo()) ? f.map.hi() - f.map.lo() : 1.0;
        const double th = theta[k];
        if (std::isfinite(f.map.lo()) && th - f.map.lo() <= 1e-6 * width) q.at_bound = true;
        if (std::isfinite(f.map.hi()) && f.map.hi() - th <= 1e-6 * width) q.at_bound = true;
        if (q.at_bound)
            out.warnings.push_back(fmt::format("{} ended at its {} bound {}: its standard error treats it as free; widen "
                                               "the bound or fix the parameter",
                                               f.info->name, f.map.hi() - th < th - f.map.lo() ? "upper" : "lower",
                                               value_text(q.value, f.info->unit)));
        else if (std::isfinite(s) && (f.log ? t * s > std::log(10.0) : t * q.standard_error > std::fabs(q.value)))
            out.warnings.push_back(fmt::format("{} is poorly determined: its 95 % interval is [{}, {}]", f.info->name,
                                               value_text(q.interval_low, f.info->unit),
                                               value_text(q.interval_high, f.info->unit)));
    }
}

}  // namespace

FitResult fit(Block& block, const FitProblem& problem, const FitOptions& options) {
    if (options.max_iterations < 1)
        throw Error(ErrorKind::invalid_argument, fmt::format("max_iterations is {}; it must be at least 1", options.max_iterations));
    if (!(options.tolerance > 0) || !(options.tolerance < 1))
        throw Error(ErrorKind::invalid_argument, fmt::format("tolerance is {}; it must be above 0 and below 1", options.tolerance));
    const Block base = block;
    Residuals res(base, problem, check_free(base, problem));
    const auto& free = res.free();
    const auto n = static_cast<Eigen::Index>(free.size());

    FitResult out;
    for (std::size_t o = 0; o < problem.measured.size(); ++o) out.measured_names.push_back(base.variable(problem.measured[o]).name);

    // The start: every row must solve, and every parameter must change some measured value.
    VectorXd theta0(n);
    for (Eigen::Index k = 0; k < n; ++k) theta0[k] = free[static_cast<std::size_t>(k)].theta_of(free[static_cast<std::size_t>(k)].start);
    VectorXd r0;
    std::string why;
    if (!res.evaluate(theta0, r0, &why)) throw Error(res.last_failure_kind(), "at the start values: " + why);
    {
        MatrixXd J0;
        if (!jacobian(res, theta0, r0, false, J0, &why)) throw Error(res.last_failure_kind(), "at the start values: " + why);
        const VectorXd norms = J0.colwise().norm();
        const double largest = norms.maxCoeff();
        for (Eigen::Index k = 0; k < n; ++k)
            if (!(norms[k] > 1e-10 * largest) || !(norms[k] > 0))
                throw Error(ErrorKind::invalid_argument,
                            fmt::format("{} cannot be fitted from these data: the measured values ({}) do not depend on "
                                        "it at the data's operating points",
                                        free[static_cast<std::size_t>(k)].info->name,
                                        fmt::join(out.measured_names, ", ")));
    }

    // The iteration in z, each parameter's bounds enforced by its map.
    VectorXd z(n);
    for (Eigen::Index k = 0; k < n; ++k) z[k] = free[static_cast<std::size_t>(k)].map.z(theta0[k]);
    LmFunctor functor(res, static_cast<int>(res.count()));
    Eigen::LevenbergMarquardt<LmFunctor> lm(functor);
    lm.setFtol(options.tolerance);
    lm.setXtol(options.tolerance);
    lm.setMaxfev(20 * static_cast<Eigen::Index>(options.max_iterations) + 1);
    using namespace Eigen::LevenbergMarquardtSpace;
    Status status = lm.minimizeInit(z);
    if (status == ImproperInputParameters) throw Error(ErrorKind::internal, "the least-squares solver refused its set-up");
    int steps = 0;
    bool limit = false;
    if (status != UserAsked) {
        do {
            status = lm.minimizeOneStep(z);
            ++steps;
            if (options.progress &&
                !options.progress(static_cast<std::size_t>(steps), static_cast<std::size_t>(options.max_iterations)))
                throw Error(ErrorKind::cancelled, "fit cancelled by the progress callback");
            if (status == Running && steps >= options.max_iterations) limit = true;
        } while (status == Running && !limit);
    }
    const VectorXd best_theta = functor.best_z.size() == n ? functor.theta_of(functor.best_z) : theta0;
    const auto best_values = [&] {
        std::string s;
        for (Eigen::Index k = 0; k < n; ++k) {
            const Free& f = free[static_cast<std::size_t>(k)];
            s += fmt::format("{}{} = {}", k ? ", " : "", f.info->name, value_text(f.value_of(best_theta[k]), f.info->unit));
        }
        return s;
    };
    if (limit || status == TooManyFunctionEvaluation)
        throw Error(ErrorKind::no_convergence,
                    fmt::format("the fit did not converge in {} iterations ({} model evaluations); best so far: {} "
                                "(weighted residual norm {:.6g})",
                                steps, res.evaluations(), best_values(), functor.best_norm));
    if (status == UserAsked)
        throw Error(ErrorKind::no_convergence,
                    fmt::format("the fit stopped: the Jacobian could not be evaluated near {}", best_values()));

    // The optimum: the lowest sum of squares seen (the iteration accepts only lower ones).
    VectorXd r;
    std::vector<double> model;
    if (!res.evaluate(best_theta, r, &why, &model)) throw Error(ErrorKind::internal, "the optimum no longer solves: " + why);
    out.iterations = steps;
    out.termination = termination_text(status);
    out.points = problem.points;
    out.measurements = res.count();
    for (Eigen::Index k = 0; k < n; ++k) {
        const Free& f = free[static_cast<std::size_t>(k)];
        FittedParameter q;
        q.name = f.info->name;
        q.config_key = f.info->config_key ? f.info->config_key : "";
        q.unit = f.info->unit;
        q.log_scale = f.log;
        q.start = f.start;
        q.value = f.value_of(best_theta[k]);
        q.lower = f.lower;
        q.upper = f.upper;
        out.parameters.push_back(q);
    }
    statistics(res, best_theta, r, out);

    // Per measured variable: the model, the residuals and their root mean square (unweighted).
    const std::size_t n_out = problem.measured.size();
    out.fitted = model;
    out.residuals.assign(model.size(), kNaN);
    out.rmse.assign(n_out, kNaN);
    std::vector<double> sum(n_out, 0.0);
    std::vector<std::size_t> count(n_out, 0);
    for (std::size_t i = 0; i < problem.points; ++i)
        for (std::size_t o = 0; o < n_out; ++o) {
            const std::size_t at = i * n_out + o;
            if (std::isnan(problem.measured_values[at])) continue;
            out.residuals[at] = model[at] - problem.measured_values[at];
            sum[o] += out.residuals[at] * out.residuals[at];
            ++count[o];
        }
    for (std::size_t o = 0; o < n_out; ++o)
        if (count[o]) out.rmse[o] = std::sqrt(sum[o] / static_cast<double>(count[o]));
    out.evaluations = res.evaluations();

    // The block takes the fitted values only now, all or none.
    Block calibrated = base;
    std::vector<int32_t> indices;
    for (const FittedParameter& q : out.parameters) {
        const int32_t index = calibrated.find(q.name);
        calibrated.set(index, q.value);
        indices.push_back(index);
    }
    out.plant_json = calibrated_plant_json(calibrated, indices);
    block = std::move(calibrated);
    return out;
}

}  // namespace ely
