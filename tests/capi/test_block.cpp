// The block through the C interface: every error path, life cycle, batch, report, clone,
// threads; results compared with the C++ model directly.
#include <elyblock/elyblock.h>
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <cstddef>
#include <cstring>
#include <limits>
#include <string>
#include <thread>
#include <vector>

#include "cells/registry.hpp"
#include "config/config.hpp"
#include "unit/block.hpp"

using ::testing::HasSubstr;

namespace {

const char* const kMinimalPem =
    R"({"technology":"pem","stack":{"cells":100,"active_area":0.1},"operating":{"spec":"current_density"}})";

struct Handle {
    ely_block* b = nullptr;
    explicit Handle(const char* json = kMinimalPem) {
        const int32_t s = ely_block_create(json, &b);
        if (s != ELY_OK) ADD_FAILURE() << "create failed: " << ely_last_error();
    }
    ~Handle() { ely_block_destroy(b); }
    int32_t idx(const char* name) const {
        int32_t i = -1;
        EXPECT_EQ(ely_block_find(b, name, &i), ELY_OK) << name << ": " << ely_last_error();
        return i;
    }
    double get(const char* name) const {
        double v = std::nan("");
        EXPECT_EQ(ely_block_get(b, idx(name), &v), ELY_OK) << name << ": " << ely_last_error();
        return v;
    }
};

}  // namespace

TEST(BlockApi, MinimalConfigOfDesignSolvesForEveryTechnology) {
    for (const char* tech : {"pem", "alkaline", "solid_oxide", "brine"}) {
        const std::string json = std::string(R"({"technology":")") + tech +
                                 R"(","stack":{"cells":100,"active_area":0.1},"operating":{"spec":"current_density"}})";
        Handle h(json.c_str());
        ASSERT_NE(h.b, nullptr) << tech;
        const int32_t s = ely_block_solve(h.b);
        EXPECT_GE(s, 0) << tech << ": " << ely_last_error();
        EXPECT_GT(h.get("cell.voltage"), h.get("cell.reversible_voltage")) << tech;
    }
}

TEST(BlockApi, ResultsEqualTheCppModel) {
    Handle h;
    ely::Block direct(ely::parse_config(kMinimalPem));
    direct.set(direct.find("in.current_density"), 15000.0);
    direct.solve();
    ASSERT_EQ(ely_block_set(h.b, h.idx("in.current_density"), 15000.0), ELY_OK);
    ASSERT_GE(ely_block_solve(h.b), 0);
    int32_t n = 0;
    ASSERT_EQ(ely_block_variable_count(h.b, &n), ELY_OK);
    ASSERT_EQ(n, direct.variable_count());
    for (int32_t i = 0; i < n; ++i) {
        double v = 0;
        ASSERT_EQ(ely_block_get(h.b, i, &v), ELY_OK);
        const double d = direct.get(i);
        if (std::isnan(d)) EXPECT_TRUE(std::isnan(v));
        else EXPECT_EQ(v, d) << direct.variable(i).name;
    }
}

TEST(BlockApi, NullPointersAreErrors) {
    ely_block* out = reinterpret_cast<ely_block*>(0x1);
    EXPECT_EQ(ely_block_create(nullptr, &out), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(out, nullptr);
    EXPECT_THAT(ely_last_error(), HasSubstr("config_json"));
    EXPECT_EQ(ely_block_create(kMinimalPem, nullptr), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_create_from_file(nullptr, &out), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_clone(nullptr, &out), ELY_ERR_INVALID_ARGUMENT);
    int32_t i = 0;
    double v = 0;
    EXPECT_EQ(ely_block_find(nullptr, "cell.voltage", &i), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_set(nullptr, 0, 1.0), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_get(nullptr, 0, &v), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_solve(nullptr), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_variable_count(nullptr, &i), ELY_ERR_INVALID_ARGUMENT);
    Handle h;
    EXPECT_EQ(ely_block_find(h.b, nullptr, &i), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_find(h.b, "cell.voltage", nullptr), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_get(h.b, 0, nullptr), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_set_spec(h.b, nullptr), ELY_ERR_INVALID_ARGUMENT);
    ely_block_destroy(nullptr);  // no-op
}

TEST(BlockApi, BadConfigurationsNameTheProblem) {
    ely_block* out = nullptr;
    EXPECT_EQ(ely_block_create("{\"technology\": ", &out), ELY_ERR_CONFIG);
    EXPECT_STRNE(ely_last_error(), "");
    EXPECT_EQ(ely_block_create(R"({"technology":"pem","stack":{"cells":100,"active_area":0.1},"operating":{"spec":"current_density"},"colour":1})", &out),
              ELY_ERR_CONFIG);
    EXPECT_THAT(ely_last_error(), HasSubstr("colour"));
    EXPECT_EQ(ely_block_create(R"({"technology":"pem","stack":{"cells":100,"active_area":-0.1},"operating":{"spec":"current_density"}})", &out),
              ELY_ERR_CONFIG);
    EXPECT_THAT(ely_last_error(), HasSubstr("active_area"));
    EXPECT_EQ(ely_block_create_from_file("/nonexistent/plant.json", &out), ELY_ERR_IO);
    EXPECT_THAT(ely_last_error(), HasSubstr("/nonexistent/plant.json"));
    EXPECT_EQ(out, nullptr);
}

TEST(BlockApi, LifeCycleAndBadInputsKeepTheLastValidState) {
    Handle h;
    double v = 0;
    const int32_t iv = h.idx("cell.voltage"), it = h.idx("in.temperature");
    EXPECT_EQ(ely_block_get(h.b, iv, &v), ELY_ERR_WRONG_STATE);
    EXPECT_THAT(ely_last_error(), HasSubstr("not been solved"));
    ASSERT_GE(ely_block_solve(h.b), 0);
    const double v0 = h.get("cell.voltage"), t0 = h.get("in.temperature");

    const double bad[] = {std::nan(""), std::numeric_limits<double>::infinity(), -5.0, 0.0};
    for (double x : bad) {
        EXPECT_EQ(ely_block_set(h.b, it, x), ELY_ERR_INVALID_ARGUMENT) << x;
        EXPECT_THAT(ely_last_error(), HasSubstr("in.temperature"));
    }
    EXPECT_EQ(h.get("cell.voltage"), v0);  // still solved, unchanged
    EXPECT_EQ(ely_block_set(h.b, iv, 2.0), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("output"));
    EXPECT_EQ(ely_block_set(h.b, 100000, 2.0), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_set(h.b, -1, 2.0), ELY_ERR_INVALID_ARGUMENT);
    int32_t i = 0;
    EXPECT_EQ(ely_block_find(h.b, "cell.colour", &i), ELY_ERR_UNKNOWN_NAME);
    EXPECT_THAT(ely_last_error(), HasSubstr("cell.colour"));
    EXPECT_EQ(ely_block_find(h.b, "product.chlorine", &i), ELY_ERR_UNKNOWN_NAME);  // brine only
    EXPECT_EQ(ely_block_set_spec(h.b, "torque"), ELY_ERR_INVALID_ARGUMENT);

    // A temperature outside the cell's envelope: the solve fails, the block rolls back.
    ASSERT_EQ(ely_block_set(h.b, it, 500.0), ELY_OK);
    EXPECT_EQ(ely_block_get(h.b, iv, &v), ELY_ERR_WRONG_STATE);
    EXPECT_EQ(ely_block_solve(h.b), ELY_ERR_OUT_OF_RANGE);
    EXPECT_THAT(ely_last_error(), HasSubstr("temperature"));
    EXPECT_EQ(h.get("in.temperature"), t0);
    EXPECT_EQ(h.get("cell.voltage"), v0);

    // Infeasible power spec: the spec rolls back with the inputs.
    ASSERT_EQ(ely_block_set_spec(h.b, "power"), ELY_OK);
    ASSERT_EQ(ely_block_set(h.b, h.idx("in.power"), 1e12), ELY_OK);
    EXPECT_EQ(ely_block_solve(h.b), ELY_ERR_INFEASIBLE);
    EXPECT_THAT(ely_last_error(), HasSubstr("maximum current density"));
    EXPECT_EQ(h.get("cell.voltage"), v0);
    const char* spec = nullptr;
    ASSERT_EQ(ely_block_get_spec(h.b, &spec), ELY_OK);
    EXPECT_STREQ(spec, "current_density");  // back on current_density
    EXPECT_EQ(ely_block_set(h.b, h.idx("in.power"), 1e5), ELY_OK);  // stored; the spec does not read it
    ASSERT_GE(ely_block_solve(h.b), 0);
    EXPECT_EQ(h.get("cell.voltage"), v0);
}

TEST(BlockApi, PowerSpecMeetsTheSetpoint) {
    Handle h;
    ASSERT_EQ(ely_block_set_spec(h.b, "power"), ELY_OK);
    for (double p : {5e3, 50e3, 150e3, 300e3}) {
        ASSERT_EQ(ely_block_set(h.b, h.idx("in.power"), p), ELY_OK);
        ASSERT_GE(ely_block_solve(h.b), 0) << ely_last_error();
        EXPECT_LT(std::fabs(h.get("stack.power") / p - 1.0), 1e-9);
        EXPECT_EQ(h.get("perf.specific_energy"), h.get("stack.power") / h.get("product.hydrogen"));
    }
}

TEST(BlockApi, ReportBufferProtocol) {
    Handle h;
    size_t n = 0;
    EXPECT_EQ(ely_block_report_json(h.b, nullptr, 0, &n), ELY_ERR_WRONG_STATE);
    ASSERT_GE(ely_block_solve(h.b), 0);
    ASSERT_EQ(ely_block_report_json(h.b, nullptr, 0, &n), ELY_OK);
    ASSERT_GT(n, 100u);
    std::vector<char> small(10, 'x');
    size_t m = 0;
    EXPECT_EQ(ely_block_report_json(h.b, small.data(), small.size(), &m), ELY_ERR_BUFFER_TOO_SMALL);
    EXPECT_EQ(m, n);
    EXPECT_EQ(small[0], 'x');  // nothing written
    EXPECT_EQ(ely_block_report_json(h.b, nullptr, 5, &m), ELY_ERR_INVALID_ARGUMENT);
    std::vector<char> buf(n);
    ASSERT_EQ(ely_block_report_json(h.b, buf.data(), buf.size(), &m), ELY_OK);
    const std::string text(buf.data());
    EXPECT_EQ(text.size() + 1, n);
    EXPECT_THAT(text, HasSubstr("\"cell.voltage\":{\"value\":"));
    EXPECT_THAT(text, HasSubstr("\"technology\":\"pem\""));
}

TEST(BlockApi, VariableInfoAndItsStructSize) {
    Handle h;
    int32_t n = 0;
    ASSERT_EQ(ely_block_variable_count(h.b, &n), ELY_OK);
    bool saw_input = false, saw_output = false, saw_parameter = false;
    for (int32_t i = 0; i < n; ++i) {
        ely_variable_info info{};
        info.struct_size = sizeof info;
        ASSERT_EQ(ely_block_variable_info(h.b, i, &info), ELY_OK);
        ASSERT_NE(info.name, nullptr);
        ASSERT_NE(info.unit, nullptr);
        ASSERT_NE(info.description, nullptr);
        int32_t back = -1;
        ASSERT_EQ(ely_block_find(h.b, info.name, &back), ELY_OK);
        EXPECT_EQ(back, i);
        saw_input |= info.causality == ELY_CAUSALITY_INPUT;
        saw_output |= info.causality == ELY_CAUSALITY_OUTPUT;
        saw_parameter |= info.causality == ELY_CAUSALITY_PARAMETER;
    }
    EXPECT_TRUE(saw_input && saw_output && saw_parameter);
    ely_variable_info info{};
    info.struct_size = 4;
    EXPECT_EQ(ely_block_variable_info(h.b, 0, &info), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("struct_size"));
    info.struct_size = sizeof info;
    EXPECT_EQ(ely_block_variable_info(h.b, n, &info), ELY_ERR_INVALID_ARGUMENT);
}

TEST(BlockApi, BatchEqualsSingleSolvesAndLeavesTheBlockAlone) {
    Handle h;
    ASSERT_GE(ely_block_solve(h.b), 0);
    const double v_before = h.get("cell.voltage");
    const int32_t in_idx[] = {h.idx("in.current_density"), h.idx("in.temperature")};
    const int32_t out_idx[] = {h.idx("cell.voltage"), h.idx("product.hydrogen"), h.idx("heat.duty")};
    const size_t n = 40;
    std::vector<double> in(2 * n), out(3 * n);
    std::vector<int32_t> st(n);
    for (size_t k = 0; k < n; ++k) {
        in[2 * k] = 500.0 + 500.0 * static_cast<double>(k);
        in[2 * k + 1] = 330.0 + static_cast<double>(k % 5) * 5.0;
    }
    in[2 * 7 + 1] = 900.0;  // a point outside the envelope fails alone
    const int32_t s = ely_block_solve_batch(h.b, n, 2, in_idx, in.data(), 3, out_idx, out.data(), st.data(), nullptr, nullptr);
    EXPECT_EQ(s, ELY_PARTIAL);
    EXPECT_THAT(ely_last_error(), HasSubstr("point 7"));
    EXPECT_EQ(st[7], ELY_ERR_OUT_OF_RANGE);
    EXPECT_TRUE(std::isnan(out[3 * 7]));
    EXPECT_EQ(h.get("cell.voltage"), v_before);  // the block itself is untouched
    Handle single;
    for (size_t k = 0; k < n; ++k) {
        if (k == 7) continue;
        ASSERT_GE(st[k], 0) << k;
        ASSERT_EQ(ely_block_set(single.b, in_idx[0], in[2 * k]), ELY_OK);
        ASSERT_EQ(ely_block_set(single.b, in_idx[1], in[2 * k + 1]), ELY_OK);
        ASSERT_GE(ely_block_solve(single.b), 0);
        // The vectorized batch (lib/batch) equals the scalar path to 1e-12 relative (its exp, log and asinh
        // round differently by about an ulp); heat.duty to 1e-12 of the stack power, the size of its terms.
        const double v = single.get("cell.voltage"), h2 = single.get("product.hydrogen");
        EXPECT_NEAR(out[3 * k], v, 1e-12 * v) << k;
        EXPECT_NEAR(out[3 * k + 1], h2, 1e-12 * h2) << k;
        EXPECT_NEAR(out[3 * k + 2], single.get("heat.duty"), 1e-12 * single.get("stack.power")) << k;
    }
}

TEST(BlockApi, BatchArgumentErrorsWriteNothingAndCancelWorks) {
    Handle h;
    const int32_t in_idx[] = {h.idx("in.current_density")};
    const int32_t bad_in[] = {h.idx("cell.voltage")};
    const int32_t out_idx[] = {h.idx("cell.voltage")};
    std::vector<double> in(3000, 10000.0), out(3000, -1.0);
    std::vector<int32_t> st(3000, 99);
    EXPECT_EQ(ely_block_solve_batch(h.b, 3, 1, bad_in, in.data(), 1, out_idx, out.data(), st.data(), nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("not an input"));
    EXPECT_EQ(ely_block_solve_batch(h.b, 3, 1, in_idx, nullptr, 1, out_idx, out.data(), st.data(), nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_solve_batch(h.b, 3, -1, in_idx, in.data(), 1, out_idx, out.data(), st.data(), nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(out[0], -1.0);
    EXPECT_EQ(st[0], 99);
    auto cancel = [](size_t done, size_t, void* user) -> int32_t {
        *static_cast<size_t*>(user) = done;
        return 1;
    };
    size_t seen = 0;
    EXPECT_EQ(ely_block_solve_batch(h.b, 3000, 1, in_idx, in.data(), 1, out_idx, out.data(), st.data(), cancel, &seen),
              ELY_ERR_CANCELLED);
    EXPECT_EQ(seen, 1024u);
    EXPECT_GE(st[0], 0);
    EXPECT_EQ(st[2999], ELY_ERR_CANCELLED);
}

TEST(BlockApi, CloneIsIndependent) {
    Handle h;
    ASSERT_GE(ely_block_solve(h.b), 0);
    ely_block* c = nullptr;
    ASSERT_EQ(ely_block_clone(h.b, &c), ELY_OK);
    double v = 0;
    ASSERT_EQ(ely_block_get(c, h.idx("cell.voltage"), &v), ELY_OK);
    EXPECT_EQ(v, h.get("cell.voltage"));
    ASSERT_EQ(ely_block_set(c, h.idx("in.current_density"), 1000.0), ELY_OK);
    ASSERT_GE(ely_block_solve(c), 0);
    ASSERT_EQ(ely_block_get(c, h.idx("cell.voltage"), &v), ELY_OK);
    EXPECT_NE(v, h.get("cell.voltage"));
    ely_block_destroy(c);
}

TEST(BlockApi, TwoThreadsOnTwoHandlesMatchSerial) {
    const size_t n = 300;
    auto run = [n](std::vector<double>& out) {
        Handle h;
        const int32_t ij = h.idx("in.current_density"), iv = h.idx("cell.voltage"), ih = h.idx("heat.duty");
        out.resize(2 * n);
        for (size_t k = 0; k < n; ++k) {
            ely_block_set(h.b, ij, 100.0 + 90.0 * static_cast<double>(k));
            ely_block_solve(h.b);
            ely_block_get(h.b, iv, &out[2 * k]);
            ely_block_get(h.b, ih, &out[2 * k + 1]);
        }
    };
    std::vector<double> serial, a, b;
    run(serial);
    std::thread ta([&] { run(a); }), tb([&] { run(b); });
    ta.join();
    tb.join();
    EXPECT_EQ(a, serial);
    EXPECT_EQ(b, serial);
}

// --- The variable metadata: every field, every variable, every technology ----------------------

namespace {
std::string source(const char* relative) { return std::string(ELY_SOURCE_DIR) + "/" + relative; }
}  // namespace

TEST(BlockApi, VariableInfoEveryFieldOfEveryVariableOfEveryTechnology) {
    for (const auto& tech : ely::technologies()) {
        SCOPED_TRACE(tech.name);
        const std::string path = source(tech.example);
        ely_block* b = nullptr;
        ASSERT_EQ(ely_block_create_from_file(path.c_str(), &b), ELY_OK) << ely_last_error();
        const ely::Block direct(ely::load_config_file(path));
        int32_t n = 0;
        ASSERT_EQ(ely_block_variable_count(b, &n), ELY_OK);
        ASSERT_EQ(n, direct.variable_count());
        int32_t shown = 0, tunable = 0;
        for (int32_t i = 0; i < n; ++i) {
            ely_variable_info info;
            std::memset(&info, 0xA5, sizeof info);
            info.struct_size = sizeof info;
            ASSERT_EQ(ely_block_variable_info(b, i, &info), ELY_OK) << ely_last_error();
            const ely::VariableInfo& v = direct.variable(i);
            SCOPED_TRACE(v.name);
            EXPECT_EQ(info.struct_size, sizeof info);  // not written by the library
            // Name, unit, description: the C++ table's strings.
            EXPECT_STREQ(info.name, v.name);
            EXPECT_STREQ(info.unit, v.unit);
            EXPECT_STREQ(info.description, v.description);
            EXPECT_GT(std::strlen(info.unit), 0u);
            EXPECT_GT(std::strlen(info.description), 0u);
            // Causality and variability: consistent pairs.
            EXPECT_EQ(info.causality, static_cast<int32_t>(v.causality));
            EXPECT_EQ(info.variability, static_cast<int32_t>(v.variability));
            switch (info.causality) {
                case ELY_CAUSALITY_INPUT:  // continuous, or discrete: in.mode_request
                    EXPECT_TRUE(info.variability == ELY_VARIABILITY_CONTINUOUS || info.variability == ELY_VARIABILITY_DISCRETE);
                    break;
                case ELY_CAUSALITY_OUTPUT:
                    EXPECT_TRUE(info.variability == ELY_VARIABILITY_CONTINUOUS || info.variability == ELY_VARIABILITY_DISCRETE);
                    break;
                case ELY_CAUSALITY_PARAMETER:
                    EXPECT_TRUE(info.variability == ELY_VARIABILITY_FIXED || info.variability == ELY_VARIABILITY_TUNABLE);
                    tunable += info.variability == ELY_VARIABILITY_TUNABLE;
                    break;
                default: ADD_FAILURE() << "causality " << info.causality;
            }
            // Limits, start, nominal.
            EXPECT_EQ(info.flags, v.min_exclusive ? ELY_VARIABLE_MIN_EXCLUSIVE : 0u);
            EXPECT_EQ(info.min, v.min);
            EXPECT_EQ(info.max, v.max);
            EXPECT_LE(info.min, info.max);
            EXPECT_FALSE(std::isnan(info.min) || std::isnan(info.max));
            if (info.causality == ELY_CAUSALITY_OUTPUT) {
                EXPECT_TRUE(std::isnan(info.start));
            } else if (!std::isnan(info.start)) {  // NaN only for a drive input never given
                EXPECT_GE(info.start, info.min);
                EXPECT_LE(info.start, info.max);
            } else {
                EXPECT_EQ(info.causality, ELY_CAUSALITY_INPUT);
            }
            EXPECT_EQ(std::isnan(info.start), std::isnan(direct.start(i)));
            EXPECT_TRUE(std::isfinite(info.nominal) && info.nominal > 0) << info.nominal;
            // Display: label, unit and a conversion that maps SI to it.
            EXPECT_STREQ(info.label, v.label);
            EXPECT_GT(std::strlen(info.label), 0u);
            EXPECT_STREQ(info.display_unit, v.display_symbol());
            EXPECT_TRUE(std::isfinite(info.display_scale) && info.display_scale != 0);
            EXPECT_TRUE(std::isfinite(info.display_offset));
            if (std::strcmp(info.display_unit, info.unit) == 0) {
                EXPECT_EQ(info.display_scale, 1.0);
                EXPECT_EQ(info.display_offset, 0.0);
            }
            // Summary place and config key.
            ASSERT_NE(info.summary_group, nullptr);
            EXPECT_GE(info.summary_rank, 0);
            EXPECT_EQ(info.summary_rank > 0, std::strlen(info.summary_group) > 0);
            EXPECT_EQ(info.summary_rank, direct.summary_rank(i));
            shown += info.summary_rank > 0;
            ASSERT_NE(info.config_key, nullptr);
            if (info.causality == ELY_CAUSALITY_OUTPUT) EXPECT_STREQ(info.config_key, "");
            else EXPECT_EQ(std::string(info.config_key).rfind("$.", 0), 0u) << info.config_key;
        }
        EXPECT_GT(shown, 20);
        EXPECT_GT(tunable, 10);
        ely_block_destroy(b);
    }
}

TEST(BlockApi, VariableInfoOfTheFirstVersionStillWorks) {
    // A caller built against the first header: its struct ends after description, and the
    // library must write nothing beyond it.
    struct VariableInfoV1 {
        uint32_t struct_size;
        int32_t causality;
        const char* name;
        const char* unit;
        const char* description;
    };
    struct {
        VariableInfoV1 info;
        unsigned char after[96];
    } guarded;
    std::memset(&guarded, 0x5A, sizeof guarded);
    guarded.info.struct_size = sizeof(VariableInfoV1);
    Handle h;
    const int32_t i = h.idx("in.temperature");
    ASSERT_EQ(ely_block_variable_info(h.b, i, reinterpret_cast<ely_variable_info*>(&guarded.info)), ELY_OK)
        << ely_last_error();
    EXPECT_STREQ(guarded.info.name, "in.temperature");
    EXPECT_STREQ(guarded.info.unit, "K");
    EXPECT_EQ(guarded.info.causality, ELY_CAUSALITY_INPUT);
    for (unsigned char byte : guarded.after) ASSERT_EQ(byte, 0x5A) << "written past the first version's struct";
    // A struct_size between the versions is the first version too.
    guarded.info.struct_size = sizeof(VariableInfoV1) + 8;
    EXPECT_EQ(ely_block_variable_info(h.b, i, reinterpret_cast<ely_variable_info*>(&guarded.info)), ELY_OK);
    for (unsigned char byte : guarded.after) ASSERT_EQ(byte, 0x5A);
}

TEST(BlockApi, ConstantsOfTheTableArePinned) {
    // Macros are invisible to the ABI check: their values are part of the interface.
    EXPECT_EQ(ELY_CAUSALITY_INPUT, 0);
    EXPECT_EQ(ELY_CAUSALITY_OUTPUT, 1);
    EXPECT_EQ(ELY_CAUSALITY_PARAMETER, 2);
    EXPECT_EQ(ELY_VARIABILITY_FIXED, 0);
    EXPECT_EQ(ELY_VARIABILITY_TUNABLE, 1);
    EXPECT_EQ(ELY_VARIABILITY_CONTINUOUS, 2);
    EXPECT_EQ(ELY_VARIABILITY_DISCRETE, 3);
    EXPECT_EQ(ELY_VARIABLE_MIN_EXCLUSIVE, 1);
    // The second version of the struct: its members after description, in this order.
    EXPECT_LT(offsetof(ely_variable_info, description), offsetof(ely_variable_info, variability));
    EXPECT_LT(offsetof(ely_variable_info, config_key), offsetof(ely_variable_info, summary_rank));
}

// --- Specs and tunable parameters through the C interface ------------------------------------

TEST(BlockApi, EverySpecModeSolvesAndGetSpecNamesIt) {
    Handle h;
    ASSERT_GE(ely_block_solve(h.b), 0);
    struct Mode {
        const char* spec;
        const char* input;
        const char* held;
    };
    const Mode modes[] = {{"current_density", "in.current_density", "cell.current_density"},
                          {"current", "in.current", "stack.current"},
                          {"power", "in.power", "stack.power"},
                          {"hydrogen_rate", "in.hydrogen_rate", "product.hydrogen"},
                          {"voltage", "in.voltage", "cell.voltage"}};
    double reference[5];
    for (int m = 0; m < 5; ++m) reference[m] = h.get(modes[m].held);
    const double j0 = h.get("cell.current_density");
    for (int m = 0; m < 5; ++m) {
        SCOPED_TRACE(modes[m].spec);
        ASSERT_EQ(ely_block_set_spec(h.b, modes[m].spec), ELY_OK);
        const char* spec = nullptr;
        ASSERT_EQ(ely_block_get_spec(h.b, &spec), ELY_OK);
        EXPECT_STREQ(spec, modes[m].spec);
        ASSERT_EQ(ely_block_set(h.b, h.idx(modes[m].input), reference[m]), ELY_OK);
        ASSERT_GE(ely_block_solve(h.b), 0) << ely_last_error();
        EXPECT_NEAR(h.get(modes[m].held), reference[m], 1e-9 * std::fabs(reference[m]));
        EXPECT_NEAR(h.get("cell.current_density"), j0, 1e-6 * j0);
    }
    const char* spec = nullptr;
    EXPECT_EQ(ely_block_get_spec(nullptr, &spec), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_get_spec(h.b, nullptr), ELY_ERR_INVALID_ARGUMENT);
}

TEST(BlockApi, ADriveInputNeverGivenIsAnErrorNamingIt) {
    Handle h;  // current_density spec, no power given
    ASSERT_EQ(ely_block_set_spec(h.b, "power"), ELY_OK);
    EXPECT_EQ(ely_block_solve(h.b), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("in.power"));
    EXPECT_THAT(ely_last_error(), HasSubstr("$.operating.power"));
    ely_block* b = nullptr;
    EXPECT_EQ(ely_block_create(R"({"technology":"pem","stack":{"cells":10,"active_area":0.1},"operating":{"spec":"power"}})", &b),
              ELY_ERR_CONFIG);
    EXPECT_THAT(ely_last_error(), HasSubstr("operating.power is not given"));
}

TEST(BlockApi, TunableParametersAreSettableAndStructuralOnesAreNot) {
    Handle h;
    ASSERT_GE(ely_block_solve(h.b), 0);
    const double v0 = h.get("cell.voltage");
    const int32_t contact = h.idx("param.cell.contact_resistance");
    ASSERT_EQ(ely_block_set(h.b, contact, 5e-5), ELY_OK) << ely_last_error();
    ASSERT_GE(ely_block_solve(h.b), 0);
    EXPECT_GT(h.get("cell.voltage"), v0);
    EXPECT_EQ(ely_block_set(h.b, contact, -1.0), ELY_ERR_INVALID_ARGUMENT);  // below its limit
    EXPECT_THAT(ely_last_error(), HasSubstr("param.cell.contact_resistance"));
    EXPECT_EQ(ely_block_set(h.b, h.idx("param.cells"), 10), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("structural"));
    EXPECT_THAT(ely_last_error(), HasSubstr("$.stack.cells"));
    EXPECT_EQ(h.get("param.cells"), 100.0);
    // A clone keeps the value it had when it was made.
    ely_block* c = nullptr;
    ASSERT_EQ(ely_block_clone(h.b, &c), ELY_OK);
    ASSERT_EQ(ely_block_set(h.b, contact, 5e-6), ELY_OK);
    double in_clone = 0;
    ASSERT_EQ(ely_block_get(c, contact, &in_clone), ELY_OK);
    EXPECT_EQ(in_clone, 5e-5);
    ely_block_destroy(c);
}
