#include "corpus/json_reason.h"

#include <simdjson.h>

#include <cstring>
#include <utility>

#include "corpus/json_string.h"

namespace evenhand::corpus {

namespace {

constexpr size_t npos = std::string_view::npos;

size_t skip_ws(std::string_view s, size_t i) {
  while (i < s.size() && is_json_ws(s[i])) ++i;
  return i;
}

// End (one past the closing quote) of the string token that opens at s[i], or npos.
size_t string_end(std::string_view s, size_t i) {
  for (++i; i < s.size(); ++i) {
    if (s[i] == '\\')
      ++i;
    else if (s[i] == '"')
      return i + 1;
  }
  return npos;
}

// End of the value that starts at s[i]: brackets balanced (strings skipped), or the end of a
// bare token; npos when it never closes.
size_t value_end(std::string_view s, size_t i) {
  if (s[i] == '"') return string_end(s, i);
  if (s[i] != '{' && s[i] != '[') {
    while (i < s.size() && !is_json_ws(s[i]) && !std::strchr(",:[]{}\"", s[i])) ++i;
    return i;
  }
  int depth = 0;
  for (; i < s.size(); ++i) {
    const char c = s[i];
    if (c == '"') {
      const size_t e = string_end(s, i);
      if (e == npos) return npos;
      i = e - 1;
    } else if (c == '{' || c == '[') {
      ++depth;
    } else if ((c == '}' || c == ']') && --depth == 0) {
      return i + 1;
    }
  }
  return npos;
}

bool is_letter(char c) {
  return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');
}

// Offset of the first NaN or Infinity (any case, optionally signed) where a value may
// start, with its spelling; npos when there is none.
std::pair<size_t, std::string_view> non_finite(std::string_view s) {
  bool value_here = true;
  for (size_t i = 0; i < s.size(); ++i) {
    const char c = s[i];
    if (is_json_ws(c)) continue;
    if (c == '"') {
      const size_t e = string_end(s, i);
      if (e == npos) break;
      i = e - 1;
      value_here = false;
      continue;
    }
    if (value_here) {
      size_t k = i + (c == '-' || c == '+');
      const size_t word = k;
      while (k < s.size() && is_letter(s[k])) ++k;
      std::string w(s.substr(word, k - word));
      for (char& ch : w) ch = static_cast<char>(ch | 0x20);
      if (w == "nan" || w == "infinity" || w == "inf") return {i, s.substr(i, k - i)};
    }
    value_here = c == ':' || c == ',' || c == '[';
  }
  return {npos, {}};
}

bool valid_json(std::string_view s) {
  simdjson::dom::parser parser;
  simdjson::dom::element ignored;
  return !parser.parse(s.data(), s.size(), true).get(ignored);
}

}  // namespace

std::optional<std::string> explain_invalid_json(std::string_view record) {
  if (auto [at, word] = non_finite(record); at != npos) {
    return "invalid JSON: " + std::string(word) + " at byte " + std::to_string(at) +
           " of the record is not a JSON number (JSON has no NaN or Infinity)";
  }
  const size_t begin = skip_ws(record, 0);
  if (begin == record.size()) return std::nullopt;
  const size_t end = value_end(record, begin);
  if (end == npos) return std::nullopt;
  const size_t rest = skip_ws(record, end);
  if (rest == record.size() || !valid_json(record.substr(0, end))) return std::nullopt;
  return "invalid JSON: trailing characters after the JSON value, at byte " + std::to_string(rest) +
         " of the record";
}

}  // namespace evenhand::corpus
