// Help texts cannot drift from the code: every "(default X)" a command's help shows is the
// value its parser stores when the option is absent; tally lists no rewrite-only option; the
// top-level help names every mode of run; a broken pack's error is printed once.
#include <catch2/catch.hpp>

#include <algorithm>
#include <functional>
#include <sstream>

#include "cli/command_options.h"
#include "support/temp_dir.h"

namespace po = boost::program_options;
using evenhand::testing::run_evenhand;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;
using namespace evenhand::cli;

namespace {

// The value `vm` holds for an option, as help would show it.
std::string stored_text(const po::variable_value& v) {
  if (auto* s = boost::any_cast<std::string>(&v.value())) return *s;
  if (auto* l = boost::any_cast<std::vector<std::string>>(&v.value())) return default_text(*l);
  if (auto* b = boost::any_cast<bool>(&v.value())) return *b ? "true" : "false";
  return "?";
}

// Checks every option of `opts` after parsing an empty command line: "(default X...)" shown
// means the parser stored X; "(default: ...)" means it stored nothing (worked out later);
// "default" appears in no other form (apart from "own default", a library's default).
void defaults_match(const std::string& command, const std::string& synopsis,
                    po::options_description& opts,
                    const po::positional_options_description* pos = nullptr) {
  INFO(command);
  po::variables_map vm;
  auto parser = po::command_line_parser(std::vector<std::string>{}).options(opts);
  if (pos) parser.positional(*pos);
  po::store(parser.run(), vm);
  po::notify(vm);
  std::string help = help_text(command, synopsis, opts);
  std::string flat;  // the help with its line wrapping undone
  std::istringstream words(help);
  for (std::string w; words >> w;) flat += (flat.empty() ? "" : " ") + w;
  for (const auto& o : opts.options()) {
    const std::string& d = o->description();
    INFO("--" << o->long_name() << ": " << d);
    size_t mentions = 0, shown = 0;
    for (size_t p = d.find("default"); p != std::string::npos; p = d.find("default", p + 1)) {
      ++mentions;
      if (p >= 4 && d.compare(p - 4, 4, "own ") == 0) ++shown;
    }
    size_t at = d.find("(default");
    if (at != std::string::npos) {
      ++shown;
      if (d[at + 8] == ':') {
        CHECK(vm.count(o->long_name()) == 0);
      } else {
        size_t from = at + 9, to = d.find_first_of(":)", from);
        REQUIRE(vm.count(o->long_name()) == 1);
        CHECK(vm[o->long_name()].defaulted());
        CHECK(stored_text(vm[o->long_name()]) == d.substr(from, to - from));
      }
      std::istringstream dw(d);
      std::string flat_d;
      for (std::string w; dw >> w;) flat_d += (flat_d.empty() ? "" : " ") + w;
      CHECK(flat.find(flat_d) != std::string::npos);  // printed as it is
    }
    CHECK(mentions == shown);
  }
}

}  // namespace

TEST_CASE("every default a command's help shows is the value its parser stores") {
  {
    po::options_description o("Options");
    RunArgs a;
    add_run_options(o, a);
    defaults_match("run", kRunSynopsis, o);
    CHECK(a.corpus.ro.output_options.zstd_level == 3);  // source: zstd manual, default level 3
  }
  {
    po::options_description o("Options");
    TallyArgs a;
    add_tally_options(o, a);
    defaults_match("tally", kTallySynopsis, o);
  }
  {
    po::options_description o("Options");
    PlanArgs a;
    add_plan_options(o, a);
    defaults_match("plan", kPlanSynopsis, o);
  }
  {
    po::options_description o("Options");
    po::positional_options_description pos;
    ReviewArgs a;
    add_review_options(o, pos, a);
    defaults_match("review", kReviewSynopsis, o, &pos);
  }
  {
    po::options_description o("Options");
    ReportArgs a;
    add_report_options(o, a);
    defaults_match("report", kReportSynopsis, o);
  }
  {
    po::options_description o("Options");
    AssociationsArgs a;
    add_associations_options(o, a);
    defaults_match("associations", kAssociationsSynopsis, o);
  }
  {
    po::options_description o("Options");
    PairNamesArgs a;
    add_pair_names_options(o, a);
    defaults_match("pair-names", kPairNamesSynopsis, o);
  }
}

TEST_CASE("each command prints the help of its own options builder") {
  TempDir d;
  auto same = [&](const std::string& cmd, const std::string& synopsis, po::options_description& o) {
    INFO(cmd);
    auto r = run_evenhand(d, cmd + " --help");
    CHECK(r.code == 0);
    CHECK(r.out == help_text(cmd, synopsis, o));
  };
  po::options_description run_o("Options"), tally_o("Options"), assoc_o("Options"),
      review_o("Options");
  RunArgs ra;
  add_run_options(run_o, ra);
  same("run", kRunSynopsis, run_o);
  TallyArgs ta;
  add_tally_options(tally_o, ta);
  same("tally", kTallySynopsis, tally_o);
  AssociationsArgs aa;
  add_associations_options(assoc_o, aa);
  same("associations", kAssociationsSynopsis, assoc_o);
  po::positional_options_description pos;
  ReviewArgs va;
  add_review_options(review_o, pos, va);
  same("review", kReviewSynopsis, review_o);
  // check, packs and merge-manifests show no default at all.
  for (const char* c : {"check", "packs", "merge-manifests"}) {
    auto r = run_evenhand(d, std::string(c) + " --help");
    CHECK(r.out.find("default") == std::string::npos);
  }
}

TEST_CASE("tally's help lists no rewrite-only option") {
  TempDir d;
  auto r = run_evenhand(d, "tally --help");
  REQUIRE(r.code == 0);
  for (const char* o : {"--seed", "--id-field", "--themselves", "--on-flagged", "--mode", "--rate",
                        "--provenance", "to rewrite"})
    CHECK(r.out.find(o) == std::string::npos);
  CHECK(r.out.find("--toward") != std::string::npos);  // the counts depend on it
  CHECK(run_evenhand(d, "tally --seed 1 --help").code == 2);
}

TEST_CASE("the top-level help lists every mode of run") {
  TempDir d;
  for (const char* args : {"--help", ""}) {
    auto r = run_evenhand(d, args);
    std::string text = r.out + r.err;
    size_t at = text.find("  run ");
    REQUIRE(at != std::string::npos);
    std::string line = text.substr(at, text.find('\n', at) - at);
    for (const char* mode : {"augment", "substitute", "balance", "pass"}) {
      INFO(line);
      CHECK(line.find(mode) != std::string::npos);
    }
  }
}

TEST_CASE("a broken pack's error is printed once by every command that loads it") {
  TempDir d;
  std::filesystem::copy(evenhand::testing::source_dir() + "/rules/en-gender", d.file("pack"));
  std::string words = evenhand::testing::read_file(d.file("pack") + "/words.txt");
  size_t line = std::count(words.begin(), words.end(), '\n') + 1;
  write_file(d.file("pack") + "/words.txt", words + "she | he\n");  // 2 columns, 3 groups
  write_file(d.file("in.jsonl"), "{\"text\":\"she went\"}\n");
  std::string in = " --pack " + d.file("pack") + " --in " + d.file("in.jsonl") + " --out ";
  for (std::string cmd : {"run" + in + d.file("o.jsonl"), "tally" + in + d.file("t.json"),
                          "associations" + in + d.file("a.json")}) {
    INFO(cmd);
    auto r = run_evenhand(d, cmd);
    INFO(r.err);
    CHECK(r.code == 5);
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    CHECK(r.err.rfind("evenhand: " + d.file("pack") + "/words.txt:" + std::to_string(line) + ": ",
                      0) == 0);
  }
}
