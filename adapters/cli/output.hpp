#pragma once
// Where a command writes: standard output or a file, every write and the close checked. A full
// disk, a closed pipe or a file that takes no data (/dev/full, /proc/version) is a Failure naming
// the destination and the system's reason; the program exits 1 and never reports success for
// data it lost.
#include <cstdio>
#include <string>
#include <string_view>

#include <fmt/format.h>

namespace elycli {

class Output {
public:
    /// Standard output.
    Output();
    /// A file, created or truncated; Failure when it cannot be opened. `option` names the
    /// command-line option that gave the path, for the message.
    Output(const std::string& path, std::string_view option);
    Output(const Output&) = delete;
    Output& operator=(const Output&) = delete;
    ~Output();  // closes a file still open without reporting (a Failure is already on its way)

    void write(std::string_view text);
    template <class... Args>
    void print(fmt::format_string<Args...> format, Args&&... args) {
        write(fmt::vformat(format, fmt::make_format_args(args...)));
    }
    /// Flushes and closes (standard output: flushes); Failure when the data did not all go out.
    void close();

private:
    [[noreturn]] void fail(int error_number) const;
    std::FILE* file_;
    std::string name_;  // "standard output" or "--output 'path'"
    bool owned_;
};

/// Closes standard output at the end of a successful run, checking that everything written
/// reached it (data buffered by the C library may fail only here). Failure otherwise.
void close_standard_output();

}  // namespace elycli
