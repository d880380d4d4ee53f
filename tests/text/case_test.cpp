// Case folding, case patterns and re-casing replacements. Expected values cite the Unicode
// Character Database files they come from; the ASCII fast paths are checked against ICU.
#include <catch2/catch.hpp>

#include <cstdlib>
#include <fstream>
#include <random>
#include <sstream>
#include <string>

#include "text/case.h"
#include "text/utf8.h"

using evenhand::text::apply_case;
using evenhand::text::apply_case_icu;
using evenhand::text::case_pattern;
using evenhand::text::CasePattern;
using evenhand::text::fold_case;
using evenhand::text::fold_case_icu;
using evenhand::text::match_case;

namespace {

std::string fold(std::string_view s) {
  std::string out;
  fold_case(s, out);
  return out;
}

std::string recase(std::string_view s, CasePattern p) {
  std::string out;
  apply_case(s, p, out);
  return out;
}

std::string like(std::string_view s, std::string_view original) {
  std::string out;
  match_case(s, original, out);
  return out;
}

}  // namespace

TEST_CASE("case patterns of English pronouns", "[case]") {
  CHECK(case_pattern("she") == CasePattern::lower);
  CHECK(case_pattern("She") == CasePattern::title);
  CHECK(case_pattern("SHE") == CasePattern::upper);
  CHECK(case_pattern("sHe") == CasePattern::mixed);
  // A single capital letter is title case, so "I" at sentence start re-cases as "He".
  CHECK(case_pattern("I") == CasePattern::title);
  CHECK(case_pattern("McDonald") == CasePattern::mixed);
  CHECK(case_pattern("eBay") == CasePattern::mixed);
  // Only cased letters count: digits and apostrophes are ignored.
  CHECK(case_pattern("She's") == CasePattern::title);
  CHECK(case_pattern("SHE'S") == CasePattern::upper);
  CHECK(case_pattern("'em") == CasePattern::lower);
  CHECK(case_pattern("42") == CasePattern::lower);
  CHECK(case_pattern("") == CasePattern::lower);
}

TEST_CASE("case patterns of non-ASCII words", "[case]") {
  // Letter case from UnicodeData.txt (source: Unicode Character Database 15.0).
  CHECK(case_pattern("\u00c9lise") == CasePattern::title);                      // Élise
  CHECK(case_pattern("\u00c9COLE") == CasePattern::upper);                      // ÉCOLE
  CHECK(case_pattern("ni\u00f1a") == CasePattern::lower);                       // niña
  CHECK(case_pattern("\u03a3\u03bf\u03c6\u03af\u03b1") == CasePattern::title);  // Σοφία
  CHECK(case_pattern("\u01c5ur") == CasePattern::title);  // ǅ is a titlecase letter
  CHECK(case_pattern("\u00e9COLE") == CasePattern::mixed);
}

TEST_CASE("fold_case: ASCII and Unicode full folding", "[case]") {
  // Mappings from CaseFolding.txt (source: Unicode Character Database 15.0), status C/F.
  CHECK(fold("SHE she She sHe") == "she she she she");
  CHECK(fold("\u00c9LISE") == "\u00e9lise");  // 00C9; C; 00E9
  CHECK(fold("NI\u00d1A") == "ni\u00f1a");    // 00D1; C; 00F1
  CHECK(fold("Stra\u00dfe") == "strasse");    // 00DF; F; 0073 0073
  // Final sigma folds like any sigma: 03A3; C; 03C3 and 03C2; C; 03C3.
  CHECK(fold("\u039f\u0394\u03a5\u03a3\u03a3\u0395\u03a5\u03a3") ==
        "\u03bf\u03b4\u03c5\u03c3\u03c3\u03b5\u03c5\u03c3");
  CHECK(fold("\u03bf\u03b4\u03c5\u03c3\u03c3\u03b5\u03cd\u03c2") ==
        "\u03bf\u03b4\u03c5\u03c3\u03c3\u03b5\u03cd\u03c3");
  // Dotted and dotless I are left to the root locale (no Turkic 'T' mappings): "I" folds
  // to "i", and U+0130 folds to "i" + U+0307 (0130; F; 0069 0307).
  CHECK(fold("I") == "i");
  CHECK(fold("\u0130") == "i\u0307");
  CHECK(fold("\u0131") == "\u0131");  // dotless i has no folding in CaseFolding.txt
  // Appends, does not replace.
  std::string out = "x:";
  fold_case("AB", out);
  CHECK(out == "x:ab");
}

TEST_CASE("apply_case carries the original's pattern to the replacement", "[case]") {
  CHECK(recase("he", CasePattern::lower) == "he");
  CHECK(recase("he", CasePattern::title) == "He");
  CHECK(recase("he", CasePattern::upper) == "HE");
  CHECK(recase("he", CasePattern::mixed) == "he");
  CHECK(recase("McKay", CasePattern::title) == "McKay");  // the rest stays as written
  CHECK(recase("McKay", CasePattern::upper) == "MCKAY");
  CHECK(recase("him or her", CasePattern::title) == "Him or her");  // first letter only
  // ICU's titlecase adjustment goes to the first letter or digit ("49ers" stays, per the
  // ICU 60 documentation of U_TITLECASE_ADJUST_TO_CASED).
  CHECK(recase("'em", CasePattern::title) == "'Em");
  CHECK(recase("49ers", CasePattern::title) == "49ers");
  // Full mappings from SpecialCasing.txt (source: Unicode Character Database 15.0):
  // 00DF upper = 0053 0053, title = 0053 0073.
  CHECK(recase("stra\u00dfe", CasePattern::upper) == "STRASSE");
  CHECK(recase("\u00dfa", CasePattern::title) == "Ssa");
  // UnicodeData.txt: 01C6 titlecase = 01C5, uppercase = 01C4.
  CHECK(recase("\u01c6ur", CasePattern::title) == "\u01c5ur");
  CHECK(recase("\u00e9lise", CasePattern::title) == "\u00c9lise");
  CHECK(recase("\u00e9lise", CasePattern::upper) == "\u00c9LISE");
  // Upper-casing Greek drops nothing and maps final sigma to capital sigma (03C2 -> 03A3).
  CHECK(recase("\u03bf\u03b4\u03cc\u03c2", CasePattern::upper) == "\u039f\u0394\u038c\u03a3");
}

TEST_CASE("match_case handles mixed originals", "[case]") {
  CHECK(like("her", "McDonald") == "Her");  // mixed, first cased letter upper
  CHECK(like("her", "eBay") == "her");
  CHECK(like("he", "SHE") == "HE");
  CHECK(like("he", "I") == "He");
  CHECK(like("he", "she") == "he");
}

TEST_CASE("ASCII fast paths equal ICU on random ASCII strings", "[case]") {
  std::mt19937 rng(1234);  // fixed seed: reproducible
  std::uniform_int_distribution<int> len(0, 12), byte(0, 127);
  for (int n = 0; n < 20000; ++n) {
    std::string s;
    int l = len(rng);
    for (int k = 0; k < l; ++k) s.push_back(char(byte(rng)));
    INFO("input: \"" << s << "\"");
    std::string a, b;
    fold_case(s, a);
    fold_case_icu(s, b);
    REQUIRE(a == b);
    for (CasePattern p :
         {CasePattern::lower, CasePattern::title, CasePattern::upper, CasePattern::mixed}) {
      a.clear();
      b.clear();
      apply_case(s, p, a);
      apply_case_icu(s, p, b);
      REQUIRE(a == b);
    }
  }
}

// External check: every C and F line of CaseFolding.txt (source: Unicode Character Database
// CaseFolding.txt, Debian package unicode-data, /usr/share/unicode/CaseFolding.txt;
// EVENHAND_CASEFOLDING_TXT overrides the path): our fold of the single character equals
// the listed mapping. S and T lines are not part of default full folding.
TEST_CASE("fold_case matches Unicode CaseFolding.txt", "[case][external]") {
  const char* env = std::getenv("EVENHAND_CASEFOLDING_TXT");
  std::string path = env && *env ? env : "/usr/share/unicode/CaseFolding.txt";
  std::ifstream in(path);
  if (!in) FAIL("cannot open " << path << ": install the Debian package unicode-data");
  std::string line;
  size_t checked = 0;
  while (std::getline(in, line)) {
    line = line.substr(0, line.find('#'));
    std::istringstream ss(line);
    std::string code, status, mapping;
    if (!std::getline(ss, code, ';') || !std::getline(ss, status, ';') ||
        !std::getline(ss, mapping, ';'))
      continue;
    status.erase(0, status.find_first_not_of(' '));
    if (status != "C" && status != "F") continue;
    std::string from, to;
    evenhand::text::append_utf8(char32_t(std::stoul(code, nullptr, 16)), from);
    std::istringstream ms(mapping);
    std::string cp;
    while (ms >> cp) evenhand::text::append_utf8(char32_t(std::stoul(cp, nullptr, 16)), to);
    INFO("CaseFolding.txt line: " << line);
    CHECK(fold(from) == to);
    ++checked;
  }
  CHECK(checked > 1400);  // CaseFolding 15.0 has about 1,500 C and F lines
}

TEST_CASE("ascii_lower8 lowers A-Z in every byte position and nothing else", "[case]") {
  // Reference: the ASCII table (common practice: 'A'..'Z' are 0x41..0x5A, lower case is
  // +0x20), one byte at a time. Every byte value in every position, amid random neighbours.
  std::mt19937_64 rng(42);
  for (int pos = 0; pos < 8; ++pos) {
    for (int b = 0; b < 256; ++b) {
      uint64_t v = rng();
      v = (v & ~(uint64_t{0xff} << (8 * pos))) | (uint64_t(b) << (8 * pos));
      uint64_t want = 0;
      for (int k = 0; k < 8; ++k) {
        uint64_t c = (v >> (8 * k)) & 0xff;
        if (c >= 'A' && c <= 'Z') c += 0x20;
        want |= c << (8 * k);
      }
      INFO("byte " << b << " at position " << pos);
      REQUIRE(evenhand::text::ascii_lower8(v) == want);
    }
  }
}
