// Protected spans: parts of a text that are never rewritten, such as URLs, e-mail addresses,
// @handles, fenced and inline code, and user patterns (ICU regular expressions). The
// detector is built once, is immutable, and may be shared by threads.
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
  uint8_t kind = 0;    // a SpanKind
};

enum SpanKind : uint8_t { url = 0, email, handle, code_fence, code_inline, user_pattern, pack_phrase };

const char* span_kind_name(uint8_t kind);

class ProtectedSpans {
 public:
  ~ProtectedSpans();
  ProtectedSpans(const ProtectedSpans&) = delete;
  ProtectedSpans& operator=(const ProtectedSpans&) = delete;

  // Builds a detector for the built-in kinds plus `user_patterns` (ICU regex syntax).
  // Errors (kind usage) name the pattern and ICU's reason for one that does not compile.
  static Result<std::unique_ptr<ProtectedSpans>> create(const std::vector<std::string>& user_patterns);

  // Replaces `out` with the protected spans of `text`, sorted by begin, merged where they
  // overlap. Thread-safe (per-call scratch is thread_local or local).
  void find(std::string_view text, std::vector<Span>& out) const;

 private:
  ProtectedSpans();
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

}  // namespace evenhand::text
