// Handles are independent: eight threads, each on its own handle of one technology (all six
// technologies run at once), each with inputs of its own. Every status is checked, and every
// value equals, bit for bit, a serial run of the same work on one thread.
#include <cstdint>
#include <cstring>
#include <string>
#include <thread>
#include <vector>

#include "capi_support.hpp"

namespace {

constexpr int kThreads = 8;
constexpr int kPoints = 60;

// Current densities (A/m2) inside each technology's default envelope, from the minimal configs'
// defaults (docs/cells-water.md, docs/cells-brine-custom.md).
struct Range {
    const char* technology;
    double j_low, j_high;
};
const Range kRanges[] = {{"pem", 3000, 20000}, {"alkaline", 1000, 4000}, {"solid_oxide", 1500, 6000},
                         {"brine", 1500, 4500}, {"custom", 300, 3000}, {"aem", 2000, 10000}};
constexpr int kTechnologies = static_cast<int>(sizeof kRanges / sizeof kRanges[0]);

struct Work {
    std::vector<int32_t> statuses;
    std::vector<uint64_t> bits;  // every variable after every solve, as bit patterns (NaN included)
    std::string first_error;
};

uint64_t bits_of(double v) {
    uint64_t b;
    std::memcpy(&b, &v, sizeof b);
    return b;
}

// The work of thread `t`: a sweep with its own current densities (offset by t) on its own
// technology; nothing in it may fail.
Work run(int t) {
    const Range& r = kRanges[t % kTechnologies];
    capi_test::Block block(capi_test::minimal_config(r.technology));
    Work w;
    if (!block.get()) return w;
    int32_t count = 0;
    if (ely_block_variable_count(block.get(), &count) != ELY_OK) return w;
    const int32_t ij = block.index("in.current_density");
    for (int k = 0; k < kPoints; ++k) {
        const double x = (k + 0.37 * t) / (kPoints + 3.0);  // a different sequence for each thread
        int32_t s = ely_block_set(block.get(), ij, r.j_low + (r.j_high - r.j_low) * x);
        if (s == ELY_OK) s = ely_block_solve(block.get());
        w.statuses.push_back(s);
        if (s < 0) {
            if (w.first_error.empty()) w.first_error = ely_last_error();
            continue;
        }
        for (int32_t i = 0; i < count; ++i) {
            double v = 0;
            const int32_t g = ely_block_get(block.get(), i, &v);
            w.statuses.push_back(g);
            w.bits.push_back(bits_of(v));
        }
    }
    return w;
}

}  // namespace

TEST(Threads, EightHandlesOfEveryTechnologyMatchASerialRunBitForBit) {
    std::vector<Work> serial;
    for (int t = 0; t < kThreads; ++t) serial.push_back(run(t));
    for (int t = 0; t < kThreads; ++t) {
        ASSERT_EQ(serial[t].statuses.size(), static_cast<size_t>(kPoints) * (1 + serial[t].bits.size() / kPoints))
            << kRanges[t % kTechnologies].technology;
        for (int32_t s : serial[t].statuses)
            ASSERT_TRUE(s == ELY_OK || s == ELY_WARNING) << kRanges[t % kTechnologies].technology << ": status " << s << ", "
                                                         << serial[t].first_error;
        ASSERT_FALSE(serial[t].bits.empty());
    }

    std::vector<Work> parallel(kThreads);
    std::vector<std::thread> threads;
    for (int t = 0; t < kThreads; ++t) threads.emplace_back([t, &parallel] { parallel[t] = run(t); });
    for (auto& th : threads) th.join();

    for (int t = 0; t < kThreads; ++t) {
        SCOPED_TRACE(kRanges[t % kTechnologies].technology);
        EXPECT_EQ(parallel[t].statuses, serial[t].statuses);
        EXPECT_EQ(parallel[t].bits, serial[t].bits);
        EXPECT_EQ(parallel[t].first_error, "");
    }
    // The threads worked on different inputs: no two sequences are alike.
    for (int t = 1; t < kThreads; ++t) EXPECT_NE(serial[t].bits, serial[t - 1].bits);
    EXPECT_NE(serial[0].bits, serial[kTechnologies].bits);  // same technology, other inputs
}
