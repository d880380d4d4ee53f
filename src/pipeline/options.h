// What one run of the corpus pipeline is asked to do: inputs, outputs, framing, field
// selection, mode and error policy. Plain data, filled by the CLI or by library users.
#pragma once

#include <cstdint>
#include <functional>
#include <string>
#include <vector>

#include "balance/plan.h"
#include "base/status.h"
#include "corpus/records.h"
#include "io/output_set.h"
#include "io/sink.h"

namespace evenhand::pipeline {

struct RunResult;  // pipeline/run.h

enum class Format { jsonl, text };

enum class Mode {
  augment,      // every record with mentions is followed by its counterfactual copy
  substitute,   // a record with mentions is replaced by its counterfactual with probability rate
  passthrough,  // frame, validate and copy records (no rewriting); for checks and benchmarks
  tally,        // count group mentions and counterfactual effects; writes no corpus
  balance,      // apply a rebalancing plan: keep, flip, add or drop each record
};

enum class OnBadRecord { fail, skip, quarantine };

// What happens to a record whose counterfactual has agreement the engine could not settle.
enum class OnFlagged {
  original,        // write the original only (no counterfactual); counted
  counterfactual,  // write the counterfactual anyway; the provenance member lists the flags
  reject,          // reject the record (to the quarantine file with --on-bad-record quarantine)
};

struct Progress {
  uint64_t records = 0;    // records framed so far
  uint64_t raw_bytes = 0;  // input bytes consumed so far (compressed bytes when compressed)
  uint64_t raw_total = 0;  // total input size when every input is a regular file, else 0
  double seconds = 0;
};

// Records after which a --field pattern that matched nothing is reported (on_unmatched_field).
inline constexpr uint64_t kUnmatchedWarnAfter = 1000;

// Limits run() checks (kind usage): worker threads and the per-record size limit.
inline constexpr unsigned kMaxThreads = 256;
inline constexpr size_t kMaxRecordBytesLimit = size_t(1) << 31;

struct RunOptions {
  std::vector<std::string> inputs;              // "-" is stdin
  std::string output;                           // "-" is stdout
  std::string edits_path;                       // audit log (JSONL); empty: none
  std::string quarantine_path;                  // raw copies of rejected records; empty: none
  std::string rejects_path;                     // one JSON line per rejection; empty: none
  std::vector<std::string> fields = {"/text"};  // JSON Pointers with '*' (JSONL only)
  Format format = Format::jsonl;
  corpus::Framing framing = corpus::Framing::lines;
  Mode mode = Mode::augment;
  uint64_t seed = 0;
  double rate = 0.5;       // substitute mode
  std::string id_pointer;  // substitute: record identity from this value; empty: raw bytes
  unsigned threads = 0;    // worker threads, at most kMaxThreads; 0: the machine's cores
  OnBadRecord on_bad = OnBadRecord::fail;
  OnFlagged on_flagged = OnFlagged::original;
  size_t max_record_bytes = 16u << 20;  // 1..kMaxRecordBytesLimit
  io::SinkOptions output_options;
  bool provenance = false;              // add the "_evenhand" member to every written JSONL record
  const balance::Plan* plan = nullptr;  // balance mode: the plan to apply (not owned)
  // JSONL: a --field pattern that matched no value in any record read fails the run (kind
  // usage) unless this is set; the run's records all pass through unrewritten otherwise.
  bool allow_unmatched_fields = false;

  // Called from the writer thread, about four times a second.
  std::function<void(const Progress&)> on_progress;
  // Called from the writer thread once, after the first kUnmatchedWarnAfter records, for each
  // --field pattern that has matched no value yet (its text and the records read).
  std::function<void(const std::string& pattern, uint64_t records)> on_unmatched_field;
  // Called from the writer thread for every rejected record, in input order.
  std::function<void(const Error&)> on_rejection;
  // Called once every output is complete under its temporary name, before any is renamed
  // into place; `result` has the outputs' sizes and hashes. It may add sinks (a manifest) to
  // `outputs`: they are renamed after the run's own, in the order added. An error aborts
  // every output and becomes the run's error.
  std::function<Status(const RunResult& result, io::OutputSet& outputs)> before_publish;
};

// Name of the provenance member added with RunOptions::provenance.
inline constexpr const char* kProvenanceKey = "_evenhand";

}  // namespace evenhand::pipeline
