// The shipped English gender pack (rules/en-gender/, built into the binary): it loads cleanly,
// has the groups female, male and neutral, is big enough, covers the definitional gender pairs
// in both directions, maps the singular-they pronouns and the common neutral nouns, maps every
// form back to where it came from, and spells every form as the hunspell en_US dictionary does.
#include <array>
#include <catch2/catch.hpp>
#include <fstream>
#include <map>
#include <set>

#include "pack_test_util.h"
#include "support/hunspell.h"

using namespace evenhand;
using namespace evenhand::pack;
using namespace evenhand::pack::testing;

namespace {

std::shared_ptr<const CompiledPack> shipped() {
  std::vector<Diagnostic> diags;
  auto r = load_pack("en-gender", diags);
  INFO(format_diagnostics(diags));
  REQUIRE(diags.empty());
  REQUIRE(r.ok());
  return r.value();
}

// The counterparts in group `to` of the form `word` of group `from` (all tags).
std::set<std::string> counterparts(const CompiledPack& p, const std::string& word, uint16_t from,
                                   uint16_t to) {
  std::set<std::string> out;
  std::vector<std::string> words;
  for (const auto& t : form_tokens(word)) words.push_back(fold_word(t));
  const auto* list = p.lookup(words.front());
  if (!list) return out;
  for (const auto& e : *list) {
    if (e.words != words || e.group != from) continue;
    const std::string& other = e.is_name ? p.names()[e.set].names[to] : p.sets()[e.set].forms[to];
    if (!other.empty()) out.insert(fold_word(other));
  }
  return out;
}

// The set in which `word` is a form of group `group` with tag `tag`, or null.
const WordSet* set_of(const CompiledPack& p, const std::string& word, uint16_t group,
                      Tag tag = Tag::none) {
  std::vector<std::string> words;
  for (const auto& t : form_tokens(word)) words.push_back(fold_word(t));
  const auto* list = p.lookup(words.front());
  if (!list) return nullptr;
  for (const auto& e : *list)
    if (e.words == words && e.group == group && !e.is_name && e.tag == tag) return &p.sets()[e.set];
  return nullptr;
}

}  // namespace

TEST_CASE("the en-gender pack is built in and loads with no diagnostics", "[pack][shipped]") {
  auto names = builtin_pack_names();
  CHECK(std::find(names.begin(), names.end(), "en-gender") != names.end());
  CHECK(std::is_sorted(names.begin(), names.end()));
  auto p = shipped();
  CHECK(p->name() == "en-gender");
  CHECK(p->version() == "1.1.0");
  CHECK(p->language() == "en");
  CHECK(p->axis() == "gender");
  // The group names are fixed: scripts and --toward name them.
  CHECK(p->groups() == std::vector<std::string>{"female", "male", "neutral"});
  CHECK(p->sets().size() >= 150);
  CHECK_FALSE(p->protected_phrases().empty());
  std::set<std::string> reasons;
  for (const auto& g : p->guards()) reasons.insert(g.reason);
  CHECK(reasons.count("medical") == 1);
  CHECK(p->sha256().size() == 64);
}

TEST_CASE("the built-in en-gender pack is the rules/en-gender folder", "[pack][shipped]") {
  std::vector<Diagnostic> diags;
  auto dir = load_pack_dir((source_dir() / "rules" / "en-gender").string(), diags);
  INFO(format_diagnostics(diags));
  REQUIRE(dir.ok());
  // Equal hashes mean the embedded bytes are the files' bytes (rebuild after editing rules/).
  CHECK(dir.value()->sha256() == shipped()->sha256());
  auto files = builtin_pack_files("en-gender");
  REQUIRE(files.has_value());
  CHECK(files->count("pack.txt") == 1);
  CHECK(files->count("words.txt") == 1);
  CHECK_FALSE(builtin_pack_files("no-such-pack").has_value());
}

TEST_CASE("the definitional gender pairs map in both directions", "[pack][shipped]") {
  // source: Bolukbasi et al. 2016, "Man is to Computer Programmer as Woman is to Homemaker?
  // Debiasing Word Embeddings", the ten definitional pairs, from memory.
  const std::vector<std::pair<std::string, std::string>> pairs = {
      {"she", "he"},          {"her", "his"},      {"woman", "man"},
      {"herself", "himself"}, {"daughter", "son"}, {"mother", "father"},
      {"gal", "guy"},         {"girl", "boy"},     {"female", "male"}};
  auto p = shipped();
  uint16_t f = *p->group_index("female"), m = *p->group_index("male");
  for (const auto& [fw, mw] : pairs) {
    INFO(fw << " | " << mw);
    CHECK(counterparts(*p, fw, f, m).count(mw) == 1);
    CHECK(counterparts(*p, mw, m, f).count(fw) == 1);
  }
  // Mary | John is a name pair; checked only when the pack has names.
  if (!p->names().empty()) {
    CHECK(counterparts(*p, "Mary", f, m).count("john") == 1);
    CHECK(counterparts(*p, "John", m, f).count("mary") == 1);
  }
}

TEST_CASE("the singular-they pronouns are the neutral forms of the pronoun sets",
          "[pack][shipped]") {
  // source: Merriam-Webster, entry "they" (the sense for one person whose gender is unknown or
  // nonbinary), and The Chicago Manual of Style, 17th ed., 2017 (singular they and themself),
  // from memory.
  auto p = shipped();
  const uint16_t f = *p->group_index("female"), m = *p->group_index("male"),
                 n = *p->group_index("neutral");
  struct Row {
    const char* female;
    const char* male;
    const char* neutral;
    Tag tag;
  };
  const std::vector<Row> rows = {{"she", "he", "they", Tag::subj},
                                 {"her", "him", "them", Tag::obj},
                                 {"her", "his", "their", Tag::det},
                                 {"hers", "his", "theirs", Tag::poss},
                                 {"herself", "himself", "themself", Tag::none}};
  for (const auto& r : rows) {
    INFO(r.female << " | " << r.male << " | " << r.neutral << " @" << tag_name(r.tag));
    const WordSet* from_f = set_of(*p, r.female, f, r.tag);
    const WordSet* from_m = set_of(*p, r.male, m, r.tag);
    const WordSet* from_n = set_of(*p, r.neutral, n, r.tag);
    REQUIRE(from_f != nullptr);
    REQUIRE(from_m != nullptr);
    REQUIRE(from_n != nullptr);
    // One set, seen from each of its three forms.
    CHECK(from_f == from_m);
    CHECK(from_f == from_n);
    CHECK(from_f->forms[n] == r.neutral);
    CHECK(from_n->forms[f] == r.female);
    CHECK(from_n->forms[m] == r.male);
  }
  // she -> they, him -> them, her (determiner) -> their; "her" as object is "them".
  CHECK(counterparts(*p, "she", f, n) == std::set<std::string>{"they"});
  CHECK(counterparts(*p, "him", m, n) == std::set<std::string>{"them"});
  CHECK(counterparts(*p, "her", f, n) == (std::set<std::string>{"them", "their"}));
  CHECK(set_of(*p, "her", f, Tag::det)->forms[n] == "their");
  CHECK(set_of(*p, "her", f, Tag::obj)->forms[n] == "them");
  // "his" is determiner or possessive pronoun: their / theirs.
  CHECK(counterparts(*p, "his", m, n) == (std::set<std::string>{"their", "theirs"}));
  // And back: each neutral pronoun has one female and one male counterpart.
  CHECK(counterparts(*p, "they", n, f) == std::set<std::string>{"she"});
  CHECK(counterparts(*p, "them", n, m) == std::set<std::string>{"him"});
  CHECK(counterparts(*p, "their", n, f) == std::set<std::string>{"her"});
  CHECK(counterparts(*p, "theirs", n, m) == std::set<std::string>{"his"});
}

TEST_CASE("neutral nouns where English has them, '-' where it has none", "[pack][shipped]") {
  auto p = shipped();
  const uint16_t f = *p->group_index("female"), m = *p->group_index("male"),
                 n = *p->group_index("neutral");
  // source: the U.S. Department of Labor's Dictionary of Occupational Titles, 4th ed., 1977,
  // which replaced sex-specific job titles by neutral ones (flight attendant for stewardess,
  // police officer for policeman), from memory; the kinship and other nouns are common
  // practice.
  const std::vector<std::array<const char*, 3>> with_neutral = {
      {"woman", "man", "person"},
      {"women", "men", "people"},
      {"woman's", "man's", "person's"},
      {"mother", "father", "parent"},
      {"mothers", "fathers", "parents"},
      {"sister", "brother", "sibling"},
      {"wife", "husband", "spouse"},
      {"daughter", "son", "child"},
      {"daughters", "sons", "children"},
      {"grandmother", "grandfather", "grandparent"},
      {"granddaughter", "grandson", "grandchild"},
      {"chairwoman", "chairman", "chairperson"},
      {"spokeswoman", "spokesman", "spokesperson"},
      {"businesswoman", "businessman", "businessperson"},
      {"stewardess", "steward", "flight attendant"},
      {"waitress", "waiter", "server"},
      {"queen", "king", "monarch"},
      {"policewoman", "policeman", "police officer"},
      {"Mrs", "Mr", "Mx"},
  };
  for (const auto& [fw, mw, nw] : with_neutral) {
    INFO(fw << " | " << mw << " | " << nw);
    CHECK(counterparts(*p, fw, f, n) == std::set<std::string>{fold_word(nw)});
    CHECK(counterparts(*p, mw, m, n) == std::set<std::string>{fold_word(nw)});
    CHECK(counterparts(*p, nw, n, f) == std::set<std::string>{fold_word(fw)});
    CHECK(counterparts(*p, nw, n, m) == std::set<std::string>{fold_word(mw)});
  }
  // "firewoman" is not in the dictionary: the set has a male and a neutral form only.
  CHECK(counterparts(*p, "fireman", m, n) == std::set<std::string>{"firefighter"});
  CHECK(counterparts(*p, "fireman", m, f).empty());
  CHECK(counterparts(*p, "firefighter", n, m) == std::set<std::string>{"fireman"});

  // Sets with no neutral form write '-' (an empty form): no common neutral word (niece |
  // nephew, aunt | uncle, princess | prince, madam | sir, ladies | gentlemen), no neutral
  // adjective (female | male), or the neutral word is the male form (actress | actor).
  const std::vector<std::pair<const char*, const char*>> without = {
      {"niece", "nephew"},  {"aunt", "uncle"},       {"princess", "prince"},
      {"madam", "sir"},     {"ladies", "gentlemen"}, {"female", "male"},
      {"actress", "actor"}, {"hostess", "host"},     {"heiress", "heir"}};
  for (const auto& [fw, mw] : without) {
    INFO(fw << " | " << mw);
    const WordSet* set = set_of(*p, fw, f);
    if (!set) set = set_of(*p, fw, f, Tag::noun);
    REQUIRE(set != nullptr);
    CHECK(set->forms[m] == mw);
    CHECK(set->forms[n].empty());
    CHECK(counterparts(*p, fw, f, n).empty());
  }
  // "actor" is the male form, so it cannot be a neutral one as well.
  CHECK(set_of(*p, "actor", n) == nullptr);
  // "child" is daughter | son's neutral form; girl | boy takes "kid".
  CHECK(counterparts(*p, "child", n, f) == std::set<std::string>{"daughter"});
  CHECK(counterparts(*p, "girl", f, n) == std::set<std::string>{"kid"});

  // How many sets have a neutral form (printed; a floor so that the column is really used).
  size_t neutral = 0, neutral_only = 0;
  for (const auto& set : p->sets()) {
    if (set.forms[n].empty()) continue;
    ++neutral;
    if (set.forms[f].empty() && set.forms[m].empty()) ++neutral_only;
  }
  WARN("en-gender: " << neutral << " of " << p->sets().size() << " sets have a neutral form");
  CHECK(neutral >= 100);
  CHECK(neutral < p->sets().size());
  CHECK(neutral_only == 0);  // a neutral word alone would never be rewritten
  // First names have no neutral counterpart.
  for (const auto& pair : p->names()) {
    INFO(pair.where.str());
    CHECK(pair.names[n].empty());
  }
}

TEST_CASE("every mapping of the shipped pack is reversible", "[pack][shipped]") {
  auto p = shipped();
  size_t checked = check_mappings_go_back(*p);
  CHECK(checked >= 300);
  // Names: a bijection, so each name's counterpart names it back.
  for (const auto& pair : p->names()) {
    if (pair.names[0].empty() || pair.names[1].empty()) continue;
    auto back = counterparts(*p, pair.names[1], 1, 0);
    INFO(pair.where.str());
    CHECK(back == std::set<std::string>{fold_word(pair.names[0])});
  }
  // Every neutral form is in one set of its tag, so it maps back to one female and one male
  // form (the reverse mapping is unique).
  const uint16_t n = *p->group_index("neutral");
  std::map<std::pair<std::string, Tag>, std::string> seen;
  for (const auto& set : p->sets()) {
    if (set.forms[n].empty()) continue;
    std::string key;
    for (const auto& t : form_tokens(set.forms[n])) key += fold_word(t) + " ";
    auto [it, fresh] = seen.emplace(std::make_pair(key, set.tag), set.where.str());
    INFO(set.forms[n] << " at " << set.where.str() << " and " << it->second);
    CHECK(fresh);
  }
}

TEST_CASE("shipped lookups: curly apostrophes, case and multiword forms", "[pack][shipped]") {
  auto p = shipped();
  const auto* straight = p->lookup(fold_word("mother's"));
  const auto* curly = p->lookup(fold_word("Mother\xE2\x80\x99s"));
  REQUIRE(straight != nullptr);
  CHECK(straight == curly);
  bool found = false;
  for (const auto& e : *straight)
    found |= e.words.size() == 1 && p->sets()[e.set].forms[1] == "father's";
  CHECK(found);

  auto has_entry = [&](std::vector<std::string> words, const std::string& counterpart) {
    const auto* list = p->lookup(words.front());
    if (!list) return false;
    for (const auto& e : *list)
      if (e.words == words && e.group < 2 && p->sets()[e.set].forms[1 - e.group] == counterpart)
        return true;
    return false;
  };
  CHECK(has_entry({"mother", "-", "in", "-", "law"}, "father-in-law"));
  CHECK(has_entry({"step", "-", "mother"}, "step-father"));
  CHECK(has_entry({"great", "-", "grandmother"}, "great-grandfather"));
  CHECK(has_entry({"grandmothers", "'"}, "grandfathers'"));
  CHECK(has_entry({"ladies", "'"}, "gentlemen's"));
  // Multiword neutral forms are entries under their first word.
  const LexEntry* officer = nullptr;
  if (const auto* list = p->lookup("police"))
    for (const auto& e : *list)
      if (e.words == std::vector<std::string>{"police", "officer"}) officer = &e;
  REQUIRE(officer != nullptr);
  CHECK(p->groups()[officer->group] == "neutral");
  CHECK(p->sets()[officer->set].forms[0] == "policewoman");
  CHECK(p->max_entry_words() >= 5);
  // Longest first under every key.
  for (const std::string key : {"mother", "step", "great", "sister", "daughter"}) {
    const auto* list = p->lookup(key);
    REQUIRE(list != nullptr);
    for (size_t i = 1; i < list->size(); ++i)
      CHECK((*list)[i - 1].words.size() >= (*list)[i].words.size());
  }
}

TEST_CASE("every word of the shipped sets is in the hunspell en_US dictionary",
          "[pack][shipped][external]") {
  // source: hunspell 1.7 with the hunspell-en-us dictionary (Debian 12 packages hunspell and
  // hunspell-en-us); `hunspell -d en_US -l` prints the words it does not accept.
  // Accepted exceptions, each with its reason:
  const std::map<std::string, std::string> exceptions = {
      {"fianc\xC3\xA9"
       "e",
       "the dictionary is ASCII-only and spells it fiancee (also in the pack)"},
      {"fianc\xC3\xA9", "the dictionary is ASCII-only and spells it fiance (also in the pack)"},
      {"fianc\xC3\xA9"
       "es",
       "plural of the accented spelling, see fiancée"},
      {"fianc\xC3\xA9"
       "s",
       "plural of the accented spelling, see fiancé"},
      {"gentlemen's",
       "possessive of an irregular plural; the dictionary lists gentlemen without it"},
      // source for both: Merriam-Webster lists "Mx" and "themself" (from memory).
      {"Mx", "the title without gender; hunspell-en-us 2020.12.07 predates it"},
      {"themself", "reflexive of singular they; hunspell-en-us 2020.12.07 lacks it"},
  };
  auto p = shipped();
  std::set<std::string> words;
  for (const auto& set : p->sets())
    for (const auto& form : set.forms)
      for (const auto& t : form_tokens(form))
        if (t != "-" && t != "'") words.insert(t);
  REQUIRE(words.size() >= 300);

  evenhand::testing::check_hunspell_exceptions(evenhand::testing::hunspell_rejects(words, "en_US"),
                                               exceptions, "en_US");
}
