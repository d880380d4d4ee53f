// English person evidence (see person_context.h). The rules, in the order they are tried:
// 1. Negative evidence from the words around: the name opens a multi-word name of a thing
//    ("Hope Street", "Bell Labs"), follows a place prefix ("San", "New") or an article, stands
//    after a title with no name after it (a surname: "Dr. Grace"), after an initial or after
//    another capitalised word inside a sentence (a surname or part of a longer name), after
//    "X of" ("Bank of Virginia"), or before a subject pronoun or a number ("Will you", "Win 98").
// 2. Positive evidence: a form of address before it ("Aunt", "Dear"), a title and a surname
//    around it, a surname-like capitalised word after it, a verb of speech or action after it,
//    a person word before it ("my brother Jack"), "who" after it, a vocative at a line start.
// 3. Otherwise the default: a person, unless the name is also a common word or a thing's name.
#include "rewrite/en/person_context.h"

#include <algorithm>
#include <array>
#include <optional>
#include <string>
#include <vector>

#include "pack/data_records.h"
#include "text/case.h"

namespace evenhand::rewrite::en {

namespace {

constexpr std::string_view kFormatLine = "format evenhand-person-context 1";
constexpr std::string_view kMixedFormatLine = "format evenhand-mixed-names 1";

struct KindName {
  std::string_view name;
  Lexicon list;
};
constexpr KindName kKinds[] = {
    {"thing-head", Lexicon::thing_head},
    {"thing-name", Lexicon::thing_name},
    {"surname", Lexicon::surname},
    {"person-verb", Lexicon::person_verb},
    {"title", Lexicon::title},
    {"given-title", Lexicon::given_title},
    {"place-prefix", Lexicon::place_prefix},
    {"greeting", Lexicon::greeting},
    {"word-name", Lexicon::word_name},
    {"rare-name", Lexicon::rare_name},
    {"apposition", Lexicon::apposition},
    {"common-word", Lexicon::common_word},
    {"proper-thing", Lexicon::proper_thing},
    {"place-preposition", Lexicon::place_preposition},
};

bool valid_word(std::string_view w) {
  if (w.empty()) return false;
  for (unsigned char c : w)
    if (c <= ' ' || (c >= 'A' && c <= 'Z')) return false;
  return true;
}

}  // namespace

std::optional<Error> PersonContext::read_context(std::string_view text, const std::string& file,
                                                 PersonContext& into) {
  into.words_.reserve(std::count(text.begin(), text.end(), '\n'), text.size());
  return pack::read_data_records(
      text, file, kFormatLine, [&](std::string_view line) -> std::string {
        size_t space = line.find(' ');
        std::string_view kind = line.substr(0, space);
        std::string_view word = space == line.npos ? std::string_view() : line.substr(space + 1);
        const KindName* k = nullptr;
        for (const auto& kn : kKinds)
          if (kn.name == kind) k = &kn;
        if (k == nullptr) return "unknown kind '" + std::string(kind) + "'";
        if (!valid_word(word))
          return "'" + std::string(word) + "' is not one lower-case word without spaces";
        into.add(word, k->list);
        return "";
      });
}

void PersonContext::add(std::string_view word, Lexicon list) {
  const uint32_t bit = 1u << static_cast<unsigned>(list);
  uint32_t* lists = words_.find_for_update(word);
  if (lists && (*lists & bit)) return;
  if (lists)
    *lists |= bit;
  else
    words_.emplace(word, bit);
  ++sizes_[static_cast<size_t>(list)];
  if (list == Lexicon::mixed_name) mixed_.emplace_back(word);
}

Result<std::shared_ptr<const PersonContext>> PersonContext::parse(std::string_view text,
                                                                  const std::string& file) {
  auto ctx = std::make_shared<PersonContext>();
  if (auto error = read_context(text, file, *ctx)) return *error;
  return std::shared_ptr<const PersonContext>(std::move(ctx));
}

Result<std::shared_ptr<const PersonContext>> PersonContext::from_pack(
    const pack::CompiledPack& pack) {
  const std::string* text = pack.file(kPersonContextFile);
  if (text == nullptr)
    return make_error(ErrorKind::pack, pack.file_path(kPersonContextFile), "missing");
  auto ctx = std::make_shared<PersonContext>();
  if (auto error = read_context(*text, pack.file_path(kPersonContextFile), *ctx)) return *error;
  if (const std::string* mixed = pack.file(kMixedNamesFile)) {
    auto error =
        pack::read_data_records(*mixed, pack.file_path(kMixedNamesFile), kMixedFormatLine,
                                [&](std::string_view line) -> std::string {
                                  if (!valid_word(line))
                                    return "'" + std::string(line) + "' is not one lower-case name";
                                  ctx->add(line, Lexicon::mixed_name);
                                  return "";
                                });
    if (error) return *error;
  }
  return std::shared_ptr<const PersonContext>(std::move(ctx));
}

bool PersonContext::has(Lexicon list, std::string_view folded) const {
  return (lists_of(folded) >> static_cast<unsigned>(list)) & 1;
}

namespace {

// The tokens around the name, read with the lexicons.
class Around {
 public:
  Around(const PersonContext& lex, const NameSite& s) : lex_(lex), s_(s) {}

  size_t size() const { return s_.tokens.size(); }
  bool word(size_t j) const { return j < size() && s_.tokens[j].word; }
  std::string_view f(size_t j) const { return s_.tokens[j].folded; }
  bool is(size_t j, std::string_view w) const { return j < size() && f(j) == w; }
  // Whether word j is in list l; a common word is also found by its singular ("Wars").
  bool has(Lexicon l, size_t j) const {
    if (!word(j)) return false;
    if ((lists(j) >> static_cast<unsigned>(l)) & 1) return true;
    std::string_view w = f(j);
    return l == Lexicon::common_word && w.size() > 3 && w.back() == 's' &&
           lex_.has(l, w.substr(0, w.size() - 1));
  }
  // The lists word j is in; looked up once per token near the name.
  uint32_t lists(size_t j) const {
    size_t slot = j + kWindow - s_.at;  // wraps (large) for j far before the name
    if (slot >= cache_.size()) return lex_.lists_of(f(j));
    if (cache_[slot] == kUnknown) cache_[slot] = lex_.lists_of(f(j));
    return cache_[slot];
  }
  std::string_view raw(size_t j) const {
    return s_.text.substr(s_.tokens[j].begin, s_.tokens[j].end - s_.tokens[j].begin);
  }
  // Starts with an upper-case letter (ASCII, or any non-ASCII letter: best effort).
  bool capital(size_t j) const {
    if (!word(j)) return false;
    unsigned char c = static_cast<unsigned char>(raw(j)[0]);
    return (c >= 'A' && c <= 'Z') || (c >= 0x80 && f(j) != raw(j));
  }
  // Tokens a < b with only spaces or tabs between them (same line, nothing else).
  bool adjacent(size_t a, size_t b) const {
    if (b != a + 1 || b >= size()) return false;
    for (uint32_t i = s_.tokens[a].end; i < s_.tokens[b].begin; ++i)
      if (s_.text[i] != ' ' && s_.text[i] != '\t') return false;
    return true;
  }
  // The item next to the name in a list ("Pascal, Ada, APL", "Atari 800, Osborne"): the token
  // across the comma (and an "and"/"or") on side +1 or -1, brackets and quotes skipped;
  // SIZE_MAX if there is no comma there.
  size_t list_neighbour(size_t k, int side) const {
    auto skip = [&](size_t j) {
      while (j < size() && (is(j, "}") || is(j, "{") || is(j, ")") || is(j, "(") || is(j, "\"")))
        j += side;
      return j;
    };
    size_t j = skip(k + side);
    if (!is(j, ",")) return SIZE_MAX;
    j = skip(j + side);
    if (is(j, "and") || is(j, "or")) j = skip(j + side);
    return j < size() ? j : SIZE_MAX;
  }
  // A word in capitals that is not a first name, or a number: a list of things.
  bool thing_item(size_t j, const NameSite& s) const {
    if (j == SIZE_MAX) return false;
    if (!word(j)) return raw(j)[0] >= '0' && raw(j)[0] <= '9';
    return all_caps(j) && !(s.is_name && s.is_name(f(j)));
  }
  // A tab, or two spaces, right after token j: the layout of a table or glossary.
  bool column_after(size_t j) const {
    size_t at = s_.tokens[j].end;
    std::string_view rest = s_.text.substr(at, 2);
    return (!rest.empty() && rest[0] == '\t') || rest == "  ";
  }
  bool newline_before(size_t j) const {
    uint32_t from = j == 0 ? 0 : s_.tokens[j - 1].end;
    for (uint32_t i = from; i < s_.tokens[j].begin; ++i)
      if (s_.text[i] == '\n') return true;
    return j == 0;
  }
  // First on its line, after quote markers, bullets and a chat label ("> ", "* ", "<nick> ").
  bool line_start(size_t j) const {
    while (!newline_before(j)) {
      if (after_chat_label(j)) return true;
      std::string_view p = f(j - 1);
      if (p != ">" && p != "|" && p != "*" && p != "-" && p != "_" && p != "#") return false;
      --j;
    }
    return true;
  }
  // A full stop that ends an abbreviation or an initial, not a sentence ("Mr.", "J.").
  bool abbreviation_stop(size_t j) const {
    if (!is(j, ".") || j == 0 || !word(j - 1) || !adjacent_any(j - 1, j)) return false;
    return f(j - 1).size() == 1 || has(Lexicon::title, j - 1) || has(Lexicon::given_title, j - 1) ||
           has(Lexicon::place_prefix, j - 1);
  }
  bool sentence_start(size_t j) const {
    if (line_start(j)) return true;
    size_t p = j - 1;
    while (p > 0 && (f(p) == "*" || f(p) == "_" || f(p) == "(" || f(p) == "\"" ||
                     f(p) == "\xE2\x80\x9C" || f(p) == "'" || f(p) == "\xE2\x80\x98")) {
      if (line_start(p)) return true;
      --p;
    }
    std::string_view q = f(p);
    if (q == "!" || q == "?" || q == ":" || q == ";" || q == "\xE2\x80\xA6") return true;
    return q == "." && !abbreviation_stop(p);
  }
  // A middle initial: one capital letter and a full stop ("M.").
  bool initial(size_t j) const {
    return word(j) && raw(j).size() == 1 && capital(j) && is(j + 1, ".");
  }
  // First on its line after a dash of attribution ("-- Name", an em dash and "Name").
  bool attribution(size_t j) const {
    size_t dashes = 0;
    for (; j > 0 && !newline_before(j); --j, ++dashes)
      if (f(j - 1) != "-" && f(j - 1) != "\xE2\x80\x94") return false;
    return dashes >= 2 || (dashes == 1 && f(j) == "\xE2\x80\x94");
  }
  // Opens the quoted title of a work in an attribution line: '-- Author, "Title"'.
  bool quoted_title(size_t j) const {
    if (j < 2 || (!is(j - 1, "\"") && !is(j - 1, "\xE2\x80\x9C")) || !is(j - 2, ",")) return false;
    size_t first = j;
    while (first > 0 && !newline_before(first)) --first;
    while (first < j && !word(first)) ++first;
    return first < j && attribution(first);
  }
  // A lower-case common word in -s (a plural noun, or a verb: the caller tells them apart).
  bool plural_noun(size_t j) const {
    if (!word(j) || capital(j) || f(j).size() < 4 || f(j).back() != 's') return false;
    return has(Lexicon::common_word, j) && !has(Lexicon::person_verb, j);
  }
  bool opening_quote(size_t j) const { return is(j, "\"") || is(j, "\xE2\x80\x9C"); }
  bool closing_quote(size_t j) const { return is(j, "\"") || is(j, "\xE2\x80\x9D"); }
  // "<nick> NAME" (a chat line) and "<NAME>" (the speaker).
  bool after_chat_label(size_t j) const { return j >= 3 && is(j - 1, ">") && is(j - 3, "<"); }
  bool chat_label(size_t j) const { return j >= 1 && is(j - 1, "<") && is(j + 1, ">"); }
  // Two or more letters, all upper case ("ELIZA", "ANN").
  bool all_caps(size_t j) const {
    if (!word(j) || raw(j).size() < 2) return false;
    unsigned char c0 = raw(j)[0], c1 = raw(j)[1];
    if ((c0 >= 'a' && c0 <= 'z') || (c1 >= 'a' && c1 <= 'z')) return false;  // fast path
    return text::case_pattern(raw(j)) == text::CasePattern::upper;
  }
  // The nearest word before or after `j` on its line is in capitals too (a heading, a shout).
  bool all_caps_around(size_t j) const {
    for (size_t i = j; i-- > 0 && !newline_before(i + 1);)
      if (word(i)) return all_caps(i);
    for (size_t i = j + 1; i < size() && !newline_before(i); ++i)
      if (word(i)) return all_caps(i);
    return false;
  }
  // Sentence-final punctuation, a closing quote or the end of the line at `j`.
  bool closes_sentence(size_t j) const {
    if (j >= size() || newline_before(j)) return true;
    std::string_view q = f(j);
    return q == "." || q == "!" || q == "?" || q == "\"" || q == "\xE2\x80\x9D";
  }
  // The token after a possessive name ("Lucas' Law", "Sanford's Run") when it follows on the
  // same line after spaces; SIZE_MAX when the name is not possessive.
  size_t after_possessive(size_t k) const {
    std::string_view w = f(k);
    size_t next = SIZE_MAX;
    if (w.size() > 2 && (w.ends_with("'s") || w.ends_with("\xE2\x80\x99s"))) next = k + 1;
    if (is(k + 1, "'") && s_.tokens[k].end == s_.tokens[k + 1].begin) next = k + 2;
    return next != SIZE_MAX && adjacent(next - 1, next) ? next : SIZE_MAX;
  }
  // The word before `j`, skipping one abbreviation stop ("Mr. Grace"); SIZE_MAX if none.
  size_t word_before(size_t j) const {
    if (j == 0 || newline_before(j)) return SIZE_MAX;
    size_t p = j - 1;
    if (abbreviation_stop(p)) return p;  // caller reads p - 1 as the word
    return word(p) && adjacent(p, j) ? p : SIZE_MAX;
  }

 private:
  bool adjacent_any(size_t a, size_t b) const {
    return b == a + 1 && s_.tokens[a].end == s_.tokens[b].begin;
  }
  static constexpr size_t kWindow = 8;
  static constexpr uint32_t kUnknown = UINT32_MAX;
  const PersonContext& lex_;
  const NameSite& s_;
  mutable std::array<uint32_t, 2 * kWindow + 1> cache_ = filled();
  static constexpr std::array<uint32_t, 2 * kWindow + 1> filled() {
    std::array<uint32_t, 2 * kWindow + 1> a{};
    for (auto& v : a) v = kUnknown;
    return a;
  }
};

NameVerdict yes(const char* why, Evidence e = Evidence::firm) {
  return {.person = true, .evidence = e, .why = why};
}
NameVerdict no(const char* why, Evidence e = Evidence::firm) {
  return {.person = false, .evidence = e, .why = why};
}
NameVerdict surname(const char* why) {
  return {.person = false, .evidence = Evidence::firm, .surname = true, .why = why};
}

bool is_subject_pronoun(std::string_view w) {
  return w == "i" || w == "you" || w == "we" || w == "they" || w == "he" || w == "she" || w == "it";
}

// How surely the capitalised word after the name (on its line) is a surname: firm when the
// surname list holds it; some when it is no common word and no thing's name; else none.
Evidence surname_after(const Around& a, size_t k) {
  size_t n = k + 1;
  if (!a.adjacent(k, n) || !a.capital(n) || a.has(Lexicon::thing_head, n)) return Evidence::none;
  if (is_subject_pronoun(a.f(n)) || a.all_caps(n) != a.all_caps(k)) return Evidence::none;
  if (a.has(Lexicon::proper_thing, n)) return Evidence::none;  // "Even Norway", "Trenton Monday"
  if (a.has(Lexicon::surname, n) || a.initial(n)) return Evidence::firm;
  for (Lexicon l : {Lexicon::thing_name, Lexicon::common_word})
    if (a.has(l, n)) return Evidence::none;
  return Evidence::some;
}

// A capitalised word right after the name that may be a surname even if it is also a common
// word ("Remnant", "Crump"): not in capitals, no country or thing, no subject pronoun. For
// names that something before already marks as part of a person's name.
bool surname_like_after(const Around& a, size_t k) {
  size_t n = k + 1;
  return a.adjacent(k, n) && a.capital(n) && !a.all_caps(n) && !a.has(Lexicon::proper_thing, n) &&
         !a.has(Lexicon::thing_head, n) && !is_subject_pronoun(a.f(n));
}

// Rule 1, the part that looks right of the name.
std::optional<NameVerdict> thing_after(const Around& a, size_t k, bool common) {
  size_t j = k + 1;
  for (; j < k + 5 && a.adjacent(j - 1, j) && a.capital(j); ++j)
    if (a.has(Lexicon::thing_head, j)) return no("part of a place or organisation's name");
  if (a.is(j, "&") && j > k + 1) return no("part of a firm's name");
  if (a.adjacent(k, k + 1) && is_subject_pronoun(a.f(k + 1)))
    return no("a verb before a subject pronoun");
  if (common && a.adjacent(k, k + 1) &&
      (a.is(k + 1, "the") || a.is(k + 1, "a") || a.is(k + 1, "an")))
    return no("a common word before an article ('Will the meeting')", Evidence::some);
  if (a.adjacent(k, k + 1) &&
      (a.is(k + 1, "me") || a.is(k + 1, "us") || a.is(k + 1, "them") || a.is(k + 1, "him")))
    return no("a verb before an object pronoun ('Read me')");
  if (k + 1 < a.size() && a.adjacent(k, k + 1) && !a.word(k + 1) && a.raw(k + 1)[0] >= '0' &&
      a.raw(k + 1)[0] <= '9')
    return no("followed by a number: a product or version");
  size_t after = a.after_possessive(k);
  if (after != SIZE_MAX && a.capital(after)) return no("a possessive inside a longer name");
  return std::nullopt;
}

// Rules 1 and 2 for the word before the name.
std::optional<NameVerdict> judge_before(const Around& a, const NameSite& s, size_t k) {
  if (a.chat_label(k)) return yes("a chat speaker's label");
  size_t p = a.word_before(k);
  if (p == SIZE_MAX) return std::nullopt;
  bool stop = a.is(p, ".");
  if (stop) p = p - 1;
  Evidence first = surname_after(a, k);
  if (a.has(Lexicon::given_title, p) || (!stop && a.has(Lexicon::greeting, p)))
    return yes("after a form of address");
  if (a.has(Lexicon::title, p))  // "Sen. Louis Crump": a surname even if also a word
    return first != Evidence::none || surname_like_after(a, k) ? yes("first name after a title")
                                                               : surname("surname after a title");
  if (a.has(Lexicon::place_prefix, p) && a.capital(p)) return no("after a place prefix");
  if (!stop && (a.f(p) == "the" || a.f(p) == "a" || a.f(p) == "an")) return no("after an article");
  if (stop && a.f(p).size() == 1)
    return first != Evidence::none ? yes("first name after an initial")
                                   : surname("surname after an initial");
  if (!stop && s.is_person_word && s.is_person_word(a.f(p)) && !a.capital(p))
    return yes("after a person word");
  if (!stop && !a.capital(p) && s.verbs &&
      (s.verbs->is_third_singular(a.f(p)) ||
       (s.verbs->is_past_participle(a.f(p)) && !s.verbs->is_base_form(a.f(p)))))
    return yes("the object of a verb ('met Grace')", Evidence::some);
  if (stop || !a.capital(p)) return std::nullopt;
  if (s.is_name && s.is_name(a.f(p))) {
    // Between a first name and a capitalised word, even a common one: "Scott James Remnant".
    return first != Evidence::none || surname_like_after(a, k)
               ? yes("middle name")
               : surname("surname after a first name");
  }
  // "On Monday Mary", "Secretary of State Dean Rusk", "Yesterday Mary": no given name before.
  if (a.has(Lexicon::common_word, p) || a.has(Lexicon::proper_thing, p)) {
    if (first == Evidence::none && a.has(Lexicon::common_word, p) && !a.sentence_start(p))
      return no("inside a capitalised phrase ('the Hilltop Barn')", Evidence::some);
    return std::nullopt;
  }
  if (first != Evidence::none) return yes("first name after a capitalised word", first);
  return surname("after a capitalised word: surname or part of a longer name");
}

// A verb right after the name makes it its subject ("Mark pilots", "Mark swept", "Anna
// leading"); a plural noun there is what the name modifies ("Mac users").
std::optional<NameVerdict> verb_after(const Around& a, const NameSite& s, size_t k,
                                      bool possessive) {
  size_t n = k + 1;
  if (!s.verbs || possessive || !a.adjacent(k, n) || !a.word(n) || a.capital(n))
    return std::nullopt;
  std::string_view w = a.f(n);
  bool third = s.verbs->is_third_singular(w);
  if (a.plural_noun(n) && !third)
    return no("a plural noun follows: the name modifies it ('Mac users')", Evidence::some);
  if (third || s.verbs->is_present_participle(w) ||
      (s.verbs->is_past_participle(w) && !s.verbs->is_base_form(w)))
    return yes("a verb follows ('Mark pilots')", Evidence::some);
  return std::nullopt;
}

// Rule 2 for the words after the name.
std::optional<NameVerdict> judge_after(const Around& a, const NameSite& s, size_t k, bool common) {
  Evidence e = surname_after(a, k);
  if (e != Evidence::none) return yes("a surname follows", e);
  size_t n = k + 1;
  if (n < a.size() && a.f(n) == ",") ++n;
  if (a.has(Lexicon::person_verb, n) || a.is(n, "who"))
    return yes("a verb of speech or action follows", Evidence::some);
  auto joined = [&](size_t j) {
    return a.is(j, "i") || a.is(j, "me") ||
           (a.capital(j) && s.is_name && s.is_name(a.f(j)) && !a.has(Lexicon::word_name, j));
  };
  if (a.is(k + 1, "and") && joined(k + 2)) return yes("joined to another person");
  bool possessive = a.f(k).ends_with("'s") || a.f(k).ends_with("\xE2\x80\x99s");
  if (auto v = verb_after(a, s, k, possessive)) return *v;
  if (a.is(k + 1, ",") && a.word(k + 2) && !a.capital(k + 2) && a.has(Lexicon::apposition, k + 2))
    return yes("an apposition follows ('Grace, one of our volunteers')", Evidence::some);
  if (a.is(k + 1, "(") && (a.is(k + 2, "a") || a.is(k + 2, "an") || a.is(k + 2, "the")))
    return yes("a description in brackets follows", Evidence::some);
  if (common && a.adjacent(k, k + 1) && a.capital(k + 1) && a.has(Lexicon::common_word, k + 1))
    return no("a capitalised common word follows: a title or a thing's name", Evidence::some);
  if (k >= 2 && a.is(k - 1, "and") && joined(k - 2)) return yes("joined to another person");
  if (a.is(k + 1, ",") && a.line_start(k) && !common)
    return yes("addressed at a line start", Evidence::some);
  if ((a.is(k + 1, ",") || a.is(k + 1, ":")) && a.after_chat_label(k)) return yes("addressed");
  if (k > 0 && a.is(k - 1, ",") && a.closes_sentence(k + 1)) return yes("addressed");
  if (a.is(k - 1 + (k == 0), "(") && a.is(k + 1, ")") && a.capital(k + 2))
    return yes("a nickname before a surname");
  if (k > 0 && a.opening_quote(k - 1) &&
      (a.closing_quote(k + 1) || (a.is(k + 1, ",") && a.closing_quote(k + 2))))
    return yes("quoted on its own: addressed or spoken of", Evidence::some);
  return std::nullopt;
}

}  // namespace

NameVerdict judge_name(const PersonContext& lexicons, const NameSite& site) {
  Around a(lexicons, site);
  const size_t k = site.at;
  // A name that is also a greeting ("Hi") is a common word too, and the greeting itself at
  // the start of a line.
  const bool greeting = lexicons.has(Lexicon::greeting, a.f(k));
  if (greeting && a.line_start(k)) return no("a greeting");
  // "Ivy:<tab>Friendship": a glossary or table entry, not a chat turn ("Ivy: thanks").
  if (a.is(k + 1, ":") && a.line_start(k) && a.column_after(k + 1))
    return no("a list entry: 'Name:' and a tab at a line start", Evidence::some);
  const bool common = site.word_like || greeting;
  if (a.attribution(k) && a.adjacent(k, k + 1) && a.capital(k + 1))
    return yes("opens an attribution or signature");
  if (a.quoted_title(k)) return no("opens a quoted title in an attribution");
  // "[... Ed.]": the abbreviation that signs an editor's bracketed note.
  if (a.is(k + 1, ".") && a.is(k + 2, "]") &&
      a.raw(k + 1).data() == a.raw(k).data() + a.raw(k).size())
    return no("signs a bracketed note: an abbreviation ('Ed.]')");
  if (a.all_caps(k) && !a.all_caps_around(k)) return no("written in capitals: an acronym");
  if (auto v = thing_after(a, k, common)) return *v;
  if (auto v = judge_before(a, site, k)) return *v;
  size_t p = a.word_before(k);
  if (p != SIZE_MAX && p >= 2 && a.f(p) == "of" && a.capital(p - 1) && !a.sentence_start(p - 1))
    return no("after 'X of': part of a longer name");
  if (!a.all_caps(k) &&
      (a.thing_item(a.list_neighbour(k, 1), site) || a.thing_item(a.list_neighbour(k, -1), site)))
    return no("listed beside things ('Pascal, Ada, APL')", Evidence::some);
  if (auto v = judge_after(a, site, k, common)) return *v;
  if (common) return no("also a common word, and nothing says it names a person", Evidence::none);
  if (lexicons.has(Lexicon::thing_name, a.f(k)) && p != SIZE_MAX &&
      a.has(Lexicon::place_preposition, p))
    return {.evidence = Evidence::some, .place = true, .why = "a place's name after a preposition"};
  return yes("a first name", Evidence::none);
}

}  // namespace evenhand::rewrite::en
