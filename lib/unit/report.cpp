// The solved state as JSON text. Strings go through Boost.JSON (escaping of names and of the
// plant's free-text name); numbers print as the shortest text that reads back to the same
// double (fmt), e.g. 338.15 rather than Boost.JSON's 3.3815E2; NaN and infinities are null.
#include <boost/json.hpp>
#include <cmath>
#include <fmt/format.h>

#include "base/error.hpp"
#include "unit/block.hpp"

namespace ely {

namespace {
std::string quoted(std::string_view text) { return boost::json::serialize(boost::json::string(text)); }

std::string number(double x) { return std::isfinite(x) ? fmt::format("{}", x) : "null"; }
}  // namespace

std::string Block::report_json() const {
    if (!outputs_current_)
        throw Error(ErrorKind::wrong_state, "no report: the block has no solution for its current inputs; solve first");
    const auto& spec = spec_info(spec_);
    std::string out = fmt::format("{{\"technology\":{},\"spec\":{},\"drive_input\":{},\"name\":{},\"variables\":{{",
                                  quoted(design_.technology->name), quoted(spec.name),
                                  quoted(variable_info(spec.drive).name), quoted(design_.name));
    for (int32_t i = 0; i < variable_count(); ++i) {
        const auto& info = variable(i);
        out += fmt::format("{}{}:{{\"value\":{},\"unit\":{}}}", i ? "," : "", quoted(info.name), number(get(i)),
                           quoted(info.unit));
    }
    out += "}}";
    return out;
}

}  // namespace ely
