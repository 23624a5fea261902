// libFuzzer target: a plant description and a program of C-interface calls. Nothing may crash,
// hang, leak or throw; every failure is a status with a message, and the results of a call that
// succeeded hold the header's promises (finite voltages, batch statuses, cancel not OK).
//
// Input: <config text> [NUL <program>]. An empty config part means one of the bundled minimal
// configs, chosen by the program's first byte, so the fuzzer reaches the call sequences without
// having to write a valid plant. The program is a byte code (see run_program); missing argument
// bytes read as 0. Everything runs on a worker thread with a 512 KiB stack, as in a host's
// thread pool, so that unbounded recursion shows at the depths that break real hosts.
// fuzz_mutator.cpp adds structure-aware mutations; fuzz_regressions.cpp replays the corpora.
// Build and run: scripts/fuzz [seconds]
#include <elyblock/elyblock.h>
#include <pthread.h>

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstring>
#include <limits>
#include <string>
#include <vector>

#include "fuzz_program.hpp"

namespace {

const char* const kMinimalConfigs[] = {
    R"({"technology":"pem","stack":{"cells":100,"active_area":0.1},"operating":{"spec":"current_density"}})",
    R"({"technology":"alkaline","stack":{"cells":100,"active_area":0.1},"operating":{"spec":"current_density"}})",
    R"({"technology":"solid_oxide","stack":{"cells":100,"active_area":0.1},"operating":{"spec":"current_density"}})",
    R"({"technology":"brine","stack":{"cells":100,"active_area":0.1},"operating":{"spec":"current_density"}})",
    R"({"technology":"custom","stack":{"cells":10,"active_area":0.1},"operating":{"spec":"current_density"},)"
    R"("reactions":{"anode":[{"name":"o","product":"O2","electrons":4,"standard_potential":"1.229 V",)"
    R"("activation_energy":"50 kJ/mol"}],)"
    R"("cathode":[{"name":"h","product":"H2","electrons":2,"standard_potential":"0 V",)"
    R"("activation_energy":"30 kJ/mol"}]}})",  // any values: a seed for the fuzzer, not a cell
};

const double kSpecialValues[] = {0.0, -0.0, 1.0, -1.0, 1e300, -1e300, 5e-324, 1e-320,
                                 std::numeric_limits<double>::quiet_NaN(), std::numeric_limits<double>::infinity(),
                                 -std::numeric_limits<double>::infinity(), 300.0, 353.15, 1e5, 3e6, 1e8, 2e8,
                                 1e4, 2e4, 1e6, 0.5, 1.23, 2.0};

const char* const kSpecs[] = {"current_density", "current", "power", "hydrogen_rate", "voltage", "", "torque", nullptr};

const char* const kNames[] = {"in.current_density", "in.temperature", "in.power", "cell.voltage", "product.hydrogen",
                              "in.pressure_anode", "", "no.such", nullptr};

const char* const kPaths[] = {"/dev/zero", "/", "/nonexistent/plant.json", "", nullptr};

[[noreturn]] void broken(const char* what) {
    std::fprintf(stderr, "fuzz invariant broken: %s (last error: %s)\n", what, ely_last_error());
    __builtin_trap();
}

// After an error the message must say why.
void check_status(int32_t status) {
    if (status < 0 && ely_last_error()[0] == '\0') broken("an error without a message");
}

class Reader {
public:
    Reader(const uint8_t* data, size_t size) : data_(data), size_(size) {}
    bool more() const { return pos_ < size_; }
    uint8_t byte() { return pos_ < size_ ? data_[pos_++] : 0; }
    int32_t int32() {
        uint32_t v = 0;
        for (int i = 0; i < 4; ++i) v = v << 8 | byte();
        return static_cast<int32_t>(v);
    }
    double value() {
        const uint8_t b = byte();
        if (b < 200) return kSpecialValues[b % std::size(kSpecialValues)];
        uint64_t bits = 0;
        for (int i = 0; i < 8; ++i) bits = bits << 8 | byte();
        double v;
        std::memcpy(&v, &bits, sizeof v);
        return v;
    }
    template <class T, size_t N>
    T pick(T (&table)[N]) {
        return table[byte() % N];
    }

private:
    const uint8_t* data_;
    size_t size_;
    size_t pos_ = 0;
};

struct Cancel {
    size_t at;  // the call of the callback that asks to stop (0: never)
    size_t calls = 0;
    bool asked = false;
};

int32_t progress(size_t, size_t, void* user) {
    auto* c = static_cast<Cancel*>(user);
    ++c->calls;
    if (c->at != 0 && c->calls >= c->at) c->asked = true;
    return c->asked ? 1 : 0;
}

// A batch with counts and NULLs chosen independently, and its invariants.
void batch(const ely_block* b, int32_t count, Reader& r) {
    const uint8_t shape = r.byte();
    static const size_t kPoints[] = {0, 1, 2, 3, 1025, std::numeric_limits<size_t>::max()};
    const size_t n_points = kPoints[shape % std::size(kPoints)];
    const int32_t n_in = static_cast<int32_t>(r.byte() % 5) - 1;   // -1 .. 3
    const int32_t n_out = static_cast<int32_t>(r.byte() % 5) - 1;  // -1 .. 3
    const uint8_t nulls = r.byte();                                  // one bit per pointer
    std::vector<int32_t> in_idx(4), out_idx(4);
    for (auto& i : in_idx) i = r.byte() % 2 ? r.int32() : static_cast<int32_t>(r.byte()) % (count + 1);
    for (auto& o : out_idx) o = static_cast<int32_t>(r.byte()) % (count + 1);
    const size_t rows = n_points > 1025 ? 1 : n_points;  // the huge count must be refused before any access
    std::vector<double> in(rows * 3 + 1), out(rows * 3 + 1, -7.0);
    for (auto& v : in) v = r.value();
    std::vector<int32_t> st(rows + 1, 99);
    Cancel cancel{static_cast<size_t>(r.byte() % 4)};
    const bool with_progress = r.byte() % 2;
    const int32_t s = ely_block_solve_batch(b, n_points, n_in, nulls & 1 ? nullptr : in_idx.data(),
                                            nulls & 2 ? nullptr : in.data(), n_out,
                                            nulls & 4 ? nullptr : out_idx.data(), nulls & 8 ? nullptr : out.data(),
                                            nulls & 16 ? nullptr : st.data(), with_progress ? progress : nullptr,
                                            &cancel);
    check_status(s);
    if (n_points > 1025 && s != ELY_ERR_INVALID_ARGUMENT) broken("a batch larger than memory was not refused");
    if (cancel.asked && s == ELY_OK) broken("a batch asked to cancel returned OK");
    if (s == ELY_ERR_INVALID_ARGUMENT && st[0] != 99) broken("a refused batch wrote a status");
    if (s == ELY_OK || s == ELY_WARNING || s == ELY_PARTIAL) {
        for (size_t k = 0; k < rows; ++k)
            if (st[k] == 99) broken("a batch left a point without a status");
    }
}

void report(const ely_block* b, Reader& r) {
    size_t n = 0;
    switch (r.byte() % 4) {
        case 0: check_status(ely_block_report_json(b, nullptr, 0, &n)); break;
        case 1: check_status(ely_block_report_json(b, nullptr, 5, &n)); break;
        case 2: check_status(ely_block_report_json(b, nullptr, 0, nullptr)); break;
        default: {
            if (ely_block_report_json(b, nullptr, 0, &n) != ELY_OK) break;
            std::vector<char> buf(n - (r.byte() % 2));  // sometimes one byte short
            const int32_t s = ely_block_report_json(b, buf.data(), buf.size(), &n);
            check_status(s);
            if (s == ELY_OK && (buf.empty() || buf.back() != '\0')) broken("report not NUL-terminated");
        }
    }
}

void water(Reader& r) {
    const double t = r.value(), pa = r.value(), pc = r.value();
    double e_rev = -7, e_tn = -7;
    const uint8_t mask = r.byte() % 4;
    const int32_t s = ely_water_electrolysis_voltages(t, pa, pc, mask & 1 ? nullptr : &e_rev, mask & 2 ? nullptr : &e_tn);
    check_status(s);
    if (s == ELY_OK && ((!(mask & 1) && !std::isfinite(e_rev)) || (!(mask & 2) && !std::isfinite(e_tn))))
        broken("water voltages OK but not finite");
    double p = -7;
    const int32_t sp = ely_water_saturation_pressure(t, &p);
    check_status(sp);
    if (sp == ELY_OK && !(std::isfinite(p) && p > 0)) broken("saturation pressure OK but not finite and positive");
}

// Runs the byte code on `b` (which it may replace: clone, destroy, recreate).
void run_program(ely_block*& b, Reader& r) {
    for (int step = 0; step < 64 && r.more(); ++step) {
        int32_t count = 0;
        ely_block_variable_count(b, &count);
        switch (r.byte() % 12) {
            case 0: {
                const int32_t i = r.byte() % 8 == 0 ? r.int32() : static_cast<int32_t>(r.byte()) % (count + 1);
                check_status(ely_block_set(b, i, r.value()));
                break;
            }
            case 1: check_status(ely_block_solve(b)); break;
            case 2: {
                double v = 0;
                const int32_t i = static_cast<int32_t>(r.byte()) % (count + 1);
                check_status(ely_block_get(b, i, r.byte() % 8 == 0 ? nullptr : &v));
                break;
            }
            case 3: check_status(ely_block_set_spec(b, r.pick(kSpecs))); break;
            case 4: batch(b, count, r); break;
            case 5: report(b, r); break;
            case 6: {  // the clone outlives its original
                ely_block* c = nullptr;
                const int32_t s = ely_block_clone(b, &c);
                check_status(s);
                if (s == ELY_OK) {
                    ely_block_destroy(b);
                    b = c;
                }
                break;
            }
            case 7: {
                ely_variable_info info{};
                info.struct_size = r.byte() % 2 ? sizeof info : r.byte();
                check_status(ely_block_variable_info(b, static_cast<int32_t>(r.byte()) % (count + 1) - 1, &info));
                break;
            }
            case 8: {
                int32_t i = 0;
                check_status(ely_block_find(b, r.pick(kNames), r.byte() % 8 == 0 ? nullptr : &i));
                break;
            }
            case 9: water(r); break;
            case 10: {
                ely_block* f = reinterpret_cast<ely_block*>(1);
                check_status(ely_block_create_from_file(r.pick(kPaths), &f));
                if (f != nullptr) broken("a failed create left a handle");
                break;
            }
            default: {  // destroy and start again from a bundled config
                ely_block_destroy(b);
                b = nullptr;
                if (ely_block_create(r.pick(kMinimalConfigs), &b) != ELY_OK) broken("a bundled config failed");
                break;
            }
        }
    }
}

struct Job {
    const uint8_t* data;
    size_t size;
};

void* run(void* p) {
    const auto* job = static_cast<const Job*>(p);
    const auto* nul = static_cast<const uint8_t*>(std::memchr(job->data, 0, job->size));
    const size_t config_size = nul ? static_cast<size_t>(nul - job->data) : job->size;
    Reader program(nul ? nul + 1 : job->data + job->size, nul ? job->size - config_size - 1 : 0);
    const std::string text(reinterpret_cast<const char*>(job->data), config_size);
    ely_block* b = nullptr;
    const char* config = config_size == 0 ? program.pick(kMinimalConfigs) : text.c_str();
    const int32_t s = ely_block_create(config, &b);
    if (s != ELY_OK) {
        if (b != nullptr || ely_last_error()[0] == '\0') broken("a failed create must say why and give no handle");
        if (config_size == 0) broken("a bundled config failed");
        return nullptr;
    }
    if (!program.more()) {  // no program: the default sequence
        static const uint8_t kDefault[] = {1, 5, 3, 0, 0, 1, 1, 4, 1, 2, 2, 7, 0, 1, 9};
        Reader fallback(kDefault, sizeof kDefault);
        run_program(b, fallback);
    } else {
        run_program(b, program);
    }
    ely_block_destroy(b);
    return nullptr;
}

}  // namespace

int fuzz_one_input(const uint8_t* data, size_t size) {
    Job job{data, size};
    pthread_attr_t attr;
    pthread_attr_init(&attr);
    pthread_attr_setstacksize(&attr, kFuzzStackBytes);
    pthread_t thread;
    if (pthread_create(&thread, &attr, run, &job) != 0) {
        pthread_attr_destroy(&attr);
        run(&job);  // no thread to be had: run here
        return 0;
    }
    pthread_attr_destroy(&attr);
    pthread_join(thread, nullptr);
    return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) { return fuzz_one_input(data, size); }
