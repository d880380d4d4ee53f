// JSON Pointers (RFC 6901) naming the fields to rewrite, extended with one wildcard: a
// reference token that is exactly "*" matches every element of an array and every member of
// an object ("/messages/*/content"). "~0" and "~1" decode to "~" and "/" as in the RFC.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "base/status.h"

namespace evenhand::corpus {

class PointerPattern {
 public:
  struct Token {
    std::string key;        // decoded reference token
    bool wildcard = false;  // the token was "*"
  };

  // Parses a pointer such as "/a/*/b". "" is the whole document. Errors (kind usage) for a
  // pointer that does not start with "/" or holds a "~" not followed by 0 or 1.
  static Result<PointerPattern> parse(std::string_view text);

  const std::vector<Token>& tokens() const { return tokens_; }
  const std::string& text() const { return text_; }

 private:
  std::vector<Token> tokens_;
  std::string text_;
};

// Appends `key` to `pointer` as one reference token ("/" + key with "~" -> "~0", "/" -> "~1").
void append_pointer_token(std::string& pointer, std::string_view key);

}  // namespace evenhand::corpus
