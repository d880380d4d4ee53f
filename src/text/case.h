// Case folding for matching, and carrying the case pattern of an original word to its
// replacement (she -> he, She -> He, SHE -> HE). ASCII fast paths; ICU for everything else.
#pragma once

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

// Reference paths that always go through ICU (no ASCII fast path). Same results as the
// functions above; exposed so tests can check the fast paths against ICU.
void fold_case_icu(std::string_view utf8, std::string& out);
void apply_case_icu(std::string_view replacement, CasePattern pattern, std::string& out);

}  // namespace evenhand::text
