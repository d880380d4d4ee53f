// The main job on the shipped demo corpus, checked from outside the project: Python's json
// module (source: Python 3 standard library, RFC 8259) parses every output line, replays the
// audit log against the input, and checks round trips; see tests/external/check_run.py.
#include <catch2/catch.hpp>

#include "support/temp_dir.h"

using evenhand::testing::read_file;
using evenhand::testing::shell;
using evenhand::testing::TempDir;

TEST_CASE("augment on the demo corpus: valid JSON, audit log replays, originals untouched") {
  TempDir d;
  std::string src = evenhand::testing::source_dir(), bin = evenhand::testing::evenhand_binary();
  std::string in = src + "/samples/helpdesk.jsonl";
  std::string fields = " --field /text --field '/messages/*/content'";
  REQUIRE(shell(bin + " run -q --pack en-gender --in " + in + fields + " --out " +
                d.file("out.jsonl") + " --edits " + d.file("edits.jsonl")) == 0);
  REQUIRE(shell("python3 " + src + "/tests/external/check_run.py " + in + " " +
                d.file("out.jsonl") + " " + d.file("edits.jsonl") + " augment") == 0);
}

TEST_CASE("substitute twice on the demo corpus gives back every one-to-one record") {
  TempDir d;
  std::string src = evenhand::testing::source_dir(), bin = evenhand::testing::evenhand_binary();
  std::string in = src + "/samples/helpdesk.jsonl";
  std::string fields = " --field /text --field '/messages/*/content'";
  std::string sub = bin + " run -q --pack en-gender --mode substitute --rate 1" + fields;
  REQUIRE(shell(sub + " --in " + in + " --out " + d.file("cf.jsonl") + " --edits " +
                d.file("e.jsonl")) == 0);
  REQUIRE(shell(sub + " --in " + d.file("cf.jsonl") + " --out " + d.file("back.jsonl")) == 0);
  REQUIRE(shell("python3 " + src + "/tests/external/check_run.py " + in + " " + d.file("cf.jsonl") +
                " " + d.file("e.jsonl") + " substitute " + d.file("back.jsonl") + " > " +
                d.file("report")) == 0);
  std::string report = read_file(d.file("report"));
  INFO(report);
  // At least a hundred records must have made the round trip for the check to mean much.
  auto pos = report.find(" rewritten, ");
  REQUIRE(pos != std::string::npos);
  REQUIRE(std::stoi(report.substr(pos + 12)) >= 100);
}

TEST_CASE("output is identical for 1 and 4 threads on the demo corpus") {
  TempDir d;
  std::string src = evenhand::testing::source_dir(), bin = evenhand::testing::evenhand_binary();
  std::string base = bin + " run -q --pack en-gender --in " + src +
                     "/samples/helpdesk.jsonl --field /text --field '/messages/*/content'";
  REQUIRE(shell(base + " --threads 1 --out " + d.file("a.jsonl") + " --edits " + d.file("ea")) ==
          0);
  REQUIRE(shell(base + " --threads 4 --out " + d.file("b.jsonl") + " --edits " + d.file("eb")) ==
          0);
  REQUIRE(read_file(d.file("a.jsonl")) == read_file(d.file("b.jsonl")));
  REQUIRE(read_file(d.file("ea")) == read_file(d.file("eb")));
}
