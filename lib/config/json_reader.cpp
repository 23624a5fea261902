#include "config/json_reader.hpp"

#include <algorithm>
#include <boost/json/basic_parser_impl.hpp>
#include <fmt/format.h>
#include <vector>

#include "base/error.hpp"

namespace ely::json_input {

[[noreturn]] void fail(const std::string& path, const std::string& message) {
    throw Error(ErrorKind::config, path + ": " + message);
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
        case json::kind::string: return fmt::format("a string (\"{}\")", std::string_view(v.get_string()));
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
    static constexpr std::size_t max_array_size = std::size_t(-1);
    static constexpr std::size_t max_object_size = std::size_t(-1);
    static constexpr std::size_t max_string_size = std::size_t(-1);
    static constexpr std::size_t max_key_size = std::size_t(-1);

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
        if (std::find(f.keys.begin(), f.keys.end(), key_) != f.keys.end()) {
            duplicate_ = key_;
            ec = json::error::syntax;  // any code: parse_json reports the duplicate itself
            return false;
        }
        f.keys.push_back(key_);
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
        std::vector<std::string> keys;
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

json::parse_options parse_options() {
    json::parse_options options;
    options.allow_comments = true;  // a config is edited by hand: // and /* */ comments are accepted
    options.max_depth = 32;
    return options;
}

}  // namespace

json::value parse_json(std::string_view text, json::storage_ptr storage) {
    const auto options = parse_options();
    json::basic_parser<SyntaxCheck> check(options);
    json::error_code ec;
    const std::size_t consumed = check.write_some(false, text.data(), text.size(), ec);
    if (!check.handler().duplicate().empty()) {
        fail(check.handler().path(),
             fmt::format("duplicate key '{}' at {}", check.handler().duplicate(), position(text, consumed)));
    }
    if (ec) {
        fail(check.handler().path(),
             fmt::format("malformed JSON at {}: {}", position(text, consumed), ec.message()));
    }
    if (consumed < text.size())
        fail("$", fmt::format("malformed JSON at {}: text after the end of the document", position(text, consumed)));
    json::value root = json::parse(json::string_view(text.data(), text.size()), ec, std::move(storage), options);
    if (ec) fail("$", fmt::format("malformed JSON: {}", ec.message()));  // not reached: the check passed
    return root;
}

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
