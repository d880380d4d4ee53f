// Fuzz target: the possessive model file (rewrite/en/possessive.h, rules/en-gender/
// possessive.model) and its word lists (possessive_words.h, word-classes.data). Input: a model
// text, read with a small fixed word list, and also read as a word list. Checked: parse()
// returns a model (or word list) or an error with a line, never crashes; a parsed model
// decides every word of a few sentences (fixed ones and the input's own words) with a class
// and a finite, non-negative margin.
#include <cmath>
#include <string>
#include <vector>

#include "fuzz_support.h"
#include "rewrite/en/possessive.h"

using namespace evenhand;
using namespace evenhand::rewrite;

namespace {

void check_decisions(const PossessiveModel& m, const std::vector<std::string_view>& words) {
  for (size_t i = 0; i <= words.size(); ++i) {
    Decision d = m.decide(words, i);
    FUZZ_CHECK(d.kind <= Decision::standalone, "a decision outside the three classes");
    FUZZ_CHECK(std::isfinite(d.score) && d.score >= 0, "a margin that is negative or not finite");
  }
}

// One word of each kind of word-classes.data (the shipped file is not at hand here).
std::shared_ptr<const PossessiveWords> fixed_words() {
  static const auto words = PossessiveWords::parse(
      "format evenhand-word-classes 1\ndeterminer the\npreposition of\nconjunction and\n"
      "subordinator if\nsubject-pronoun she\nobject-pronoun him\npossessive his\n"
      "standalone-possessive hers\nauxiliary is\nnegation not\nobject-verb gave\n"
      "infinitive-to to\nher her\nfinite-verb is\nobject-participle-verb got\n"
      "day-adverb today\nadjective-preposition inside\nadverb-noun back\n"
      "after-possessive every\n",
      "word-classes.data");
  FUZZ_CHECK(words.ok(), "the fixed word list does not parse");
  return words.value();
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  std::string_view text(reinterpret_cast<const char*>(data), size);
  auto as_words = PossessiveWords::parse(text, "word-classes.data");
  FUZZ_CHECK(as_words.ok() || as_words.error().line.has_value() ||
                 as_words.error().reason.rfind("no '", 0) == 0,
             "a word-list error without a line");
  auto model = PossessiveModel::parse(text, fixed_words(), "possessive.model");
  if (!model.ok()) {
    FUZZ_CHECK(model.error().line.has_value(), "a model error without a line");
    return 0;
  }
  static const std::vector<std::vector<std::string_view>> kSentences = {
      {"she", "gave", "her", "book", "to", "his", "friend", "."},
      {"i", "saw", "her", "", "it", "is", "his", "!"},
      {"her", ",", "his", ";", "her", "her", "his", "his"}};
  for (const auto& s : kSentences) check_decisions(*model.value(), s);
  std::vector<std::string_view> words;  // the input's own words, as a sentence
  for (size_t pos = 0; pos < text.size() && words.size() < 64;) {
    size_t end = text.find_first_of(" \t\n", pos);
    if (end == std::string_view::npos) end = text.size();
    if (end > pos) words.push_back(text.substr(pos, end - pos));
    pos = end + 1;
  }
  check_decisions(*model.value(), words);
  return 0;
}
