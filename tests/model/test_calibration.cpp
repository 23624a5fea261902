// Calibration (lib/calibration): recovery of known parameters from synthetic curves, the
// coverage of the reported 95 % intervals over repeated noisy trials, unidentifiable parameter
// sets, bounds, weights and missing values, the calibrated plant description, and every
// refusal leaving the block unchanged.
#include <boost/json.hpp>
#include <boost/math/distributions/binomial.hpp>
#include <fmt/format.h>
#include <random>

#include "calibration/bound_map.hpp"
#include "calibration/fit.hpp"
#include "config/config.hpp"
#include "support.hpp"

namespace ely {
namespace {

using test::expect_error;
using ::testing::HasSubstr;

// A PEM plant at 80 °C. The parameters the fits recover are set here (the "truth"); the others are the
// registry's defaults.
const char* const kPlant = R"({ "technology": "pem", "stack": { "cells": 100, "active_area": 0.1 },
  "cell": { "contact_resistance": 1e-5, "h2_permeability": 4.44e-14 },
  "operating": { "spec": "current_density", "temperature": "80 degC" } })";

Block pem_block() { return Block(parse_config(kPlant)); }

/// A polarization curve of `truth` at the given temperatures: n current densities per
/// temperature from 0.1 to 2 A/cm², the cell voltage measured (plus `noise` of standard deviation
/// sigma when an engine is given).
FitProblem curve(Block truth, const std::vector<std::string>& free, std::size_t n, std::vector<double> temperatures,
                 double sigma = 0, std::mt19937_64* engine = nullptr) {
    FitProblem p;
    const int32_t j = truth.find("in.current_density"), t = truth.find("in.temperature"), v = truth.find("cell.voltage");
    p.inputs = {j, t};
    p.measured = {v};
    std::normal_distribution<double> noise(0.0, sigma);
    for (double temperature : temperatures)
        for (std::size_t k = 0; k < n; ++k) {
            const double jk = 1000.0 + static_cast<double>(k) * (20000.0 - 1000.0) / static_cast<double>(n - 1);
            truth.set(j, jk);
            truth.set(t, temperature);
            truth.solve();
            p.input_values.insert(p.input_values.end(), {jk, temperature});
            p.measured_values.push_back(truth.get(v) + (engine ? noise(*engine) : 0.0));
        }
    p.points = p.measured_values.size();
    p.free = free;
    return p;
}

void scale_parameters(Block& b, const std::vector<std::string>& names, double factor) {
    for (const auto& name : names) {
        const int32_t i = b.find("param.cell." + name);
        b.set(i, b.get(i) * factor);
    }
}

const std::vector<std::string> kKinetics = {"anode_exchange_current_density", "anode_transfer_coefficient_forward",
                                            "contact_resistance"};

TEST(Calibration, NoiseFreeCurveGivesBackTheTrueValues) {
    const Block truth = pem_block();
    const FitProblem p = curve(truth, kKinetics, 15, {353.15});
    Block b = truth;
    scale_parameters(b, kKinetics, 1.5);
    const FitResult r = fit(b, p);
    ASSERT_EQ(r.parameters.size(), 3u);
    for (const auto& q : r.parameters) {
        EXPECT_LT(test::rel(q.value, truth.get(truth.find(q.name))), 1e-6) << q.name;
        EXPECT_DOUBLE_EQ(q.start, 1.5 * truth.get(truth.find(q.name))) << q.name;
        // The block holds the fitted values.
        EXPECT_EQ(b.get(b.find(q.name)), q.value) << q.name;
    }
    EXPECT_LT(r.rmse[0], 1e-8);
    EXPECT_EQ(r.points, 15u);
    EXPECT_EQ(r.measurements, 15u);
    EXPECT_EQ(r.degrees_of_freedom, 12u);
    EXPECT_GT(r.iterations, 0);
    // Exchange current densities span twelve decades of limits: log space; the transfer
    // coefficient's limits (0.05..4) do not; contact resistance has a lower limit of 0 and a
    // maximum two decades above its default: log space.
    EXPECT_TRUE(r.parameters[0].log_scale);
    EXPECT_FALSE(r.parameters[1].log_scale);
    EXPECT_TRUE(r.parameters[2].log_scale);
}

// The reported 95 % intervals hold the true values in about 95 % of repeated noisy trials. The
// band is that of a binomial count: with 200 trials at p = 0.95, 99.9 % of counts fall within
// it; a standard error off by a factor 1.5 either way would give about 81 % or 99.7 % coverage.
TEST(Calibration, IntervalsCoverTheTrueValuesAtTheirLevel) {
    const Block truth = pem_block();
    constexpr int kTrials = 200;
    const boost::math::binomial_distribution<double> counts(kTrials, 0.95);
    const double low = boost::math::quantile(counts, 0.0005), high = boost::math::quantile(counts, 0.9995);
    std::mt19937_64 engine(20240611);
    std::vector<int> inside(kKinetics.size(), 0);
    double mean_variance = 0;
    for (int trial = 0; trial < kTrials; ++trial) {
        const FitProblem p = curve(truth, kKinetics, 20, {353.15}, 0.003, &engine);
        Block b = truth;
        scale_parameters(b, kKinetics, 1.3);
        const FitResult r = fit(b, p);
        mean_variance += r.residual_variance / kTrials;
        for (std::size_t k = 0; k < kKinetics.size(); ++k) {
            const auto& q = r.parameters[k];
            const double t = truth.get(truth.find(q.name));
            if (q.interval_low <= t && t <= q.interval_high) ++inside[k];
        }
    }
    for (std::size_t k = 0; k < kKinetics.size(); ++k) {
        EXPECT_GE(inside[k], low) << kKinetics[k];
        EXPECT_LE(inside[k], high) << kKinetics[k];
    }
    // The residual variance estimates the noise's: 9e-6 V², within the spread of a chi-square
    // mean over 200 trials of 17 degrees of freedom (relative sd sqrt(2/17/200) = 2.4 %).
    EXPECT_NEAR(mean_variance / 9e-6, 1.0, 0.08);
}

TEST(Calibration, SixParametersFromFourTemperatures) {
    const std::vector<std::string> six = {"anode_exchange_current_density", "anode_transfer_coefficient_forward",
                                          "anode_activation_energy", "contact_resistance",
                                          "membrane_water_content", "cathode_exchange_current_density"};
    Block truth = pem_block();
    truth.set(truth.find("param.cell.cathode_exchange_current_density"), 30.0);  // a slow cathode, visible in the curve
    const FitProblem p = curve(truth, six, 25, {323.15, 338.15, 353.15, 363.15});
    Block b = truth;
    scale_parameters(b, six, 1.1);
    const FitResult r = fit(b, p);
    for (const auto& q : r.parameters) EXPECT_LT(test::rel(q.value, truth.get(truth.find(q.name))), 1e-4) << q.name;
}

// With equal transfer coefficients and Tafel kinetics at both electrodes, the two activation
// losses add to (RT/αF)·ln(j²/(j0,a·j0,c)) at one temperature: only the product of the exchange
// current densities is determined (apart from the small departure of Butler–Volmer from Tafel at
// the lowest current densities, which noise hides). A warning names both; the product is found.
TEST(Calibration, ExchangeCurrentDensitiesOfBothElectrodesAreFlaggedAsInseparable) {
    Block truth = pem_block();
    for (const char* key : {"param.cell.cathode_transfer_coefficient_forward", "param.cell.cathode_transfer_coefficient_backward"})
        truth.set(truth.find(key), 1.5);
    truth.set(truth.find("param.cell.cathode_exchange_current_density"), 1.0);
    const double anode_truth = truth.get(truth.find("param.cell.anode_exchange_current_density"));
    const std::vector<std::string> both = {"anode_exchange_current_density", "cathode_exchange_current_density"};
    std::mt19937_64 engine(7);
    for (const double sigma : {0.0, 0.002}) {
        SCOPED_TRACE(sigma);
        const FitProblem p = curve(truth, both, 20, {353.15}, sigma, &engine);
        Block b = truth;
        scale_parameters(b, both, 2.0);
        const FitResult r = fit(b, p);
        ASSERT_FALSE(r.warnings.empty());
        EXPECT_THAT(r.warnings[0], ::testing::ContainsRegex("(cannot|hardly) separate param.cell.anode_exchange_current_density "
                                                            "and param.cell.cathode_exchange_current_density"));
        const double rho = r.correlation[0][1];
        EXPECT_TRUE(std::isnan(rho) || std::fabs(rho) > 0.999) << rho;
        EXPECT_NEAR(std::log(r.parameters[0].value * r.parameters[1].value / (anode_truth * 1.0)), 0.0, sigma > 0 ? 0.2 : 1e-6);
    }
}

TEST(Calibration, ParameterTheMeasuredOutputsDoNotDependOnIsRefused) {
    Block b = pem_block();
    // The cell voltage does not depend on the hydrogen permeability (it lowers the Faraday
    // efficiency only).
    const FitProblem p = curve(b, {"contact_resistance", "h2_permeability"}, 10, {353.15});
    const double before = b.get(b.find("param.cell.contact_resistance"));
    expect_error([&] { fit(b, p); }, ErrorKind::invalid_argument,
                 "param.cell.h2_permeability cannot be fitted from these data: the measured values (cell.voltage) do not depend on it");
    EXPECT_EQ(b.get(b.find("param.cell.contact_resistance")), before);
}

// The Faraday efficiency as a second measured output, with weights for the two units and a row
// where it was not measured (NaN): the hydrogen permeability comes back from it.
TEST(Calibration, FaradayEfficiencyAndVoltageTogether) {
    Block truth = pem_block();
    const int32_t j = truth.find("in.current_density"), v = truth.find("cell.voltage"),
                  fe = truth.find("cell.faraday_efficiency");
    FitProblem p;
    p.inputs = {j};
    p.measured = {v, fe};
    for (double jk : {500.0, 1000.0, 2000.0, 5000.0, 10000.0, 15000.0, 20000.0}) {
        truth.set(j, jk);
        truth.solve();
        p.input_values.push_back(jk);
        p.measured_values.insert(p.measured_values.end(), {truth.get(v), jk == 5000.0 ? std::nan("") : truth.get(fe)});
        p.weights.insert(p.weights.end(), {1.0 / (0.002 * 0.002), 1.0 / (1e-4 * 1e-4)});  // 1/σ²
    }
    p.points = 7;
    p.free = {"contact_resistance", "param.cell.h2_permeability"};
    Block b = truth;
    b.set(b.find("param.cell.h2_permeability"), 1e-13);
    b.set(b.find("param.cell.contact_resistance"), 3e-5);
    const FitResult r = fit(b, p);
    EXPECT_EQ(r.measurements, 13u);  // 7 voltages, 6 efficiencies
    EXPECT_LT(test::rel(r.parameters[1].value, 4.44e-14), 1e-6);
    EXPECT_LT(test::rel(r.parameters[0].value, 1e-5), 1e-6);
    EXPECT_TRUE(std::isnan(r.residuals[3 * 2 + 1]));  // the row without an efficiency
    EXPECT_FALSE(std::isnan(r.fitted[3 * 2 + 1]));    // the model's value is still given
}

TEST(Calibration, WeightOfZeroLeavesAPointOut) {
    const Block truth = pem_block();
    FitProblem p = curve(truth, {"contact_resistance"}, 8, {353.15});
    p.measured_values[4] += 0.5;  // an outlier ...
    p.weights.assign(8, 1.0);
    p.weights[4] = 0.0;           // ... weighed out
    Block b = truth;
    const FitResult r = fit(b, p);
    EXPECT_LT(test::rel(r.parameters[0].value, 1e-5), 1e-6);
    EXPECT_NEAR(r.residuals[4], -0.5, 1e-6);  // reported, not fitted
    EXPECT_EQ(r.measurements, 7u);
}

TEST(Calibration, BoundsHoldAndAParameterAtItsBoundIsNamed) {
    const Block truth = pem_block();
    FitProblem p = curve(truth, {"contact_resistance"}, 8, {353.15});
    p.lower = {std::nan("")};
    p.upper = {6e-6};  // the true value, 1e-5, lies above
    Block b = truth;
    b.set(b.find("param.cell.contact_resistance"), 5e-6);
    const FitResult r = fit(b, p);
    EXPECT_LE(r.parameters[0].value, 6e-6);
    EXPECT_NEAR(r.parameters[0].value, 6e-6, 1e-12);
    EXPECT_TRUE(r.parameters[0].at_bound);
    EXPECT_EQ(r.parameters[0].lower, 0.0);  // the variable's own limit
    ASSERT_EQ(r.warnings.size(), 1u);
    EXPECT_THAT(r.warnings[0], HasSubstr("param.cell.contact_resistance ended at its upper bound"));
}

TEST(Calibration, CalibratedPlantLoadsAndReproducesTheFit) {
    const Block truth = pem_block();
    std::mt19937_64 engine(3);
    const FitProblem p = curve(truth, kKinetics, 12, {353.15}, 0.002, &engine);
    Block b = truth;
    scale_parameters(b, kKinetics, 1.4);
    b.set(b.find("param.degradation.voltage_rate"), 2e-6);  // set before the fit: written too
    const FitResult r = fit(b, p);
    Block again(parse_config(r.plant_json));
    for (const auto& q : r.parameters) EXPECT_EQ(again.get(again.find(q.name)), q.value) << q.name;
    EXPECT_EQ(again.get(again.find("param.degradation.voltage_rate")), 2e-6);
    // Parameters never set keep the description's text: not written.
    const auto plant = boost::json::parse(r.plant_json).as_object();
    EXPECT_FALSE(plant.at("cell").as_object().contains("membrane_water_content"));
    EXPECT_FALSE(plant.contains("limits"));
    EXPECT_EQ(plant.at("operating").at("temperature").as_string(), "80 degC");
    // Values are written as "number unit" (read exactly, where a JSON number would be read to an ulp).
    EXPECT_EQ(plant.at("cell").at("contact_resistance").as_string(),
              fmt::format("{} ohm m2", r.parameters[2].value));
    EXPECT_EQ(plant.at("cell").at("anode_transfer_coefficient_forward").as_string(),
              fmt::format("{}", r.parameters[1].value));
    // The same model values at the data's rows.
    const int32_t j = again.find("in.current_density"), v = again.find("cell.voltage");
    for (std::size_t i = 0; i < p.points; ++i) {
        again.set(j, p.input_values[2 * i]);
        again.solve();
        EXPECT_EQ(again.get(v), r.fitted[i]) << "row " << i;
    }
}

TEST(Calibration, ReportHasTheDocumentedMembers) {
    const Block truth = pem_block();
    const FitProblem p = curve(truth, {"contact_resistance", "anode_exchange_current_density"}, 6, {353.15});
    Block b = truth;
    const auto report = boost::json::parse(fit_report_json(fit(b, p))).as_object();
    for (const char* key : {"parameters", "correlation", "rmse", "rmse_V", "residuals", "fitted", "warnings", "plant",
                            "termination", "iterations", "evaluations", "condition_number", "degrees_of_freedom"})
        EXPECT_TRUE(report.contains(key)) << key;
    const auto& first = report.at("parameters").as_array().at(0).as_object();
    for (const char* key : {"name", "value", "standard_error", "interval_95", "bounds", "scale", "unit", "start"})
        EXPECT_TRUE(first.contains(key)) << key;
    EXPECT_EQ(first.at("name").as_string(), "param.cell.contact_resistance");
    EXPECT_EQ(report.at("residuals").as_array().size(), 6u);
    EXPECT_EQ(report.at("correlation").as_array().at(0).as_array().at(0).to_number<double>(), 1.0);
}

TEST(Calibration, RefusalsNameTheProblemAndLeaveTheBlockUnchanged) {
    const Block truth = pem_block();
    const FitProblem good = curve(truth, {"contact_resistance"}, 6, {353.15});
    struct Case {
        const char* what;
        ErrorKind kind;
        const char* fragment;
        void (*change)(FitProblem&);
    };
    const Case cases[] = {
        {"unknown name", ErrorKind::unknown_name, "'no_such_key' is neither a variable nor a key of the cell object",
         [](FitProblem& p) { p.free = {"no_such_key"}; }},
        {"unknown variable", ErrorKind::unknown_name, "unknown variable 'param.cell.nope'",
         [](FitProblem& p) { p.free = {"param.cell.nope"}; }},
        {"structural parameter", ErrorKind::invalid_argument, "'param.cells' is not a tunable parameter",
         [](FitProblem& p) { p.free = {"param.cells"}; }},
        {"an input", ErrorKind::invalid_argument, "'in.temperature' is not a tunable parameter",
         [](FitProblem& p) { p.free = {"in.temperature"}; }},
        {"twice", ErrorKind::invalid_argument, "free parameter 'param.cell.contact_resistance' is named twice",
         [](FitProblem& p) { p.free = {"contact_resistance", "param.cell.contact_resistance"}; }},
        {"none", ErrorKind::invalid_argument, "no free parameters", [](FitProblem& p) { p.free.clear(); }},
        {"no points", ErrorKind::invalid_argument, "no data points",
         [](FitProblem& p) { p.points = 0; p.input_values.clear(); p.measured_values.clear(); }},
        {"output as input", ErrorKind::invalid_argument, "data input 1 'cell.voltage' is not an input",
         [](FitProblem& p) { p.inputs[0] = p.measured[0]; }},
        {"input as measured", ErrorKind::invalid_argument, "measured variable 1 'in.temperature' is not an output",
         [](FitProblem& p) { p.measured[0] = p.inputs[1]; }},
        {"NaN input", ErrorKind::invalid_argument, "data row 3: in.current_density is nan; inputs must be finite",
         [](FitProblem& p) { p.input_values[4] = std::nan(""); }},
        {"infinite measurement", ErrorKind::invalid_argument, "data row 2: measured cell.voltage is inf",
         [](FitProblem& p) { p.measured_values[1] = HUGE_VAL; }},
        {"negative weight", ErrorKind::invalid_argument, "data row 1: weight -1 of cell.voltage is not a finite number >= 0",
         [](FitProblem& p) { p.weights.assign(6, 1.0); p.weights[0] = -1; }},
        {"too few values", ErrorKind::invalid_argument, "0 measured values (given, with a positive weight) for 1 free parameters",
         [](FitProblem& p) { p.measured_values.assign(6, std::nan("")); }},
        {"bound outside the limits", ErrorKind::invalid_argument,
         "upper bound 0.01 ohm m2 of param.cell.contact_resistance is outside its limits (≥ 0 ohm m2, ≤ 0.001 ohm m2)",
         [](FitProblem& p) { p.upper = {1e-2}; }},
        {"start outside the bounds", ErrorKind::invalid_argument,
         "start value 1e-05 ohm m2 of param.cell.contact_resistance is outside its bounds [2e-05 ohm m2, 0.001 ohm m2]",
         [](FitProblem& p) { p.lower = {2e-5}; }},
        {"crossed bounds", ErrorKind::invalid_argument, "lower 5e-05 ohm m2 is not below upper 4e-05 ohm m2",
         [](FitProblem& p) { p.lower = {5e-5}; p.upper = {4e-5}; }},
        {"row the model refuses", ErrorKind::out_of_range, "at the start values: data row 6: ",
         [](FitProblem& p) { p.input_values[10] = 1e5; }},  // above the limiting current density
    };
    for (const Case& c : cases) {
        SCOPED_TRACE(c.what);
        FitProblem p = good;
        c.change(p);
        Block b = truth;
        b.set(b.find("param.cell.contact_resistance"), 1e-5);
        expect_error([&] { fit(b, p); }, c.kind, c.fragment);
        EXPECT_EQ(b.get(b.find("param.cell.contact_resistance")), 1e-5);
    }
}

TEST(Calibration, LogScaleNeedsAPositiveStart) {
    const Block truth = pem_block();
    FitProblem p = curve(truth, {"param.degradation.voltage_rate"}, 6, {353.15});
    p.inputs.push_back(truth.find("in.hours_operated"));
    for (std::size_t i = 0; i < p.points; ++i) p.input_values.insert(p.input_values.begin() + static_cast<long>(3 * i + 2), 1000.0);
    p.scales = {FitScale::log};
    Block b = truth;
    expect_error([&] { fit(b, p); }, ErrorKind::invalid_argument,
                 "param.degradation.voltage_rate cannot be fitted in log space: its start value 0 V/h");
    // Linear is the automatic choice for a start of 0; the data were made without degradation,
    // so the fit ends at the lower limit 0 and says so.
    p.scales = {FitScale::automatic};
    const FitResult r = fit(b, p);
    EXPECT_FALSE(r.parameters[0].log_scale);
    EXPECT_NEAR(r.parameters[0].value, 0.0, 1e-12);
    EXPECT_TRUE(r.parameters[0].at_bound);
}

TEST(Calibration, IterationLimitAndCancellationLeaveTheBlockUnchanged) {
    const Block truth = pem_block();
    const FitProblem p = curve(truth, kKinetics, 10, {353.15});
    Block b = truth;
    scale_parameters(b, kKinetics, 2.0);
    const double start = b.get(b.find("param.cell.contact_resistance"));
    FitOptions once;
    once.max_iterations = 1;
    expect_error([&] { fit(b, p, once); }, ErrorKind::no_convergence, "the fit did not converge in 1 iterations");
    expect_error([&] { fit(b, p, once); }, ErrorKind::no_convergence, "best so far: param.cell.anode_exchange_current_density = ");
    EXPECT_EQ(b.get(b.find("param.cell.contact_resistance")), start);

    FitOptions cancel;
    std::vector<std::size_t> calls;
    cancel.progress = [&](std::size_t done, std::size_t total) {
        calls.push_back(done);
        EXPECT_EQ(total, 200u);
        return done < 2;
    };
    expect_error([&] { fit(b, p, cancel); }, ErrorKind::cancelled, "fit cancelled by the progress callback");
    EXPECT_EQ(calls, (std::vector<std::size_t>{1, 2}));
    EXPECT_EQ(b.get(b.find("param.cell.contact_resistance")), start);

    FitOptions bad;
    bad.tolerance = 0;
    expect_error([&] { fit(b, p, bad); }, ErrorKind::invalid_argument, "tolerance is 0");
    bad = FitOptions{};
    bad.max_iterations = 0;
    expect_error([&] { fit(b, p, bad); }, ErrorKind::invalid_argument, "max_iterations is 0");
}

// The bound maps keep θ within its bounds for any z, and invert each other inside them.
TEST(Calibration, BoundMapsStayWithinTheirBoundsAndInvert) {
    using calibration::BoundMap;
    const double inf = HUGE_VAL;
    const BoundMap maps[] = {BoundMap(-2.0, 3.0), BoundMap(-20.7, -6.9), BoundMap(0.5, inf), BoundMap(-inf, 1.0),
                             BoundMap(-inf, inf)};
    for (const BoundMap& m : maps) {
        for (double z = -50; z <= 50; z += 0.37) {
            const double theta = m.theta(z);
            EXPECT_GE(theta, m.lo());
            EXPECT_LE(theta, m.hi());
            // dθ/dz against a central difference
            const double h = 1e-6;
            EXPECT_NEAR(m.dtheta_dz(z), (m.theta(z + h) - m.theta(z - h)) / (2 * h), 1e-6 * std::max(1.0, m.hi() - m.lo()));
        }
        const double lo = std::isfinite(m.lo()) ? m.lo() : -5.0, hi = std::isfinite(m.hi()) ? m.hi() : 5.0;
        for (int k = 1; k < 10; ++k) {
            const double theta = lo + (hi - lo) * k / 10.0;
            EXPECT_NEAR(m.theta(m.z(theta)), theta, 1e-12 * std::max(1.0, std::fabs(theta)));
        }
    }
    // A start on a bound is moved just inside, where the map can move it.
    EXPECT_GT(maps[0].dtheta_dz(maps[0].z(-2.0)), 0.0);
    EXPECT_GT(maps[2].dtheta_dz(maps[2].z(0.5)), 0.0);
}

}  // namespace
}  // namespace ely
