// JSON Pointer parsing (RFC 6901 section 3 and 4) with the "*" wildcard extension.
#include "corpus/json_pointer.h"

namespace evenhand::corpus {

Result<PointerPattern> PointerPattern::parse(std::string_view text) {
  PointerPattern p;
  p.text_ = std::string(text);
  if (text.empty()) return p;  // the whole document
  if (text.front() != '/') {
    return make_error(ErrorKind::usage, "",
                      "JSON pointer \"" + std::string(text) + "\" does not start with '/'");
  }
  size_t pos = 1;
  while (true) {
    size_t slash = text.find('/', pos);
    std::string_view raw =
        text.substr(pos, slash == std::string_view::npos ? text.npos : slash - pos);
    Token tok;
    tok.key.reserve(raw.size());
    for (size_t i = 0; i < raw.size(); ++i) {
      char c = raw[i];
      if (c != '~') {
        tok.key.push_back(c);
        continue;
      }
      // RFC 6901 section 4: "~1" becomes "/" and "~0" becomes "~"; a single left-to-right
      // pass gives the required order ("~01" decodes to "~1", not "/").
      char next = i + 1 < raw.size() ? raw[i + 1] : '\0';
      if (next == '0') {
        tok.key.push_back('~');
      } else if (next == '1') {
        tok.key.push_back('/');
      } else {
        return make_error(ErrorKind::usage, "",
                          "JSON pointer \"" + std::string(text) +
                              "\" has '~' not followed by '0' or '1' (write \"~0\" for '~')");
      }
      ++i;
    }
    tok.wildcard = raw == "*";
    p.tokens_.push_back(std::move(tok));
    if (slash == std::string_view::npos) break;
    pos = slash + 1;
  }
  return p;
}

void append_pointer_token(std::string& pointer, std::string_view key) {
  pointer.push_back('/');
  for (char c : key) {
    if (c == '~') {
      pointer += "~0";
    } else if (c == '/') {
      pointer += "~1";
    } else {
      pointer.push_back(c);
    }
  }
}

}  // namespace evenhand::corpus
