// Verb agreement (rewrite/en/verb_agreement.h): the shipped verbs.data checked against WordNet 3.0
// itself, read at test time, and the agreement rules on cases written out by hand.
#include <catch2/catch.hpp>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <map>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include "pack/pack.h"
#include "rewrite/en/verb_agreement.h"

using namespace evenhand;
using namespace evenhand::rewrite;

namespace {

constexpr const char* kWordNet = "/usr/share/wordnet";

std::shared_ptr<const VerbTable> shipped_table() {
  std::vector<pack::Diagnostic> diags;
  auto p = pack::load_pack("en-gender", diags);
  REQUIRE(p.ok());
  auto t = VerbTable::from_pack(*p.value());
  INFO((t.ok() ? std::string() : t.error().message()));
  REQUIRE(t.ok());
  return t.value();
}

// The text of the shipped verbs.data.
std::string shipped_data() {
  std::vector<pack::Diagnostic> diags;
  auto p = pack::load_pack("en-gender", diags);
  REQUIRE(p.ok());
  const std::string* text = p.value()->file("verbs.data");
  REQUIRE(text != nullptr);
  return *text;
}

std::vector<std::string> split(const std::string& s, char sep) {
  std::vector<std::string> out;
  std::stringstream in(s);
  std::string part;
  while (std::getline(in, part, sep)) out.push_back(part);
  return out;
}

std::vector<std::string> read_lines_or_fail(const std::string& path) {
  std::ifstream in(path);
  if (!in) {
    FAIL("cannot read " << path << ": install the Debian package wordnet-base (.ci/deps does)");
  }
  std::vector<std::string> lines;
  std::string line;
  while (std::getline(in, line)) lines.push_back(line);
  return lines;
}

bool one_word(const std::string& w) {
  if (w.empty()) return false;
  for (char c : w) {
    if (c < 'a' || c > 'z') return false;
  }
  return true;
}

// WordNet 3.0 as the test reads it: the one-word verb lemmas of index.verb and verb.exc as
// form -> bases.
// source: WordNet 3.0, Princeton University, Debian wordnet-base (index.verb, verb.exc).
struct WordNet {
  std::set<std::string> lemmas;
  std::map<std::string, std::vector<std::string>> exc;

  static WordNet read() {
    WordNet wn;
    for (const auto& line : read_lines_or_fail(std::string(kWordNet) + "/index.verb")) {
      if (line.empty() || line[0] == ' ') continue;  // the licence lines start with a space
      std::string lemma = line.substr(0, line.find(' '));
      if (one_word(lemma)) wn.lemmas.insert(lemma);
    }
    for (const auto& line : read_lines_or_fail(std::string(kWordNet) + "/verb.exc")) {
      auto fields = split(line, ' ');
      if (fields.size() < 2) continue;
      wn.exc[fields[0]].assign(fields.begin() + 1, fields.end());
    }
    return wn;
  }

  // WordNet's morphy for verbs, written out again for the test: the exception list first,
  // then the rules of detachment, keeping the results that are lemmas.
  // source: WordNet 3.0 morphy(7WN) man page, "Rules of Detachment" (Debian wordnet-base).
  std::set<std::string> morphy(const std::string& form) const {
    std::set<std::string> out;
    auto it = exc.find(form);
    if (it != exc.end()) {
      out.insert(it->second.begin(), it->second.end());
      return out;
    }
    static const std::vector<std::pair<std::string, std::string>> rules = {
        {"s", ""},   {"ies", "y"}, {"es", "e"},  {"es", ""},
        {"ed", "e"}, {"ed", ""},   {"ing", "e"}, {"ing", ""}};
    for (const auto& [suffix, ending] : rules) {
      if (form.size() > suffix.size() &&
          form.compare(form.size() - suffix.size(), suffix.size(), suffix) == 0) {
        std::string base = form.substr(0, form.size() - suffix.size()) + ending;
        if (lemmas.count(base)) out.insert(base);
      }
    }
    return out;
  }
};

// The "v" records of verbs.data: lemma -> {3sg forms, past forms, -ing forms}.
std::map<std::string, std::vector<std::vector<std::string>>> data_records(const std::string& text) {
  std::map<std::string, std::vector<std::vector<std::string>>> out;
  for (const auto& line : split(text, '\n')) {
    auto f = split(line, ' ');
    if (f.size() == 5 && f[0] == "v") {
      out[f[1]] = {split(f[2], ','), split(f[3], ','), split(f[4], ',')};
    }
  }
  return out;
}

bool ends_with(const std::string& s, const std::string& suffix) {
  return s.size() >= suffix.size() &&
         s.compare(s.size() - suffix.size(), suffix.size(), suffix) == 0;
}

VerbTable::Answer plural(const VerbTable& t, std::string_view token) {
  return t.pluralize(token);
}

VerbTable::Contraction after_s(const VerbTable& t, std::vector<std::string_view> words) {
  return t.resolve_s(words);
}

}  // namespace

TEST_CASE("verbs.data covers every one-word WordNet verb and maps its 3sg back (>= 500 checked)",
          "[verbs][wordnet]") {
  // source: WordNet 3.0, Princeton University, Debian wordnet-base
  WordNet wn = WordNet::read();
  REQUIRE(wn.lemmas.size() > 8000);
  auto table = shipped_table();
  auto records = data_records(shipped_data());
  // Every one-word lemma but "be" (kept in the hand list, see verb_agreement.cpp) is there.
  for (const auto& lemma : wn.lemmas) {
    if (lemma == "be") continue;
    INFO(lemma);
    CHECK(records.count(lemma) == 1);
    CHECK(table->is_base_form(lemma));
  }
  CHECK(records.size() == wn.lemmas.size() - 1);
  CHECK(table->lemma_count() == records.size());

  // Every 16th lemma, in index.verb order: our 3sg forms detach back to it by morphy (on
  // WordNet's own data) and our table maps them back to it.
  size_t checked = 0, two_lemmas = 0, k = 0;
  for (const auto& lemma : wn.lemmas) {
    if (lemma == "be" || k++ % 16 != 0) continue;
    INFO(lemma);
    REQUIRE(records.count(lemma) == 1);
    const auto& thirds = records[lemma][0];
    REQUIRE_FALSE(thirds.empty());
    for (const auto& form : thirds) {
      INFO(form);
      CHECK(wn.morphy(form).count(lemma) == 1);
      CHECK(table->is_third_singular(form));
      auto a = table->pluralize(form);
      if (a.kind == VerbTable::Answer::plural) {
        CHECK(a.form == lemma);
      } else {
        // Only a form shared by two lemmas (axes: ax, axe) or a 3sg that is also a lemma
        // (summons) is left unknown, and its reason names our lemma.
        CHECK(a.kind == VerbTable::Answer::unknown);
        CHECK(a.reason.find(lemma) != std::string::npos);
        ++two_lemmas;
      }
    }
    ++checked;
  }
  std::printf(
      "verbs: %zu WordNet lemmas checked (3sg detaches back by morphy, table maps back); "
      "%zu forms with two lemmas\n",
      checked, two_lemmas);
  CHECK(checked >= 500);
}

TEST_CASE("verbs.data agrees with every one-word entry of WordNet's verb.exc", "[verbs][wordnet]") {
  // source: WordNet 3.0, Princeton University, Debian wordnet-base (verb.exc)
  WordNet wn = WordNet::read();
  auto table = shipped_table();
  size_t thirds = 0, pasts = 0, ings = 0;
  for (const auto& [form, bases] : wn.exc) {
    if (!one_word(form)) continue;
    bool any_lemma = false;
    for (const auto& b : bases) any_lemma = any_lemma || (b != form && wn.lemmas.count(b));
    if (!any_lemma) continue;  // "popes popes", or bases that are not one-word lemmas
    INFO(form);
    if (bases.size() == 1 && bases[0] == "be") {
      // "be" is special (person and number): the hand list. WordNet lists these forms as
      // forms of "be"; the table turns the singular ones into the plural ones.
      continue;
    }
    if (ends_with(form, "ing")) {
      CHECK(table->is_present_participle(form));
      ++ings;
    } else if (ends_with(form, "s")) {
      CHECK(table->is_third_singular(form));
      auto a = table->pluralize(form);
      if (a.kind == VerbTable::Answer::plural) {
        CHECK(std::find(bases.begin(), bases.end(), a.form) != bases.end());
      } else {
        CHECK(a.kind == VerbTable::Answer::unknown);
      }
      ++thirds;
    } else {
      CHECK(table->is_past_participle(form));
      ++pasts;
    }
  }
  std::printf("verbs: verb.exc entries checked: %zu 3sg, %zu past, %zu -ing\n", thirds, pasts,
              ings);
  CHECK(thirds >= 10);
  CHECK(pasts >= 1000);
  CHECK(ings >= 500);

  // The forms of "be" as WordNet lists them, and what the hand list does with them.
  for (std::string f : {"is", "was", "are", "were", "am", "been"}) {
    INFO(f);
    REQUIRE(wn.exc.count(f) == 1);
    CHECK(wn.exc[f] == std::vector<std::string>{"be"});
  }
  CHECK(plural(*table, "is").form == "are");
  CHECK(plural(*table, "was").form == "were");
  CHECK(plural(*table, "were").kind == VerbTable::Answer::unchanged);
  CHECK(plural(*table, "are").kind == VerbTable::Answer::unknown);
  CHECK(plural(*table, "am").kind == VerbTable::Answer::unknown);
  CHECK(table->is_past_participle("been"));
  CHECK(table->is_present_participle("being"));
}

TEST_CASE("verbs.data is what build_verbs.py makes from WordNet", "[verbs][wordnet]") {
  // source: WordNet 3.0, Princeton University, Debian wordnet-base; the converter
  // rules/tools/build_verbs.py (Python 3, Debian python3) must reproduce the file byte for byte.
  const char* src = std::getenv("EVENHAND_SOURCE_DIR");
  REQUIRE(src != nullptr);
  std::string cmd = std::string("python3 ") + src + "/rules/tools/build_verbs.py --check";
  int rc = std::system(cmd.c_str());
  INFO(cmd);
  CHECK(rc == 0);
}

TEST_CASE("pluralize: hand-written cases", "[verbs]") {
  // Forms from general knowledge of English (from memory).
  auto t = shipped_table();
  struct Case {
    const char* in;
    const char* out;
  };
  for (const Case& c : std::vector<Case>{
           {"is", "are"},         {"was", "were"},       {"has", "have"},
           {"does", "do"},        {"goes", "go"},        {"watches", "watch"},
           {"tries", "try"},      {"plays", "play"},     {"fixes", "fix"},
           {"buzzes", "buzz"},    {"echoes", "echo"},    {"carries", "carry"},
           {"obeys", "obey"},     {"runs", "run"},       {"dies", "die"},
           {"sees", "see"},       {"quizzes", "quiz"},   {"teaches", "teach"},
           {"wishes", "wish"},    {"says", "say"},       {"leads", "lead"},
           {"isn't", "aren't"},   {"wasn't", "weren't"}, {"doesn't", "don't"},
           {"hasn't", "haven't"}, {"needs", "need"},     {"undergoes", "undergo"},
       }) {
    INFO(c.in);
    auto a = t->pluralize(c.in);
    CHECK(a.kind == VerbTable::Answer::plural);
    CHECK(a.form == c.out);
  }
  // Curly apostrophes stay curly.
  auto curly = t->pluralize("isn\xE2\x80\x99t");
  CHECK(curly.kind == VerbTable::Answer::plural);
  CHECK(curly.form == "aren\xE2\x80\x99t");
  CHECK(t->pluralize("doesn\xE2\x80\x99t").form == "don\xE2\x80\x99t");

  for (const char* w : {"can", "could", "will", "would", "must", "should", "may", "might", "won't",
                        "can't", "didn't", "went", "walked", "did", "had", "put", "read", "took",
                        "going", "been", "were", "ain't", "cried",
                        // Not in the table and without an -s ending: nothing to agree.
                        "daixed", "often"}) {
    INFO(w);
    auto a = t->pluralize(w);
    CHECK(a.kind == VerbTable::Answer::unchanged);
    CHECK(a.form == w);
    CHECK_FALSE(a.reason.empty());
  }
  for (const char* w : {"lead", "go", "are", "axes", "summons", "table", "she's", "frierks", ""}) {
    INFO(w);
    auto a = t->pluralize(w);
    CHECK(a.kind == VerbTable::Answer::unknown);
    CHECK(a.form.empty());
    CHECK_FALSE(a.reason.empty());
  }
  CHECK(t->pluralize("lead").reason.find("base form") != std::string::npos);
  CHECK(t->pluralize("axes").reason.find("two lemmas") != std::string::npos);
}

TEST_CASE("resolve_s: she's -> they're or they've", "[verbs]") {
  // Readings from general knowledge of English (from memory).
  auto t = shipped_table();
  using C = VerbTable::Contraction;
  CHECK(after_s(*t, {"going", "home"}).kind == C::are);
  CHECK(after_s(*t, {"a", "doctor"}).kind == C::are);
  CHECK(after_s(*t, {"happy"}).kind == C::are);
  CHECK(after_s(*t, {"here", "."}).kind == C::are);
  CHECK(after_s(*t, {}).kind == C::are);
  CHECK(after_s(*t, {"."}).kind == C::are);
  CHECK(after_s(*t, {"been", "there"}).kind == C::have);
  CHECK(after_s(*t, {"got", "a", "car"}).kind == C::have);
  CHECK(after_s(*t, {"had", "enough"}).kind == C::have);
  CHECK(after_s(*t, {"seen", "it"}).kind == C::have);
  CHECK(after_s(*t, {"walked", "home"}).kind == C::have);
  CHECK(after_s(*t, {"never", "been"}).kind == C::have);
  CHECK(after_s(*t, {"not", "really", "seen", "it"}).kind == C::have);
  CHECK(after_s(*t, {"gone", "the", "long", "way"}).kind == C::have);
  CHECK(after_s(*t, {"finished", "the", "report"}).kind == C::have);
  CHECK(after_s(*t, {"written", "three", "books"}).kind == C::have);
  // A past participle that is also an adjective, with no object: both readings exist, and
  // "they're" is the grammatical one for both.
  for (auto words : std::vector<std::vector<std::string_view>>{
           {"gone"}, {"tired"}, {"married", "to", "him"}, {"gone", "home"}, {"tired", "."}}) {
    auto c = after_s(*t, words);
    INFO(words[0]);
    CHECK(c.kind == C::unknown);
    CHECK(c.lean == C::are);
    CHECK(c.reason.find("adjective") != std::string::npos);
  }
  auto passive = after_s(*t, {"allowed", "to", "go"});
  CHECK(passive.kind == C::unknown);
  CHECK(passive.lean == C::have);
}

TEST_CASE("verb table helpers", "[verbs]") {
  auto t = shipped_table();
  CHECK(t->is_past_participle("gone"));
  CHECK(t->is_past_participle("walked"));
  CHECK(t->is_past_participle("put"));
  CHECK_FALSE(t->is_past_participle("going"));
  CHECK(t->is_present_participle("going"));
  CHECK(t->is_present_participle("dying"));
  CHECK_FALSE(t->is_present_participle("gone"));
  CHECK(t->is_third_singular("goes"));
  CHECK(t->is_third_singular("is"));
  CHECK_FALSE(t->is_third_singular("go"));
  CHECK(t->is_base_form("go"));
  CHECK(t->is_base_form("be"));
  CHECK(t->is_preverbal_adverb("often"));
  CHECK(t->is_preverbal_adverb("usually"));
  CHECK(t->is_preverbal_adverb("never"));
  CHECK_FALSE(t->is_preverbal_adverb("applies"));
  CHECK_FALSE(t->is_preverbal_adverb("apply"));  // a verb, though it ends in -ly
  CHECK_FALSE(t->is_preverbal_adverb("goes"));
}

TEST_CASE("VerbTable::parse reads the format and rejects malformed records", "[verbs]") {
  const std::string head = "# comment\nformat evenhand-verbs 1\n";
  auto ok = VerbTable::parse(head +
                             "v go goes went,gone going\nv walk walks walked walking\n"
                             "a gone\n\n# trailing comment\n");
  REQUIRE(ok.ok());
  CHECK(ok.value()->lemma_count() == 2);
  CHECK(ok.value()->pluralize("goes").form == "go");
  CHECK(ok.value()->pluralize("went").kind == VerbTable::Answer::unchanged);
  CHECK(ok.value()->resolve_s(std::vector<std::string_view>{"walked"}).kind ==
        VerbTable::Contraction::have);
  CHECK(ok.value()->resolve_s(std::vector<std::string_view>{"gone"}).kind ==
        VerbTable::Contraction::unknown);
  // CRLF line ends are accepted.
  CHECK(VerbTable::parse("format evenhand-verbs 1\r\nv go goes went going\r\n").ok());

  struct Bad {
    std::string text;
    uint64_t line;
    const char* says;
  };
  for (const Bad& b : std::vector<Bad>{
           {"v go goes went going\n", 1, "first record"},
           {"format evenhand-verbs 2\n", 1, "first record"},
           {"", 0, "no 'format"},
           {"# only a comment\n", 0, "no 'format"},
           {head + "v go goes went\n", 3, "5 fields"},
           {head + "v go goes went going extra\n", 3, "5 fields"},
           {head + "v Go goes went going\n", 3, "bad lemma"},
           {head + "v go goes,,x went going\n", 3, "bad form"},
           {head + "v go goes went going\nv go goes went going\n", 4, "listed twice"},
           {head + "v go goes went going\na going\n", 4, "not a past form"},
           {head + "a gone\n", 3, "not a past form"},
           {head + "a\n", 3, "2 fields"},
           {head + "x y\n", 3, "unknown record type"},
       }) {
    INFO(b.text);
    auto r = VerbTable::parse(b.text, "test.data");
    REQUIRE_FALSE(r.ok());
    CHECK(r.error().kind == ErrorKind::pack);
    CHECK(r.error().file == "test.data");
    CHECK(r.error().line.value_or(0) == b.line);
    CHECK(r.error().reason.find(b.says) != std::string::npos);
  }
}

TEST_CASE("auxiliaries before a subject: which invert with number, which have none") {
  // Common practice of English grammar (no outside list): in questions and tags only
  // auxiliaries stand before the subject; be/have/do show number there, modals and "did" do
  // not.
  using rewrite::VerbTable;
  for (const char* w : {"is", "was", "has", "does", "isn't", "wasn't", "hasn't", "doesn't"}) {
    INFO(w);
    CHECK(VerbTable::is_inverting_auxiliary(w));
    CHECK_FALSE(VerbTable::is_numberless_auxiliary(w));
  }
  for (const char* w : {"can", "could", "will", "would", "shall", "should", "may", "might", "must",
                        "did", "cannot", "can't", "won't", "didn't", "mustn't"}) {
    INFO(w);
    CHECK(VerbTable::is_numberless_auxiliary(w));
    CHECK_FALSE(VerbTable::is_inverting_auxiliary(w));
  }
  // Lexical verbs and other words are neither ("she says he knows").
  for (const char* w : {"says", "knows", "goes", "are", "were", "the", "she"}) {
    INFO(w);
    CHECK_FALSE(VerbTable::is_inverting_auxiliary(w));
    CHECK_FALSE(VerbTable::is_numberless_auxiliary(w));
  }
}
