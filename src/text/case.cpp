#include "text/case.h"

#include <unicode/casemap.h>
#include <unicode/uchar.h>
#include <unicode/ustring.h>

#include <string>

#include "text/utf8.h"

namespace evenhand::text {

namespace {

inline char ascii_lower(char c) {
  return c >= 'A' && c <= 'Z' ? char(c + 32) : c;
}
inline char ascii_upper(char c) {
  return c >= 'a' && c <= 'z' ? char(c - 32) : c;
}

// Runs a UTF-16 ICU transform `f(src, len, dest, cap, status) -> length` over `utf8` and
// appends the result as UTF-8. Should ICU fail (it cannot for these transforms short of
// running out of memory), the input is appended unchanged so the text is never lost.
template <typename F>
void transform_utf16(std::string_view utf8, std::string& out, F f) {
  thread_local std::u16string src;
  thread_local std::u16string dst;
  utf8_to_utf16(utf8, src, nullptr);
  // Full case mappings grow a string at most threefold (e.g. U+0390 -> 3 code points).
  dst.resize(src.size() * 3 + 8);
  UErrorCode st = U_ZERO_ERROR;
  int32_t len = f(src.data(), int32_t(src.size()), dst.data(), int32_t(dst.size()), st);
  if (st == U_BUFFER_OVERFLOW_ERROR) {
    dst.resize(size_t(len));
    st = U_ZERO_ERROR;
    len = f(src.data(), int32_t(src.size()), dst.data(), int32_t(dst.size()), st);
  }
  if (U_FAILURE(st)) {
    out.append(utf8);
    return;
  }
  append_utf16_as_utf8(std::u16string_view(dst.data(), size_t(len)), out);
}

void title_icu(std::string_view s, std::string& out) {
  transform_utf16(s, out, [](const UChar* src, int32_t n, UChar* dst, int32_t cap, UErrorCode& st) {
    return icu::CaseMap::toTitle("", U_TITLECASE_WHOLE_STRING | U_TITLECASE_NO_LOWERCASE, nullptr,
                                 src, n, dst, cap, nullptr, st);
  });
}

void upper_icu(std::string_view s, std::string& out) {
  transform_utf16(s, out, [](const UChar* src, int32_t n, UChar* dst, int32_t cap, UErrorCode& st) {
    return u_strToUpper(dst, cap, src, n, "", &st);
  });
}

// ICU (since 60) title-cases the first character that is a letter, number, symbol or
// private use code point. In ASCII those are the letters, digits and the symbols below.
inline bool ascii_title_target(char c) {
  return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '$' ||
         c == '+' || c == '<' || c == '=' || c == '>' || c == '^' || c == '`' || c == '|' ||
         c == '~';
}

void title_ascii(std::string_view s, std::string& out) {
  size_t start = out.size();
  out.append(s);
  for (size_t i = start; i < out.size(); ++i) {
    if (ascii_title_target(out[i])) {
      out[i] = ascii_upper(out[i]);
      break;
    }
  }
}

// The first cased letter of `word` is upper (or title) case.
bool starts_upper(std::string_view word) {
  size_t i = 0;
  while (i < word.size()) {
    UChar32 c = UChar32(decode_utf8(word, i));
    if (u_isUUppercase(c) || u_istitle(c)) return true;
    if (u_isULowercase(c)) return false;
  }
  return false;
}

}  // namespace

void fold_case_icu(std::string_view utf8, std::string& out) {
  transform_utf16(utf8, out,
                  [](const UChar* src, int32_t n, UChar* dst, int32_t cap, UErrorCode& st) {
                    return u_strFoldCase(dst, cap, src, n, U_FOLD_CASE_DEFAULT, &st);
                  });
}

void fold_case(std::string_view utf8, std::string& out) {
  if (!is_ascii(utf8)) {
    fold_case_icu(utf8, out);
    return;
  }
  size_t start = out.size();
  out.append(utf8);
  for (size_t i = start; i < out.size(); ++i) out[i] = ascii_lower(out[i]);
}

CasePattern case_pattern(std::string_view word) {
  size_t cased = 0, upper = 0;
  bool first_upper = false, later_upper = false;
  size_t i = 0;
  while (i < word.size()) {
    bool up, low;
    unsigned char b = static_cast<unsigned char>(word[i]);
    if (b < 0x80) {
      up = b >= 'A' && b <= 'Z';
      low = b >= 'a' && b <= 'z';
      ++i;
    } else {
      UChar32 c = UChar32(decode_utf8(word, i));
      up = u_isUUppercase(c) || u_istitle(c);
      low = u_isULowercase(c);
    }
    if (!up && !low) continue;
    if (cased == 0)
      first_upper = up;
    else if (up)
      later_upper = true;
    ++cased;
    if (up) ++upper;
  }
  if (upper == 0) return CasePattern::lower;
  if (first_upper && !later_upper) return CasePattern::title;
  if (upper == cased) return CasePattern::upper;
  return CasePattern::mixed;
}

void apply_case_icu(std::string_view replacement, CasePattern pattern, std::string& out) {
  switch (pattern) {
    case CasePattern::title:
      title_icu(replacement, out);
      return;
    case CasePattern::upper:
      upper_icu(replacement, out);
      return;
    case CasePattern::lower:
    case CasePattern::mixed:
      break;
  }
  out.append(replacement);
}

void apply_case(std::string_view replacement, CasePattern pattern, std::string& out) {
  if (pattern == CasePattern::lower || pattern == CasePattern::mixed) {
    out.append(replacement);
    return;
  }
  if (!is_ascii(replacement)) {
    apply_case_icu(replacement, pattern, out);
    return;
  }
  if (pattern == CasePattern::title) {
    title_ascii(replacement, out);
    return;
  }
  size_t start = out.size();
  out.append(replacement);
  for (size_t i = start; i < out.size(); ++i) out[i] = ascii_upper(out[i]);
}

void match_case(std::string_view replacement, std::string_view original, std::string& out) {
  CasePattern p = case_pattern(original);
  if (p == CasePattern::mixed && starts_upper(original)) p = CasePattern::title;
  apply_case(replacement, p, out);
}

}  // namespace evenhand::text
