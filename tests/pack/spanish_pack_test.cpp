// The shipped Spanish gender pack (rules/es-gender/, built into the binary): it loads cleanly,
// is big enough, maps the basic gender pairs and every form back to where it came from, its
// data files are well formed and consistent, and every word is spelled as hunspell es_ES does.
#include <catch2/catch.hpp>
#include <fstream>
#include <set>
#include <sstream>

#include "pack_test_util.h"
#include "support/hunspell.h"

using namespace evenhand;
using namespace evenhand::pack;
using namespace evenhand::pack::testing;

namespace {

std::shared_ptr<const CompiledPack> spanish() {
  std::vector<Diagnostic> diags;
  auto r = load_pack("es-gender", diags);
  INFO(format_diagnostics(diags));
  REQUIRE(diags.empty());
  REQUIRE(r.ok());
  return r.value();
}

std::vector<std::string> folded_tokens(const std::string& form) {
  std::vector<std::string> out;
  for (const auto& t : form_tokens(form)) out.push_back(fold_word(t));
  return out;
}

// The counterparts in group `to` of the form `form` of group `from`, with the tag of each set.
std::set<std::pair<std::string, Tag>> counterparts(const CompiledPack& p, const std::string& form,
                                                   uint16_t from, uint16_t to) {
  std::set<std::pair<std::string, Tag>> out;
  auto words = folded_tokens(form);
  const auto* list = p.lookup(words.front());
  if (!list) return out;
  for (const auto& e : *list) {
    if (e.words != words || e.group != from || e.is_name) continue;
    const std::string& other = p.sets()[e.set].forms[to];
    if (!other.empty()) out.insert({fold_word(other), e.tag});
  }
  return out;
}

// The lines of a data file without comments, split into fields at spaces.
std::vector<std::vector<std::string>> data_lines(const std::string& text) {
  std::vector<std::vector<std::string>> out;
  std::istringstream in(text);
  std::string line;
  while (std::getline(in, line)) {
    line = line.substr(0, line.find('#'));
    std::istringstream fields(line);
    std::vector<std::string> f;
    for (std::string w; fields >> w;) f.push_back(w);
    if (!f.empty()) out.push_back(std::move(f));
  }
  return out;
}

std::string data_file(const CompiledPack& p, const std::string& name) {
  const std::string* text = p.file(name);
  REQUIRE(text != nullptr);
  return *text;
}

bool ends_with(const std::string& s, const std::string& suffix) {
  return s.size() >= suffix.size() &&
         s.compare(s.size() - suffix.size(), suffix.size(), suffix) == 0;
}

}  // namespace

TEST_CASE("the es-gender pack is built in and loads with no diagnostics", "[pack][spanish]") {
  auto names = builtin_pack_names();
  CHECK(std::find(names.begin(), names.end(), "es-gender") != names.end());
  auto p = spanish();
  CHECK(p->name() == "es-gender");
  CHECK(p->version() == "0.2.0");
  CHECK(p->language() == "es");
  CHECK(p->axis() == "gender");
  CHECK(p->groups() == std::vector<std::string>{"female", "male"});
  CHECK(p->sets().size() >= 120);
  CHECK(p->names().empty());
  CHECK_FALSE(p->protected_phrases().empty());
  std::set<std::string> reasons;
  for (const auto& g : p->guards()) reasons.insert(g.reason);
  CHECK(reasons.count("medical") == 1);
  // The data files for the engine's agreement travel with the pack.
  auto files = p->file_names();
  for (const char* f : {"pack.txt", "words.txt", "protect.txt", "guards.txt", "common-gender.data",
                        "adjectives.data", "stressed-a.data", "noun-phrase.data"})
    CHECK(std::find(files.begin(), files.end(), f) != files.end());
}

TEST_CASE("the built-in es-gender pack is the rules/es-gender folder", "[pack][spanish]") {
  std::vector<Diagnostic> diags;
  auto dir = load_pack_dir((source_dir() / "rules" / "es-gender").string(), diags);
  INFO(format_diagnostics(diags));
  REQUIRE(dir.ok());
  // Equal hashes mean the embedded bytes are the files' bytes (rebuild after editing rules/).
  CHECK(dir.value()->sha256() == spanish()->sha256());
}

TEST_CASE("basic Spanish gender pairs map in both directions", "[pack][spanish]") {
  // source: Real Academia Española, Nueva gramática de la lengua española (gender of nouns,
  // pronouns and determiners), from memory.
  const std::vector<std::pair<std::string, std::string>> pairs = {
      {"ella", "él"},         {"ellas", "ellos"},        {"nosotras", "nosotros"},
      {"madre", "padre"},     {"hija", "hijo"},          {"niña", "niño"},
      {"hermana", "hermano"}, {"abuela", "abuelo"},      {"nuera", "yerno"},
      {"reina", "rey"},       {"actriz", "actor"},       {"emperatriz", "emperador"},
      {"heroína", "héroe"},   {"profesora", "profesor"}, {"campeona", "campeón"},
      {"jefa", "jefe"},       {"de la", "del"},          {"a la", "al"},
      {"esta", "este"},       {"aquellas", "aquellos"}};
  auto p = spanish();
  uint16_t f = *p->group_index("female"), m = *p->group_index("male");
  for (const auto& [fw, mw] : pairs) {
    INFO(fw << " | " << mw);
    auto to_male = counterparts(*p, fw, f, m);
    auto to_female = counterparts(*p, mw, m, f);
    REQUIRE(to_male.size() == 1);
    REQUIRE(to_female.size() == 1);
    CHECK(to_male.begin()->first == fold_word(mw));
    CHECK(to_female.begin()->first == fw);
  }
  // "él" (pronoun) and "el" (article) are different words: the accent is kept by folding.
  CHECK(fold_word("\xC3\x89l") != fold_word("El"));
  CHECK(counterparts(*p, "el", m, f) == std::set<std::pair<std::string, Tag>>{{"la", Tag::det}});
  // "la" is article and clitic; the tag chooses the counterpart.
  CHECK(counterparts(*p, "la", f, m) ==
        std::set<std::pair<std::string, Tag>>{{"el", Tag::det}, {"lo", Tag::obj}});
  // "mujer" is a woman ("hombre") and, after a possessive, a wife ("marido": Real Academia
  // Española, Diccionario de la lengua española, "mujer", from memory); the tag chooses.
  CHECK(counterparts(*p, "mujer", f, m) ==
        std::set<std::pair<std::string, Tag>>{{"hombre", Tag::noun}, {"marido", Tag::poss}});
  CHECK(counterparts(*p, "hombre", m, f) ==
        std::set<std::pair<std::string, Tag>>{{"mujer", Tag::noun}});
  // Apocope: "alguna" is "algún" before a noun and "alguno" standing alone.
  CHECK(counterparts(*p, "alguna", f, m) ==
        std::set<std::pair<std::string, Tag>>{{"alg\xC3\xBAn", Tag::det}, {"alguno", Tag::poss}});
}

TEST_CASE("every mapping of the es-gender pack goes back to its source", "[pack][spanish]") {
  auto p = spanish();
  size_t checked = check_mappings_go_back(*p);
  CHECK(checked >= 240);
}

TEST_CASE("the es-gender data files are well formed and consistent", "[pack][spanish]") {
  auto p = spanish();
  // Nouns of one form for both sexes cannot also be a form of a set.
  std::set<std::string> kinds;
  size_t nouns = 0;
  for (const auto& f : data_lines(data_file(*p, "common-gender.data"))) {
    INFO("common-gender.data: " << f.front());
    REQUIRE(f.size() == 3);
    CHECK((f[0] == "common" || f[0] == "epicene-f" || f[0] == "epicene-m"));
    kinds.insert(f[0]);
    for (size_t i = 1; i < 3; ++i) CHECK(p->lookup(fold_word(f[i])) == nullptr);
    ++nouns;
  }
  CHECK(kinds.size() == 3);
  CHECK(nouns >= 40);

  // Adjectives: explicit pairs that an ending rule covers must agree with that rule (the
  // longest matching ending), so that the rules and the examples do not contradict.
  std::vector<std::vector<std::string>> rules;
  std::vector<std::vector<std::string>> pairs;
  std::set<std::string> same;
  size_t apocopes = 0;
  for (const auto& f : data_lines(data_file(*p, "adjectives.data"))) {
    INFO("adjectives.data: " << f.front() << " " << (f.size() > 1 ? f[1] : ""));
    if (f[0] == "rule" || f[0] == "pair") {
      REQUIRE(f.size() == 5);
      (f[0] == "rule" ? rules : pairs).push_back(f);
    } else if (f[0] == "same") {
      REQUIRE(f.size() == 3);
      CHECK(same.insert(f[1]).second);
    } else if (f[0] == "apocope") {
      REQUIRE(f.size() == 4);
      CHECK((f[3] == "m" || f[3] == "mf"));
      ++apocopes;
    } else if (f[0] == "adj") {
      CHECK(f.size() >= 2);
      for (size_t i = 1; i < f.size(); ++i) CHECK(ends_with(f[i], "o"));
    } else if (f[0] == "invariable") {
      CHECK(f.size() == 2);
    } else {
      FAIL("unknown line kind " << f[0]);
    }
  }
  REQUIRE(rules.size() >= 5);
  CHECK(apocopes >= 8);
  size_t ruled = 0;
  for (const auto& pair : pairs) {
    INFO("pair " << pair[1]);
    CHECK(same.count(pair[1]) == 0);
    const std::vector<std::string>* best = nullptr;
    for (const auto& r : rules)
      if (ends_with(pair[1], r[1]) && (!best || r[1].size() > (*best)[1].size())) best = &r;
    if (!best) continue;
    std::string stem = pair[1].substr(0, pair[1].size() - (*best)[1].size());
    CHECK(pair[2] == stem + (*best)[2]);
    CHECK(pair[3] == stem + (*best)[3]);
    CHECK(pair[4] == stem + (*best)[4]);
    ++ruled;
  }
  CHECK(ruled >= 10);
  // The invariable comparatives are exceptions to the -or rule.
  for (const char* w : {"mayor", "menor", "mejor", "peor", "superior", "inferior"})
    CHECK(same.count(w) == 1);

  // Stressed a: every listed word (nouns and exceptions) begins with a, á, ha or há.
  size_t stressed = 0, exceptions = 0;
  for (const auto& f : data_lines(data_file(*p, "stressed-a.data"))) {
    INFO("stressed-a.data: " << f.front() << " " << (f.size() > 1 ? f[1] : ""));
    REQUIRE(f.size() == 3);
    std::string w = fold_word(f[1]);
    bool starts_a = w.rfind("a", 0) == 0 || w.rfind("\xC3\xA1", 0) == 0 || w.rfind("ha", 0) == 0 ||
                    w.rfind("h\xC3\xA1", 0) == 0;
    CHECK(starts_a);
    if (f[0] == "noun") {
      CHECK(ends_with(f[2], "s"));
      // A feminine noun of the rule is a set form only as the female form of a person noun
      // ("ama | amo"): it is never a male form.
      if (const auto* entries = p->lookup(w)) {
        for (const auto& e : *entries) CHECK(p->groups()[e.group] == "female");
      }
      ++stressed;
    } else {
      CHECK(f[0] == "exception");
      CHECK((f[2] == "letter" || f[2] == "sex" || f[2] == "name"));
      ++exceptions;
    }
  }
  CHECK(stressed >= 25);
  CHECK(exceptions >= 6);
}

TEST_CASE("every word of the es-gender sets is in the hunspell es_ES dictionary",
          "[pack][spanish][external]") {
  // source: hunspell-es (Debian), RLA-ES dictionary; hunspell 1.7 (Debian package hunspell),
  // `hunspell -d es_ES -l` prints the words it does not accept. Multiword forms ("de la") are
  // checked word by word.
  // Accepted exceptions, each with its reason:
  const std::map<std::string, std::string> exceptions = {
      {"azafato",
       "the male form of azafata; in the RAE's dictionary (azafato, ta), from memory, but not "
       "in the hunspell word list"},
      {"azafatos", "plural of azafato, see there"},
  };
  auto p = spanish();
  std::set<std::string> words;
  for (const auto& set : p->sets())
    for (const auto& form : set.forms)
      for (const auto& t : form_tokens(form))
        if (t != "-" && t != "'") words.insert(t);
  REQUIRE(words.size() >= 400);
  evenhand::testing::check_hunspell_exceptions(evenhand::testing::hunspell_rejects(words, "es_ES"),
                                               exceptions, "es_ES");
}

TEST_CASE("every word of the es-gender data files is in the hunspell es_ES dictionary",
          "[pack][spanish][external]") {
  // source: hunspell-es (Debian), RLA-ES dictionary, as above.
  // Accepted exceptions, each with its reason:
  const std::map<std::string, std::string> exceptions = {
      {"grandote", "augmentative of grande (-ote); productive suffix, not in the word list"},
      {"grandota", "feminine of grandote, see there"},
      {"grandotes", "plural of grandote, see there"},
      {"grandotas", "plural of grandota, see there"},
      {"\xC3\xA1"
       "crata",
       "ácrata (anarchist), in the RAE's dictionary, from memory; not in the word list"},
  };
  auto p = spanish();
  std::set<std::string> words;
  for (const auto& f : data_lines(data_file(*p, "common-gender.data")))
    words.insert(f.begin() + 1, f.end());
  for (const auto& f : data_lines(data_file(*p, "adjectives.data"))) {
    if (f[0] == "rule" || f[0] == "invariable") continue;  // endings, not words
    size_t last = f[0] == "apocope" ? 3 : f.size();
    words.insert(f.begin() + 1, f.begin() + last);
  }
  // noun-phrase.data: the word lists and the forms of the sets it names.
  for (const auto& f : data_lines(data_file(*p, "noun-phrase.data"))) {
    if (f[0] == "genders") continue;
    for (size_t i = 1; i < f.size(); ++i) {
      std::string w = f[i];
      if (w == "-") continue;
      for (size_t u; (u = w.find('_')) != std::string::npos;) {
        words.insert(w.substr(0, u));
        w = w.substr(u + 1);
      }
      words.insert(w);
    }
  }
  for (const auto& f : data_lines(data_file(*p, "stressed-a.data"))) {
    words.insert(f[1]);
    if (f[0] == "noun") words.insert(f[2]);
  }
  REQUIRE(words.size() >= 250);
  evenhand::testing::check_hunspell_exceptions(evenhand::testing::hunspell_rejects(words, "es_ES"),
                                               exceptions, "es_ES");
}
