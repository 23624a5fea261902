#pragma once
// JSON text of the calibration's results: an indented layout that people can read (objects one
// member a line; arrays of numbers or strings on one line, arrays of arrays or objects one element
// a line). Strings go through Boost.JSON's escaping; numbers are the shortest text that reads
// back to the same double (fmt); NaN and infinities are null.
#include <boost/json.hpp>
#include <string>

namespace ely::calibration {

std::string indented_json(const boost::json::value& value);

}  // namespace ely::calibration
