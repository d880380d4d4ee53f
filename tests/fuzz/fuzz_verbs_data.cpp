// Fuzz target: the verb table file (rewrite/en/verb_agreement.h, rules/en-gender/verbs.data).
// Input: a verbs.data text. Checked: parse() returns a table or an error with a line (without
// one only for a text that has no record at all); a parsed table answers for fixed tokens and
// for every word of the input (folded): a plural answer has a form, an unchanged one keeps the
// token, an unknown one says why.
#include <string>
#include <vector>

#include "fuzz_support.h"
#include "pack/pack.h"
#include "rewrite/en/verb_agreement.h"

using namespace evenhand;
using namespace evenhand::rewrite;

namespace {

void check_token(const VerbTable& t, std::string_view token) {
  VerbTable::Answer a = t.pluralize(token);
  if (a.kind == VerbTable::Answer::plural) FUZZ_CHECK(!a.form.empty(), "a plural without a form");
  if (a.kind == VerbTable::Answer::unchanged) FUZZ_CHECK(a.form == token, "unchanged changed it");
  if (a.kind == VerbTable::Answer::unknown) FUZZ_CHECK(!a.reason.empty(), "unknown without why");
  (void)t.is_past_participle(token);
  (void)t.is_present_participle(token);
  (void)t.is_base_form(token);
  (void)t.is_third_singular(token);
  (void)t.is_preverbal_adverb(token);
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  std::string_view text(reinterpret_cast<const char*>(data), size);
  auto table = VerbTable::parse(text);
  if (!table.ok()) {
    // A bad record names its line; only a text without any record is about the whole file.
    FUZZ_CHECK(table.error().line.has_value() || !fuzz::has_record(text),
               "a verbs.data error without a line");
    return 0;
  }
  const VerbTable& t = *table.value();
  static const std::vector<std::string_view> kTokens = {
      "is",   "was", "goes",        "has",  "can",     "won't", "doesn't", "isn\xE2\x80\x99t",
      "s",    "",    "watches",     "axes", "summons", "went",  "going",   "been",
      "lead", "'s",  "\xE2\x80\x99"};
  for (std::string_view tok : kTokens) check_token(t, tok);
  std::vector<std::string> folded;  // the input's words, folded as callers fold them
  for (size_t pos = 0; pos < text.size() && folded.size() < 64;) {
    size_t end = text.find_first_of(" \t\n", pos);
    if (end == std::string_view::npos) end = text.size();
    if (end > pos) folded.push_back(pack::fold_word(text.substr(pos, end - pos)));
    pos = end + 1;
  }
  std::vector<std::string_view> words(folded.begin(), folded.end());
  for (std::string_view w : words) check_token(t, w);
  for (size_t i = 0; i <= words.size(); ++i) {
    std::span<const std::string_view> rest(words.data() + i, words.size() - i);
    VerbTable::Contraction c = t.resolve_s(rest);
    FUZZ_CHECK(c.kind == VerbTable::Contraction::unknown || c.lean == c.kind,
               "a settled contraction leans the other way");
  }
  return 0;
}
