// The shipped English gender pack (rules/en-gender/, built into the binary): it loads cleanly,
// is big enough, covers the definitional gender pairs in both directions, maps every form back
// to where it came from, and spells every form as the hunspell en_US dictionary does.
#include <unistd.h>
#include <catch2/catch.hpp>
#include <cstdio>
#include <fstream>
#include <set>

#include "pack_test_util.h"

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

}  // namespace

TEST_CASE("the en-gender pack is built in and loads with no diagnostics", "[pack][shipped]") {
  auto names = builtin_pack_names();
  CHECK(std::find(names.begin(), names.end(), "en-gender") != names.end());
  CHECK(std::is_sorted(names.begin(), names.end()));
  auto p = shipped();
  CHECK(p->name() == "en-gender");
  CHECK(p->version() == "1.0.0");
  CHECK(p->language() == "en");
  CHECK(p->axis() == "gender");
  CHECK(p->groups() == std::vector<std::string>{"female", "male"});
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

TEST_CASE("every mapping of the shipped pack is reversible", "[pack][shipped]") {
  auto p = shipped();
  size_t checked = 0;
  for (uint32_t s = 0; s < p->sets().size(); ++s) {
    const WordSet& set = p->sets()[s];
    for (uint16_t g = 0; g < set.forms.size(); ++g) {
      for (uint16_t h = 0; h < set.forms.size(); ++h) {
        if (g == h || set.forms[g].empty() || set.forms[h].empty()) continue;
        INFO(set.where.str() << ": " << set.forms[g] << " -> " << set.forms[h]);
        // B = the counterpart; its entries in group h must lead back to A through a set that
        // the tag selects: either B has one set (this one) or each of its sets has its own tag.
        std::vector<std::string> words;
        for (const auto& t : form_tokens(set.forms[h])) words.push_back(fold_word(t));
        const auto* list = p->lookup(words.front());
        REQUIRE(list != nullptr);
        std::vector<const LexEntry*> mine;
        for (const auto& e : *list)
          if (e.words == words && e.group == h && !e.is_name) mine.push_back(&e);
        REQUIRE_FALSE(mine.empty());
        std::set<Tag> tags;
        for (const auto* e : mine) tags.insert(e->tag);
        if (mine.size() > 1) {
          CHECK(tags.size() == mine.size());
          CHECK(tags.count(Tag::none) == 0);
        }
        const LexEntry* back = nullptr;
        for (const auto* e : mine)
          if (mine.size() == 1 || e->tag == set.tag) back = e;
        REQUIRE(back != nullptr);
        CHECK(fold_word(p->sets()[back->set].forms[g]) == fold_word(set.forms[g]));
        ++checked;
      }
    }
  }
  CHECK(checked >= 300);
  // Names: a bijection, so each name's counterpart names it back.
  for (const auto& pair : p->names()) {
    if (pair.names[0].empty() || pair.names[1].empty()) continue;
    auto back = counterparts(*p, pair.names[1], 1, 0);
    INFO(pair.where.str());
    CHECK(back == std::set<std::string>{fold_word(pair.names[0])});
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
      if (e.words == words && p->sets()[e.set].forms[1 - e.group] == counterpart) return true;
    return false;
  };
  CHECK(has_entry({"mother", "-", "in", "-", "law"}, "father-in-law"));
  CHECK(has_entry({"step", "-", "mother"}, "step-father"));
  CHECK(has_entry({"great", "-", "grandmother"}, "great-grandfather"));
  CHECK(has_entry({"grandmothers", "'"}, "grandfathers'"));
  CHECK(has_entry({"ladies", "'"}, "gentlemen's"));
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
  };
  auto p = shipped();
  std::set<std::string> words;
  for (const auto& set : p->sets())
    for (const auto& form : set.forms)
      for (const auto& t : form_tokens(form))
        if (t != "-" && t != "'") words.insert(t);
  REQUIRE(words.size() >= 300);

  std::string tmp =
      (std::filesystem::temp_directory_path() /
       ("evenhand_pack_hunspell_words." + std::to_string(getpid()) + ".txt"))
          .string();  // one file per process: ctest runs test cases in parallel
  {
    std::ofstream out(tmp);
    for (const auto& w : words) out << w << '\n';
  }
  FILE* pipe = popen(("hunspell -d en_US -i UTF-8 -l < '" + tmp + "' 2>&1").c_str(), "r");
  REQUIRE(pipe != nullptr);
  std::string output;
  char buf[4096];
  size_t n;
  while ((n = fread(buf, 1, sizeof buf, pipe)) > 0) output.append(buf, n);
  int status = pclose(pipe);
  std::filesystem::remove(tmp);
  INFO(output);
  REQUIRE(status == 0);

  std::set<std::string> unknown;
  size_t start = 0;
  while (start < output.size()) {
    size_t nl = output.find('\n', start);
    std::string line = output.substr(start, nl == std::string::npos ? nl : nl - start);
    if (!line.empty()) unknown.insert(line);
    if (nl == std::string::npos) break;
    start = nl + 1;
  }
  for (const auto& w : unknown) {
    INFO("hunspell en_US does not know '" << w << "'");
    CHECK(exceptions.count(w) == 1);
  }
  // Every exception is still needed: it names a word of the pack that hunspell rejects.
  for (const auto& [w, why] : exceptions) {
    INFO(w << ": " << why);
    CHECK(unknown.count(w) == 1);
  }
}
