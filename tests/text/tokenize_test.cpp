// Tokenizer: UAX #29 word segments with byte offsets; the ASCII fast path must give exactly
// ICU's answer (boundaries and kinds), and tokens must tile the text.
#include <catch2/catch.hpp>

#include <random>
#include <string>
#include <utility>
#include <vector>

#include "text/tokenize.h"

using evenhand::text::Token;
using evenhand::text::Tokenizer;
using evenhand::text::TokenKind;

namespace {

char kind_letter(TokenKind k) {
  switch (k) {
    case TokenKind::word:
      return 'w';
    case TokenKind::number:
      return 'n';
    case TokenKind::space:
      return 's';
    case TokenKind::punct:
      return 'p';
  }
  return '?';
}

// "text|kind" per token, for readable comparisons.
std::vector<std::string> render(std::string_view text, const std::vector<Token>& toks) {
  std::vector<std::string> out;
  for (const Token& t : toks)
    out.push_back(std::string(text.substr(t.begin, t.end - t.begin)) + "|" + kind_letter(t.kind));
  return out;
}

std::vector<std::string> seg(std::string_view text) {
  Tokenizer tk;
  std::vector<Token> toks;
  tk.tokenize(text, toks);
  return render(text, toks);
}

std::vector<std::string> seg_icu(std::string_view text) {
  Tokenizer tk;
  std::vector<Token> toks;
  tk.tokenize_icu(text, toks);
  return render(text, toks);
}

bool tiles(std::string_view text, const std::vector<Token>& toks) {
  uint32_t at = 0;
  for (const Token& t : toks) {
    if (t.begin != at || t.end <= t.begin) return false;
    at = t.end;
  }
  return at == text.size();
}

using V = std::vector<std::string>;

}  // namespace

// Expected segmentations follow the UAX #29 word boundary rules (source: Unicode Standard
// Annex #29, Unicode Text Segmentation, revision 41 for Unicode 15.0, 2022), rule by rule.
TEST_CASE("possessives and hyphens segment per UAX #29", "[tokenize]") {
  // WB6/WB7: an apostrophe (Single_Quote) between letters does not break.
  CHECK(seg("mother's") == V{"mother's|w"});
  // U+2019 RIGHT SINGLE QUOTATION MARK is MidNumLet, so WB6/WB7 join it too.
  CHECK(seg("mother\u2019s") == V{"mother\u2019s|w"});
  // No letter after the apostrophe: WB999 breaks before it.
  CHECK(seg("grandmothers'") == V{"grandmothers|w", "'|p"});
  // U+002D HYPHEN-MINUS is Other: breaks on both sides.
  CHECK(seg("step-mother") == V{"step|w", "-|p", "mother|w"});
  CHECK(seg("her mother's hat") == V{"her|w", " |s", "mother's|w", " |s", "hat|w"});
}

TEST_CASE("numbers, spaces and punctuation", "[tokenize]") {
  // WB11/WB12: MidNum and MidNumLet between digits; WB8 digits together.
  CHECK(seg("3.14 1,000") == V{"3.14|n", " |s", "1,000|n"});
  // WB3d keeps horizontal spaces together; WB3 CR x LF; WB3a/b break around newlines.
  CHECK(seg("a  b\r\nc") == V{"a|w", "  |s", "b|w", "\r\n|s", "c|w"});
  // Tab is Word_Break=Other: each tab is its own segment, still white space.
  CHECK(seg("\t\t") == V{"\t|s", "\t|s"});
  // WB6 needs a letter after the period: "end." breaks, "e.g" does not.
  CHECK(seg("end.") == V{"end|w", ".|p"});
  CHECK(seg("e.g") == V{"e.g|w"});
  CHECK(seg("\"Hi!\"") == V{"\"|p", "Hi|w", "!|p", "\"|p"});
  CHECK(seg("").empty());
}

TEST_CASE("non-ASCII text goes through ICU with byte offsets", "[tokenize]") {
  // U+00E9 is ALetter; U+0301 COMBINING ACUTE is Extend and stays with its base (WB4).
  CHECK(seg("caf\u00e9 cafe\u0301") == V{"caf\u00e9|w", " |s", "cafe\u0301|w"});
  // U+00A0 NO-BREAK SPACE is White_Space (but Word_Break Other).
  CHECK(seg("a\u00a0b") == V{"a|w", "\u00a0|s", "b|w"});
  // U+2014 EM DASH is punctuation.
  CHECK(seg("yes\u2014no") == V{"yes|w", "\u2014|p", "no|w"});
  // WB15/WB16: regional indicators pair up (flag), WB3c: ZWJ x Extended_Pictographic.
  CHECK(seg("\U0001F1EB\U0001F1F7\U0001F1E9") == V{"\U0001F1EB\U0001F1F7|p", "\U0001F1E9|p"});
}

TEST_CASE("ASCII fast path equals ICU on the examples", "[tokenize]") {
  for (const char* s : {"mother's", "grandmothers'", "step-mother", "e.g. 3.14, a_b __ _ x",
                        "a:b 1:2 a@b @bob x@y.com", "it's 5 o'clock; 1;2 a;b", "x__y_1 1_a a1 1a",
                        "  \t\r\n\v\f\r\r\n\n", "a.b.c 1.2.3 a..b 1..2 a'1 1'2 a.1 1.a"}) {
    INFO(s);
    CHECK(seg(s) == seg_icu(s));
  }
}

TEST_CASE("ASCII fast path equals ICU on random ASCII strings", "[tokenize]") {
  // Alphabet weighted towards the characters the word rules care about.
  const std::string hot = "aZq09_.',;:@ \t\r\n\v\f-\"!?()#$";
  std::mt19937 rng(20240611);  // fixed seed: reproducible
  std::uniform_int_distribution<int> len(0, 24), pick(0, int(hot.size()) - 1), any(0, 127),
      coin(0, 9);
  Tokenizer fast, ref;
  std::vector<Token> a, b;
  for (int n = 0; n < 20000; ++n) {
    std::string s;
    int l = len(rng);
    for (int k = 0; k < l; ++k)
      s.push_back(coin(rng) == 0 ? char(any(rng)) : hot[size_t(pick(rng))]);
    fast.tokenize(s, a);
    ref.tokenize_icu(s, b);
    INFO("input: \"" << s << "\"");
    REQUIRE(tiles(s, a));
    REQUIRE(render(s, a) == render(s, b));
  }
}

// A random string of 0 to 16 pieces drawn from `pieces`.
static std::string random_pieces(const std::vector<std::string>& pieces, std::mt19937& rng) {
  std::uniform_int_distribution<int> len(0, 16), pick(0, int(pieces.size()) - 1);
  std::string s;
  for (int k = len(rng); k > 0; --k) s += pieces[size_t(pick(rng))];
  return s;
}

TEST_CASE("mixed ASCII and non-ASCII: chunked path equals ICU on random strings", "[tokenize]") {
  // Pieces that exercise the chunk edges: marks (Extend), ZWJ, soft hyphen (Format),
  // regional indicators, ideographs (dictionary segmentation), Hebrew, Thai, wide spaces.
  const std::vector<std::string> pieces = {
      "a", "Z", "7", "_", ".", "'", ",", ":", "@", " ", " ", "\t", "\n", "\r", "-", "\u00e9",
      "\u2019", "\u0301", "\u200d", "\u00ad", "\u00a0", "\u3000", "\u2003", "\u65e5\u672c",
      "\u05d0", "\u05f3", "\u0e01", "\u30ab", "\U0001F1EB", "\U0001F44D", "\u0661", "\uff0e",
      // Prose punctuation that the fast path takes itself when ASCII follows.
      "\u201c", "\u201d", "\u2013", "\u2014", "\u2026", "\u2018"};
  std::mt19937 rng(7);
  Tokenizer fast, ref;
  std::vector<Token> a, b;
  for (int n = 0; n < 20000; ++n) {
    std::string s = random_pieces(pieces, rng);
    fast.tokenize(s, a);
    ref.tokenize_icu(s, b);
    INFO("input: \"" << s << "\"");
    REQUIRE(tiles(s, a));
    REQUIRE(render(s, a) == render(s, b));
  }
}

TEST_CASE("prose punctuation outside ICU agrees with ICU", "[tokenize]") {
  // The fast path takes U+2013 U+2014 U+201C U+201D U+2026 itself when ASCII follows; the
  // reference is ICU's word break iterator on the whole string (tokenize_icu).
  for (const char* s :
       {"\u201cHer mother\u2019s\u2014no.\u201d", "a\u2013b 1\u20132 \u2026and so\u2026",
        "\u201c\u201d\u201c", "x\u2014\u00e9t\u00e9", "\u201d\u0301a", "\u2014\u200d\U0001F44D",
        "it\u2019s\u2026 \u201c'quoted'\u201d", "end\u2014"}) {
    INFO(s);
    CHECK(seg(s) == seg_icu(s));
  }
}

TEST_CASE("tokenize_without_space gives tokenize's tokens minus the space ones", "[tokenize]") {
  // Random mixed strings as above (ASCII, non-ASCII through ICU, and the fast-path punctuation).
  const std::vector<std::string> pieces = {
      "a",      "Z",      "7",      ".",      "'",      " ",      "  ",     "\t",     "\r\n",
      "\u00a0", "\u3000", "\u2003", "\u00e9", "\u2019", "\u201c", "\u2014", "\u0301", "-"};
  std::mt19937 rng(11);
  Tokenizer tk;
  std::vector<Token> all, some;
  for (int n = 0; n < 5000; ++n) {
    std::string s = random_pieces(pieces, rng);
    tk.tokenize(s, all);
    tk.tokenize_without_space(s, some);
    std::vector<Token> want;
    for (const Token& t : all)
      if (t.kind != TokenKind::space) want.push_back(t);
    INFO("input: \"" << s << "\"");
    REQUIRE(render(s, some) == render(s, want));
  }
}

TEST_CASE("tokens tile ill-formed UTF-8 too", "[tokenize]") {
  Tokenizer tk;
  std::vector<Token> toks;
  for (std::string s :
       {std::string("ab\xff"
                    "cd"),
        std::string("\xc3"), std::string("x \xe2\x80 y"), std::string("\xed\xa0\x80z")}) {
    tk.tokenize(s, toks);
    CHECK(tiles(s, toks));
  }
}

TEST_CASE("a tokenizer is reusable across texts", "[tokenize]") {
  Tokenizer tk;
  std::vector<Token> toks;
  tk.tokenize("caf\u00e9 au lait", toks);
  CHECK(toks.size() == 5);
  tk.tokenize("hi", toks);
  REQUIRE(toks.size() == 1);
  CHECK(toks[0].end == 2);
  CHECK(toks[0].kind == TokenKind::word);
}
