#pragma once
// The one place where C++ exceptions become C status values. Every exported function body
// runs inside ely::capi::guard(), so no exception can cross the C interface.
#include <cstdint>
#include <exception>
#include <new>
#include <string>

#include "elyblock/elyblock.h"
#include "base/error.hpp"

namespace ely::capi {

void set_last_error(const std::string& message) noexcept;
void clear_last_error() noexcept;
int32_t status_of(ErrorKind kind) noexcept;

/// Throws invalid_argument when a required pointer argument is NULL.
inline void require_pointer(const void* p, const char* what) {
    if (p == nullptr) throw Error(ErrorKind::invalid_argument, std::string(what) + " is NULL");
}

/// Runs `body` (returning int32_t status); maps any exception to a status and a message.
/// A body returning a warning (> 0) sets the message itself; ELY_OK clears it.
template <class Body>
int32_t guard(Body&& body) noexcept {
    try {
        const int32_t status = body();
        if (status == ELY_OK) clear_last_error();
        return status;
    } catch (const Error& e) {
        set_last_error(e.what());
        return status_of(e.kind());
    } catch (const std::bad_alloc&) {
        set_last_error("out of memory");
        return ELY_ERR_OUT_OF_MEMORY;
    } catch (const std::exception& e) {
        set_last_error(std::string("internal error: ") + e.what());
        return ELY_ERR_INTERNAL;
    } catch (...) {
        set_last_error("internal error: unknown exception");
        return ELY_ERR_INTERNAL;
    }
}

}  // namespace ely::capi
