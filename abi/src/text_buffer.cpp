// The buffer protocol of the text results (reports, JSON): one implementation for every call.
#include <cstring>
#include <string>

#include "base/error.hpp"
#include "block_handle.hpp"

namespace ely::capi {

void copy_text(const std::string& text, char* buffer, std::size_t capacity, std::size_t* length) {
    const std::size_t needed = text.size() + 1;
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
    std::memcpy(buffer, text.c_str(), needed);
    *length = needed;
}

}  // namespace ely::capi
