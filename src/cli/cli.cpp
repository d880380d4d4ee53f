#include "cli/cli.h"

#include <exception>
#include <iostream>
#include <string>
#include <vector>

#include "cli/common.h"
#include "evenhand/version.h"

namespace evenhand::cli {

namespace {

const char* kUsageText =
    "Usage: evenhand COMMAND [OPTIONS]\n"
    "\n"
    "Counterfactual data augmentation for training corpora.\n"
    "\n"
    "Commands:\n"
    "  run         rewrite a corpus: augment, substitute, balance or pass through (see run "
    "--help)\n"
    "  tally       count group mentions and what a counterfactual would change, per record kind\n"
    "  plan        turn tallies and a target mix into a rebalancing plan\n"
    "  merge-manifests  add up the manifests of shard runs into one\n"
    "  review      show the edits of an audit log against the corpus, filtered or sampled\n"
    "  report      write a self-contained HTML report of a run (manifest, audit log)\n"
    "  associations  measure how target words co-occur with each group, before and after\n"
    "  check       validate a rule pack and report every problem with file:line\n"
    "  packs       list the rule packs built into this binary\n"
    "  pair-names  pair first names of equal frequency rank into a pack's [names] section\n"
    "\n"
    "Options:\n"
    "  --help     show this help\n"
    "  --version  show the version\n"
    "\n"
    "'evenhand COMMAND --help' shows a command's options.\n";

// Runs the command named `cmd`; returns its exit code.
int dispatch(const std::string& cmd, const std::vector<std::string>& rest,
             const std::vector<std::string>& all) {
  if (cmd == "--help" || cmd == "-h" || cmd == "help") {
    std::cout << kUsageText;
    return kOk;
  }
  if (cmd == "--version") {
    std::cout << "evenhand " << kVersion << "\n";
    return kOk;
  }
  if (cmd == "run") return run_command(rest, all);
  if (cmd == "check") return check_command(rest);
  if (cmd == "tally") return tally_command(rest);
  if (cmd == "plan") return plan_command(rest);
  if (cmd == "merge-manifests") return merge_manifests_command(rest);
  if (cmd == "review") return review_command(rest);
  if (cmd == "report") return report_command(rest);
  if (cmd == "associations") return associations_command(rest);
  if (cmd == "packs") return packs_command(rest);
  if (cmd == "pair-names") return pair_names_command(rest);
  print_error("unknown command '" + cmd + "' (see 'evenhand --help')");
  return kUsage;
}

}  // namespace

int main(int argc, char** argv) {
  std::vector<std::string> all(argv, argv + argc);
  if (argc < 2) {
    std::cerr << kUsageText;
    return kUsage;
  }
  std::vector<std::string> rest(all.begin() + 2, all.end());
  try {
    install_stop_signals();
    const int rc = dispatch(argv[1], rest, all);
    std::cout.flush();
    return pipe_closed() ? stop_for_closed_pipe() : rc;
  } catch (const std::bad_alloc&) {
    print_error("out of memory");
    return kInternal;
  } catch (const std::exception& e) {
    print_error(std::string("internal error: ") + e.what());
    return kInternal;
  }
}

}  // namespace evenhand::cli
