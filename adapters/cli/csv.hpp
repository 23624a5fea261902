#pragma once
// CSV output: one header row whose column names carry their unit, "cell.voltage [V]", then the
// values (SI by default, the variable table's display units with --units engineering); a value
// that is not a number is an empty field.
#include <string>
#include <vector>

#include "block.hpp"
#include "output.hpp"
#include "quantities.hpp"

namespace elycli {

/// "name [unit]" of a variable in the chosen units.
std::string column_name(const Variable& v, Units units);

/// Every variable of the solved block, one per row: name,value,unit.
void write_variables_csv(const Block& block, Output& out, Units units);

/// A table whose columns are variables, written row by row.
class CsvTable {
public:
    CsvTable(Output& out, Units units) : out_(out), units_(units) {}
    /// The header: each column's name and unit, and a text column `status_column` after the first.
    void header(const std::vector<const Variable*>& columns, const std::string& status_column);
    /// A row: values of the columns in SI (converted as the header says), the status after the first.
    void row(const std::vector<const Variable*>& columns, const double* si_values, const std::string& status);

private:
    Output& out_;
    Units units_;
    std::string line_;
};

}  // namespace elycli
