// Small UTF-8 helpers for the text layer: validation, decoding one code point at a time, and
// UTF-8 <-> UTF-16 conversion that records where each UTF-16 unit came from (so offsets
// found by ICU on UTF-16 map back to exact UTF-8 byte offsets). No allocation beyond `out`.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace evenhand::text {

// Returns true if `s` is well-formed UTF-8 (Unicode 15, table 3-7: no overlong forms, no
// surrogates, nothing above U+10FFFF), false otherwise. The empty string is valid.
bool valid_utf8(std::string_view s);

// Returns true if every byte of `s` is below 0x80.
bool is_ascii(std::string_view s);

// Decodes the code point starting at byte `i` (i < s.size()) and advances `i` past it.
// An ill-formed sequence yields U+FFFD and advances by one byte, so loops always progress.
char32_t decode_utf8(std::string_view s, size_t& i);

// Decodes the code point that ends just before byte `i` (0 < i <= s.size()) and sets `i`
// to its first byte. Ill-formed bytes yield U+FFFD one byte at a time.
char32_t decode_utf8_before(std::string_view s, size_t& i);

// Appends the UTF-8 form of `c` to `out` (U+FFFD for surrogates and values past U+10FFFF).
void append_utf8(char32_t c, std::string& out);

// Replaces `out` with the UTF-16 form of `s` (ill-formed bytes become U+FFFD). If `byte_of`
// is not null it is replaced with out.size() + 1 entries: the UTF-8 byte offset where the
// code point holding each UTF-16 unit starts, and s.size() as the last entry.
void utf8_to_utf16(std::string_view s, std::u16string& out, std::vector<uint32_t>* byte_of);

// Appends the UTF-8 form of `s` to `out` (unpaired surrogates become U+FFFD).
void append_utf16_as_utf8(std::u16string_view s, std::string& out);

}  // namespace evenhand::text
