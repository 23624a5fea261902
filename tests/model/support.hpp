#pragma once
// Helpers shared by the model tests.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>

#include "thermo/error.hpp"

namespace ely::test {

/// |a/b − 1|
inline double rel(double a, double b) { return std::fabs(a / b - 1.0); }

/// Expects f() to throw ely::Error of `kind` whose message contains `fragment`.
template <class F>
void expect_error(F&& f, ErrorKind kind, const char* fragment) {
    try {
        f();
        ADD_FAILURE() << "no ely::Error thrown; expected one containing '" << fragment << "'";
    } catch (const Error& e) {
        EXPECT_EQ(e.kind(), kind) << e.what();
        EXPECT_THAT(e.what(), ::testing::HasSubstr(fragment));
    }
}

}  // namespace ely::test
