#include "errors.hpp"

#include <elyblock/elyblock.h>
#include <fmt/format.h>

namespace elycli {

std::string last_error() { return ely_last_error(); }

int32_t check(int32_t status, std::string_view context) {
    if (status >= 0) return status;
    const std::string message = last_error();
    throw Failure{context.empty() ? message : fmt::format("{}: {}", context, message)};
}

}  // namespace elycli
