// Record framing: splits a decompressed byte stream into records, one per line (JSONL or
// text) or one per blank-line-separated paragraph (text). Memory stays bounded by the
// largest allowed record: a record over the limit is reported and skipped without being
// buffered whole. A UTF-8 BOM at the very start is dropped; CRLF is accepted.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

#include "base/status.h"
#include "io/source.h"

namespace evenhand::corpus {

enum class Framing {
  lines,       // one record per line; blank (white-space only) lines are skipped and counted
  paragraphs,  // text only: records separated by one or more blank lines
};

struct RawRecord {
  std::string_view bytes;  // the record without its line terminator (valid until next())
  std::string_view eol;    // "\n", "\r\n", or "" for a last line without one (lines only)
  uint64_t line = 0;       // 1-based number of the record's first line in its input
  uint64_t offset = 0;     // decompressed byte offset of the record in its input
  uint64_t size = 0;       // bytes of the record (set also for an oversized one)
};

// Not copyable; reads from a Source it does not own.
class RecordReader {
 public:
  enum class Kind { record, oversized, end };

  // Bytes asked of the source per read: large for throughput. A smaller `read_size` serves
  // callers that frame many small inputs (the fuzz targets), where the buffer dominates.
  static constexpr size_t kReadSize = size_t(1) << 20;

  RecordReader(io::Source& source, Framing framing, size_t max_record_bytes,
               size_t read_size = kReadSize);
  RecordReader(const RecordReader&) = delete;
  RecordReader& operator=(const RecordReader&) = delete;

  // Reads the next record into `out`. Returns record, oversized (out.line/offset/size say
  // which; out.bytes is empty and the record has been skipped), or end. Errors from the
  // source (corrupt or truncated stream) pass through with the file name filled in.
  Result<Kind> next(RawRecord& out);

  uint64_t blank_lines() const { return blank_lines_; }
  uint64_t lines() const { return line_; }
  // Decompressed bytes read from the source so far (the stream's size once next() hit end).
  uint64_t data_bytes() const { return buf_offset_ + end_; }

 private:
  Result<bool> fill();  // reads more; false at end of stream
  Result<Kind> next_line(RawRecord& out);
  Result<Kind> next_paragraph(RawRecord& out);

  io::Source& source_;
  Framing framing_;
  size_t max_;
  size_t read_size_;
  std::string buf_;
  size_t begin_ = 0;         // start of unconsumed bytes in buf_
  size_t end_ = 0;           // end of valid bytes in buf_
  uint64_t buf_offset_ = 0;  // stream offset of buf_[0]
  uint64_t line_ = 0;        // lines consumed so far
  uint64_t blank_lines_ = 0;
  bool eof_ = false;
  bool started_ = false;
  std::string para_;  // paragraph assembly
};

// True when `s` holds only spaces, tabs, CR and LF.
bool is_blank(std::string_view s);

}  // namespace evenhand::corpus
