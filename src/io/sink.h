// Byte sinks with all-or-nothing semantics: output goes to a temporary file beside the target
// and is renamed into place only by commit() (or by an OutputSet, with other outputs); a sink
// destroyed or aborted before that leaves nothing under the final name. Optional zstd or gzip
// compression; "-" is stdout.
#pragma once

#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <string_view>

#include "base/status.h"
#include "io/source.h"

namespace evenhand::io {

struct SinkOptions {
  // nullopt: choose from the name (".zst" -> zstd, ".gz" -> gzip, otherwise none).
  std::optional<Compression> compression;
  int zstd_level = 3;
  int zstd_workers = 0;  // zstd's own worker threads; 0 = compress in the caller's thread
  int gzip_level = 6;
};

// The values SinkOptions accepts (Sink::create refuses others with kind usage): libzstd's
// levels (ZSTD_minCLevel()..ZSTD_maxCLevel(); 0 is its default) and worker counts
// (ZSTD_c_nbWorkers bounds), zlib's levels (-1 is its default, 0 stores, 9 is smallest).
struct IntRange {
  int lo, hi;
  bool contains(int v) const { return v >= lo && v <= hi; }
};
IntRange zstd_levels();
IntRange zstd_worker_counts();
inline constexpr IntRange kGzipLevels{-1, 9};

// Not copyable; not thread-safe.
class OutputSet;

class Sink {
 public:
  ~Sink();  // aborts unless committed
  Sink(const Sink&) = delete;
  Sink& operator=(const Sink&) = delete;

  // Creates the temporary file in the target's directory. Errors (kind output) when the
  // directory does not exist or is not writable; (kind usage, before any file is made) for a
  // level or worker count outside the ranges above.
  static Result<std::unique_ptr<Sink>> create(const std::string& path, const SinkOptions& options);

  // Appends bytes (compressing as configured). Errors (kind output) on write failure, e.g. a
  // full disk; after an error the sink is aborted.
  Status write(std::string_view bytes);
  // Finishes compression, flushes, fsyncs and closes the file, still under its temporary
  // name; afterwards bytes_written() and sha256() are final. Safe to call more than once.
  // Errors (kind output) on write failure; after an error the sink is aborted.
  Status finish();
  // finish(), then renames the temporary file to the final path (a one-member OutputSet).
  Status commit();
  // Removes the temporary file. Safe to call more than once.
  void abort();

  const std::string& path() const { return path_; }
  Compression compression() const { return compression_; }
  // Bytes written to the file so far (after compression).
  uint64_t bytes_written() const { return bytes_written_; }
  // Hex SHA-256 of the bytes written to the file; valid after finish().
  const std::string& sha256() const { return sha256_; }

 private:
  friend class OutputSet;
  Sink();
  // For OutputSet, which holds the temporary-file lock (io/temp_files.h) around these.
  Status publish_locked();        // renames a finished sink's file into place
  void discard_locked();          // removes the temporary file
  bool is_directory_now() const;  // the final name is a directory (renaming would fail)
  std::string directory() const;  // the directory a rename changes; empty when none
  struct Impl;
  std::unique_ptr<Impl> impl_;
  std::string path_;
  Compression compression_ = Compression::none;
  uint64_t bytes_written_ = 0;
  std::string sha256_;
};

// Compression that SinkOptions{} would choose for `path`.
Compression compression_for_name(const std::string& path);

}  // namespace evenhand::io
