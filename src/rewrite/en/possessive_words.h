// The English word lists of the "her"/"his" slot model (possessive.h), read from the pack's
// word-classes.data (written by rules/tools/build_word_classes.py): each word's closed-class
// category, a model feature, and the word sets the model's rules test. Immutable; thread-safe.
#pragma once

#include <cstdint>
#include <memory>
#include <string>
#include <string_view>

#include "base/flat_map.h"
#include "base/status.h"

namespace evenhand::rewrite {

// The pack file, next to possessive.model.
inline constexpr const char* kWordClassesFile = "word-classes.data";

class PossessiveWords {
 public:
  // The word sets of the rules (the file's kinds that are no closed-class category).
  enum class Set : uint8_t {
    finite_verb,             // finite be/have/do or modal that is not also a noun: "was"
    object_participle_verb,  // takes an object, then a past participle: "got (her) acquitted"
    day_adverb,              // a day word used as an adverb: "tomorrow"
    adjective_preposition,   // a preposition that is an adjective before a nominal: "inside"
    adverb_noun,             // an adverb as often a noun: "back"
    after_possessive,        // a determiner that can follow a possessive: "every"
    count
  };

  // Parses word-classes.data: a format line, then `KIND WORD` records. Errors (kind pack)
  // name `file` and the line: a malformed record, an unknown kind, a word that is not lower
  // case a-z and apostrophes, a word listed twice for a kind or given two closed-class
  // categories; and (no line) a kind with no word.
  static Result<std::shared_ptr<const PossessiveWords>> parse(std::string_view text,
                                                              const std::string& file);

  // The closed-class category of a folded word as the model's features name it ("det",
  // "prep", "conj", "sub", "subj", "obj", "poss", "stand", "aux", "neg", "vobj", "to", "her"),
  // or "w" for any other word. Does not allocate.
  std::string_view category(std::string_view folded) const {
    const Entry* e = words_.find(folded);
    return e == nullptr ? std::string_view("w") : e->category;
  }
  // Whether a folded word is in one of the rules' sets. Does not allocate.
  bool has(Set set, std::string_view folded) const {
    const Entry* e = words_.find(folded);
    return e != nullptr && (e->sets >> static_cast<unsigned>(set) & 1u);
  }

 private:
  struct Entry {
    std::string_view category = "w";  // points at a static label
    uint32_t sets = 0;                // 1 << Set
  };
  // Adds one record; returns the reason it is wrong, or "". Marks its kind in `seen_kinds`
  // (1 << the kind's place in the file's kind table).
  std::string add(std::string_view line, uint32_t& seen_kinds);
  FlatStringMap<Entry> words_;  // probed for every window word of every decision
};

}  // namespace evenhand::rewrite
