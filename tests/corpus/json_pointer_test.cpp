// JSON Pointer parsing and selection: RFC 6901 examples, the "*" wildcard, array indexes.
#include <catch2/catch.hpp>

#include <string>
#include <vector>

#include "corpus/json_fields.h"
#include "corpus/json_pointer.h"
#include "corpus/json_test_support.h"

using namespace evenhand;
using namespace evenhand::corpus;

namespace {

PointerPattern pattern(std::string_view text) {
  auto r = PointerPattern::parse(text);
  REQUIRE(r.ok());
  return r.value();
}

std::vector<PointerPattern> patterns(std::initializer_list<std::string_view> texts) {
  std::vector<PointerPattern> out;
  for (std::string_view t : texts) out.push_back(pattern(t));
  return out;
}

std::string raw_of(std::string_view record, const FieldMatch& m) {
  return std::string(record.substr(m.raw_begin, m.raw_end - m.raw_begin));
}

struct Selected {
  std::vector<FieldMatch> matches;
  SelectStats stats;
};

Selected select_all(FieldSelector& sel, std::string_view record) {
  Selected s;
  Status st = sel.select(record, s.matches, s.stats);
  INFO(record);
  REQUIRE(st.ok());
  return s;
}

std::vector<std::string> pointers_of(const std::vector<FieldMatch>& ms) {
  std::vector<std::string> out;
  for (const FieldMatch& m : ms) out.push_back(m.pointer);
  return out;
}

}  // namespace

TEST_CASE("PointerPattern parses reference tokens", "[corpus][pointer]") {
  CHECK(pattern("").tokens().empty());

  auto root_key = pattern("/");
  REQUIRE(root_key.tokens().size() == 1);
  CHECK(root_key.tokens()[0].key.empty());
  CHECK_FALSE(root_key.tokens()[0].wildcard);

  auto p = pattern("/a~1b/m~0n//*/**");
  REQUIRE(p.tokens().size() == 5);
  CHECK(p.tokens()[0].key == "a/b");
  CHECK(p.tokens()[1].key == "m~n");
  CHECK(p.tokens()[2].key.empty());
  CHECK(p.tokens()[3].wildcard);
  CHECK_FALSE(p.tokens()[4].wildcard);  // only a token exactly "*" is the wildcard
  CHECK(p.tokens()[4].key == "**");
  CHECK(p.text() == "/a~1b/m~0n//*/**");

  // source: RFC 6901 section 4 ("~01" is first turned into "~1", never into "/")
  auto order = pattern("/~01");
  REQUIRE(order.tokens().size() == 1);
  CHECK(order.tokens()[0].key == "~1");
}

TEST_CASE("PointerPattern rejects malformed pointers", "[corpus][pointer]") {
  // source: RFC 6901 section 3 (a non-empty pointer starts with "/"; "~" is only "~0"/"~1")
  for (std::string_view bad : {"a", "a/b", "#/a", "/~", "/a~", "/~2", "/a~x/b", "/ok/~/"}) {
    INFO(bad);
    auto r = PointerPattern::parse(bad);
    REQUIRE_FALSE(r.ok());
    CHECK(r.error().kind == ErrorKind::usage);
    CHECK(r.error().reason.find(std::string(bad)) != std::string::npos);
  }
}

TEST_CASE("append_pointer_token escapes ~ and / and round-trips through parse",
          "[corpus][pointer]") {
  std::string ptr;
  append_pointer_token(ptr, "a/b~c");
  append_pointer_token(ptr, "");
  append_pointer_token(ptr, "~1");
  // source: RFC 6901 section 3 ('~' is written "~0", '/' is written "~1")
  CHECK(ptr == "/a~1b~0c//~01");
  auto back = pattern(ptr);
  REQUIRE(back.tokens().size() == 3);
  CHECK(back.tokens()[0].key == "a/b~c");
  CHECK(back.tokens()[1].key.empty());
  CHECK(back.tokens()[2].key == "~1");
}

// source: RFC 6901 section 5 (example document and the values its pointers evaluate to)
TEST_CASE("RFC 6901 section 5 examples resolve to the listed values", "[corpus][pointer]") {
  const std::string doc = R"({
      "foo": ["bar", "baz"],
      "": 0,
      "a/b": 1,
      "c%d": 2,
      "e^f": 3,
      "g|h": 4,
      "i\\j": 5,
      "k\"l": 6,
      " ": 7,
      "m~n": 8
   })";
  struct Case {
    const char* pointer;
    std::string value;  // raw JSON text of the value in `doc`
  };
  const std::vector<Case> cases = {
      {"", doc},
      {"/foo", R"(["bar", "baz"])"},
      {"/foo/0", R"("bar")"},
      {"/", "0"},
      {"/a~1b", "1"},
      {"/c%d", "2"},
      {"/e^f", "3"},
      {"/g|h", "4"},
      {"/i\\j", "5"},
      {"/k\"l", "6"},
      {"/ ", "7"},
      {"/m~0n", "8"},
  };
  REQUIRE(cases.size() == 12);

  SECTION("one pattern at a time") {
    for (const Case& c : cases) {
      INFO("pointer " << c.pointer);
      FieldSelector sel(patterns({c.pointer}));
      Selected s = select_all(sel, doc);
      REQUIRE(s.matches.size() == 1);
      CHECK(raw_of(doc, s.matches[0]) == c.value);
      CHECK(s.matches[0].pointer == c.pointer);
      CHECK(s.stats.missing == 0);
      // cross-check: simdjson's own RFC 6901 evaluation gives the same value
      auto ref = testing::simdjson_minified_at(doc, c.pointer);
      REQUIRE(ref.has_value());
      auto mine = testing::simdjson_minified_at(c.value, "");
      REQUIRE(mine.has_value());
      CHECK(*mine == *ref);
    }
  }

  SECTION("all twelve patterns at once, in document order") {
    std::vector<PointerPattern> ps;
    for (const Case& c : cases) ps.push_back(pattern(c.pointer));
    FieldSelector sel(std::move(ps));
    Selected s = select_all(sel, doc);
    REQUIRE(s.matches.size() == 12);
    for (size_t i = 0; i < s.matches.size(); ++i) {
      const FieldMatch& m = s.matches[i];
      INFO("match " << i << " " << m.pointer);
      CHECK(m.pattern == i);  // the cases are listed in document order
      CHECK(raw_of(doc, m) == cases[m.pattern].value);
      if (i > 0) CHECK(s.matches[i - 1].raw_begin < m.raw_begin);
    }
    CHECK(s.matches[2].is_string);
    CHECK(s.matches[2].text == "bar");
    CHECK(s.stats.missing == 0);
    CHECK(s.stats.not_string == 11);
  }
}

TEST_CASE("wildcard over an array of messages", "[corpus][pointer][wildcard]") {
  const std::string rec = R"({"id":7,"messages":[{"role":"user","content":"Hello there"},)"
                          R"({"role":"assistant","content":{"parts":["x"]}},{"role":"user"},)"
                          R"({"content":"Bye","role":"user"}]})";
  FieldSelector sel(patterns({"/messages/*/content"}));
  Selected s = select_all(sel, rec);
  CHECK(pointers_of(s.matches) == std::vector<std::string>{"/messages/0/content",
                                                           "/messages/1/content",
                                                           "/messages/3/content"});
  REQUIRE(s.matches.size() == 3);
  CHECK(s.matches[0].is_string);
  CHECK(s.matches[0].text == "Hello there");
  CHECK_FALSE(s.matches[1].is_string);
  CHECK(raw_of(rec, s.matches[1]) == R"({"parts":["x"]})");
  CHECK(s.matches[2].text == "Bye");
  CHECK(s.stats.missing == 0);
  CHECK(s.stats.not_string == 1);
}

TEST_CASE("wildcard over object members", "[corpus][pointer][wildcard]") {
  const std::string rec =
      R"({"messages":{"first":{"content":"a"},"second":{"content":"b"},"x/y~":{"content":"c"}}})";
  FieldSelector sel(patterns({"/messages/*/content"}));
  Selected s = select_all(sel, rec);
  CHECK(pointers_of(s.matches) == std::vector<std::string>{"/messages/first/content",
                                                           "/messages/second/content",
                                                           "/messages/x~1y~0/content"});
  REQUIRE(s.matches.size() == 3);
  CHECK(s.matches[2].text == "c");
  CHECK(s.stats.not_string == 0);
}

TEST_CASE("nested wildcards and the root", "[corpus][pointer][wildcard]") {
  const std::string rec = R"({"a":[1,"s"],"b":{"c":"t","d":[]},"e":"u"})";
  SECTION("/*/*") {
    FieldSelector sel(patterns({"/*/*"}));
    Selected s = select_all(sel, rec);
    CHECK(pointers_of(s.matches) == std::vector<std::string>{"/a/0", "/a/1", "/b/c", "/b/d"});
    CHECK(s.stats.not_string == 2);  // 1 and []
    CHECK(s.stats.missing == 0);
  }
  SECTION("/*") {
    FieldSelector sel(patterns({"/*"}));
    Selected s = select_all(sel, rec);
    CHECK(pointers_of(s.matches) == std::vector<std::string>{"/a", "/b", "/e"});
    REQUIRE(s.matches.size() == 3);
    CHECK(raw_of(rec, s.matches[0]) == R"([1,"s"])");
    CHECK(raw_of(rec, s.matches[1]) == R"({"c":"t","d":[]})");
    CHECK(s.matches[2].text == "u");
    CHECK(s.stats.not_string == 2);
  }
  SECTION("/*/*/* reaches nothing") {
    FieldSelector sel(patterns({"/*/*/*"}));
    Selected s = select_all(sel, rec);
    CHECK(s.matches.empty());
    CHECK(s.stats.missing == 1);
  }
}

TEST_CASE("missing paths count once per pattern", "[corpus][pointer][wildcard]") {
  const std::string rec =
      R"({"messages":[{"content":"a"},{"content":"b"},{"content":"c"}],"meta":{"lang":"en"}})";
  FieldSelector sel(patterns({"/nope", "/messages/*/missing", "/messages/1/content",
                              "/meta/lang/deeper", "/messages/*/content"}));
  Selected s = select_all(sel, rec);
  CHECK(s.stats.missing == 3);
  // "/messages/1/content" and the wildcard both name /messages/1/content: one match, with
  // the first pattern that names it.
  CHECK(pointers_of(s.matches) == std::vector<std::string>{"/messages/0/content",
                                                           "/messages/1/content",
                                                           "/messages/2/content"});
  REQUIRE(s.matches.size() == 3);
  CHECK(s.matches[0].pattern == 4);
  CHECK(s.matches[1].pattern == 2);
  CHECK(s.matches[2].pattern == 4);
}

TEST_CASE("array index tokens follow RFC 6901", "[corpus][pointer]") {
  const std::string rec = R"({"foo":["a","b","c"],"m":{"01":"x","1":"y","-":"z"}})";
  auto only = [&](std::string_view ptr) {
    FieldSelector sel(patterns({ptr}));
    Selected s = select_all(sel, rec);
    return s;
  };
  // source: RFC 6901 section 4 (array-index = "0" / digits without a leading zero; "-" names
  // the nonexistent element after the last one)
  CHECK(only("/foo/0").matches.at(0).text == "a");
  CHECK(only("/foo/2").matches.at(0).text == "c");
  for (std::string_view none : {"/foo/01", "/foo/00", "/foo/-", "/foo/3", "/foo/+1", "/foo/1a",
                                "/foo/99999999999999999999", "/foo/"}) {
    INFO(none);
    Selected s = only(none);
    CHECK(s.matches.empty());
    CHECK(s.stats.missing == 1);
  }
  // For objects the token is a member name, compared as it is.
  CHECK(only("/m/01").matches.at(0).text == "x");
  CHECK(only("/m/1").matches.at(0).text == "y");
  CHECK(only("/m/-").matches.at(0).text == "z");
}

TEST_CASE("keys with escapes are decoded before matching", "[corpus][pointer]") {
  const std::string rec = R"({"caf\u00e9":"yes","a\/b":"slash","t\"q":"quote"})";
  FieldSelector sel(patterns({"/café", "/a~1b", "/t\"q"}));
  Selected s = select_all(sel, rec);
  CHECK(pointers_of(s.matches) == std::vector<std::string>{"/café", "/a~1b", "/t\"q"});
  CHECK(s.stats.missing == 0);
}
