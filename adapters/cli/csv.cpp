#include "csv.hpp"

#include <cmath>
#include <fmt/format.h>

namespace elycli {
namespace {
// RFC 4180: a field with a comma, a quote or a line break is quoted, its quotes doubled.
std::string field(const std::string& text) {
    if (text.find_first_of(",\"\r\n") == std::string::npos) return text;
    std::string out = "\"";
    for (char ch : text) out += ch == '"' ? std::string("\"\"") : std::string(1, ch);
    return out + '"';
}
}  // namespace

std::string column_name(const Variable& v, Units units) {
    return fmt::format("{} [{}]", v.info.name, shown(v.info, 0.0, units).unit);
}

void write_variables_csv(const Block& block, Output& out, Units units) {
    out.write("name,value,unit\n");
    for (const auto& v : block.variables()) {
        const Shown s = shown(v.info, block.get(v), units);
        out.print("{},{},{}\n", v.info.name, number_text(s.value, units), s.unit);
    }
}

void CsvTable::header(const std::vector<const Variable*>& columns, const std::string& status_column) {
    line_.clear();
    for (std::size_t c = 0; c < columns.size(); ++c) {
        if (c > 0) line_ += ',';
        line_ += column_name(*columns[c], units_);
        if (c == 0) line_ += ',' + field(status_column);
    }
    line_ += '\n';
    out_.write(line_);
}

void CsvTable::row(const std::vector<const Variable*>& columns, const double* si_values, const std::string& status) {
    line_.clear();
    for (std::size_t c = 0; c < columns.size(); ++c) {
        if (c > 0) line_ += ',';
        line_ += number_text(shown(columns[c]->info, si_values[c], units_).value, units_);
        if (c == 0) line_ += ',' + field(status);
    }
    line_ += '\n';
    out_.write(line_);
}

}  // namespace elycli
