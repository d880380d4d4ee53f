// The corpus pipeline: one reader thread frames records from the inputs into batches, N
// worker threads process batches, and the calling thread writes results strictly in input
// order. At most a fixed number of batches are in flight, so memory does not grow with the
// input (and a cap on the input bytes of the batches in flight keeps memory a small multiple
// of --max-record-bytes per thread even for huge records); outputs are byte-identical for any
// thread count; outputs appear under their final names only when the whole run succeeded.
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
  // Input bytes held at once by batches handed to the workers and not yet written (their
  // most, and the cap they are kept under): a structural bound, not a measurement of RSS.
  uint64_t peak_batch_bytes = 0;
  uint64_t batch_byte_cap = 0;
};

// Runs the pipeline. Errors: kind usage for bad options (a bad pointer, an output that names
// an input), input for unreadable or corrupt input and (with OnBadRecord::fail) the first
// bad record, output for unwritable outputs. On error no output is left under its final name.
Result<RunResult> run(const RunOptions& options, const rewrite::Engine& engine);

// The cap on the input bytes of batches in flight for `threads` workers: room for one batch
// holding a record of --max-record-bytes per worker, so the reader's batch being filled makes
// at most threads + 1 large records held at once (outputs and scratch scale with them).
uint64_t in_flight_byte_cap(unsigned threads, uint64_t max_record_bytes);

// The worker count `threads` means (0: the machine's cores, at least 1).
unsigned effective_threads(unsigned threads);

}  // namespace evenhand::pipeline
