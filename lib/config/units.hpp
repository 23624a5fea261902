#pragma once
// Quantities with units in the config: "80 degC", "30 bar", "2 A/cm2", "0.15 ohm cm2".
// A unit expression is parsed into a rational factor times a power of ten, an offset
// (degC only) and a dimension over the SI base units m, kg, s, A, K, mol; the value is then
// expressed in the unit the caller expects (an SI unit string such as ParameterInfo::unit).
//
// Grammar (SI Brochure, 9th ed. 2019, section 5.4, with the usual engineering liberties):
//   expression := product ('/' product)*        a/b c = a/(b c); a/b/c = a/(b c)
//   product    := power (('*' | '.' | '·' | space) power)*
//   power      := atom exponent?                exponent: [^][-+]digits, or ² ³ ⁻¹ …
//   atom       := '(' expression ')' | symbol | '1'
// Symbols: m g s A K mol Pa bar W V J ohm Ω S C L l Wh Ah with the prefixes n u µ m c k M G;
// without prefixes: atm h min d t degC (°C), and the dimensionless 1 % ppm wt% mol% vol%.
// degC stands only on its own (a temperature, not a difference: use K in compounds).
//
// Limits (a unit in a plant description is a few characters; these bound the work and the
// stack any text can ask for, and every intermediate result of the exponent arithmetic):
// at most kMaxUnitLength bytes, kMaxUnitDepth levels of parentheses, exponents of the base
// units within ±kMaxUnitExponent and powers of ten within ±kMaxUnitPowerOfTen. Crossing one
// is ErrorKind::config naming the limit.
#include <array>
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

namespace ely {

inline constexpr std::size_t kMaxUnitLength = 128;
inline constexpr int kMaxUnitDepth = 16;
inline constexpr int kMaxUnitExponent = 24;
inline constexpr int kMaxUnitPowerOfTen = 400;

/// Exponents of the SI base units m, kg, s, A, K, mol.
using Dimension = std::array<int, 6>;

/// A parsed unit: value_SI = value · (numerator / denominator) · 10^exponent10 + offset.
struct Unit {
    double numerator = 1;    // integers, exact in a double
    double denominator = 1;
    int exponent10 = 0;
    double offset = 0;       // K, degC only
    Dimension dimension{};

    double factor() const;   // numerator / denominator · 10^exponent10
};

/// Parses a unit expression. Throws ely::Error (ErrorKind::config) naming the unit text:
/// "unit 'degF' is not known", "unit 'm^' has no exponent after '^'".
Unit parse_unit(std::string_view text);

/// The SI base units of a dimension in the order of Dimension, e.g. "kg m-1 s-2"; "1" if none.
std::string dimension_text(const Dimension& dimension);

// The two ways in, one conversion behind them (units.cpp, `apply`):
//  - parse_quantity: text that carries its own unit ("2 A/cm2": a plant description, an option
//    value on a command line) into the unit a variable is kept in;
//  - convert_unit: a number whose unit is known apart from it (a data file's column header, a
//    display unit) from one unit into another, offsets allowed on both sides.
// The C interface offers both as ely_parse_quantity and ely_convert_unit.

/// Converts `value` given in unit `from` into unit `to` (both unit expressions; either may be
/// degC, e.g. 353.15 K to degC is 80). The dimensions must agree ("expected a quantity in K,
/// got 'bar'"). Throws ErrorKind::config for a unit that does not parse, other dimensions, a
/// non-finite value or result.
double convert_unit(double value, std::string_view from, std::string_view to);

/// Parses "number unit" ("1.5 MW", "25 %", "80degC", or a bare "42" taken as already in
/// `expected_unit`) and returns the value in `expected_unit`, which must have no offset (not
/// degC). An expected unit outside the grammar (an empirical "(A/m2)^-n") accepts bare numbers
/// only. Throws ErrorKind::config with a message without a JSON path; the config layer puts the
/// path in front. A non-finite number or result is an error.
double parse_quantity(std::string_view text, std::string_view expected_unit);

/// Parses a plain number with optional surrounding white space ("100", " 1e2 "), no unit.
/// Throws ErrorKind::config for anything else, a non-finite number included.
double parse_plain_number(std::string_view text);

/// Markdown list of the accepted unit symbols and prefixes, generated from the parser's tables.
std::string units_markdown();

}  // namespace ely
