// Outputs end to end: no command lets an output replace one of its inputs or another output
// (however the path is spelled), and a run's outputs appear together or not at all when a
// later one fails (a full device, /dev/full).
#include <catch2/catch.hpp>

#include <unistd.h>

#include <filesystem>
#include <map>

#include "support/temp_dir.h"

using evenhand::testing::read_file;
using evenhand::testing::shell;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

namespace {

constexpr int kUsage = 2, kOutput = 4;

// Runs evenhand in `d` (so "./name" names a file of `d`); returns the exit code.
int run_in(const TempDir& d, const std::string& args) {
  return shell("cd " + d.path().string() + " && " + evenhand::testing::evenhand_binary() + " " +
               args + " >" + d.file("stdout") + " 2>" + d.file("stderr") + " </dev/null");
}

// Every input a command can be given, made in `d` by real runs: in.jsonl (the demo corpus),
// out.jsonl, edits.jsonl, m.json (its run), t.json (tally), p.json (plan), f.tsv and m.tsv
// (name counts), targets.txt, a.json (associations) and mypack/ (a copy of en-gender).
void make_inputs(const TempDir& d) {
  std::filesystem::copy_file(evenhand::testing::source_dir() + "/samples/helpdesk.jsonl",
                             d.file("in.jsonl"));
  const std::string fields = " --field /text --field '/messages/*/content'";
  REQUIRE(run_in(d,
                 "run --pack en-gender --in in.jsonl --out out.jsonl --edits edits.jsonl "
                 "--manifest m.json --quiet" +
                     fields) == 0);
  REQUIRE(run_in(d, "tally --pack en-gender --in in.jsonl --out t.json --quiet" + fields) == 0);
  REQUIRE(run_in(d, "plan --tally t.json --target female=1,male=1 --out p.json --quiet") == 0);
  write_file(d.file("f.tsv"), "name\tcount\nMary\t50\nAnna\t20\n");
  write_file(d.file("m.tsv"), "name\tcount\nJohn\t60\nPeter\t30\n");
  write_file(d.file("targets.txt"), "nurse\nengineer\nleader\n");
  REQUIRE(run_in(d,
                 "associations --pack en-gender --in in.jsonl --after out.jsonl "
                 "--out a.json" +
                     fields) == 0);
  std::filesystem::copy(evenhand::testing::source_dir() + "/rules/en-gender", d.file("mypack"));
}

// The bytes of every regular file under `d` (but the captured stdout and stderr).
std::map<std::string, std::string> snapshot(const TempDir& d) {
  std::map<std::string, std::string> files;
  for (const auto& e : std::filesystem::recursive_directory_iterator(d.path())) {
    const std::string name = e.path().filename().string();
    if (!e.is_regular_file() || name == "stdout" || name == "stderr") continue;
    files[e.path().string()] = read_file(e.path().string());
  }
  return files;
}

// Puts every file of `d` back as in `before` (so that a case that failed on a faulty build
// does not spoil the next one): new files removed, changed ones rewritten.
void restore(const TempDir& d, const std::map<std::string, std::string>& before) {
  for (const auto& [path, bytes] : snapshot(d))
    if (!before.count(path)) std::filesystem::remove(path);
  for (const auto& [path, bytes] : before) write_file(path, bytes);
}

struct Case {
  const char* what;  // the options that clash
  std::string args;
};

// Each case names an output that is an input (or another output) in another spelling; the
// command must exit with the usage code and leave every file as it was.
void check_refused(const TempDir& d, const std::vector<Case>& cases) {
  for (const auto& c : cases) {
    INFO(c.what << ": evenhand " << c.args);
    const auto before = snapshot(d);
    const int code = run_in(d, c.args);
    INFO(read_file(d.file("stderr")));
    CHECK(code == kUsage);
    CHECK(snapshot(d) == before);
    CHECK(read_file(d.file("stderr")).find("refusing to overwrite") != std::string::npos);
    restore(d, before);
  }
}

}  // namespace

TEST_CASE("run refuses every output that is an input or another output") {
  TempDir d;
  make_inputs(d);
  const std::string in = d.file("in.jsonl");
  REQUIRE(::link(in.c_str(), d.file("hard.jsonl").c_str()) == 0);
  REQUIRE(::symlink("in.jsonl", d.file("soft.jsonl").c_str()) == 0);
  const std::string run = "run --pack en-gender --quiet --field /text ";
  check_refused(
      d,
      {
          {"--out ./", run + "--in in.jsonl --out ./in.jsonl"},
          {"--manifest ./", run + "--in in.jsonl --out new.jsonl --manifest ./in.jsonl"},
          {"--manifest absolute", run + "--in in.jsonl --out new.jsonl --manifest " + in},
          {"--manifest a/../", run + "--in in.jsonl --out new.jsonl --manifest mypack/../in.jsonl"},
          {"--manifest hard link", run + "--in hard.jsonl --out new.jsonl --manifest in.jsonl"},
          {"--manifest symlink", run + "--in soft.jsonl --out new.jsonl --manifest in.jsonl"},
          {"--edits", run + "--in in.jsonl --out new.jsonl --edits " + in},
          {"--rejects", run + "--in in.jsonl --out new.jsonl --rejects ./in.jsonl"},
          {"--quarantine", run + "--in in.jsonl --out new.jsonl --on-bad-record quarantine "
                                 "--quarantine ./in.jsonl"},
          {"--manifest = --out", run + "--in in.jsonl --out new.jsonl --manifest ./new.jsonl"},
          {"--manifest = --edits",
           run + "--in in.jsonl --out new.jsonl --edits e.jsonl --manifest " + d.file("e.jsonl")},
          {"--edits = --out", run + "--in in.jsonl --out new.jsonl --edits ./new.jsonl"},
          {"--manifest = existing --out",
           run + "--in in.jsonl --out out.jsonl --manifest ./out.jsonl"},
          {"--out = --plan",
           "run --pack en-gender --quiet --in in.jsonl --mode balance "
           "--plan p.json --out ./p.json"},
          {"--manifest in --pack dir",
           "run --pack mypack --in in.jsonl --out new.jsonl --manifest mypack/pack.txt"},
          {"--out in --pack dir", "run --pack ./mypack --in in.jsonl --out mypack/words.txt"},
      });
}

TEST_CASE("tally and plan refuse an output that is an input") {
  TempDir d;
  make_inputs(d);
  const std::string tally = "tally --pack en-gender --quiet ";
  check_refused(
      d,
      {
          {"tally --out", tally + "--in in.jsonl --out ./in.jsonl"},
          {"tally --rejects",
           tally + "--in in.jsonl --out new.json --rejects " + d.file("in.jsonl")},
          {"tally --out = --rejects", tally + "--in in.jsonl --out new.json --rejects ./new.json"},
          {"tally --out in --pack dir",
           "tally --pack mypack --quiet --in in.jsonl --out mypack/pack.txt"},
          {"plan --out", "plan --tally t.json --target female=1,male=1 --out ./t.json"},
          {"plan --out absolute",
           "plan --tally t.json --target female=1,male=1 --out " + d.file("t.json")},
      });
}

TEST_CASE("merge-manifests and pair-names refuse an output that is an input") {
  TempDir d;
  make_inputs(d);
  check_refused(d, {
                       {"merge-manifests --out", "merge-manifests m.json --out ./m.json"},
                       {"merge-manifests --out absolute",
                        "merge-manifests --manifest m.json --out " + d.file("m.json")},
                       {"pair-names --out",
                        "pair-names --group female=f.tsv --group male=m.tsv --out ./f.tsv"},
                       {"pair-names --out absolute",
                        "pair-names --group female=f.tsv --group "
                        "male=m.tsv --out " +
                            d.file("m.tsv")},
                   });
}

TEST_CASE("associations and report refuse an output that is an input") {
  TempDir d;
  make_inputs(d);
  const std::string assoc = "associations --pack en-gender ";
  check_refused(
      d, {
             {"associations --in", assoc + "--in in.jsonl --out ./in.jsonl"},
             {"associations --after",
              assoc + "--in in.jsonl --after out.jsonl --out " + d.file("out.jsonl")},
             {"associations --targets",
              assoc + "--in in.jsonl --targets targets.txt --out ./targets.txt"},
             {"associations --out in --pack dir",
              "associations --pack mypack --in in.jsonl --out mypack/pack.txt"},
             {"report --manifest", "report --manifest m.json --out ./m.json"},
             {"report --edits", "report --manifest m.json --edits edits.jsonl --out ./edits.jsonl"},
             {"report --associations",
              "report --manifest m.json --associations a.json --out " + d.file("a.json")},
             {"report --out = the manifest's corpus",
              "report --manifest m.json --edits edits.jsonl --out ./in.jsonl"},
         });
}

TEST_CASE("two outputs on /dev/null are allowed") {
  TempDir d;
  make_inputs(d);
  CHECK(run_in(d,
               "run --pack en-gender --quiet --in in.jsonl --out /dev/null --edits /dev/null "
               "--manifest /dev/null") == 0);
}

// A later output that cannot be written (/dev/full: every write fails with ENOSPC) fails the
// run before any output is renamed into place: no final name appears, no temporary remains.
TEST_CASE("a failing later output leaves none of the run's outputs") {
  TempDir d;
  make_inputs(d);
  // A bad record so that --rejects and --quarantine have something to write.
  write_file(d.file("bad.jsonl"), read_file(d.file("in.jsonl")) + "not json\n");
  const std::string run =
      "run --pack en-gender --quiet --in bad.jsonl --field /text "
      "--on-bad-record quarantine ";
  const std::vector<std::pair<std::string, std::string>> cases = {
      {"--edits",
       "--out o.jsonl --quarantine q.txt --rejects r.jsonl --manifest n.json "
       "--edits /dev/full"},
      {"--manifest",
       "--out o.jsonl --quarantine q.txt --rejects r.jsonl --edits e.jsonl "
       "--manifest /dev/full"},
      {"--rejects",
       "--out o.jsonl --quarantine q.txt --edits e.jsonl --manifest n.json "
       "--rejects /dev/full"},
      {"--quarantine",
       "--out o.jsonl --rejects r.jsonl --edits e.jsonl --manifest n.json "
       "--quarantine /dev/full"},
  };
  for (const auto& [what, args] : cases) {
    INFO(what << " on /dev/full: " << args);
    const auto before = snapshot(d);
    CHECK(run_in(d, run + args) == kOutput);
    CHECK(read_file(d.file("stderr")).find("disk full") != std::string::npos);
    CHECK(snapshot(d) == before);
    for (const auto& e : std::filesystem::directory_iterator(d.path()))
      CHECK(e.path().filename().string().find(".tmp-") == std::string::npos);
    restore(d, before);
  }
  // tally: the tally and the rejects form one set too.
  const auto before = snapshot(d);
  CHECK(run_in(d,
               "tally --pack en-gender --quiet --in bad.jsonl --on-bad-record skip "
               "--rejects r.jsonl --out /dev/full") == kOutput);
  CHECK(snapshot(d) == before);
}
