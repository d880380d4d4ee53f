// Turns one framed record into output bytes: selects the fields, runs the rewrite engine,
// applies the mode (augment, substitute, passthrough), splices edits into the original bytes
// and writes the audit line. One per worker thread; every decision depends only on the
// record and the options, never on which thread or batch it ran in.
#pragma once

#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "audit/stats.h"
#include "balance/tally.h"
#include "base/status.h"
#include "corpus/json_fields.h"
#include "pipeline/options.h"
#include "rewrite/engine.h"

namespace evenhand::pipeline {

// Where a record came from, for messages, provenance and the audit log.
struct RecordOrigin {
  const std::string* path = nullptr;
  uint64_t line = 0;
  uint64_t offset = 0;  // decompressed byte offset
};

// The bytes one record produces; the caller appends them to the batch buffers.
struct RecordOutput {
  std::string* out = nullptr;    // corpus lines
  std::string* edits = nullptr;  // audit log lines (null: no audit log)
  audit::Stats* stats = nullptr;
  balance::Tally* tally = nullptr;  // tally mode: every record is added here
};

// Not copyable; one per worker thread.
class RecordProcessor {
 public:
  // `patterns` are the parsed field pointers (JSONL); the engine must outlive this object.
  RecordProcessor(const RunOptions& options, std::vector<corpus::PointerPattern> patterns,
                  std::optional<corpus::PointerPattern> id_pattern, const rewrite::Engine& engine);
  ~RecordProcessor();
  RecordProcessor(const RecordProcessor&) = delete;
  RecordProcessor& operator=(const RecordProcessor&) = delete;

  // Processes one record. Returns an Error (kind input, with file and line) when the record
  // is bad and must be rejected; nothing has been written to `out` in that case, and the
  // caller records the rejection (reason code in Error via reason_code()).
  Status process(std::string_view record, std::string_view eol, const RecordOrigin& origin,
                 RecordOutput& out);

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

// Short machine-readable code for a rejection message ("invalid_json", "not_object",
// "invalid_utf8", "record_too_large", "duplicate_key").
std::string rejection_code(const Error& e);

}  // namespace evenhand::pipeline
