// Sink: buffered, optionally compressed output to a temporary file that commit() renames into
// place; stdout and existing non-regular targets (devices, FIFOs) are written directly.
#include "io/sink.h"

#include <errno.h>
#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>
#include <zlib.h>
#include <zstd.h>

#include <algorithm>
#include <cstring>
#include <fstream>
#include <vector>

#include "base/sha256.h"
#include "io/output_set.h"
#include "io/temp_files.h"

namespace evenhand::io {

namespace {

constexpr size_t kBufferSize = size_t(1) << 20;

bool ends_with(const std::string& s, std::string_view suffix) {
  return s.size() >= suffix.size() &&
         s.compare(s.size() - suffix.size(), suffix.size(), suffix.data(), suffix.size()) == 0;
}

// The process umask without changing it: Linux reports it in /proc/self/status; otherwise
// fall back to setting and restoring it.
mode_t current_umask() {
  std::ifstream status("/proc/self/status");
  std::string line;
  while (std::getline(status, line)) {
    if (line.rfind("Umask:", 0) == 0) {
      try {
        return mode_t(std::stoul(line.substr(6), nullptr, 8));
      } catch (...) {
        break;
      }
    }
  }
  const mode_t old = ::umask(022);
  ::umask(old);
  return old;
}

std::string errno_text(int err) {
  return std::strerror(err);
}

std::string write_failure(int err) {
  if (err == ENOSPC) return "disk full";
  if (err == EDQUOT) return "disk full (quota exceeded)";
  return "write failed: " + errno_text(err);
}

}  // namespace

IntRange zstd_levels() {
  return {ZSTD_minCLevel(), ZSTD_maxCLevel()};
}

IntRange zstd_worker_counts() {
  ZSTD_bounds b = ZSTD_cParam_getBounds(ZSTD_c_nbWorkers);
  return ZSTD_isError(b.error) ? IntRange{0, 0} : IntRange{b.lowerBound, b.upperBound};
}

namespace {

// Why `o` cannot be used, or an empty string.
std::string bad_options(const SinkOptions& o) {
  auto range = [](IntRange r) {
    return " (" + std::to_string(r.lo) + " to " + std::to_string(r.hi) + ")";
  };
  if (!zstd_levels().contains(o.zstd_level))
    return "zstd level " + std::to_string(o.zstd_level) + " out of range" + range(zstd_levels());
  if (!zstd_worker_counts().contains(o.zstd_workers))
    return "zstd worker count " + std::to_string(o.zstd_workers) + " out of range" +
           range(zstd_worker_counts());
  if (!kGzipLevels.contains(o.gzip_level))
    return "gzip level " + std::to_string(o.gzip_level) + " out of range" + range(kGzipLevels);
  return {};
}

}  // namespace

Compression compression_for_name(const std::string& path) {
  if (ends_with(path, ".zst") || ends_with(path, ".zstd")) return Compression::zstd;
  if (ends_with(path, ".gz")) return Compression::gzip;
  return Compression::none;
}

struct Sink::Impl {
  enum class Target { temp_file, direct, stdout_fd };

  Target target = Target::temp_file;
  int fd = -1;
  std::string temp_path;  // for Target::temp_file
  std::string final_path;
  std::vector<char> out;  // bytes ready for the file
  size_t out_len = 0;
  ZSTD_CCtx* zstd = nullptr;
  z_stream gz;
  bool gz_ready = false;
  Sha256 hash;
  bool finished = false;
  bool committed = false;
  bool aborted = false;

  ~Impl() {
    close_and_remove();
    ZSTD_freeCCtx(zstd);
    if (gz_ready) deflateEnd(&gz);
  }

  Error error(std::string reason) const {
    return make_error(ErrorKind::output, target == Target::stdout_fd ? "<stdout>" : final_path,
                      std::move(reason));
  }

  void close_and_remove() {
    if (fd >= 0 && target != Target::stdout_fd) ::close(fd);
    fd = -1;
    if (target == Target::temp_file && !temp_path.empty()) {
      auto lock = temp_files::lock();
      remove_locked();
    }
  }

  // Removes the temporary file; the caller holds temp_files::lock().
  void remove_locked() {
    if (temp_path.empty()) return;
    ::unlink(temp_path.c_str());
    temp_files::remove(temp_path);
    temp_path.clear();
  }

  // The directory of the final path.
  std::string final_dir() const {
    const size_t slash = final_path.rfind('/');
    return slash == std::string::npos ? "." : slash == 0 ? "/" : final_path.substr(0, slash);
  }

  // Writes `size` bytes to the descriptor, retrying on EINTR and short writes.
  Status emit(const char* data, size_t size, uint64_t& written) {
    while (size > 0) {
      const ssize_t n = ::write(fd, data, size);
      if (n < 0 && errno == EINTR) continue;
      if (n < 0) return error(write_failure(errno));
      if (n == 0) return error(write_failure(ENOSPC));
      hash.update(data, size_t(n));
      written += uint64_t(n);
      data += n;
      size -= size_t(n);
    }
    return ok_status();
  }

  Status flush_out(uint64_t& written) {
    if (out_len == 0) return ok_status();
    const size_t n = out_len;
    out_len = 0;
    return emit(out.data(), n, written);
  }
};

Sink::Sink() : impl_(std::make_unique<Impl>()) {}

Sink::~Sink() {
  abort();
}

void Sink::abort() {
  if (!impl_ || impl_->committed) return;
  impl_->aborted = true;
  impl_->close_and_remove();
}

Result<std::unique_ptr<Sink>> Sink::create(const std::string& path, const SinkOptions& options) {
  std::unique_ptr<Sink> sink(new Sink());
  Impl& im = *sink->impl_;
  sink->path_ = path;
  im.final_path = path;
  sink->compression_ = options.compression.value_or(compression_for_name(path));
  im.out.resize(kBufferSize);

  if (path.empty()) return im.error("empty output path");
  if (std::string why = bad_options(options); !why.empty())
    return make_error(ErrorKind::usage, path, std::move(why));
  if (path == "-") {
    im.target = Impl::Target::stdout_fd;
    im.fd = STDOUT_FILENO;
  } else {
    struct stat st;
    if (::stat(path.c_str(), &st) == 0 && !S_ISREG(st.st_mode)) {
      if (S_ISDIR(st.st_mode)) return im.error("is a directory");
      // A device or FIFO: renaming over it makes no sense, so write to it in place.
      im.target = Impl::Target::direct;
      do {
        im.fd = ::open(path.c_str(), O_WRONLY | O_CLOEXEC);
      } while (im.fd < 0 && errno == EINTR);
      if (im.fd < 0) return im.error("cannot open: " + errno_text(errno));
    } else {
      const size_t slash = path.rfind('/');
      const std::string dir =
          slash == std::string::npos ? "." : (slash == 0 ? "/" : path.substr(0, slash));
      const std::string base = slash == std::string::npos ? path : path.substr(slash + 1);
      if (base.empty()) return im.error("not a file name (ends with '/')");
      std::string tmpl = (dir == "/" ? "" : dir) + "/." + base + ".tmp-XXXXXX";
      std::vector<char> name(tmpl.begin(), tmpl.end());
      name.push_back('\0');
      int err = 0;
      {
        // Created and registered under one lock, so a stopping process removes it too.
        auto lock = temp_files::lock();
        im.fd = ::mkostemp(name.data(), O_CLOEXEC);
        err = errno;
        if (im.fd >= 0) {
          im.temp_path = name.data();
          temp_files::add(im.temp_path);
        }
      }
      if (im.fd < 0) {
        if (err == ENOENT || err == ENOTDIR) {
          return im.error("output directory does not exist: " + dir);
        }
        return im.error("cannot create a file in " + dir + ": " + errno_text(err));
      }
    }
  }

  switch (sink->compression_) {
    case Compression::none:
      break;
    case Compression::zstd: {
      im.zstd = ZSTD_createCCtx();
      if (im.zstd == nullptr) return im.error("out of memory");
      size_t r = ZSTD_CCtx_setParameter(im.zstd, ZSTD_c_compressionLevel, options.zstd_level);
      if (ZSTD_isError(r)) {
        return im.error(std::string("bad zstd level: ") + ZSTD_getErrorName(r));
      }
      ZSTD_CCtx_setParameter(im.zstd, ZSTD_c_checksumFlag, 1);
      if (options.zstd_workers > 0) {
        // Fails when libzstd is built without threads; single-threaded output is the same format.
        (void)ZSTD_CCtx_setParameter(im.zstd, ZSTD_c_nbWorkers, options.zstd_workers);
      }
      break;
    }
    case Compression::gzip: {
      std::memset(&im.gz, 0, sizeof im.gz);
      if (deflateInit2(&im.gz, options.gzip_level, Z_DEFLATED, 15 + 16, 8, Z_DEFAULT_STRATEGY) !=
          Z_OK) {
        return im.error("bad gzip level " + std::to_string(options.gzip_level));
      }
      im.gz_ready = true;
      break;
    }
  }
  return sink;
}

Status Sink::write(std::string_view bytes) {
  Impl& im = *impl_;
  if (im.committed || im.finished) {
    return make_error(ErrorKind::internal, path_, "write after finish");
  }
  if (im.aborted) return im.error("write to an aborted output");
  Status st = ok_status();
  switch (compression_) {
    case Compression::none: {
      if (bytes.size() >= im.out.size()) {
        // Large writes go straight to the file after what is already buffered.
        st = im.flush_out(bytes_written_);
        if (st.ok()) st = im.emit(bytes.data(), bytes.size(), bytes_written_);
        break;
      }
      if (im.out_len + bytes.size() > im.out.size()) st = im.flush_out(bytes_written_);
      if (st.ok()) {
        std::memcpy(im.out.data() + im.out_len, bytes.data(), bytes.size());
        im.out_len += bytes.size();
      }
      break;
    }
    case Compression::zstd: {
      ZSTD_inBuffer in{bytes.data(), bytes.size(), 0};
      while (st.ok() && in.pos < in.size) {
        ZSTD_outBuffer out{im.out.data(), im.out.size(), im.out_len};
        const size_t r = ZSTD_compressStream2(im.zstd, &out, &in, ZSTD_e_continue);
        im.out_len = out.pos;
        if (ZSTD_isError(r)) {
          st = im.error(std::string("zstd compression failed: ") + ZSTD_getErrorName(r));
        } else if (im.out_len == im.out.size()) {
          st = im.flush_out(bytes_written_);
        }
      }
      break;
    }
    case Compression::gzip: {
      std::string_view rest = bytes;
      while (st.ok() && !rest.empty()) {
        const size_t take = std::min<size_t>(rest.size(), 1u << 30);
        im.gz.next_in = reinterpret_cast<Bytef*>(const_cast<char*>(rest.data()));
        im.gz.avail_in = uInt(take);
        while (st.ok() && im.gz.avail_in > 0) {
          im.gz.next_out = reinterpret_cast<Bytef*>(im.out.data() + im.out_len);
          im.gz.avail_out = uInt(im.out.size() - im.out_len);
          const int r = deflate(&im.gz, Z_NO_FLUSH);
          im.out_len = im.out.size() - im.gz.avail_out;
          if (r != Z_OK && r != Z_BUF_ERROR) {
            st = im.error("gzip compression failed: " + std::to_string(r));
          } else if (im.out_len == im.out.size()) {
            st = im.flush_out(bytes_written_);
          }
        }
        rest.remove_prefix(take);
      }
      break;
    }
  }
  if (!st.ok()) abort();
  return st;
}

Status Sink::finish() {
  Impl& im = *impl_;
  if (im.finished || im.committed) return ok_status();
  if (im.aborted) return im.error("finish of an aborted output");
  Status st = ok_status();
  auto fail = [&](Error e) -> Status {
    abort();
    return e;
  };

  // End the compression frame.
  if (compression_ == Compression::zstd) {
    for (;;) {
      ZSTD_inBuffer in{nullptr, 0, 0};
      ZSTD_outBuffer out{im.out.data(), im.out.size(), im.out_len};
      const size_t r = ZSTD_compressStream2(im.zstd, &out, &in, ZSTD_e_end);
      im.out_len = out.pos;
      if (ZSTD_isError(r)) {
        return fail(im.error(std::string("zstd compression failed: ") + ZSTD_getErrorName(r)));
      }
      if (r == 0) break;
      st = im.flush_out(bytes_written_);
      if (!st.ok()) return fail(std::move(st).error());
    }
  } else if (compression_ == Compression::gzip) {
    im.gz.next_in = nullptr;
    im.gz.avail_in = 0;
    for (;;) {
      im.gz.next_out = reinterpret_cast<Bytef*>(im.out.data() + im.out_len);
      im.gz.avail_out = uInt(im.out.size() - im.out_len);
      const int r = deflate(&im.gz, Z_FINISH);
      im.out_len = im.out.size() - im.gz.avail_out;
      if (r == Z_STREAM_END) break;
      if (r != Z_OK && r != Z_BUF_ERROR) {
        return fail(im.error("gzip compression failed: " + std::to_string(r)));
      }
      st = im.flush_out(bytes_written_);
      if (!st.ok()) return fail(std::move(st).error());
    }
  }
  st = im.flush_out(bytes_written_);
  if (!st.ok()) return fail(std::move(st).error());

  if (im.target == Impl::Target::temp_file) {
    if (::fsync(im.fd) != 0) return fail(im.error(write_failure(errno)));
    if (::fchmod(im.fd, 0666 & ~current_umask()) != 0) {
      return fail(im.error("cannot set file mode: " + errno_text(errno)));
    }
    const int fd = im.fd;
    im.fd = -1;
    if (::close(fd) != 0) return fail(im.error(write_failure(errno)));
  } else if (im.target == Impl::Target::direct) {
    const int fd = im.fd;
    im.fd = -1;
    if (::close(fd) != 0) return fail(im.error(write_failure(errno)));
  }
  // stdout: everything has been written with write(2); nothing is buffered in stdio.
  im.finished = true;
  sha256_ = im.hash.finish_hex();
  return ok_status();
}

Status Sink::commit() {
  OutputSet set;
  set.add(*this);
  return set.commit();
}

Status Sink::publish_locked() {
  Impl& im = *impl_;
  if (im.committed) return ok_status();
  if (!im.finished) return make_error(ErrorKind::internal, path_, "rename of an unfinished output");
  if (im.target == Impl::Target::temp_file) {
    if (::rename(im.temp_path.c_str(), im.final_path.c_str()) != 0) {
      Error e = im.error("cannot rename into place: " + errno_text(errno));
      discard_locked();
      return e;
    }
    temp_files::remove(im.temp_path);
    im.temp_path.clear();
  }
  im.committed = true;
  return ok_status();
}

void Sink::discard_locked() {
  if (impl_->committed) return;
  impl_->aborted = true;
  impl_->remove_locked();
}

bool Sink::is_directory_now() const {
  struct stat st;
  return impl_->target == Impl::Target::temp_file && ::lstat(path_.c_str(), &st) == 0 &&
         S_ISDIR(st.st_mode);
}

std::string Sink::directory() const {
  return impl_->target == Impl::Target::temp_file ? impl_->final_dir() : std::string();
}

}  // namespace evenhand::io
