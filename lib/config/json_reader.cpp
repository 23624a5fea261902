#include "config/json_reader.hpp"

#include <algorithm>
#include <boost/json/basic_parser_impl.hpp>
#include <cerrno>
#include <cstring>
#include <fmt/format.h>
#include <string>
#include <unordered_set>
#include <vector>

#ifdef _WIN32
#include <filesystem>
#include <fstream>
#else
#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>
#endif

#include "base/error.hpp"
#include "base/excerpt.hpp"

namespace ely::json_input {

[[noreturn]] void fail(const std::string& path, const std::string& message) {
    // A JSON string may hold "\u0000": a NUL would end the message where a host reads it as a
    // C string (what(), ely_last_error), so it is written out.
    std::string text = path + ": " + message;
    for (std::size_t i = text.find('\0'); i != std::string::npos; i = text.find('\0', i + 4)) text.replace(i, 1, "\\x00");
    throw Error(ErrorKind::config, text);
}

std::string child(const std::string& path, std::string_view key) {
    std::string p;
    p.reserve(path.size() + key.size() + 1);
    p += path;
    p += '.';
    p += key;
    return p;
}

std::string element(const std::string& path, std::size_t index) { return fmt::format("{}[{}]", path, index); }

std::string got(const json::value& v) {
    switch (v.kind()) {
        case json::kind::null: return "null";
        case json::kind::bool_: return v.get_bool() ? "true" : "false";
        case json::kind::int64: return std::to_string(v.get_int64());
        case json::kind::uint64: return std::to_string(v.get_uint64());
        case json::kind::double_: return fmt::format("{:g}", v.get_double());
        case json::kind::string: return fmt::format("a string (\"{}\")", excerpt(std::string_view(v.get_string())));
        case json::kind::array: return "an array";
        case json::kind::object: return "an object";
    }
    return "?";
}

namespace {

// ---------------------------------------------------------------------------------------------
// JSON text → DOM. A first pass with Boost.JSON's SAX parser finds syntax errors with their
// line, column and the path reached, and duplicate keys (which the DOM would silently merge,
// last one winning); the second pass builds the DOM.

class SyntaxCheck {
public:
    // Boost.JSON stops with array_too_large, object_too_large, ... past these.
    static constexpr std::size_t max_array_size = kMaxArrayElements;
    static constexpr std::size_t max_object_size = kMaxObjectMembers;
    static constexpr std::size_t max_string_size = kMaxStringBytes;
    static constexpr std::size_t max_key_size = kMaxKeyBytes;

    bool on_document_begin(json::error_code&) { return true; }
    bool on_document_end(json::error_code&) { return true; }
    bool on_array_begin(json::error_code&) {
        frames_.push_back(Frame{false, false, {}, 0, {}});
        return true;
    }
    bool on_array_end(std::size_t, json::error_code&) { return close(); }
    bool on_object_begin(json::error_code&) {
        frames_.push_back(Frame{true, false, {}, 0, {}});
        return true;
    }
    bool on_object_end(std::size_t, json::error_code&) { return close(); }
    bool on_string_part(json::string_view, std::size_t, json::error_code&) { return true; }
    bool on_string(json::string_view, std::size_t, json::error_code&) { return value_done(); }
    bool on_key_part(json::string_view s, std::size_t, json::error_code&) {
        key_.append(s.data(), s.size());
        return true;
    }
    bool on_key(json::string_view s, std::size_t, json::error_code& ec) {
        key_.append(s.data(), s.size());
        Frame& f = frames_.back();
        if (!f.keys.insert(key_).second) {
            duplicate_ = key_;
            ec = json::error::syntax;  // any code: parse_json reports the duplicate itself
            return false;
        }
        f.key = std::move(key_);
        f.reading_value = true;
        key_.clear();
        return true;
    }
    bool on_number_part(json::string_view, json::error_code&) { return true; }
    bool on_int64(std::int64_t, json::string_view, json::error_code&) { return value_done(); }
    bool on_uint64(std::uint64_t, json::string_view, json::error_code&) { return value_done(); }
    bool on_double(double, json::string_view, json::error_code&) { return value_done(); }
    bool on_bool(bool, json::error_code&) { return value_done(); }
    bool on_null(json::error_code&) { return value_done(); }
    bool on_comment_part(json::string_view, json::error_code&) { return true; }
    bool on_comment(json::string_view, json::error_code&) { return true; }

    /// The repeated key, empty if none.
    const std::string& duplicate() const { return duplicate_; }

    /// Path of the value being read where the parser stopped (of the object, between members).
    std::string path() const {
        std::string p = "$";
        for (const Frame& f : frames_) {
            if (!f.object) p = element(p, f.index);
            else if (f.reading_value) p = child(p, f.key);
        }
        return p;
    }

private:
    struct Frame {
        bool object;
        bool reading_value;  // object: between a key and the end of its value
        std::string key;     // object: the last key
        std::size_t index;   // array: the index of the element being read
        std::unordered_set<std::string> keys;  // object: the keys so far (a hash set: linear in the members)
    };

    bool value_done() {
        if (!frames_.empty()) {
            Frame& f = frames_.back();
            if (f.object) f.reading_value = false;
            else ++f.index;
        }
        return true;
    }
    bool close() {
        frames_.pop_back();
        return value_done();
    }

    std::vector<Frame> frames_;
    std::string key_;
    std::string duplicate_;
};

std::string position(std::string_view text, std::size_t offset) {
    offset = std::min(offset, text.size());
    std::size_t line = 1, column = 1;
    for (std::size_t i = 0; i < offset; ++i) {
        const auto c = static_cast<unsigned char>(text[i]);
        if (c == '\n') {
            ++line;
            column = 1;
        } else if ((c & 0xC0) != 0x80) {  // count UTF-8 characters, not bytes
            ++column;
        }
    }
    return fmt::format("line {}, column {}", line, column);
}

// The limit of kMax* by which the SAX pass stopped, empty if it stopped for another reason.
std::string limit_crossed(const json::error_code& ec) {
    if (ec == json::error::array_too_large)
        return fmt::format("array with more than the limit of {} elements", kMaxArrayElements);
    if (ec == json::error::object_too_large)
        return fmt::format("object with more than the limit of {} members", kMaxObjectMembers);
    if (ec == json::error::string_too_large)
        return fmt::format("string longer than the limit of {} bytes", kMaxStringBytes);
    if (ec == json::error::key_too_large) return fmt::format("key longer than the limit of {} bytes", kMaxKeyBytes);
    if (ec == json::error::too_deep)
        return fmt::format("arrays and objects nested deeper than the limit of {} levels", kMaxDepth);
    return {};
}

[[noreturn]] void fail_io(const std::string& path, const std::string& reason) {
    throw Error(ErrorKind::io, fmt::format("cannot read config file '{}': {}", excerpt(path, 256), reason));
}

std::string too_large(unsigned long long size) {
    return fmt::format("it is {} bytes, more than the limit of {} bytes (4 MiB) for a plant description", size,
                       kMaxDocumentBytes);
}

json::parse_options parse_options() {
    json::parse_options options;
    options.allow_comments = true;  // a config is edited by hand: // and /* */ comments are accepted
    options.max_depth = kMaxDepth;
    return options;
}

}  // namespace

json::value parse_json(std::string_view text, json::storage_ptr storage) {
    if (text.size() > kMaxDocumentBytes)
        fail("$", fmt::format("the document is {} bytes, more than the limit of {} bytes (4 MiB) for a plant description",
                              text.size(), kMaxDocumentBytes));
    const auto options = parse_options();
    json::basic_parser<SyntaxCheck> check(options);
    json::error_code ec;
    const std::size_t consumed = check.write_some(false, text.data(), text.size(), ec);
    if (!check.handler().duplicate().empty()) {
        fail(check.handler().path(),
             fmt::format("duplicate key '{}' at {}", check.handler().duplicate(), position(text, consumed)));
    }
    if (ec) {
        const std::string limit = limit_crossed(ec);
        if (!limit.empty()) fail(check.handler().path(), fmt::format("{} at {}", limit, position(text, consumed)));
        fail(check.handler().path(), fmt::format("malformed JSON at {}: {}", position(text, consumed), ec.message()));
    }
    if (consumed < text.size())
        fail("$", fmt::format("malformed JSON at {}: text after the end of the document", position(text, consumed)));
    json::value root = json::parse(json::string_view(text.data(), text.size()), ec, std::move(storage), options);
    if (ec) fail("$", fmt::format("malformed JSON: {}", ec.message()));  // not reached: the check passed
    return root;
}

#ifdef _WIN32
std::string read_document_file(const std::string& path) {
    namespace fs = std::filesystem;
    const fs::path file = fs::u8path(path);  // UTF-8 → the UTF-16 name Windows opens
    std::error_code ec;
    const fs::file_status st = fs::status(file, ec);
    if (ec) fail_io(path, ec.message());
    if (fs::is_directory(st)) fail_io(path, "it is a directory");
    if (!fs::is_regular_file(st)) fail_io(path, "it is not a regular file");
    const auto size = fs::file_size(file, ec);
    if (ec) fail_io(path, ec.message());
    if (size > kMaxDocumentBytes) fail_io(path, too_large(size));
    std::ifstream in(file, std::ios::binary);  // libstdc++ and MSVC open a path with _wfopen
    if (!in) fail_io(path, std::strerror(errno));
    std::string text(kMaxDocumentBytes + 1, '\0');
    in.read(text.data(), static_cast<std::streamsize>(text.size()));
    if (in.bad()) fail_io(path, "read error");
    text.resize(static_cast<std::size_t>(in.gcount()));
    if (text.size() > kMaxDocumentBytes) fail_io(path, too_large(text.size()));  // grew after the check
    return text;
}
#else
std::string read_document_file(const std::string& path) {
    // O_NONBLOCK: opening a FIFO for reading must not wait for a writer; it is refused below.
    const int fd = ::open(path.c_str(), O_RDONLY | O_NONBLOCK | O_CLOEXEC | O_NOCTTY);
    if (fd < 0) fail_io(path, std::strerror(errno));
    struct Closer {
        int fd;
        ~Closer() { ::close(fd); }
    } closer{fd};
    struct stat st {};
    if (::fstat(fd, &st) != 0) fail_io(path, std::strerror(errno));
    if (S_ISDIR(st.st_mode)) fail_io(path, "it is a directory");
    if (S_ISFIFO(st.st_mode)) fail_io(path, "it is a FIFO (named pipe), not a regular file");
    if (S_ISCHR(st.st_mode) || S_ISBLK(st.st_mode)) fail_io(path, "it is a device, not a regular file");
    if (!S_ISREG(st.st_mode)) fail_io(path, "it is not a regular file");
    if (static_cast<unsigned long long>(st.st_size) > kMaxDocumentBytes)
        fail_io(path, too_large(static_cast<unsigned long long>(st.st_size)));
    // Read at most one byte past the limit, in case the file grew after fstat.
    std::string text(static_cast<std::size_t>(st.st_size) + 1, '\0');
    std::size_t got_bytes = 0;
    for (;;) {
        if (got_bytes == text.size()) {
            if (text.size() > kMaxDocumentBytes) fail_io(path, too_large(text.size()));
            text.resize(std::min(kMaxDocumentBytes + 1, 2 * text.size()));
        }
        const ssize_t n = ::read(fd, text.data() + got_bytes, text.size() - got_bytes);
        if (n < 0) {
            if (errno == EINTR) continue;
            fail_io(path, std::strerror(errno));
        }
        if (n == 0) break;
        got_bytes += static_cast<std::size_t>(n);
    }
    text.resize(got_bytes);
    return text;
}
#endif

const json::object& expect_object(const json::value& v, const std::string& path) {
    if (!v.is_object()) fail(path, "expected an object, got " + got(v));
    return v.get_object();
}

const json::array& expect_array(const json::value& v, const std::string& path) {
    if (!v.is_array()) fail(path, "expected an array, got " + got(v));
    return v.get_array();
}

std::string_view expect_string(const json::value& v, const std::string& path) {
    if (!v.is_string()) fail(path, "expected a string, got " + got(v));
    const auto& s = v.get_string();
    return {s.data(), s.size()};
}

bool expect_bool(const json::value& v, const std::string& path) {
    if (!v.is_bool()) fail(path, "expected true or false, got " + got(v));
    return v.get_bool();
}

}  // namespace ely::json_input
