#pragma once
// Shared by the fuzz target, its structure-aware mutator and the regression replayer.
#include <cstddef>
#include <cstdint>

/// The stack of the thread each input runs on: a host's worker pool may give no more.
inline constexpr std::size_t kFuzzStackBytes = 512 * 1024;

/// Runs one input (config text, optionally NUL and a call program) on a small-stack thread.
int fuzz_one_input(const uint8_t* data, std::size_t size);
