// The reasons given for records that are not JSON where simdjson's own message misleads:
// text after a complete value, and NaN or Infinity written as numbers.
#include <catch2/catch.hpp>

#include <string>
#include <vector>

#include "corpus/json_fields.h"
#include "corpus/json_reason.h"

using namespace evenhand;
using namespace evenhand::corpus;

namespace {

// The reason FieldSelector::select gives for `record`, or "ok".
std::string reason_for(std::string_view record) {
  auto p = PointerPattern::parse("/text");
  REQUIRE(p.ok());
  FieldSelector sel({p.value()});
  std::vector<FieldMatch> ms;
  SelectStats stats;
  Status st = sel.select(record, ms, stats);
  return st.ok() ? "ok" : st.error().reason;
}

}  // namespace

TEST_CASE("text after a complete JSON value is called trailing, with its offset",
          "[corpus][reason]") {
  // Offsets are 0-based byte counts before the first trailing character (counted by hand).
  CHECK(reason_for("{\"text\":\"she\"} x") ==
        "invalid JSON: trailing characters after the JSON value, at byte 15 of the record");
  CHECK(reason_for("{\"text\":\"she\"} ,") ==
        "invalid JSON: trailing characters after the JSON value, at byte 15 of the record");
  CHECK(reason_for("{\"text\":\"a\"}}") ==
        "invalid JSON: trailing characters after the JSON value, at byte 12 of the record");
  CHECK(reason_for("{\"text\":\"a}\"} {\"b\":1}") ==
        "invalid JSON: trailing characters after the JSON value, at byte 14 of the record");
  CHECK(reason_for("[1] x") ==
        "invalid JSON: trailing characters after the JSON value, at byte 4 of the record");
  // Trailing whitespace is allowed (RFC 8259 section 2: ws around a value).
  CHECK(reason_for("{\"text\":\"she\"} \t ") == "ok");
  // A broken first value is not blamed on what follows it.
  CHECK(reason_for("{\"text\":\"a\",} x").find("trailing") == std::string::npos);
  CHECK(reason_for("{\"text\":\"a\"").find("trailing") == std::string::npos);
}

TEST_CASE("NaN and Infinity are named as what JSON has no number for", "[corpus][reason]") {
  // source: RFC 8259 section 6: "Numeric values that cannot be represented in the grammar
  // below (such as Infinity and NaN) are not permitted."
  const std::string tail = " is not a JSON number (JSON has no NaN or Infinity)";
  CHECK(reason_for("{\"text\":NaN}") == "invalid JSON: NaN at byte 8 of the record" + tail);
  CHECK(reason_for("{\"a\": Infinity}") == "invalid JSON: Infinity at byte 6 of the record" + tail);
  CHECK(reason_for("{\"a\":[1,-Infinity]}") ==
        "invalid JSON: -Infinity at byte 8 of the record" + tail);
  CHECK(reason_for("{\"a\":nan}") == "invalid JSON: nan at byte 5 of the record" + tail);
  // Inside strings and as keys they are just text.
  CHECK(reason_for("{\"text\":\"NaN\",\"Infinity\":1}") == "ok");
  CHECK_FALSE(explain_invalid_json("{\"a\":\"NaN\"").has_value());
  // Other errors keep the parser's reason.
  CHECK(reason_for("{\"a\":tru}").rfind("invalid JSON: ", 0) == 0);
  CHECK(reason_for("{\"a\":tru}").find("NaN") == std::string::npos);
}
