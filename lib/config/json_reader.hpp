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

/// Parses JSON text (comments allowed) into a DOM; errors name the line, column and path,
/// and a key repeated within one object is an error.
json::value parse_json(std::string_view text, json::storage_ptr storage);

const json::object& expect_object(const json::value& v, const std::string& path);
const json::array& expect_array(const json::value& v, const std::string& path);
std::string_view expect_string(const json::value& v, const std::string& path);
bool expect_bool(const json::value& v, const std::string& path);

}  // namespace ely::json_input
