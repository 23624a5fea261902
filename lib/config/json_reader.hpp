#pragma once
// Reading a plant description's JSON text: syntax and duplicate-key errors with line,
// column and the JSON path reached, and the typed accessors whose errors name the path.
// Every failure is an ely::Error of kind config whose message starts with the JSON path.
#include <boost/json.hpp>
#include <cstddef>
#include <string>
#include <string_view>

namespace ely::json_input {

namespace json = boost::json;

/// Throws ErrorKind::config with "<path>: <message>".
[[noreturn]] void fail(const std::string& path, const std::string& message);

/// Path of an object member ("$.stack" + "cells" → "$.stack.cells") and of an array element.
std::string child(const std::string& path, std::string_view key);
std::string element(const std::string& path, std::size_t index);

/// A short description of a JSON value for messages: "null", "2.5", "a string (\"x\")", ...
std::string got(const json::value& v);

/// Limits of a plant description (one is a few kilobytes; these bound the memory and time any
/// text can ask for). Crossing one is an error naming the limit.
inline constexpr std::size_t kMaxDocumentBytes = 4 * 1024 * 1024;  // 4 MiB, text and file
inline constexpr std::size_t kMaxDepth = 32;                         // nested arrays and objects
inline constexpr std::size_t kMaxArrayElements = 1024;
inline constexpr std::size_t kMaxObjectMembers = 256;
inline constexpr std::size_t kMaxStringBytes = 4096;
inline constexpr std::size_t kMaxKeyBytes = 128;

/// Parses JSON text (comments allowed) into a DOM; errors name the line, column and path,
/// and a key repeated within one object is an error (found in linear time). The limits above
/// apply.
json::value parse_json(std::string_view text, json::storage_ptr storage);

/// Reads a plant description file whole. Only a regular file of at most kMaxDocumentBytes is
/// read: a directory, a device (/dev/zero), a FIFO or a larger file fails at once, without
/// reading it, with ErrorKind::io naming the file and the reason. `path` is UTF-8 (on Windows
/// it is opened through its UTF-16 form, so any file name works).
std::string read_document_file(const std::string& path);

const json::object& expect_object(const json::value& v, const std::string& path);
const json::array& expect_array(const json::value& v, const std::string& path);
std::string_view expect_string(const json::value& v, const std::string& path);
bool expect_bool(const json::value& v, const std::string& path);

}  // namespace ely::json_input
