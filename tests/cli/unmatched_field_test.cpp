// A --field pointer that matches nothing: a warning on stderr once the first 1,000 records have
// gone by without a match, and at the end a usage error (exit 2, no output under its final
// name) unless --allow-unmatched-field is given. Records are invented (mechanics only).
#include <catch2/catch.hpp>

#include <filesystem>
#include <string>

#include "support/temp_dir.h"

using evenhand::testing::Ran;
using evenhand::testing::read_file;
using evenhand::testing::run_evenhand;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

namespace {

constexpr int kUsage = 2;  // README, exit codes

std::string records(int n) {
  std::string s;
  for (int i = 0; i < n; ++i) s += "{\"text\":\"She thanked her brother.\"}\n";
  return s;
}

}  // namespace

TEST_CASE("a --field that never matches fails the run unless allowed") {
  TempDir d;
  write_file(d.file("in.jsonl"), records(20));
  const std::string base = "run --pack en-gender --in " + d.file("in.jsonl") + " --out " +
                           d.file("out.jsonl") + " --manifest " + d.file("m.json");
  Ran r = run_evenhand(d, base + " --field /txt");
  CHECK(r.code == kUsage);
  CHECK(r.err.find("--field /txt matched no value in any of the 20 records read") !=
        std::string::npos);
  CHECK_FALSE(std::filesystem::exists(d.file("out.jsonl")));
  CHECK_FALSE(std::filesystem::exists(d.file("m.json")));
  // One pointer that matches is not enough: each one must match somewhere.
  CHECK(run_evenhand(d, base + " --field /text --field /txt").code == kUsage);
  // Allowed: the run finishes and the records pass through.
  Ran ok = run_evenhand(d, base + " --field /text --field /txt --allow-unmatched-field");
  CHECK(ok.code == 0);
  CHECK(read_file(d.file("out.jsonl")).find("He thanked his sister.") != std::string::npos);
  // An empty input has nothing to match.
  write_file(d.file("empty.jsonl"), "");
  CHECK(run_evenhand(d, "run --pack en-gender --in " + d.file("empty.jsonl") + " --out " +
                            d.file("e.jsonl") + " --field /txt")
            .code == 0);
}

TEST_CASE("a --field with no match after the first 1,000 records is warned about") {
  TempDir d;
  write_file(d.file("in.jsonl"), records(1500));
  Ran r = run_evenhand(d, "run --pack en-gender --in " + d.file("in.jsonl") + " --out " +
                              d.file("out.jsonl") +
                              " --field /text --field /txt --allow-unmatched-field");
  CHECK(r.code == 0);
  CHECK(r.err.find("warning: --field /txt has matched no value in the first") != std::string::npos);
  CHECK(r.err.find("--field /text has") == std::string::npos);
  // --quiet prints nothing but errors.
  Ran q = run_evenhand(d, "run -q --pack en-gender --in " + d.file("in.jsonl") + " --out " +
                              d.file("out2.jsonl") +
                              " --field /text --field /txt --allow-unmatched-field");
  CHECK(q.err.empty());
}
