// Byte sources: a file or stdin, decompressed on the fly. The compression (zstd with any
// number of frames and skippable frames, gzip with any number of members, or none) is
// detected from the magic bytes, never the name. A truncated or corrupt stream is an error
// naming the file and the compressed byte offset; a clean end returns 0.
#pragma once

#include <cstdint>
#include <memory>
#include <optional>
#include <string>

#include "base/status.h"

namespace evenhand::io {

enum class Compression { none, gzip, zstd };

const char* compression_name(Compression c);

// A stream of decompressed bytes. Not copyable; not thread-safe (one reader at a time).
class Source {
 public:
  virtual ~Source() = default;
  Source(const Source&) = delete;
  Source& operator=(const Source&) = delete;

  // Opens `path` ("-" means stdin) and sniffs its compression. Errors (kind input) for a
  // missing or unreadable path or a directory.
  static Result<std::unique_ptr<Source>> open(const std::string& path);

  // Reads up to `size` decompressed bytes into `buf`. Returns the count, 0 only at the clean
  // end of the stream; an Error (kind input) for I/O failure, corrupt or truncated data.
  virtual Result<size_t> read(char* buf, size_t size) = 0;

  const std::string& path() const { return path_; }
  Compression compression() const { return compression_; }
  // Bytes consumed so far from the underlying file (compressed bytes for compressed input).
  uint64_t raw_offset() const { return raw_offset_; }
  // Size of the underlying file when it is a regular file, for progress; nullopt otherwise.
  std::optional<uint64_t> raw_size() const { return raw_size_; }
  // Hex SHA-256 of the raw (on-disk) bytes; complete only after read() returned 0.
  std::string raw_sha256();

 protected:
  Source() = default;
  std::string path_;
  Compression compression_ = Compression::none;
  uint64_t raw_offset_ = 0;
  std::optional<uint64_t> raw_size_;
  std::string raw_sha256_;  // set by implementations when the stream ends
};

}  // namespace evenhand::io
