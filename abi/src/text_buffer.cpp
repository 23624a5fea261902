// The buffer protocol of the text results (reports, JSON) and of saved states: one implementation
// for every call.
#include <cstring>
#include <string>

#include "base/error.hpp"
#include "block_handle.hpp"

namespace ely::capi {

namespace {
void copy_out(const std::string& data, bool with_nul, void* buffer, std::size_t capacity, std::size_t* length) {
    const std::size_t needed = data.size() + (with_nul ? 1 : 0);
    if (buffer == nullptr || capacity == 0) {
        if (buffer == nullptr && capacity != 0) throw Error(ErrorKind::invalid_argument, "buffer is NULL but capacity is not 0");
        *length = needed;
        return;
    }
    if (capacity < needed) {
        *length = needed;
        throw Error(ErrorKind::buffer_too_small,
                    "buffer of " + std::to_string(capacity) + " bytes is too small; " + std::to_string(needed) + " needed");
    }
    std::memcpy(buffer, data.c_str(), needed);
    *length = needed;
}
}  // namespace

void copy_text(const std::string& text, char* buffer, std::size_t capacity, std::size_t* length) {
    copy_out(text, true, buffer, capacity, length);
}

void copy_bytes(const std::string& bytes, void* buffer, std::size_t capacity, std::size_t* length) {
    copy_out(bytes, false, buffer, capacity, length);
}

}  // namespace ely::capi
