// Private to the pack layer: the character rules for forms and names, folding of whole
// phrases, and the UTF-8 helpers the parser needs. Pure functions, no state; thread-safe.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace evenhand::pack::detail {

// Byte offset of the first invalid UTF-8 sequence in `s`, or nullopt when `s` is valid.
std::optional<size_t> find_invalid_utf8(std::string_view s);

// Why `form` (already trimmed, inner white space collapsed to single spaces) cannot be a form
// or a name, or nullopt when it is well formed: letters and combining marks, with single
// spaces, hyphens and apostrophes (' or U+2019) between them, in Unicode NFC.
std::optional<std::string> form_problem(std::string_view form);

// The folded tokens of a form (form_tokens, each folded with fold_word).
std::vector<std::string> folded_tokens(std::string_view form);

// Joins folded tokens back into readable text: a space between two word tokens, none around
// hyphen and apostrophe tokens ("step-mother", "best man", "girls'").
std::string join_tokens(const std::vector<std::string>& tokens);

// True when the token is a word (not a lone hyphen or apostrophe).
bool is_word_token(std::string_view token);

// Case-folded phrase with runs of white space collapsed to one space, for duplicate checks.
std::string phrase_key(std::string_view phrase);

}  // namespace evenhand::pack::detail
