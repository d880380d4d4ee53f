// UTF-8 helpers, checked against the well-formedness table of the Unicode Standard (source:
// The Unicode Standard 15.0, chapter 3, table 3-7 "Well-Formed UTF-8 Byte Sequences") and
// against ICU's own converter (reference library: Debian libicu72, u_strFromUTF8).
#include <catch2/catch.hpp>

#include <unicode/ustring.h>

#include <random>
#include <string>
#include <vector>

#include "text/utf8.h"

using namespace evenhand::text;

TEST_CASE("valid_utf8 follows table 3-7", "[utf8]") {
  CHECK(valid_utf8(""));
  CHECK(valid_utf8("plain ASCII text, long enough for the 8-byte path"));
  CHECK(valid_utf8("\xc2\x80"));                // U+0080, smallest two-byte
  CHECK(valid_utf8("\xe0\xa0\x80"));            // U+0800
  CHECK(valid_utf8("\xed\x9f\xbf"));            // U+D7FF, last before the surrogates
  CHECK(valid_utf8("\xee\x80\x80"));            // U+E000
  CHECK(valid_utf8("\xf0\x90\x80\x80"));        // U+10000
  CHECK(valid_utf8("\xf4\x8f\xbf\xbf"));        // U+10FFFF
  CHECK_FALSE(valid_utf8("\xc0\xaf"));          // overlong '/'
  CHECK_FALSE(valid_utf8("\xc1\xbf"));          // overlong
  CHECK_FALSE(valid_utf8("\xe0\x9f\xbf"));      // overlong three-byte
  CHECK_FALSE(valid_utf8("\xed\xa0\x80"));      // U+D800 surrogate
  CHECK_FALSE(valid_utf8("\xf0\x8f\xbf\xbf"));  // overlong four-byte
  CHECK_FALSE(valid_utf8("\xf4\x90\x80\x80"));  // above U+10FFFF
  CHECK_FALSE(valid_utf8("\xf5\x80\x80\x80"));
  CHECK_FALSE(valid_utf8("\x80"));          // lone continuation
  CHECK_FALSE(valid_utf8("abc\xe2\x82"));   // truncated at the end
  CHECK_FALSE(valid_utf8("12345678\xff"));  // after the 8-byte path
}

TEST_CASE("valid_utf8 agrees with ICU on random bytes", "[utf8]") {
  std::mt19937 rng(99);  // fixed seed: reproducible
  // Bias towards lead and continuation bytes so that well-formed sequences do occur.
  const std::vector<unsigned char> hot = {'a',  0x80, 0x8f, 0x90, 0x9f, 0xa0, 0xbf,
                                          0xc2, 0xc1, 0xdf, 0xe0, 0xe1, 0xed, 0xef,
                                          0xf0, 0xf3, 0xf4, 0xf5, 0xff};
  std::uniform_int_distribution<int> len(0, 12), pick(0, int(hot.size()) - 1);
  std::u16string u16;
  for (int n = 0; n < 50000; ++n) {
    std::string s;
    int l = len(rng);
    for (int k = 0; k < l; ++k) s.push_back(char(hot[size_t(pick(rng))]));
    UErrorCode st = U_ZERO_ERROR;
    UChar buf[64];
    int32_t out_len = 0;
    u_strFromUTF8(buf, 64, &out_len, s.data(), int32_t(s.size()), &st);
    INFO("bytes: " << s.size());
    REQUIRE(valid_utf8(s) == (U_SUCCESS(st) != 0));
    if (U_SUCCESS(st)) {
      // Our converter gives the same UTF-16 on well-formed input.
      utf8_to_utf16(s, u16, nullptr);
      REQUIRE(u16 == std::u16string(buf, buf + out_len));
    }
  }
}

TEST_CASE("decode and re-encode round trip", "[utf8]") {
  std::string s = "a\u00e9\u20ac\U0001F600z";
  std::vector<char32_t> cps;
  size_t i = 0;
  while (i < s.size()) cps.push_back(decode_utf8(s, i));
  CHECK(cps == std::vector<char32_t>{'a', 0xE9, 0x20AC, 0x1F600, 'z'});
  std::string back;
  for (char32_t c : cps) append_utf8(c, back);
  CHECK(back == s);
  // Backwards.
  std::vector<char32_t> rev;
  size_t j = s.size();
  while (j > 0) rev.push_back(decode_utf8_before(s, j));
  CHECK(rev == std::vector<char32_t>{'z', 0x1F600, 0x20AC, 0xE9, 'a'});
  // Ill-formed bytes decode as U+FFFD one byte at a time, in both directions.
  std::string bad = "\xe2\x82x";
  i = 0;
  CHECK(decode_utf8(bad, i) == 0xFFFD);
  CHECK(i == 1);
  j = 2;
  CHECK(decode_utf8_before(bad, j) == 0xFFFD);
  CHECK(j == 1);
}

TEST_CASE("UTF-16 conversion records byte offsets", "[utf8]") {
  std::string s = "\u00e9a\U0001F600b";  // 2 + 1 + 4 + 1 bytes
  std::u16string u;
  std::vector<uint32_t> at;
  utf8_to_utf16(s, u, &at);
  REQUIRE(u.size() == 5);
  CHECK(at == std::vector<uint32_t>{0, 2, 3, 3, 7, 8});
  std::string back;
  append_utf16_as_utf8(u, back);
  CHECK(back == s);
  back.clear();
  append_utf16_as_utf8(std::u16string(1, char16_t(0xD800)), back);  // lone surrogate
  CHECK(back == "\uFFFD");
}
