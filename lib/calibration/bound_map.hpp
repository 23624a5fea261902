#pragma once
// Bounds of a fitted parameter enforced by a change of variable, so that the unconstrained
// Levenberg–Marquardt iteration never leaves them: the transformations of MINUIT (F. James,
// MINUIT reference manual, CERN Program Library D506, "parameter limits"; the same formulas as
// the lmfit documentation's "Bounds Implementation" gives):
//   two bounds  θ = lo + (hi − lo)·(sin z + 1)/2
//   lower only  θ = lo − 1 + √(z² + 1)
//   upper only  θ = hi + 1 − √(z² + 1)
//   none        θ = z
// θ is the fit's natural coordinate (ln p or p/nominal), of order one, which the "± 1" of the
// one-sided forms assumes.
#include <cmath>

namespace ely::calibration {

class BoundMap {
public:
    BoundMap(double lo, double hi) : lo_(lo), hi_(hi) {}

    double lo() const { return lo_; }
    double hi() const { return hi_; }

    double theta(double z) const {
        if (two()) return lo_ + 0.5 * (hi_ - lo_) * (std::sin(z) + 1.0);
        if (std::isfinite(lo_)) return lo_ - 1.0 + std::sqrt(z * z + 1.0);
        if (std::isfinite(hi_)) return hi_ + 1.0 - std::sqrt(z * z + 1.0);
        return z;
    }

    double dtheta_dz(double z) const {
        if (two()) return 0.5 * (hi_ - lo_) * std::cos(z);
        if (std::isfinite(lo_)) return z / std::sqrt(z * z + 1.0);
        if (std::isfinite(hi_)) return -z / std::sqrt(z * z + 1.0);
        return 1.0;
    }

    /// The z of a θ within the bounds. A θ on a bound (where dθ/dz = 0 and the iteration could
    /// not move it) is first moved inside by kInside (of the width for two bounds, absolute for one).
    double z(double theta) const {
        if (two()) {
            double s = 2.0 * (theta - lo_) / (hi_ - lo_) - 1.0;
            s = std::fmax(-1.0 + kInside, std::fmin(1.0 - kInside, s));
            return std::asin(s);
        }
        if (std::isfinite(lo_)) {
            const double y = std::fmax(theta - lo_, kInside) + 1.0;
            return std::sqrt(y * y - 1.0);
        }
        if (std::isfinite(hi_)) {
            const double y = std::fmax(hi_ - theta, kInside) + 1.0;
            return std::sqrt(y * y - 1.0);
        }
        return theta;
    }

    static constexpr double kInside = 1e-4;

private:
    bool two() const { return std::isfinite(lo_) && std::isfinite(hi_); }
    double lo_, hi_;
};

}  // namespace ely::calibration
