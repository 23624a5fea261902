// Hostile plant descriptions through the C interface: unit expressions nested or long enough to
// exhaust a stack, exponents that overflow, white space around units. Each must end in
// ELY_ERR_CONFIG naming the limit, on the main thread and on a worker thread with a small stack.
#include <gmock/gmock.h>
#include <pthread.h>

#include <string>

#include "capi_support.hpp"

using ::testing::HasSubstr;

namespace {

// A PEM config whose operating temperature is the given JSON string literal (already escaped).
std::string with_temperature(const std::string& json_string) {
    return R"({"technology":"pem","stack":{"cells":100,"active_area":0.1},)"
           R"("operating":{"spec":"current_density","temperature":")" +
           json_string + R"("}})";
}

std::string nested(int levels, const std::string& inner) {
    return std::string(static_cast<std::size_t>(levels), '(') + inner + std::string(static_cast<std::size_t>(levels), ')');
}

struct CreateResult {
    int32_t status = 99;
    std::string message;
    double temperature = 0;
};

CreateResult create(const std::string& json) {
    CreateResult r;
    ely_block* b = nullptr;
    r.status = ely_block_create(json.c_str(), &b);
    r.message = ely_last_error();
    if (b) {
        int32_t i = -1;
        if (ely_block_find(b, "in.temperature", &i) == ELY_OK) ely_block_get(b, i, &r.temperature);
    }
    ely_block_destroy(b);
    return r;
}

// Runs create() on a thread whose whole stack is `stack_bytes`, as a host's worker pool may give.
CreateResult create_on_small_stack(const std::string& json, std::size_t stack_bytes) {
    struct Job {
        const std::string* json;
        CreateResult result;
    } job{&json, {}};
    pthread_attr_t attr;
    pthread_attr_init(&attr);
    EXPECT_EQ(pthread_attr_setstacksize(&attr, stack_bytes), 0);
    pthread_t thread;
    const int rc = pthread_create(
        &thread, &attr,
        [](void* p) -> void* {
            auto* j = static_cast<Job*>(p);
            j->result = create(*j->json);
            return nullptr;
        },
        &job);
    pthread_attr_destroy(&attr);
    EXPECT_EQ(rc, 0);
    if (rc == 0) pthread_join(thread, nullptr);
    return job.result;
}

}  // namespace

TEST(HostileInput, DeeplyNestedUnitIsAConfigErrorNamingTheLimit) {
    const auto r = create(with_temperature("1 " + nested(10000, "K")));  // 20 kB of parentheses
    EXPECT_EQ(r.status, ELY_ERR_CONFIG);
    EXPECT_THAT(r.message, HasSubstr("$.operating.temperature: string longer than the limit of 4096 bytes"));
    const auto u = create(with_temperature("1 " + nested(2000, "K")));  // 4 kB: a JSON string, not a unit
    EXPECT_EQ(u.status, ELY_ERR_CONFIG);
    EXPECT_THAT(u.message, HasSubstr("$.operating.temperature"));
    EXPECT_THAT(u.message, HasSubstr("longer than the limit of 128 bytes"));
    // Within the length limit, the depth limit speaks.
    const auto d = create(with_temperature("1 " + nested(40, "K")));
    EXPECT_EQ(d.status, ELY_ERR_CONFIG);
    EXPECT_THAT(d.message, HasSubstr("deeper than the limit of 16 levels"));
    EXPECT_LT(d.message.size(), 400u);  // the quoted unit is cut, not repeated whole
}

TEST(HostileInput, NestingAtTheLimitStillConverts) {
    // degC stands only on its own: nested it is refused, but for the reason of degC, not depth.
    const auto r = create(with_temperature("80 " + nested(15, "degC")));
    EXPECT_EQ(r.status, ELY_ERR_CONFIG);
    EXPECT_THAT(r.message, HasSubstr("stands only on its own"));
    const auto k = create(with_temperature("353.15 " + nested(16, "K")));
    ASSERT_EQ(k.status, ELY_OK) << k.message;
    EXPECT_EQ(k.temperature, 353.15);
}

TEST(HostileInput, NestedUnitOnA512KiBWorkerThread) {
    const std::size_t stack = 512 * 1024;
    for (int levels : {16, 17, 60, 800}) {
        const auto r = create_on_small_stack(with_temperature("353.15 " + nested(levels, "K")), stack);
        if (levels <= 16) {
            EXPECT_EQ(r.status, ELY_OK) << r.message;
            EXPECT_EQ(r.temperature, 353.15);
        } else {
            EXPECT_EQ(r.status, ELY_ERR_CONFIG) << levels;
            EXPECT_THAT(r.message, HasSubstr("limit of")) << levels;
        }
    }
}

TEST(HostileInput, ExponentsBeyondTheirRangeAreErrorsNotOverflows) {
    // 99^5 does not fit an int: before the range check this was undefined behaviour.
    const auto r = create(with_temperature("1 ((((K99)99)99)99)99"));
    EXPECT_EQ(r.status, ELY_ERR_CONFIG);
    EXPECT_THAT(r.message, HasSubstr("raises K to the power 99, beyond the limit of -24 to 24"));
    const auto p = create(with_temperature("1 K (ppm99)99"));
    EXPECT_EQ(p.status, ELY_ERR_CONFIG);
    EXPECT_THAT(p.message, HasSubstr("beyond the limit of 1e-400 to 1e400"));
    const auto h = create(with_temperature("353.15 K (h/s)4 (s/h)4"));  // factors of 3600^4 cancel exactly
    EXPECT_EQ(h.status, ELY_OK) << h.message;
    EXPECT_EQ(h.temperature, 353.15);
    const auto big = create(with_temperature("1 K (h/s)90 (s/h)90"));  // 3600^90 overflows a double
    EXPECT_EQ(big.status, ELY_ERR_CONFIG);
    EXPECT_THAT(big.message, HasSubstr("too large for a double"));
    // Each exponent within range, their product not: m^24 · m^1.
    const auto m = create(with_temperature("1 K m24 m"));
    EXPECT_EQ(m.status, ELY_ERR_CONFIG);
    EXPECT_THAT(m.message, HasSubstr("raises m to the power 25"));
}

TEST(HostileInput, WhiteSpaceAroundAUnitIsTrimmed) {
    for (const char* text : {"353.15 K \\n", "\\t353.15 K\\r\\n", "353.15K\\n", "80 degC\\n"}) {
        const auto r = create(with_temperature(text));
        ASSERT_EQ(r.status, ELY_OK) << text << ": " << r.message;
        EXPECT_NEAR(r.temperature, 353.15, 1e-12) << text;
    }
}
