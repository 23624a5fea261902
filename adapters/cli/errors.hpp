#pragma once
// The two ways a command fails, and the exit status of each:
//  - UsageError (exit 2): the command line is wrong: an unknown option, a bad option value, a
//    variable name the plant does not have. One line: the problem and where to look.
//  - Failure (exit 1): the model or the system refused: a plant that does not validate, an
//    infeasible point, sweep points that failed, output that could not be written.
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

namespace elycli {

inline constexpr int kExitOk = 0;
inline constexpr int kExitFailure = 1;
inline constexpr int kExitUsage = 2;

struct UsageError {
    std::string message;
    /// Where to look, e.g. "see 'elyblock variables plant.json'"; empty: the command's --help.
    std::string hint;
};

struct Failure {
    std::string message;
};

/// Throws Failure with the library's message for an error status (< 0); returns the status
/// otherwise (ELY_OK or a warning). `context` prefixes the message, e.g. the config path.
int32_t check(int32_t status, std::string_view context);

/// The library's message of the last failed call on this thread, as a std::string.
std::string last_error();

/// The text a call of the buffer protocol gives (ely_block_report_json, ely_fit_report_json,
/// ely_fit_plant_json): asks for the length, then fills a string of that size. Failure with the
/// library's message, prefixed by `context`.
template <class Handle>
std::string buffer_text(int32_t (*call)(const Handle*, char*, size_t, size_t*), const Handle* handle,
                        std::string_view context) {
    size_t needed = 0;
    check(call(handle, nullptr, 0, &needed), context);
    std::string text(needed, '\0');
    check(call(handle, text.data(), text.size(), &needed), context);
    text.resize(needed - 1);  // the NUL
    return text;
}

}  // namespace elycli
