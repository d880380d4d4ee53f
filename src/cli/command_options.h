// The options of the commands that have defaults, each built by one function bound to the
// values it sets: the command parses with it and prints it for --help, and the tests parse an
// empty command line with it to hold every "(default X)" of the help to the value then stored.
#pragma once

#include <string>
#include <vector>

#include "cli/common.h"
#include "cli/corpus_args.h"
#include "review/associations.h"
#include "review/diff.h"
#include "review/select.h"

namespace evenhand::cli {

// The balance options of run and plan.
struct BalanceArgs {
  std::string target, basis = "mentions", plan_path;
  double tolerance = 0.02;
  bool allow_drop = false, no_add = false, no_flip = false;
};
void add_balance_options(po::options_description& opts, BalanceArgs& b);

inline constexpr const char* kRunSynopsis =
    "--pack PACK --in PATH [--in PATH ...] --out PATH [OPTIONS]";
struct RunArgs {
  CorpusArgs corpus;
  BalanceArgs balance;
  std::string mode = "augment", compress = "auto", manifest_path;
};
void add_run_options(po::options_description& opts, RunArgs& a);

inline constexpr const char* kTallySynopsis =
    "--pack PACK --in PATH [--in PATH ...] --out TALLY.json [OPTIONS]";
struct TallyArgs {
  CorpusArgs corpus;
  std::string out;
};
void add_tally_options(po::options_description& opts, TallyArgs& a);

inline constexpr const char* kPlanSynopsis =
    "--tally T.json [--tally ...] --target SPEC --out PLAN.json";
struct PlanArgs {
  BalanceArgs balance;
  std::vector<std::string> tallies;
  std::string out;
  bool quiet = false;
};
void add_plan_options(po::options_description& opts, PlanArgs& a);

inline constexpr const char* kReviewSynopsis =
    "EDITS.jsonl [--manifest M.json] [filters] [--sample N]";
struct ReviewArgs {
  std::string edits, manifest, format, root, stdin_corpus, layout = "inline", color = "auto";
  bool paragraphs = false, no_rules = false, whole = false;
  size_t sample = 0, width = 0, context = review::kWindowWords;
  uint64_t seed = 0;
  review::Filter filter;
};
// Also the positional EDITS into `pos`.
void add_review_options(po::options_description& opts, po::positional_options_description& pos,
                        ReviewArgs& a);

inline constexpr const char* kReportSynopsis =
    "--manifest PATH [--edits PATH] [--associations PATH] --out FILE.html";
struct ReportArgs {
  std::string manifest, edits, associations, out, format, root, stdin_corpus;
  bool paragraphs = false;
  size_t sample = 12;
  uint64_t seed = 0;
};
void add_report_options(po::options_description& opts, ReportArgs& a);

inline constexpr const char* kAssociationsSynopsis =
    "--pack PACK --in CORPUS [--after AUGMENTED] --out ASSOC.json";
struct AssociationsArgs {
  std::string pack_name, targets_path, out, format = "jsonl";
  std::vector<std::string> before, after, fields, protect;
  bool paragraphs = false;
  review::AssociationOptions options;
};
void add_associations_options(po::options_description& opts, AssociationsArgs& a);

inline constexpr const char* kPairNamesSynopsis =
    "--group female=F.tsv --group male=M.tsv [--out FILE]";
struct PairNamesArgs {
  std::vector<std::string> groups;
  std::string out = "-";
};
void add_pair_names_options(po::options_description& opts, PairNamesArgs& a);

}  // namespace evenhand::cli
