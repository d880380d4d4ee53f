// Fuzz target: the tokenizer (text/tokenize.h) and protected spans (text/protect.h). Input:
// any bytes, taken as one text. Checked: tokens tile the text, the fast path equals the
// ICU reference on valid UTF-8, tokenize_without_space is tokenize minus the space tokens;
// protected spans and pack phrases are sorted, apart, inside the text, on character
// boundaries, and merge_spans of their union keeps them so.
#include <memory>
#include <string>
#include <vector>

#include "fuzz_support.h"
#include "pack/pack.h"
#include "text/protect.h"
#include "text/tokenize.h"
#include "text/utf8.h"

using namespace evenhand;
using namespace evenhand::text;

namespace {

struct Fixture {
  Tokenizer tokenizer;
  std::unique_ptr<ProtectedSpans> spans;
  std::unique_ptr<PhraseSpans> phrases;
  Fixture() {
    // A user pattern as the README shows them, plus one that can match empty text.
    auto s = ProtectedSpans::create({"\\b[A-Z]{2,}-[0-9]+\\b", "x*"});
    FUZZ_CHECK(s.ok(), "the protect patterns do not compile");
    spans = std::move(s).value();
    std::vector<pack::Diagnostic> diags;
    auto pack = pack::load_pack("en-gender", diags);
    FUZZ_CHECK(pack.ok(), "the built-in en-gender pack does not load");
    auto p = PhraseSpans::create(pack.value()->protected_phrases());
    FUZZ_CHECK(p.ok(), "the pack's protected phrases do not build");
    phrases = std::move(p).value();
  }
};

void check_tiling(std::string_view text, const std::vector<Token>& toks, const char* what) {
  uint32_t pos = 0;
  for (const Token& t : toks) {
    FUZZ_CHECK(t.begin == pos && t.end > t.begin, std::string(what) + ": tokens do not tile");
    pos = t.end;
  }
  FUZZ_CHECK(pos == text.size(), std::string(what) + ": tokens stop before the end");
}

bool same_tokens(const std::vector<Token>& a, const std::vector<Token>& b) {
  if (a.size() != b.size()) return false;
  for (size_t i = 0; i < a.size(); ++i)
    if (a[i].begin != b[i].begin || a[i].end != b[i].end || a[i].kind != b[i].kind) return false;
  return true;
}

void check_spans(std::string_view text, const std::vector<Span>& spans, const char* what) {
  uint32_t prev_end = 0;
  for (const Span& s : spans) {
    FUZZ_CHECK(s.begin >= prev_end && s.begin < s.end && s.end <= text.size(),
               std::string(what) + ": spans overlap, are empty or leave the text");
    FUZZ_CHECK(fuzz::at_char_boundary(text, s.begin) && fuzz::at_char_boundary(text, s.end),
               std::string(what) + ": a span cuts a character");
    prev_end = s.end;
  }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  static Fixture* f = new Fixture();
  std::string_view text(reinterpret_cast<const char*>(data), size);
  std::vector<Token> fast, icu, nospace;
  f->tokenizer.tokenize(text, fast);
  check_tiling(text, fast, "tokenize");
  f->tokenizer.tokenize_icu(text, icu);
  check_tiling(text, icu, "tokenize_icu");
  f->tokenizer.tokenize_without_space(text, nospace);
  std::vector<Token> expected;
  for (const Token& t : fast)
    if (t.kind != TokenKind::space) expected.push_back(t);
  FUZZ_CHECK(same_tokens(expected, nospace), "tokenize_without_space is not tokenize minus spaces");
  if (!valid_utf8(text)) return 0;  // the fields the engine sees are valid UTF-8
  FUZZ_CHECK(same_tokens(fast, icu), "the fast path and ICU disagree");
  std::vector<Span> spans, phrases;
  f->spans->find(text, spans);
  check_spans(text, spans, "protected spans");
  f->phrases->find(text, phrases);
  check_spans(text, phrases, "pack phrases");
  spans.insert(spans.end(), phrases.begin(), phrases.end());
  merge_spans(spans);
  check_spans(text, spans, "merged spans");
  return 0;
}
