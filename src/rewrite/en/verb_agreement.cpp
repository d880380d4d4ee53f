#include "rewrite/en/verb_agreement.h"

#include "pack/data_records.h"

#include <algorithm>
#include <array>
#include <utility>

namespace evenhand::rewrite {

namespace {

constexpr std::string_view kFormatLine = "format evenhand-verbs 1";
constexpr std::string_view kCurly = "\xE2\x80\x99";  // U+2019 RIGHT SINGLE QUOTATION MARK

// "be" and the contracted negatives: person and number show in the form itself, so they are
// listed here rather than derived (from memory, general knowledge of English).
constexpr std::array<std::pair<std::string_view, std::string_view>, 6> kPluralOf = {{
    {"is", "are"},
    {"was", "were"},
    {"isn't", "aren't"},
    {"wasn't", "weren't"},
    {"doesn't", "don't"},
    {"hasn't", "haven't"},
}};

// The modals and their negatives (from memory, general knowledge of English): no number,
// and before a subject ("Can she ride?") they leave the verb after it in its base form.
constexpr std::array<std::string_view, 20> kModals = {
    "can",    "could",     "will",     "would",   "shall",    "should",   "may",
    "might",  "must",      "cannot",   "can't",   "couldn't", "won't",    "wouldn't",
    "shan't", "shouldn't", "mightn't", "mustn't", "ought",    "oughtn't",
};

// Other tokens that keep their form after a plural subject (from memory): "need" and "dare"
// used as modals ("she need not"), their negatives, the past negatives, the subjunctive
// "were" ("if she were"), the participles of "be", and "ain't".
constexpr std::array<std::string_view, 11> kUnchanged = {
    "need",    "dare", "needn't", "daren't", "didn't", "hadn't",
    "weren't", "were", "been",    "being",   "ain't",
};

// Forms of "be" that are not third-person singular present: after "she" they are an error or
// dialect, and the table cannot tell what was meant.
constexpr std::array<std::string_view, 4> kNotThird = {"am", "are", "aren't", "be"};

// Pasts that mark "'s" as "has" whatever follows ("she's been", "she's got", "she's had").
constexpr std::array<std::string_view, 4> kHaveOnly = {"been", "got", "gotten", "had"};

// Words after a past form that show it takes an object, so "'s" is "has" ("she's finished
// the report"): determiners, object and reflexive pronouns, numbers (common practice).
constexpr std::array<std::string_view, 52> kObjectLike = {
    "a",          "an",        "the",      "this",     "these",   "those",   "my",
    "your",       "his",       "her",      "its",      "our",     "their",   "him",
    "them",       "me",        "us",       "it",       "some",    "any",     "every",
    "each",       "no",        "both",     "several",  "many",    "another", "everything",
    "something",  "nothing",   "anything", "everyone", "someone", "herself", "himself",
    "themselves", "itself",    "myself",   "one",      "two",     "three",   "four",
    "five",       "six",       "seven",    "eight",    "nine",    "ten",     "dozens",
    "hundreds",   "thousands", "lots",
};

// Adverbs that may stand between a subject and its verb (common practice).
constexpr std::array<std::string_view, 24> kPreverbal = {
    "not",       "never",   "always", "often", "also",   "still",  "just",   "already",
    "ever",      "seldom",  "only",   "even",  "soon",   "then",   "now",    "once",
    "sometimes", "perhaps", "maybe",  "thus",  "rather", "hardly", "almost", "again",
};

template <size_t N>
bool in(const std::array<std::string_view, N>& list, std::string_view w) {
  return std::find(list.begin(), list.end(), w) != list.end();
}

bool valid_form(std::string_view w) {
  if (w.empty()) return false;
  for (char c : w) {
    if (!((c >= 'a' && c <= 'z') || c == '\'')) return false;
  }
  return true;
}

bool starts_with_letter(std::string_view w) {
  if (w.empty()) return false;
  unsigned char c = static_cast<unsigned char>(w[0]);
  return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c >= 0x80;
}

bool is_number(std::string_view w) {
  return !w.empty() && w[0] >= '0' && w[0] <= '9';
}

std::vector<std::string_view> split(std::string_view s, char sep) {
  std::vector<std::string_view> out;
  size_t start = 0;
  while (true) {
    size_t end = s.find(sep, start);
    out.push_back(s.substr(start, end == std::string_view::npos ? s.npos : end - start));
    if (end == std::string_view::npos) break;
    start = end + 1;
  }
  return out;
}

// `s` with every `from` replaced by `to`.
std::string replace_all(std::string_view s, std::string_view from, std::string_view to) {
  std::string out;
  size_t start = 0;
  while (true) {
    size_t pos = s.find(from, start);
    if (pos == std::string_view::npos) break;
    out.append(s.substr(start, pos - start));
    out.append(to);
    start = pos + from.size();
  }
  out.append(s.substr(start));
  return out;
}

VerbTable::Contraction decided(VerbTable::Contraction::Kind kind, std::string reason) {
  VerbTable::Contraction c;
  c.kind = kind;
  c.lean = kind;
  c.reason = std::move(reason);
  return c;
}

VerbTable::Contraction undecided(VerbTable::Contraction::Kind lean, std::string reason) {
  VerbTable::Contraction c;
  c.kind = VerbTable::Contraction::unknown;
  c.lean = lean;
  c.reason = std::move(reason);
  return c;
}

}  // namespace

const VerbTable::Entry* VerbTable::find(std::string_view folded) const {
  return words_.find(folded);
}

VerbTable::Entry& VerbTable::add(std::string_view form) {
  if (Entry* e = words_.find_for_update(form)) return *e;
  words_.emplace(form, Entry{});
  return *words_.find_for_update(form);
}

std::string VerbTable::read_v(const std::vector<std::string_view>& fields) {
  if (fields.size() != 5)
    return "a 'v' record has 5 fields (v LEMMA 3SG PAST ING), found " +
           std::to_string(fields.size());
  std::string_view lemma = fields[1];
  if (!valid_form(lemma)) return "bad lemma '" + std::string(lemma) + "'";
  Entry& base = add(lemma);
  if (base.flags & kBase) return "lemma '" + std::string(lemma) + "' listed twice";
  base.flags |= kBase;
  uint32_t index = static_cast<uint32_t>(lemmas_.size());
  lemmas_.emplace_back(lemma);
  static constexpr std::array<uint8_t, 3> kKinds = {kThird, kPast, kIng};
  for (size_t k = 0; k < 3; ++k) {
    for (std::string_view form : split(fields[2 + k], ',')) {
      if (!valid_form(form))
        return "bad form '" + std::string(form) + "' of lemma '" + std::string(lemma) + "'";
      Entry& e = add(form);
      e.flags |= kKinds[k];
      if (kKinds[k] != kThird) continue;
      if (e.third_lemmas == 0) {
        e.lemma = index;
        e.third_lemmas = 1;
      } else if (e.lemma != index && e.third_lemmas == 1) {
        e.other_lemma = index;
        e.third_lemmas = 2;
      }
    }
  }
  return "";
}

std::string VerbTable::read_a(const std::vector<std::string_view>& fields) {
  if (fields.size() != 2)
    return "an 'a' record has 2 fields (a FORM), found " + std::to_string(fields.size());
  Entry* e = words_.find_for_update(fields[1]);
  if (e == nullptr || !(e->flags & kPast))
    return "'" + std::string(fields[1]) +
           "' is marked as an adjective but is not a past form of an earlier 'v' record";
  e->flags |= kAdjPast;
  return "";
}

Result<std::shared_ptr<const VerbTable>> VerbTable::parse(std::string_view text, std::string file) {
  std::shared_ptr<VerbTable> table(new VerbTable());
  // About four forms a record ("v LEMMA 3SG PAST ING"): room for them all without regrowing.
  table->words_.reserve(4 * static_cast<size_t>(std::count(text.begin(), text.end(), '\n')),
                        text.size());
  auto take = [&](std::string_view line) -> std::string {
    std::vector<std::string_view> fields = split(line, ' ');
    if (fields[0] == "v") return table->read_v(fields);
    if (fields[0] == "a") return table->read_a(fields);
    return "unknown record type '" + std::string(fields[0]) + "'";
  };
  if (auto error = pack::read_data_records(text, file, kFormatLine, take)) return *error;
  return std::shared_ptr<const VerbTable>(std::move(table));
}

Result<std::shared_ptr<const VerbTable>> VerbTable::from_pack(const pack::CompiledPack& pack) {
  const std::string* text = pack.file(kVerbsFile);
  if (text == nullptr) return make_error(ErrorKind::pack, pack.file_path(kVerbsFile), "missing");
  return parse(*text, pack.file_path(kVerbsFile));
}

VerbTable::Answer VerbTable::pluralize(std::string_view token) const {
  bool curly = token.find(kCurly) != std::string_view::npos;
  std::string normalized;
  std::string_view w = token;
  if (curly) {
    normalized = replace_all(token, kCurly, "'");
    w = normalized;
  }
  Answer a;
  auto result = [&](Answer::Kind kind, std::string_view form, std::string reason) {
    a.kind = kind;
    a.form = curly ? replace_all(form, "'", kCurly) : std::string(form);
    a.reason = std::move(reason);
    return a;
  };
  for (const auto& [singular, plural] : kPluralOf) {
    if (w == singular) return result(Answer::plural, plural, "");
  }
  if (in(kModals, w) || in(kUnchanged, w)) {
    return result(Answer::unchanged, token, "modal, past or participle with no number");
  }
  if (in(kNotThird, w)) {
    return result(Answer::unknown, "", "'" + std::string(w) + "' is not third-person singular");
  }
  const Entry* e = find(w);
  if (e != nullptr && (e->flags & kThird)) {
    const std::string& lemma = lemmas_[e->lemma];
    if (e->third_lemmas > 1) {
      return result(
          Answer::unknown, "",
          "'" + std::string(w) + "' has two lemmas: " + lemma + ", " + lemmas_[e->other_lemma]);
    }
    if (e->flags & kBase) {
      return result(
          Answer::unknown, "",
          "'" + std::string(w) + "' is the 3sg form of '" + lemma + "' and a lemma itself");
    }
    return result(Answer::plural, lemma, "");
  }
  if (e != nullptr && (e->flags & kPast)) {
    return result(Answer::unchanged, token, "past tense or participle");
  }
  if (e != nullptr && (e->flags & kIng)) {
    return result(Answer::unchanged, token, "present participle");
  }
  if (e != nullptr && (e->flags & kBase)) {
    return result(Answer::unknown, "",
                  "'" + std::string(w) + "' is a base form, not third-person singular present");
  }
  // A word the table does not know (a rare or invented verb, a name, a typo). Every English
  // third-person singular present form outside the modals ends in -s (common practice of
  // English grammar), so one that does not end in s needs no agreement whatever it is.
  if (!w.empty() && w.back() != 's') {
    return result(Answer::unchanged, token,
                  "'" + std::string(w) + "' is not in the table and has no -s ending");
  }
  return result(Answer::unknown, "", "'" + std::string(w) + "' is not a verb form the table knows");
}

VerbTable::Contraction VerbTable::resolve_s(std::span<const std::string_view> following) const {
  size_t i = 0;
  for (size_t skipped = 0; i < following.size() && skipped < 3; ++i, ++skipped) {
    if (!is_preverbal_adverb(following[i])) break;
  }
  if (i >= following.size() || !starts_with_letter(following[i])) {
    return decided(Contraction::are, "no verb form follows");
  }
  std::string_view w = following[i];
  std::string normalized;
  if (w.find(kCurly) != std::string_view::npos) {
    normalized = replace_all(w, kCurly, "'");
    w = normalized;
  }
  if (in(kHaveOnly, w)) return decided(Contraction::have, "'" + std::string(w) + "' follows");
  const Entry* e = find(w);
  if (e == nullptr || !(e->flags & kPast)) {
    return decided(Contraction::are, "'" + std::string(w) + "' is not a past participle");
  }
  std::string_view next = i + 1 < following.size() ? following[i + 1] : std::string_view();
  bool object = in(kObjectLike, next) || is_number(next);
  if (e->flags & kAdjPast) {
    if (object) {
      return decided(Contraction::have, "past participle '" + std::string(w) +
                                            "' with an object ('" + std::string(next) + "')");
    }
    return undecided(Contraction::are,
                     "'" + std::string(w) + "' is a past participle and an adjective: is or has");
  }
  if (next == "to" || next == "by") {
    return undecided(Contraction::have, "past participle '" + std::string(w) + "' before '" +
                                            std::string(next) + "' may be passive: is or has");
  }
  return decided(Contraction::have, "past participle '" + std::string(w) + "'");
}

bool VerbTable::is_past_participle(std::string_view folded) const {
  if (folded == "been") return true;
  const Entry* e = find(folded);
  return e != nullptr && (e->flags & kPast);
}

bool VerbTable::is_present_participle(std::string_view folded) const {
  if (folded == "being") return true;
  const Entry* e = find(folded);
  return e != nullptr && (e->flags & kIng);
}

bool VerbTable::is_base_form(std::string_view folded) const {
  if (folded == "be") return true;
  const Entry* e = find(folded);
  return e != nullptr && (e->flags & kBase);
}

bool VerbTable::is_third_singular(std::string_view folded) const {
  if (folded == "is") return true;
  const Entry* e = find(folded);
  return e != nullptr && (e->flags & kThird);
}

bool VerbTable::is_inverting_auxiliary(std::string_view folded) {
  for (const auto& [singular, plural] : kPluralOf)
    if (folded == singular) return true;
  return folded == "has" || folded == "does";
}

bool VerbTable::is_numberless_auxiliary(std::string_view folded) {
  return in(kModals, folded) || folded == "did" || folded == "didn't";
}

bool VerbTable::is_preverbal_adverb(std::string_view folded) const {
  if (in(kPreverbal, folded)) return true;
  if (folded.size() < 4 || folded.substr(folded.size() - 2) != "ly") return false;
  return find(folded) == nullptr;  // "really", "usually"; not "apply", "rely", "fly"
}

}  // namespace evenhand::rewrite
