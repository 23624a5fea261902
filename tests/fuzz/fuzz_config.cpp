// libFuzzer target: any bytes as a plant description, then a solve, a report and a few sets
// through the C interface. Nothing may crash, leak or throw; every failure is a status.
// Build and run: scripts/fuzz [seconds]
#include <elyblock/elyblock.h>

#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <string>
#include <vector>

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
    const std::string text(reinterpret_cast<const char*>(data), size);
    ely_block* b = nullptr;
    if (ely_block_create(text.c_str(), &b) != ELY_OK) {
        if (b != nullptr || ely_last_error()[0] == '\0') __builtin_trap();  // an error must say why
        return 0;
    }
    ely_block_solve(b);
    size_t n = 0;
    if (ely_block_report_json(b, nullptr, 0, &n) == ELY_OK) {
        std::vector<char> buf(n);
        ely_block_report_json(b, buf.data(), buf.size(), &n);
    }
    int32_t count = 0;
    ely_block_variable_count(b, &count);
    // Use the tail of the input as values for the inputs.
    for (int32_t i = 0; i < count && size >= 8; ++i) {
        double v;
        std::memcpy(&v, data + size - 8, 8);
        ely_block_set(b, i, v);
        ely_block_set(b, i, std::fabs(v) * (i + 1));
    }
    ely_block_solve(b);
    ely_block_destroy(b);
    return 0;
}
