// Reading a run manifest (schema evenhand.manifest/1) back into plain data for review and
// the HTML report: pack identity, options, files with hashes, record counts, group counts
// before/planned/after, guards, flags and entry hits. Errors name the file and the key.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "base/status.h"

namespace evenhand::review {

struct GroupRow {
  std::string name;
  uint64_t before_mentions = 0, before_records = 0;
  uint64_t after_mentions = 0, after_records = 0;
  std::optional<double> planned;  // balance runs: the plan's expected total
  std::string planned_basis;      // "mentions" or "records"
};

struct HitRow {
  std::string rule, forms;
  uint64_t hits = 0;
  bool common_word = false;  // a name pair marked ~word in the pack
};

// The manifest's "balance" section (balance runs): what the plan aimed at and promised.
struct BalanceView {
  std::string plan, basis;                             // plan source; "mentions" or "records"
  std::vector<std::pair<std::string, double>> target;  // group -> weight, in target order
  double tolerance = 0, planned_tolerance = 0;
  uint64_t planned_changed = 0, lower_bound = 0;
  bool minimal = false;
  std::vector<std::pair<std::string, double>> expected_share;  // group -> the plan's share
  std::vector<std::pair<std::string, uint64_t>> actions;       // kept, flipped, added, dropped
};

struct FileRow {
  std::string role;  // outputs only
  std::string path, compression, sha256;
  uint64_t bytes = 0, records = 0;
};

struct ManifestView {
  std::string path;  // where it was read from
  std::string tool_version, started_at;
  std::vector<std::string> command_line;
  std::string pack_name, pack_version, pack_sha256, axis;
  std::string mode, format;
  bool paragraphs = false;
  uint64_t max_record_bytes = 0;  // the run's --max-record-bytes; 0: not recorded
  std::vector<std::string> fields;
  std::vector<FileRow> inputs, outputs;
  std::vector<std::pair<std::string, uint64_t>> records;  // records.* integers, in file order
  std::vector<std::pair<std::string, uint64_t>> guarded_by_reason, flagged_by_reason,
      rejected_by_reason;
  std::vector<GroupRow> groups;
  uint64_t edits = 0, protected_skips = 0, ambiguous = 0;
  std::vector<HitRow> entry_hits;      // as in the manifest (rule order)
  std::optional<BalanceView> balance;  // balance runs only

  // records.<key>, or 0.
  uint64_t record_count(const std::string& key) const;
};

// Reads and checks a manifest. Errors (kind input) for unreadable JSON, another schema, or
// a required key that is missing or has the wrong type (a "balance" section needs basis,
// target, tolerance, planned_changed, lower_bound and minimal).
Result<ManifestView> read_manifest(const std::string& path);

}  // namespace evenhand::review
