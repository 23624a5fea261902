// ely_block_fit and the ely_fit result through the shared library: the same numbers as the
// library's own fit, the buffer protocol of the report and the plant, the calibrated block, and
// every error path (NULLs, counts, indices, names, options, cancellation, the iteration limit, a
// row the model refuses), each leaving the block unchanged and *result NULL. Unit conversion.
#include <boost/json.hpp>
#include <gmock/gmock.h>

#include <cmath>
#include <cstdint>
#include <cstring>
#include <string>
#include <vector>

#include "calibration/fit.hpp"
#include "capi_support.hpp"
#include "config/config.hpp"

using ::testing::HasSubstr;
using capi_test::Block;

namespace {

// A PEM plant at 80 °C whose anode gas stays below the alarm levels (an anode recombination
// catalyst), so that the curve below solves without warnings.
const char* const kPem = R"({"technology":"pem","stack":{"cells":100,"active_area":0.1},)"
                         R"("cell":{"h2_recombination_fraction_anode":0.9},)"
                         R"("operating":{"spec":"current_density","temperature":353.15}})";

/// A polarization curve of the plant at its defaults, made with the batch call, with a fixed
/// wiggle of ±1 mV standing in for noise (so that the fit has a residual variance).
struct Curve {
    std::vector<int32_t> inputs, measured;
    std::vector<double> input_values, voltages;
    size_t points = 0;

    explicit Curve(const Block& h) {
        inputs = {h.index("in.current_density")};
        measured = {h.index("cell.voltage")};
        for (int k = 0; k < 12; ++k) input_values.push_back(6000.0 + 1200.0 * k);  // above the minimum load
        points = input_values.size();
        voltages.assign(points, 0.0);
        std::vector<int32_t> status(points);
        EXPECT_EQ(ely_block_solve_batch(h.get(), points, 1, inputs.data(), input_values.data(), 1, measured.data(),
                                        voltages.data(), status.data(), nullptr, nullptr),
                  ELY_OK);
        for (size_t k = 0; k < points; ++k) voltages[k] += (k % 2 ? 1e-3 : -1e-3) * (k % 3 ? 1.0 : 0.5);
    }
};

const char* const kFree[] = {"anode_exchange_current_density", "param.cell.contact_resistance"};

struct Fit {
    ely_fit* p = nullptr;
    ~Fit() { ely_fit_destroy(p); }
};

/// Fits the contact resistance alone to the curve.
int32_t fit_contact_resistance(const Block& h, const Curve& c, Fit& fit) {
    const char* one[] = {"contact_resistance"};
    return ely_block_fit(h.get(), c.points, 1, c.inputs.data(), c.input_values.data(), 1, c.measured.data(),
                         c.voltages.data(), nullptr, 1, one, nullptr, nullptr, nullptr, &fit.p);
}

std::string report_of(const ely_fit* fit) {
    size_t length = 0;
    EXPECT_EQ(ely_fit_report_json(fit, nullptr, 0, &length), ELY_OK);
    std::string text(length, '\0');
    EXPECT_EQ(ely_fit_report_json(fit, text.data(), text.size(), &length), ELY_OK);
    text.resize(length - 1);
    return text;
}

}  // namespace

TEST(Fit, SameNumbersAsTheLibraryAndTheBlockCalibrated) {
    Block h(kPem);
    const Curve c(h);
    h.set("param.cell.anode_exchange_current_density", 3e-3);
    h.set("param.cell.contact_resistance", 2e-5);
    Fit fit;
    const int32_t s = ely_block_fit(h.get(), c.points, 1, c.inputs.data(), c.input_values.data(), 1, c.measured.data(),
                                    c.voltages.data(), nullptr, 2, kFree, nullptr, nullptr, nullptr, &fit.p);
    ASSERT_TRUE(s == ELY_OK || s == ELY_WARNING) << ely_last_error();
    ASSERT_NE(fit.p, nullptr);

    // The library's fit of the same problem, directly.
    ely::Block direct(ely::parse_config(kPem));
    direct.set(direct.find("param.cell.anode_exchange_current_density"), 3e-3);
    direct.set(direct.find("param.cell.contact_resistance"), 2e-5);
    ely::FitProblem p;
    p.points = c.points;
    p.inputs = c.inputs;
    p.input_values = c.input_values;
    p.measured = c.measured;
    p.measured_values = c.voltages;
    p.free = {kFree[0], kFree[1]};
    const ely::FitResult r = ely::fit(direct, p);
    for (int32_t k = 0; k < 2; ++k) {
        double value = 0, se = 0;
        ASSERT_EQ(ely_fit_parameter(fit.p, k, &value, &se), ELY_OK);
        EXPECT_EQ(value, r.parameters[static_cast<size_t>(k)].value);
        EXPECT_EQ(se, r.parameters[static_cast<size_t>(k)].standard_error);
        EXPECT_GT(se, 0.0);
    }
    EXPECT_EQ(report_of(fit.p), ely::fit_report_json(r));
    // The handle's block holds the fitted values; its outputs wait for a solve.
    double value = 0;
    ASSERT_EQ(ely_fit_parameter(fit.p, 1, &value, nullptr), ELY_OK);
    EXPECT_EQ(h.value("param.cell.contact_resistance"), value);
    EXPECT_EQ(ely_block_solve(h.get()), ELY_OK) << ely_last_error();
    double se_only = 0;
    EXPECT_EQ(ely_fit_parameter(fit.p, 0, nullptr, &se_only), ELY_OK);
}

TEST(Fit, PlantLoadsAgainWithTheFittedValues) {
    Block h(kPem);
    const Curve c(h);
    h.set("param.cell.contact_resistance", 2e-5);
    Fit fit;
    ASSERT_EQ(fit_contact_resistance(h, c, fit), ELY_OK) << ely_last_error();
    size_t length = 0;
    ASSERT_EQ(ely_fit_plant_json(fit.p, nullptr, 0, &length), ELY_OK);
    std::string plant(length, '\0');
    ASSERT_EQ(ely_fit_plant_json(fit.p, plant.data(), plant.size(), &length), ELY_OK);
    Block again(plant);
    EXPECT_EQ(again.value("param.cell.contact_resistance"), h.value("param.cell.contact_resistance"));
    EXPECT_THAT(report_of(fit.p), HasSubstr("\"plant\": {"));
}

TEST(Fit, BufferProtocolOfTheReportAndThePlant) {
    Block h(kPem);
    const Curve c(h);
    Fit fit;
    ASSERT_EQ(fit_contact_resistance(h, c, fit), ELY_OK) << ely_last_error();
    for (auto call : {&ely_fit_report_json, &ely_fit_plant_json}) {
        size_t length = 0;
        ASSERT_EQ(call(fit.p, nullptr, 0, &length), ELY_OK);
        ASSERT_GT(length, 10u);
        std::vector<char> small(length - 1, 'x');
        size_t reported = 0;
        EXPECT_EQ(call(fit.p, small.data(), small.size(), &reported), ELY_ERR_BUFFER_TOO_SMALL);
        EXPECT_EQ(reported, length);
        EXPECT_EQ(small[0], 'x');  // nothing written
        EXPECT_THAT(ely_last_error(), HasSubstr("too small"));
        EXPECT_EQ(call(fit.p, nullptr, 5, &reported), ELY_ERR_INVALID_ARGUMENT);
        EXPECT_EQ(call(fit.p, small.data(), small.size(), nullptr), ELY_ERR_INVALID_ARGUMENT);
        EXPECT_EQ(call(nullptr, nullptr, 0, &reported), ELY_ERR_INVALID_ARGUMENT);
        EXPECT_THAT(ely_last_error(), HasSubstr("fit is NULL"));
        std::vector<char> exact(length);
        EXPECT_EQ(call(fit.p, exact.data(), exact.size(), &reported), ELY_OK);
        EXPECT_EQ(std::strlen(exact.data()) + 1, length);
    }
}

TEST(Fit, ParameterAccessorChecks) {
    Block h(kPem);
    const Curve c(h);
    Fit fit;
    ASSERT_EQ(fit_contact_resistance(h, c, fit), ELY_OK) << ely_last_error();
    double v = -1;
    EXPECT_EQ(ely_fit_parameter(fit.p, 1, &v, nullptr), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("parameter 1 is outside 0..0"));
    EXPECT_EQ(ely_fit_parameter(fit.p, -1, &v, nullptr), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_fit_parameter(fit.p, 0, nullptr, nullptr), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_fit_parameter(nullptr, 0, &v, nullptr), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(v, -1);
    ely_fit_destroy(nullptr);  // no-op
}

TEST(Fit, RmseAccessorGivesTheReportsRmseAndRows) {
    Block h(kPem);
    Curve c(h);
    c.voltages[3] = NAN;  // not measured at row 4
    std::vector<double> weights(c.points, 1.0);
    weights[5] = 0.0;     // weighed out, still measured
    Fit fit;
    ASSERT_GE(ely_block_fit(h.get(), c.points, 1, c.inputs.data(), c.input_values.data(), 1, c.measured.data(),
                            c.voltages.data(), weights.data(), 1, kFree + 1, nullptr, nullptr, nullptr, &fit.p),
              0)
        << ely_last_error();
    double rmse = -1;
    size_t rows = 0;
    ASSERT_EQ(ely_fit_rmse(fit.p, 0, &rmse, &rows), ELY_OK);
    EXPECT_EQ(rows, c.points - 1);
    // The root mean square of the report's residuals, summed here (an identity the accessor does
    // not use: it reads the fit's own value).
    const auto report = boost::json::parse(report_of(fit.p)).as_object();
    double sum = 0;
    for (const auto& row : report.at("residuals").as_array())
        if (!row.as_array()[0].is_null()) sum += std::pow(row.as_array()[0].to_number<double>(), 2);
    EXPECT_NEAR(rmse, std::sqrt(sum / static_cast<double>(c.points - 1)), 1e-15);
    EXPECT_EQ(rmse, report.at("rmse_V").to_number<double>());
    size_t only_rows = 0;
    EXPECT_EQ(ely_fit_rmse(fit.p, 0, nullptr, &only_rows), ELY_OK);
    EXPECT_EQ(only_rows, rows);
    EXPECT_EQ(ely_fit_rmse(fit.p, 1, &rmse, &rows), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("measured variable 1 is outside 0..0"));
    EXPECT_EQ(ely_fit_rmse(fit.p, -1, &rmse, &rows), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_fit_rmse(fit.p, 0, nullptr, nullptr), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_fit_rmse(nullptr, 0, &rmse, &rows), ELY_ERR_INVALID_ARGUMENT);
}

TEST(Fit, WarningStatusNamesTheParameters) {
    Block h(kPem);
    const Curve c(h);
    // Only three rows for two parameters, and bounds that hold the contact resistance far from
    // where the data put it.
    const double lower[] = {NAN, 4e-5};
    ely_fit_options options{};
    options.struct_size = sizeof options;
    options.lower = lower;
    h.set("param.cell.contact_resistance", 5e-5);
    Fit fit;
    ASSERT_EQ(ely_block_fit(h.get(), 3, 1, c.inputs.data(), c.input_values.data(), 1, c.measured.data(),
                            c.voltages.data(), nullptr, 2, kFree, &options, nullptr, nullptr, &fit.p),
              ELY_WARNING);
    EXPECT_THAT(ely_last_error(), HasSubstr("param.cell.contact_resistance ended at its lower bound"));
    EXPECT_THAT(report_of(fit.p), HasSubstr("\"at_bound\": true"));
}

TEST(Fit, ProgressIsCalledAndCancels) {
    Block h(kPem);
    const Curve c(h);
    h.set("param.cell.contact_resistance", 3e-5);
    struct Seen {
        std::vector<size_t> done;
        size_t total = 0;
        int32_t answer = 0;
    } seen;
    const ely_progress_fn record = [](size_t done, size_t total, void* user) -> int32_t {
        auto* s = static_cast<Seen*>(user);
        s->done.push_back(done);
        s->total = total;
        return s->answer;
    };
    Fit fit;
    ASSERT_GE(ely_block_fit(h.get(), c.points, 1, c.inputs.data(), c.input_values.data(), 1, c.measured.data(),
                            c.voltages.data(), nullptr, 2, kFree, nullptr, record, &seen, &fit.p),
              ELY_OK);
    ASSERT_FALSE(seen.done.empty());
    EXPECT_EQ(seen.done.front(), 1u);
    EXPECT_EQ(seen.total, 200u);  // the default iteration limit
    ely_fit_destroy(fit.p);
    fit.p = nullptr;

    h.set("param.cell.contact_resistance", 3e-5);
    seen = Seen{};
    seen.answer = 1;
    ely_fit* out = reinterpret_cast<ely_fit*>(&seen);  // must be set to NULL
    EXPECT_EQ(ely_block_fit(h.get(), c.points, 1, c.inputs.data(), c.input_values.data(), 1, c.measured.data(),
                            c.voltages.data(), nullptr, 2, kFree, nullptr, record, &seen, &out),
              ELY_ERR_CANCELLED);
    EXPECT_EQ(out, nullptr);
    EXPECT_EQ(seen.done, (std::vector<size_t>{1}));
    EXPECT_EQ(h.value("param.cell.contact_resistance"), 3e-5);
}

// Every refusal: the status, a message naming the problem, *result NULL, the block unchanged.
TEST(Fit, EveryErrorPathLeavesTheBlockUnchanged) {
    Block h(kPem);
    const Curve c(h);
    h.set("param.cell.contact_resistance", 3e-5);
    const double anode_before = h.value("param.cell.anode_exchange_current_density");
    const int32_t output_index = h.index("cell.voltage");
    const int32_t input_index = h.index("in.temperature");
    int32_t count = 0;
    ASSERT_EQ(ely_block_variable_count(h.get(), &count), ELY_OK);

    struct Args {
        ely_block* block;
        size_t n_points;
        int32_t n_inputs;
        const int32_t* input_indices;
        const double* inputs;
        int32_t n_measured;
        const int32_t* measured_indices;
        const double* measured;
        const double* weights;
        int32_t n_free;
        const char* const* free_names;
        const ely_fit_options* options;
    };
    const Args good{h.get(), c.points, 1, c.inputs.data(), c.input_values.data(), 1, c.measured.data(),
                    c.voltages.data(), nullptr, 2, kFree, nullptr};
    static ely_fit_options small_options{};  // struct_size 0
    static ely_fit_options negative_iterations{sizeof(ely_fit_options), -1, 0, nullptr, nullptr, nullptr};
    static ely_fit_options nan_tolerance{sizeof(ely_fit_options), 0, NAN, nullptr, nullptr, nullptr};
    static const int32_t bad_scales[] = {ELY_FIT_SCALE_LOG, 7};
    static ely_fit_options bad_scale{sizeof(ely_fit_options), 0, 0, nullptr, nullptr, bad_scales};
    static const double inf_upper[] = {NAN, HUGE_VAL};
    static ely_fit_options infinite_bound{sizeof(ely_fit_options), 0, 0, nullptr, inf_upper, nullptr};
    static ely_fit_options one_iteration{sizeof(ely_fit_options), 1, 0, nullptr, nullptr, nullptr};
    static const char* const unknown[] = {"anode_exchange_current_density", "no_such_parameter"};
    static const char* const null_name[] = {"anode_exchange_current_density", nullptr};
    static const char* const structural[] = {"param.cells", "contact_resistance"};
    static int32_t bad_index[1];
    bad_index[0] = count;
    static int32_t output_as_input[1];
    output_as_input[0] = output_index;
    static int32_t input_as_output[1];
    input_as_output[0] = input_index;
    static std::vector<double> too_high;
    too_high = c.input_values;
    too_high[5] = 2e5;  // above the limiting current density
    static std::vector<double> negative_weights(c.points, -1.0);

    struct Case {
        const char* what;
        int32_t status;
        const char* fragment;
        void (*change)(Args&);
    };
    const Case cases[] = {
        {"NULL block", ELY_ERR_INVALID_ARGUMENT, "block is NULL", [](Args& a) { a.block = nullptr; }},
        {"no points", ELY_ERR_INVALID_ARGUMENT, "n_points is 0", [](Args& a) { a.n_points = 0; }},
        {"negative n_inputs", ELY_ERR_INVALID_ARGUMENT, "n_inputs is -1", [](Args& a) { a.n_inputs = -1; }},
        {"no measured output", ELY_ERR_INVALID_ARGUMENT, "n_measured is 0", [](Args& a) { a.n_measured = 0; }},
        {"no free parameter", ELY_ERR_INVALID_ARGUMENT, "n_free is 0", [](Args& a) { a.n_free = 0; }},
        {"NULL input_indices", ELY_ERR_INVALID_ARGUMENT, "input_indices is NULL", [](Args& a) { a.input_indices = nullptr; }},
        {"NULL inputs", ELY_ERR_INVALID_ARGUMENT, "inputs is NULL", [](Args& a) { a.inputs = nullptr; }},
        {"NULL measured_indices", ELY_ERR_INVALID_ARGUMENT, "measured_indices is NULL",
         [](Args& a) { a.measured_indices = nullptr; }},
        {"NULL measured", ELY_ERR_INVALID_ARGUMENT, "measured is NULL", [](Args& a) { a.measured = nullptr; }},
        {"NULL free_names", ELY_ERR_INVALID_ARGUMENT, "free_names is NULL", [](Args& a) { a.free_names = nullptr; }},
        {"NULL name", ELY_ERR_INVALID_ARGUMENT, "free_names[1] is NULL", [](Args& a) { a.free_names = null_name; }},
        {"unknown name", ELY_ERR_UNKNOWN_NAME, "'no_such_parameter' is neither a variable nor a key",
         [](Args& a) { a.free_names = unknown; }},
        {"structural parameter", ELY_ERR_INVALID_ARGUMENT, "'param.cells' is not a tunable parameter",
         [](Args& a) { a.free_names = structural; }},
        {"index out of range", ELY_ERR_INVALID_ARGUMENT, "is outside 0..", [](Args& a) { a.input_indices = bad_index; }},
        {"output as input", ELY_ERR_INVALID_ARGUMENT, "data input 1 'cell.voltage' is not an input",
         [](Args& a) { a.input_indices = output_as_input; }},
        {"input as measured", ELY_ERR_INVALID_ARGUMENT, "'in.temperature' is not an output",
         [](Args& a) { a.measured_indices = input_as_output; }},
        {"negative weights", ELY_ERR_INVALID_ARGUMENT, "weight -1 of cell.voltage",
         [](Args& a) { a.weights = negative_weights.data(); }},
        {"options struct_size", ELY_ERR_INVALID_ARGUMENT, "options->struct_size is 0",
         [](Args& a) { a.options = &small_options; }},
        {"negative max_iterations", ELY_ERR_INVALID_ARGUMENT, "options->max_iterations is -1",
         [](Args& a) { a.options = &negative_iterations; }},
        {"NaN tolerance", ELY_ERR_INVALID_ARGUMENT, "tolerance is nan", [](Args& a) { a.options = &nan_tolerance; }},
        {"bad scale", ELY_ERR_INVALID_ARGUMENT, "options->scales[1] is 7", [](Args& a) { a.options = &bad_scale; }},
        {"infinite bound", ELY_ERR_INVALID_ARGUMENT, "upper bound inf ohm m2 of param.cell.contact_resistance",
         [](Args& a) { a.options = &infinite_bound; }},
        {"iteration limit", ELY_ERR_NO_CONVERGENCE, "did not converge in 1 iterations",
         [](Args& a) { a.options = &one_iteration; }},
        {"row the model refuses", ELY_ERR_OUT_OF_RANGE, "at the start values: data row 6:",
         [](Args& a) { a.inputs = too_high.data(); }},
    };
    for (const Case& k : cases) {
        SCOPED_TRACE(k.what);
        Args a = good;
        k.change(a);
        ely_fit* out = reinterpret_cast<ely_fit*>(&a);  // must be set to NULL
        const int32_t s = ely_block_fit(a.block, a.n_points, a.n_inputs, a.input_indices, a.inputs, a.n_measured,
                                        a.measured_indices, a.measured, a.weights, a.n_free, a.free_names, a.options,
                                        nullptr, nullptr, &out);
        EXPECT_EQ(s, k.status) << ely_last_error();
        EXPECT_THAT(ely_last_error(), HasSubstr(k.fragment));
        EXPECT_EQ(out, nullptr);
        EXPECT_EQ(h.value("param.cell.contact_resistance"), 3e-5);
        EXPECT_EQ(h.value("param.cell.anode_exchange_current_density"), anode_before);
    }
    EXPECT_EQ(ely_block_fit(h.get(), c.points, 1, c.inputs.data(), c.input_values.data(), 1, c.measured.data(),
                            c.voltages.data(), nullptr, 2, kFree, nullptr, nullptr, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("result is NULL"));
}

TEST(Units, ConvertsWithThePlantDescriptionsUnits) {
    double x = 0;
    ASSERT_EQ(ely_convert_unit(1.5, "A/cm2", "A/m2", &x), ELY_OK);
    EXPECT_EQ(x, 15000.0);  // exact: 1 cm2 = 1e-4 m2 (SI Brochure, 9th ed.)
    ASSERT_EQ(ely_convert_unit(80, "degC", "K", &x), ELY_OK);
    EXPECT_DOUBLE_EQ(x, 353.15);
    ASSERT_EQ(ely_convert_unit(353.15, "K", "degC", &x), ELY_OK);
    EXPECT_NEAR(x, 80.0, 1e-12);
    ASSERT_EQ(ely_convert_unit(30, "bar", "Pa", &x), ELY_OK);
    EXPECT_EQ(x, 3e6);
    ASSERT_EQ(ely_convert_unit(0.15, "ohm cm2", "ohm m2", &x), ELY_OK);
    EXPECT_DOUBLE_EQ(x, 1.5e-5);
    ASSERT_EQ(ely_convert_unit(25, "degC", "degC", &x), ELY_OK);
    EXPECT_NEAR(x, 25.0, 1e-12);

    x = -1;
    EXPECT_EQ(ely_convert_unit(1, "bar", "K", &x), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("expected a quantity in K, got 'bar'"));
    EXPECT_EQ(ely_convert_unit(1, "furlong", "m", &x), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("furlong"));
    EXPECT_EQ(ely_convert_unit(NAN, "bar", "Pa", &x), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_convert_unit(1, nullptr, "Pa", &x), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_convert_unit(1, "bar", nullptr, &x), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_convert_unit(1, "bar", "Pa", nullptr), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(x, -1);
}
