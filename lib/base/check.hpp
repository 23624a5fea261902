#pragma once
// Argument checks shared by all of lib/: each throws ely::Error with a message that names
// the quantity, the value given and the limit crossed, e.g.
//   "IF97 region 1: temperature 650 K is above the limit 623.15 K"
//   "membrane thickness -1 m is not above the limit 0 m"
//   "in.temperature nan K is not a finite number"
// Values print in shortest round-trip form, limits with nine significant digits. The checks
// cost two comparisons when they pass; the message is built only when one fails.
#include <cmath>
#include <fmt/format.h>
#include <string>

#include "base/error.hpp"

namespace ely {

/// The name of a checked quantity, optionally with its context ("IF97 region 1").
struct QuantityName {
    const char* context = nullptr;
    const char* name;
    QuantityName(const char* quantity) : name(quantity) {}  // NOLINT: implicit on purpose
    QuantityName(const char* where, const char* quantity) : context(where), name(quantity) {}
};

namespace check_detail {
inline std::string text(const QuantityName& q) {
    return q.context ? fmt::format("{}: {}", q.context, q.name) : std::string(q.name);
}
inline std::string with_unit(const char* unit) { return (unit && *unit) ? std::string(" ") + unit : std::string(); }
[[noreturn]] inline void fail(ErrorKind kind, const QuantityName& q, double value, const char* unit, const char* what,
                              double limit) {
    const std::string u = with_unit(unit);
    throw Error(kind, fmt::format("{} {}{} is {} {:.9g}{}", text(q), value, u, what, limit, u));
}
}  // namespace check_detail

inline double require_finite(double value, const QuantityName& what, const char* unit = "") {
    if (!std::isfinite(value))
        throw Error(ErrorKind::invalid_argument, fmt::format("{} {}{} is not a finite number", check_detail::text(what),
                                                             value, check_detail::with_unit(unit)));
    return value;
}

inline double require_positive(double value, const QuantityName& what, const char* unit = "") {
    require_finite(value, what, unit);
    if (!(value > 0.0)) check_detail::fail(ErrorKind::invalid_argument, what, value, unit, "not above the limit", 0.0);
    return value;
}

inline double require_at_least(double value, double lo, const QuantityName& what, const char* unit = "") {
    require_finite(value, what, unit);
    if (value < lo) check_detail::fail(ErrorKind::out_of_range, what, value, unit, "below the limit", lo);
    return value;
}

inline double require_at_most(double value, double hi, const QuantityName& what, const char* unit = "") {
    require_finite(value, what, unit);
    if (value > hi) check_detail::fail(ErrorKind::out_of_range, what, value, unit, "above the limit", hi);
    return value;
}

/// lo <= value <= hi.
inline double require_within(double value, double lo, double hi, const QuantityName& what, const char* unit = "") {
    require_at_least(value, lo, what, unit);
    return require_at_most(value, hi, what, unit);
}

}  // namespace ely
