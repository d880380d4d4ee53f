// `evenhand pair-names`: builds a [names] section for a pack from the user's own first-name
// lists with frequency counts, pairing names of equal frequency rank within each group (the
// names intervention of Hall Maudslay et al. 2019, "It's All in the Name").
#include <iostream>

#include "cli/cli.h"
#include "cli/command_options.h"
#include "cli/common.h"
#include "pack/names_pairing.h"

namespace evenhand::cli {

void add_pair_names_options(po::options_description& opts, PairNamesArgs& a) {
  // clang-format off
  opts.add_options()
    ("help,h", "show this help")
    ("group", po::value(&a.groups)->value_name("GROUP=FILE")->composing(),
     "GROUP=FILE: a group's names with counts, one 'NAME<TAB or comma>COUNT' per line "
     "(a header line is allowed); give one per group, in the pack's group order");
  // clang-format on
  add_defaulted(opts, "out,o", po::value(&a.out)->value_name("PATH"), a.out,
                "write the [names] section here", "stdout");
}

int pair_names_command(const std::vector<std::string>& args) {
  po::options_description opts("Options");
  PairNamesArgs a;
  add_pair_names_options(opts, a);
  const std::vector<std::string>& groups = a.groups;
  const std::string& out = a.out;
  po::variables_map vm;
  int rc = parse_args("pair-names", kPairNamesSynopsis, opts, args, vm);
  if (rc >= 0) return rc;
  if (groups.size() < 2) {
    print_error("pair-names: give at least two --group GROUP=FILE");
    return kUsage;
  }
  std::vector<io::NamedPath> ins;
  for (const auto& g : groups) {
    size_t eq = g.find('=');
    if (eq == std::string::npos || eq == 0 || eq + 1 == g.size()) {
      print_error("pair-names: --group takes GROUP=FILE, not '" + g + "'");
      return kUsage;
    }
    ins.push_back({g.substr(eq + 1), "--group"});
  }
  rc = check_outputs("pair-names", ins, {{out, "--out"}});
  if (rc >= 0) return rc;
  std::vector<pack::NameList> lists;
  for (const auto& g : groups) {
    size_t eq = g.find('=');
    auto list = pack::read_name_counts_file(g.substr(eq + 1));
    if (!list.ok()) return report(list.error());
    list->group = g.substr(0, eq);
    lists.push_back(std::move(*list));
  }
  auto pairing = pack::pair_names_by_rank(lists);
  if (!pairing.ok()) return report(pairing.error());
  Status s = write_file_atomic(out, pack::write_names_section(*pairing));
  if (!s.ok()) return report(s.error());
  std::cerr << "evenhand: " << pairing->pairs.size() << " pairs, " << pairing->unpaired.size()
            << " names left unpaired (listed as comments)\n";
  return kOk;
}

}  // namespace evenhand::cli
