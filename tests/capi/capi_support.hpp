#pragma once
// Shared by the C-interface test files: a block handle that is destroyed with its scope, the
// bundled configurations by technology, and file reading for the examples.
#include <elyblock/elyblock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace capi_test {

inline std::string read_text(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    std::ostringstream s;
    s << in.rdbuf();
    if (!in) ADD_FAILURE() << "cannot read " << path;
    return s.str();
}

/// The minimal configuration of a technology, from examples/minimal/<technology>.json.
inline std::string minimal_config(const std::string& technology) {
    return read_text(std::string(ELY_SOURCE_DIR) + "/examples/minimal/" + technology + ".json");
}

inline const std::vector<std::string>& technologies() {
    static const std::vector<std::string> all = {"pem", "alkaline", "solid_oxide", "brine", "custom"};
    return all;
}

/// A block created from JSON text, destroyed at the end of its scope.
class Block {
public:
    explicit Block(const std::string& json) {
        const int32_t s = ely_block_create(json.c_str(), &b_);
        if (s != ELY_OK) ADD_FAILURE() << "create failed (" << s << "): " << ely_last_error();
    }
    Block(const Block&) = delete;
    Block& operator=(const Block&) = delete;
    ~Block() { ely_block_destroy(b_); }
    ely_block* get() const { return b_; }
    int32_t index(const char* name) const {
        int32_t i = -1;
        EXPECT_EQ(ely_block_find(b_, name, &i), ELY_OK) << name << ": " << ely_last_error();
        return i;
    }
    double value(const char* name) const {
        double v = std::nan("");
        EXPECT_EQ(ely_block_get(b_, index(name), &v), ELY_OK) << name << ": " << ely_last_error();
        return v;
    }
    void set(const char* name, double v) const {
        EXPECT_EQ(ely_block_set(b_, index(name), v), ELY_OK) << name << " = " << v << ": " << ely_last_error();
    }

private:
    ely_block* b_ = nullptr;
};

}  // namespace capi_test
