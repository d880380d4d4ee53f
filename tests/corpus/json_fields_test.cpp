// FieldSelector: whole-record validation, raw ranges, decoded texts, splicing edits back
// into the original bytes, and append_with_member. Decoded values are checked against
// simdjson's DOM parser.
#include <catch2/catch.hpp>

#include <map>
#include <random>
#include <set>
#include <string>
#include <vector>

#include "corpus/json_fields.h"
#include "corpus/json_pointer.h"
#include "corpus/json_string.h"
#include "corpus/json_test_support.h"

using namespace evenhand;
using namespace evenhand::corpus;

namespace {

std::vector<PointerPattern> patterns(std::initializer_list<std::string_view> texts) {
  std::vector<PointerPattern> out;
  for (std::string_view t : texts) {
    auto r = PointerPattern::parse(t);
    REQUIRE(r.ok());
    out.push_back(r.value());
  }
  return out;
}

std::string raw_of(std::string_view record, const FieldMatch& m) {
  return std::string(record.substr(m.raw_begin, m.raw_end - m.raw_begin));
}

const FieldMatch& match_at(const std::vector<FieldMatch>& ms, std::string_view pointer) {
  for (const FieldMatch& m : ms)
    if (m.pointer == pointer) return m;
  FAIL("no match at " << pointer);
  return ms.front();
}

std::string spliced(const FieldSelector& sel, std::string_view record,
                    const std::vector<FieldMatch>& ms, const std::vector<FieldEdits>& edits) {
  std::string out;
  sel.splice(record, ms, edits, out);
  return out;
}

// Expects select() to fail; returns the reason.
std::string select_error(FieldSelector& sel, std::string_view record) {
  std::vector<FieldMatch> ms;
  SelectStats stats;
  Status st = sel.select(record, ms, stats);
  REQUIRE_FALSE(st.ok());
  CHECK(st.error().kind == ErrorKind::input);
  CHECK(st.error().file.empty());
  CHECK_FALSE(st.error().line.has_value());
  CHECK(ms.empty());
  return st.error().reason;
}

bool starts_with(std::string_view s, std::string_view prefix) {
  return s.substr(0, prefix.size()) == prefix;
}

}  // namespace

TEST_CASE("select reports raw ranges and decoded text", "[corpus][fields]") {
  const std::string rec =
      R"({ "id" : 12 , "text" : "plain words" , "esc":"tab\there \u00e9 \ud83d\ude00",)"
      R"( "list" : [ 1 , "s" , true , null , -0.5e-3 ] , "obj" : { } })";
  FieldSelector sel(patterns(
      {"/id", "/text", "/esc", "/list", "/list/1", "/list/2", "/list/3", "/list/4", "/obj"}));
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(sel.select(rec, ms, stats).ok());
  REQUIRE(ms.size() == 9);
  CHECK(raw_of(rec, match_at(ms, "/id")) == "12");
  CHECK(raw_of(rec, match_at(ms, "/text")) == R"("plain words")");
  CHECK(raw_of(rec, match_at(ms, "/list")) == R"([ 1 , "s" , true , null , -0.5e-3 ])");
  CHECK(raw_of(rec, match_at(ms, "/list/1")) == R"("s")");
  CHECK(raw_of(rec, match_at(ms, "/list/2")) == "true");
  CHECK(raw_of(rec, match_at(ms, "/list/3")) == "null");
  CHECK(raw_of(rec, match_at(ms, "/list/4")) == "-0.5e-3");
  CHECK(raw_of(rec, match_at(ms, "/obj")) == "{ }");
  CHECK(stats.not_string == 6);
  CHECK(stats.missing == 0);

  const FieldMatch& text = match_at(ms, "/text");
  CHECK(text.is_string);
  CHECK(text.text == "plain words");
  CHECK(text.align == -1);
  // Zero copy: the text of a string without escapes is a view into the record itself.
  CHECK(text.text.data() == rec.data() + text.raw_begin + 1);

  const FieldMatch& esc = match_at(ms, "/esc");
  CHECK(esc.is_string);
  CHECK(esc.align >= 0);
  CHECK(esc.text == "tab\there \xc3\xa9 \xf0\x9f\x98\x80");
  // source: simdjson 3.0.1 DOM parser (Debian package libsimdjson-dev), get_string
  auto ref = testing::simdjson_string_at(rec, "/esc");
  REQUIRE(ref.has_value());
  CHECK(esc.text == *ref);
}

TEST_CASE("numbers beyond simdjson's range are valid JSON and kept", "[corpus][fields]") {
  const std::string rec = R"({"id":123456789012345678901234567890,"x":[1e400,-1E-400, 0],"t":"k"})";
  FieldSelector sel(patterns({"/id", "/x/*", "/t"}));
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(sel.select(rec, ms, stats).ok());
  REQUIRE(ms.size() == 5);
  CHECK(raw_of(rec, ms[0]) == "123456789012345678901234567890");
  CHECK(raw_of(rec, ms[1]) == "1e400");
  CHECK(raw_of(rec, ms[2]) == "-1E-400");
  CHECK(raw_of(rec, ms[3]) == "0");
  CHECK(ms[4].text == "k");
  // but malformed numbers are still refused (source: RFC 8259 section 6 number grammar)
  for (std::string_view bad :
       {R"({"x":01})", R"({"x":1.})", R"({"x":-})", R"({"x":.5})", R"({"x":+1})", R"({"x":1e})",
        R"({"x":0x10})", R"({"x":NaN})", R"({"x":[1,2,1e400x]})"}) {
    INFO(bad);
    CHECK(starts_with(select_error(sel, bad), "invalid JSON: "));
  }
}

TEST_CASE("splice keeps untouched escapes verbatim", "[corpus][fields][splice]") {
  const std::string rec =
      R"({"id":1,"text":"She said \"caf\u00e9\" \ud83d\ude00 to him\n","n":null})";
  FieldSelector sel(patterns({"/text"}));
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(sel.select(rec, ms, stats).ok());
  REQUIRE(ms.size() == 1);
  const std::string text(ms[0].text);
  REQUIRE(text == "She said \"caf\xc3\xa9\" \xf0\x9f\x98\x80 to him\n");

  const uint32_t him = static_cast<uint32_t>(text.find("him"));
  std::vector<FieldEdits> edits = {{0, {{0, 3, "He"}, {him, him + 3, "her"}}}};
  const std::string out = spliced(sel, rec, ms, edits);
  CHECK(out == R"({"id":1,"text":"He said \"caf\u00e9\" \ud83d\ude00 to her\n","n":null})");
  // source: simdjson 3.0.1 DOM parser (Debian package libsimdjson-dev)
  CHECK(testing::simdjson_string_at(out, "/text") ==
        "He said \"caf\xc3\xa9\" \xf0\x9f\x98\x80 to her\n");

  SECTION("an edit covering an escape replaces the escape") {
    const uint32_t e_acute = static_cast<uint32_t>(text.find("\xc3\xa9"));
    std::vector<FieldEdits> ed = {{0, {{e_acute, e_acute + 2, "e"}}}};
    CHECK(spliced(sel, rec, ms, ed) ==
          R"({"id":1,"text":"She said \"cafe\" \ud83d\ude00 to him\n","n":null})");
  }
  SECTION("edits right next to escapes leave them whole") {
    const uint32_t quote = static_cast<uint32_t>(text.find('"'));
    std::vector<FieldEdits> ed = {{0, {{quote, quote, "<"}, {quote + 1, quote + 1, ">"}}}};
    CHECK(spliced(sel, rec, ms, ed) ==
          R"({"id":1,"text":"She said <\">caf\u00e9\" \ud83d\ude00 to him\n","n":null})");
  }
}

TEST_CASE("splice with no edits reproduces the record", "[corpus][fields][splice]") {
  const std::string rec =
      "{ \"a\" : \"x\\u0041\\/y\" ,\n\t\"b\":[ \"\\ud83d\\ude00\", 2 ] , \"c\" : { \"d\" : \"\" } "
      "}";
  FieldSelector sel(patterns({"/a", "/b/*", "/c/d", "/c"}));
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(sel.select(rec, ms, stats).ok());
  REQUIRE(ms.size() == 5);
  CHECK(spliced(sel, rec, ms, {}) == rec);
  // A FieldEdits with no edits changes nothing either.
  CHECK(spliced(sel, rec, ms, {{0, {}}, {1, {}}}) == rec);
  // splice appends to what `out` already holds
  std::string out = "head|";
  sel.splice(rec, ms, {}, out);
  CHECK(out == "head|" + rec);
}

TEST_CASE("splice edits at the start, the end and over the whole string",
          "[corpus][fields][splice]") {
  const std::string rec = R"({"t":"ab\ncd","u":"x"})";
  FieldSelector sel(patterns({"/t"}));
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(sel.select(rec, ms, stats).ok());
  REQUIRE(ms.at(0).text == "ab\ncd");
  auto with = [&](std::vector<StringEdit> e) {
    std::vector<FieldEdits> edits = {{0, std::move(e)}};
    return spliced(sel, rec, ms, edits);
  };
  CHECK(with({{0, 2, "AB"}}) == R"({"t":"AB\ncd","u":"x"})");
  CHECK(with({{3, 5, "CD"}}) == R"({"t":"ab\nCD","u":"x"})");
  CHECK(with({{0, 5, "whole"}}) == R"({"t":"whole","u":"x"})");
  CHECK(with({{0, 0, ">"}}) == R"({"t":">ab\ncd","u":"x"})");
  CHECK(with({{5, 5, "<"}}) == R"({"t":"ab\ncd<","u":"x"})");
  CHECK(with({{0, 5, ""}}) == R"({"t":"","u":"x"})");
  CHECK(with({{2, 3, " "}}) == R"({"t":"ab cd","u":"x"})");  // the \n escape replaced
  // Replacements are escaped (RFC 8259 section 7).
  const std::string odd = with({{0, 5, "q\"\\\t\x01/"}});
  CHECK(odd == R"({"t":"q\"\\\t\u0001/","u":"x"})");
  CHECK(testing::simdjson_string_at(odd, "/t") == "q\"\\\t\x01/");
}

TEST_CASE("splice edits several fields, unedited matches stay verbatim",
          "[corpus][fields][splice]") {
  const std::string rec = R"({"messages":[{"content":"he is here"},{"content":"sch\u00f6n"},)"
                          R"({"content":"his \"book\""}],"title":"her day"})";
  FieldSelector sel(patterns({"/messages/*/content", "/title"}));
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(sel.select(rec, ms, stats).ok());
  REQUIRE(ms.size() == 4);
  // Given out of document order on purpose.
  std::vector<FieldEdits> edits = {
      {3, {{0, 3, "his"}}},
      {0, {{0, 2, "she"}}},
      {2, {{0, 3, "her"}}},
  };
  const std::string out = spliced(sel, rec, ms, edits);
  CHECK(out == R"({"messages":[{"content":"she is here"},{"content":"sch\u00f6n"},)"
               R"({"content":"her \"book\""}],"title":"his day"})");
  std::vector<FieldMatch> again;
  REQUIRE(sel.select(out, again, stats).ok());
  CHECK(again.size() == 4);
}

TEST_CASE("append_with_member inserts one member before the final brace", "[corpus][fields]") {
  auto with = [](std::string_view rec, std::string_view key, std::string_view value) {
    std::string out;
    append_with_member(rec, key, value, out);
    return out;
  };
  CHECK(with("{}", "k", "1") == R"({"k":1})");
  CHECK(with("{ }", "k", "1") == R"({ "k":1})");
  CHECK(with("{\n}", "k", "1") == "{\n\"k\":1}");
  CHECK(with(R"({"a":1})", "k", R"("v")") == R"({"a":1,"k":"v"})");
  CHECK(with(R"({"a":{}})", "k", "[]") == R"({"a":{},"k":[]})");
  CHECK(with(R"({"a":"}"} )", "k", "null") == R"({"a":"}","k":null} )");
  CHECK(with(R"({"a":"{"})", "k", "true") == R"({"a":"{","k":true})");
  const std::string odd = with(R"({"a":1})", "we\"ird\n/", R"({"x":[1]})");
  CHECK(odd == R"({"a":1,"we\"ird\n/":{"x":[1]}})");

  // The result is a valid object holding the new member.
  FieldSelector sel(patterns({"/we\"ird\n~1/x/0", "/a"}));
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(sel.select(odd, ms, stats).ok());
  CHECK(ms.size() == 2);
  CHECK(stats.missing == 0);
  // source: simdjson 3.0.1 DOM parser (Debian package libsimdjson-dev)
  CHECK(testing::simdjson_minified_at(odd, "/we\"ird\n~1") == R"({"x":[1]})");
  // appends to what `out` holds
  std::string out = "X";
  append_with_member("{}", "k", "0", out);
  CHECK(out == R"(X{"k":0})");
}

TEST_CASE("malformed JSON is refused with a clear reason", "[corpus][fields][errors]") {
  FieldSelector sel(patterns({"/text"}));
  // source: RFC 8259 sections 2-7 (grammar of a JSON text)
  const std::vector<std::string> bad = {
      R"({"text":"x")",                       // missing closing brace
      R"({"text":{"b":1})",                   // missing outer closing brace
      R"({"text":"x",})",                     // trailing comma
      R"({"text":"x",,"b":1})",               // double comma
      R"({"text" "x"})",                      // missing colon
      R"({text:"x"})",                        // unquoted key
      R"({'text':"x"})",                      // single quotes
      R"({"text":"x"} x)",                    // garbage after the value
      R"({"text":"x"}})",                     // extra closing brace
      R"({"text":"x"}])",                     // extra closing bracket
      R"({"text":"x"} {"b":2})",              // two values
      R"({"text":"x","tail":[1,2,}})",        // bad tail after the selected field
      R"({"text":"x","tail":[1 2]})",         // missing comma in an array
      R"({"text":"x","tail":tru})",           // bad literal
      R"({"text":"x","tail":nul})",           // bad literal
      R"({"text":"x","tail":falsey})",        // bad literal
      R"({"text":"x","tail":"unclosed})",     // unterminated string
      R"({"text":"x","tail":{"a":[}]}})",     // mismatched brackets
      R"({"text":"x","tail":"\q"})",          // bad escape in an unselected string
      R"({"text":"\x"})",                     // bad escape in the selected string
      R"({"text":"x","t\qail":1})",           // bad escape in a key
      "{\"text\":\"a\x01b\"}",                // raw control character in a string
      "{\"text\":\"x\",\"tail\":\"a\tb\"}",   // raw tab in an unselected string
      std::string("{\"text\":\"x\"}\0", 13),  // NUL after the value
      "",                                     // nothing
      "   ",                                  // only whitespace
      "{",                                    // lone brace
  };
  for (const std::string& rec : bad) {
    INFO("record: " << rec);
    const std::string reason = select_error(sel, rec);
    INFO("reason: " << reason);
    CHECK(starts_with(reason, "invalid JSON: "));
    CHECK(reason.size() > std::string_view("invalid JSON: ").size());
    CHECK(reason.back() != '.');
  }
  // The selector is still usable after errors.
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(sel.select(R"({"text":"fine"})", ms, stats).ok());
  REQUIRE(ms.size() == 1);
  CHECK(ms[0].text == "fine");
}

TEST_CASE("a record must be a JSON object", "[corpus][fields][errors]") {
  FieldSelector sel(patterns({""}));
  CHECK(select_error(sel, "[1,2]") == "record is not a JSON object (found array)");
  CHECK(select_error(sel, " 42 ") == "record is not a JSON object (found number)");
  CHECK(select_error(sel, R"("text")") == "record is not a JSON object (found string)");
  CHECK(select_error(sel, "true") == "record is not a JSON object (found boolean)");
  CHECK(select_error(sel, "null") == "record is not a JSON object (found null)");
  // What only starts like a value is broken JSON, not a value of another type (RFC 8259
  // section 3: the literal names are exactly true, false and null).
  for (const char* broken : {"not json", "nul", "truth", "[1,", "\"open", "42x"}) {
    INFO(broken);
    CHECK(select_error(sel, broken).rfind("invalid JSON: ", 0) == 0);
  }
}

TEST_CASE("invalid UTF-8 is refused inside and outside selected fields",
          "[corpus][fields][errors]") {
  FieldSelector sel(patterns({"/text"}));
  // source: RFC 3629 section 4 (UTF8-octets syntax) and the Unicode Standard, Table 3-7
  // (well-formed byte sequences): stray continuation, truncated, overlong, surrogate,
  // beyond U+10FFFF, 0xFF.
  const std::vector<std::string> bytes = {
      "\x80",         "\xc3",         "\xc3\x28",         "\xc0\xaf",
      "\xe0\x80\xaf", "\xed\xa0\x80", "\xf4\x90\x80\x80", "\xf8\x88\x80\x80\x80",
      "\xff",         "\xe2\x82"};
  for (const std::string& b : bytes) {
    INFO("bytes " << b.size());
    CHECK(select_error(sel, "{\"text\":\"a" + b + "z\"}") == "invalid UTF-8");
    CHECK(select_error(sel, "{\"text\":\"ok\",\"other\":\"" + b + "\"}") == "invalid UTF-8");
    CHECK(select_error(sel, "{\"k" + b + "\":1,\"text\":\"ok\"}") == "invalid UTF-8");
  }
  // Escapes that would decode to a lone surrogate are not UTF-8 either.
  CHECK(starts_with(select_error(sel, R"({"text":"\ud800"})"), "invalid UTF-8: "));
  CHECK(starts_with(select_error(sel, R"({"text":"a","b":"\udc00x"})"), "invalid UTF-8: "));
  CHECK(starts_with(select_error(sel, R"({"\ud83d":1})"), "invalid UTF-8: "));
  // Valid multi-byte text passes.
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(sel.select("{\"text\":\"\xf4\x8f\xbf\xbf \xed\x9f\xbf\"}", ms, stats).ok());
  CHECK(ms.size() == 1);
}

TEST_CASE("deep nesting is refused, not a stack overflow", "[corpus][fields][errors]") {
  FieldSelector sel(patterns({"/a"}));
  auto arrays = [](size_t n) {
    return "{\"a\":" + std::string(n, '[') + "\"s\"" + std::string(n, ']') + "}";
  };
  auto objects = [](size_t n) {
    std::string s = "{\"a\":";
    for (size_t i = 0; i < n; ++i) s += "{\"k\":";
    s += "1";
    s += std::string(n, '}');
    return s + "}";
  };
  // The root object counts as level 1: 1023 more levels are allowed, 1024 are not.
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(sel.select(arrays(1023), ms, stats).ok());
  REQUIRE(ms.size() == 1);
  CHECK(ms[0].raw_end - ms[0].raw_begin == 1023 * 2 + 3);
  CHECK(select_error(sel, arrays(1024)) == "nesting deeper than 1024 levels");
  CHECK(select_error(sel, arrays(100000)) == "nesting deeper than 1024 levels");
  CHECK(select_error(sel, objects(5000)) == "nesting deeper than 1024 levels");
  // unbalanced deep input
  CHECK_FALSE(select_error(sel, "{\"a\":" + std::string(100000, '[')).empty());
  CHECK_FALSE(select_error(sel, "{\"a\":" + std::string(100000, '[') + "}").empty());
}

namespace {

// Random JSON objects for the property test. Each string is generated as decoded UTF-8 and
// then written with randomly chosen escapes, independently of append_json_escaped.
class RandomJson {
 public:
  explicit RandomJson(uint32_t seed) : rng_(seed) {}

  struct Record {
    std::string json;
    std::map<std::string, std::string> strings;  // pointer -> decoded string value
    std::map<std::string, std::string> raw;      // pointer -> raw token of every value
  };

  Record record() {
    Record r;
    r_ = &r;
    std::string ptr;
    object(r.json, ptr, 1);
    return r;
  }

  std::string text(size_t max_chars) {
    std::string s;
    size_t n = pick(max_chars + 1);
    for (size_t i = 0; i < n; ++i) append_utf8(code_point(), s);
    return s;
  }

  size_t pick(size_t n) { return std::uniform_int_distribution<size_t>(0, n - 1)(rng_); }

 private:
  static void append_utf8(uint32_t cp, std::string& out) {
    if (cp < 0x80) {
      out.push_back(static_cast<char>(cp));
    } else if (cp < 0x800) {
      out.push_back(static_cast<char>(0xC0 | (cp >> 6)));
      out.push_back(static_cast<char>(0x80 | (cp & 0x3F)));
    } else if (cp < 0x10000) {
      out.push_back(static_cast<char>(0xE0 | (cp >> 12)));
      out.push_back(static_cast<char>(0x80 | ((cp >> 6) & 0x3F)));
      out.push_back(static_cast<char>(0x80 | (cp & 0x3F)));
    } else {
      out.push_back(static_cast<char>(0xF0 | (cp >> 18)));
      out.push_back(static_cast<char>(0x80 | ((cp >> 12) & 0x3F)));
      out.push_back(static_cast<char>(0x80 | ((cp >> 6) & 0x3F)));
      out.push_back(static_cast<char>(0x80 | (cp & 0x3F)));
    }
  }

  uint32_t code_point() {
    static constexpr uint32_t kSpecial[] = {'"', '\\', '/', '~', 0x7F, ' ', 0x00, '\n', '\t'};
    static constexpr uint32_t kWide[] = {0xE9,   0xDF,   0x416,   0x5D0,   0x20AC,   0x65E5,
                                         0xFFFD, 0x2028, 0x1F600, 0x1D11E, 0x10FFFF, 0x1F469};
    switch (pick(6)) {
      case 0:
        return static_cast<uint32_t>(pick(0x20));  // control characters
      case 1:
        return kSpecial[pick(std::size(kSpecial))];
      case 2:
        return kWide[pick(std::size(kWide))];
      default:
        return static_cast<uint32_t>('a' + pick(26));
    }
  }

  void hex4(uint32_t v, std::string& out) {
    const char* digits = pick(2) ? "0123456789abcdef" : "0123456789ABCDEF";
    for (int shift = 12; shift >= 0; shift -= 4) out.push_back(digits[(v >> shift) & 0xF]);
  }

  // The decoded `s` written as the inside of a JSON string, escapes chosen at random.
  std::string encode(const std::string& s) {
    std::string out;
    size_t i = 0;
    while (i < s.size()) {
      unsigned char c = static_cast<unsigned char>(s[i]);
      size_t len = c < 0x80 ? 1 : c < 0xE0 ? 2 : c < 0xF0 ? 3 : 4;
      uint32_t cp = len == 1 ? c : len == 2 ? c & 0x1F : len == 3 ? c & 0x0F : c & 0x07;
      for (size_t k = 1; k < len; ++k)
        cp = (cp << 6) | (static_cast<unsigned char>(s[i + k]) & 0x3F);
      const bool must = cp < 0x20 || cp == '"' || cp == '\\';
      const char* short_form = nullptr;
      switch (cp) {
        case '"':
          short_form = "\\\"";
          break;
        case '\\':
          short_form = "\\\\";
          break;
        case '/':
          short_form = "\\/";
          break;
        case '\b':
          short_form = "\\b";
          break;
        case '\f':
          short_form = "\\f";
          break;
        case '\n':
          short_form = "\\n";
          break;
        case '\r':
          short_form = "\\r";
          break;
        case '\t':
          short_form = "\\t";
          break;
      }
      if (!must && pick(3) != 0) {
        out.append(s, i, len);
      } else if (short_form && pick(2)) {
        out += short_form;
      } else if (cp < 0x10000) {
        out += "\\u";
        hex4(cp, out);
      } else {
        uint32_t v = cp - 0x10000;
        out += "\\u";
        hex4(0xD800 + (v >> 10), out);
        out += "\\u";
        hex4(0xDC00 + (v & 0x3FF), out);
      }
      i += len;
    }
    return out;
  }

  std::string ws() {
    static const char* kWs[] = {"", "", "", " ", "\n", "\t ", "\r\n  "};
    return kWs[pick(std::size(kWs))];
  }

  static void push_token(std::string& ptr, const std::string& key) {
    ptr.push_back('/');
    for (char c : key) {
      if (c == '~')
        ptr += "~0";
      else if (c == '/')
        ptr += "~1";
      else
        ptr.push_back(c);
    }
  }

  void value(std::string& out, const std::string& ptr, int depth) {
    size_t begin = out.size();
    size_t kind = pick(10);
    if (depth < 4 && kind == 0) {
      object(out, ptr, depth + 1);
    } else if (depth < 4 && kind == 1) {
      out += "[" + ws();
      size_t n = pick(4);
      for (size_t i = 0; i < n; ++i) {
        if (i) out += ws() + "," + ws();
        std::string child = ptr;
        push_token(child, std::to_string(i));
        value(out, child, depth + 1);
      }
      out += ws() + "]";
    } else if (kind < 7) {
      std::string s = text(10);
      out += "\"" + encode(s) + "\"";
      r_->strings[ptr] = s;
    } else {
      // (no integers beyond 64 bits here: simdjson's DOM parser, the reference below,
      // refuses them; they have their own test above)
      static const char* kScalars[] = {"0",       "-12",  "3.25",  "1e5", "-0",
                                       "-0.0E+2", "true", "false", "null"};
      out += kScalars[pick(std::size(kScalars))];
    }
    r_->raw[ptr] = out.substr(begin);
  }

  void object(std::string& out, const std::string& ptr, int depth) {
    size_t begin = out.size();
    out += "{" + ws();
    size_t n = pick(5);
    std::set<std::string> keys;
    for (size_t i = 0; i < n; ++i) {
      std::string key = text(4);
      if (!keys.insert(key).second) continue;
      if (keys.size() > 1) out += ws() + "," + ws();
      out += "\"" + encode(key) + "\"" + ws() + ":" + ws();
      std::string child = ptr;
      push_token(child, key);
      value(out, child, depth);
    }
    out += ws() + "}";
    if (!ptr.empty()) r_->raw[ptr] = out.substr(begin);
  }

  std::mt19937 rng_;
  Record* r_ = nullptr;
};

// Offsets of `s` that start a character (or end the string).
std::vector<uint32_t> char_boundaries(std::string_view s) {
  std::vector<uint32_t> out;
  for (uint32_t i = 0; i <= s.size(); ++i)
    if (i == s.size() || (static_cast<unsigned char>(s[i]) & 0xC0) != 0x80) out.push_back(i);
  return out;
}

}  // namespace

TEST_CASE("property: random records select, splice and re-parse consistently",
          "[corpus][fields][property]") {
  RandomJson gen(20240601);  // fixed seed: the run is reproducible
  FieldSelector sel(patterns({"/*", "/*/*", "/*/*/*", "/*/*/*/*"}));
  int edited = 0;
  for (int round = 0; round < 400; ++round) {
    RandomJson::Record r = gen.record();
    INFO("round " << round << " record " << r.json);
    std::vector<FieldMatch> ms;
    SelectStats stats;
    Status st = sel.select(r.json, ms, stats);
    INFO((st.ok() ? std::string("ok") : st.error().reason));
    REQUIRE(st.ok());

    // Every value is matched exactly once, with the generator's raw token and decoded text.
    std::map<std::string, std::string> strings;
    REQUIRE(ms.size() == r.raw.size());
    for (const FieldMatch& m : ms) {
      INFO("pointer " << m.pointer);
      REQUIRE(r.raw.count(m.pointer) == 1);
      CHECK(raw_of(r.json, m) == r.raw[m.pointer]);
      if (m.is_string) {
        strings[m.pointer] = std::string(m.text);
        // source: simdjson 3.0.1 DOM parser (Debian package libsimdjson-dev), get_string
        CHECK(testing::simdjson_string_at(r.json, m.pointer) == std::string(m.text));
      }
    }
    CHECK(strings == r.strings);
    CHECK(stats.not_string == r.raw.size() - r.strings.size());

    // No edits: the identical record.
    CHECK(spliced(sel, r.json, ms, {}) == r.json);

    // One or two random edits in one random string, another in a second string.
    std::vector<uint32_t> string_matches;
    for (uint32_t i = 0; i < ms.size(); ++i)
      if (ms[i].is_string) string_matches.push_back(i);
    if (string_matches.empty()) continue;
    std::vector<FieldEdits> edits;
    std::map<std::string, std::string> expected = strings;
    std::vector<std::string> replacements;  // keeps the edit texts alive
    replacements.reserve(8);
    for (int e = 0; e < 2 && !string_matches.empty(); ++e) {
      size_t which = gen.pick(string_matches.size());
      uint32_t mi = string_matches[which];
      string_matches.erase(string_matches.begin() + static_cast<long>(which));
      const std::string text(ms[mi].text);
      std::vector<uint32_t> cuts = char_boundaries(text);
      uint32_t a = cuts[gen.pick(cuts.size())];
      uint32_t b = cuts[gen.pick(cuts.size())];
      if (a > b) std::swap(a, b);
      FieldEdits fe;
      fe.match = mi;
      replacements.push_back(gen.text(5));
      fe.edits.push_back({a, b, replacements.back()});
      std::string want = text.substr(0, a) + replacements.back();
      // sometimes a second, later edit in the same string
      std::vector<uint32_t> later;
      for (uint32_t c : cuts)
        if (c >= b) later.push_back(c);
      uint32_t c = later[gen.pick(later.size())];
      uint32_t d = later[gen.pick(later.size())];
      if (c > d) std::swap(c, d);
      if (gen.pick(2) && c > b) {
        replacements.push_back(gen.text(3));
        fe.edits.push_back({c, d, replacements.back()});
        want += text.substr(b, c - b) + replacements.back() + text.substr(d);
      } else {
        want += text.substr(b);
      }
      expected[ms[mi].pointer] = want;
      edits.push_back(std::move(fe));
    }
    const std::string out = spliced(sel, r.json, ms, edits);
    INFO("spliced " << out);
    for (const auto& [ptr, want] : expected) {
      INFO("pointer " << ptr);
      // source: simdjson 3.0.1 DOM parser (Debian package libsimdjson-dev)
      CHECK(testing::simdjson_string_at(out, ptr) == want);
    }
    // Bytes before the first edited string are untouched.
    uint32_t first = UINT32_MAX;
    for (const FieldEdits& fe : edits) first = std::min(first, ms[fe.match].raw_begin);
    CHECK(out.compare(0, first, r.json, 0, first) == 0);
    // And our own selector reads the spliced record back the same way.
    std::vector<FieldMatch> again;
    REQUIRE(sel.select(out, again, stats).ok());
    REQUIRE(again.size() == ms.size());
    for (const FieldMatch& m : again)
      if (m.is_string) CHECK(std::string(m.text) == expected.at(m.pointer));
    ++edited;
  }
  CHECK(edited > 250);  // the edits were really exercised
}

TEST_CASE("a selected member name twice in one object is refused, others pass",
          "[corpus][fields][errors]") {
  // RFC 8259 section 4: names SHOULD be unique; with duplicates readers differ on the value.
  FieldSelector sel(patterns({"/text", "/meta/body"}));
  CHECK(select_error(sel, R"({"text":"She rode.","text":"Her bike."})") ==
        R"(duplicate key "text" in the top-level object)");
  CHECK(select_error(sel, R"({"meta":{"body":"a","body":"b"}})") ==
        R"(duplicate key "body" in the object at "/meta")");
  // An object on the way to a selected field counts too, and escapes are decoded first.
  CHECK(select_error(sel, R"({"meta":{"x":1},"meta":{"body":"She"}})") ==
        R"(duplicate key "meta" in the top-level object)");
  CHECK(select_error(sel, R"({"te\u0078t":"a","text":"b"})") ==
        R"(duplicate key "text" in the top-level object)");
  // Duplicates no pattern reaches are left alone.
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(
      sel.select(R"({"id":1,"id":2,"other":{"body":1,"body":2},"text":"She"})", ms, stats).ok());
  REQUIRE(ms.size() == 1);
  CHECK(ms[0].pointer == "/text");
}

TEST_CASE("a wildcard over a wide object finds a duplicate among many names",
          "[corpus][fields][errors]") {
  FieldSelector sel(patterns({"/*"}));
  std::string rec = "{";
  for (int i = 0; i < 200; ++i) rec += "\"k" + std::to_string(i) + "\":\"v\",";
  std::string unique = rec + "\"last\":\"v\"}";
  std::vector<FieldMatch> ms;
  SelectStats stats;
  REQUIRE(sel.select(unique, ms, stats).ok());
  CHECK(ms.size() == 201);
  CHECK(select_error(sel, rec + "\"k123\":\"w\"}") ==
        R"(duplicate key "k123" in the top-level object)");
}
