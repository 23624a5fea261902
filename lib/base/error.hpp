#pragma once
// The one exception type of lib/. The C layer (abi/) maps ErrorKind to a frozen status
// code; nothing in lib/ knows about C. Every message names the quantity, the value given
// and the limit crossed, so a host can show it to a user as it is.
#include <cmath>
#include <stdexcept>
#include <string>

namespace ely {

enum class ErrorKind {
    invalid_argument,  // NaN, infinity, NULL, non-positive where positive is required
    out_of_range,      // outside the validity range of a correlation or a model envelope
    config,            // a plant description that does not parse or validate
    infeasible,        // an operating specification that no state within the limits meets
    no_convergence,    // a solve that did not meet its tolerance
    unknown_name,      // a variable name or key that does not exist
    wrong_state,       // a call in the wrong order of the life cycle
    io,                // a file that cannot be read
    buffer_too_small,  // a caller's buffer cannot hold the result
    cancelled,         // a progress callback asked to stop
    internal           // a broken invariant: a bug
};

class Error : public std::runtime_error {
public:
    Error(ErrorKind kind, const std::string& message) : std::runtime_error(message), kind_(kind) {}
    ErrorKind kind() const noexcept { return kind_; }

private:
    ErrorKind kind_;
};

}  // namespace ely
