#include "calibration/json_text.hpp"

#include <cmath>
#include <fmt/format.h>

namespace ely::calibration {

namespace json = boost::json;

namespace {

bool is_container(const json::value& v) { return v.is_object() || v.is_array(); }

void write(const json::value& v, int depth, std::string& out) {
    const std::string pad(2 * static_cast<std::size_t>(depth + 1), ' ');
    const std::string close_pad(2 * static_cast<std::size_t>(depth), ' ');
    switch (v.kind()) {
        case json::kind::null: out += "null"; return;
        case json::kind::bool_: out += v.get_bool() ? "true" : "false"; return;
        case json::kind::int64: out += fmt::format("{}", v.get_int64()); return;
        case json::kind::uint64: out += fmt::format("{}", v.get_uint64()); return;
        case json::kind::double_: {
            const double x = v.get_double();
            out += std::isfinite(x) ? fmt::format("{}", x) : "null";
            return;
        }
        case json::kind::string: out += json::serialize(v.get_string()); return;
        case json::kind::array: {
            const auto& a = v.get_array();
            if (a.empty()) { out += "[]"; return; }
            bool nested = false;
            for (const auto& e : a) nested = nested || is_container(e);
            out += '[';
            for (std::size_t i = 0; i < a.size(); ++i) {
                if (i) out += nested ? "," : ", ";
                if (nested) out += "\n" + pad;
                write(a[i], depth + 1, out);
            }
            if (nested) out += "\n" + close_pad;
            out += ']';
            return;
        }
        case json::kind::object: {
            const auto& o = v.get_object();
            if (o.empty()) { out += "{}"; return; }
            out += '{';
            bool first = true;
            for (const auto& member : o) {
                out += first ? "\n" : ",\n";
                first = false;
                out += pad + json::serialize(json::string(member.key())) + ": ";
                write(member.value(), depth + 1, out);
            }
            out += "\n" + close_pad + "}";
            return;
        }
    }
}

}  // namespace

std::string indented_json(const json::value& value) {
    std::string out;
    write(value, 0, out);
    out += '\n';
    return out;
}

}  // namespace ely::calibration
