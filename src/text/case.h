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

// Appends the Unicode full case folding of `utf8` (ICU u_strFoldCase, default options).
void fold_case(std::string_view utf8, std::string& out);

// Classifies the case of `word`.
CasePattern case_pattern(std::string_view word);

// Appends `replacement` (as written in the pack, e.g. "he" or "McKay") re-cased to follow
// `pattern`: lower -> as written in the pack, title -> first letter upper-cased (title case),
// upper -> all upper, mixed -> as written in the pack (best effort: if the original's first
// letter is upper the replacement's is upper too).
void apply_case(std::string_view replacement, CasePattern pattern, std::string& out);

}  // namespace evenhand::text
