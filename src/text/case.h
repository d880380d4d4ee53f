// Case folding for matching, and carrying the case pattern of an original word to its
// replacement (she -> he, She -> He, SHE -> HE). ASCII fast paths; ICU for everything else.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

namespace evenhand::text {

enum class CasePattern {
  lower,  // "she", also words with no cased letters
  title,  // "She": first cased letter upper, the rest lower
  upper,  // "SHE" (a single upper-case letter such as "I" counts as title)
  mixed,  // anything else, e.g. "McDonald"
};

// Appends the Unicode full case folding of `utf8` (ICU u_strFoldCase, default options, so
// the root-locale mappings: "I" folds to "i", never to dotless i). Pure ASCII is lowered
// byte by byte; anything else goes through ICU on UTF-16. Ill-formed bytes become U+FFFD.
void fold_case(std::string_view utf8, std::string& out);

// Returns the case pattern of `word` (see CasePattern), judged on its cased letters only.
CasePattern case_pattern(std::string_view word);

// Appends `replacement` (as written in the pack, e.g. "he" or "McKay") re-cased to follow
// `pattern`: lower -> as written in the pack, title -> the first letter (ICU's titlecase
// adjustment: first letter or digit) title-cased and the rest left as written, upper -> all
// upper (ICU u_strToUpper, root locale: "ß" becomes "SS"), mixed -> as written in the pack.
// The pattern alone cannot say whether a mixed original began upper; use match_case().
void apply_case(std::string_view replacement, CasePattern pattern, std::string& out);

// Appends `replacement` re-cased after the word it replaces: apply_case() with
// case_pattern(original), except that for a mixed original ("McDonald") whose first cased
// letter is upper the replacement's first letter is title-cased too (best effort).
void match_case(std::string_view replacement, std::string_view original, std::string& out);

// ASCII lower-casing of eight bytes at once (a uint64_t as loaded from memory): bytes 'A'..'Z'
// gain 0x20, every other byte (non-ASCII ones included) stays. No carry crosses a byte: after
// the mask every byte is below 0x80, and adding 0x3F or 0x25 keeps it below 0x100.
inline uint64_t ascii_lower8(uint64_t v) {
  constexpr uint64_t kHigh = 0x8080808080808080ULL;
  uint64_t low7 = v & ~kHigh;
  uint64_t ge_a = low7 + 0x3F3F3F3F3F3F3F3FULL;  // high bit set where the byte is >= 'A'
  uint64_t gt_z = low7 + 0x2525252525252525ULL;  // high bit set where the byte is > 'Z'
  uint64_t upper = (ge_a ^ gt_z) & ~v & kHigh;
  return v | (upper >> 2);
}

// Reference paths that always go through ICU (no ASCII fast path). Same results as the
// functions above; exposed so tests can check the fast paths against ICU.
void fold_case_icu(std::string_view utf8, std::string& out);
void apply_case_icu(std::string_view replacement, CasePattern pattern, std::string& out);

}  // namespace evenhand::text
