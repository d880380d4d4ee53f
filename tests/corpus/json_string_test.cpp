// JSON string escaping and unescaping checked against RFC 8259 section 7 and three outside
// decoders: simdjson, Python's json module and jq.
#include <catch2/catch.hpp>

#include <string>
#include <vector>

#include "corpus/json_string.h"
#include "corpus/json_test_support.h"

using namespace evenhand::corpus;

namespace {

std::string escaped(std::string_view s) {
  std::string out;
  append_json_escaped(s, out);
  return out;
}

std::string unescaped(std::string_view raw) {
  std::string out;
  REQUIRE(unescape_json_string(raw, out, nullptr));
  return out;
}

// Texts covering RFC 8259 section 7: every control character, quote, backslash, solidus,
// characters outside the BMP and raw multi-byte UTF-8.
std::vector<std::string> escape_corpus() {
  std::vector<std::string> texts;
  std::string all_controls;
  for (int c = 0; c < 0x20; ++c) {
    texts.push_back(std::string(1, static_cast<char>(c)));
    texts.push_back("a" + std::string(1, static_cast<char>(c)) + "b");
    all_controls.push_back(static_cast<char>(c));
  }
  texts.push_back(all_controls);
  texts.push_back("");
  texts.push_back("\"");
  texts.push_back("\\");
  texts.push_back("/");
  texts.push_back("\\\"\\\"/\\/");
  texts.push_back("He said \"hi\"\nthen left\t(at 5/6 \\ 7)");
  texts.push_back("\x7f delete is not a control character in JSON");
  texts.push_back("caf\xc3\xa9 na\xc3\xafve \xd0\x96");  // U+00E9 U+00EF U+0416
  texts.push_back(
      "\xe2\x82\xac \xe6\x97\xa5\xe6\x9c\xac \xef\xbf\xbd");  // U+20AC U+65E5 U+672C U+FFFD
  texts.push_back("\xf0\x9f\x98\x80");                        // U+1F600
  texts.push_back("\xf0\x9d\x84\x9e clef");                   // U+1D11E
  texts.push_back("\xf4\x8f\xbf\xbf");                        // U+10FFFF, the last code point
  texts.push_back(std::string("nul\0inside", 10));
  texts.push_back("\xe2\x80\xa8 line separator \xe2\x80\xa9");  // U+2028 U+2029 stay raw
  return texts;
}

std::string as_json_array(const std::vector<std::string>& texts) {
  std::string json = "[";
  for (size_t i = 0; i < texts.size(); ++i) {
    if (i) json += ",";
    json += "\"" + escaped(texts[i]) + "\"";
  }
  return json + "]";
}

}  // namespace

// source: RFC 8259 section 7 (characters that must be escaped, the two-character escapes)
TEST_CASE("append_json_escaped writes the RFC 8259 escapes", "[corpus][string]") {
  CHECK(escaped("\"") == "\\\"");
  CHECK(escaped("\\") == "\\\\");
  CHECK(escaped("\b\f\n\r\t") == "\\b\\f\\n\\r\\t");
  CHECK(escaped(std::string(1, '\0')) == "\\u0000");
  CHECK(escaped("\x01\x1f") == "\\u0001\\u001f");
  CHECK(escaped("/") == "/");  // the solidus may be escaped but need not be
  CHECK(escaped("\x7f") == "\x7f");
  CHECK(escaped("caf\xc3\xa9 \xf0\x9f\x98\x80") == "caf\xc3\xa9 \xf0\x9f\x98\x80");
  std::string out = "prefix:";
  append_json_escaped("a\"b", out);
  CHECK(out == "prefix:a\\\"b");  // appends
}

TEST_CASE("escaped text decodes back to itself in simdjson, Python and jq",
          "[corpus][string][external]") {
  const std::vector<std::string> texts = escape_corpus();
  const std::string json = as_json_array(texts);
  // The escaped form never holds a raw control character (RFC 8259 section 7).
  for (unsigned char c : json) CHECK(c >= 0x20);

  // source: simdjson 3.0.1 DOM parser (Debian package libsimdjson-dev)
  auto by_simdjson = testing::decode_with_simdjson(json);
  REQUIRE(by_simdjson.has_value());
  CHECK(*by_simdjson == texts);

  // source: Python 3.11 json module (Debian package python3.11), json.loads
  auto by_python = testing::decode_with_python(json);
  REQUIRE(by_python.has_value());
  CHECK(*by_python == texts);

  // source: jq 1.6 (Debian package jq)
  auto by_jq = testing::decode_with_jq(json);
  REQUIRE(by_jq.has_value());
  CHECK(*by_jq == texts);

  // and our own decoder inverts our encoder
  for (const std::string& t : texts) CHECK(unescaped(escaped(t)) == t);
}

TEST_CASE("unescape_json_string agrees with simdjson, Python and jq on escape sequences",
          "[corpus][string][external]") {
  // Insides of JSON strings written with every kind of escape (RFC 8259 section 7).
  const std::vector<std::string> raws = {
      R"(plain)",
      R"(\"\\\/\b\f\n\r\t)",
      R"(\u0000\u001F\u001f\u0020)",
      R"(\u00e9\u00E9 caf\u00e9)",
      R"(\u20ac\u65e5\uFFFD)",
      R"(\ud83d\ude00)",
      R"(\uD834\uDD1E)",
      R"(\udbff\udfff)",
      R"(mixed \u0041\u0062 raw é and 😀 and \ud83d\ude00!)",
      R"(a\\u0041)",  // an escaped backslash followed by the letters "u0041"
      R"(\/\/)",
  };
  std::string json = "[";
  for (size_t i = 0; i < raws.size(); ++i) json += (i ? ",\"" : "\"") + raws[i] + "\"";
  json += "]";

  std::vector<std::string> mine;
  for (const std::string& r : raws) mine.push_back(unescaped(r));

  // source: simdjson 3.0.1 DOM parser (Debian package libsimdjson-dev)
  auto by_simdjson = testing::decode_with_simdjson(json);
  REQUIRE(by_simdjson.has_value());
  CHECK(mine == *by_simdjson);
  // source: Python 3.11 json module (Debian package python3.11)
  auto by_python = testing::decode_with_python(json);
  REQUIRE(by_python.has_value());
  CHECK(mine == *by_python);
  // source: jq 1.6 (Debian package jq)
  auto by_jq = testing::decode_with_jq(json);
  REQUIRE(by_jq.has_value());
  CHECK(mine == *by_jq);

  // source: RFC 8259 section 7 (G clef U+1D11E is "\uD834\uDD1E"); its UTF-8 bytes
  // F0 9D 84 9E follow RFC 3629 section 3
  CHECK(unescaped(R"(\uD834\uDD1E)") == "\xf0\x9d\x84\x9e");
  // source: RFC 3629 section 3 (U+1F600 in UTF-8 is F0 9F 98 80), pair D83D DE00 from the
  // UTF-16 rule of RFC 2781 section 2.1
  CHECK(unescaped(R"(\ud83d\ude00)") == "\xf0\x9f\x98\x80");
  CHECK(unescaped(R"(\u0000)") == std::string(1, '\0'));
  CHECK(unescaped(R"(a\\u0041)") == "a\\u0041");
}

TEST_CASE("unescape_json_string rejects malformed escapes and unpaired surrogates",
          "[corpus][string]") {
  const std::vector<std::string> bad = {
      R"(\ud800)",       R"(\udbff tail)",  R"(\udc00)",       R"(x\udfff)",
      R"(\ud800\u0041)", R"(\ud800\ud800)", R"(\ude00\ud83d)", R"(\ud83d\n)",
      R"(\q)",           R"(\U0041)",       R"(\u12)",         R"(\u12g4)",
      R"(\x41)",         R"(\')",           "trailing\\",      R"(\u)",
  };
  for (const std::string& raw : bad) {
    INFO(raw);
    std::string out;
    std::vector<uint32_t> align;
    CHECK_FALSE(unescape_json_string(raw, out, &align));
    // simdjson refuses the same strings.
    // source: simdjson 3.0.1 DOM parser (Debian package libsimdjson-dev)
    CHECK_FALSE(testing::decode_with_simdjson("[\"" + raw + "\"]").has_value());
  }
}

TEST_CASE("the alignment maps decoded bytes to the start of their escape", "[corpus][string]") {
  // raw offsets:    a=0  \u00e9=1..6  b=7  \n=8..9  é(raw, 2 bytes)=10..11  \ud83d\ude00=12..23
  const std::string raw = "a\\u00e9b\\n\xc3\xa9\\ud83d\\ude00";
  std::string out;
  std::vector<uint32_t> align;
  REQUIRE(unescape_json_string(raw, out, &align));
  CHECK(out ==
        "a\xc3\xa9"
        "b\n\xc3\xa9\xf0\x9f\x98\x80");
  const std::vector<uint32_t> expected = {0, 1, 1, 7, 8, 10, 10, 12, 12, 12, 12, 24};
  CHECK(align == expected);
  CHECK(align.size() == out.size() + 1);
  CHECK(align.back() == raw.size());

  // Replacing the output clears it first.
  REQUIRE(unescape_json_string("x", out, &align));
  CHECK(out == "x");
  CHECK(align == std::vector<uint32_t>{0, 1});
}

TEST_CASE("unescaping from any aligned offset gives the matching decoded suffix",
          "[corpus][string]") {
  for (const std::string& text : escape_corpus()) {
    // Mix escaped and raw parts.
    const std::string raw = escaped(text) + "\\u00e9" + escaped(text) + "\\/";
    std::string out;
    std::vector<uint32_t> align;
    REQUIRE(unescape_json_string(raw, out, &align));
    for (size_t i = 0; i < out.size(); ++i) {
      if ((static_cast<unsigned char>(out[i]) & 0xC0) == 0x80) continue;  // inside a char
      INFO("offset " << i);
      CHECK(unescaped(std::string_view(raw).substr(align[i])) == out.substr(i));
    }
  }
}
