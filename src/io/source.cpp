// Source implementations: a raw reader over a file descriptor (large reused buffer, SHA-256 of
// the raw bytes) and three decoders on top of it (plain copy, zstd frames, gzip members).
#include "io/source.h"

#include <errno.h>
#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>
#include <zlib.h>
#include <zstd.h>

#include <algorithm>
#include <cstring>
#include <vector>

#include "base/sha256.h"

namespace evenhand::io {

const char* compression_name(Compression c) {
  switch (c) {
    case Compression::none:
      return "none";
    case Compression::gzip:
      return "gzip";
    case Compression::zstd:
      return "zstd";
  }
  return "unknown";
}

std::string Source::raw_sha256() {
  return raw_sha256_;
}

namespace {

constexpr size_t kChunk = size_t(1) << 20;  // raw read size

// zstd frame magic (RFC 8878 section 3.1.1) and skippable-frame magic range (section 3.1.2).
constexpr uint32_t kZstdMagic = 0xFD2FB528u;
constexpr uint32_t kZstdSkippableMask = 0xFFFFFFF0u;
constexpr uint32_t kZstdSkippableStart = 0x184D2A50u;

std::string errno_text(int err) {
  return std::strerror(err);
}

// Everything the decoders share: the descriptor, the raw buffer and the hashing. `pos_` is
// how far the decoder has consumed `buf_`; raw_offset_ counts consumed raw bytes.
class FdSource : public Source {
 public:
  // `prefix` holds the bytes already read from `fd` for sniffing.
  FdSource(std::string path, int fd, bool owns_fd, const std::string& prefix)
      : fd_(fd), owns_fd_(owns_fd), buf_(kChunk) {
    path_ = std::move(path);
    std::memcpy(buf_.data(), prefix.data(), prefix.size());
    len_ = prefix.size();
    raw_read_ = prefix.size();
    hash_.update(prefix);
  }
  ~FdSource() override {
    if (owns_fd_ && fd_ >= 0) ::close(fd_);
  }

  void set_compression(Compression c) { compression_ = c; }
  void set_raw_size(std::optional<uint64_t> s) { raw_size_ = s; }

 protected:
  // Reads one chunk after the unconsumed bytes; sets eof_ (and the raw hash) at the end.
  Status fill() {
    if (eof_) return ok_status();
    if (pos_ > 0) {
      std::memmove(buf_.data(), buf_.data() + pos_, len_ - pos_);
      len_ -= pos_;
      pos_ = 0;
    }
    for (;;) {
      ssize_t n = ::read(fd_, buf_.data() + len_, buf_.size() - len_);
      if (n < 0 && errno == EINTR) continue;
      if (n < 0) {
        int err = errno;
        return error_at(err == EISDIR ? "is a directory" : "read failed: " + errno_text(err),
                        raw_read_);
      }
      if (n == 0) {
        eof_ = true;
        raw_sha256_ = hash_.finish_hex();
      } else {
        hash_.update(buf_.data() + len_, size_t(n));
        len_ += size_t(n);
        raw_read_ += uint64_t(n);
      }
      return ok_status();
    }
  }

  void consume(size_t n) {
    pos_ += n;
    raw_offset_ += n;
  }

  Error error_at(std::string reason, uint64_t offset) const {
    Error e = make_error(ErrorKind::input, display_name(), std::move(reason));
    e.offset = offset;
    return e;
  }

  std::string display_name() const { return path_ == "-" ? "<stdin>" : path_; }

  int fd_;
  bool owns_fd_;
  std::vector<char> buf_;
  size_t pos_ = 0;
  size_t len_ = 0;
  bool eof_ = false;
  uint64_t raw_read_ = 0;  // bytes read from the descriptor (>= raw_offset_)
  Sha256 hash_;
};

class PlainSource final : public FdSource {
 public:
  using FdSource::FdSource;

  Result<size_t> read(char* out, size_t size) override {
    if (size == 0) return size_t(0);
    if (pos_ == len_) EVENHAND_TRY(fill());
    const size_t n = std::min(size, len_ - pos_);
    std::memcpy(out, buf_.data() + pos_, n);
    consume(n);
    return n;
  }
};

// Where the zstd decoder stands in the compressed bytes, walked from the frame and block
// headers (RFC 8878 sections 3.1.1 to 3.1.2). The decoder is fed one part at a time (frame
// header, block header, block body, checksum, skippable frame), never more than its own size
// hint, so a failure belongs to the current part and is reported where its block, or for
// frame headers and checksums its frame, starts.
class ZstdFraming {
 public:
  // Bytes of the current part to feed next, from the `avail` bytes at `p` (the unconsumed
  // input); 0 when its size needs more header bytes than are available.
  size_t piece(const uint8_t* p, size_t avail) {
    if (!sized_ && !size_part(p, avail)) return 0;
    return size_t(std::min<uint64_t>(left_, avail));
  }

  // The decoder consumed `n` bytes of the current part.
  void advance(size_t n) {
    offset_ += n;
    if (!sized_) return;  // a header cut short by the end of the file
    left_ -= n;
    while (sized_ && left_ == 0) next_part();
  }

  // Whether the current part belongs to a block (else to a frame's header or checksum), and
  // where that block or frame starts.
  bool in_block() const { return part_ == Part::block_header || part_ == Part::block_body; }
  uint64_t part_owner_start() const { return in_block() ? block_start_ : frame_start_; }

 private:
  enum class Part { frame_header, block_header, block_body, checksum, skippable_body };

  static uint32_t le(const uint8_t* p, int bytes) {
    uint32_t v = 0;
    for (int i = bytes - 1; i >= 0; --i) v = (v << 8) | p[i];
    return v;
  }

  // Sizes a frame or block header from its first bytes; false when more are needed.
  bool size_part(const uint8_t* p, size_t avail) {
    if (part_ == Part::block_header) {
      if (avail < 3) return false;
      const uint32_t h = le(p, 3);  // Last_Block (1 bit), Block_Type (2), Block_Size (21)
      last_block_ = (h & 1) != 0;
      const uint32_t type = (h >> 1) & 3;
      body_ = type == 1 ? 1 : type == 3 ? 0 : h >> 3;  // RLE: one byte; reserved: refused
      return set_left(3);
    }
    if (avail < 4) return false;
    const uint32_t magic = le(p, 4);
    skippable_ = (magic & kZstdSkippableMask) == kZstdSkippableStart;
    if (skippable_) {
      if (avail < 8) return false;
      body_ = le(p + 4, 4);  // Frame_Size
      return set_left(8);
    }
    if (magic != kZstdMagic) return set_left(4);  // the decoder refuses it
    if (avail < 5) return false;
    // Frame_Header_Descriptor: FCS flag (2 bits), Single_Segment (1), unused, reserved,
    // Content_Checksum (1), Dictionary_ID flag (2).
    static constexpr int kDidBytes[4] = {0, 1, 2, 4};
    static constexpr int kFcsBytes[4] = {0, 2, 4, 8};
    const uint8_t fhd = p[4];
    const bool single = (fhd & 0x20) != 0;
    const int fcs = fhd >> 6;
    checksum_ = (fhd & 0x04) != 0;
    return set_left(5 + (single ? 0 : 1) + kDidBytes[fhd & 3] +
                    (fcs == 0 && single ? 1 : kFcsBytes[fcs]));
  }

  bool set_left(uint64_t n) {
    left_ = n;
    sized_ = true;
    return true;
  }

  // Enters `part`; headers are sized later from their bytes, the others by `size`.
  void start(Part part, uint64_t size) {
    part_ = part;
    left_ = size;
    sized_ = part != Part::frame_header && part != Part::block_header;
    if (part == Part::frame_header) frame_start_ = offset_;
    if (part == Part::block_header) block_start_ = offset_;
  }

  void next_part() {
    switch (part_) {
      case Part::frame_header:
        skippable_ ? start(Part::skippable_body, body_) : start(Part::block_header, 0);
        break;
      case Part::block_header:
        start(Part::block_body, body_);
        break;
      case Part::block_body:
        if (!last_block_) {
          start(Part::block_header, 0);
        } else {
          checksum_ ? start(Part::checksum, 4) : start(Part::frame_header, 0);
        }
        break;
      case Part::checksum:
      case Part::skippable_body:
        start(Part::frame_header, 0);
        break;
    }
  }

  Part part_ = Part::frame_header;
  uint64_t left_ = 0;    // bytes left in the current part, once sized_
  bool sized_ = false;   // the current part's size is known
  uint64_t offset_ = 0;  // bytes consumed
  uint64_t frame_start_ = 0, block_start_ = 0;
  uint64_t body_ = 0;  // size of the coming block body or skippable payload
  bool last_block_ = false, checksum_ = false, skippable_ = false;
};

class ZstdSource final : public FdSource {
 public:
  using FdSource::FdSource;
  ~ZstdSource() override { ZSTD_freeDStream(ds_); }

  Result<size_t> read(char* out_buf, size_t size) override {
    if (size == 0 || done_) return size_t(0);
    if (ds_ == nullptr) {
      ds_ = ZSTD_createDStream();
      if (ds_ == nullptr) return make_error(ErrorKind::internal, display_name(), "out of memory");
    }
    ZSTD_outBuffer out{out_buf, size, 0};
    for (;;) {
      const size_t avail = len_ - pos_;
      size_t piece = framing_.piece(reinterpret_cast<const uint8_t*>(buf_.data()) + pos_, avail);
      if ((avail == 0 || piece == 0) && !eof_) {
        if (out.pos > 0) return out.pos;  // hand over what we have before blocking on input
        EVENHAND_TRY(fill());
        continue;
      }
      if (avail == 0 && frame_complete_) {
        if (out.pos == 0) done_ = true;
        return out.pos;
      }
      if (piece == 0) piece = avail;  // a header cut short by the end of the file
      ZSTD_inBuffer in{buf_.data() + pos_, piece, 0};
      const size_t out_before = out.pos;
      const size_t ret = ZSTD_decompressStream(ds_, &out, &in);
      if (ZSTD_isError(ret)) return corrupt(ret);
      consume(in.pos);
      framing_.advance(in.pos);
      if (in.pos > 0 || out.pos > out_before) frame_complete_ = ret == 0;
      if (out.pos == out.size) return out.pos;
      if (in.pos == 0 && out.pos == out_before && pos_ == len_ && eof_) {
        // No input left and the decoder cannot make progress: the last frame is cut short.
        if (out.pos > 0) return out.pos;
        return error_at("truncated zstd stream", raw_offset_);
      }
    }
  }

 private:
  Error corrupt(size_t code) const {
    return error_at(std::string("corrupt zstd stream: ") + ZSTD_getErrorName(code) +
                        (framing_.in_block() ? " (in the block starting at this byte)"
                                             : " (in the frame starting at this byte)"),
                    framing_.part_owner_start());
  }

  ZSTD_DStream* ds_ = nullptr;
  ZstdFraming framing_;
  bool frame_complete_ = false;  // the last frame (if any) was fully decoded and flushed
  bool done_ = false;
};

class GzipSource final : public FdSource {
 public:
  using FdSource::FdSource;
  ~GzipSource() override {
    if (initialized_) inflateEnd(&zs_);
  }

  Result<size_t> read(char* out_buf, size_t size) override {
    if (size == 0 || done_) return size_t(0);
    if (!initialized_) {
      std::memset(&zs_, 0, sizeof zs_);
      if (inflateInit2(&zs_, 15 + 16) != Z_OK) {
        return make_error(ErrorKind::internal, display_name(), "cannot initialise zlib");
      }
      initialized_ = true;
    }
    zs_.next_out = reinterpret_cast<Bytef*>(out_buf);
    zs_.avail_out = clamp_uint(size);
    const size_t out_cap = zs_.avail_out;
    for (;;) {
      const size_t produced = out_cap - zs_.avail_out;
      if (pos_ == len_ && !eof_) {
        if (produced > 0) return produced;
        EVENHAND_TRY(fill());
      }
      if (pos_ == len_ && eof_ && member_done_) {
        if (produced == 0) done_ = true;
        return produced;
      }
      if (member_done_) {
        // More bytes after a complete member: they must start another gzip member.
        const auto* p = reinterpret_cast<const uint8_t*>(buf_.data()) + pos_;
        if (p[0] != 0x1F || (len_ - pos_ >= 2 && p[1] != 0x8B)) {
          if (produced > 0) return produced;
          return error_at("trailing garbage after gzip stream", raw_offset_);
        }
        inflateReset(&zs_);
        member_done_ = false;
        member_start_ = raw_offset_;
      }
      zs_.next_in = reinterpret_cast<Bytef*>(buf_.data() + pos_);
      zs_.avail_in = clamp_uint(len_ - pos_);
      const size_t in_before = zs_.avail_in;
      const size_t out_before = zs_.avail_out;
      const int ret = inflate(&zs_, Z_NO_FLUSH);
      consume(in_before - zs_.avail_in);
      if (ret == Z_STREAM_END) {
        member_done_ = true;
      } else if (ret == Z_BUF_ERROR ||
                 (ret == Z_OK && in_before == zs_.avail_in && out_before == zs_.avail_out)) {
        // No progress possible. With input exhausted at end of file the member is cut short.
        if (pos_ == len_ && eof_) {
          const size_t got = out_cap - zs_.avail_out;
          if (got > 0) return got;
          return error_at("truncated gzip stream", raw_offset_);
        }
      } else if (ret != Z_OK) {
        const char* msg = zs_.msg != nullptr ? zs_.msg : zError(ret);
        return error_at(
            std::string("corrupt gzip stream: ") + msg + " (in the member starting at this byte)",
            member_start_);
      }
      if (zs_.avail_out == 0) return out_cap;
    }
  }

 private:
  static uInt clamp_uint(size_t n) { return n > (1u << 30) ? uInt(1u << 30) : uInt(n); }

  z_stream zs_;
  bool initialized_ = false;
  bool member_done_ = false;
  uint64_t member_start_ = 0;  // raw offset of the member being inflated
  bool done_ = false;
};

Error open_error(const std::string& path, std::string reason) {
  return make_error(ErrorKind::input, path == "-" ? "<stdin>" : path, std::move(reason));
}

}  // namespace

Result<std::unique_ptr<Source>> Source::open(const std::string& path) {
  int fd = 0;
  bool owns = false;
  if (path != "-") {
    do {
      fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
    } while (fd < 0 && errno == EINTR);
    if (fd < 0) return open_error(path, "cannot open: " + errno_text(errno));
    owns = true;
  }
  struct stat st;
  if (::fstat(fd, &st) != 0) {
    const int err = errno;
    if (owns) ::close(fd);
    return open_error(path, "cannot stat: " + errno_text(err));
  }
  if (S_ISDIR(st.st_mode)) {
    if (owns) ::close(fd);
    return open_error(path, "is a directory");
  }
  std::optional<uint64_t> size;
  if (S_ISREG(st.st_mode)) size = uint64_t(st.st_size);

  // Sniff the first four bytes; the decoder starts with them already in its buffer.
  std::string prefix;
  char head[4];
  while (prefix.size() < sizeof head) {
    const ssize_t got = ::read(fd, head, sizeof head - prefix.size());
    if (got < 0 && errno == EINTR) continue;
    if (got < 0) {
      const int err = errno;
      if (owns) ::close(fd);
      Error e = open_error(path, "read failed: " + errno_text(err));
      e.offset = prefix.size();
      return e;
    }
    if (got == 0) break;
    prefix.append(head, size_t(got));
  }
  const auto* p = reinterpret_cast<const uint8_t*>(prefix.data());
  const size_t n = prefix.size();
  Compression c = Compression::none;
  if (n >= 4) {
    const uint32_t magic =
        uint32_t(p[0]) | (uint32_t(p[1]) << 8) | (uint32_t(p[2]) << 16) | (uint32_t(p[3]) << 24);
    if (magic == kZstdMagic || (magic & kZstdSkippableMask) == kZstdSkippableStart) {
      c = Compression::zstd;
    }
  }
  if (c == Compression::none && n >= 2 && p[0] == 0x1F && p[1] == 0x8B) c = Compression::gzip;

  std::unique_ptr<FdSource> src;
  switch (c) {
    case Compression::none:
      src = std::make_unique<PlainSource>(path, fd, owns, prefix);
      break;
    case Compression::zstd:
      src = std::make_unique<ZstdSource>(path, fd, owns, prefix);
      break;
    case Compression::gzip:
      src = std::make_unique<GzipSource>(path, fd, owns, prefix);
      break;
  }
  src->set_compression(c);
  src->set_raw_size(size);
  return std::unique_ptr<Source>(std::move(src));
}

}  // namespace evenhand::io
