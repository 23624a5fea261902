#pragma once
// SI base-unit exponents of the variable table's unit texts ("W", "J/(kg K)", "ohm m2/h"), for
// the model description's UnitDefinitions: value in base units = factor * value + offset.
#include <array>
#include <string>

namespace elyfmi {

struct BaseUnit {
    std::array<int, 8> exponents{};  // kg, m, s, A, K, mol, cd, rad (FMI's BaseUnit attributes, in order)
    double factor = 1;
};
inline constexpr const char* kBaseUnitNames[8] = {"kg", "m", "s", "A", "K", "mol", "cd", "rad"};

/// Reads a unit text of the table: symbols separated by spaces or '*', '/' dividing by what
/// follows it (a symbol or a parenthesised group), integer powers written after the symbol
/// ("m2", "s-1", "m^2"); "1" is dimensionless. Throws std::runtime_error naming the unit and
/// the symbol it does not know.
BaseUnit base_unit(const std::string& unit);

}  // namespace elyfmi
