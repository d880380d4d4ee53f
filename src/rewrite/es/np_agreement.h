// Noun-phrase agreement for languages whose determiners and adjectives agree with the noun in
// gender (Spanish): rewrites a person noun together with its determiners and adjectives, the
// predicate after ser/estar/parecer/quedar, and the clitics that refer to it, and leaves
// dependent words alone elsewhere ("la casa"). Promises: an immutable table shared by threads,
// built from the pack's data files; a word it cannot inflect with confidence is flagged.
#pragma once

#include <array>
#include <cstdint>
#include <map>
#include <memory>
#include <span>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "base/status.h"
#include "pack/pack.h"
#include "rewrite/engine.h"
#include "rewrite/field_tokens.h"
#include "text/protect.h"

namespace evenhand::rewrite {

// One non-space token of a field, as the engine cut and folded it.

// The data file whose presence switches noun-phrase agreement on.
inline constexpr const char* kNounPhraseFile = "noun-phrase.data";

// Grammatical gender, as the agreement rules need it.
enum class Gender : uint8_t { feminine, masculine };

// How the pack's rules and data files are used (the README and rules/README.md say it for
// users; the data files' headers give their line formats):
// - Person words are the pack's sets that noun-phrase.data does not list as dependent. One is
//   rewritten by its set; a set tagged @noun only after a determiner (or a determiner and
//   adjectives) or right after a copula ("es médica"), since its forms are also verbs or
//   adjectives ("ella ama", "atención médica"). Pronouns (`pronoun` sets) take no
//   determiner or adjective before them.
// - A common-gender noun of common-gender.data (el/la estudiante) is a person mention when a
//   determiner before it shows the gender: the determiner's gender is the person's. The noun
//   stays; its determiners and adjectives flip. Without such a determiner it is left alone.
//   Epicene nouns (la persona, el personaje) never change.
// - Around a rewritten person noun: the determiners before it (also chains: "todas las", and
//   contractions: "de la" <-> "del"), adjectives between determiner and noun (inflected by the
//   rules of adjectives.data, with apocope: "la buena amiga" -> "el buen amigo"), and
//   adjectives after it that adjectives.data knows. An unknown word after a noun with a
//   determiner that would inflect ("la niña salta") is flagged "unsettled_adjective", not
//   changed; a verb of noun-phrase.data ("canta") ends the phrase. A quantifier before "de"
//   stands for the noun ("una de las chicas"); a demonstrative subject of a predicative noun
//   follows it ("Esa es la tía").
// - Predicate: after a rewritten subject (noun phrase or pronoun, not after a preposition),
//   a copula of noun-phrase.data (adverbs may stand between; also past a "de" complement)
//   and adjectives or participles after it are inflected by rule; a coordinated subject
//   ("ella y su madre están") is flagged "unsettled_predicate".
// - Stressed a (stressed-a.data; Real Academia Española, Diccionario panhispánico de dudas,
//   entry "el", from memory): a feminine singular noun beginning with stressed a takes the
//   masculine form of an article right before it ("el ama", "un ama", "del ama"); such an
//   "el" is read as feminine.
// - Clitics "la/las/lo/los" are rewritten when the nearest earlier noun phrase of the same
//   gender and number is a rewritten person and the clitic stands before a verb of
//   noun-phrase.data or one with an unmistakable verb ending, or after "no"/"se"/"ya"...;
//   when a phrase of no person came in between, the record is flagged "unsettled_clitic".
// - Names (a pack with [names]) are swapped when capitalised, with no agreement.
// - Every agreement edit has reason agreement and a note saying what agreed with what.
class NounPhraseAgreement {
 public:
  NounPhraseAgreement(const NounPhraseAgreement&) = delete;
  NounPhraseAgreement& operator=(const NounPhraseAgreement&) = delete;

  // Reads noun-phrase.data, adjectives.data, common-gender.data and stressed-a.data of the pack.
  // Returns the table, or an Error of kind pack naming file and line of the first problem (a
  // missing file, an unknown line kind, a set that words.txt does not have, a group the pack
  // does not have).
  // The table keeps the pack alive.
  static Result<std::shared_ptr<const NounPhraseAgreement>> from_pack(
      std::shared_ptr<const pack::CompiledPack> pack);
  // The same, reading a file named in `replaced` from there instead of from the pack (errors
  // still name the pack's file): other data files tried without compiling the pack again.
  static Result<std::shared_ptr<const NounPhraseAgreement>> from_pack(
      std::shared_ptr<const pack::CompiledPack> pack,
      const std::map<std::string, std::string, std::less<>>& replaced);

  // One field to rewrite. `target` maps each group to the group it is rewritten to (as the
  // engine decided); `spans` are the protected spans, sorted by begin.
  struct Field {
    uint32_t index = 0;
    std::string_view text;
    std::span<const FieldToken> tokens;
    std::span<const text::Span> spans;
    std::span<const uint16_t> target;
    bool guarded = false;  // count mentions only, make no edits
  };
  // Appends the field's edits (sorted, not overlapping), counts and flags to `out`.
  void rewrite_field(const Field& field, RecordResult& out) const;

  // The form of adjective `folded` (lower case) for `to`, given that it agrees with a noun of
  // gender `from` and number `plural`. `certain` says that the position settles that the word
  // is an adjective (between determiner and noun, after a copula): then the rules apply to an
  // unknown word; otherwise only known adjectives change. `before_noun` applies apocope
  // (bueno -> buen before a masculine singular noun).
  struct Inflection {
    enum Kind : uint8_t {
      changed,       // `form` is the new form
      same,          // the adjective does not change (invariable, or the same form)
      not_agreeing,  // the word is not the form for `from` and `plural`: not this noun's
      unknown,       // cannot be settled; `reason` says why
    };
    Kind kind = unknown;
    std::string form;
    std::string reason;
  };
  Inflection inflect(std::string_view folded, Gender from, Gender to, bool plural, bool certain,
                     bool before_noun) const;

  // Every form a known adjective can be given (all genders and numbers, apocopes), sorted:
  // the forms the tables can write, for checks against a dictionary.
  std::vector<std::string> adjective_forms() const;

 private:
  NounPhraseAgreement() = default;
  struct Hash {
    using is_transparent = void;
    size_t operator()(std::string_view s) const { return std::hash<std::string_view>{}(s); }
  };
  template <class V>
  using Map = std::unordered_map<std::string, V, Hash, std::equal_to<>>;

  enum Role : uint16_t {
    kDet = 1,
    kArticle = 2,
    kContraction = 4,
    kAfter = 8,
    kClitic = 16,
    kInert = 32,
    kPronoun = 64,     // a person word, not a dependent
    kAlone = 128,      // stands for its noun ("alguna de ellas")
    kPossessed = 256,  // a person word's sense after a possessive ("su mujer": his wife)
    kTitle = 512,      // a title of address: a person only before a name ("don Luis")
  };
  // True when set `s` is a person word (no dependent role).
  bool person_set(uint32_t s) const {
    return (set_roles_[s] & ~(kPronoun | kPossessed | kTitle)) == 0;
  }
  enum Slot : uint8_t { m_sg = 0, f_sg = 1, m_pl = 2, f_pl = 3 };
  struct Adjective {
    std::array<std::string, 4> forms;  // by Slot
    std::string short_form;            // apocope before a singular noun, or ""
    bool short_feminine = false;       // apocope also in the feminine (gran)
    bool invariable = false;
  };
  struct AdjForm {
    uint32_t adjective = 0;
    uint8_t slots = 0;  // bit per Slot the form fills
    bool is_short = false;
  };
  struct Rule {
    std::array<std::string, 4> endings;  // by Slot
  };
  enum class NounKind : uint8_t { common, epicene };
  struct Noun {
    NounKind kind = NounKind::common;
    bool plural = false;
  };
  struct Worker;
  friend struct Worker;

  bool in(const Map<bool>& m, std::string_view w) const { return m.find(w) != m.end(); }

  uint16_t fem_group_ = 0, masc_group_ = 1;
  std::vector<uint16_t> set_roles_;  // by pack set index
  std::vector<Adjective> adjectives_;
  Map<AdjForm> adj_forms_;
  std::vector<Rule> rules_;
  std::vector<std::string> invariable_endings_;
  Map<Noun> nouns_;
  Map<bool> stressed_a_;  // feminine stressed-a nouns, singular forms
  Map<bool> fixed_, copula_, adverb_, verb_, neuter_, word_, possessive_, preposition_;
  std::shared_ptr<const pack::CompiledPack> pack_;  // the pack it was read from
};

}  // namespace evenhand::rewrite
