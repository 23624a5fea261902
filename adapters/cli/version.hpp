#pragma once
#include <elyblock/elyblock.h>
#include <fmt/format.h>

#include <string>

namespace elycli {

/// "elyblock 0.1.0 (ABI 1)": the library's version and binary interface.
inline std::string version_text() { return fmt::format("elyblock {} (ABI {})", ely_version(), ely_abi_version()); }

}  // namespace elycli
