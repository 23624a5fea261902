// The fit report as JSON (members described in docs/calibration.md).
#include <boost/json.hpp>
#include <cmath>
#include <cstring>

#include "calibration/fit.hpp"
#include "calibration/json_text.hpp"
#include "config/json_reader.hpp"

namespace ely {

namespace json = boost::json;

namespace {

json::array numbers(const double* begin, std::size_t count) {
    json::array a;
    for (std::size_t i = 0; i < count; ++i) a.emplace_back(begin[i]);  // NaN is written null
    return a;
}

json::array rows(const std::vector<double>& values, std::size_t points, std::size_t columns) {
    json::array a;
    for (std::size_t i = 0; i < points; ++i) a.emplace_back(numbers(values.data() + i * columns, columns));
    return a;
}

}  // namespace

std::string fit_report_json(const FitResult& r) {
    // Members in the order people read them: what was fitted, how well, what to beware of,
    // how the iteration went, the rows, and the calibrated plant last.
    json::object report;
    json::array parameters;
    for (const FittedParameter& p : r.parameters) {
        json::object o;
        o["name"] = p.name;
        o["config_key"] = p.config_key;
        o["unit"] = p.unit;
        o["scale"] = p.log_scale ? "log" : "linear";
        o["start"] = p.start;
        o["value"] = p.value;
        o["standard_error"] = p.standard_error;
        o["interval_95"] = json::array{p.interval_low, p.interval_high};
        o["bounds"] = json::array{p.lower, p.upper};
        o["at_bound"] = p.at_bound;
        parameters.emplace_back(std::move(o));
    }
    report["parameters"] = std::move(parameters);
    json::array correlation;
    for (const auto& row : r.correlation) correlation.emplace_back(numbers(row.data(), row.size()));
    report["correlation"] = std::move(correlation);
    report["condition_number"] = r.condition_number;
    json::array measured;
    for (const auto& name : r.measured_names) measured.emplace_back(json::string(name));
    report["measured"] = std::move(measured);
    json::object rmse;
    for (std::size_t o = 0; o < r.measured_names.size(); ++o) rmse[r.measured_names[o]] = r.rmse[o];
    report["rmse"] = std::move(rmse);
    for (std::size_t o = 0; o < r.measured_names.size(); ++o)
        if (r.measured_names[o] == "cell.voltage") report["rmse_V"] = r.rmse[o];
    json::array warnings;
    for (const auto& w : r.warnings) warnings.emplace_back(json::string(w));
    report["warnings"] = std::move(warnings);
    report["termination"] = r.termination;
    report["iterations"] = r.iterations;
    report["evaluations"] = r.evaluations;
    report["points"] = r.points;
    report["measurements"] = r.measurements;
    report["degrees_of_freedom"] = r.degrees_of_freedom;
    report["sum_of_squares"] = r.sum_of_squares;
    report["residual_variance"] = r.residual_variance;
    const std::size_t columns = r.measured_names.size();
    report["residuals"] = rows(r.residuals, r.points, columns);
    report["fitted"] = rows(r.fitted, r.points, columns);
    report["plant"] = r.plant_json.empty() ? json::value(nullptr) : json_input::parse_json(r.plant_json, {});
    return calibration::indented_json(report);
}

}  // namespace ely
