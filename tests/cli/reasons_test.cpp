// What the command line prints for bad records: one line per rejection in the README's
// format, "evenhand: FILE:LINE: reason", in skip mode as in fail mode.
#include <catch2/catch.hpp>

#include <sstream>

#include "support/temp_dir.h"

using evenhand::testing::Ran;
using evenhand::testing::run_evenhand;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

TEST_CASE("skip mode prints each rejection as FILE:LINE: reason") {
  TempDir d;
  std::string in = d.file("in.jsonl");
  write_file(in, "{\"text\":\"ok\"}\n{\"text\":\"she\"} x\n{\"text\":NaN}\n");
  Ran r = run_evenhand(d, "run --mode passthrough --on-bad-record skip --in " + in + " --out " +
                              d.file("out.jsonl"));
  INFO(r.err);
  REQUIRE(r.code == 0);
  std::istringstream lines(r.err);
  std::string first, second;
  std::getline(lines, first);
  std::getline(lines, second);
  // README, "Bad records and exit codes": evenhand: FILE:LINE: reason
  CHECK(first == "evenhand: " + in +
                     ":2: invalid JSON: trailing characters after the JSON value, at byte 15 "
                     "of the record");
  CHECK(second == "evenhand: " + in +
                      ":3: invalid JSON: NaN at byte 8 of the record is not a JSON number (JSON "
                      "has no NaN or Infinity)");
  Ran f = run_evenhand(d, "run --mode passthrough --in " + in + " --out " + d.file("out.jsonl"));
  CHECK(f.err.rfind(first + "\n", 0) == 0);
}
