// ely_block_solve_batch argument checks: every combination of counts (zero included, negative,
// one, several) and of NULL and valid pointers, against the contract written in the header.
#include <gmock/gmock.h>

#include <cstdint>
#include <limits>

#include "capi_support.hpp"

using ::testing::HasSubstr;
using capi_test::Block;

namespace {

// A PEM plant whose anode gas stays below the warning level at its default point (an anode
// recombination catalyst): these tests check argument handling, so every point must be OK.
const char* const kPem =
    R"({"technology":"pem","stack":{"cells":100,"active_area":0.1},"cell":{"h2_recombination_fraction_anode":0.9},)"
    R"("operating":{"spec":"current_density"}})";

// The header's contract: an index array is required whenever its count is positive (even for
// zero points), the data arrays whenever there is a point; negative counts are errors.
bool arguments_valid(size_t n_points, int32_t n_in, int32_t n_out, bool in_idx, bool in, bool out_idx, bool out,
                     bool status) {
    if (n_in < 0 || n_out < 0) return false;
    if (n_in > 0 && !in_idx) return false;
    if (n_out > 0 && !out_idx) return false;
    if (n_points == 0) return true;
    return status && (n_in == 0 || in) && (n_out == 0 || out);
}

}  // namespace

TEST(BatchArguments, EveryCountWithEveryNullCombination) {
    Block h(kPem);
    // The second input is the first again (the later value wins), so that every row of `in` is a
    // current density for either width.
    const int32_t in_idx[] = {h.index("in.current_density"), h.index("in.current_density")};
    const int32_t out_idx[] = {h.index("cell.voltage")};
    int checked = 0;
    for (size_t n_points : {size_t{0}, size_t{1}, size_t{2}}) {
        for (int32_t n_in : {-1, 0, 1, 2}) {
            for (int32_t n_out : {-1, 0, 1}) {
                for (unsigned nulls = 0; nulls < 32; ++nulls) {
                    const bool has_in_idx = !(nulls & 1), has_in = !(nulls & 2), has_out_idx = !(nulls & 4),
                               has_out = !(nulls & 8), has_status = !(nulls & 16);
                    double in[4] = {12000.0, 13000.0, 14000.0, 15000.0};
                    double out[2] = {-1.0, -1.0};
                    int32_t st[2] = {99, 99};
                    const int32_t s = ely_block_solve_batch(
                        h.get(), n_points, n_in, has_in_idx ? in_idx : nullptr, has_in ? in : nullptr, n_out,
                        has_out_idx ? out_idx : nullptr, has_out ? out : nullptr, has_status ? st : nullptr, nullptr,
                        nullptr);
                    const bool valid =
                        arguments_valid(n_points, n_in, n_out, has_in_idx, has_in, has_out_idx, has_out, has_status);
                    SCOPED_TRACE(::testing::Message() << "n_points " << n_points << " n_inputs " << n_in
                                                      << " n_outputs " << n_out << " null mask " << nulls);
                    if (!valid) {
                        EXPECT_EQ(s, ELY_ERR_INVALID_ARGUMENT);
                        EXPECT_STRNE(ely_last_error(), "");
                        EXPECT_EQ(st[0], 99);  // nothing written
                        EXPECT_EQ(out[0], -1.0);
                    } else {
                        EXPECT_EQ(s, ELY_OK) << ely_last_error();
                        for (size_t k = 0; k < n_points; ++k) {
                            EXPECT_EQ(st[k], ELY_OK);
                        }
                        if (n_points == 0) {
                            EXPECT_EQ(st[0], 99);
                        } else if (n_out > 0) {
                            EXPECT_GT(out[0], 1.0);  // a cell voltage
                        }
                    }
                    ++checked;
                }
            }
        }
    }
    EXPECT_EQ(checked, 3 * 4 * 3 * 32);
}

TEST(BatchArguments, NullIndexArraysWithZeroPointsNameTheArgument) {
    Block h(kPem);
    EXPECT_EQ(ely_block_solve_batch(h.get(), 0, 3, nullptr, nullptr, 0, nullptr, nullptr, nullptr, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("input_indices"));
    EXPECT_EQ(ely_block_solve_batch(h.get(), 0, 0, nullptr, nullptr, 2, nullptr, nullptr, nullptr, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("output_indices"));
    // Zero points still check the indices themselves.
    const int32_t bad[] = {100000};
    EXPECT_EQ(ely_block_solve_batch(h.get(), 0, 0, nullptr, nullptr, 1, bad, nullptr, nullptr, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_block_solve_batch(h.get(), 0, -1, nullptr, nullptr, 0, nullptr, nullptr, nullptr, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("n_inputs"));
}

TEST(BatchArguments, PointCountBeyondTheAddressSpaceIsAnError) {
    Block h(kPem);
    const int32_t in_idx[] = {h.index("in.current_density")};
    double in[1] = {1e4};
    int32_t st[1] = {99};
    EXPECT_EQ(ely_block_solve_batch(h.get(), std::numeric_limits<size_t>::max(), 1, in_idx, in, 0, nullptr, nullptr,
                                    st, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("n_points"));
    EXPECT_EQ(st[0], 99);
    // With no inputs and no outputs the status array alone must be addressable.
    EXPECT_EQ(ely_block_solve_batch(h.get(), std::numeric_limits<size_t>::max(), 0, nullptr, nullptr, 0, nullptr,
                                    nullptr, st, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(st[0], 99);
}

TEST(BatchArguments, CancelAtTheFinalProgressCallIsNotOk) {
    Block h(kPem);
    const int32_t in_idx[] = {h.index("in.current_density")};
    const int32_t out_idx[] = {h.index("cell.voltage")};
    double in[3] = {5000.0, 10000.0, 15000.0}, out[3] = {0, 0, 0};
    int32_t st[3] = {99, 99, 99};
    size_t calls = 0;
    auto stop = [](size_t done, size_t total, void* user) -> int32_t {
        ++*static_cast<size_t*>(user);
        return done == total ? 1 : 0;
    };
    EXPECT_EQ(ely_block_solve_batch(h.get(), 3, 1, in_idx, in, 1, out_idx, out, st, stop, &calls), ELY_ERR_CANCELLED);
    EXPECT_THAT(ely_last_error(), HasSubstr("cancelled"));
    EXPECT_EQ(calls, 1u);
    for (int k = 0; k < 3; ++k) EXPECT_EQ(st[k], ELY_OK) << k;  // every point was solved before the request
    EXPECT_LT(out[0], out[2]);
}
