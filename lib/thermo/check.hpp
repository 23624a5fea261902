#pragma once
// Argument checks shared by all of lib/: each throws ely::Error with a message that names
// the quantity, the value and the limit.
#include <cmath>
#include <fmt/format.h>

#include "thermo/error.hpp"

namespace ely {

inline double require_finite(double value, const char* what) {
    if (!std::isfinite(value))
        throw Error(ErrorKind::invalid_argument, fmt::format("{} is {}; a finite number is required", what, value));
    return value;
}

inline double require_positive(double value, const char* what) {
    require_finite(value, what);
    if (!(value > 0.0))
        throw Error(ErrorKind::invalid_argument, fmt::format("{} is {}; it must be positive", what, value));
    return value;
}

/// Checks lo <= value <= hi; `unit` is printed after the numbers.
inline double require_within(double value, double lo, double hi, const char* what, const char* unit) {
    require_finite(value, what);
    if (value < lo)
        throw Error(ErrorKind::out_of_range,
                    fmt::format("{} {:g} {} is below the limit {:g} {}", what, value, unit, lo, unit));
    if (value > hi)
        throw Error(ErrorKind::out_of_range,
                    fmt::format("{} {:g} {} is above the limit {:g} {}", what, value, unit, hi, unit));
    return value;
}

}  // namespace ely
