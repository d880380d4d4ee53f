// Outputs that appear under their final names together or not at all: every member is
// finished (flushed, fsynced, hashed) under its temporary name first, then all are renamed
// in one loop, in the order added, so the last member (a manifest) appears last.
#pragma once

#include <string>
#include <vector>

#include "base/status.h"
#include "io/sink.h"

namespace evenhand::io {

// Not copyable; not thread-safe. Does not own its members; they must outlive it.
class OutputSet {
 public:
  OutputSet() = default;
  OutputSet(const OutputSet&) = delete;
  OutputSet& operator=(const OutputSet&) = delete;

  // Adds a sink; members are renamed into place in the order added.
  void add(Sink& sink);

  // Finishes every member not yet finished, under its temporary name. On failure aborts
  // every member and returns the error: no final name has been touched.
  Status finish();

  // finish(), then, holding the temporary-file lock (io/temp_files.h, so a stopping process
  // waits for the whole set), checks that no final name has become a directory and renames
  // every member into place; then fsyncs the directories. A failure before the first rename
  // aborts every member and touches no final name. If a rename itself fails (the directory
  // changed under the run), the members renamed before it stay, the rest are removed, and
  // the error is returned.
  Status commit();

  // Aborts every member not yet renamed into place.
  void abort();

 private:
  std::vector<Sink*> members_;
};

}  // namespace evenhand::io
