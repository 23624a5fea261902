#include "output.hpp"

#include <cerrno>
#include <cstring>

#include "errors.hpp"

namespace elycli {

Output::Output() : file_(stdout), name_("standard output"), owned_(false) {}

Output::Output(const std::string& path, std::string_view option)
    : file_(std::fopen(path.c_str(), "w")), name_(fmt::format("{} '{}'", option, path)), owned_(true) {
    if (!file_) fail(errno);
}

Output::~Output() {
    if (owned_ && file_) std::fclose(file_);
}

void Output::write(std::string_view text) {
    if (text.empty()) return;
    errno = 0;
    if (std::fwrite(text.data(), 1, text.size(), file_) != text.size()) fail(errno);
}

void Output::close() {
    errno = 0;
    if (std::fflush(file_) != 0 || std::ferror(file_)) fail(errno);
    if (owned_) {
        std::FILE* f = file_;
        file_ = nullptr;
        errno = 0;
        if (std::fclose(f) != 0) fail(errno);
    }
}

void Output::fail(int error_number) const {
    throw Failure{fmt::format("cannot write to {}: {}", name_,
                              error_number != 0 ? std::strerror(error_number) : "write error")};
}

void close_standard_output() {
    errno = 0;
    if (std::fflush(stdout) != 0 || std::ferror(stdout))
        throw Failure{fmt::format("cannot write to standard output: {}",
                                  errno != 0 ? std::strerror(errno) : "write error")};
    errno = 0;
    if (std::fclose(stdout) != 0)
        throw Failure{fmt::format("cannot close standard output: {}", errno != 0 ? std::strerror(errno) : "error")};
}

}  // namespace elycli
