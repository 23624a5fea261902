#pragma once
// The block handle of the C interface and the buffer protocol of its text results, shared by
// the files of abi/src.
#include <cstddef>
#include <string>

#include "unit/block.hpp"

struct ely_block {
    explicit ely_block(ely::Block b) : model(std::move(b)) {}
    ely::Block model;
};

namespace ely::capi {

/// Copies text with its NUL into a caller's buffer: *length receives the size needed (NUL
/// included); buffer NULL with capacity 0 only reports it; a smaller non-zero capacity is
/// buffer_too_small (the size still reported), a NULL buffer with a capacity invalid_argument.
void copy_text(const std::string& text, char* buffer, std::size_t capacity, std::size_t* length);

/// The same protocol for bytes (a saved state): no NUL; *length is the number of bytes.
void copy_bytes(const std::string& bytes, void* buffer, std::size_t capacity, std::size_t* length);

}  // namespace ely::capi
