#include "rewrite/en/article.h"

#include <array>
#include <cstddef>
#include <cstdint>

namespace evenhand::rewrite {

namespace {

constexpr size_t kMaxLetters = 32;

// The leading letters of a word, lower-cased ASCII (accented Latin-1 letters folded to their
// base letter), with what the rules need to know about the rest.
struct Letters {
  std::array<char, kMaxLetters> buf{};
  size_t n = 0;             // letters kept in buf
  bool whole = true;        // buf holds all the letters of the run (not cut at kMaxLetters)
  bool all_upper = true;    // every letter of the run was a capital
  size_t upper_run = 0;     // capitals before a first small letter
  bool trailing_s = false;  // the run is capitals followed by one small "s" ("MRIs")
  std::string_view view() const { return {buf.data(), n}; }
};

bool is_ascii_letter(unsigned char c) {
  return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');
}

// Folds the Latin-1 letter encoded as C3 xx in UTF-8 to its base ASCII letter (lower case), or
// 0 when xx is not a letter this unit knows. Sets `upper` for the capital ones.
char fold_latin1(unsigned char second, bool& upper) {
  upper = second < 0xA0;
  unsigned char c = upper ? static_cast<unsigned char>(second + 0x20) : second;
  if (c >= 0xA0 && c <= 0xA6) return 'a';
  if (c == 0xA7) return 'c';
  if (c >= 0xA8 && c <= 0xAB) return 'e';
  if (c >= 0xAC && c <= 0xAF) return 'i';
  if (c == 0xB1) return 'n';
  if ((c >= 0xB2 && c <= 0xB6) || c == 0xB8) return 'o';
  if (c >= 0xB9 && c <= 0xBC) return 'u';
  if (c == 0xBD) return 'y';
  return 0;
}

// Reads the run of letters that starts at `s[i]`. Returns the index after the run.
size_t read_letters(std::string_view s, size_t i, Letters& out) {
  size_t total = 0;
  bool seen_lower = false;
  while (i < s.size()) {
    unsigned char c = static_cast<unsigned char>(s[i]);
    char folded = 0;
    bool upper = false;
    size_t width = 1;
    if (is_ascii_letter(c)) {
      upper = c <= 'Z';
      folded = static_cast<char>(upper ? c + ('a' - 'A') : c);
    } else if (c == 0xC3 && i + 1 < s.size()) {
      folded = fold_latin1(static_cast<unsigned char>(s[i + 1]), upper);
      width = 2;
    }
    if (folded == 0) break;
    if (upper && !seen_lower) ++out.upper_run;
    if (!upper) {
      seen_lower = true;
      out.all_upper = false;
    }
    if (out.n < kMaxLetters) {
      out.buf[out.n++] = folded;
    } else {
      out.whole = false;
    }
    ++total;
    i += width;
  }
  out.trailing_s =
      out.upper_run >= 2 && total == out.upper_run + 1 && out.n > 0 && out.buf[out.n - 1] == 's';
  return i;
}

bool starts_with(std::string_view s, std::string_view p) {
  return s.substr(0, p.size()) == p;
}

bool is_vowel(char c) {
  return c == 'a' || c == 'e' || c == 'i' || c == 'o' || c == 'u';
}

// Letters whose English names begin with a vowel sound: "an F", "an R", "an X" (from memory).
bool letter_name_takes_an(char c) {
  switch (c) {
    case 'a':
    case 'e':
    case 'f':
    case 'h':
    case 'i':
    case 'l':
    case 'm':
    case 'n':
    case 'o':
    case 'r':
    case 's':
    case 'x':
      return true;
    default:
      return false;
  }
}

// The rules for a word read as a word (lower-case letters `w`; `whole` when w is all of it).
bool word_takes_an(std::string_view w, bool whole) {
  if (w.empty()) return false;
  auto is = [&](std::string_view x) { return whole && w == x; };
  // Silent h (from memory; "herb" as in US usage). "herbal" but not "Herbert".
  for (std::string_view p : {"heir", "honest", "honor", "honour", "hour", "herbal"}) {
    if (starts_with(w, p)) return true;
  }
  if (is("herb") || is("herbs")) return true;
  // "w"-sounding o (one, once) and "w"-sounding ou (ouija).
  for (std::string_view x : {"one", "ones", "once", "oneself", "oneness", "onetime"}) {
    if (is(x)) return false;
  }
  if (starts_with(w, "ouija")) return false;
  // "you"-sounding eu and ew (European, eulogy, ewe).
  if (starts_with(w, "eu") || starts_with(w, "ew")) return false;
  if (w[0] == 'u') {
    if (w.size() == 1) return true;
    // uni- is "you-nee" (university, unicorn, union), except the negative un- before in-, im-,
    // id- (uninformed, unimportant, unidentified).
    if (starts_with(w, "uni")) {
      return starts_with(w, "unin") || starts_with(w, "unim") || starts_with(w, "unid");
    }
    if (starts_with(w, "unanim")) return false;  // unanimous
    if (starts_with(w, "un")) return true;       // the negative prefix: an unusual, an uncle
    if (starts_with(w, "ukr")) return false;     // Ukraine, Ukrainian
    // u + one consonant + vowel is "you" (use, usual, utensil, ubiquitous, urine); a
    // consonant cluster or a double consonant is the short u (under, utter, usher, ugly).
    // m, n and p are left out: umami, upon, upend have the short or long u without "y".
    if (w.size() >= 3 && !is_vowel(w[1]) && w[1] != 'y' && w[1] != 'm' && w[1] != 'n' &&
        w[1] != 'p' && (is_vowel(w[2]) || w[2] == 'y')) {
      return false;
    }
    return true;
  }
  // y before a consonant is a vowel sound (Yvonne, Yvette, ytterbium).
  if (w[0] == 'y') return w.size() >= 2 && !is_vowel(w[1]) && w[1] != 'y';
  return is_vowel(w[0]);
}

// "an 8", "an 80", "an 11", "an 18,000", "an 11.5"; otherwise "a" (from memory).
bool number_takes_an(std::string_view s, size_t i) {
  size_t digits = 0;
  char first = s[i], second = 0;
  for (; i < s.size(); ++i) {
    char c = s[i];
    if (c >= '0' && c <= '9') {
      if (digits == 1) second = c;
      ++digits;
    } else if (c == ',' && i + 1 < s.size() && s[i + 1] >= '0' && s[i + 1] <= '9') {
      continue;  // a group separator inside the number
    } else {
      break;
    }
  }
  if (first == '8') return true;
  return first == '1' && (second == '1' || second == '8') && digits % 3 == 2;
}

}  // namespace

std::string_view choose_article(std::string_view next_word, CapitalsAs capitals) {
  size_t i = 0;
  // Skip opening quotes and brackets: ASCII, and U+2018 / U+201C (E2 80 98, E2 80 9C).
  while (i < next_word.size()) {
    char c = next_word[i];
    if (c == '"' || c == '\'' || c == '(' || c == '[' || c == '{') {
      ++i;
    } else if (next_word.substr(i, 3) == "\xE2\x80\x98" ||
               next_word.substr(i, 3) == "\xE2\x80\x9C") {
      i += 3;
    } else {
      break;
    }
  }
  if (i >= next_word.size()) return "a";
  char c = next_word[i];
  if (c >= '0' && c <= '9') return number_takes_an(next_word, i) ? "an" : "a";
  Letters letters;
  read_letters(next_word, i, letters);
  if (letters.n == 0) return "a";
  std::string_view w = letters.view();
  char first = w[0];
  // One letter, spoken by its name: "an F", "an X-ray", "a U-turn".
  if (letters.n == 1 && letters.whole) return letter_name_takes_an(first) ? "an" : "a";
  // An abbreviation in capitals read letter by letter: two or three capitals ("an MRI", "a
  // UFO", "an FBI"), or more with no vowel letter ("an HTML"), optionally with a plural "s".
  size_t caps = letters.trailing_s ? letters.upper_run : (letters.all_upper ? letters.n : 0);
  if (capitals == CapitalsAs::letters_if_short && caps >= 2 && letters.whole) {
    bool vowel = false;
    for (size_t k = 0; k < caps; ++k) vowel = vowel || is_vowel(w[k]);
    if (caps <= 3 || !vowel) return letter_name_takes_an(first) ? "an" : "a";
  }
  return word_takes_an(w, letters.whole) ? "an" : "a";
}

void recase_article(std::string_view original_article, std::string_view chosen, std::string& out) {
  out.assign(chosen);
  if (original_article.empty() || out.empty()) return;
  auto upper = [](char ch) { return ch >= 'A' && ch <= 'Z'; };
  auto lower = [](char ch) { return ch >= 'a' && ch <= 'z'; };
  bool rest_upper = original_article.size() >= 2, rest_lower = true;
  for (size_t k = 1; k < original_article.size(); ++k) {
    rest_upper = rest_upper && upper(original_article[k]);
    rest_lower = rest_lower && lower(original_article[k]);
  }
  if (upper(original_article[0]) && rest_upper) {
    for (char& ch : out) {
      if (lower(ch)) ch = static_cast<char>(ch - ('a' - 'A'));
    }
  } else if (upper(original_article[0]) && rest_lower) {
    if (lower(out[0])) out[0] = static_cast<char>(out[0] - ('a' - 'A'));
  }
}

bool is_indefinite_article(std::string_view word) {
  if (word.size() == 1) return word[0] == 'a' || word[0] == 'A';
  return word.size() == 2 && (word[0] == 'a' || word[0] == 'A') &&
         (word[1] == 'n' || word[1] == 'N');
}

}  // namespace evenhand::rewrite
