// Protected spans: parts of a text that are never rewritten, such as URLs, e-mail addresses,
// @handles, fenced and inline code, and user patterns (ICU regular expressions). The
// detector is built once, is immutable, and may be shared by threads; not copyable.
#pragma once

#include <cstdint>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "base/status.h"

namespace evenhand::text {

struct Span {
  uint32_t begin = 0;  // byte offsets [begin, end)
  uint32_t end = 0;
  uint8_t kind = 0;  // a SpanKind
};

enum SpanKind : uint8_t {
  url = 0,
  email,
  handle,
  code_fence,
  code_inline,
  user_pattern,
  pack_phrase
};

// Returns the lower-case name of a SpanKind ("url", "email", ...), or "unknown".
const char* span_kind_name(uint8_t kind);

// Sorts `spans` by begin (longest first on ties) and merges those that overlap (adjacent
// spans stay apart); a merged span keeps the kind of the one that starts first. Use it to
// combine the output of ProtectedSpans and PhraseSpans.
void merge_spans(std::vector<Span>& spans);

class ProtectedSpans {
 public:
  ~ProtectedSpans();
  ProtectedSpans(const ProtectedSpans&) = delete;
  ProtectedSpans& operator=(const ProtectedSpans&) = delete;

  // Builds a detector for the built-in kinds plus `user_patterns` (ICU regex syntax).
  // Errors (kind usage) name the pattern and ICU's reason for one that does not compile.
  static Result<std::unique_ptr<ProtectedSpans>> create(
      const std::vector<std::string>& user_patterns);

  // Replaces `out` with the protected spans of `text`, sorted by begin, merged where they
  // overlap. Thread-safe (per-call scratch is thread_local or local).
  // Built-in kinds (ASCII syntax, found by hand-written scanning after a memchr pre-check):
  //   url: http:// https:// ftp:// (any case) or www. at a word start, up to white space,
  //        < > " ` or non-ASCII punctuation; trailing . , : ; ! ? ' * ~ and unbalanced ) ]
  //        are left out.
  //   email: local@domain, local of [A-Za-z0-9._%+-], domain of two or more labels whose
  //        last is two or more letters.
  //   handle: @ + [A-Za-z0-9_]+ where the @ does not follow a letter, digit or '_'.
  //   code_fence: a run of 3+ backticks up to the next run at least as long, anywhere (not
  //        only at line starts); an unterminated fence runs to the end of the text.
  //   code_inline: a run of 1 or 2 backticks up to the next run of the same length on the
  //        same line; without one the backticks are plain text. Backticks that a run of as
  //        many apostrophes closes first (before that backtick run), the apostrophes followed by
  //        the end, white space or . , ; : ! ?, are old ASCII quotes (``so'' `so'), not code.
  // User patterns match on UTF-16; their offsets are mapped back to UTF-8 bytes exactly.
  void find(std::string_view text, std::vector<Span>& out) const;

 private:
  ProtectedSpans();
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

// Finds a rule pack's protected expressions ("Mother Nature") in text: literal phrases
// matched case-insensitively (full case folding) as whole words, with any run of white
// space matching any other and U+2019 matching an apostrophe. Immutable once built and
// may be shared by threads. Not copyable.
class PhraseSpans {
 public:
  ~PhraseSpans();
  PhraseSpans(const PhraseSpans&) = delete;
  PhraseSpans& operator=(const PhraseSpans&) = delete;

  // Builds a matcher for `phrases`. Errors (kind usage) name a phrase that is empty or only
  // white space, or that is not valid UTF-8.
  static Result<std::unique_ptr<PhraseSpans>> create(const std::vector<std::string>& phrases);

  // Replaces `out` with spans of kind pack_phrase, sorted and merged as merge_spans() does.
  // A match is whole-word: a phrase that starts (ends) with a letter, digit or '_' does not
  // match right after (before) another letter, digit, mark or '_'.
  void find(std::string_view text, std::vector<Span>& out) const;

 private:
  PhraseSpans();
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace evenhand::text
