// English indefinite article agreement: when an edit changes the word after "a"/"an" ("an
// actress" -> "a performer"), picks "a" or "an" by the new word's first sound and keeps the
// article's case. Promises: pure, thread-safe functions; choose_article does not allocate.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

namespace evenhand::rewrite {

// The article ("a" or "an", lower case) that goes before `next_word` as written (UTF-8; case
// matters only for abbreviations). The rules, by the word's first sound (common practice;
// spellings from general knowledge of English, from memory):
//   - a vowel letter (a e i o u, also the accented Latin-1 ones: é, à, ...) -> "an", except
//     "you"-sounding u and eu/ew (a university, a unicorn, a user, a European, a ewe) and
//     "w"-sounding o (a one, a once-only);
//   - a consonant -> "a", except silent h (an hour, an honest, an honour/honor, an heir,
//     an herb: US usage) and y before a consonant (an Yvonne);
//   - one letter is read by its name: "an F", "an X-ray", "a U-turn";
//   - with CapitalsAs::letters_if_short, a word in capitals of two or three letters (or
//     longer with no vowel letter, optionally with a plural "s") is an abbreviation read
//     letter by letter: "an MRI", "an HTML", "an SUVs", "a UFO". With CapitalsAs::word (the
//     default) capitals are read as a word, which is right for text written in capitals
//     ("A MAN" -> "A MAN", not "AN MAN") and for the pack's forms, which are never
//     abbreviations;
//   - a number by how it is read: "an 8", "an 80", "an 11", "an 18,000" -> "an"; others "a".
// Leading quotes and brackets are skipped. An empty word (or one with no letter or digit)
// gets "a".
enum class CapitalsAs : uint8_t { word, letters_if_short };
std::string_view choose_article(std::string_view next_word, CapitalsAs capitals = CapitalsAs::word);

// Writes `chosen` ("a" or "an") into `out` (replacing its content) in the case of
// `original_article` as written: "an"/"a" -> lower case, "An"/"A" -> capitalised ("A" is read
// as capitalised, since one capital letter cannot tell "A" from all capitals), "AN" ->
// all capitals. Anything else in `original_article` -> `chosen` as given.
void recase_article(std::string_view original_article, std::string_view chosen, std::string& out);

// True when `word` (any case) is the English indefinite article "a" or "an".
bool is_indefinite_article(std::string_view word);

}  // namespace evenhand::rewrite
