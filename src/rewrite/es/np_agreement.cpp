#include "rewrite/es/np_agreement.h"

#include <algorithm>
#include <optional>
#include <sstream>

#include "text/case.h"
#include "text/utf8.h"

namespace evenhand::rewrite {

namespace {

constexpr const char* kAdjectivesFile = "adjectives.data";
constexpr const char* kNounsFile = "common-gender.data";
constexpr const char* kStressedFile = "stressed-a.data";

// The data lines of a file: comments cut, fields split at white space, with line numbers.
struct DataLine {
  uint32_t line = 0;
  std::vector<std::string> f;
};
std::vector<DataLine> data_lines(const std::string& text) {
  std::vector<DataLine> out;
  std::istringstream in(text);
  std::string line;
  uint32_t n = 0;
  while (std::getline(in, line)) {
    ++n;
    line = line.substr(0, line.find('#'));
    std::istringstream fields(line);
    DataLine d;
    d.line = n;
    for (std::string w; fields >> w;) d.f.push_back(w);
    if (!d.f.empty()) out.push_back(std::move(d));
  }
  return out;
}

// The number of the first line of `text` that is not valid UTF-8, or 0 when every line is.
uint32_t first_non_utf8_line(std::string_view text) {
  uint32_t n = 0;
  for (size_t pos = 0; pos < text.size();) {
    size_t end = std::min(text.find('\n', pos), text.size());
    ++n;
    if (!text::valid_utf8(text.substr(pos, end - pos))) return n;
    pos = end + 1;
  }
  return 0;
}

Error line_error(const pack::CompiledPack& p, const std::string& file, uint32_t line,
                 std::string reason) {
  Error e = make_error(ErrorKind::pack, p.file_path(file), std::move(reason));
  if (line) e.line = line;
  return e;
}

bool ends_with(std::string_view s, std::string_view e) {
  return s.size() >= e.size() && s.substr(s.size() - e.size()) == e;
}

bool is_ascii(std::string_view s) {
  for (unsigned char c : s)
    if (c >= 0x80) return false;
  return true;
}

// Plural by the form: Spanish plurals end in -s; singulars that do end in -s end in a
// stressed -és (marqués) among the pack's person words (common practice).
bool plural_form(std::string_view folded) {
  return ends_with(folded, "s") && !ends_with(folded, "\xC3\xA9s");
}

// Endings that mark a finite verb form and no noun or adjective of a person: preterite,
// imperfect, future, first person plural, preterite in -í (common practice; used only as evidence
// for a clitic, which must also have a rewritten person as its nearest antecedent).
bool verb_ending(std::string_view w) {
  if (w.size() < 3) return false;
  for (std::string_view e : {"\xC3\xB3", "\xC3\xA9", "\xC3\xAD", "aba", "aban", "aron", "ieron",
                             "aste", "iste", "amos", "emos", "imos", "ar\xC3\xA1", "er\xC3\xA1",
                             "ir\xC3\xA1", "ar\xC3\xA1n", "er\xC3\xA1n", "ir\xC3\xA1n"}) {
    if (ends_with(w, e)) return true;
  }
  return false;
}

}  // namespace

Result<std::shared_ptr<const NounPhraseAgreement>> NounPhraseAgreement::from_pack(
    std::shared_ptr<const pack::CompiledPack> shared) {
  return from_pack(std::move(shared), {});
}

Result<std::shared_ptr<const NounPhraseAgreement>> NounPhraseAgreement::from_pack(
    std::shared_ptr<const pack::CompiledPack> shared,
    const std::map<std::string, std::string, std::less<>>& replaced) {
  std::shared_ptr<NounPhraseAgreement> t(new NounPhraseAgreement());
  const pack::CompiledPack& p = *shared;
  t->pack_ = std::move(shared);
  t->set_roles_.assign(p.sets().size(), 0);
  auto need = [&](const char* name) -> const std::string* {
    auto it = replaced.find(name);
    return it != replaced.end() ? &it->second : p.file(name);
  };
  for (const char* f : {kNounPhraseFile, kAdjectivesFile, kNounsFile, kStressedFile}) {
    if (!need(f))
      return make_error(ErrorKind::pack, p.file_path(f),
                        std::string("missing: noun-phrase agreement (switched on by ") +
                            kNounPhraseFile + ") needs it");
    // Forms are spliced into the output: a byte that is not UTF-8 would make it invalid.
    if (uint32_t line = first_non_utf8_line(*need(f)))
      return line_error(p, f, line, "not valid UTF-8");
  }

  // noun-phrase.data
  bool genders = false;
  for (const auto& d : data_lines(*need(kNounPhraseFile))) {
    const std::string& kind = d.f[0];
    auto err = [&](std::string why) { return line_error(p, kNounPhraseFile, d.line, why); };
    if (!genders && kind != "genders") return err("the first entry must be the genders line");
    if (kind == "genders") {
      if (genders || d.f.size() != 3) return err("one genders line: genders F_GROUP M_GROUP");
      auto fg = p.group_index(d.f[1]), mg = p.group_index(d.f[2]);
      if (!fg || !mg || *fg == *mg) return err("genders names two different groups of the pack");
      t->fem_group_ = *fg;
      t->masc_group_ = *mg;
      genders = true;
      continue;
    }
    uint16_t role = kind == "det"           ? kDet
                    : kind == "article"     ? (kDet | kArticle)
                    : kind == "contraction" ? (kDet | kArticle | kContraction)
                    : kind == "after"       ? kAfter
                    : kind == "clitic"      ? kClitic
                    : kind == "inert"       ? kInert
                    : kind == "alone"       ? kAlone
                    : kind == "pronoun"     ? kPronoun
                    : kind == "possessed"   ? kPossessed
                    : kind == "title"       ? kTitle
                                            : 0;
    if (role) {
      if (d.f.size() != 3) return err(kind + " takes a female and a male form");
      std::string fem = d.f[1] == "-" ? "" : d.f[1], masc = d.f[2] == "-" ? "" : d.f[2];
      std::replace(fem.begin(), fem.end(), '_', ' ');
      std::replace(masc.begin(), masc.end(), '_', ' ');
      bool found = false;
      for (uint32_t s = 0; s < p.sets().size(); ++s) {
        const auto& forms = p.sets()[s].forms;
        if (forms[t->fem_group_] == fem && forms[t->masc_group_] == masc) {
          t->set_roles_[s] |= role;
          found = true;
        }
      }
      if (!found) return err("no set '" + fem + " | " + masc + "' in the pack");
      continue;
    }
    Map<bool>* list = kind == "fixed"         ? &t->fixed_
                      : kind == "copula"      ? &t->copula_
                      : kind == "adverb"      ? &t->adverb_
                      : kind == "verb"        ? &t->verb_
                      : kind == "neuter"      ? &t->neuter_
                      : kind == "word"        ? &t->word_
                      : kind == "possessive"  ? &t->possessive_
                      : kind == "preposition" ? &t->preposition_
                                              : nullptr;
    if (!list) return err("unknown entry kind '" + kind + "'");
    if (d.f.size() < 2) return err(kind + " needs at least one word");
    for (size_t i = 1; i < d.f.size(); ++i) (*list)[d.f[i]] = true;
  }
  if (!genders) return line_error(p, kNounPhraseFile, 0, "no genders line");

  // adjectives.data: rules first (adj lines use them), then the rest in order.
  auto adj_lines = data_lines(*need(kAdjectivesFile));
  for (const auto& d : adj_lines) {
    if (d.f[0] != "rule") continue;
    if (d.f.size() != 5)
      return line_error(p, kAdjectivesFile, d.line, "rule takes four endings: M_SG F_SG M_PL F_PL");
    Rule r;
    for (size_t i = 0; i < 4; ++i) r.endings[i] = d.f[i + 1];
    t->rules_.push_back(std::move(r));
  }
  auto add_adjective = [&](Adjective a) {
    uint32_t idx = static_cast<uint32_t>(t->adjectives_.size());
    for (uint8_t s = 0; s < 4; ++s) {
      auto [it, fresh] = t->adj_forms_.try_emplace(a.forms[s], AdjForm{idx, 0, false});
      if (it->second.adjective == idx) it->second.slots |= static_cast<uint8_t>(1u << s);
    }
    t->adjectives_.push_back(std::move(a));
    return idx;
  };
  auto by_rule = [&](const std::string& msg, Adjective& a) {
    const Rule* best = nullptr;
    for (const auto& r : t->rules_)
      if (ends_with(msg, r.endings[m_sg]) && msg.size() > r.endings[m_sg].size() &&
          (!best || r.endings[m_sg].size() > best->endings[m_sg].size()))
        best = &r;
    if (!best) return false;
    std::string stem = msg.substr(0, msg.size() - best->endings[m_sg].size());
    for (size_t i = 0; i < 4; ++i) a.forms[i] = stem + best->endings[i];
    return true;
  };
  auto find_adj = [&](const std::string& msg) -> Adjective* {
    auto it = t->adj_forms_.find(msg);
    if (it == t->adj_forms_.end() || !(it->second.slots & 1)) return nullptr;
    return &t->adjectives_[it->second.adjective];
  };
  for (const auto& d : adj_lines) {
    const std::string& kind = d.f[0];
    auto err = [&](std::string why) { return line_error(p, kAdjectivesFile, d.line, why); };
    if (kind == "rule") continue;
    if (kind == "same") {
      if (d.f.size() != 3) return err("same takes SG PL");
      Adjective a;
      a.forms = {d.f[1], d.f[1], d.f[2], d.f[2]};
      a.invariable = true;
      add_adjective(std::move(a));
    } else if (kind == "pair") {
      if (d.f.size() != 5) return err("pair takes M_SG F_SG M_PL F_PL");
      Adjective a;
      for (size_t i = 0; i < 4; ++i) a.forms[i] = d.f[i + 1];
      add_adjective(std::move(a));
    } else if (kind == "adj") {
      for (size_t i = 1; i < d.f.size(); ++i) {
        if (find_adj(d.f[i])) continue;
        Adjective a;
        if (!by_rule(d.f[i], a)) return err("no rule inflects '" + d.f[i] + "'");
        add_adjective(std::move(a));
      }
    } else if (kind == "invariable") {
      if (d.f.size() != 2) return err("invariable takes one ending");
      t->invariable_endings_.push_back(d.f[1]);
    } else if (kind == "apocope") {
      if (d.f.size() != 4 || (d.f[3] != "m" && d.f[3] != "mf"))
        return err("apocope takes FULL SHORT m|mf");
      Adjective* a = find_adj(d.f[1]);
      if (!a) {
        Adjective fresh;
        if (!by_rule(d.f[1], fresh)) {
          fresh.forms = {d.f[1], d.f[1], d.f[1], d.f[1]};
          fresh.invariable = true;
        }
        a = &t->adjectives_[add_adjective(std::move(fresh))];
      }
      a->short_form = d.f[2];
      a->short_feminine = d.f[3] == "mf";
      uint32_t idx = static_cast<uint32_t>(a - t->adjectives_.data());
      auto [it, fresh] = t->adj_forms_.try_emplace(d.f[2], AdjForm{idx, 0, true});
      if (fresh) it->second.slots = a->short_feminine ? 3 : 1;
    } else {
      return err("unknown entry kind '" + kind + "'");
    }
  }

  // common-gender.data
  for (const auto& d : data_lines(*need(kNounsFile))) {
    if (d.f.size() != 3 || (d.f[0] != "common" && d.f[0] != "epicene-f" && d.f[0] != "epicene-m"))
      return line_error(p, kNounsFile, d.line, "expected KIND SINGULAR PLURAL");
    NounKind k = d.f[0] == "common" ? NounKind::common : NounKind::epicene;
    t->nouns_[d.f[1]] = Noun{k, false};
    t->nouns_[d.f[2]] = Noun{k, true};
  }
  // stressed-a.data: the nouns (singular); exceptions simply are not listed as nouns.
  for (const auto& d : data_lines(*need(kStressedFile))) {
    if (d.f.size() != 3 || (d.f[0] != "noun" && d.f[0] != "exception"))
      return line_error(p, kStressedFile, d.line, "expected noun SG PL or exception WORD KIND");
    if (d.f[0] == "noun") t->stressed_a_[pack::fold_word(d.f[1])] = true;
  }
  // A person noun's feminine singular form may begin with stressed a too ("ama"): it must be
  // listed as a noun there to get "el ama".
  return std::shared_ptr<const NounPhraseAgreement>(std::move(t));
}

NounPhraseAgreement::Inflection NounPhraseAgreement::inflect(std::string_view w, Gender from,
                                                             Gender to, bool plural, bool certain,
                                                             bool before_noun) const {
  Inflection r;
  auto slot = [&](Gender g) {
    return static_cast<Slot>((plural ? 2 : 0) + (g == Gender::feminine ? 1 : 0));
  };
  Slot fs = slot(from), ts = slot(to);
  if (auto it = adj_forms_.find(w); it != adj_forms_.end()) {
    const Adjective& a = adjectives_[it->second.adjective];
    if (!(it->second.slots & (1u << fs))) {
      r.kind = Inflection::not_agreeing;
      r.reason = "'" + std::string(w) + "' is not the form for this noun";
      return r;
    }
    std::string form = a.forms[ts];
    if (before_noun && !plural && !a.short_form.empty() &&
        (ts == m_sg || (a.short_feminine && ts == f_sg)))
      form = a.short_form;
    r.kind = form == w ? Inflection::same : Inflection::changed;
    r.form = std::move(form);
    return r;
  }
  for (const auto& e : invariable_endings_) {
    if (ends_with(w, e)) {
      r.kind = Inflection::same;
      r.form = std::string(w);
      return r;
    }
  }
  // The rules whose ending for `from` the word has.
  const Rule* best = nullptr;
  size_t matches = 0;
  bool ambiguous = false;
  for (const auto& rule : rules_) {
    const std::string& e = rule.endings[fs];
    if (!ends_with(w, e) || w.size() <= e.size()) continue;
    ++matches;
    if (!best || e.size() > best->endings[fs].size()) best = &rule;
  }
  if (!best) {
    // No ending of the rules for this slot: invariable ("amable", "feliz"), or the word has
    // another slot's ending ("alto" after a feminine noun).
    for (const auto& rule : rules_) {
      for (uint8_t s = 0; s < 4; ++s) {
        if (s != fs && ends_with(w, rule.endings[s]) && w.size() > rule.endings[s].size() &&
            rule.endings[s] != rule.endings[fs]) {
          r.kind = Inflection::not_agreeing;
          r.reason = "'" + std::string(w) + "' has the ending -" + rule.endings[s];
          return r;
        }
      }
    }
    r.kind = Inflection::same;
    r.form = std::string(w);
    return r;
  }
  if (!certain) {
    r.kind = Inflection::unknown;
    r.reason = "'" + std::string(w) + "' is not a known adjective (it may be a verb or a noun)";
    return r;
  }
  // Feminine to masculine: a longer ending whose masculine has a written accent (-ana from
  // -án) competes with the plain -a of -o (humana, humano).
  if (from == Gender::feminine && matches > 1 && !is_ascii(best->endings[m_sg])) ambiguous = true;
  if (ambiguous) {
    r.kind = Inflection::unknown;
    r.reason = "'" + std::string(w) + "': the masculine may end in -" + best->endings[slot(to)] +
               " or not; not a known adjective";
    return r;
  }
  std::string stem(w.substr(0, w.size() - best->endings[fs].size()));
  r.form = stem + best->endings[ts];
  if (before_noun && !plural && ts == m_sg) {
    // Apocope of an unknown adjective is not guessed: only the listed ones have it.
  }
  r.kind = r.form == w ? Inflection::same : Inflection::changed;
  return r;
}

// Per-field state of one rewrite.
struct NounPhraseAgreement::Worker {
  const NounPhraseAgreement& t;
  const Field& in;
  RecordResult& out;
  const pack::CompiledPack& pk;
  size_t n;
  std::vector<Edit> edits;
  std::vector<char> claimed;
  // The nearest earlier noun phrase of each gender (0 f, 1 m) and number (0 sg, 1 pl): -1 when
  // none, else the index of the person mention in `persons` or -2 for a phrase of no person.
  int last[2][2] = {{-1, -1}, {-1, -1}};
  int last_person[2][2] = {{-1, -1}, {-1, -1}};  // the nearest earlier person mention
  struct Person {
    std::string from_word, to_word;
    uint16_t to_group = 0;
  };
  std::vector<Person> persons;

  Worker(const NounPhraseAgreement& table, const Field& f, RecordResult& o)
      : t(table), in(f), out(o), pk(*table.pack_), n(f.tokens.size()), claimed(n, 0) {}

  std::string_view fold(size_t k) const { return in.tokens[k].folded; }
  std::string_view raw(size_t k) const {
    return in.text.substr(in.tokens[k].begin, in.tokens[k].end - in.tokens[k].begin);
  }
  bool word(size_t k) const { return k < n && in.tokens[k].word; }
  bool is_protected(size_t k) const {
    uint32_t b = in.tokens[k].begin, e = in.tokens[k].end;
    for (const auto& s : in.spans) {
      if (s.begin >= e) break;
      if (s.end > b) return true;
    }
    return false;
  }
  std::optional<Gender> gender_of(uint16_t g) const {
    if (g == t.fem_group_) return Gender::feminine;
    if (g == t.masc_group_) return Gender::masculine;
    return std::nullopt;
  }
  uint16_t group_of(Gender g) const { return g == Gender::feminine ? t.fem_group_ : t.masc_group_; }

  // Sets of the pack matched at k (same words), with the match length.
  struct SetMatch {
    std::vector<const pack::LexEntry*> entries;
    size_t len = 0;
  };
  SetMatch match(size_t k) const {
    SetMatch m;
    if (!word(k)) return m;
    const auto* list = pk.lookup(fold(k));
    if (!list) return m;
    for (const auto& en : *list) {
      if (!m.entries.empty() && en.words.size() < m.len) break;
      if (k + en.words.size() > n) continue;
      bool ok = true;
      for (size_t j = 1; j < en.words.size() && ok; ++j) ok = fold(k + j) == en.words[j];
      if (!ok) continue;
      if (m.entries.empty()) m.len = en.words.size();
      if (en.words.size() == m.len) m.entries.push_back(&en);
    }
    return m;
  }
  // The dependent set with role `role` among the single-word sets at k, or null.
  const pack::LexEntry* dependent(size_t k, uint16_t role) const {
    if (!word(k)) return nullptr;
    const auto* list = pk.lookup(fold(k));
    if (!list) return nullptr;
    for (const auto& en : *list)
      if (!en.is_name && en.words.size() == 1 && (t.set_roles_[en.set] & role)) return &en;
    return nullptr;
  }
  bool any_dependent(size_t k) const {
    return dependent(k, kDet | kAfter | kClitic) != nullptr ||
           (k + 1 < n && contraction_at(k) != nullptr);
  }
  // A two-word contraction set ("de la") starting at k.
  const pack::LexEntry* contraction_at(size_t k) const {
    if (!word(k) || k + 1 >= n) return nullptr;
    const auto* list = pk.lookup(fold(k));
    if (!list) return nullptr;
    for (const auto& en : *list)
      if (!en.is_name && en.words.size() == 2 && (t.set_roles_[en.set] & kContraction) &&
          fold(k + 1) == en.words[1])
        return &en;
    return nullptr;
  }
  bool person_word(size_t k) const {
    SetMatch m = match(k);
    for (const auto* e : m.entries)
      if (e->is_name || t.person_set(e->set)) return true;
    return t.nouns_.count(std::string(fold(k))) > 0;
  }

  // Adds the edit unless its tokens are claimed or it changes nothing; returns whether it did.
  // `mention` (from_group, to_group, hit) is set on the edit of a person mention.
  bool add_edit(size_t first, size_t last, std::string_view form, EditReason why,
                const pack::SourceRef* rule, std::string note, const Edit* mention = nullptr) {
    for (size_t j = first; j <= last; ++j)
      if (claimed[j]) return false;
    Edit e;
    if (mention) {
      e.from_group = mention->from_group;
      e.to_group = mention->to_group;
      e.hit = mention->hit;
    }
    e.field = in.index;
    e.begin = in.tokens[first].begin;
    e.end = in.tokens[last].end;
    std::string_view original = in.text.substr(e.begin, e.end - e.begin);
    text::apply_case(form, text::case_pattern(raw(first)), e.replacement);
    if (e.replacement == original) return false;
    e.reason = why;
    e.rule = rule;
    e.note = std::move(note);
    for (size_t j = first; j <= last; ++j) claimed[j] = 1;
    edits.push_back(std::move(e));
    return true;
  }
  void flag(std::string code, std::string detail) {
    out.flags.push_back({std::move(code), std::move(detail)});
  }

  // The determiners of a noun phrase whose noun starts at item k: indexes of the determiner
  // tokens (a contraction by its first token) and of adjectives between them and the noun.
  struct Left {
    std::vector<size_t> dets;  // nearest first
    std::vector<size_t> adjs;  // nearest first
  };
  // True when `w` may be an adjective agreeing with a noun of gender `g` (either gender when
  // unknown) and number `plural`: a known adjective, or a word with a rule's ending for it.
  bool looks_agreeing(std::string_view w, std::optional<Gender> g, bool plural) const {
    if (t.adj_forms_.count(std::string(w))) return true;
    for (const auto& r : t.rules_) {
      for (Gender x : {Gender::feminine, Gender::masculine}) {
        if (g && x != *g) continue;
        const std::string& e = r.endings[(plural ? 2 : 0) + (x == Gender::feminine ? 1 : 0)];
        if (ends_with(w, e) && w.size() > e.size()) return true;
      }
    }
    return false;
  }

  Left left_of(size_t k, std::optional<Gender> g, bool plural) const {
    Left l;
    size_t j = k;
    std::vector<size_t> adjs;
    while (j > 0 && adjs.size() < 2) {
      size_t c = j - 1;
      if (!word(c) || claimed[c] || any_dependent(c) || t.in(t.fixed_, fold(c)) || person_word(c) ||
          t.in(t.word_, fold(c)) || t.in(t.copula_, fold(c)) || t.in(t.verb_, fold(c)) ||
          t.in(t.adverb_, fold(c)) || t.nouns_.count(std::string(fold(c))) ||
          t.stressed_a_.count(std::string(fold(c))) || !looks_agreeing(fold(c), g, plural))
        break;
      adjs.push_back(c);
      j = c;
    }
    // Determiners must come right before (the adjectives, or the noun).
    for (size_t tries = 0; tries < 2; ++tries) {
      size_t i = j;
      while (i > 0 && l.dets.size() < 3) {
        size_t c = i - 1;
        if (c > 0 && contraction_at(c - 1)) {
          l.dets.push_back(c - 1);
          break;  // a preposition ends the phrase
        }
        if (dependent(c, kDet) || t.in(t.fixed_, fold(c))) {
          l.dets.push_back(c);
          i = c;
          continue;
        }
        break;
      }
      if (!l.dets.empty() || adjs.empty()) break;
      // No determiner before the adjectives: they were not adjectives of this noun.
      j = k;
      adjs.clear();
    }
    if (!l.dets.empty()) l.adjs = adjs;
    return l;
  }

  // Gender of the determiner at i for the noun at k (whose singular feminine form begins
  // with stressed a when `stressed`); nullopt when it has none ("mi").
  std::optional<Gender> det_gender(size_t i, bool adjacent, bool stressed) const {
    const pack::LexEntry* e = contraction_at(i);
    if (!e) e = dependent(i, kDet);
    if (!e) return std::nullopt;
    auto g = gender_of(e->group);
    if (g == Gender::masculine && stressed && adjacent && (t.set_roles_[e->set] & kArticle))
      return Gender::feminine;  // "el agua", "un ama", "del ama"
    return g;
  }

  // Rewrites the determiners and adjectives of the noun phrase whose noun is at k..k+len-1,
  // and its predicate. `from_word`/`to_word` are the noun's forms (for notes).
  void agree(size_t k, size_t len, Gender from, Gender to, bool plural, std::string_view from_word,
             std::string_view to_word, bool old_stressed, bool new_stressed, const Left& l) {
    std::string who = "'" + std::string(from_word) + "' -> '" + std::string(to_word) + "'";
    size_t nearest = l.adjs.empty() ? k : l.adjs.back();
    bool dets_agree = true;
    for (size_t i : l.dets) {
      bool adjacent = (contraction_at(i) ? i + 2 : i + 1) == nearest && l.adjs.empty();
      auto g = det_gender(i, adjacent, old_stressed && !plural);
      if (!g) continue;  // no gender: "mi", "cada"
      const pack::LexEntry* e = contraction_at(i);
      size_t last = e ? i + 1 : i;
      if (!e) e = dependent(i, kDet);
      if (*g != from) {
        dets_agree = false;
        flag("unsettled_determiner",
             "'" + std::string(raw(i)) + "' before " + who + " does not agree with the noun");
        continue;
      }
      const auto& forms = pk.sets()[e->set].forms;
      std::string form = forms[group_of(to)];
      std::string note = "determiner agrees with " + who;
      if (to == Gender::feminine && !plural && adjacent && new_stressed &&
          (t.set_roles_[e->set] & kArticle)) {
        form = forms[t.masc_group_];
        note += " (feminine noun with stressed a takes this form; RAE)";
      }
      if (form.empty()) continue;
      add_edit(i, last, form, EditReason::agreement, &pk.sets()[e->set].where, note);
    }
    for (size_t a : l.adjs) {
      if (!dets_agree) break;  // "el hada madrina": the phrase is not this noun's
      auto r = t.inflect(fold(a), from, to, plural, true, true);
      if (r.kind == Inflection::changed) {
        add_edit(a, a, r.form, EditReason::agreement, nullptr,
                 "adjective before the noun agrees with " + who);
      } else if (r.kind == Inflection::unknown) {
        flag("unsettled_adjective", r.reason + ", before " + who);
      }
    }
    // After the noun; "la niña, cansada, ...": a known adjective between commas too.
    size_t j = k + len;
    if (j + 2 < n && fold(j) == "," && word(j + 1) &&
        t.adj_forms_.count(std::string(fold(j + 1))) && fold(j + 2) == ",")
      ++j;
    for (int count = 0; count < 3 && word(j) && !claimed[j]; ++count) {
      if (const auto* e = dependent(j, kAfter)) {
        if (gender_of(e->group) != from) break;
        add_edit(j, j, pk.sets()[e->set].forms[group_of(to)], EditReason::agreement,
                 &pk.sets()[e->set].where, "agrees with " + who);
        ++j;
        continue;
      }
      std::string_view w = fold(j);
      if (any_dependent(j) || person_word(j) || t.in(t.fixed_, w) || t.in(t.copula_, w) ||
          t.in(t.adverb_, w) || t.in(t.verb_, w) || t.in(t.word_, w))
        break;
      auto pat = text::case_pattern(raw(j));
      if (pat == text::CasePattern::title || pat == text::CasePattern::mixed) break;  // a name
      auto r = t.inflect(w, from, to, plural, false, false);
      if (r.kind == Inflection::changed) {
        add_edit(j, j, r.form, EditReason::agreement, nullptr,
                 "adjective after the noun agrees with " + who);
      } else if (r.kind == Inflection::unknown && l.dets.empty()) {
        break;  // a pronoun or a bare noun: "ella canta" is no noun phrase with an adjective
      } else if (r.kind == Inflection::unknown) {
        flag("unsettled_adjective", r.reason + ", after " + who);
        break;
      } else if (r.kind == Inflection::not_agreeing) {
        break;
      } else if (t.adj_forms_.find(w) == t.adj_forms_.end()) {
        break;  // invariable or not an adjective: nothing to change, and the phrase ends
      }
      ++j;
      // "alta y rubia": a known adjective after "y" continues the phrase.
      if (word(j) && (fold(j) == "y" || fold(j) == "e") && word(j + 1) &&
          t.adj_forms_.count(std::string(fold(j + 1))))
        ++j;
    }
    // A subject after a preposition ("de la niña") or coordinated ("la niña y su padre") does
    // not govern the predicate.
    size_t start = l.dets.empty() ? k : l.dets.back();
    static const char* const kPrepositions[] = {"de",  "a",     "con",   "para",  "por",   "en",
                                                "sin", "entre", "sobre", "hacia", "desde", "hasta"};
    bool after_prep = false;
    if (start > 0)
      for (const char* p : kPrepositions) after_prep = after_prep || fold(start - 1) == p;
    if (contraction_at(start) || dependent(start, kContraction)) after_prep = true;
    // A predicative noun ("es médica y ...") is no subject either.
    bool predicative = start > 0 && t.in(t.copula_, fold(start - 1));
    // "Esa es la tía": a demonstrative standing alone at the start of the clause is the
    // subject and refers to the same person as the predicative noun.
    if (predicative && start >= 2 && (start == 2 || !word(start - 3))) {
      const pack::LexEntry* e = dependent(start - 2, kDet);
      if (e && gender_of(e->group) == from && !t.person_set(e->set))
        add_edit(start - 2, start - 2, pk.sets()[e->set].forms[group_of(to)], EditReason::agreement,
                 &pk.sets()[e->set].where,
                 "subject of '" + std::string(raw(start - 1)) + "' refers to " + who);
    }
    // "una de las chicas", "ninguno de ellos": a quantifier standing for the noun, before "de".
    if (start >= 2 && fold(start - 1) == "de") {
      const pack::LexEntry* e = dependent(start - 2, kAlone);
      if (!e) e = dependent(start - 2, kDet);
      const std::string* form = e ? &pk.sets()[e->set].forms[group_of(to)] : nullptr;
      if (e && gender_of(e->group) == from && !form->empty() &&
          !(dependent(start - 2, kArticle) && !dependent(start - 2, kAlone)))
        add_edit(start - 2, start - 2, *form, EditReason::agreement, &pk.sets()[e->set].where,
                 "stands for " + who + " before 'de'");
    }
    if (after_prep || predicative) return;
    // "el hijo de mi vecina es alto": the predicate agrees with the head, past a complement
    // with "de" (whose own noun, after the preposition, governs no predicate).
    if (word(j) && (fold(j) == "de" || fold(j) == "del")) {
      for (size_t c = j + 1, words = 0; c < n && words < 5; ++c) {
        if (!word(c)) break;
        ++words;
        if (t.in(t.copula_, fold(c))) {
          j = c;
          break;
        }
      }
    }
    // "ella y su madre": a person word right before the conjunction; ", y el presidente
    // quedó" joins clauses, not subjects.
    bool coordinated = start > 1 && word(start - 1) && conjunction(fold(start - 1)) &&
                       person_word(start - 2) && !(start > 2 && t.in(t.copula_, fold(start - 3)));
    predicate(j, from, to, plural, who, coordinated);
  }

  static bool conjunction(std::string_view w) {
    return w == "y" || w == "e" || w == "o" || w == "u" || w == "ni";
  }

  // `coordinated`: the subject is the second part of "X y Y".
  void predicate(size_t j, Gender from, Gender to, bool plural, const std::string& who,
                 bool coordinated = false) {
    if (word(j) && conjunction(fold(j))) {
      // "ella y su madre están cansadas": the predicate agrees with both; not settled here.
      for (size_t c = j + 1, words = 0; c < n && words < 6 && word(c); ++c, ++words) {
        if (t.in(t.copula_, fold(c))) {
          flag("unsettled_predicate",
               "coordinated subject " + who + " before '" + std::string(raw(c)) + "'");
          break;
        }
      }
      return;
    }
    auto adverb = [&](size_t i) {
      return word(i) && (t.in(t.adverb_, fold(i)) || ends_with(fold(i), "mente"));
    };
    for (int s = 0; s < 3 && adverb(j); ++s) ++j;
    if (!word(j) || !t.in(t.copula_, fold(j))) return;
    if (coordinated) {
      flag("unsettled_predicate",
           "coordinated subject " + who + " before '" + std::string(raw(j)) + "'");
      return;
    }
    std::string cop(raw(j));
    ++j;
    // "ha sido elegida": a participle of ser/estar after the copula is part of it.
    if (word(j) && (fold(j) == "sido" || fold(j) == "estado")) ++j;
    for (int s = 0; s < 3 && adverb(j); ++s) ++j;
    for (int count = 0; count < 3 && word(j) && !claimed[j]; ++count) {
      std::string_view w = fold(j);
      if (any_dependent(j) || person_word(j) || t.in(t.fixed_, w) || t.in(t.copula_, w) ||
          t.in(t.verb_, w) || t.in(t.word_, w))
        return;
      auto pat = text::case_pattern(raw(j));
      if (pat == text::CasePattern::title || pat == text::CasePattern::mixed) return;
      // "es buena persona": the adjective belongs to the epicene noun after it.
      if (word(j + 1)) {
        auto nit = t.nouns_.find(fold(j + 1));
        if (nit != t.nouns_.end()) return;
      }
      auto r = t.inflect(w, from, to, plural, true, false);
      if (r.kind == Inflection::changed) {
        add_edit(j, j, r.form, EditReason::agreement, nullptr,
                 "predicate after '" + cop + "' agrees with subject " + who);
      } else if (r.kind == Inflection::unknown) {
        flag("unsettled_adjective", r.reason + ", predicate of " + who);
        return;
      } else if (r.kind == Inflection::not_agreeing) {
        return;
      }
      ++j;
      if (word(j) && (fold(j) == "y" || fold(j) == "e")) {
        ++j;
      } else if (j < n && fold(j) == "," && word(j + 1) &&
                 t.adj_forms_.count(std::string(fold(j + 1)))) {
        ++j;
      } else {
        return;
      }
    }
  }

  void remember(Gender g, bool plural, int who) {
    last[g == Gender::feminine ? 0 : 1][plural ? 1 : 0] = who;
    if (who >= 0) last_person[g == Gender::feminine ? 0 : 1][plural ? 1 : 0] = who;
  }

  bool is_stressed(std::string_view folded_form) const {
    return t.stressed_a_.count(std::string(folded_form)) > 0;
  }

  // A clitic at k: rewritten when it refers to a rewritten person.
  bool clitic(size_t k) {
    const pack::LexEntry* e = dependent(k, kClitic);
    if (!e) return false;
    auto g = gender_of(e->group);
    if (!g) return false;
    bool plural = plural_form(fold(k));
    int gi = *g == Gender::feminine ? 0 : 1, ni = plural ? 1 : 0;
    int who = last[gi][ni];
    if (who == -1) return false;
    bool verb_next = word(k + 1) && !person_word(k + 1) && !any_dependent(k + 1) &&
                     (t.in(t.verb_, fold(k + 1)) || verb_ending(fold(k + 1)));
    static const char* const kBefore[] = {"no",      "se", "ya", "nunca", "jamás",
                                          "también", "me", "te", "nos",   "os"};
    bool intro = false;
    if (k > 0)
      for (const char* b : kBefore) intro = intro || fold(k - 1) == b;
    bool next_ok = word(k + 1) && !person_word(k + 1) && !any_dependent(k + 1) &&
                   !t.adj_forms_.count(std::string(fold(k + 1))) && !t.in(t.word_, fold(k + 1));
    if (!verb_next && !(intro && next_ok)) return false;
    // "él lo dijo": before a verb of saying or knowing, "lo" is the neuter clitic.
    if (*g == Gender::masculine && !plural && word(k + 1) && t.in(t.neuter_, fold(k + 1)))
      return false;
    if (who == -2) {
      // The nearest phrase of this gender is no person, but a rewritten person came before
      // it: the clitic may refer to either ("vi a mi hermano en el ensayo y lo saludé").
      if (last_person[gi][ni] >= 0) {
        const Person& p = persons[static_cast<size_t>(last_person[gi][ni])];
        flag("unsettled_clitic", "'" + std::string(raw(k)) + "' may refer to '" + p.from_word +
                                     "' or to a later noun of the same gender");
      }
      return false;
    }
    const Person& p = persons[who];
    auto tg = gender_of(p.to_group);
    if (!tg || *tg == *g) return false;
    add_edit(k, k, pk.sets()[e->set].forms[p.to_group], EditReason::agreement,
             &pk.sets()[e->set].where,
             "clitic refers to '" + p.from_word + "' -> '" + p.to_word + "'");
    return true;
  }

  void run() {
    for (size_t k = 0; k < n; ++k) {
      if (!word(k) || claimed[k]) continue;
      SetMatch m = match(k);
      const pack::LexEntry* person = nullptr;
      bool one_group = true;
      for (const auto* e : m.entries) {
        if (e->is_name || t.person_set(e->set)) {
          if (person && person->group != e->group) one_group = false;
          if (!person) person = e;
        }
      }
      if (person && one_group) person = sense_of(k, m);
      if (person) {
        if (is_protected(k)) {
          ++out.protected_spans;
          k += m.len - 1;
          continue;
        }
        if (!one_group) {
          ++out.ambiguous;
          continue;
        }
        if (title_alone(k, m.len, *person) || pronoun_of_thing(k, *person) ||
            describes_named(k, *person))
          continue;
        person_noun(k, m.len, *person);
        continue;
      }
      auto nit = t.nouns_.find(fold(k));
      if (nit != t.nouns_.end() && !is_protected(k)) {
        if (nit->second.kind == NounKind::common) common_noun(k, nit->second.plural);
        continue;
      }
      if (is_protected(k)) continue;
      if (clitic(k)) continue;
      // A determiner of some other noun: the nearest phrase of its gender is no person.
      if (const auto* e = contraction_at(k) ? contraction_at(k) : dependent(k, kDet)) {
        if (auto g = gender_of(e->group))
          remember(*g, plural_form(fold(contraction_at(k) ? k + 1 : k)), -2);
      }
    }
    std::sort(edits.begin(), edits.end(),
              [](const Edit& a, const Edit& b) { return a.begin < b.begin; });
    for (auto& e : edits) out.edits.push_back(std::move(e));
  }

  // Whether the title of address at k..k+len-1 is no person to rewrite here: a title names a
  // person only before a capitalised word ("don Luis"; "un don" is a gift), and when that
  // word is no first name of the pack, the title cannot change without the name: the record
  // is flagged (unswappable_person) rather than written as "doña Luis".
  bool title_alone(size_t k, size_t len, const pack::LexEntry& en) {
    if (en.is_name || !(t.set_roles_[en.set] & kTitle)) return false;
    size_t j = k + len;
    if (!word(j)) return true;
    auto pat = text::case_pattern(raw(j));
    if (pat != text::CasePattern::title && pat != text::CasePattern::upper) return true;
    for (const auto* e : match(j).entries)
      if (e->is_name) return false;
    if (!in.guarded && in.target[en.group] != en.group)
      flag("unswappable_person", "'" + std::string(raw(k)) + " " + std::string(raw(j)) +
                                     "': a title before a name the pack cannot swap");
    return true;
  }

  // Whether the pronoun at k, after a preposition, refers to a thing: the nearest earlier
  // noun phrase of its gender and number is no person ("la casa ... vivir en ella").
  // When a rewritten person of that gender came before the thing, the pronoun may refer to
  // either ("mi hermana llegó; la casa era de ella"): the record is flagged
  // (unsettled_pronoun) and the pronoun stays.
  bool pronoun_of_thing(size_t k, const pack::LexEntry& en) {
    if (en.is_name || !(t.set_roles_[en.set] & kPronoun)) return false;
    if (k == 0 || !word(k - 1) || !t.in(t.preposition_, fold(k - 1))) return false;
    auto g = gender_of(en.group);
    if (!g) return false;
    int gi = *g == Gender::feminine ? 0 : 1, ni = plural_form(fold(k)) ? 1 : 0;
    if (last[gi][ni] != -2) return false;
    if (last_person[gi][ni] >= 0) {
      const Person& p = persons[static_cast<size_t>(last_person[gi][ni])];
      flag("unsettled_pronoun", "'" + std::string(raw(k)) + "' may refer to '" + p.from_word +
                                    "' or to a later noun of the same gender");
    }
    return true;
  }

  // Whether the person noun at k stands in an attribution line ("-- Honorato de Balzac.
  // (1799-1850) Escritor francés."): a line that opens with a dash and a capitalised word
  // names a person, and a person noun on it describes that person. The pack has no Spanish
  // first names, so the name cannot change with the noun: the record is flagged
  // (unswappable_person) rather than written as "Escritora" beside a man's name.
  bool describes_named(size_t k, const pack::LexEntry& en) {
    if (en.is_name || (t.set_roles_[en.set] & kPronoun)) return false;
    std::string_view text = in.text;
    size_t at = in.tokens[k].begin;
    size_t line = text.rfind('\n', at == 0 ? 0 : at - 1);
    line = line == std::string_view::npos || at == 0 ? 0 : line + 1;
    std::string_view rest = text.substr(line, at - line);
    size_t i = rest.find_first_not_of(" \t");
    if (i == std::string_view::npos) return false;
    rest.remove_prefix(i);
    size_t dash = rest.starts_with("--")       ? 2
                  : rest.starts_with("\u2014") ? 3  // em dash
                  : rest.starts_with("\u2015") ? 3  // horizontal bar
                                               : 0;
    if (dash == 0) return false;
    rest.remove_prefix(dash);
    i = rest.find_first_not_of(" \t");
    if (i == std::string_view::npos) return false;
    std::string_view first = rest.substr(i, rest.find_first_of(" \t.,(", i) - i);
    auto pat = text::case_pattern(first);
    if (pat != text::CasePattern::title && pat != text::CasePattern::upper) return false;
    if (!in.guarded && in.target[en.group] != en.group)
      flag("unswappable_person", "'" + std::string(raw(k)) + "' describes '" + std::string(first) +
                                     "', named in an attribution line");
    return true;
  }

  // The person entry of match m at k: a set with the possessed role ("mujer | marido") right
  // after a possessive determiner ("su mujer"), another person set elsewhere ("la mujer").
  const pack::LexEntry* sense_of(size_t k, const SetMatch& m) const {
    const pack::LexEntry *plain = nullptr, *possessed = nullptr;
    for (const auto* e : m.entries) {
      if (!e->is_name && (t.set_roles_[e->set] & kPossessed))
        possessed = possessed ? possessed : e;
      else if (e->is_name || t.person_set(e->set))
        plain = plain ? plain : e;
    }
    bool after_possessive = k > 0 && word(k - 1) && t.in(t.possessive_, fold(k - 1));
    if (possessed && (after_possessive || !plain)) return possessed;
    return plain;
  }

  void person_noun(size_t k, size_t len, const pack::LexEntry& en) {
    const std::string& from_form =
        en.is_name ? pk.names()[en.set].names[en.group] : pk.sets()[en.set].forms[en.group];
    if (en.is_name) {
      auto pat = text::case_pattern(raw(k));
      if (pat != text::CasePattern::title && pat != text::CasePattern::upper) return;
    }
    uint16_t g = en.group;
    Left l;
    if (en.is_name || !(t.set_roles_[en.set] & kPronoun))
      l = left_of(k, gender_of(g), plural_form(pack::fold_word(from_form)));
    // "ella ama", "atención médica": a verb or an adjective; "es médica" (after a copula) and
    // "la médica" are the noun.
    if (en.tag == pack::Tag::noun && l.dets.empty() && !(k > 0 && t.in(t.copula_, fold(k - 1))))
      return;

    out.count_mention(g, in.index, in.tokens[k].begin, in.tokens[k + len - 1].end);
    uint16_t tg = in.target[g];
    const std::string& to_form =
        en.is_name ? pk.names()[en.set].names[tg] : pk.sets()[en.set].forms[tg];
    if (in.guarded || tg == g || to_form.empty()) {
      ++out.after[g];
      return;
    }
    Edit mention;  // the groups and entry hit its edit carries (Edit::hit)
    mention.from_group = g;
    mention.to_group = tg;
    mention.hit = en.is_name ? static_cast<uint32_t>(pk.sets().size() + en.set) : en.set;
    ++out.after[tg];
    out.entry_hits.push_back(mention.hit);
    const pack::SourceRef* rule = en.is_name ? &pk.names()[en.set].where : &pk.sets()[en.set].where;
    // Not made when the spelling stays ("la estudiante" -> "el estudiante"): the determiners
    // still agree below, so the mention moves group all the same.
    add_edit(k, k + len - 1, to_form, en.is_name ? EditReason::name : EditReason::lexicon, rule, "",
             &mention);
    if (en.is_name) return;
    auto from = gender_of(g), to = gender_of(tg);
    if (!from || !to) {
      flag("unsettled_agreement", "'" + from_form + "' -> '" + to_form +
                                      "': the noun phrase cannot agree with that group");
      return;
    }
    bool plural = plural_form(pack::fold_word(from_form));
    persons.push_back({from_form, to_form, tg});
    agree(k, len, *from, *to, plural, from_form, to_form, is_stressed(pack::fold_word(from_form)),
          is_stressed(pack::fold_word(to_form)), l);
    remember(*from, plural, static_cast<int>(persons.size() - 1));
  }

  void common_noun(size_t k, bool plural) {
    Left l = left_of(k, std::nullopt, plural);
    std::optional<Gender> g;
    for (size_t i : l.dets) {
      size_t nearest = l.adjs.empty() ? k : l.adjs.back();
      bool adjacent = (contraction_at(i) ? i + 2 : i + 1) == nearest && l.adjs.empty();
      if ((g = det_gender(i, adjacent, false))) break;
    }
    if (!g) return;  // "estudiantes", "mi colega": the gender is not shown
    uint16_t grp = group_of(*g);
    out.count_mention(grp, in.index, in.tokens[k].begin, in.tokens[k].end);
    uint16_t tg = in.target[grp];
    auto to = gender_of(tg);
    if (in.guarded || tg == grp || !to) {
      ++out.after[grp];
      return;
    }
    ++out.after[tg];
    std::string noun(raw(k));
    persons.push_back({noun, noun, tg});
    agree(k, 1, *g, *to, plural, noun + " (common gender, " + pk.groups()[grp] + ")",
          noun + " (" + pk.groups()[tg] + ")", false, false, l);
    remember(*g, plural, static_cast<int>(persons.size() - 1));
  }
};

std::vector<std::string> NounPhraseAgreement::adjective_forms() const {
  std::vector<std::string> out;
  for (const auto& a : adjectives_) {
    out.insert(out.end(), a.forms.begin(), a.forms.end());
    if (!a.short_form.empty()) out.push_back(a.short_form);
  }
  std::sort(out.begin(), out.end());
  out.erase(std::unique(out.begin(), out.end()), out.end());
  return out;
}

void NounPhraseAgreement::rewrite_field(const Field& field, RecordResult& out) const {
  Worker w(*this, field, out);
  w.run();
}

}  // namespace evenhand::rewrite
