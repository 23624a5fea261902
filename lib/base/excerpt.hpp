#pragma once
// User text quoted in an error message: bounded in length and printable. A message repeats
// what the user gave ("unit 'degF' is not known"), but a host shows it on one line and the C
// interface hands it out as a NUL-terminated string, so the quoted part is cut to a few dozen
// characters (on a UTF-8 character boundary, with its full length said) and control
// characters, an embedded NUL among them, are written as \xNN.
#include <cstddef>
#include <string>
#include <string_view>

namespace ely {

/// Longest quoted user text in a message, in bytes of the original text.
inline constexpr std::size_t kExcerptBytes = 64;

/// `text` for a message: control characters escaped, cut after `max_bytes` with "…" and the
/// full length, e.g. "((((((((((((… (40000 bytes)".
inline std::string excerpt(std::string_view text, std::size_t max_bytes = kExcerptBytes) {
    std::size_t end = text.size();
    if (end > max_bytes) {
        end = max_bytes;
        while (end > 0 && (static_cast<unsigned char>(text[end]) & 0xC0) == 0x80) --end;  // not inside a character
    }
    static constexpr char kHex[] = "0123456789abcdef";
    std::string out;
    out.reserve(end + 24);
    for (std::size_t i = 0; i < end; ++i) {
        const auto c = static_cast<unsigned char>(text[i]);
        if (c < 0x20 || c == 0x7F) {
            out += "\\x";
            out += kHex[c >> 4];
            out += kHex[c & 0xF];
        } else {
            out += static_cast<char>(c);
        }
    }
    if (end < text.size()) {
        out += "\xE2\x80\xA6 (";  // …
        out += std::to_string(text.size());
        out += " bytes)";
    }
    return out;
}

}  // namespace ely
