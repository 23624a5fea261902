// The dynamic calls of the C interface: the same numbers as the C++ block, bit for bit; a profile
// equals the loop of calls it stands for; saved states; every error path; independent handles on
// threads; the run from C.
#include <boost/json.hpp>
#include <gtest/gtest.h>

#include <cmath>
#include <cstring>
#include <limits>
#include <string>
#include <thread>
#include <vector>

#include "capi_support.hpp"
#include "config/config.hpp"
#include "test_dynamics_c.h"
#include "unit/block.hpp"

namespace {

using capi_test::Block;
using capi_test::read_text;

std::string demo() { return read_text(std::string(ELY_SOURCE_DIR) + "/examples/demo-plant.json"); }

bool same(double a, double b) { return (std::isnan(a) && std::isnan(b)) || a == b; }

/// Every variable of a block after a call, NaN for one that cannot be read.
std::vector<double> all_values(ely_block* b) {
    int32_t n = 0;
    EXPECT_EQ(ely_block_variable_count(b, &n), ELY_OK);
    std::vector<double> v(static_cast<std::size_t>(n));
    for (int32_t i = 0; i < n; ++i)
        if (ely_block_get(b, i, &v[static_cast<std::size_t>(i)]) != ELY_OK) v[static_cast<std::size_t>(i)] = std::nan("");
    return v;
}

std::string summary_of(ely_block* b) {
    size_t n = 0;
    EXPECT_EQ(ely_block_run_summary_json(b, nullptr, 0, &n), ELY_OK);
    std::string s(n, '\0');
    EXPECT_EQ(ely_block_run_summary_json(b, s.data(), n, &n), ELY_OK);
    s.resize(n - 1);
    return s;
}

std::string saved_state(ely_block* b) {
    size_t n = 0;
    EXPECT_EQ(ely_block_save_state(b, nullptr, 0, &n), ELY_OK) << ely_last_error();
    std::string s(n, '\0');
    EXPECT_EQ(ely_block_save_state(b, s.data(), n, &n), ELY_OK);
    return s;
}

/// An hour of a varying power setpoint (a power spec), a stop and a start, in steps of 15 s.
struct Profile {
    std::vector<double> times, inputs;  // inputs: in.power, in.mode_request per row
};
Profile profile(int rows) {
    Profile p;
    for (int k = 0; k < rows; ++k) {
        p.times.push_back(15.0 * k);
        p.inputs.push_back(8e6 + 6e6 * std::sin(0.01 * k) * std::sin(0.01 * k));
        p.inputs.push_back(k >= rows / 3 && k < rows / 2 ? 1.0 : 2.0);
    }
    return p;
}

}  // namespace

TEST(CDynamics, TheCInterfaceGivesTheNumbersOfTheBlock) {
    // The same calls through the C interface and on ely::Block: bit for bit.
    const std::string json = demo();
    Block c(json);
    ely::Block direct(ely::parse_config(json));
    ASSERT_EQ(ely_block_reset(c.get(), 0.0), ELY_OK) << ely_last_error();
    direct.reset(0.0);
    const int32_t ij = c.index("in.current_density"), ir = c.index("in.mode_request");
    const double steps[] = {1, 37.5, 600, 0, 3600, 5};
    for (int k = 0; k < 6; ++k) {
        if (k == 2) {
            ASSERT_EQ(ely_block_set(c.get(), ij, 6000), ELY_OK);
            direct.set(ij, 6000);
        }
        if (k == 4) {
            ASSERT_EQ(ely_block_set(c.get(), ir, 1), ELY_OK);
            direct.set(ir, 1);
        }
        ASSERT_GE(ely_block_advance(c.get(), steps[k]), 0) << ely_last_error();
        direct.advance(steps[k]);
        const std::vector<double> v = all_values(c.get());
        for (int32_t i = 0; i < direct.variable_count(); ++i)
            EXPECT_PRED2(same, v[static_cast<std::size_t>(i)], direct.get(i)) << direct.variable(i).name << " step " << k;
    }
    double t = 0;
    EXPECT_EQ(ely_block_time(c.get(), &t), ELY_OK);
    EXPECT_EQ(t, direct.time());
    EXPECT_EQ(summary_of(c.get()), direct.run_summary_json());
}

TEST(CDynamics, AProfileIsTheLoopOfCallsItStandsFor) {
    // ely_block_simulate: reset at the first row, then advance with the inputs of the row before
    // and apply the row's inputs; row by row the same numbers as those calls made one by one.
    const std::string json = demo();
    Block a(json), b(json);
    ASSERT_EQ(ely_block_set_spec(a.get(), "power"), ELY_OK);
    ASSERT_EQ(ely_block_set_spec(b.get(), "power"), ELY_OK);
    const Profile p = profile(240);
    const int32_t in_idx[] = {a.index("in.power"), a.index("in.mode_request")};
    const int32_t out_idx[] = {a.index("stack.temperature"), a.index("product.hydrogen"), a.index("state.mode"),
                               a.index("stack.power")};
    const size_t rows = p.times.size();
    std::vector<double> out(rows * 4);
    std::vector<int32_t> status(rows);
    ASSERT_GE(ely_block_simulate(a.get(), rows, p.times.data(), 2, in_idx, p.inputs.data(), 4, out_idx, out.data(),
                                 status.data(), nullptr, nullptr),
              0)
        << ely_last_error();
    for (size_t k = 0; k < rows; ++k) {
        for (int i = 0; i < 2; ++i) ASSERT_EQ(ely_block_set(b.get(), in_idx[i], p.inputs[2 * k + i]), ELY_OK);
        const int32_t s = k == 0 ? ely_block_reset(b.get(), p.times[0]) : ely_block_advance(b.get(), 0.0);
        EXPECT_EQ(s, status[k]) << k;
        for (int o = 0; o < 4; ++o) {
            double v = 0;
            ASSERT_EQ(ely_block_get(b.get(), out_idx[o], &v), ELY_OK);
            EXPECT_PRED2(same, out[4 * k + o], v) << "row " << k << " output " << o;
        }
        if (k + 1 < rows) {
            ASSERT_GE(ely_block_advance(b.get(), p.times[k + 1] - p.times[k]), 0) << ely_last_error();
        }
    }
    // The stop of the profile is in the summary, and the power followed its setpoint in production:
    // at row k the stacks draw the setpoint of the row before (held over the interval; the current
    // starts its ramp towards row k's at times[k]).
    const auto summary = boost::json::parse(summary_of(a.get())).at("figures");
    EXPECT_EQ(summary.at("starts_warm").at("value").to_number<double>(), 1.0);
    EXPECT_NEAR(summary.at("hours_standby").at("value").to_number<double>(), 15.0 * (rows / 2 - rows / 3) / 3600, 1e-9);
    for (size_t k = 1; k < rows / 3; ++k)
        EXPECT_NEAR(out[4 * k + 3], p.inputs[2 * (k - 1)], 1e-9 * p.inputs[2 * (k - 1)]) << k;
}

TEST(CDynamics, AProfileStopsAtARowThatFailsAndSaysWhich) {
    Block b(demo());
    const int32_t ij = b.index("in.current_density"), it = b.index("stack.temperature");
    const double times[] = {0, 60, 120, 180};
    const double currents[] = {15000, 16000, std::nan(""), 14000};
    double out[4] = {0, 0, 0, 0};
    int32_t status[4] = {99, 99, 99, 99};
    EXPECT_EQ(ely_block_simulate(b.get(), 4, times, 1, &ij, currents, 1, &it, out, status, nullptr, nullptr), ELY_PARTIAL);
    EXPECT_NE(std::string(ely_last_error()).find("row 2"), std::string::npos) << ely_last_error();
    EXPECT_GE(status[0], 0);
    EXPECT_GE(status[1], 0);
    EXPECT_EQ(status[2], ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(status[3], ELY_ERR_INVALID_ARGUMENT);
    EXPECT_TRUE(std::isnan(out[2]) && std::isnan(out[3]));
    double t = 0;
    EXPECT_EQ(ely_block_time(b.get(), &t), ELY_OK);
    EXPECT_EQ(t, 120.0);  // it reached the failing row's time, with the inputs before it in force
    EXPECT_GE(ely_block_advance(b.get(), 60), 0) << ely_last_error();
    // A first row that fails is the call's status.
    const double bad_first[] = {std::nan(""), 1, 1, 1};
    EXPECT_EQ(ely_block_simulate(b.get(), 4, times, 1, &ij, bad_first, 1, &it, out, status, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
}

TEST(CDynamics, BadArgumentsOfAProfileWriteNothing) {
    Block b(demo());
    const int32_t ij = b.index("in.current_density"), it = b.index("stack.temperature"), iv = b.index("cell.voltage");
    const double times[] = {0, 60, 120};
    const double values[] = {1e4, 1e4, 1e4};
    double out[3] = {-1, -1, -1};
    int32_t status[3] = {99, 99, 99};
    const auto refused = [&](int32_t s, const char* fragment) {
        EXPECT_EQ(s, ELY_ERR_INVALID_ARGUMENT) << fragment;
        EXPECT_NE(std::string(ely_last_error()).find(fragment), std::string::npos) << ely_last_error();
        for (int k = 0; k < 3; ++k) {
            EXPECT_EQ(out[k], -1.0);
            EXPECT_EQ(status[k], 99);
        }
    };
    refused(ely_block_simulate(nullptr, 3, times, 1, &ij, values, 1, &it, out, status, nullptr, nullptr), "block");
    refused(ely_block_simulate(b.get(), 3, times, -1, &ij, values, 1, &it, out, status, nullptr, nullptr), "n_inputs");
    refused(ely_block_simulate(b.get(), 3, times, 1, &ij, values, -1, &it, out, status, nullptr, nullptr), "n_outputs");
    refused(ely_block_simulate(b.get(), 3, nullptr, 1, &ij, values, 1, &it, out, status, nullptr, nullptr), "times");
    refused(ely_block_simulate(b.get(), 3, times, 1, nullptr, values, 1, &it, out, status, nullptr, nullptr), "input_indices");
    refused(ely_block_simulate(b.get(), 3, times, 1, &ij, nullptr, 1, &it, out, status, nullptr, nullptr), "inputs");
    refused(ely_block_simulate(b.get(), 3, times, 1, &ij, values, 1, &it, nullptr, status, nullptr, nullptr), "outputs");
    refused(ely_block_simulate(b.get(), 3, times, 1, &ij, values, 1, &it, out, nullptr, nullptr, nullptr), "row_status");
    refused(ely_block_simulate(b.get(), 3, times, 1, &iv, values, 1, &it, out, status, nullptr, nullptr), "not an input");
    const int32_t far = 100000;
    refused(ely_block_simulate(b.get(), 3, times, 1, &ij, values, 1, &far, out, status, nullptr, nullptr), "outside");
    const double backwards[] = {0, 60, 30};
    refused(ely_block_simulate(b.get(), 3, backwards, 1, &ij, values, 1, &it, out, status, nullptr, nullptr), "before");
    const double nan_time[] = {0, std::nan(""), 60};
    refused(ely_block_simulate(b.get(), 3, nan_time, 1, &ij, values, 1, &it, out, status, nullptr, nullptr), "finite");
    refused(ely_block_simulate(b.get(), std::numeric_limits<size_t>::max(), times, 1, &ij, values, 1, &it, out, status,
                               nullptr, nullptr),
            "address space");
    // Nothing ran: the block was never reset.
    double t = 0;
    EXPECT_EQ(ely_block_time(b.get(), &t), ELY_ERR_WRONG_STATE);
    // Zero rows: nothing to do, with the indices still checked.
    EXPECT_EQ(ely_block_simulate(b.get(), 0, nullptr, 1, &ij, nullptr, 1, &it, nullptr, nullptr, nullptr, nullptr), ELY_OK);
    refused(ely_block_simulate(b.get(), 0, nullptr, 1, &iv, nullptr, 0, nullptr, nullptr, nullptr, nullptr, nullptr),
            "not an input");
}

TEST(CDynamics, EveryErrorPathOfTheDynamicCalls) {
    Block b(demo());
    double t = 0;
    size_t n = 0;
    char text[8];
    const auto expect = [](int32_t got, int32_t want, const char* fragment) {
        EXPECT_EQ(got, want) << fragment;
        EXPECT_NE(std::string(ely_last_error()).find(fragment), std::string::npos) << ely_last_error();
    };
    expect(ely_block_reset(nullptr, 0), ELY_ERR_INVALID_ARGUMENT, "block");
    expect(ely_block_advance(nullptr, 1), ELY_ERR_INVALID_ARGUMENT, "block");
    expect(ely_block_time(nullptr, &t), ELY_ERR_INVALID_ARGUMENT, "block");
    expect(ely_block_save_state(nullptr, nullptr, 0, &n), ELY_ERR_INVALID_ARGUMENT, "block");
    expect(ely_block_restore_state(nullptr, text, 1), ELY_ERR_INVALID_ARGUMENT, "block");
    expect(ely_block_run_summary_json(nullptr, nullptr, 0, &n), ELY_ERR_INVALID_ARGUMENT, "block");
    expect(ely_block_advance(b.get(), 1), ELY_ERR_WRONG_STATE, "reset");
    expect(ely_block_time(b.get(), &t), ELY_ERR_WRONG_STATE, "reset");
    expect(ely_block_run_summary_json(b.get(), nullptr, 0, &n), ELY_ERR_WRONG_STATE, "reset");
    expect(ely_block_reset(b.get(), std::nan("")), ELY_ERR_INVALID_ARGUMENT, "start_time");
    expect(ely_block_reset(b.get(), INFINITY), ELY_ERR_INVALID_ARGUMENT, "start_time");
    ASSERT_EQ(ely_block_reset(b.get(), 0), ELY_OK) << ely_last_error();
    EXPECT_EQ(ely_last_error(), std::string());
    expect(ely_block_time(b.get(), nullptr), ELY_ERR_INVALID_ARGUMENT, "time_s");
    expect(ely_block_advance(b.get(), std::nan("")), ELY_ERR_INVALID_ARGUMENT, "step");
    expect(ely_block_advance(b.get(), -2), ELY_ERR_INVALID_ARGUMENT, "negative");
    expect(ely_block_save_state(b.get(), nullptr, 0, nullptr), ELY_ERR_INVALID_ARGUMENT, "length");
    expect(ely_block_save_state(b.get(), nullptr, 5, &n), ELY_ERR_INVALID_ARGUMENT, "capacity");
    n = 0;
    expect(ely_block_save_state(b.get(), text, sizeof text, &n), ELY_ERR_BUFFER_TOO_SMALL, "too small");
    EXPECT_GT(n, sizeof text);  // the size needed
    expect(ely_block_run_summary_json(b.get(), text, sizeof text, &n), ELY_ERR_BUFFER_TOO_SMALL, "too small");
    expect(ely_block_restore_state(b.get(), nullptr, 10), ELY_ERR_INVALID_ARGUMENT, "buffer");
    expect(ely_block_restore_state(b.get(), "not a state", 11), ELY_ERR_INVALID_ARGUMENT, "not an elyblock state");
    // A mode request that is not one of the codes, and one that is not whole.
    expect(ely_block_set(b.get(), b.index("in.mode_request"), 7), ELY_ERR_INVALID_ARGUMENT, "above");
    expect(ely_block_set(b.get(), b.index("in.mode_request"), 0.5), ELY_ERR_INVALID_ARGUMENT, "whole number");
    EXPECT_EQ(ely_block_time(b.get(), &t), ELY_OK);
    EXPECT_EQ(t, 0.0);
}

TEST(CDynamics, SavedStatesContinueBitForBitAndForeignOnesAreRefused) {
    const std::string json = demo();
    Block a(json), b(json);
    ASSERT_EQ(ely_block_reset(a.get(), 0), ELY_OK);
    a.set("in.current_density", 7000);
    ASSERT_GE(ely_block_advance(a.get(), 90), 0);  // ramping and warming
    const std::string state = saved_state(a.get());
    b.set("in.temperature", 320);  // replaced by the restore
    ASSERT_EQ(ely_block_restore_state(b.get(), state.data(), state.size()), ELY_OK) << ely_last_error();
    for (double step : {45.0, 600.0, 3600.0}) {
        ASSERT_GE(ely_block_advance(a.get(), step), 0);
        ASSERT_GE(ely_block_advance(b.get(), step), 0);
        const std::vector<double> va = all_values(a.get()), vb = all_values(b.get());
        for (std::size_t i = 0; i < va.size(); ++i) EXPECT_PRED2(same, va[i], vb[i]) << i;
    }
    EXPECT_EQ(saved_state(a.get()), saved_state(b.get()));
    // Another plant, a cut state, a changed byte: refused, the block as it was.
    std::string other_json = json;
    other_json.replace(other_json.find("\"cells\": 250"), 12, "\"cells\": 251");
    Block other(other_json);
    ASSERT_EQ(ely_block_reset(other.get(), 5), ELY_OK);
    const std::vector<double> before = all_values(other.get());
    EXPECT_EQ(ely_block_restore_state(other.get(), state.data(), state.size()), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_NE(std::string(ely_last_error()).find("another plant description"), std::string::npos);
    EXPECT_EQ(ely_block_restore_state(other.get(), state.data(), state.size() - 8), ELY_ERR_INVALID_ARGUMENT);
    std::string changed = state;
    changed[changed.size() - 20] ^= 1;
    EXPECT_EQ(ely_block_restore_state(other.get(), changed.data(), changed.size()), ELY_ERR_INVALID_ARGUMENT);
    const std::vector<double> after = all_values(other.get());
    for (std::size_t i = 0; i < before.size(); ++i) EXPECT_PRED2(same, before[i], after[i]) << i;
    double t = 0;
    EXPECT_EQ(ely_block_time(other.get(), &t), ELY_OK);
    EXPECT_EQ(t, 5.0);
}

TEST(CDynamics, IndependentHandlesOnThreadsGiveTheSerialNumbers) {
    // Four threads, each running a profile on its own handle (two plants, two specs); the values
    // equal a serial run bit for bit.
    const std::string json = demo();
    const auto work = [&](int t, std::vector<double>& out) {
        Block b(json);
        if (t % 2) ely_block_set_spec(b.get(), "power");
        const Profile p = profile(150 + 20 * t);
        const int32_t in_idx[] = {b.index(t % 2 ? "in.power" : "in.current_density"), b.index("in.mode_request")};
        std::vector<double> inputs = p.inputs;
        if (t % 2 == 0)
            for (std::size_t k = 0; k < inputs.size(); k += 2) inputs[k] = 10000 + inputs[k] / 1e3;
        const int32_t out_idx[] = {b.index("stack.temperature"), b.index("product.hydrogen")};
        out.assign(p.times.size() * 2, 0.0);
        std::vector<int32_t> status(p.times.size());
        ely_block_simulate(b.get(), p.times.size(), p.times.data(), 2, in_idx, inputs.data(), 2, out_idx, out.data(),
                           status.data(), nullptr, nullptr);
        out.push_back(boost::json::parse(summary_of(b.get())).at("figures").at("hydrogen").at("value").to_number<double>());
    };
    std::vector<std::vector<double>> serial(4), parallel(4);
    for (int t = 0; t < 4; ++t) work(t, serial[static_cast<std::size_t>(t)]);
    std::vector<std::thread> threads;
    for (int t = 0; t < 4; ++t) threads.emplace_back(work, t, std::ref(parallel[static_cast<std::size_t>(t)]));
    for (auto& th : threads) th.join();
    for (int t = 0; t < 4; ++t) {
        ASSERT_EQ(serial[static_cast<std::size_t>(t)].size(), parallel[static_cast<std::size_t>(t)].size());
        for (std::size_t k = 0; k < serial[static_cast<std::size_t>(t)].size(); ++k)
            EXPECT_PRED2(same, serial[static_cast<std::size_t>(t)][k], parallel[static_cast<std::size_t>(t)][k]) << t << " " << k;
    }
}

TEST(CDynamics, ARunFromC) {
    char why[512] = "";
    EXPECT_EQ(ely_c_test_dynamic_run(demo().c_str(), why, sizeof why), 0) << why;
}
