// Character rules for forms, and token splitting that mirrors UAX #29 on the characters a
// form may contain. Case folding is the text layer's (ICU full case folding).
#include "pack/forms.h"

#include <cstdio>

#include <unicode/uchar.h>
#include <unicode/unorm2.h>
#include <unicode/ustring.h>
#include <unicode/utf8.h>

#include "pack/pack.h"
#include "text/case.h"

namespace evenhand::pack {

namespace {

constexpr UChar32 kRightSingleQuote = 0x2019;

bool is_letter_or_mark(UChar32 c) {
  return (U_GET_GC_MASK(c) & (U_GC_L_MASK | U_GC_M_MASK)) != 0;
}

bool is_apostrophe(UChar32 c) {
  return c == '\'' || c == kRightSingleQuote;
}

// Code points of a valid UTF-8 string, with the byte offset where each starts.
struct CodePoint {
  UChar32 c;
  size_t begin, end;
};

std::vector<CodePoint> code_points(std::string_view s) {
  std::vector<CodePoint> out;
  const auto* p = reinterpret_cast<const uint8_t*>(s.data());
  int32_t len = static_cast<int32_t>(s.size());
  int32_t i = 0;
  while (i < len) {
    int32_t start = i;
    UChar32 c;
    U8_NEXT(p, i, len, c);
    out.push_back({c, static_cast<size_t>(start), static_cast<size_t>(i)});
  }
  return out;
}

}  // namespace

std::string fold_word(std::string_view token) {
  std::string folded;
  text::fold_case(token, folded);
  // U+2019 is E2 80 99 in UTF-8; case folding leaves it alone.
  std::string out;
  out.reserve(folded.size());
  for (size_t i = 0; i < folded.size(); ++i) {
    if (folded.compare(i, 3, "\xE2\x80\x99") == 0) {
      out += '\'';
      i += 2;
    } else {
      out += folded[i];
    }
  }
  return out;
}

std::vector<std::string> form_tokens(std::string_view form) {
  std::vector<std::string> tokens;
  std::vector<CodePoint> cps = code_points(form);
  std::string word;
  auto flush = [&] {
    if (!word.empty()) tokens.push_back(std::move(word));
    word.clear();
  };
  for (size_t i = 0; i < cps.size(); ++i) {
    UChar32 c = cps[i].c;
    std::string_view bytes = form.substr(cps[i].begin, cps[i].end - cps[i].begin);
    if (c == ' ' || c == '\t') {
      flush();
    } else if (c == '-') {
      flush();
      tokens.emplace_back("-");
    } else if (is_apostrophe(c)) {
      // UAX #29 WB6/WB7: a letter, an apostrophe, a letter do not break.
      bool between_letters = i > 0 && i + 1 < cps.size() && is_letter_or_mark(cps[i - 1].c) &&
                             is_letter_or_mark(cps[i + 1].c) && !word.empty();
      if (between_letters) {
        word += bytes;
      } else {
        flush();
        tokens.emplace_back(bytes);
      }
    } else {
      word += bytes;
    }
  }
  flush();
  return tokens;
}

namespace detail {

std::optional<size_t> find_invalid_utf8(std::string_view s) {
  const auto* p = reinterpret_cast<const uint8_t*>(s.data());
  int32_t len = static_cast<int32_t>(s.size());
  int32_t i = 0;
  while (i < len) {
    int32_t start = i;
    UChar32 c;
    U8_NEXT(p, i, len, c);
    if (c < 0) return static_cast<size_t>(start);
  }
  return std::nullopt;
}

std::optional<std::string> form_problem(std::string_view form) {
  if (form.empty()) return "the form is empty";
  std::vector<CodePoint> cps = code_points(form);
  bool any_letter = false;
  for (size_t i = 0; i < cps.size(); ++i) {
    UChar32 c = cps[i].c;
    bool first = i == 0, last = i + 1 == cps.size();
    if (is_letter_or_mark(c)) {
      any_letter = true;
    } else if (c == ' ' || c == '-') {
      if (first || last)
        return std::string("a form cannot begin or end with '") + static_cast<char>(c) + "'";
      UChar32 next = cps[i + 1].c;
      if (next == ' ' || next == '-')
        return "a hyphen or space must stand between two letters or apostrophes";
    } else if (is_apostrophe(c)) {
      // allowed anywhere a letter could stand next to it: "mother's", "grandmothers'"
    } else {
      std::string shown(form.substr(cps[i].begin, cps[i].end - cps[i].begin));
      char hex[16];
      std::snprintf(hex, sizeof hex, "U+%04X", static_cast<unsigned>(c));
      return "'" + shown + "' (" + hex +
             ") is not allowed in a form (letters, single spaces, hyphens and apostrophes only)";
    }
  }
  if (!any_letter) return "a form needs at least one letter";
  UErrorCode status = U_ZERO_ERROR;
  const UNormalizer2* nfc = unorm2_getNFCInstance(&status);
  if (U_SUCCESS(status)) {
    int32_t len16 = 0;
    UErrorCode st = U_ZERO_ERROR;
    u_strFromUTF8(nullptr, 0, &len16, form.data(), static_cast<int32_t>(form.size()), &st);
    std::u16string s16(static_cast<size_t>(len16), u'\0');
    st = U_ZERO_ERROR;
    u_strFromUTF8(s16.data(), len16, nullptr, form.data(), static_cast<int32_t>(form.size()), &st);
    st = U_ZERO_ERROR;
    if (!unorm2_isNormalized(nfc, s16.data(), len16, &st) && U_SUCCESS(st))
      return "the form is not in Unicode normalization form C (NFC)";
  }
  return std::nullopt;
}

std::vector<std::string> folded_tokens(std::string_view form) {
  std::vector<std::string> tokens = form_tokens(form);
  for (auto& t : tokens) t = fold_word(t);
  return tokens;
}

bool is_word_token(std::string_view token) {
  return !(token == "-" || token == "'");
}

std::string join_tokens(const std::vector<std::string>& tokens) {
  std::string out;
  for (size_t i = 0; i < tokens.size(); ++i) {
    if (i > 0 && is_word_token(tokens[i]) && is_word_token(tokens[i - 1])) out += ' ';
    out += tokens[i];
  }
  return out;
}

std::string phrase_key(std::string_view phrase) {
  std::string collapsed;
  bool space = false;
  for (char ch : phrase) {
    if (ch == ' ' || ch == '\t') {
      space = true;
      continue;
    }
    if (space && !collapsed.empty()) collapsed += ' ';
    space = false;
    collapsed += ch;
  }
  return fold_word(collapsed);
}

}  // namespace detail
}  // namespace evenhand::pack
