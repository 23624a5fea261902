// ely_block_solve_batch against the scalar path, point by point (set + solve + get on a block of the
// same description): every output of every technology at every spec, on random points that include
// failing ones (limits crossed, open circuit, standby, infeasible drive values). The batch takes the
// vectorized kernel where it applies (PEM at the current-density, power and voltage specs, lib/batch);
// it must give the scalar path's statuses and, for the points that solve, every output to 1e-12
// relative (NaN where the scalar path gives NaN); at the spec solves, at the batch's current density.
#include <algorithm>
#include <cmath>
#include <random>
#include <string>
#include <thread>
#include <vector>

#include <gmock/gmock.h>

#include "capi_support.hpp"

namespace {
using capi_test::Block;

const char* const kTechnologies[] = {"pem", "aem", "alkaline", "solid_oxide", "brine", "custom"};
const char* const kSpecs[] = {"current_density", "current", "power", "hydrogen_rate", "voltage"};
const char* const kDrive[] = {"in.current_density", "in.current", "in.power", "in.hydrogen_rate", "in.voltage"};
// The output each spec's drive input sets.
const char* const kMeets[] = {"cell.current_density", "stack.current", "stack.power", "product.hydrogen", "cell.voltage"};

std::vector<int32_t> output_indices(const Block& b) {
    int32_t n = 0;
    ely_block_variable_count(b.get(), &n);
    std::vector<int32_t> out;
    for (int32_t i = 0; i < n; ++i) {
        ely_variable_info info{};
        info.struct_size = sizeof info;
        EXPECT_EQ(ely_block_variable_info(b.get(), i, &info), ELY_OK);
        if (info.causality == ELY_CAUSALITY_OUTPUT) out.push_back(i);
    }
    return out;
}

// |a − b| <= 1e-12 max(|a|, |b|, scale), or both NaN, or both the same infinity. scale is 0 but for the
// heat flows, which are differences of enthalpy flows and the power (heat.duty passes through zero
// near the thermoneutral voltage): for them the stack power, the size of the terms.
bool close(double a, double b, double scale) {
    if (std::isnan(a) || std::isnan(b)) return std::isnan(a) && std::isnan(b);
    if (a == b) return true;
    return std::fabs(a - b) <= 1e-12 * std::max({std::fabs(a), std::fabs(b), scale});
}

struct Points {
    std::vector<double> in;  // rows: drive, T, p_c, p_a
    size_t n = 0;
    void add(double drive, double t, double pc, double pa) {
        in.insert(in.end(), {drive, t, pc, pa});
        ++n;
    }
};

// Compares the batch with set + solve + get on `scalar` (a block of the same description and spec): the
// statuses, and every output to 1e-12 relative. With `meets` (the output a spec solve's drive input sets:
// stack.power, cell.voltage): the batch's current density agrees with the scalar spec solve's within the
// latter's tolerance (Brent, 1e-13 j_max), the batch meets the drive value to 1e-14 or is the scalar
// path's answer, and every output equals the scalar path's at the batch's current density to 1e-12.
void compare(const Block& batch_block, const Block& scalar, const char* drive, const Points& p, const std::string& what,
             const char* meets = nullptr, const Block* at_j = nullptr) {
    const int32_t ii[] = {batch_block.index(drive), batch_block.index("in.temperature"),
                          batch_block.index("in.pressure_cathode"), batch_block.index("in.pressure_anode")};
    const std::vector<int32_t> oi = output_indices(batch_block);
    const size_t no = oi.size();
    std::vector<double> out(p.n * no);
    std::vector<int32_t> status(p.n);
    ely_block_solve_batch(batch_block.get(), p.n, 4, ii, p.in.data(), static_cast<int32_t>(no), oi.data(), out.data(),
                          status.data(), nullptr, nullptr);
    std::vector<bool> heat(no);
    for (size_t o = 0; o < no; ++o) {
        ely_variable_info info{};
        info.struct_size = sizeof info;
        ely_block_variable_info(batch_block.get(), oi[o], &info);
        heat[o] = std::string(info.name).rfind("heat.", 0) == 0;
    }
    const auto at = [&](const char* name) {
        return static_cast<size_t>(std::find(oi.begin(), oi.end(), batch_block.index(name)) - oi.begin());
    };
    const size_t o_power = at("stack.power"), o_j = at("cell.current_density"), o_met = meets ? at(meets) : 0;
    const double j_max = scalar.value("param.current_density_max");
    int solved = 0, worst_shown = 0;
    for (size_t k = 0; k < p.n; ++k) {
        int32_t s = ELY_OK;
        for (int i = 0; i < 4 && s >= 0; ++i) s = ely_block_set(scalar.get(), ii[i], p.in[4 * k + static_cast<size_t>(i)]);
        if (s >= 0) s = ely_block_solve(scalar.get());
        ASSERT_EQ(status[k], s) << what << " point " << k << ": " << ely_last_error();
        if (s < 0) continue;
        ++solved;
        const double* b = &out[k * no];
        if (meets) {
            const double j_s = scalar.value("cell.current_density"), q_s = scalar.value(meets), target = p.in[4 * k];
            EXPECT_NEAR(b[o_j], j_s, 1.01e-13 * j_max + 1e-12 * j_s) << what << " point " << k;
            if (b[o_met] != q_s) {
                EXPECT_NEAR(b[o_met], target, 1e-14 * target) << what << " point " << k << " " << meets;
            }
            // The scalar path at the batch's current density (at_j: a block of the same description at the
            // current-density spec).
            for (int i = 1; i < 4; ++i) ASSERT_EQ(ely_block_set(at_j->get(), ii[i], p.in[4 * k + static_cast<size_t>(i)]), ELY_OK);
            at_j->set("in.current_density", b[o_j]);
            ASSERT_GE(ely_block_solve(at_j->get()), 0) << what << " point " << k << ": " << ely_last_error();
        }
        const Block& ref = meets ? *at_j : scalar;
        const double p_stack = ref.value("stack.power");
        for (size_t o = 0; o < no; ++o) {
            double v = std::nan("");
            ASSERT_EQ(ely_block_get(ref.get(), oi[o], &v), ELY_OK);
            if (!close(b[o], v, heat[o] ? std::fabs(p_stack) : 0.0) && worst_shown++ < 10) {
                ely_variable_info info{};
                info.struct_size = sizeof info;
                ely_block_variable_info(scalar.get(), oi[o], &info);
                ADD_FAILURE() << what << " point " << k << " (" << p.in[4 * k] << ", " << p.in[4 * k + 1] << ", "
                              << p.in[4 * k + 2] << ", " << p.in[4 * k + 3] << ") " << info.name << ": batch " << b[o]
                              << ", scalar " << v << " (rel " << std::fabs(b[o] / v - 1) << ")";
            }
        }
    }
    (void)o_power;
    EXPECT_GT(solved, 0) << what;
}

// Random points around the configured operating point of a description, some of them failing.
Points random_points(const Block& b, int spec, std::mt19937_64& rng, size_t n) {
    std::uniform_real_distribution<double> u(0.0, 1.0);
    const double t0 = b.value("in.temperature"), pc0 = b.value("in.pressure_cathode"), pa0 = b.value("in.pressure_anode");
    // The drive values the configured point reaches at its spec's quantity.
    const double q_ref[] = {b.value("cell.current_density"), b.value("stack.current"), b.value("stack.power"),
                            b.value("product.hydrogen"), b.value("cell.voltage")};
    const double e_ref = b.value("cell.reversible_voltage");
    Points p;
    for (size_t k = 0; k < n; ++k) {
        double drive = spec == 4 ? e_ref + (q_ref[4] - e_ref) * (0.2 + 1.0 * u(rng)) : q_ref[spec] * (0.02 + 1.2 * u(rng));
        double t = t0 + 20.0 * (u(rng) - 0.5), pc = pc0 * (1.0 + 2.0 * u(rng)), pa = pa0 * (1.0 + 0.5 * u(rng));
        switch (k % 23) {  // failing and edge points
            case 3: drive = spec == 4 ? 100.0 : drive * 1e3; break;   // beyond every limit
            case 5: t = std::nan(""); break;                           // not a number
            case 7: drive = 0.0; break;                                 // open circuit
            case 11: drive = spec == 4 ? drive : q_ref[spec] * 1e-7; break;  // standby (below the crossover)
            case 13: t = 250.0; break;                                  // below every envelope
            case 17: pc = 1.0; break;                                   // below every pressure limit
            default: break;
        }
        p.add(drive, t, pc, pa);
    }
    return p;
}

}  // namespace

TEST(BatchEqualsScalar, EveryTechnologyEveryOutput) {
    std::mt19937_64 rng(20261202);
    for (const char* tech : kTechnologies) {
        const std::string config = capi_test::minimal_config(tech);
        Block ref(config);
        ASSERT_EQ(ely_block_set_spec(ref.get(), "current_density"), ELY_OK) << tech;
        ASSERT_GE(ely_block_solve(ref.get()), 0) << tech << ": " << ely_last_error();
        for (int s = 0; s < 5; ++s) {
            Block batch(config), scalar(config), at_j(config);
            if (ely_block_set_spec(batch.get(), kSpecs[s]) != ELY_OK) continue;  // a drive the technology lacks
            ASSERT_EQ(ely_block_set_spec(scalar.get(), kSpecs[s]), ELY_OK);
            ASSERT_EQ(ely_block_set_spec(at_j.get(), "current_density"), ELY_OK);
            // A failed solve takes a block back to its last good solve, spec included (DEVELOPERS.md,
            // Rollback), while the batch's points all keep the spec set at the start of the batch: both
            // blocks solve once at their spec first, so that a failed point takes the scalar block back to
            // this spec too (and both start the spec solve's warm start from the same point).
            if (s >= 1) {
                for (const Block* b : {&batch, &scalar}) {
                    b->set(kDrive[s], ref.value(kMeets[s]));
                    ASSERT_GE(ely_block_solve(b->get()), 0) << tech << " at " << kSpecs[s] << ": " << ely_last_error();
                }
            }
            const Points p = random_points(ref, s, rng, 120);
            // The spec solves: the vector kernel's Newton (PEM) and the scalar path's Brent agree within the
            // latter's tolerance; outputs compared at the batch's current density.
            compare(batch, scalar, kDrive[s], p, std::string(tech) + " at " + kSpecs[s], s >= 2 ? kMeets[s] : nullptr,
                    &at_j);
        }
    }
}

// The vectorized kernel over the ranges a study sweeps (the shared numpy peer's: 0.05-3 A/cm2,
// 30-90 C, cathode 1-40 bar, anode 1-3 bar), with the parameters that select its branches changed:
// hydrogen recombined at the anode, oxygen partly recombined, drag water drained, ageing, alarms.
TEST(BatchEqualsScalar, PemKernelOverAStudysRanges) {
    const std::string config = capi_test::minimal_config("pem");
    for (int variant = 0; variant < 3; ++variant) {
        Block batch(config), scalar(config), at_j(config);
        const auto both = [&](const char* name, double v) {
            batch.set(name, v);
            scalar.set(name, v);
            at_j.set(name, v);
        };
        if (variant >= 1) {
            both("param.cell.h2_recombination_fraction_anode", 0.3);
            both("param.cell.o2_recombination_fraction", 0.6);
            both("param.cell.h2_darcy_coefficient", 1e-21);
            both("in.hours_operated", 20000.0);
            both("param.degradation.voltage_rate", 2e-6);
        }
        if (variant == 2) {
            both("param.thermal.gas_cooler_temperature", 370.0);  // above the stack: nothing condenses
            both("param.rectifier.loss_quadratic", 0.01);
            both("in.feed_temperature", 340.0);
        }
        for (int spec : {0, 2, 4}) {
            ASSERT_EQ(ely_block_set_spec(batch.get(), kSpecs[spec]), ELY_OK);
            ASSERT_EQ(ely_block_set_spec(scalar.get(), kSpecs[spec]), ELY_OK);
            std::mt19937_64 rng(7 + static_cast<unsigned>(variant));
            std::uniform_real_distribution<double> j(500.0, 3.0e4), t(303.15, 363.15), pc(1e5, 40e5), pa(1e5, 3e5);
            // Drive values: the stack power (100 cells x 0.1 m2) and cell voltage of about 0.05-3 A/cm2.
            std::uniform_real_distribution<double> power(8e3, 6e5), voltage(1.5, 2.3);
            Points p;
            for (int k = 0; k < (spec == 0 ? 3000 : 1000); ++k)
                p.add(spec == 0 ? j(rng) : spec == 2 ? power(rng) : voltage(rng), t(rng), pc(rng), pa(rng));
            p.add(spec == 0 ? 6.0e4 : spec == 2 ? 5e7 : 9.0, 353.15, 30e5, 1e5);  // beyond the limits: fails
            p.add(spec == 0 ? 1e-3 : spec == 2 ? 1e-2 : 1.3, 353.15, 30e5, 1e5);  // standby
            p.add(0.0, 353.15, 30e5, 1e5);                                        // open circuit
            // The spec solves: the scalar path's Brent stops at 1e-13 j_max in the current density (up to 1e-10
            // relative at the low end of the range), where the batch's Newton converges to a few ulp.
            compare(batch, scalar, kDrive[spec], p, "pem variant " + std::to_string(variant) + " at " + kSpecs[spec],
                    spec == 0 ? nullptr : spec == 2 ? "stack.power" : "cell.voltage", &at_j);
        }
    }
}

// The kernel keeps the terms of the stack temperature alone from one vector of points to the next when
// every point of the vector has the previous one's temperature: points in runs at one temperature (runs
// of 37, across the vectors' boundaries), with failing points among them, against the scalar path.
TEST(BatchEqualsScalar, PemKernelRunsAtOneTemperature) {
    const std::string config = capi_test::minimal_config("pem");
    for (int spec : {0, 2}) {
        Block batch(config), scalar(config), at_j(config);
        ASSERT_EQ(ely_block_set_spec(batch.get(), kSpecs[spec]), ELY_OK);
        ASSERT_EQ(ely_block_set_spec(scalar.get(), kSpecs[spec]), ELY_OK);
        std::mt19937_64 rng(31);
        std::uniform_real_distribution<double> j(500.0, 3.0e4), t(303.15, 363.15), pc(1e5, 40e5), pa(1e5, 3e5),
            power(8e3, 6e5);
        Points p;
        double temperature = t(rng);
        for (int k = 0; k < 1200; ++k) {
            if (k % 37 == 0) temperature = t(rng);
            p.add(spec == 0 ? j(rng) : power(rng), k % 101 == 50 ? 900.0 : temperature, pc(rng), pa(rng));
        }
        compare(batch, scalar, kDrive[spec], p, std::string("pem runs at one temperature at ") + kSpecs[spec],
                spec == 0 ? nullptr : "stack.power", &at_j);
    }
}

// ely_block_solve_batch_threads: the same statuses and outputs as the single-thread call, bit for bit,
// for every thread count; progress on
// the calling thread, cancelling, a bad thread count.
namespace {
struct BatchRun {
    std::vector<double> out;
    std::vector<int32_t> status;
    int32_t rc;
};
BatchRun run_threads(const Block& b, const Points& p, const int32_t* ii, const std::vector<int32_t>& oi, int32_t threads,
                ely_progress_fn progress = nullptr, void* user = nullptr) {
    BatchRun r{std::vector<double>(p.n * oi.size()), std::vector<int32_t>(p.n), 0};
    r.rc = threads < 0 ? ely_block_solve_batch(b.get(), p.n, 4, ii, p.in.data(), static_cast<int32_t>(oi.size()), oi.data(),
                                               r.out.data(), r.status.data(), progress, user)
                       : ely_block_solve_batch_threads(b.get(), p.n, 4, ii, p.in.data(), static_cast<int32_t>(oi.size()),
                                                       oi.data(), r.out.data(), r.status.data(), threads, progress, user);
    return r;
}
}  // namespace

TEST(BatchThreads, ResultsDoNotDependOnTheThreadCount) {
    for (const char* spec : {"current_density", "power"}) {
        Block b(capi_test::minimal_config("pem"));
        ASSERT_EQ(ely_block_set_spec(b.get(), spec), ELY_OK);
        const bool power = std::string(spec) == "power";
        const int32_t ii[] = {b.index(power ? "in.power" : "in.current_density"), b.index("in.temperature"),
                              b.index("in.pressure_cathode"), b.index("in.pressure_anode")};
        const std::vector<int32_t> oi = output_indices(b);
        std::mt19937_64 rng(5);
        std::uniform_real_distribution<double> u(0.0, 1.0);
        Points p;
        for (int k = 0; k < 10000; ++k)
            p.add((power ? 6e5 : 3e4) * (0.02 + u(rng)), 303.15 + 60 * u(rng), 1e5 + 39e5 * u(rng), 1e5 + 2e5 * u(rng));
        p.in[4 * 4500 + 1] = 900.0;  // a failing point in the second piece
        const BatchRun one = run_threads(b, p, ii, oi, -1);
        const BatchRun t1 = run_threads(b, p, ii, oi, 1), t2 = run_threads(b, p, ii, oi, 2), t3 = run_threads(b, p, ii, oi, 3);
        EXPECT_EQ(one.rc, ELY_PARTIAL);
        EXPECT_EQ(t1.rc, one.rc);
        EXPECT_THAT(std::string(ely_last_error()), ::testing::HasSubstr("point 4500"));
        EXPECT_EQ(t1.status, one.status);
        for (const BatchRun* r : {&t2, &t3}) {
            EXPECT_EQ(r->rc, t1.rc);
            EXPECT_EQ(r->status, t1.status);
            for (size_t k = 0; k < t1.out.size(); ++k)  // bit for bit, NaN included
                ASSERT_TRUE(r->out[k] == t1.out[k] || (std::isnan(r->out[k]) && std::isnan(t1.out[k]))) << spec << " " << k;
        }
        // And the same as the single-thread call, bit for bit: a point's result does not depend on the
        // piece it falls in (alarms are worded from the kernel's flags, spec solves have no history).
        for (size_t k = 0; k < t1.out.size(); ++k)
            ASSERT_TRUE(one.out[k] == t1.out[k] || (std::isnan(one.out[k]) && std::isnan(t1.out[k]))) << spec << " " << k;
    }
}

TEST(BatchThreads, ProgressOnTheCallingThreadCancelAndArguments) {
    Block b(capi_test::minimal_config("pem"));
    const int32_t ii[] = {b.index("in.current_density"), b.index("in.temperature"), b.index("in.pressure_cathode"),
                          b.index("in.pressure_anode")};
    const std::vector<int32_t> oi = {b.index("cell.voltage")};
    Points p;
    for (int k = 0; k < 20000; ++k) p.add(1e4, 340.0, 30e5, 1e5);
    struct Log {
        std::thread::id caller = std::this_thread::get_id();
        bool other_thread = false;
        size_t calls = 0, last = 0;
        bool cancel = false;
    } log;
    const auto progress = [](size_t done, size_t, void* user) -> int {
        auto* l = static_cast<Log*>(user);
        l->other_thread |= std::this_thread::get_id() != l->caller;
        ++l->calls;
        l->last = done;
        return l->cancel ? 1 : 0;
    };
    const BatchRun r = run_threads(b, p, ii, oi, 2, progress, &log);
    EXPECT_GE(r.rc, 0);
    EXPECT_FALSE(log.other_thread);
    EXPECT_EQ(log.last, p.n);
    log = Log{};
    log.cancel = true;
    const BatchRun c = run_threads(b, p, ii, oi, 1, progress, &log);
    EXPECT_EQ(c.rc, ELY_ERR_CANCELLED);
    EXPECT_EQ(log.calls, 1u);  // after the first piece
    EXPECT_GE(c.status[0], 0);
    EXPECT_EQ(c.status[p.n - 1], ELY_ERR_CANCELLED);
    EXPECT_TRUE(std::isnan(c.out[p.n - 1]));
    int32_t st = 0;
    double v = 0;
    EXPECT_EQ(ely_block_solve_batch_threads(b.get(), 1, 4, ii, p.in.data(), 1, oi.data(), &v, &st, -1, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(std::string(ely_last_error()), ::testing::HasSubstr("threads is -1"));
    EXPECT_GE(ely_block_solve_batch_threads(b.get(), 1, 4, ii, p.in.data(), 1, oi.data(), &v, &st, 0, nullptr, nullptr), 0);
    EXPECT_EQ(ely_block_solve_batch_threads(nullptr, 1, 4, ii, p.in.data(), 1, oi.data(), &v, &st, 2, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
}

// ely_block_solve_batch_columns: the same statuses, outputs (bit for bit) and return as the row-major call,
// for the vectorized kernel (whole chunks straight into the columns, a last part chunk, an output asked for
// twice, an input and a parameter as outputs) and for the scalar path (alkaline); bad arguments named.
TEST(BatchColumns, EqualTheRowMajorCallBitForBit) {
    for (const char* tech : {"pem", "alkaline"}) {
        for (const char* spec : {"current_density", "power"}) {
            Block b(capi_test::minimal_config(tech));
            ASSERT_EQ(ely_block_set_spec(b.get(), spec), ELY_OK);
            const bool power = std::string(spec) == "power";
            const int32_t ii[] = {b.index(power ? "in.power" : "in.current_density"), b.index("in.temperature"),
                                  b.index("in.pressure_cathode"), b.index("in.pressure_anode")};
            std::vector<int32_t> oi = output_indices(b);
            oi.push_back(b.index("cell.voltage"));  // twice
            oi.push_back(b.index("in.temperature"));
            oi.push_back(b.index("param.current_density_max"));
            const size_t no = oi.size();
            std::mt19937_64 rng(11);
            std::uniform_real_distribution<double> u(0.0, 1.0);
            Points p;
            for (int k = 0; k < 1500; ++k)  // 2 whole chunks of 512 and a part one
                p.add((power ? 4e5 : 2e4) * (0.02 + u(rng)), 313.15 + 40 * u(rng), 1e5 + 29e5 * u(rng), 1e5 + 2e5 * u(rng));
            p.in[4 * 700 + 1] = 900.0;  // fails
            p.in[4 * 1499] = 0.0;       // open circuit, in the part chunk
            std::vector<double> rows(p.n * no);
            std::vector<int32_t> st_rows(p.n), st_cols(p.n);
            const int32_t rc_rows = ely_block_solve_batch(b.get(), p.n, 4, ii, p.in.data(), static_cast<int32_t>(no),
                                                          oi.data(), rows.data(), st_rows.data(), nullptr, nullptr);
            const std::string msg_rows = ely_last_error();
            std::vector<std::vector<double>> in_cols(4, std::vector<double>(p.n)), out_cols(no, std::vector<double>(p.n));
            for (size_t k = 0; k < p.n; ++k)
                for (size_t i = 0; i < 4; ++i) in_cols[i][k] = p.in[4 * k + i];
            std::vector<const double*> in_ptr;
            std::vector<double*> out_ptr;
            for (auto& c : in_cols) in_ptr.push_back(c.data());
            for (auto& c : out_cols) out_ptr.push_back(c.data());
            const int32_t rc_cols = ely_block_solve_batch_columns(b.get(), p.n, 4, ii, in_ptr.data(), static_cast<int32_t>(no),
                                                                  oi.data(), out_ptr.data(), st_cols.data(), nullptr, nullptr);
            const std::string what = std::string(tech) + " at " + spec;
            EXPECT_EQ(rc_cols, rc_rows) << what;
            EXPECT_EQ(ely_last_error(), msg_rows) << what;
            EXPECT_EQ(rc_rows, ELY_PARTIAL) << what;
            EXPECT_EQ(st_cols, st_rows) << what;
            for (size_t k = 0; k < p.n; ++k)
                for (size_t o = 0; o < no; ++o) {
                    const double a = out_cols[o][k], c = rows[k * no + o];
                    ASSERT_TRUE(a == c || (std::isnan(a) && std::isnan(c))) << what << " point " << k << " output " << o;
                }
        }
    }
    Block b(capi_test::minimal_config("pem"));
    const int32_t ii[] = {b.index("in.current_density")};
    const int32_t oi[] = {b.index("cell.voltage")};
    double j = 1e4, v = 0;
    const double* in_ptr[] = {&j};
    double* out_ptr[] = {&v};
    int32_t st = 0;
    EXPECT_GE(ely_block_solve_batch_columns(b.get(), 1, 1, ii, in_ptr, 1, oi, out_ptr, &st, nullptr, nullptr), 0);
    EXPECT_GT(v, 1.0);
    const double* null_in[] = {nullptr};
    EXPECT_EQ(ely_block_solve_batch_columns(b.get(), 1, 1, ii, null_in, 1, oi, out_ptr, &st, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(std::string(ely_last_error()), ::testing::HasSubstr("input_columns[0] is NULL"));
    EXPECT_EQ(ely_block_solve_batch_columns(b.get(), 1, 1, ii, in_ptr, 1, oi, nullptr, &st, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(std::string(ely_last_error()), ::testing::HasSubstr("output_columns is NULL"));
    EXPECT_EQ(ely_block_solve_batch_columns(b.get(), 0, 1, ii, nullptr, 1, oi, nullptr, nullptr, nullptr, nullptr), ELY_OK);
    EXPECT_EQ(ely_block_solve_batch_columns(b.get(), 1, 1, oi, in_ptr, 1, oi, out_ptr, &st, nullptr, nullptr),
              ELY_ERR_INVALID_ARGUMENT);  // an output as an input
}
