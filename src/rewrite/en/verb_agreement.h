// English subject-verb agreement for rewrites toward a plural-form subject ("she goes" -> "they
// go", "she's gone" -> "they've gone"), over the pack's verbs.data (from WordNet 3.0). Promises:
// an immutable table shared by threads, const lookups, and "unknown" with a reason, not a guess.
#pragma once

#include <cstdint>
#include <functional>
#include <memory>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "base/flat_map.h"
#include "base/status.h"
#include "pack/pack.h"

namespace evenhand::rewrite {

// The pack data file that switches verb agreement on.
inline constexpr const char* kVerbsFile = "verbs.data";

// The verb forms of one language, parsed from a verbs.data file. Immutable; not copyable.
class VerbTable {
 public:
  // What to do with the verb after a third-person singular subject pronoun.
  struct Answer {
    enum Kind : uint8_t {
      plural,     // `form` is the verb for a plural subject (goes -> go, is -> are)
      unchanged,  // the verb does not show number (went, can, walked, going): keep it
      unknown,    // cannot be settled; `reason` says why
    };
    Kind kind = unknown;
    std::string form;    // plural: the new token; unchanged: the token as given; unknown: ""
    std::string reason;  // unchanged and unknown: why (e.g. "modal", "not a verb form")
  };

  // What a contracted "'s" after a singular subject pronoun stands for.
  struct Contraction {
    enum Kind : uint8_t {
      are,      // "she's going" = she is: "they're going"
      have,     // "she's gone home" = she has: "they've gone home"
      unknown,  // cannot be told; `lean` is the safer guess, `reason` says why
    };
    Kind kind = unknown;
    Kind lean = are;     // for unknown: "are" or "have"; otherwise equal to kind
    std::string reason;  // why this answer (for the audit log)
  };

  VerbTable(const VerbTable&) = delete;
  VerbTable& operator=(const VerbTable&) = delete;

  // Parses a verbs.data text (format: the header of rules/en-gender/verbs.data). `file` names
  // the text in errors. Returns the table, or an Error of kind pack naming the line of the
  // first malformed record (unknown record type, wrong field count, empty or non-lower-case
  // form, wrong format line); a text without any record (blank or '#' lines only) gets an
  // error about the whole file, without a line.
  static Result<std::shared_ptr<const VerbTable>> parse(std::string_view text,
                                                        std::string file = "verbs.data");
  // Parses the pack's "verbs.data" file, named in errors by pack.file_path. Returns the table,
  // or an Error of kind pack when the pack has no such file or it does not parse.
  static Result<std::shared_ptr<const VerbTable>> from_pack(const pack::CompiledPack& pack);

  // The verb for a plural subject, given `token`, the case-folded verb token that follows a
  // third-person singular subject pronoun ("she", "he"). Straight and curly (U+2019)
  // apostrophes are both accepted; the answer's form uses the one the token had.
  //   is/was -> are/were, isn't/wasn't/doesn't/hasn't -> aren't/weren't/don't/haven't,
  //   a 3sg present form of the table -> its lemma (goes -> go, watches -> watch, has -> have);
  //   unchanged: modals and their negatives (can, won't), past forms (went, walked, put),
  //     participles (going, been), the subjunctive "were" and the other past negatives;
  //   unknown: a base form that is not 3sg ("she lead"), a 3sg form with two lemmas (axes:
  //     ax, axe) or that is also a lemma (summons), and any token the table does not know
  //     that ends in s; one it does not know that ends otherwise is unchanged.
  Answer pluralize(std::string_view token) const;

  // Decides what "'s" in "she's"/"he's" stands for from the case-folded tokens that follow it
  // (as many as the caller has up to the end of the sentence; punctuation tokens included,
  // they end the look-ahead). Adverbs ("not", "never", "already", words in -ly) are skipped.
  //   have: "been", "got", "gotten", "had"; a past form WordNet does not list as an adjective
  //     ("she's walked", "she's seen"), unless "to" or "by" follows it (then unknown, lean
  //     have: "she's moved to" is has, "she's allowed to" is is); a past form that is also an
  //     adjective followed by a determiner, pronoun or number ("she's finished the report");
  //   unknown, lean are: a past form that is also an adjective with no object after it
  //     ("she's tired", "she's gone": "they're" is grammatical for both readings);
  //   are: anything else (a present participle, an adjective, a noun phrase, the end).
  Contraction resolve_s(std::span<const std::string_view> following) const;

  // True when `folded` is a past tense or past participle form of some verb in the table, or
  // "been" (WordNet does not tell past tense from past participle; the two are kept together).
  bool is_past_participle(std::string_view folded) const;
  // True when `folded` is the -ing form of some verb in the table, or "being".
  bool is_present_participle(std::string_view folded) const;
  // True when `folded` is a lemma (base form) of the table, or "be".
  bool is_base_form(std::string_view folded) const;
  // True when `folded` is the third-person singular present form of some verb (or "is").
  bool is_third_singular(std::string_view folded) const;
  // True when `folded` is an adverb that may stand between a subject and its verb, so that a
  // caller looking for the verb of "she often goes" can skip it: a short hand list (not,
  // never, always, often, ...) and words ending in -ly that are not verb forms of the table
  // (common practice).
  bool is_preverbal_adverb(std::string_view folded) const;

  // True when `folded` is an auxiliary that shows number and stands before its subject in
  // questions and tags ("Is she", "..., doesn't he?"): is, was, has, does and their negative
  // contractions. Only auxiliaries invert in English; a lexical verb before a subject
  // belongs to another clause ("she says he knows").
  static bool is_inverting_auxiliary(std::string_view folded);
  // True when `folded` is a modal or "did" (or a negative of them): before its subject ("Can
  // she ride?", "Did he call?") it leaves the verb after the subject in its base form.
  static bool is_numberless_auxiliary(std::string_view folded);

  // Number of lemmas (verbs) in the table.
  size_t lemma_count() const { return lemmas_.size(); }

 private:
  VerbTable() = default;
  enum Flag : uint8_t {
    kBase = 1,
    kThird = 2,
    kPast = 4,
    kIng = 8,
    kAdjPast = 16,
  };
  struct Entry {
    uint8_t flags = 0;
    uint32_t lemma = 0;        // for kThird: index into lemmas_ of the (first) lemma
    uint32_t other_lemma = 0;  // for kThird with two lemmas: the second one
    uint8_t third_lemmas = 0;  // for kThird: how many lemmas have this 3sg form (capped at 2)
  };
  const Entry* find(std::string_view folded) const;
  Entry& add(std::string_view form);
  // One record of verbs.data ("v LEMMA 3SG PAST ING", "a FORM"): "" or what is wrong.
  std::string read_v(const std::vector<std::string_view>& fields);
  std::string read_a(const std::vector<std::string_view>& fields);

  std::vector<std::string> lemmas_;
  FlatStringMap<Entry> words_;  // probed for the words around every pronoun and name
};

}  // namespace evenhand::rewrite
