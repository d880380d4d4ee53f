// The word lists of the her/his model (rewrite/en/possessive_words.h, word-classes.data): the
// shipped file gives each word the category the model was trained with, and a malformed file
// is an error naming the file and the line.
#include <catch2/catch.hpp>

#include <cstdlib>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "rewrite/en/possessive_words.h"

namespace {

using evenhand::ErrorKind;
using evenhand::rewrite::PossessiveWords;
using Set = PossessiveWords::Set;

std::string shipped_text() {
  const char* s = std::getenv("EVENHAND_SOURCE_DIR");
  std::string path = std::string(s && *s ? s : ".") + "/rules/en-gender/word-classes.data";
  std::ifstream in(path, std::ios::binary);
  if (!in) FAIL("cannot read " + path);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

// One word of every kind: the smallest file the loader accepts.
const std::string kSmall =
    "# a comment\n"
    "format evenhand-word-classes 1\n"
    "determiner the\npreposition of\nconjunction and\nsubordinator if\nsubject-pronoun she\n"
    "object-pronoun him\npossessive his\nstandalone-possessive hers\nauxiliary is\n"
    "negation n't\nobject-verb gave\ninfinitive-to to\nher her\nfinite-verb is\n"
    "object-participle-verb got\nday-adverb today\nadjective-preposition inside\n"
    "adverb-noun back\nafter-possessive every\n";

}  // namespace

// source: common practice (closed-class words of English), as the shipped file lists them.
TEST_CASE("possessive words: the shipped file gives the categories and sets", "[possessive]") {
  auto words = PossessiveWords::parse(shipped_text(), "word-classes.data");
  REQUIRE(words.ok());
  const PossessiveWords& w = *words.value();
  CHECK(w.category("the") == "det");
  CHECK(w.category("of") == "prep");
  CHECK(w.category("and") == "conj");
  CHECK(w.category("whom") == "sub");
  CHECK(w.category("they") == "subj");
  CHECK(w.category("them") == "obj");
  CHECK(w.category("its") == "poss");
  CHECK(w.category("theirs") == "stand");
  CHECK(w.category("'ll") == "aux");
  CHECK(w.category("n't") == "neg");
  CHECK(w.category("gave") == "vobj");
  CHECK(w.category("to") == "to");
  CHECK(w.category("her") == "her");
  CHECK(w.category("lamp") == "w");
  CHECK(w.category("The") == "w");  // callers fold first
  CHECK(w.has(Set::finite_verb, "wasn't"));
  CHECK_FALSE(w.has(Set::finite_verb, "will"));  // a noun too ("her will")
  CHECK(w.has(Set::object_participle_verb, "got"));
  CHECK(w.has(Set::day_adverb, "tomorrow"));
  CHECK(w.has(Set::adjective_preposition, "near"));
  CHECK(w.has(Set::adverb_noun, "back"));
  CHECK(w.has(Set::after_possessive, "every"));
  CHECK_FALSE(w.has(Set::day_adverb, "the"));
}

TEST_CASE("possessive words: the smallest file, comments and CR LF", "[possessive]") {
  std::string crlf;
  for (char c : kSmall) crlf += c == '\n' ? std::string("\r\n") : std::string(1, c);
  for (const std::string& text : {kSmall, crlf}) {
    auto words = PossessiveWords::parse(text, "small.data");
    REQUIRE(words.ok());
    CHECK(words.value()->category("n't") == "neg");
    CHECK(words.value()->category("is") == "aux");
    CHECK(words.value()->has(Set::finite_verb, "is"));  // a set and a category at once
  }
}

TEST_CASE("possessive words: a malformed line is an error naming file and line", "[possessive]") {
  struct Case {
    std::string add;  // appended to kSmall (lines 1..21), so the bad line is 22
    std::string says;
  };
  const std::vector<Case> cases = {
      {"article the\n", "unknown kind 'article'"},
      {"determiner\n", "a record is: KIND WORD"},
      {"determiner the a\n", "a record is: KIND WORD"},
      {"determiner  a\n", "a record is: KIND WORD"},
      {"determiner The\n", "'The' is not a lower-case word"},
      {"determiner caf\xc3\xa9\n", "is not a lower-case word"},
      {"determiner the\n", "'the' is listed twice as determiner"},
      {"preposition the\n", "'the' already has a closed class (det)"},
      {"day-adverb today\n", "'today' is listed twice as day-adverb"},
  };
  for (const Case& c : cases) {
    INFO(c.add);
    auto r = PossessiveWords::parse(kSmall + c.add, "rules/word-classes.data");
    REQUIRE_FALSE(r.ok());
    CHECK(r.error().kind == ErrorKind::pack);
    CHECK(r.error().file == "rules/word-classes.data");
    CHECK(r.error().line == 22u);
    CHECK(r.error().reason.find(c.says) != std::string::npos);
    CHECK(r.error().message().find("rules/word-classes.data:22: ") == 0);
  }
}

TEST_CASE("possessive words: a wrong format line or a missing kind is an error", "[possessive]") {
  auto r = PossessiveWords::parse("format evenhand-word-classes 2\ndeterminer the\n", "w.data");
  REQUIRE_FALSE(r.ok());
  CHECK(r.error().line == 1u);
  CHECK(r.error().reason.find("the first record must be") != std::string::npos);

  r = PossessiveWords::parse("", "w.data");
  REQUIRE_FALSE(r.ok());
  CHECK_FALSE(r.error().line.has_value());

  // Every kind must list a word: without "back" the model would read "her back" otherwise.
  std::string text = kSmall;
  text.erase(text.find("adverb-noun back\n"), 17);
  r = PossessiveWords::parse(text, "w.data");
  REQUIRE_FALSE(r.ok());
  CHECK_FALSE(r.error().line.has_value());
  CHECK(r.error().reason == "no 'adverb-noun' word");
}
