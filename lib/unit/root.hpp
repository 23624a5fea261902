#pragma once
// Bracketed scalar root finding: Brent's method (Brent, Algorithms for Minimization without
// Derivatives, 1973, ch. 4, "zeroin"): inverse quadratic interpolation and secant steps,
// safeguarded by bisection, so it converges superlinearly on smooth functions and always
// terminates within the bracket.
#include <cmath>
#include <fmt/format.h>
#include <utility>

#include "base/error.hpp"

namespace ely {

/// Finds x in [a, b] with f(x) = 0, given fa = f(a) and fb = f(b) of opposite signs (or one
/// zero). Stops when the bracket is narrower than x_tolerance; at most max_iter steps.
template <class F>
double brent_root(F&& f, double a, double b, double fa, double fb, double x_tolerance, int max_iter = 200) {
    if (fa == 0.0) return a;
    if (fb == 0.0) return b;
    if ((fa > 0) == (fb > 0))
        throw Error(ErrorKind::internal, fmt::format("root bracket [{:g}, {:g}] does not change sign", a, b));
    double c = a, fc = fa, d = b - a, e = d;
    for (int iter = 0; iter < max_iter; ++iter) {
        if ((fb > 0) == (fc > 0)) { c = a; fc = fa; d = e = b - a; }
        if (std::fabs(fc) < std::fabs(fb)) { a = b; b = c; c = a; fa = fb; fb = fc; fc = fa; }
        const double tol = 2.0 * 2.2e-16 * std::fabs(b) + 0.5 * x_tolerance;
        const double m = 0.5 * (c - b);
        if (std::fabs(m) <= tol || fb == 0.0) return b;
        if (std::fabs(e) >= tol && std::fabs(fa) > std::fabs(fb)) {
            double p, q, r;
            const double s = fb / fa;
            if (a == c) {
                p = 2.0 * m * s; q = 1.0 - s;
            } else {
                q = fa / fc; r = fb / fc;
                p = s * (2.0 * m * q * (q - r) - (b - a) * (r - 1.0));
                q = (q - 1.0) * (r - 1.0) * (s - 1.0);
            }
            if (p > 0) q = -q; else p = -p;
            if (2.0 * p < std::min(3.0 * m * q - std::fabs(tol * q), std::fabs(e * q))) { e = d; d = p / q; }
            else { d = m; e = m; }
        } else {
            d = m; e = m;
        }
        a = b; fa = fb;
        b += std::fabs(d) > tol ? d : (m > 0 ? tol : -tol);
        fb = f(b);
    }
    throw Error(ErrorKind::no_convergence, fmt::format("root solve did not converge in {} steps", max_iter));
}

}  // namespace ely
