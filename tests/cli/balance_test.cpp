// Balance mode and the sharded workflow through the command line: tally each shard, plan
// from the merged tallies, apply the plan to each shard, merge the manifests; the result
// must equal the one-machine run byte for byte and count for count.
#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>

#include "support/temp_dir.h"

using evenhand::testing::evenhand_binary;
using evenhand::testing::read_file;
using evenhand::testing::shell;
using evenhand::testing::source_dir;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

namespace {

const std::string kFields = " --field /text --field '/messages/*/content'";

std::string jq(const TempDir& d, const std::string& expr, const std::string& file) {
  // jq (Debian package jq) reads the JSON: a parser outside the project.
  REQUIRE(shell("jq -c '" + expr + "' " + file + " > " + d.file("jq.out")) == 0);
  std::string s = read_file(d.file("jq.out"));
  return s.substr(0, s.size() - 1);
}

// An invented skewed corpus: `f` records about women for every `m` about men.
std::string skewed(int f, int m) {
  std::string s;
  for (int i = 0; i < f + m; ++i) {
    bool female = i % (f + m) < f;
    std::string who = female ? "She said her sister" : "He said his brother";
    s += "{\"id\":" + std::to_string(i) + ",\"text\":\"" + who + " would lead ride " +
         std::to_string(i) + (i % 3 ? "." : ", and the mechanic thanked her.") + "\"}\n";
  }
  return s;
}

}  // namespace

TEST_CASE("balance reaches the target on a skewed corpus, on both bases") {
  TempDir d;
  std::string bin = evenhand_binary();
  write_file(d.file("in.jsonl"), skewed(400, 100));
  for (std::string basis : {"mentions", "records"}) {
    INFO(basis);
    REQUIRE(shell(bin + " run -q --pack en-gender --in " + d.file("in.jsonl") +
                  " --mode balance --target female=1,male=1 --tolerance 0.02 --basis " + basis +
                  " --out " + d.file("out.jsonl") + " --manifest " + d.file("m.json")) == 0);
    std::string m = d.file("m.json");
    double f = std::stod(jq(d, ".groups.gender.female.after." + basis, m));
    double ml = std::stod(jq(d, ".groups.gender.male.after." + basis, m));
    double before_f = std::stod(jq(d, ".groups.gender.female.before." + basis, m));
    double before_m = std::stod(jq(d, ".groups.gender.male.before." + basis, m));
    REQUIRE(before_f / (before_f + before_m) > 0.75);  // the corpus really is skewed
    REQUIRE(std::abs(f / (f + ml) - 0.5) <= 0.02);
    // The tally of the output file agrees with the manifest's after counts.
    REQUIRE(shell(bin + " tally -q --pack en-gender --in " + d.file("out.jsonl") + " --out " +
                  d.file("t.json")) == 0);
    std::string key = basis == "mentions" ? "mentions" : "records";
    REQUIRE(jq(d, ".by_group[0]." + key, d.file("t.json")) ==
            jq(d, ".groups.gender.female.after." + key, m));
    REQUIRE(jq(d, ".by_group[1]." + key, d.file("t.json")) ==
            jq(d, ".groups.gender.male.after." + key, m));
    REQUIRE(jq(d,
               ".records.read == .records.kept + .records.replaced + .records.dropped + "
               ".records.rejected",
               m) == "true");
  }
}

TEST_CASE("balance refuses stdin and infeasible targets with a clear message") {
  TempDir d;
  std::string bin = evenhand_binary();
  write_file(d.file("in.jsonl"), skewed(10, 0));
  REQUIRE(shell(bin +
                " run --pack en-gender --in - --mode balance --target female=1,male=1 --out " +
                d.file("o.jsonl") + " < " + d.file("in.jsonl") + " 2> " + d.file("err")) == 2);
  REQUIRE(read_file(d.file("err")).find("stdin") != std::string::npos);
  REQUIRE(shell(bin + " run --pack en-gender --in " + d.file("in.jsonl") +
                " --mode balance --target female=1,nobody=1 --out " + d.file("o.jsonl") + " 2> " +
                d.file("err")) == 2);
  REQUIRE(read_file(d.file("err")).find("nobody") != std::string::npos);
  REQUIRE_FALSE(std::filesystem::exists(d.file("o.jsonl")));
}

TEST_CASE("four shards tallied, planned and applied equal the one-shard run") {
  TempDir d;
  std::string bin = evenhand_binary();
  std::string in = source_dir() + "/samples/helpdesk.jsonl";
  // Split the demo corpus into 4 shards of consecutive lines.
  std::string all = read_file(in);
  std::vector<std::string> lines;
  for (size_t p = 0, q; (q = all.find('\n', p)) != std::string::npos; p = q + 1)
    lines.push_back(all.substr(p, q - p + 1));
  std::string shards;
  for (int s = 0; s < 4; ++s) {
    std::string part;
    for (size_t i = s * lines.size() / 4; i < (s + 1) * lines.size() / 4; ++i) part += lines[i];
    write_file(d.file("shard" + std::to_string(s) + ".jsonl"), part);
  }
  std::string base = bin + " run -q --pack en-gender --mode balance --seed 11" + kFields;
  // One machine: tally and plan over the whole corpus, apply.
  REQUIRE(shell(bin + " tally -q --pack en-gender" + kFields + " --in " + in + " --out " +
                d.file("whole.tally")) == 0);
  std::string tallies;
  for (int s = 0; s < 4; ++s) {
    std::string n = std::to_string(s);
    REQUIRE(shell(bin + " tally -q --pack en-gender" + kFields + " --in " +
                  d.file("shard" + n + ".jsonl") + " --out " + d.file("t" + n + ".json")) == 0);
    tallies += " --tally " + d.file("t" + n + ".json");
  }
  REQUIRE(shell(bin + " plan -q --target female=1,male=1 --tally " + d.file("whole.tally") +
                " --out " + d.file("whole.plan")) == 0);
  REQUIRE(shell(bin + " plan -q --target female=1,male=1" + tallies + " --out " +
                d.file("merged.plan")) == 0);
  // The merged shard tallies make the same plan as the whole corpus.
  REQUIRE(read_file(d.file("whole.plan")) == read_file(d.file("merged.plan")));
  REQUIRE(shell(base + " --plan " + d.file("whole.plan") + " --in " + in + " --out " +
                d.file("whole.jsonl") + " --manifest " + d.file("whole.json")) == 0);
  std::string concat, manifests;
  for (int s = 0; s < 4; ++s) {
    std::string n = std::to_string(s);
    REQUIRE(shell(base + " --plan " + d.file("merged.plan") + " --in " +
                  d.file("shard" + n + ".jsonl") + " --out " + d.file("out" + n + ".jsonl") +
                  " --manifest " + d.file("m" + n + ".json")) == 0);
    concat += read_file(d.file("out" + n + ".jsonl"));
    manifests += " " + d.file("m" + n + ".json");
  }
  REQUIRE(concat == read_file(d.file("whole.jsonl")));
  REQUIRE(shell(bin + " merge-manifests" + manifests + " --out " + d.file("merged.json")) == 0);
  for (std::string key :
       {".records", ".fields", ".groups", ".rewrites.edits", ".rewrites.entry_hits",
        ".balance.actions", "[.inputs[].records] | add", "[.outputs[].records] | add"}) {
    INFO(key);
    REQUIRE(jq(d, key, d.file("merged.json")) == jq(d, key, d.file("whole.json")));
  }
  REQUIRE(jq(d, ".records.replaced", d.file("whole.json")) != "0");  // the plan did change records
}
