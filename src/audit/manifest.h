// The run manifest: one JSON document that tells a reviewer what went in, what came out and
// what changed (schema "evenhand.manifest/1", documented in the README). Rendering is a pure
// function of the data given, with keys in a fixed order.
#pragma once

#include <cstdint>
#include <string>
#include <utility>
#include <vector>

#include "audit/stats.h"
#include "base/status.h"
#include "pack/pack.h"

namespace evenhand::audit {

inline constexpr const char* kManifestSchema = "evenhand.manifest/1";

struct FileInfo {
  std::string path;
  std::string compression;  // "none", "gzip", "zstd"
  uint64_t bytes = 0;       // on-disk bytes (compressed size for compressed files)
  uint64_t data_bytes = 0;  // decompressed bytes (inputs)
  std::string sha256;       // of the on-disk bytes
  uint64_t records = 0;     // records (lines) read from or written to this file
  std::string role;         // outputs: "corpus", "edits", "quarantine", "rejects"
};

struct ManifestData {
  std::vector<std::string> command_line;
  const pack::CompiledPack* pack = nullptr;  // null for runs without a pack
  // Options as given, in a fixed order (name, JSON value text).
  std::vector<std::pair<std::string, std::string>> options;
  const Stats* stats = nullptr;
  std::vector<FileInfo> inputs;
  std::vector<FileInfo> outputs;
  std::vector<Error> first_rejections;
  double seconds = 0;
  unsigned threads = 0;
  std::string started_at;  // UTC, ISO 8601
  // Balance mode: the plan's expected total per group in its basis ("mentions" or
  // "records"; empty: no plan), and a "balance" section as raw JSON (empty: none).
  std::string planned_basis;
  std::vector<double> planned;  // indexed like the pack's groups; NaN: not a target group
  std::string balance_json;
};

// Returns the manifest as pretty-printed JSON text ending in a newline.
std::string render_manifest(const ManifestData& data);

// Orders pack locations "file:line" by file name, then line number.
bool rule_less(std::string_view a, std::string_view b);

// Describes pack entry `index` as counted in Stats::entry_hits: sets first, then names.
// Returns {"words.txt:12", "she|he"}.
std::pair<std::string, std::string> describe_entry(const pack::CompiledPack& pack, uint32_t index);

}  // namespace evenhand::audit
