// Fuzz target: person evidence (rewrite/en/person_context.h): the person-context.data reader
// and judge_name. Input: a person-context.data text, then optionally a line "%%" and a text to
// judge (without one, fixed sentences are judged). Checked: parse() returns lexicons or an error
// with a line (without one only for a text that has no record at all); the one-lookup list bits
// agree with has(); judge_name, asked at every word of the text, gives a reason and never reads
// a name as a person and a surname or place at once.
#include <string>
#include <vector>

#include "fuzz_support.h"
#include "pack/pack.h"
#include "rewrite/en/person_context.h"
#include "rewrite/en/verb_agreement.h"
#include "text/tokenize.h"

using namespace evenhand;
using namespace evenhand::rewrite;
using en::Lexicon;

namespace {

// A few verb records, so that the verb rules run too.
const VerbTable& verbs() {
  static const std::shared_ptr<const VerbTable> table = [] {
    auto t = VerbTable::parse(
        "format evenhand-verbs 1\nv say says said saying\nv pilot pilots piloted piloting\n"
        "v use uses used using\n");
    FUZZ_CHECK(t.ok(), "the fixed verb table does not parse");
    return *t;
  }();
  return *table;
}

void check_bits(const en::PersonContext& lex, std::string_view folded) {
  uint32_t bits = lex.lists_of(folded);
  for (size_t l = 0; l < static_cast<size_t>(Lexicon::count); ++l) {
    FUZZ_CHECK(((bits >> l) & 1u) == (lex.has(static_cast<Lexicon>(l), folded) ? 1u : 0u),
               "list bits and has() disagree on '" + std::string(folded) + "'");
  }
}

void judge_every_word(const en::PersonContext& lex, std::string_view text, bool with_verbs) {
  static text::Tokenizer tokenizer;
  std::vector<text::Token> toks;
  tokenizer.tokenize_without_space(text, toks);
  if (toks.size() > 400) toks.resize(400);  // bounded work per input
  std::vector<std::string> folded;
  folded.reserve(toks.size());
  for (const auto& t : toks)
    folded.push_back(pack::fold_word(text.substr(t.begin, t.end - t.begin)));
  std::vector<FieldToken> ft;
  for (size_t i = 0; i < toks.size(); ++i)
    ft.push_back({toks[i].begin, toks[i].end, folded[i], toks[i].kind == text::TokenKind::word});
  en::NameSite site;
  site.tokens = ft;
  site.text = text;
  site.is_name = [&lex](std::string_view w) {
    return lex.has(Lexicon::word_name, w) || lex.has(Lexicon::thing_name, w) ||
           lex.has(Lexicon::mixed_name, w) || w == "grace" || w == "mark" || w == "tony";
  };
  site.is_person_word = [](std::string_view w) { return w == "brother" || w == "wife"; };
  site.verbs = with_verbs ? &verbs() : nullptr;
  for (size_t i = 0; i < ft.size(); ++i) {
    if (!ft[i].word) continue;
    check_bits(lex, ft[i].folded);
    site.at = i;
    site.word_like = lex.has(Lexicon::word_name, ft[i].folded);
    en::NameVerdict v = en::judge_name(lex, site);
    FUZZ_CHECK(v.why != nullptr && v.why[0] != '\0', "a verdict without a reason");
    FUZZ_CHECK(!(v.person && (v.surname || v.place)), "a person that is a surname or place");
  }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  std::string_view input(reinterpret_cast<const char*>(data), size);
  std::string_view lexicons = input, text;
  if (size_t cut = input.find("\n%%\n"); cut != std::string_view::npos) {
    lexicons = input.substr(0, cut + 1);
    text = input.substr(cut + 4);
  }
  auto parsed = en::PersonContext::parse(lexicons, "fuzz.data");
  if (!parsed.ok()) {
    FUZZ_CHECK(parsed.error().line.has_value() || !fuzz::has_record(lexicons),
               "a person-context.data error without a line");
    return 0;
  }
  const en::PersonContext& lex = **parsed;
  const bool with_verbs = size % 2 == 0;
  if (!text.empty()) {
    judge_every_word(lex, text, with_verbs);
  } else {
    // Invented sentences that reach the judge's rules (fuzz input; no result is checked).
    static const char* const kTexts[] = {"Grace said so.",
                                         "-- Woody Allen",
                                         "Dear Tony,\nWill you come?",
                                         "Hope Street, in Dallas",
                                         "> Mark pilots; Mac users (a group) and Grace Smith & Co",
                                         "<grace> Tony: \"Mark\", _Rose_"};
    for (const char* t : kTexts) judge_every_word(lex, t, with_verbs);
  }
  return 0;
}
