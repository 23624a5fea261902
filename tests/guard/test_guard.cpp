// The one exception-to-status wrapper of the C interface, fed every kind of exception: each
// becomes a negative status and a message, never an exception across the boundary.
#include <gtest/gtest.h>

#include <new>
#include <stdexcept>
#include <string>

#include "elyblock/elyblock.h"
#include "guard.hpp"

using ely::capi::guard;

TEST(Guard, EveryErrorKindMapsToItsFrozenStatus) {
    const struct { ely::ErrorKind kind; int32_t status; } map[] = {
        {ely::ErrorKind::invalid_argument, ELY_ERR_INVALID_ARGUMENT}, {ely::ErrorKind::out_of_range, ELY_ERR_OUT_OF_RANGE},
        {ely::ErrorKind::config, ELY_ERR_CONFIG},                     {ely::ErrorKind::infeasible, ELY_ERR_INFEASIBLE},
        {ely::ErrorKind::no_convergence, ELY_ERR_NO_CONVERGENCE},     {ely::ErrorKind::unknown_name, ELY_ERR_UNKNOWN_NAME},
        {ely::ErrorKind::wrong_state, ELY_ERR_WRONG_STATE},           {ely::ErrorKind::io, ELY_ERR_IO},
        {ely::ErrorKind::buffer_too_small, ELY_ERR_BUFFER_TOO_SMALL}, {ely::ErrorKind::cancelled, ELY_ERR_CANCELLED},
        {ely::ErrorKind::internal, ELY_ERR_INTERNAL}};
    for (const auto& m : map) {
        EXPECT_EQ(guard([&]() -> int32_t { throw ely::Error(m.kind, "kind test"); }), m.status);
        EXPECT_STREQ(ely_last_error(), "kind test");
    }
}

TEST(Guard, ForeignExceptionsBecomeInternalOrOutOfMemory) {
    EXPECT_EQ(guard([]() -> int32_t { throw std::bad_alloc(); }), ELY_ERR_OUT_OF_MEMORY);
    EXPECT_STREQ(ely_last_error(), "out of memory");
    EXPECT_EQ(guard([]() -> int32_t { throw std::logic_error("broken invariant"); }), ELY_ERR_INTERNAL);
    EXPECT_EQ(std::string(ely_last_error()), "internal error: broken invariant");
    EXPECT_EQ(guard([]() -> int32_t { throw 42; }), ELY_ERR_INTERNAL);
    EXPECT_EQ(std::string(ely_last_error()), "internal error: unknown exception");
}

TEST(Guard, SuccessClearsTheMessageAndWarningsKeepTheirs) {
    guard([]() -> int32_t { throw std::runtime_error("x"); });
    EXPECT_EQ(guard([] { return int32_t{ELY_OK}; }), ELY_OK);
    EXPECT_STREQ(ely_last_error(), "");
    EXPECT_EQ(guard([] {
                  ely::capi::set_last_error("an alarm");
                  return int32_t{ELY_WARNING};
              }),
              ELY_WARNING);
    EXPECT_STREQ(ely_last_error(), "an alarm");
}
