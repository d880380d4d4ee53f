// load_full_pack: every loader of a pack's files, in one place.
#include "cli/pack_load.h"

#include "cli/common.h"

namespace evenhand::cli {

Result<LoadedPack> load_full_pack(const std::string& name_or_dir, std::vector<Error>& problems) {
  size_t first = problems.size();
  std::vector<pack::Diagnostic> diags;
  auto compiled = pack::load_pack(name_or_dir, diags);
  if (!compiled.ok()) {
    for (const auto& d : diags) problems.push_back(pack::diagnostic_error(name_or_dir, d));
    if (diags.empty()) problems.push_back(compiled.error());
    return problems[first];
  }
  LoadedPack out;
  out.pack = *compiled;
  auto data = rewrite::load_engine_data(out.pack, problems);
  if (data.ok()) out.engine_data = std::move(*data);
  if (const std::string* text = out.pack->file(kTargetsFile)) {
    auto targets = review::parse_targets(*text, out.pack->file_path(kTargetsFile), out.pack.get());
    if (targets.ok()) {
      out.targets = std::move(*targets);
      // Reports name the list by the pack's name, not its folder, so that they do not depend
      // on where the pack lies.
      out.targets->source = out.pack->name() + ":" + kTargetsFile;
    } else {
      problems.push_back(std::move(targets).error());
      problems.back().kind = ErrorKind::pack;
    }
  }
  if (problems.size() > first) return problems[first];
  return out;
}

int report_pack_problems(const std::vector<Error>& problems, const Error& failure) {
  for (const auto& e : problems) print_error(e.message());
  if (problems.empty()) print_error(failure.message());
  return exit_code_for(failure.kind);
}

}  // namespace evenhand::cli
