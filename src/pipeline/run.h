// The corpus pipeline: one reader thread frames records from the inputs into batches, N
// worker threads process batches, and the calling thread writes results strictly in input
// order. At most a fixed number of batches are in flight, so memory does not grow with the
// input; outputs are byte-identical for any thread count; outputs appear under their final
// names only when the whole run succeeded.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "audit/manifest.h"
#include "audit/stats.h"
#include "balance/tally.h"
#include "base/status.h"
#include "pipeline/options.h"
#include "rewrite/engine.h"

namespace evenhand::pipeline {

using FileInfo = audit::FileInfo;

struct RunResult {
  audit::Stats stats;
  std::vector<FileInfo> inputs;
  std::vector<FileInfo> outputs;
  double seconds = 0;
  unsigned threads = 0;
  std::vector<Error> first_rejections;  // the first few rejections, for the manifest
  balance::Tally tally;                 // tally mode: the tally of every record read
};

// Runs the pipeline. Errors: kind usage for bad options (a bad pointer, an output that names
// an input), input for unreadable or corrupt input and (with OnBadRecord::fail) the first
// bad record, output for unwritable outputs. On error no output is left under its final name.
Result<RunResult> run(const RunOptions& options, const rewrite::Engine& engine);

// The worker count `threads` means (0: the machine's cores, at least 1).
unsigned effective_threads(unsigned threads);

}  // namespace evenhand::pipeline
