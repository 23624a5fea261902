// The last-error message lives in a fixed-size thread-local buffer (no destructor may run when a
// host unloads the library while its threads live on): long messages are cut on a UTF-8
// boundary with a note saying so, embedded NULs are written as \x00.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <string>

#include "elyblock/elyblock.h"
#include "guard.hpp"

namespace {

// Every byte sequence of s decodes as UTF-8 (no character cut in half).
bool valid_utf8(const std::string& s) {
    for (size_t i = 0; i < s.size();) {
        const unsigned char c = static_cast<unsigned char>(s[i]);
        const size_t n = c < 0x80 ? 1 : (c >> 5) == 0x6 ? 2 : (c >> 4) == 0xE ? 3 : (c >> 3) == 0x1E ? 4 : 0;
        if (n == 0 || i + n > s.size()) return false;
        for (size_t k = 1; k < n; ++k)
            if ((static_cast<unsigned char>(s[i + k]) & 0xC0) != 0x80) return false;
        i += n;
    }
    return true;
}

TEST(LastError, LongMessageIsCutOnACharacterBoundaryWithANote) {
    for (size_t offset = 0; offset < 3; ++offset) {  // move the cut across the bytes of a character
        std::string text(offset, 'x');
        for (int i = 0; i < 3000; ++i) text += "\xE2\x82\xAC";  // €, three bytes
        ely::capi::set_last_error(text);
        const std::string message = ely_last_error();
        EXPECT_THAT(message, ::testing::EndsWith("\xE2\x80\xA6 (message cut at 4096 bytes)"));
        const std::string kept = message.substr(0, message.size() - std::string(" \xE2\x80\xA6 (message cut at 4096 bytes)").size());
        EXPECT_LE(kept.size(), 4096u);
        EXPECT_GE(kept.size(), 4096u - 3u);
        EXPECT_EQ(kept, text.substr(0, kept.size()));
        EXPECT_TRUE(valid_utf8(message)) << "offset " << offset;
    }
}

TEST(LastError, ShortMessagesKeptWhole_NulEscaped_ClearedOnSuccess) {
    ely::capi::set_last_error(std::string("a\0b", 3));
    EXPECT_STREQ(ely_last_error(), "a\\x00b");
    const std::string exact(4096, 'y');
    ely::capi::set_last_error(exact);
    EXPECT_EQ(std::string(ely_last_error()), exact);
    ely::capi::clear_last_error();
    EXPECT_STREQ(ely_last_error(), "");
}

}  // namespace
