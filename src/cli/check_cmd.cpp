// `evenhand check PACK` and `evenhand packs`: validate a rule pack (every loader `run` runs,
// through load_full_pack), list built-in packs.
#include <iostream>

#include "cli/cli.h"
#include "cli/common.h"
#include "cli/pack_load.h"
#include "pack/pack.h"

namespace evenhand::cli {

int check_command(const std::vector<std::string>& args) {
  po::options_description opts("Options");
  std::string pack_name;
  opts.add_options()("help,h", "show this help")("pack", po::value(&pack_name)->value_name("PACK"),
                                                 "a built-in pack name or a pack directory");
  po::positional_options_description pos;
  pos.add("pack", 1);
  po::variables_map vm;
  int rc = parse_args("check", "PACK", opts, args, vm, &pos);
  if (rc >= 0) return rc;
  if (pack_name.empty()) {
    print_error("check: name a pack (see 'evenhand check --help')");
    return kUsage;
  }
  std::vector<Error> problems;
  auto loaded = load_full_pack(pack_name, problems);
  if (!loaded.ok()) {
    if (loaded.error().kind != ErrorKind::pack) return report(loaded.error());
    for (const auto& e : problems) std::cout << e.message() << "\n";
    std::cerr << "evenhand: " << pack_name << ": " << problems.size() << " problem"
              << (problems.size() == 1 ? "" : "s") << "\n";
    return kPack;
  }
  const auto& p = *loaded->pack;
  std::cout << p.name() << " " << p.version() << ": axis " << p.axis() << ", groups";
  for (const auto& g : p.groups()) std::cout << " " << g;
  std::cout << "; " << p.sets().size() << " sets, " << p.names().size() << " name pairs, "
            << p.guards().size() << " guards, " << p.protected_phrases().size()
            << " protected phrases; sha256 " << p.sha256() << "\nok\n";
  return kOk;
}

int packs_command(const std::vector<std::string>& args) {
  po::options_description opts("Options");
  opts.add_options()("help,h", "show this help");
  po::variables_map vm;
  int rc = parse_args("packs", "", opts, args, vm);
  if (rc >= 0) return rc;
  for (const auto& name : pack::builtin_pack_names()) {
    std::vector<Error> problems;
    auto loaded = load_full_pack(name, problems);
    if (loaded.ok()) {
      const auto& p = *loaded->pack;
      std::cout << name << "\t" << p.version() << "\t" << p.language() << "\t" << p.axis() << ":";
      for (size_t i = 0; i < p.groups().size(); ++i) std::cout << (i ? "," : "") << p.groups()[i];
      std::cout << "\n";
    } else {
      std::cout << name << "\t(broken: " << loaded.error().message() << ")\n";
    }
  }
  return kOk;
}

}  // namespace evenhand::cli
