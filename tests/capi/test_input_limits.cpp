// Limits on what a host can hand the library: plant description files (regular files of at most
// 4 MiB, refused at once otherwise), JSON documents (size, members, elements, strings, keys),
// pressures of the water functions, and the length and bytes of error messages.
#include <gmock/gmock.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <string>

#include "capi_support.hpp"

using ::testing::HasSubstr;
using ::testing::Not;

namespace {

const std::string kPemBody = R"("technology":"pem","stack":{"cells":100,"active_area":0.1},"operating":{"spec":"current_density"})";
const std::string kPem = "{" + kPemBody + "}";

struct Outcome {
    int32_t status;
    std::string message;
    bool created;
};

// Runs one create call and destroys what it made.
template <class Create>
Outcome run_create(Create&& call) {
    ely_block* b = nullptr;
    const int32_t s = call(&b);
    Outcome o{s, ely_last_error(), b != nullptr};
    ely_block_destroy(b);
    return o;
}

Outcome create(const std::string& json) {
    return run_create([&](ely_block** b) { return ely_block_create(json.c_str(), b); });
}

Outcome create_from_file(const std::string& path) {
    return run_create([&](ely_block** b) { return ely_block_create_from_file(path.c_str(), b); });
}

// A scratch directory removed with its contents at the end of the test.
struct Scratch {
    std::filesystem::path dir;
    Scratch() {
        std::string pattern = (std::filesystem::temp_directory_path() / "elyblock-limits-XXXXXX").string();
        if (mkdtemp(pattern.data()) == nullptr) ADD_FAILURE() << "mkdtemp: " << std::strerror(errno);
        dir = pattern;
    }
    ~Scratch() {
        std::error_code ec;
        std::filesystem::remove_all(dir, ec);
    }
    std::string file(const char* name) const { return (dir / name).string(); }
};

void write_file(const std::string& path, const std::string& text) {
    std::ofstream out(path, std::ios::binary);
    out << text;
    ASSERT_TRUE(out.good()) << path;
}

}  // namespace

// ---- files ---------------------------------------------------------------------------------

TEST(FileLimits, ARegularFileIsRead) {
    Scratch s;
    write_file(s.file("plant.json"), kPem);
    const auto o = create_from_file(s.file("plant.json"));
    EXPECT_EQ(o.status, ELY_OK) << o.message;
    EXPECT_TRUE(o.created);
}

TEST(FileLimits, DevZeroFailsAtOnceWithIo) {
    const auto o = create_from_file("/dev/zero");  // read whole, it would never end
    EXPECT_EQ(o.status, ELY_ERR_IO);
    EXPECT_THAT(o.message, HasSubstr("/dev/zero"));
    EXPECT_THAT(o.message, HasSubstr("not a regular file"));
    EXPECT_FALSE(o.created);
}

TEST(FileLimits, AFifoFailsAtOnceWithIo) {
    Scratch s;
    const std::string fifo = s.file("plant.fifo");
    ASSERT_EQ(mkfifo(fifo.c_str(), 0600), 0) << std::strerror(errno);
    const auto o = create_from_file(fifo);  // opened for reading without a writer, it would block forever
    EXPECT_EQ(o.status, ELY_ERR_IO);
    EXPECT_THAT(o.message, HasSubstr("FIFO"));
}

TEST(FileLimits, ADirectoryFailsWithIo) {
    Scratch s;
    const auto o = create_from_file(s.dir.string());
    EXPECT_EQ(o.status, ELY_ERR_IO);
    EXPECT_THAT(o.message, HasSubstr("directory"));
}

TEST(FileLimits, AHugeSparseFileFailsWithoutBeingRead) {
    Scratch s;
    const std::string path = s.file("huge.json");
    write_file(path, "");
    ASSERT_EQ(truncate(path.c_str(), 1LL << 30), 0) << std::strerror(errno);  // 1 GiB of holes: no disk used
    const auto o = create_from_file(path);
    EXPECT_EQ(o.status, ELY_ERR_IO);
    EXPECT_THAT(o.message, HasSubstr("1073741824 bytes, more than the limit of 4194304 bytes"));
}

TEST(FileLimits, TheSizeLimitIsExactly4MiB) {
    Scratch s;
    const std::size_t limit = 4u << 20;
    std::string text = kPem;
    text.resize(limit, ' ');  // trailing white space is valid JSON
    write_file(s.file("at.json"), text);
    const auto at = create_from_file(s.file("at.json"));
    EXPECT_EQ(at.status, ELY_OK) << at.message;
    text.push_back(' ');
    write_file(s.file("over.json"), text);
    const auto over = create_from_file(s.file("over.json"));
    EXPECT_EQ(over.status, ELY_ERR_IO);
    EXPECT_THAT(over.message, HasSubstr("4194305 bytes"));
    // The same limit for text handed over directly.
    const auto direct = create(text);
    EXPECT_EQ(direct.status, ELY_ERR_CONFIG);
    EXPECT_THAT(direct.message, HasSubstr("more than the limit of 4194304 bytes"));
}

TEST(FileLimits, AMissingFileNamesItself) {
    const auto o = create_from_file("/nonexistent/plant.json");
    EXPECT_EQ(o.status, ELY_ERR_IO);
    EXPECT_THAT(o.message, HasSubstr("'/nonexistent/plant.json'"));
    EXPECT_THAT(o.message, HasSubstr(std::strerror(ENOENT)));
}

// ---- JSON documents -------------------------------------------------------------------------

TEST(JsonLimits, ManyKeysStopAtTheMemberLimit) {
    std::string json = "{" + kPemBody;
    for (int i = 0; i < 200000; ++i) json += ",\"k" + std::to_string(i) + "\":0";
    json += "}";
    const auto o = create(json);  // with a quadratic duplicate check this took about 25 s
    EXPECT_EQ(o.status, ELY_ERR_CONFIG);
    EXPECT_THAT(o.message, HasSubstr("$: object with more than the limit of 256 members"));
}

TEST(JsonLimits, ADuplicateAmongManyKeysIsFound) {
    for (int members : {2, 100, 250}) {
        std::string json = "{" + kPemBody;
        for (int i = 0; i < members; ++i) json += ",\"k" + std::to_string(i) + "\":0";
        json += ",\"k0\":1}";
        const auto o = create(json);
        EXPECT_EQ(o.status, ELY_ERR_CONFIG) << members;
        EXPECT_THAT(o.message, HasSubstr("duplicate key 'k0'")) << members;
    }
}

TEST(JsonLimits, LongArraysStringsAndKeysNameTheirLimit) {
    std::string array = "[0";
    for (int i = 0; i < 5000; ++i) array += ",0";
    array += "]";
    auto o = create("{" + kPemBody + ",\"reactions\":{\"anode\":" + array + "}}");
    EXPECT_EQ(o.status, ELY_ERR_CONFIG);
    EXPECT_THAT(o.message, HasSubstr("$.reactions.anode[1024]: array with more than the limit of 1024 elements"));

    o = create("{" + kPemBody + ",\"name\":\"" + std::string(5000, 'n') + "\"}");
    EXPECT_EQ(o.status, ELY_ERR_CONFIG);
    EXPECT_THAT(o.message, HasSubstr("$.name: string longer than the limit of 4096 bytes"));

    o = create("{" + kPemBody + ",\"" + std::string(300, 'k') + "\":1}");
    EXPECT_EQ(o.status, ELY_ERR_CONFIG);
    EXPECT_THAT(o.message, HasSubstr("key longer than the limit of 128 bytes"));

    std::string deep = std::string(40, '[') + std::string(40, ']');
    o = create("{" + kPemBody + ",\"x\":" + deep + "}");
    EXPECT_EQ(o.status, ELY_ERR_CONFIG);
    EXPECT_THAT(o.message, HasSubstr("nested deeper than the limit of 32 levels"));
}

// ---- messages ---------------------------------------------------------------------------------

TEST(Messages, AnEmbeddedNulDoesNotCutTheMessage) {
    auto o = create("{" + kPemBody + R"(,"col\u0000our":1})");
    EXPECT_EQ(o.status, ELY_ERR_CONFIG);
    EXPECT_THAT(o.message, HasSubstr("unknown key 'col\\x00our'; known keys:"));
    o = create(R"({"technology":"pe\u0000m","stack":{"cells":100,"active_area":0.1},"operating":{"spec":"current_density"}})");
    EXPECT_EQ(o.status, ELY_ERR_CONFIG);
    EXPECT_THAT(o.message, HasSubstr("'pe\\x00m' is not a technology; known:"));
    o = create("{" + kPemBody + R"(,"name":5,"plant":{"thermal":{"feed_temperature":"1\u0000 K"}}})");
    EXPECT_EQ(o.status, ELY_ERR_CONFIG);
    EXPECT_THAT(o.message, Not(HasSubstr(std::string(1, '\0'))));
}

TEST(Messages, QuotedUserTextIsCut) {
    const std::string long_text(3000, 'z');
    auto o = create(R"({"technology":")" + long_text + R"(","stack":{"cells":100,"active_area":0.1},"operating":{"spec":"current_density"}})");
    EXPECT_EQ(o.status, ELY_ERR_CONFIG);
    EXPECT_THAT(o.message, HasSubstr("(3000 bytes)' is not a technology"));
    EXPECT_LT(o.message.size(), 300u);
    o = create("{" + kPemBody + ",\"" + std::string(100, 'k') + "\":1}");
    EXPECT_THAT(o.message, HasSubstr("(100 bytes)'; known keys"));
    EXPECT_LT(o.message.size(), 300u);
    o = create("{" + kPemBody + ",\"plant\":{\"thermal\":{\"feed_temperature\":\"" + long_text + "\"}}}");
    EXPECT_EQ(o.status, ELY_ERR_CONFIG);
    EXPECT_LT(o.message.size(), 400u) << o.message;

    capi_test::Block b(kPem);
    const std::string huge(100000, 'q');
    EXPECT_EQ(ely_block_set_spec(b.get(), huge.c_str()), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_THAT(ely_last_error(), HasSubstr("(100000 bytes)"));
    EXPECT_LT(std::strlen(ely_last_error()), 300u);
    int32_t i = 0;
    EXPECT_EQ(ely_block_find(b.get(), huge.c_str(), &i), ELY_ERR_UNKNOWN_NAME);
    EXPECT_THAT(ely_last_error(), HasSubstr("(100000 bytes)"));
    EXPECT_LT(std::strlen(ely_last_error()), 300u);
}

// ---- water functions ------------------------------------------------------------------------

TEST(WaterLimits, PressuresBeyondTheCorrelationAreOutOfRange) {
    double e_rev = -1, e_tn = -1;
    EXPECT_EQ(ely_water_electrolysis_voltages(353.15, 1e300, 1e300, &e_rev, &e_tn), ELY_ERR_OUT_OF_RANGE);
    EXPECT_THAT(ely_last_error(), HasSubstr("anode pressure 1e+300 Pa is above 1e8 Pa"));
    EXPECT_EQ(ely_water_electrolysis_voltages(353.15, 1e5, 2e8, &e_rev, &e_tn), ELY_ERR_OUT_OF_RANGE);
    EXPECT_THAT(ely_last_error(), HasSubstr("cathode pressure"));
    EXPECT_EQ(e_rev, -1.0);  // nothing written
    EXPECT_EQ(e_tn, -1.0);
    // At the limit the result is finite and, by the Nernst equation with ideal gases, rises by
    // 3/4 · RT/F · ln(p2/p1) when both pressures rise from p1 to p2 (H2 and O2^1/2 together;
    // vapour pressure 47.4 kPa at 353.15 K, IAPWS R7-97 table 35 gives 47.414 kPa).
    double lo = 0, hi = 0;
    ASSERT_EQ(ely_water_electrolysis_voltages(353.15, 1e7, 1e7, &lo, nullptr), ELY_OK) << ely_last_error();
    ASSERT_EQ(ely_water_electrolysis_voltages(353.15, 1e8, 1e8, &hi, nullptr), ELY_OK) << ely_last_error();
    ASSERT_TRUE(std::isfinite(hi));
    const double rt_f = 8.314462618 * 353.15 / 96485.33212;  // CODATA 2018 R and F
    const double p_v = 47414.0;
    EXPECT_NEAR(hi - lo, 0.75 * rt_f * std::log((1e8 - p_v) / (1e7 - p_v)), 1e-5);
}
