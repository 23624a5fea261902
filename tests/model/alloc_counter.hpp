#pragma once
// Counts heap allocations for the "evaluate() does not allocate" checks. alloc_counter.cpp
// replaces operator new with a weak, counting version; when another strong replacement wins
// (a sanitizer runtime), counting is impossible and the check skips itself.
#include <functional>

namespace ely::test {

/// Allocations made while running f, or -1 when this program cannot count them.
long count_allocations(const std::function<void()>& f);

}  // namespace ely::test
