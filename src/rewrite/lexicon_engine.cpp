// The pack-driven rewrite engine (see engine.h). Matching works on UAX #29 tokens: every
// non-space token is case-folded with pack::fold_word, and the compiled lexicon is looked up
// by the first folded word, longest entry first. Details that the README documents:
// - A trailing clitic ('s 'd 'll 're 've 'm, straight or curly) on the last word of a match
//   is kept as written, so "mother's" and "Emily’s" need no entries of their own.
// - Names are swapped only when written with an upper-case first letter, and only where
//   they name a person: with the pack's person-context.data, the words around each name
//   decide (rewrite/en/person_context.h), and within a record a name read as a surname, or
//   as a person with evidence, is read so at its other places too; without that file, a name
//   that is also a common word (~word) is not swapped at a sentence start, and a name after a
//   title or another first name is a surname.
// - A form with several counterparts (her -> his/him, his -> her/hers) is decided by the
//   pack's possessive model when it has one, else the pack's first entry wins and the
//   decision is counted as ambiguous.
// - Mentions inside protected spans are neither counted nor edited.
#include <algorithm>
#include <array>
#include <cstring>
#include <optional>
#include <tuple>
#include <unordered_map>

#include "base/flat_map.h"
#include "base/word_hash.h"
#include "pack/pack.h"
#include "rewrite/en/article.h"
#include "rewrite/en/person_context.h"
#include "rewrite/en/possessive.h"
#include "rewrite/en/senses.h"
#include "rewrite/en/verb_agreement.h"
#include "rewrite/engine.h"
#include "rewrite/es/np_agreement.h"
#include "text/case.h"
#include "text/protect.h"
#include "text/tokenize.h"

namespace evenhand::rewrite {

namespace {

// A context decision whose margin is below this is counted as ambiguous (it is still made).
constexpr float kLowMargin = 1.0f;

const char* const kClitics[] = {"'s", "'d", "'ll", "'re", "'ve", "'m"};
// Titles after which a capitalised name is a surname ("Ms Radcliffe", "Dr. Okafor"), folded;
// English forms of address (common practice). "Sir" and "Dame" take first names, so they are
// not listed.
const char* const kTitles[] = {"mr", "mrs", "ms", "miss", "mx", "dr", "prof"};

using evenhand::WordHash;

// Folded phrases (guards, protected expressions) indexed by their first token.
struct PhraseIndex {
  struct Phrase {
    std::vector<std::string> tokens;
    uint32_t index = 0;  // into the pack's list
  };
  std::unordered_map<std::string, std::vector<Phrase>, WordHash, std::equal_to<>> by_first;

  void add(std::string_view text, uint32_t index) {
    Phrase p;
    for (const auto& t : pack::form_tokens(text)) p.tokens.push_back(pack::fold_word(t));
    if (p.tokens.empty()) return;
    p.index = index;
    auto& v = by_first[p.tokens.front()];
    v.push_back(std::move(p));
    std::stable_sort(v.begin(), v.end(), [](const Phrase& a, const Phrase& b) {
      return a.tokens.size() > b.tokens.size();
    });
  }
};

class LexiconEngine;

// What one folded word starts: lexicon entries, guard phrases, protected phrases. One hash
// lookup per token finds all three.
struct WordSlots {
  const std::vector<pack::LexEntry>* lex = nullptr;
  const std::vector<PhraseIndex::Phrase>* guard = nullptr;
  const std::vector<PhraseIndex::Phrase>* prot = nullptr;
  bool mixed_name = false;               // a first name both sexes carry (person evidence)
  const pack::LexEntry* name = nullptr;  // the single-word first-name entry of lex, if any
  bool unpaired = false;  // a gendered person word the pack has no set for (senses.data)
};

// Folded word -> WordSlots in a flat table (whose filter turns most tokens, which are in no
// pack, away without reading a slot). Built once; read-only afterwards.
class WordIndex {
 public:
  WordSlots& operator[](const std::string& key) { return build_[key]; }
  void freeze() {
    table_.reserve(build_.size());
    for (auto& [key, v] : build_) {
      if (v.lex)
        for (const auto& en : *v.lex)
          if (!v.name && en.is_name && en.words.size() == 1) v.name = &en;
      table_.emplace(key, v);
    }
    build_.clear();
  }
  const WordSlots* find(std::string_view key) const { return table_.find(key); }

 private:
  std::unordered_map<std::string, WordSlots, WordHash, std::equal_to<>> build_;
  FlatStringMap<WordSlots> table_;
};

class LexiconWorker final : public Worker {
 public:
  explicit LexiconWorker(const LexiconEngine& e);
  void rewrite(std::span<const std::string_view> fields, RecordResult& out) override;
  void trim() override;

 private:
  struct Item {
    uint32_t begin = 0, end = 0;  // bytes in the field
    uint32_t fold_off = 0, fold_len = 0;
    text::TokenKind kind = text::TokenKind::punct;
    uint32_t call = kNoCall;           // a listed name's verdict in calls_, if judged
    const WordSlots* slots = nullptr;  // what this folded word starts, if anything
    // The slots of the pack entries the word starts, also before a trailing clitic
    // ("mother's": those of "mother"), or null.
    const WordSlots* entry = nullptr;
  };
  static constexpr uint32_t kNoCall = UINT32_MAX;
  // The verdict on one occurrence of a listed first name, and the name (folded).
  struct NameCall {
    en::NameVerdict verdict;
    std::string_view name;
    std::string_view written;  // as written (for a mixed name's flag)
    bool mixed = false;        // a name both sexes carry: judged, never swapped
  };
  // Fills *cur_ from `field`.
  void prepare_field(std::string_view field);
  std::string_view folded(size_t k) const {
    return std::string_view(cur_->fold.data() + cur_->items[k].fold_off, cur_->items[k].fold_len);
  }
  // Length in items of a match of `words` at item k (0 if none); `clitic` gets the bytes of
  // a clitic left on the last word.
  size_t match_at(size_t k, const std::vector<std::string>& words, uint32_t& clitic) const;
  // A guard (`guard`) or protected phrase starting at item k.
  bool phrase_at(bool guard, size_t k, const PhraseIndex::Phrase** hit, size_t* len) const;
  bool sentence_start(size_t k) const;
  // Makes the verb agree with a subject pronoun that became "they" (the pronoun edit is
  // `pronoun`, at items k..k+len-1); pushes the edits in order and returns the last item used.
  size_t verb_agreement(uint32_t field, std::string_view text, size_t k, size_t len,
                        uint32_t clitic, Edit& pronoun, RecordResult& out);
  // Re-chooses "a"/"an" at item k-1 when the word at k becomes `next_word` (English).
  void article_agreement(uint32_t field, std::string_view text, size_t k,
                         std::string_view next_word, RecordResult& out);
  // True when the name at item k follows a title or another first name (so is a surname).
  bool surname_position(size_t k) const;
  // Whether the name entry `en` at item k, written `original`, names a person here; `why`
  // gets the evidence when person evidence decided.
  bool names_person(const pack::LexEntry& en, size_t k, std::string_view original,
                    std::string_view* why) const;
  // The single-word name entry a word item holds (also before a clitic), or null.
  const pack::LexEntry* name_entry(size_t k) const;
  static bool capitalised(std::string_view original);
  // Judges every capitalised listed name of the field in *cur_ (person evidence).
  void judge_names(std::string_view text);
  // Reads a name the same way at all its places in the record where nothing else decided.
  void settle_names();
  // Notes a person whose sex the pack cannot change at item k (a name both sexes carry, an
  // unknown first name after a gendered title), in unswappable_.
  void note_unswappable(std::string_view text, size_t k);
  // Fills site_ with the tokens of the field in *cur_ (once per judge_names() call).
  void prepare_site(std::string_view text);
  // Flags the record when it names such a person and other mentions were rewritten.
  void flag_unswappable(RecordResult& out) const;
  bool is_protected(uint32_t begin, uint32_t end) const;
  // One match of the pack at an item: the longest entry (its candidates with the same words in
  // cands_), the one chosen for the edit, and why.
  struct Match {
    const pack::LexEntry* first = nullptr;
    const pack::LexEntry* chosen = nullptr;
    size_t len = 0;       // items
    uint32_t clitic = 0;  // bytes of a clitic kept on the last word
    EditReason reason = EditReason::lexicon;
    float score = 0;
    std::string_view note;  // a name's person evidence
  };
  // The pack entries a word item starts (also before a trailing clitic), or null.
  const std::vector<pack::LexEntry>* entries_at(size_t k) const {
    return cur_->items[k].entry ? cur_->items[k].entry->lex : nullptr;
  }
  // The slots of a folded word that ends in a clitic, by its stem, if it has entries.
  const WordSlots* stem_slots(std::string_view folded) const;
  Match longest_match(size_t k, const std::vector<pack::LexEntry>& entries);
  // Decides between candidates with different forms ("her" -> his/him) by the pack's model.
  void choose_form(size_t k, Match& m, RecordResult& out);
  // Pushes the edit of match m at item k (with its agreement); returns the last item used.
  size_t emit(uint32_t field, std::string_view text, size_t k, const Match& m,
              std::string_view original, std::string_view replacement, RecordResult& out);
  // A coordinated alternative of two forms that go to one form at their targets ("he or she",
  // "his/her", "she (or he)", "him or herself", "s/he", "(s)he"): items first..last, the form,
  // and the other word's item and group. Found around match m at item k, whose candidates are
  // in cands_ and whose chosen form is `form`.
  struct Pair {
    size_t first = 0, last = 0, other = 0;
    uint16_t other_group = 0;
    std::string_view form;
  };
  std::optional<Pair> coordinated_pair(size_t k, const Match& m, std::string_view form) const;
  // The single-word, non-name entry of `folded`, of a group other than `not_group`, whose form
  // at its target is one of `forms`; or null.
  const pack::LexEntry* shared_form(std::string_view folded, uint16_t not_group,
                                    std::span<const std::string_view> forms) const;
  // The form an entry becomes at its group's target ("" when the set has none).
  std::string_view form_at_target(const pack::LexEntry& en) const;
  // After the verb at item j agreed with a rewritten subject, the verbs coordinated with it
  // ("they walk in and sits down") agree too; their edits go to pending_.
  // With `subordinate` (the subject opens a clause: "if they ..."), a conjunction after a
  // comma may go back to the main clause and is not followed.
  void coordinated_verbs(uint32_t field, std::string_view text, size_t j, bool subordinate);
  // The first item from j on that is not an adverb standing before a verb ("often", "no
  // longer").
  size_t skip_adverbs(size_t j) const;
  // A line break between items first..last, which one edit replaces, moves to the space after
  // them ("his or\n her position" -> "their\n position"), as an edit in pending_.
  void keep_line_break(uint32_t field, std::string_view text, size_t first, size_t last);
  // Moves pending_ into out.edits (those that overlap no edit of the field) and puts the
  // field's edits, from index first_edit, back in text order.
  void merge_pending(size_t first_edit, RecordResult& out);
  void spanish_field(uint32_t field, std::string_view text, RecordResult& out, bool guarded);
  void field_matches(uint32_t field, std::string_view text, RecordResult& out, bool guarded);
  // Word senses (English senses.data): whether match m at item k is no person here
  // (laughter, a network host, "God"), and notes a person word the pack cannot map.
  bool other_sense(std::string_view text, size_t k, const Match& m);
  // Notes the person word at item k of `field` the pack cannot map, with its sentence.
  void note_unpaired(uint32_t field, std::string_view text, size_t k, const char* why);
  // The same word at items a and b with only white space or hyphens between.
  bool doubled_at(std::string_view text, size_t a, size_t b) const;
  // Flags the record when a mention in the sentence of a noted word changed group (the word
  // and the rewritten mention may be one person: "She was the sole heiress").
  void flag_unpaired(RecordResult& out) const;

  const LexiconEngine& e_;
  text::Tokenizer tokenizer_;
  std::vector<text::Token> tokens_;
  // A guard anywhere in the fields (null if none); with `keep`, each field stays prepared in
  // fields_ for the matching, else fields_[0] is reused and the matching prepares again.
  const pack::Guard* find_guard(std::span<const std::string_view> fields, bool keep);

  // Each field of the record, prepared once (tokens, folded text, protected spans): the guard
  // check and the matching both read them. A record whose fields are larger than
  // kKeptFieldBytes keeps one field prepared at a time and prepares each field twice, so this
  // scratch stays the size of its largest field, not of the record.
  static constexpr size_t kKeptFieldBytes = 1 << 20;
  struct FieldState {
    std::vector<Item> items;
    std::string fold;
    std::vector<text::Span> spans;
    std::vector<uint32_t> capitals;  // word items that open with a capital and the pack knows
  };
  std::vector<FieldState> fields_;
  FieldState* cur_ = nullptr;  // the field being matched
  // settle_names(): the names read as surnames, persons and places in the record.
  std::tuple<std::vector<std::string_view>, std::vector<std::string_view>,
             std::vector<std::string_view>>
      settle_;
  std::vector<std::string_view> words_;       // folded items for the possessive model
  std::vector<const pack::LexEntry*> cands_;  // entries matching at one position
  bool site_ready_ = false;                   // site_ holds the tokens of the field being judged
  std::vector<Edit> pending_;          // agreement edits of coordinated verbs, merged per field
  std::vector<FieldToken> np_tokens_;  // items for noun-phrase agreement (packs that have it)
  std::vector<NameCall> calls_;        // the record's judged names (person evidence)
  std::string unswappable_;            // the first person the pack cannot swap, as written
  struct Unpaired {
    uint32_t field = 0, sentence_begin = 0, sentence_end = 0;
    std::string detail;  // the word as written and why
  };
  std::vector<Unpaired> unpaired_;        // the record's person words the pack cannot map
  std::vector<FieldToken> sense_tokens_;  // the field's items for Senses (filled on demand)
  en::NameSite site_;                     // reused for every judged name
};

class LexiconEngine final : public Engine {
 public:
  LexiconEngine(std::shared_ptr<const pack::CompiledPack> p,
                std::unique_ptr<text::ProtectedSpans> ps,
                std::shared_ptr<const PossessiveModel> model,
                std::shared_ptr<const VerbTable> verbs,
                std::shared_ptr<const NounPhraseAgreement> np,
                std::shared_ptr<const en::PersonContext> persons,
                std::shared_ptr<const en::Senses> senses, const EngineOptions& o)
      : pack_(std::move(p)),
        protect_(std::move(ps)),
        model_(std::move(model)),
        verbs_(std::move(verbs)),
        np_(std::move(np)),
        persons_(std::move(persons)),
        senses_(std::move(senses)),
        options_(o) {
    const auto& groups = pack_->groups();
    target_.resize(groups.size());
    for (uint16_t g = 0; g < groups.size(); ++g) {
      if (o.toward) {
        // The first two groups go toward the target; further groups (neutral) are left
        // alone unless they are the target: "they" is plural far more often than not.
        target_[g] = g < 2 ? *o.toward : g;
      } else if (g < 2) {
        target_[g] = static_cast<uint16_t>(1 - g);  // the first two groups swap
      } else {
        target_[g] = g;  // further groups (e.g. neutral) stay as they are
      }
    }
    for (uint32_t i = 0; i < pack_->guards().size(); ++i) guards_.add(pack_->guards()[i].phrase, i);
    for (uint32_t i = 0; i < pack_->protected_phrases().size(); ++i)
      protected_.add(pack_->protected_phrases()[i], i);
    for (std::string_view key : pack_->keys()) words_[std::string(key)].lex = pack_->lookup(key);
    for (const auto& [key, v] : guards_.by_first) words_[key].guard = &v;
    for (const auto& [key, v] : protected_.by_first) words_[key].prot = &v;
    if (persons_)
      for (const auto& w : persons_->mixed_names()) words_[w].mixed_name = true;
    for (const auto& pair : pack_->names()) word_like_pair_.push_back(word_like(pair));
    if (senses_) {
      for (const auto& [key, value] : pack_->meta())
        if (key == "capital-god") keep_god_ = value != "rewrite";
      senses_->for_each(en::Sense::unpaired,
                        [&](std::string_view w) { words_[std::string(w)].unpaired = true; });
    }
    words_.freeze();
  }
  const pack::CompiledPack* pack() const override { return pack_.get(); }
  std::unique_ptr<Worker> make_worker() const override {
    return std::make_unique<LexiconWorker>(*this);
  }

  std::shared_ptr<const pack::CompiledPack> pack_;
  std::unique_ptr<text::ProtectedSpans> protect_;
  std::shared_ptr<const PossessiveModel> model_;
  std::shared_ptr<const VerbTable> verbs_;
  std::shared_ptr<const NounPhraseAgreement> np_;     // null unless the pack has noun-phrase.data
  std::shared_ptr<const en::PersonContext> persons_;  // null unless person-context.data
  std::shared_ptr<const en::Senses> senses_;          // null unless senses.data
  bool keep_god_ = true;  // senses: capitalised "God" is a name (pack meta capital-god)
  std::vector<uint8_t> word_like_pair_;  // per name pair: holds a common word

  bool word_like(const pack::NamePair& pair) const {
    if (!persons_ || persons_->size(en::Lexicon::word_name) == 0) return pair.word_like;
    for (const auto& n : pair.names)
      if (!n.empty() && persons_->has(en::Lexicon::word_name, pack::fold_word(n))) return true;
    return false;
  }
  EngineOptions options_;
  std::vector<uint16_t> target_;
  PhraseIndex guards_;
  PhraseIndex protected_;
  WordIndex words_;
};

LexiconWorker::LexiconWorker(const LexiconEngine& e) : e_(e) {
  auto has_entry = [&e](std::string_view w, bool name) {
    const WordSlots* slots = e.words_.find(w);
    if (slots == nullptr || slots->lex == nullptr) return false;
    for (const auto& en : *slots->lex)
      if (en.is_name == name && en.words.size() == 1) return true;
    return false;
  };
  site_.is_name = [has_entry, &e](std::string_view w) {
    const WordSlots* slots = e.words_.find(w);
    return has_entry(w, true) || (slots && slots->mixed_name);
  };
  site_.is_person_word = [has_entry](std::string_view w) { return has_entry(w, false); };
  site_.verbs = e.verbs_.get();
}

// ASCII lower-casing table (identity for every other byte).
constexpr std::array<char, 256> kAsciiLower = [] {
  std::array<char, 256> t{};
  for (int c = 0; c < 256; ++c) t[c] = static_cast<char>(c >= 'A' && c <= 'Z' ? c + 32 : c);
  return t;
}();

// UAX #29 keeps underscores inside words ("_Grace_" is one word); emphasis marks of plain
// text are split off as punctuation so that the word inside them is matched.
static void split_emphasis(std::string_view field, std::vector<text::Token>& tokens) {
  if (field.find('_') == std::string_view::npos) return;  // most fields: one memchr
  bool any = false;
  for (const auto& t : tokens)
    any = any ||
          (t.kind == text::TokenKind::word && (field[t.begin] == '_' || field[t.end - 1] == '_'));
  if (!any) return;
  std::vector<text::Token> out;
  out.reserve(tokens.size() + 8);
  for (const auto& t : tokens) {
    uint32_t b = t.begin, e = t.end;
    if (t.kind == text::TokenKind::word) {
      while (b < e && field[b] == '_') out.push_back({b, b + 1, text::TokenKind::punct}), ++b;
      uint32_t tail = e;
      while (tail > b && field[tail - 1] == '_') --tail;
      if (b < tail) out.push_back({b, tail, text::TokenKind::word});
      for (uint32_t i = tail; i < e; ++i) out.push_back({i, i + 1, text::TokenKind::punct});
      continue;
    }
    out.push_back(t);
  }
  tokens = std::move(out);
}

void LexiconWorker::prepare_field(std::string_view field) {
  tokenizer_.tokenize_without_space(field, tokens_);
  split_emphasis(field, tokens_);
  std::vector<Item>& items = cur_->items;
  std::string& fold = cur_->fold;
  items.clear();
  items.reserve(tokens_.size());
  cur_->capitals.clear();
  // The field is lower-cased (ASCII) as a whole, so a token's folded text sits at the
  // token's own offsets; a token with non-ASCII bytes is folded by pack::fold_word (which may
  // change its length) and its folded text appended after the field's.
  const size_t size = field.size();
  const auto* src = reinterpret_cast<const unsigned char*>(field.data());
  fold.resize(size);
  char* d = fold.data();
  uint64_t high = 0;
  size_t i = 0;
  for (; i + 8 <= size; i += 8) {
    uint64_t v;
    std::memcpy(&v, src + i, 8);
    high |= v;
    v = text::ascii_lower8(v);
    std::memcpy(d + i, &v, 8);
  }
  for (; i < size; ++i) {
    high |= src[i];
    d[i] = kAsciiLower[src[i]];
  }
  const bool all_ascii = (high & 0x8080808080808080ULL) == 0;
  for (const auto& t : tokens_) {
    Item it;
    it.begin = t.begin;
    it.end = t.end;
    it.kind = t.kind;
    it.fold_off = t.begin;
    it.fold_len = t.end - t.begin;
    if (!all_ascii) {
      unsigned char token_high = 0;
      for (uint32_t k = t.begin; k < t.end; ++k) token_high |= src[k];
      if (token_high & 0x80) {
        std::string f = pack::fold_word(field.substr(t.begin, t.end - t.begin));
        it.fold_off = static_cast<uint32_t>(fold.size());
        it.fold_len = static_cast<uint32_t>(f.size());
        fold += f;
      }
    }
    if (t.kind == text::TokenKind::word) {
      std::string_view f(fold.data() + it.fold_off, it.fold_len);
      it.slots = e_.words_.find(f);
      it.entry = it.slots && it.slots->lex ? it.slots : stem_slots(f);
      // A capitalised word the pack knows: a name (or title) for judge_names().
      if ((it.slots || it.entry) && !(src[t.begin] >= 'a' && src[t.begin] <= 'z'))
        cur_->capitals.push_back(static_cast<uint32_t>(items.size()));
    }
    items.push_back(it);
  }
  std::vector<text::Span>& spans = cur_->spans;
  spans.clear();
  if (e_.protect_) e_.protect_->find(field, spans);
  // The pack's protected expressions, matched on folded tokens.
  bool added = false;
  for (size_t k = 0; k < items.size(); ++k) {
    const PhraseIndex::Phrase* hit;
    size_t len;
    if (items[k].slots && items[k].slots->prot && phrase_at(false, k, &hit, &len)) {
      spans.push_back({items[k].begin, items[k + len - 1].end, text::pack_phrase});
      added = true;
      k += len - 1;
    }
  }
  if (added) {
    std::sort(spans.begin(), spans.end(),
              [](const text::Span& a, const text::Span& b) { return a.begin < b.begin; });
  }
}

bool LexiconWorker::phrase_at(bool guard, size_t k, const PhraseIndex::Phrase** hit,
                              size_t* len) const {
  const WordSlots* slots = cur_->items[k].slots;
  const std::vector<PhraseIndex::Phrase>* phrases =
      slots ? (guard ? slots->guard : slots->prot) : nullptr;
  if (phrases == nullptr) return false;
  for (const auto& p : *phrases) {
    if (k + p.tokens.size() > cur_->items.size()) continue;
    bool ok = true;
    for (size_t j = 1; j < p.tokens.size() && ok; ++j) ok = folded(k + j) == p.tokens[j];
    if (ok) {
      *hit = &p;
      *len = p.tokens.size();
      return true;
    }
  }
  return false;
}

size_t LexiconWorker::match_at(size_t k, const std::vector<std::string>& words,
                               uint32_t& clitic) const {
  clitic = 0;
  if (k + words.size() > cur_->items.size()) return 0;
  for (size_t j = 0; j < words.size(); ++j) {
    std::string_view f = folded(k + j);
    if (f == words[j]) continue;
    if (j + 1 != words.size() || f.size() <= words[j].size() ||
        f.compare(0, words[j].size(), words[j]) != 0)
      return 0;
    std::string_view rest = f.substr(words[j].size());
    bool is_clitic = false;
    for (const char* c : kClitics) is_clitic = is_clitic || rest == c;
    if (!is_clitic) return 0;
    // Bytes of the clitic as written (a curly apostrophe is three bytes, folded to one).
    const Item& it = cur_->items[k + j];
    uint32_t written = it.end - it.begin;
    uint32_t folded_extra = static_cast<uint32_t>(f.size() - words[j].size());
    clitic = folded_extra + (written > it.fold_len ? written - it.fold_len : 0);
  }
  return words.size();
}

bool LexiconWorker::sentence_start(size_t k) const {
  if (k == 0) return true;
  std::string_view prev = folded(k - 1);
  return prev == "." || prev == "!" || prev == "?" || prev == "\"" || prev == ":" ||
         prev == "\xE2\x80\x9C";  // left double quotation mark
}

void LexiconWorker::article_agreement(uint32_t field, std::string_view text, size_t k,
                                      std::string_view next_word, RecordResult& out) {
  if (k == 0 || e_.pack_->language() != "en") return;
  const Item& art = cur_->items[k - 1];
  if (art.kind != text::TokenKind::word || !is_indefinite_article(folded(k - 1))) return;
  std::string_view chosen = choose_article(next_word);
  if (chosen == folded(k - 1)) return;
  Edit ed;
  ed.field = field;
  ed.begin = art.begin;
  ed.end = art.end;
  recase_article(text.substr(art.begin, art.end - art.begin), chosen, ed.replacement);
  ed.reason = EditReason::agreement;
  out.edits.push_back(std::move(ed));
}

bool LexiconWorker::surname_position(size_t k) const {
  if (k == 0) return false;
  size_t p = k - 1;
  if (folded(p) == "." && p > 0) --p;
  std::string_view prev = folded(p);
  for (const char* t : kTitles)
    if (prev == t) return true;
  // "Matthew Tanner": a capitalised first name right before makes this one a surname.
  if (p + 1 == k && cur_->items[p].kind == text::TokenKind::word &&
      cur_->items[p].end + 1 == cur_->items[k].begin) {
    const WordSlots* slots = e_.words_.find(prev);
    if (const auto* entries = slots ? slots->lex : nullptr) {
      for (const auto& en : *entries)
        if (en.is_name && en.words.size() == 1) return true;
    }
  }
  return false;
}

bool LexiconWorker::capitalised(std::string_view original) {
  // ASCII first letter: title, capitals or mixed-from-a-capital all open with A-Z (fast path).
  if (!original.empty() && original[0] >= 'A' && original[0] <= 'Z') return true;
  if (!original.empty() && original[0] >= 'a' && original[0] <= 'z') return false;
  text::CasePattern pattern = text::case_pattern(original);
  return pattern == text::CasePattern::title || pattern == text::CasePattern::upper ||
         (pattern == text::CasePattern::mixed && original[0] >= 'A' && original[0] <= 'Z');
}

bool LexiconWorker::names_person(const pack::LexEntry& en, size_t k, std::string_view original,
                                 std::string_view* why) const {
  if (!capitalised(original)) return false;
  if (!e_.persons_) {
    if (e_.pack_->names()[en.set].word_like && sentence_start(k)) return false;
    return !surname_position(k);
  }
  uint32_t call = cur_->items[k].call;
  if (call == kNoCall) return false;  // not judged: not a single-word name
  *why = calls_[call].verdict.why;
  return calls_[call].verdict.person;
}

const pack::LexEntry* LexiconWorker::name_entry(size_t k) const {
  return cur_->items[k].entry ? cur_->items[k].entry->name : nullptr;
}

void LexiconWorker::judge_names(std::string_view text) {
  std::vector<Item>& items = cur_->items;
  site_ready_ = false;
  // Only a word that opens with a capital (or a non-ASCII letter) can be a name or title.
  for (uint32_t k : cur_->capitals) {
    items[k].call = kNoCall;
    const pack::LexEntry* en = name_entry(k);
    if (en == nullptr) {
      if (items[k].slots) note_unswappable(text, k);
      continue;
    }
    std::string_view name = folded(k);
    name = name.substr(0, en->words[0].size());
    if (!capitalised(text.substr(items[k].begin, name.size()))) continue;
    prepare_site(text);
    site_.at = k;
    // A rare first name needs evidence too, on its own (its pair's other name need not).
    site_.word_like = e_.word_like_pair_[en->set] || e_.persons_->has(en::Lexicon::rare_name, name);
    items[k].call = static_cast<uint32_t>(calls_.size());
    calls_.push_back({en::judge_name(*e_.persons_, site_), name,
                      text.substr(items[k].begin, items[k].end - items[k].begin), false});
  }
}

void LexiconWorker::prepare_site(std::string_view text) {
  if (site_ready_) return;  // judge_names() resets it for each field
  site_ready_ = true;
  const std::vector<Item>& items = cur_->items;
  if (np_tokens_.size() < items.size()) np_tokens_.resize(items.size());
  const char* fold = cur_->fold.data();
  FieldToken* out = np_tokens_.data();
  for (const Item& it : items)
    *out++ = {it.begin, it.end, std::string_view(fold + it.fold_off, it.fold_len),
              it.kind == text::TokenKind::word};
  site_.tokens = std::span<const FieldToken>(np_tokens_.data(), items.size());
  site_.text = text;
}

void LexiconWorker::note_unswappable(std::string_view text, size_t k) {
  const std::vector<Item>& items = cur_->items;
  const en::PersonContext& lex = *e_.persons_;
  auto raw = [&](size_t j) { return text.substr(items[j].begin, items[j].end - items[j].begin); };
  auto cap_word = [&](size_t j) {
    return j < items.size() && items[j].kind == text::TokenKind::word && capitalised(raw(j));
  };
  if (!cap_word(k)) return;
  if (items[k].slots->mixed_name) {  // judged with the others; settle_names() decides
    prepare_site(text);
    site_.at = k;
    site_.word_like = lex.has(en::Lexicon::word_name, folded(k));
    calls_.push_back({en::judge_name(lex, site_), folded(k), raw(k), true});
    return;
  }
  // "Mrs. Kimberlee Jones": a gendered title, an unlisted first name, a surname.
  bool titled = items[k].slots->lex && (lex.has(en::Lexicon::title, folded(k)) ||
                                        lex.has(en::Lexicon::given_title, folded(k)));
  size_t n = k + 1 < items.size() && folded(k + 1) == "." ? k + 2 : k + 1;
  if (!titled || !cap_word(n) || !cap_word(n + 1) || name_entry(n) != nullptr) return;
  // In capitals ("MR LOWTHER AT THE DESK") the case tells no name from the words after it.
  if (text::case_pattern(raw(n)) != text::CasePattern::title) return;
  if (lex.has(en::Lexicon::common_word, folded(n)) || lex.has(en::Lexicon::surname, folded(n)))
    return;
  if (unswappable_.empty())
    unswappable_ = std::string(raw(n)) + "' after '" + std::string(raw(k)) +
                   "' is a first name the pack does not list";
}

void LexiconWorker::flag_unswappable(RecordResult& out) const {
  if (unswappable_.empty()) return;
  // Toward a group that names have no form in (neutral), no name changes: a person whose sex
  // the pack cannot tell stays as written like every other, and their pronouns go to the
  // group's forms like everyone's ("Terry ... he" -> "Terry ... they").
  const auto& names = e_.pack_->names();
  if (e_.options_.toward && !names.empty() &&
      (names[0].names.size() <= *e_.options_.toward || names[0].names[*e_.options_.toward].empty()))
    return;
  for (const Edit& e : out.edits) {
    // Another person's name changing is no contradiction; a pronoun or noun may refer to
    // the person that stays.
    if (e.from_group != Edit::kNone && e.from_group != e.to_group && e.reason != EditReason::name) {
      out.flags.push_back({"unswappable_person", "'" + unswappable_});
      return;
    }
  }
}

void LexiconWorker::settle_names() {
  if (calls_.empty()) return;
  auto& [surnames, persons, places] = settle_;  // reused: no allocation per record
  for (auto* v : {&surnames, &persons, &places}) v->clear();
  for (const NameCall& c : calls_) {
    if (c.verdict.surname) surnames.push_back(c.name);
    if (c.verdict.place) places.push_back(c.name);
    if (c.verdict.person && c.verdict.evidence != en::Evidence::none) persons.push_back(c.name);
  }
  for (auto* v : {&surnames, &places, &persons}) std::sort(v->begin(), v->end());
  auto in = [](const std::vector<std::string_view>& v, std::string_view w) {
    return std::binary_search(v.begin(), v.end(), w);
  };
  for (NameCall& c : calls_) {
    if (c.verdict.evidence == en::Evidence::firm) continue;
    if (in(surnames, c.name)) {
      c.verdict = {.surname = true, .why = "a surname elsewhere in the record"};
    } else if (in(places, c.name)) {
      c.verdict = {.place = true, .why = "a place elsewhere in the record"};
    } else if (c.verdict.evidence == en::Evidence::none && in(persons, c.name)) {
      c.verdict = {.person = true, .why = "names a person elsewhere in the record"};
    }
  }
  for (const NameCall& c : calls_) {
    if (!unswappable_.empty()) break;
    if (c.mixed && c.verdict.person)
      unswappable_ = std::string(c.written) + "' is a first name both sexes carry";
    // A name left alone only for want of evidence may still be the person a pronoun means.
    const en::NameVerdict& v = c.verdict;
    if (!c.mixed && !v.person && v.evidence == en::Evidence::none && !v.surname && !v.place)
      unswappable_ = std::string(c.written) + "' may name a person, and nothing says so";
  }
}

bool LexiconWorker::is_protected(uint32_t begin, uint32_t end) const {
  for (const auto& s : cur_->spans) {
    if (s.begin >= end) break;
    if (s.end > begin) return true;
  }
  return false;
}

// Case of `original` carried to `replacement`, with its apostrophe style.
static std::string recase(std::string_view original, std::string_view replacement) {
  std::string out;
  text::apply_case(replacement, text::case_pattern(original), out);
  if (original.find("\xE2\x80\x99") != std::string_view::npos) {
    std::string curly;
    for (char c : out) {
      if (c == '\'')
        curly += "\xE2\x80\x99";
      else
        curly += c;
    }
    out = std::move(curly);
  }
  return out;
}

const WordSlots* LexiconWorker::stem_slots(std::string_view f) const {
  // The word without a trailing clitic ("mother's" -> "mother"). Clitics are two or three
  // bytes folded ('s 'd 'm, 'll 're 've).
  size_t n = f.size(), apos;
  if (n >= 3 && f[n - 2] == '\'') {
    apos = n - 2;
  } else if (n >= 4 && f[n - 3] == '\'') {
    apos = n - 3;
  } else {
    return nullptr;
  }
  const WordSlots* stem = e_.words_.find(f.substr(0, apos));  // same entries as pk.lookup()
  return stem && stem->lex ? stem : nullptr;
}

LexiconWorker::Match LexiconWorker::longest_match(size_t k,
                                                  const std::vector<pack::LexEntry>& entries) {
  Match m;
  cands_.clear();
  for (const auto& en : entries) {
    if (m.first && en.words.size() < m.len) break;
    uint32_t c;
    size_t l = match_at(k, en.words, c);
    if (l == 0) continue;
    if (!m.first) {
      m.first = &en;
      m.len = l;
      m.clitic = c;
    }
    if (en.words == m.first->words) cands_.push_back(&en);
  }
  return m;
}

void LexiconWorker::choose_form(size_t k, Match& m, RecordResult& out) {
  m.reason = EditReason::context;
  bool decided = false;
  if (e_.model_) {
    if (words_.empty()) {
      words_.reserve(cur_->items.size());
      for (size_t j = 0; j < cur_->items.size(); ++j) words_.push_back(folded(j));
    }
    Decision d = e_.model_->decide(words_, k);
    pack::Tag want = d.kind == Decision::determiner ? pack::Tag::det
                     : d.kind == Decision::object   ? pack::Tag::obj
                                                    : pack::Tag::poss;
    for (const auto* c : cands_) {
      if (c->tag == want) {
        m.chosen = c;
        decided = true;
        m.score = d.score;
        break;
      }
    }
  }
  if (!decided || m.score < kLowMargin) ++out.ambiguous;
}

size_t LexiconWorker::emit(uint32_t field, std::string_view text, size_t k, const Match& m,
                           std::string_view original, std::string_view replacement,
                           RecordResult& out) {
  const pack::CompiledPack& pk = *e_.pack_;
  const pack::LexEntry* chosen = m.chosen;
  uint16_t g = m.first->group, t = e_.target_[g];
  size_t next = k + m.len - 1;
  ++out.after[t];
  Edit ed;
  ed.field = field;
  ed.begin = cur_->items[k].begin;
  ed.end = ed.begin + static_cast<uint32_t>(original.size());
  ed.replacement = recase(original, replacement);
  ed.reason = m.reason;
  ed.score = m.score;
  ed.from_group = g;
  ed.to_group = t;
  ed.hit = chosen->is_name ? static_cast<uint32_t>(pk.sets().size() + chosen->set) : chosen->set;
  ed.rule = chosen->is_name ? &pk.names()[chosen->set].where : &pk.sets()[chosen->set].where;
  ed.note = m.note;
  if (ed.replacement == original) return next;
  uint32_t hit = ed.hit;
  article_agreement(field, text, k, ed.replacement, out);
  bool plural_subject = e_.verbs_ && chosen->tag == pack::Tag::subj && replacement == "they" &&
                        e_.pack_->language() == "en";
  if (plural_subject) {
    next = verb_agreement(field, text, k, m.len, m.clitic, ed, out);
  } else {
    out.edits.push_back(std::move(ed));
  }
  out.entry_hits.push_back(hit);
  return next;
}

void LexiconWorker::spanish_field(uint32_t field, std::string_view text, RecordResult& out,
                                  bool guarded) {
  // Noun-phrase agreement takes the whole field: determiners and adjectives are rewritten
  // only together with the person noun they agree with.
  np_tokens_.clear();
  for (size_t k = 0; k < cur_->items.size(); ++k)
    np_tokens_.push_back({cur_->items[k].begin, cur_->items[k].end, folded(k),
                          cur_->items[k].kind == text::TokenKind::word});
  NounPhraseAgreement::Field f{field, text, np_tokens_, cur_->spans, e_.target_, guarded};
  e_.np_->rewrite_field(f, out);
}

void LexiconWorker::field_matches(uint32_t field, std::string_view text, RecordResult& out,
                                  bool guarded) {
  if (e_.np_) return spanish_field(field, text, out, guarded);
  const pack::CompiledPack& pk = *e_.pack_;
  const size_t first_edit = out.edits.size();
  sense_tokens_.clear();
  for (size_t k = 0; k < cur_->items.size(); ++k) {
    const auto* entries = entries_at(k);
    if (entries == nullptr) {
      if (cur_->items[k].slots && cur_->items[k].slots->unpaired)
        note_unpaired(field, text, k, "has no counterpart in the pack");
      continue;
    }
    Match m = longest_match(k, *entries);
    if (!m.first) continue;
    uint32_t begin = cur_->items[k].begin;
    uint32_t end = cur_->items[k + m.len - 1].end - m.clitic;
    size_t next = k + m.len - 1;
    if (is_protected(begin, end)) {
      ++out.protected_spans;
      k = next;
      continue;
    }
    std::string_view original = text.substr(begin, end - begin);
    if (m.first->is_name && !names_person(*m.first, k, original, &m.note)) continue;
    if (!m.first->is_name && e_.senses_ && other_sense(text, k, m)) {
      k = next;
      continue;
    }
    uint16_t g = m.first->group;
    bool one_group = true;
    for (const auto* c : cands_) one_group = one_group && c->group == g;
    if (!one_group) {
      ++out.ambiguous;
      k = next;
      continue;
    }
    out.count_mention(g, field, begin, end);
    uint16_t t = e_.target_[g];
    auto form_of = [&](const pack::LexEntry* en) -> const std::string& {
      return en->is_name ? pk.names()[en->set].names[t] : pk.sets()[en->set].forms[t];
    };
    m.chosen = cands_.front();
    m.reason = m.first->is_name ? EditReason::name : EditReason::lexicon;
    bool differ = false;
    for (const auto* c : cands_) differ = differ || form_of(c) != form_of(m.chosen);
    if (differ && !guarded && t != g) choose_form(k, m, out);
    std::string_view replacement = form_of(m.chosen);
    if (auto pair =
            guarded || replacement.empty() ? std::nullopt : coordinated_pair(k, m, replacement)) {
      const Item &a = cur_->items[pair->first], &b = cur_->items[pair->last];
      if (is_protected(a.begin, b.end)) {
        ++out.protected_spans;
        k = pair->last;
        continue;
      }
      const Item& o = cur_->items[pair->other];
      out.count_mention(pair->other_group, field, o.begin, o.end);
      m.len = pair->last - pair->first + 1;
      m.note = "one person of either sex: a coordinated pair";
      original = text.substr(a.begin, b.end - a.begin);
      replacement = pair->form;
      keep_line_break(field, text, pair->first, pair->last);
      k = pair->first;
    } else if (guarded || t == g || replacement.empty()) {
      // A first name with no form at the target is the names rules' business (unswappable).
      if (!guarded && t != g && e_.senses_ && !m.first->is_name)
        note_unpaired(field, text, k, "has no form in that group");
      ++out.after[g];
      k = next;
      continue;
    }
    if (e_.options_.themselves && replacement == "themself") replacement = "themselves";
    k = emit(field, text, k, m, original, replacement, out);
  }
  merge_pending(first_edit, out);
}

void LexiconWorker::keep_line_break(uint32_t field, std::string_view text, size_t first,
                                    size_t last) {
  const auto& items = cur_->items;
  if (last + 1 >= items.size()) return;
  uint32_t after = items[last].end, next = items[last + 1].begin;
  if (after == next || text.substr(after, next - after).find('\n') != std::string_view::npos)
    return;
  for (size_t i = first; i < last; ++i) {
    std::string_view gap = text.substr(items[i].end, items[i + 1].begin - items[i].end);
    if (gap.find('\n') == std::string_view::npos) continue;
    Edit e;
    e.field = field;
    e.begin = after;
    e.end = next;
    e.replacement = std::string(gap);
    e.reason = EditReason::agreement;
    e.note = "line break kept";
    pending_.push_back(std::move(e));
    return;
  }
}

void LexiconWorker::merge_pending(size_t first_edit, RecordResult& out) {
  if (pending_.empty()) return;
  auto by_begin = [](const Edit& a, const Edit& b) { return a.begin < b.begin; };
  for (Edit& p : pending_) {
    bool overlaps = false;
    for (size_t i = first_edit; i < out.edits.size(); ++i)
      overlaps = overlaps || (out.edits[i].begin < p.end && p.begin < out.edits[i].end);
    if (!overlaps) out.edits.push_back(std::move(p));
  }
  pending_.clear();
  std::stable_sort(out.edits.begin() + static_cast<std::ptrdiff_t>(first_edit), out.edits.end(),
                   by_begin);
}

const pack::LexEntry* LexiconWorker::shared_form(std::string_view folded, uint16_t not_group,
                                                 std::span<const std::string_view> forms) const {
  const WordSlots* slots = e_.words_.find(folded);
  if (!slots || !slots->lex) return nullptr;
  for (const auto& en : *slots->lex) {
    if (en.is_name || en.words.size() != 1 || en.group == not_group) continue;
    std::string_view f = form_at_target(en);
    if (!f.empty() && std::find(forms.begin(), forms.end(), f) != forms.end()) return &en;
  }
  return nullptr;
}

std::string_view LexiconWorker::form_at_target(const pack::LexEntry& en) const {
  return e_.pack_->sets()[en.set].forms[e_.target_[en.group]];
}

std::optional<LexiconWorker::Pair> LexiconWorker::coordinated_pair(size_t k, const Match& m,
                                                                   std::string_view form) const {
  if (m.first->is_name || m.clitic > 0 || !e_.options_.toward) return std::nullopt;
  const auto& items = cur_->items;
  const size_t n = items.size(), last = k + m.len - 1;
  const uint16_t g = m.first->group;
  std::vector<std::string_view> forms{form};  // what this word may become
  for (const auto* c : cands_) forms.push_back(form_at_target(*c));
  auto is = [&](size_t j, std::string_view w) { return j < n && folded(j) == w; };
  auto touching = [&](size_t a, size_t b) { return items[a].end == items[b].begin; };
  // Forward: "he or she", "he/she", "he (or she)"; "him or herself", where the first word with
  // "self" is a form of the second's kind.
  bool paren = is(last + 1, "(") && is(last + 2, "or");
  size_t s = paren ? last + 3 : is(last + 1, "or") || is(last + 1, "/") ? last + 2 : n;
  if (s < n && items[s].kind == text::TokenKind::word && (!paren || is(s + 1, ")"))) {
    const pack::LexEntry* other = shared_form(folded(s), g, forms);
    std::string_view f = other ? form_at_target(*other) : std::string_view{};
    if (!other) {
      const WordSlots* own = e_.words_.find(std::string(folded(k)) + "self");
      for (size_t i = 0; own && own->lex && i < own->lex->size() && !other; ++i) {
        std::string_view fo = form_at_target((*own->lex)[i]);
        if ((*own->lex)[i].group == g && !fo.empty()) other = shared_form(folded(s), g, {&fo, 1});
        f = fo;
      }
    }
    if (other) return Pair{k, paren ? s + 1 : s, s, other->group, f};
  }
  // Backward: a fragment that makes the other form with this word ("s/he", "(s)he").
  if (k >= 2 && items[k - 2].kind == text::TokenKind::word && touching(k - 2, k - 1) &&
      touching(k - 1, k) && (is(k - 1, "/") || is(k - 1, ")"))) {
    size_t first = !is(k - 1, ")") ? k - 2 : k >= 3 && is(k - 3, "(") ? k - 3 : n;
    std::string whole = std::string(folded(k - 2)) + std::string(folded(k));
    const pack::LexEntry* other = first < n ? shared_form(whole, g, forms) : nullptr;
    if (other) return Pair{first, last, k - 2, other->group, form_at_target(*other)};
  }
  return std::nullopt;
}

// Words that open a clause of their own: a verb after them has another subject.
static bool opens_clause(std::string_view w) {
  static constexpr std::array<std::string_view, 17> kWords = {
      "that",  "who",   "which",  "whom",     "whose",  "when",  "where",   "if",  "because",
      "while", "since", "though", "although", "unless", "until", "whether", "than"};
  return std::find(kWords.begin(), kWords.end(), w) != kWords.end();
}

bool LexiconWorker::other_sense(std::string_view text, size_t k, const Match& m) {
  const std::vector<Item>& items = cur_->items;
  // "he he", "he-he-he": a subject pronoun written twice in a row with only white space or
  // hyphens between is laughter (or a stammer), not two mentions.
  auto doubled = [&](size_t a, size_t b) {  // items a < b, maybe a hyphen item between
    if (b < items.size() && b == a + 2 && folded(a + 1) == "-") return doubled_at(text, a, b);
    return b < items.size() && b == a + 1 && doubled_at(text, a, b);
  };
  bool subject = m.len == 1 && m.clitic == 0;
  for (const auto* c : cands_) subject = subject && c->tag == pack::Tag::subj;
  if (subject && ((k > 0 && doubled(k - 1, k)) || (k > 1 && doubled(k - 2, k)) ||
                  doubled(k, k + 1) || doubled(k, k + 2)))
    return true;
  if (sense_tokens_.empty()) {
    for (size_t j = 0; j < items.size(); ++j)
      sense_tokens_.push_back(
          {items[j].begin, items[j].end, folded(j), items[j].kind == text::TokenKind::word});
  }
  return e_.senses_->other_sense(text, sense_tokens_, k, e_.keep_god_);
}

bool LexiconWorker::doubled_at(std::string_view text, size_t a, size_t b) const {
  if (folded(a) != folded(b)) return false;
  std::string_view gap = text.substr(cur_->items[a].end, cur_->items[b].begin - cur_->items[a].end);
  return gap.find_first_not_of(" -") == gap.npos;
}

void LexiconWorker::note_unpaired(uint32_t field, std::string_view text, size_t k,
                                  const char* why) {
  const std::vector<Item>& items = cur_->items;
  if (is_protected(items[k].begin, items[k].end)) return;
  // The sentence: from after the last token made only of . ! ? before the word to the next.
  auto ends_sentence = [&](size_t j) {
    std::string_view w = folded(j);
    return !w.empty() && w.find_first_not_of(".!?") == std::string_view::npos;
  };
  size_t first = k, last = k;
  while (first > 0 && !ends_sentence(first - 1)) --first;
  while (last + 1 < items.size() && !ends_sentence(last)) ++last;
  const Item& it = items[k];
  unpaired_.push_back({field, items[first].begin, items[last].end,
                       std::string(text.substr(it.begin, it.end - it.begin)) + "' " + why});
}

void LexiconWorker::flag_unpaired(RecordResult& out) const {
  for (const Unpaired& u : unpaired_) {
    for (const Edit& e : out.edits) {
      if (e.field == u.field && e.from_group != Edit::kNone && e.from_group != e.to_group &&
          e.begin >= u.sentence_begin && e.begin < u.sentence_end) {
        out.flags.push_back({"unpaired_person", "'" + u.detail});
        return;
      }
    }
  }
}

size_t LexiconWorker::verb_agreement(uint32_t field, std::string_view text, size_t k, size_t len,
                                     uint32_t clitic, Edit& pronoun, RecordResult& out) {
  const VerbTable& verbs = *e_.verbs_;
  size_t last = k + len - 1;
  auto word_at = [&](size_t j) {
    return j < cur_->items.size() && cur_->items[j].kind == text::TokenKind::word;
  };
  auto raw = [&](size_t j) {
    return text.substr(cur_->items[j].begin, cur_->items[j].end - cur_->items[j].begin);
  };
  auto agree = [&](size_t j, std::string_view form, std::string note) {
    Edit e;
    e.field = field;
    e.begin = cur_->items[j].begin;
    e.end = cur_->items[j].end;
    e.replacement = recase(raw(j), form);
    e.reason = EditReason::agreement;
    e.note = std::move(note);
    return e;
  };
  // "she and I": the subject is plural already; the verb stays. ("Tom and he" is handled
  // below: after "and" a verb that is not singular is left alone without a flag.)
  bool after_and = k > 0 && folded(k - 1) == "and";
  if (last + 1 < cur_->items.size() && folded(last + 1) == "and") {
    out.edits.push_back(std::move(pronoun));
    return last;
  }
  // "she's": the clitic stands for "is" or "has".
  if (clitic > 0) {
    std::vector<std::string_view> following;
    for (size_t j = last + 1; j < cur_->items.size() && following.size() < 8; ++j)
      following.push_back(folded(j));
    auto c = verbs.resolve_s(following);
    std::string_view cl = text.substr(pronoun.end, clitic);
    if (cl.size() >= 2 && (cl.substr(cl.size() - 1) == "s" || cl.substr(cl.size() - 1) == "S")) {
      auto kind = c.kind == VerbTable::Contraction::unknown ? c.lean : c.kind;
      if (c.kind == VerbTable::Contraction::unknown)
        out.flags.push_back({"unsettled_contraction", "'s: " + c.reason});
      std::string apostrophe(cl.substr(0, cl.size() - 1));
      bool upper = cl.back() == 'S';
      std::string tail =
          kind == VerbTable::Contraction::have ? (upper ? "VE" : "ve") : (upper ? "RE" : "re");
      pronoun.end += clitic;
      pronoun.replacement += apostrophe + tail;
      pronoun.note = std::string("'s as ") + (kind == VerbTable::Contraction::have ? "has" : "is") +
                     (c.reason.empty() ? "" : ": " + c.reason);
    }
    out.edits.push_back(std::move(pronoun));
    return last;
  }
  // "Is she", "Does he", "..., isn't she?": an auxiliary stands before the pronoun. Only
  // auxiliaries invert in English; a lexical verb before a subject belongs to another clause
  // ("she says he knows"). An earlier edit may already have taken that verb.
  bool verb_free = out.edits.empty() || out.edits.back().field != field ||
                   out.edits.back().end <= cur_->items[k - (k > 0 ? 1 : 0)].begin;
  if (k > 0 && word_at(k - 1) && verb_free && VerbTable::is_inverting_auxiliary(folded(k - 1))) {
    auto a = verbs.pluralize(folded(k - 1));
    if (a.kind == VerbTable::Answer::plural) {
      out.edits.push_back(agree(k - 1, a.form, "verb before its subject"));
      out.edits.push_back(std::move(pronoun));
      return last;
    }
  }
  if (k > 0 && word_at(k - 1) && VerbTable::is_numberless_auxiliary(folded(k - 1))) {
    out.edits.push_back(std::move(pronoun));  // "Can she ride?": nothing to agree
    return last;
  }
  out.edits.push_back(std::move(pronoun));
  // The verb after the subject, past adverbs ("she often goes").
  size_t j = skip_adverbs(last + 1);
  if (!word_at(j)) return last;  // punctuation or the end: nothing to agree
  auto a = verbs.pluralize(folded(j));
  if (after_and && a.kind != VerbTable::Answer::plural) return last;
  if (a.kind == VerbTable::Answer::plural) {
    out.edits.push_back(agree(j, a.form, "verb agrees with plural subject"));
    coordinated_verbs(field, text, j, k > 0 && opens_clause(folded(k - 1)));
    return j;
  }
  if (a.kind == VerbTable::Answer::unknown) {
    out.flags.push_back(
        {"unsettled_verb", "'" + std::string(raw(j)) + "' after the subject: " + a.reason});
  }
  return last;
}

size_t LexiconWorker::skip_adverbs(size_t j) const {
  const auto& items = cur_->items;
  auto word_at = [&](size_t i) {
    return i < items.size() && items[i].kind == text::TokenKind::word;
  };
  while (word_at(j)) {
    if (e_.verbs_->is_preverbal_adverb(folded(j))) {
      ++j;
    } else if (folded(j) == "no" && word_at(j + 1) && folded(j + 1) == "longer") {
      j += 2;
    } else {
      break;
    }
  }
  return j;
}

void LexiconWorker::coordinated_verbs(uint32_t field, std::string_view text, size_t j,
                                      bool subordinate) {
  const VerbTable& verbs = *e_.verbs_;
  const auto& items = cur_->items;
  auto word_at = [&](size_t i) {
    return i < items.size() && items[i].kind == text::TokenKind::word;
  };
  // The scan ends at the end of the clause: sentence punctuation, a quotation mark or a
  // bracket, a word that opens another clause, or a finite verb not after a conjunction
  // (its subject is someone else: "they say Mary sings and dances").
  for (size_t i = j + 1; i < items.size() && i < j + 16; ++i) {
    std::string_view w = folded(i);
    if (!word_at(i) && w != ",") return;
    if (word_at(i) && (opens_clause(w) || verbs.is_third_singular(w))) return;
    if (w != "and" && w != "or" && w != "but") continue;
    // "and" joins like with like: after a word ending in s ("loves cats and dogs") what
    // follows may be a noun, not a verb; leave it.
    bool comma = i - 1 > j && folded(i - 1) == ",";
    if (comma && subordinate) return;
    size_t before = comma ? i - 2 : i - 1;
    if (before > j && folded(before).ends_with("s")) return;
    size_t v = skip_adverbs(i + 1);
    if (!word_at(v) || !verbs.is_third_singular(folded(v))) continue;
    auto a = verbs.pluralize(folded(v));
    if (a.kind != VerbTable::Answer::plural) return;
    Edit e;
    e.field = field;
    e.begin = items[v].begin;
    e.end = items[v].end;
    e.replacement = recase(text.substr(e.begin, e.end - e.begin), a.form);
    e.reason = EditReason::agreement;
    e.note = "verb coordinated with an agreed verb";
    pending_.push_back(std::move(e));
    i = v;
  }
}

const pack::Guard* LexiconWorker::find_guard(std::span<const std::string_view> fields, bool keep) {
  const pack::Guard* guard = nullptr;
  const bool has_guards = !e_.guards_.by_first.empty();
  if (!keep && !has_guards) return nullptr;
  for (size_t f = 0; f < fields.size(); ++f) {
    cur_ = &fields_[keep ? f : 0];
    prepare_field(fields[f]);
    if (guard || !has_guards) continue;
    const std::vector<Item>& items = cur_->items;
    for (size_t k = 0; k < items.size(); ++k) {
      const PhraseIndex::Phrase* hit;
      size_t len;
      if (items[k].slots && items[k].slots->guard && phrase_at(true, k, &hit, &len)) {
        guard = &e_.pack_->guards()[hit->index];
        break;
      }
    }
    if (guard && !keep) break;
  }
  return guard;
}

void LexiconWorker::rewrite(std::span<const std::string_view> fields, RecordResult& out) {
  size_t n_groups = e_.pack_->groups().size();
  out.clear();
  out.before.assign(n_groups, 0);
  out.after.assign(n_groups, 0);
  size_t bytes = 0;
  for (std::string_view f : fields) bytes += f.size();
  // Every field is prepared (once, when they fit in kKeptFieldBytes); a guard anywhere in the
  // record blocks the whole record, so the guards are looked for before any field is matched.
  const bool keep = bytes <= kKeptFieldBytes;
  const size_t states = keep ? fields.size() : std::min<size_t>(fields.size(), 1);
  if (fields_.size() < states) fields_.resize(states);
  const pack::Guard* guard = find_guard(fields, keep);
  out.guard = guard;
  // Names are judged over the whole record when its fields are kept, else field by field.
  calls_.clear();
  unswappable_.clear();
  unpaired_.clear();
  const bool judge = e_.persons_ != nullptr;
  if (judge && keep) {
    for (uint32_t f = 0; f < fields.size(); ++f) {
      cur_ = &fields_[f];
      judge_names(fields[f]);
    }
    settle_names();
  }
  for (uint32_t f = 0; f < fields.size(); ++f) {
    cur_ = &fields_[keep ? f : 0];
    if (!keep) prepare_field(fields[f]);
    if (judge && !keep) {
      calls_.clear();
      judge_names(fields[f]);
      settle_names();
    }
    words_.clear();
    field_matches(f, fields[f], out, guard != nullptr);
  }
  keep_edits_apart(out);
  flag_unswappable(out);
  flag_unpaired(out);
}

void LexiconWorker::trim() {
  fields_ = {};
  tokens_ = {};
  words_ = {};
  cands_ = {};
  np_tokens_ = {};
  calls_ = {};
  settle_ = {};
  cur_ = nullptr;
}

}  // namespace

Result<EngineData> load_engine_data(const std::shared_ptr<const pack::CompiledPack>& pack,
                                    std::vector<Error>& problems) {
  size_t first = problems.size();
  EngineData data;
  auto take = [&](auto loaded, auto& slot) {
    if (loaded.ok())
      slot = std::move(*loaded);
    else
      problems.push_back(std::move(loaded).error());
  };
  if (pack->file(kPossessiveModelFile) || pack->file(kWordClassesFile))
    take(PossessiveModel::from_pack(*pack), data.possessive);
  if (pack->file(kVerbsFile)) take(VerbTable::from_pack(*pack), data.verbs);
  if (pack->file(kNounPhraseFile)) take(NounPhraseAgreement::from_pack(pack), data.noun_phrases);
  if (pack->file(en::kPersonContextFile)) take(en::PersonContext::from_pack(*pack), data.persons);
  if (pack->file(en::kSensesFile)) take(en::Senses::from_pack(*pack), data.senses);
  if (problems.size() > first) return problems[first];
  return data;
}

Result<std::unique_ptr<Engine>> make_engine(std::shared_ptr<const pack::CompiledPack> pack,
                                            EngineData data, const EngineOptions& options) {
  auto ps = text::ProtectedSpans::create(options.protect_patterns);
  if (!ps.ok()) return std::move(ps).error();
  if (options.toward && *options.toward >= pack->groups().size()) {
    return make_error(ErrorKind::usage, "", "--toward names a group the pack does not have");
  }
  return std::unique_ptr<Engine>(std::make_unique<LexiconEngine>(
      std::move(pack), std::move(*ps), std::move(data.possessive), std::move(data.verbs),
      std::move(data.noun_phrases), std::move(data.persons), std::move(data.senses), options));
}

Result<std::unique_ptr<Engine>> make_engine(std::shared_ptr<const pack::CompiledPack> pack,
                                            const EngineOptions& options) {
  std::vector<Error> problems;
  auto data = load_engine_data(pack, problems);
  if (!data.ok()) return std::move(data).error();
  return make_engine(std::move(pack), std::move(*data), options);
}

}  // namespace evenhand::rewrite
