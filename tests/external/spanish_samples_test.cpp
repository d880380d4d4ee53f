// The Spanish pack on its demo corpus (samples/coro.jsonl), checked from outside the project:
// every counterfactual is the sentence the corpus generator wrote for the other gender, the
// audit log replays (tests/external/check_run.py), and every word the run writes, and every
// adjective form the agreement tables can write, is in the hunspell es_ES dictionary.
#include <catch2/catch.hpp>

#include <fstream>
#include <set>
#include <sstream>

#include "pack/pack.h"
#include "rewrite/es/np_agreement.h"
#include "support/hunspell.h"
#include "support/temp_dir.h"

using evenhand::testing::read_file;
using evenhand::testing::shell;
using evenhand::testing::TempDir;

TEST_CASE("the Spanish demo corpus is what its generator writes") {
  std::string src = evenhand::testing::source_dir();
  REQUIRE(shell("python3 " + src + "/samples/make_samples_es.py --check > /dev/null") == 0);
}

TEST_CASE("augment on the Spanish demo corpus gives each record its twin") {
  TempDir d;
  std::string src = evenhand::testing::source_dir(), bin = evenhand::testing::evenhand_binary();
  std::string in = src + "/samples/coro.jsonl";
  REQUIRE(shell(bin + " run -q --pack es-gender --in " + in + " --out " + d.file("out.jsonl") +
                " --edits " + d.file("edits.jsonl") + " --manifest " + d.file("m.json")) == 0);
  REQUIRE(shell("python3 " + src + "/samples/make_samples_es.py --twins > " + d.file("twins")) ==
          0);
  // source: Python 3 standard library json (RFC 8259), in both scripts.
  REQUIRE(shell("python3 " + src + "/tests/external/check_twins.py " + in + " " +
                d.file("out.jsonl") + " " + d.file("twins") + " > " + d.file("report")) == 0);
  std::string report = read_file(d.file("report"));
  INFO(report);
  auto pos = report.find("check_twins: ");
  REQUIRE(pos != std::string::npos);
  CHECK(std::stoi(report.substr(pos + 13)) >= 90);
  REQUIRE(shell("python3 " + src + "/tests/external/check_run.py " + in + " " +
                d.file("out.jsonl") + " " + d.file("edits.jsonl") + " augment > /dev/null") == 0);
  // No record of the demo needs review: nothing is flagged.
  CHECK(read_file(d.file("m.json")).find("\"flagged_by_reason\": {}") != std::string::npos);
}

TEST_CASE("every word the Spanish demo run writes is in the hunspell es_ES dictionary") {
  // source: hunspell 1.7 with the es_ES dictionary (Debian hunspell, hunspell-es); jq (Debian
  // jq) reads the audit log.
  TempDir d;
  std::string src = evenhand::testing::source_dir(), bin = evenhand::testing::evenhand_binary();
  for (std::string extra : {"", " --toward female", " --toward male"}) {
    INFO("run" << extra);
    REQUIRE(shell(bin + " run -q --pack es-gender" + extra + " --in " + src +
                  "/samples/coro.jsonl --out " + d.file("o.jsonl") + " --edits " +
                  d.file("e.jsonl")) == 0);
    REQUIRE(shell("jq -r '.edits[]? | .to' " + d.file("e.jsonl") + " | tr ' ' '\\n' | sort -u > " +
                  d.file("written")) == 0);
    std::set<std::string> words;
    std::istringstream in(read_file(d.file("written")));
    for (std::string w; std::getline(in, w);)
      if (!w.empty()) words.insert(w);
    REQUIRE(words.size() > 20);
    evenhand::testing::check_hunspell_exceptions(
        evenhand::testing::hunspell_rejects(words, "es_ES"), {}, "es_ES");
  }
}

TEST_CASE("every adjective form the Spanish agreement can write is in hunspell es_ES") {
  // source: hunspell 1.7 with the es_ES dictionary (Debian hunspell, hunspell-es).
  std::vector<evenhand::pack::Diagnostic> diags;
  auto p = evenhand::pack::load_pack("es-gender", diags);
  REQUIRE(p.ok());
  auto np = evenhand::rewrite::NounPhraseAgreement::from_pack(*p);
  REQUIRE(np.ok());
  auto forms = (*np)->adjective_forms();
  std::set<std::string> words(forms.begin(), forms.end());
  REQUIRE(words.size() >= 300);
  auto unknown = evenhand::testing::hunspell_rejects(words, "es_ES");
  // Accepted exceptions, each with its reason (the same as tests/pack/spanish_pack_test.cpp):
  const std::map<std::string, std::string> exceptions = {
      {"grandote", "augmentative of grande (-ote); productive suffix, not in the word list"},
      {"grandota", "feminine of grandote, see there"},
      {"grandotes", "plural of grandote, see there"},
      {"grandotas", "plural of grandota, see there"},
  };
  evenhand::testing::check_hunspell_exceptions(unknown, exceptions, "es_ES");
}
