// English person evidence: whether a listed first name, at one place in a field, names a
// person ("Grace said") or something else ("Grace Hospital", "Will you", "Dr. Grace"). Reads the
// words around the name and the lexicons of the pack's person-context.data (built from
// WordNet 3.0 and hand lists by rules/tools/build_person_context.py). Immutable; thread-safe.
#pragma once

#include <array>
#include <cstdint>
#include <functional>
#include <memory>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "base/flat_map.h"
#include "base/status.h"
#include "pack/pack.h"
#include "rewrite/en/verb_agreement.h"
#include "rewrite/field_tokens.h"

namespace evenhand::rewrite::en {

// The data file whose presence switches person evidence on, and the optional list of first
// names both sexes carry (format line, then one folded name a line).
inline constexpr const char* kPersonContextFile = "person-context.data";
inline constexpr const char* kMixedNamesFile = "mixed-names.data";

// The word lists of person-context.data (the file's KIND column).
enum class Lexicon : uint8_t {
  thing_head,         // ends a multi-word name of a place or organisation: "Street", "Labs"
  thing_name,         // a listed first name that is also a name of a place or thing: "Virginia"
  surname,            // known as a person's surname: "Smith"
  person_verb,        // a verb form that takes a person as subject: "said", "wrote"
  title,              // a form of address before a surname: "Mr", "Dr", "Senator"
  given_title,        // a form of address before a first name: "Aunt", "Sir", "Sister"
  place_prefix,       // opens a place or saint's name: "San", "Fort", "New"
  greeting,           // addresses the name after it: "Dear", "Hi", "Thanks"
  word_name,          // a listed first name that is also a common lower-case word: "Bill", "Rose"
  rare_name,          // a listed first name few babies get: needs evidence ("Borg", "Pascal")
  common_word,        // a common lower-case word of English: "hat", "star"
  proper_thing,       // a single-word name of a place, organisation or thing: "Norway", "Monday"
  place_preposition,  // "at", "in": a thing-name after one reads as the place
  apposition,         // opens a description after "Name,": "one", "a", "our"
  mixed_name,         // a first name both sexes carry (mixed-names.data): never swapped
  count
};

class PersonContext {
 public:
  // Parses person-context.data; errors name `file` and the line.
  static Result<std::shared_ptr<const PersonContext>> parse(std::string_view text,
                                                            const std::string& file);
  // Both files of a pack: person-context.data, and mixed-names.data when the pack has it.
  static Result<std::shared_ptr<const PersonContext>> from_pack(const pack::CompiledPack& pack);
  bool has(Lexicon list, std::string_view folded) const;
  // The lists that hold `folded`, one bit per Lexicon (1 << list): one lookup for all.
  uint32_t lists_of(std::string_view folded) const {
    const uint32_t* m = words_.find(folded);
    return m ? *m : 0;
  }
  size_t size(Lexicon list) const { return sizes_[static_cast<size_t>(list)]; }
  const std::vector<std::string>& mixed_names() const { return mixed_; }

 private:
  static std::optional<Error> read_context(std::string_view text, const std::string& file,
                                           PersonContext& into);
  void add(std::string_view word, Lexicon list);
  FlatStringMap<uint32_t> words_;  // word -> lists it is in
  std::array<size_t, static_cast<size_t>(Lexicon::count)> sizes_{};
  std::vector<std::string> mixed_;
};

// What the engine knows at one occurrence of a listed first name.
struct NameSite {
  std::span<const FieldToken> tokens;  // the field's tokens (no white space)
  std::string_view text;               // the field
  size_t at = 0;                       // the name's token
  // The name's pair holds a common word (word-name entries; without them, the pack's ~word
  // mark): the whole pair needs evidence, so rewriting a counterfactual again gives back the
  // original name.
  bool word_like = false;
  // Whether a folded word is a listed first name, and whether it is a person word of the pack
  // ("brother", "wife").
  std::function<bool(std::string_view)> is_name, is_person_word;
  // The pack's verb forms (verbs.data), to tell "Mark pilots" from "Mac users"; may be null.
  const VerbTable* verbs = nullptr;
};

// How sure a verdict is: `none` is the default for a name with nothing around it, `some`
// comes from a likely sign ("Grace said": a surname can say too), `firm` from a sure one.
enum class Evidence : uint8_t { none, some, firm };

// The verdict on one occurrence. `surname` marks a name read as a surname: in the same record
// it is then a surname wherever no firm evidence says otherwise; `place` likewise for a place
// ("in Dallas"); a name read as a person with evidence is a person wherever nothing around it
// says anything.
struct NameVerdict {
  bool person = false;
  Evidence evidence = Evidence::none;
  bool surname = false;
  bool place = false;    // read as a place's name: so wherever nothing says otherwise
  const char* why = "";  // for the audit log: the evidence, in a few words
};

NameVerdict judge_name(const PersonContext& lexicons, const NameSite& site);

}  // namespace evenhand::rewrite::en
