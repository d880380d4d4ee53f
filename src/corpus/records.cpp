#include "corpus/records.h"

#include <algorithm>
#include <cstring>

namespace evenhand::corpus {

bool is_blank(std::string_view s) {
  for (char c : s)
    if (c != ' ' && c != '\t' && c != '\r' && c != '\n') return false;
  return true;
}

RecordReader::RecordReader(io::Source& source, Framing framing, size_t max_record_bytes,
                           size_t read_size)
    : source_(source),
      framing_(framing),
      max_(max_record_bytes),
      read_size_(std::max<size_t>(1, read_size)) {}

Result<bool> RecordReader::fill() {
  if (eof_) return false;
  // Move the unconsumed tail to the front, then grow to make room for one more chunk.
  if (begin_ > 0) {
    std::memmove(buf_.data(), buf_.data() + begin_, end_ - begin_);
    buf_offset_ += begin_;
    end_ -= begin_;
    begin_ = 0;
  }
  auto read_more = [&]() -> Result<size_t> {
    if (buf_.size() < end_ + read_size_) buf_.resize(end_ + read_size_);
    auto n = source_.read(buf_.data() + end_, read_size_);
    if (!n.ok()) {
      Error e = std::move(n).error();
      if (e.file.empty()) e.file = source_.path();
      return e;
    }
    end_ += *n;
    if (*n == 0) eof_ = true;
    return *n;
  };
  auto n = read_more();
  if (!n.ok()) return std::move(n).error();
  if (*n == 0) return false;
  if (!started_) {
    // Drop a UTF-8 byte order mark at the very start of the stream. A source may hand out
    // fewer than its three bytes per read: read on while what came is a prefix of one.
    constexpr const char* kBom = "\xEF\xBB\xBF";
    while (end_ < 3 && !eof_ && std::memcmp(buf_.data(), kBom, end_) == 0) {
      auto more = read_more();
      if (!more.ok()) return std::move(more).error();
    }
    started_ = true;
    if (end_ >= 3 && std::memcmp(buf_.data(), kBom, 3) == 0) begin_ = 3;
  }
  return true;
}

Result<RecordReader::Kind> RecordReader::next(RawRecord& out) {
  if (framing_ == Framing::paragraphs) return next_paragraph(out);
  for (;;) {
    auto k = next_line(out);
    if (!k.ok() || *k != Kind::record) return k;
    if (!is_blank(out.bytes)) return k;
    ++blank_lines_;
  }
}

Result<RecordReader::Kind> RecordReader::next_line(RawRecord& out) {
  size_t scanned = begin_;  // bytes before this were searched already and hold no '\n'
  for (;;) {
    const char* nl =
        static_cast<const char*>(std::memchr(buf_.data() + scanned, '\n', end_ - scanned));
    if (nl != nullptr) {
      size_t pos = static_cast<size_t>(nl - buf_.data());
      size_t len = pos - begin_;
      size_t eol_len = 1;
      if (len > 0 && buf_[pos - 1] == '\r') {
        --len;
        eol_len = 2;
      }
      out.line = ++line_;
      out.offset = buf_offset_ + begin_;
      out.size = len;
      out.bytes = std::string_view(buf_.data() + begin_, len);
      out.eol = std::string_view(buf_.data() + begin_ + len, eol_len);
      begin_ = pos + 1;
      if (len > max_) {
        out.bytes = {};
        return Kind::oversized;
      }
      return Kind::record;
    }
    scanned = end_;
    if (end_ - begin_ > max_ && end_ - begin_ - max_ > 1) {  // "> max_ + 1" without overflow
      // Too long already: skip to the end of the line without buffering it.
      uint64_t start = buf_offset_ + begin_;
      uint64_t size = end_ - begin_;
      begin_ = end_ = 0;
      buf_offset_ = start + size;
      for (;;) {
        auto more = fill();
        if (!more.ok()) return std::move(more).error();
        const char* p =
            *more ? static_cast<const char*>(std::memchr(buf_.data(), '\n', end_)) : nullptr;
        if (!*more || p != nullptr) {
          size_t take = p ? static_cast<size_t>(p - buf_.data()) : end_;
          size += take;
          begin_ = p ? take + 1 : end_;
          break;
        }
        size += end_;
        buf_offset_ += end_;
        begin_ = end_ = 0;
      }
      out.line = ++line_;
      out.offset = start;
      out.size = size;
      out.bytes = {};
      out.eol = {};
      return Kind::oversized;
    }
    size_t unconsumed_scanned = scanned - begin_;
    auto more = fill();
    if (!more.ok()) return std::move(more).error();
    if (!*more) {
      if (begin_ == end_) return Kind::end;
      // Last line without a terminator.
      size_t len = end_ - begin_;
      if (len > 0 && buf_[end_ - 1] == '\r') --len;
      out.line = ++line_;
      out.offset = buf_offset_ + begin_;
      out.size = len;
      out.bytes = std::string_view(buf_.data() + begin_, len);
      out.eol = {};
      begin_ = end_;
      if (len > max_) {
        out.bytes = {};
        return Kind::oversized;
      }
      return Kind::record;
    }
    // fill() moved the unconsumed bytes to the front; keep what was already searched.
    scanned = begin_ + unconsumed_scanned;
  }
}

Result<RecordReader::Kind> RecordReader::next_paragraph(RawRecord& out) {
  para_.clear();
  uint64_t first_line = 0, first_offset = 0;
  bool oversized = false;
  uint64_t size = 0;
  RawRecord line;
  for (;;) {
    auto k = next_line(line);
    if (!k.ok()) return k;
    if (*k == Kind::end) break;
    bool blank = *k == Kind::record && is_blank(line.bytes);
    if (blank) {
      if (first_line == 0) {
        ++blank_lines_;
        continue;
      }
      ++blank_lines_;
      break;
    }
    if (first_line == 0) {
      first_line = line.line;
      first_offset = line.offset;
    } else {
      size += 1;
    }
    size += line.size;
    if (*k == Kind::oversized || size > max_) {
      oversized = true;
      para_.clear();
      continue;
    }
    if (line.line != first_line) para_ += '\n';
    para_.append(line.bytes);
  }
  if (first_line == 0) return Kind::end;
  out.line = first_line;
  out.offset = first_offset;
  out.size = size;
  out.eol = {};
  if (oversized) {
    out.bytes = {};
    return Kind::oversized;
  }
  out.bytes = para_;
  return Kind::record;
}

}  // namespace evenhand::corpus
