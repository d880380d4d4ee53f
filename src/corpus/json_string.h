// JSON string escaping and unescaping (RFC 8259 section 7) with a byte alignment: unescaping
// can record, for every byte of the decoded text, where its escape sequence starts in the
// raw token, so an edit in decoded text maps back to an exact raw byte range. Also the one
// test for JSON's insignificant whitespace, shared by everything that scans raw JSON text.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace evenhand::corpus {

// True for the four whitespace bytes JSON allows between tokens (RFC 8259 section 2).
inline bool is_json_ws(char c) {
  return c == ' ' || c == '\t' || c == '\n' || c == '\r';
}

// Appends `utf8` escaped for the inside of a JSON string (no quotes): '"', '\\' and control
// characters U+0000..U+001F are escaped (\n \r \t \b \f, else \u00XX); all other characters,
// including non-ASCII UTF-8, are copied as they are. Input must be valid UTF-8.
void append_json_escaped(std::string_view utf8, std::string& out);

// Decodes the inside of a JSON string token (between the quotes). Returns false for a
// malformed escape or an unpaired surrogate. When `align` is not null it receives
// out.size()+1 entries: align[i] is the offset in `raw` where the escape or character that
// produced decoded byte i begins; align[out.size()] == raw.size().
bool unescape_json_string(std::string_view raw, std::string& out, std::vector<uint32_t>* align);

}  // namespace evenhand::corpus
