// Loading a rule pack the way every command that uses one does: its .txt files parsed and
// compiled, every data file the engine reads, and its target list. One function for run,
// tally, check, packs and associations, so that no command accepts a pack another refuses.
#pragma once

#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "base/status.h"
#include "pack/pack.h"
#include "review/associations.h"
#include "rewrite/engine.h"

namespace evenhand::cli {

// The pack's target list, read by `evenhand associations`.
inline constexpr const char* kTargetsFile = "targets.data";

struct LoadedPack {
  std::shared_ptr<const pack::CompiledPack> pack;
  rewrite::EngineData engine_data;
  std::optional<review::TargetList> targets;  // targets.data, when the pack has one
};

// Loads `name_or_dir` (a built-in pack name or a folder): pack::load_pack, then, when that
// compiles, rewrite::load_engine_data and review::parse_targets of targets.data against the
// pack (no target may be a word the pack rewrites). `problems` receives every problem found,
// each an Error naming the file by pack::pack_file_path and the line
// ("/tmp/mypack/possessive.model:12: reason"). Returns the pack, or the first problem (kind
// pack; kind usage for an argument that is neither a built-in pack nor a folder).
Result<LoadedPack> load_full_pack(const std::string& name_or_dir, std::vector<Error>& problems);

// Prints every problem on stderr ("evenhand: FILE:LINE: reason") and returns the exit code of
// `failure` (the result of load_full_pack that failed).
int report_pack_problems(const std::vector<Error>& problems, const Error& failure);

}  // namespace evenhand::cli
