// The main job on the shipped demo corpus, checked from outside the project: Python's json
// module (source: Python 3 standard library, RFC 8259) parses every output line, replays the
// audit log against the input, and checks round trips; see tests/external/check_run.py.
#include <catch2/catch.hpp>

#include <set>

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
  // At least ninety records must have made the round trip for the check to mean much (95 do:
  // the records whose only listed names stand in street and branch names have no edit).
  auto pos = report.find(" rewritten, ");
  REQUIRE(pos != std::string::npos);
  REQUIRE(std::stoi(report.substr(pos + 12)) >= 90);
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

TEST_CASE("every word the demo run writes is in the hunspell en_US dictionary") {
  // source: hunspell 1.7 with the en_US dictionary (Debian hunspell, hunspell-en-us); jq
  // (Debian jq) reads the audit log. First names are proper nouns the dictionary mostly
  // lacks, so name edits are left out here (names.txt is checked against its npm sources).
  TempDir d;
  std::string src = evenhand::testing::source_dir(), bin = evenhand::testing::evenhand_binary();
  std::string in = src + "/samples/helpdesk.jsonl";
  std::string fields = " --field /text --field '/messages/*/content'";
  for (std::string extra : {"", " --toward neutral"}) {
    INFO("run" << extra);
    int rc = shell(bin + " run -q --pack en-gender" + extra + fields + " --in " + in + " --out " +
                   d.file("o.jsonl") + " --edits " + d.file("e.jsonl") + " 2> " + d.file("err"));
    if (rc != 0 && extra == " --toward neutral" &&
        read_file(d.file("err")).find("no such group") != std::string::npos)
      continue;  // a pack without a neutral group has nothing to check here
    REQUIRE(rc == 0);
    REQUIRE(shell("jq -r '.edits[]? | select(.why != \"name\") | .to' " + d.file("e.jsonl") +
                  " | tr ' ' '\\n' | sort -u > " + d.file("words")) == 0);
    REQUIRE(read_file(d.file("words")).size() > 20);  // the run did write words
    REQUIRE(shell("hunspell -d en_US -i UTF-8 -l < " + d.file("words") + " > " + d.file("unknown")) == 0);
    // Accepted exceptions, with the reason:
    // - gentlemen's: the dictionary has "gentlemen" but not its possessive; an irregular
    //   plural takes 's (common practice), as tests/pack/shipped_test.cpp notes too.
    // - mx: the gender-neutral honorific, in the Oxford English Dictionary since 2015 (from
    //   memory); hunspell-en-us 2020.12.07 does not list it.
    // - themself: the singular reflexive, listed by Merriam-Webster (from memory); not in
    //   the hunspell list either ("--themselves" writes the plural form instead).
    const std::set<std::string> accepted = {"gentlemen's", "mx", "themself"};
    std::string unknown, listed = read_file(d.file("unknown"));
    for (size_t p = 0, q; (q = listed.find('\n', p)) != std::string::npos; p = q + 1) {
      std::string w = listed.substr(p, q - p), lower;
      for (char c : w) lower += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
      if (!accepted.count(lower)) unknown += w + " ";
    }
    INFO("unknown words: " << unknown);
    REQUIRE(unknown.empty());
  }
}
