// Word segmentation of UTF-8 text with byte offsets, following Unicode UAX #29 word
// boundaries (ICU's word break rules) with an ASCII fast path that gives the same answer.
// Every byte of the input belongs to exactly one token, so tokens tile the text.
#pragma once

#include <cstdint>
#include <memory>
#include <string_view>
#include <vector>

namespace evenhand::text {

enum class TokenKind : uint8_t {
  word,    // letters (may contain apostrophes and the like inside, per UAX #29: "mother's")
  number,  // digits (and UAX #29 numeric sequences such as "3.14")
  space,   // white space
  punct,   // anything else: punctuation, symbols, hyphens, emoji
};

struct Token {
  uint32_t begin = 0;  // byte offsets into the text: [begin, end)
  uint32_t end = 0;
  TokenKind kind = TokenKind::punct;
};

// One per worker thread: holds ICU state and scratch, reused across calls.
// Not copyable; not thread-safe.
class Tokenizer {
 public:
  Tokenizer();
  ~Tokenizer();
  Tokenizer(const Tokenizer&) = delete;
  Tokenizer& operator=(const Tokenizer&) = delete;

  // Replaces `out` with the tokens of `text` (valid UTF-8), in order, tiling the text.
  // Runs of ASCII take the fast path, and so do dashes, double quotation marks and the
  // ellipsis (U+2013 U+2014 U+201C U+201D U+2026) when ASCII follows them; stretches holding
  // other non-ASCII characters go through ICU.
  // Ill-formed UTF-8 still yields tiling tokens (ICU reads bad bytes as U+FFFD).
  // Offsets are 32-bit: `text` must be shorter than 2 GiB.
  void tokenize(std::string_view text, std::vector<Token>& out);

  // tokenize() without the space tokens (the same tokens otherwise, in order): for callers
  // that skip white space anyway, about half as many tokens to write and read.
  void tokenize_without_space(std::string_view text, std::vector<Token>& out);

  // Same contract as tokenize(), but every byte goes through ICU (no fast path). This is
  // the reference the fast path is tested against; slower, otherwise interchangeable.
  void tokenize_icu(std::string_view text, std::vector<Token>& out);

 private:
  struct Impl;
  template <bool kKeepSpace>
  void run(std::string_view text, std::vector<Token>& out);
  std::unique_ptr<Impl> impl_;
};

}  // namespace evenhand::text
