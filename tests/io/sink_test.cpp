// Sink: round trips through Source, output checked by the reference zstd/gzip tools, and the
// all-or-nothing promises (temp file beside the target, rename on commit, cleanup on abort).
#include <fcntl.h>
#include <signal.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <unistd.h>

#include "base/sha256.h"
#include "io/io_test_support.h"
#include "io/sink.h"
#include "io/source.h"

using namespace evenhand;
using namespace evenhand::io;
using namespace evenhand::io::test;

namespace {

std::unique_ptr<Sink> make_sink(const std::string& path, SinkOptions opt = {}) {
  auto s = Sink::create(path, opt);
  INFO((s.ok() ? std::string() : s.error().message()));
  REQUIRE(s.ok());
  return std::move(s).value();
}

// Writes `data` in pieces of changing size (0, 1, 2, 5, ... bytes) to exercise buffering.
void write_in_pieces(Sink& sink, const std::string& data) {
  size_t pos = 0;
  size_t piece = 0;
  while (pos < data.size()) {
    const size_t n = std::min(piece, data.size() - pos);
    REQUIRE(sink.write(std::string_view(data).substr(pos, n)).ok());
    pos += n;
    piece = piece > 300000 ? 0 : piece * 2 + 1;
  }
}

bool has_temp_files(const TempDir& dir) {
  for (const std::string& e : dir.entries())
    if (e.find(".tmp-") != std::string::npos) return true;
  return false;
}

const char* suffix_for(Compression c) {
  switch (c) {
    case Compression::zstd:
      return ".zst";
    case Compression::gzip:
      return ".gz";
    case Compression::none:
      break;
  }
  return ".txt";
}

}  // namespace

TEST_CASE("sink: round trips through Source for every compression", "[sink]") {
  TempDir dir;
  for (Compression c : {Compression::none, Compression::zstd, Compression::gzip}) {
    for (size_t size : {size_t(0), size_t(1), size_t((1 << 20) + 1)}) {
      INFO(compression_name(c) << " size " << size);
      const std::string data = sample_data(size, unsigned(size) + 5);
      const std::string path = dir.file(std::string("out") + suffix_for(c));
      auto sink = make_sink(path);
      CHECK(sink->compression() == c);
      write_in_pieces(*sink, data);
      REQUIRE(sink->commit().ok());
      CHECK_FALSE(has_temp_files(dir));

      const std::string raw = read_file(path);
      CHECK(sink->bytes_written() == raw.size());
      CHECK(sink->sha256() == sha256_hex(raw));

      auto src = Source::open(path);
      REQUIRE(src.ok());
      // Empty plain output is an empty file; compressed output always has a header.
      CHECK((*src)->compression() == c);
      auto got = drain(**src, 3333);
      REQUIRE(got.ok());
      CHECK(*got == data);
      CHECK((*src)->raw_sha256() == sink->sha256());
    }
  }
}

TEST_CASE("sink: explicit compression overrides the name, and zstd workers", "[sink]") {
  TempDir dir;
  const std::string data = sample_data(3 << 20, 21);
  SinkOptions opt;
  opt.compression = Compression::zstd;
  opt.zstd_level = 1;
  opt.zstd_workers = 2;
  const std::string path = dir.file("named-plain.jsonl");
  auto sink = make_sink(path, opt);
  CHECK(sink->compression() == Compression::zstd);
  write_in_pieces(*sink, data);
  REQUIRE(sink->commit().ok());
  auto src = Source::open(path);
  REQUIRE(src.ok());
  CHECK((*src)->compression() == Compression::zstd);
  auto got = drain(**src);
  REQUIRE(got.ok());
  CHECK(*got == data);
}

TEST_CASE("sink: our zstd output passes the zstd command", "[sink][zstd]") {
  require_tool("zstd");
  TempDir dir;
  for (size_t size : {size_t(0), size_t(1), size_t(2500000)}) {
    INFO("size " << size);
    const std::string data = sample_data(size, 31);
    const std::string path = dir.file("ours.zst");
    SinkOptions opt;
    opt.zstd_level = 9;
    auto sink = make_sink(path, opt);
    write_in_pieces(*sink, data);
    REQUIRE(sink->commit().ok());
    // source: zstd command-line tool (Debian package zstd): -t tests integrity.
    CHECK(run("zstd -q -t " + quote(path)) == 0);
    const std::string back = dir.file("ours.back");
    REQUIRE(run("zstd -q -d -c " + quote(path) + " > " + quote(back)) == 0);
    CHECK(read_file(back) == data);
  }
}

TEST_CASE("sink: our gzip output passes the gzip command", "[sink][gzip]") {
  require_tool("gzip");
  TempDir dir;
  for (size_t size : {size_t(0), size_t(1), size_t(2500000)}) {
    INFO("size " << size);
    const std::string data = sample_data(size, 41);
    const std::string path = dir.file("ours.gz");
    auto sink = make_sink(path);
    write_in_pieces(*sink, data);
    REQUIRE(sink->commit().ok());
    // source: gzip command-line tool (Debian package gzip): -t tests integrity.
    CHECK(run("gzip -t " + quote(path)) == 0);
    const std::string back = dir.file("ours.back");
    REQUIRE(run("gzip -d -c " + quote(path) + " > " + quote(back)) == 0);
    CHECK(read_file(back) == data);
  }
}

TEST_CASE("sink: nothing under the final name before commit, and abort cleans up", "[sink]") {
  TempDir dir;
  const std::string path = dir.file("result.jsonl");

  SECTION("abort") {
    auto sink = make_sink(path);
    REQUIRE(sink->write("{\"a\":1}\n").ok());
    CHECK_FALSE(exists(path));
    CHECK(has_temp_files(dir));
    sink->abort();
    sink->abort();  // twice is harmless
    CHECK_FALSE(exists(path));
    CHECK(dir.entries().empty());
    CHECK_FALSE(sink->write("more").ok());
    CHECK_FALSE(sink->commit().ok());
    CHECK_FALSE(exists(path));
  }
  SECTION("destroyed without commit") {
    {
      auto sink = make_sink(path);
      REQUIRE(sink->write(sample_data(2 << 20, 1)).ok());  // bigger than the buffer
    }
    CHECK(dir.entries().empty());
  }
  SECTION("temp file lives beside the target with a hidden name") {
    auto sink = make_sink(path);
    const auto names = dir.entries();
    REQUIRE(names.size() == 1);
    CHECK(names[0].rfind(".result.jsonl.tmp-", 0) == 0);
    REQUIRE(sink->commit().ok());
    CHECK(dir.entries() == std::vector<std::string>{"result.jsonl"});
  }
}

TEST_CASE("sink: an existing file is replaced only on commit, by rename", "[sink]") {
  TempDir dir;
  const std::string path = dir.file("data.txt");
  write_file(path, "old contents\n");

  {
    auto sink = make_sink(path);
    REQUIRE(sink->write("new contents that are not kept\n").ok());
    sink->abort();
  }
  CHECK(read_file(path) == "old contents\n");

  auto sink = make_sink(path);
  REQUIRE(sink->write("new contents\n").ok());
  CHECK(read_file(path) == "old contents\n");
  std::string temp;
  for (const std::string& e : dir.entries())
    if (e.find(".tmp-") != std::string::npos) temp = dir.file(e);
  REQUIRE_FALSE(temp.empty());
  struct stat tst;
  REQUIRE(::stat(temp.c_str(), &tst) == 0);

  REQUIRE(sink->commit().ok());
  CHECK(read_file(path) == "new contents\n");
  struct stat fst;
  REQUIRE(::stat(path.c_str(), &fst) == 0);
  // The committed file is the temporary file itself (rename(2)), not a copy.
  CHECK(fst.st_ino == tst.st_ino);
  CHECK_FALSE(exists(temp));
  CHECK(sink->commit().ok());  // a second commit is a no-op
}

TEST_CASE("sink: committed file gets 0666 minus the umask", "[sink]") {
  TempDir dir;
  const mode_t old = ::umask(027);
  const std::string path = dir.file("mode.txt");
  auto sink = Sink::create(path, {});
  bool ok = sink.ok() && (*sink)->write("x").ok() && (*sink)->commit().ok();
  ::umask(old);
  REQUIRE(ok);
  struct stat st;
  REQUIRE(::stat(path.c_str(), &st) == 0);
  // common practice: new files are created 0666 & ~umask (what open(2) with O_CREAT does).
  CHECK((st.st_mode & 07777) == 0640);
}

TEST_CASE("sink: unwritable output locations", "[sink]") {
  TempDir dir;
  SECTION("missing directory") {
    const std::string path = dir.file("no/such/dir/out.jsonl");
    auto s = Sink::create(path, {});
    REQUIRE_FALSE(s.ok());
    CHECK(s.error().kind == ErrorKind::output);
    CHECK(s.error().file == path);
    CHECK(s.error().reason.find("does not exist") != std::string::npos);
  }
  SECTION("target is a directory") {
    auto s = Sink::create(dir.path().string(), {});
    REQUIRE_FALSE(s.ok());
    CHECK(s.error().kind == ErrorKind::output);
  }
  SECTION("read-only directory") {
    const std::string sub = dir.file("ro");
    REQUIRE(::mkdir(sub.c_str(), 0555) == 0);
    auto check = [&]() -> int {
      auto s = Sink::create(sub + "/out.txt", {});
      if (s.ok()) return 1;
      if (s.error().kind != ErrorKind::output) return 2;
      return s.error().reason.find("Permission denied") != std::string::npos ? 0 : 3;
    };
    if (::geteuid() == 0) {
      // root writes into a read-only directory anyway (CAP_DAC_OVERRIDE): check as "nobody",
      // who may enter the directory but not write there.
      REQUIRE(::chmod(dir.path().c_str(), 0755) == 0);
      CHECK(as_nobody(check) == 0);
    } else {
      CHECK(check() == 0);
    }
  }
}

// /dev/full fails every write with ENOSPC. source: Linux null(4)/full(4) man page
// (Debian package manpages).
TEST_CASE("sink: /dev/full reports disk full", "[sink]") {
  struct stat st;
  if (::stat("/dev/full", &st) != 0 || !S_ISCHR(st.st_mode)) {
    WARN("/dev/full is not available here; case skipped");
    return;
  }
  for (Compression c : {Compression::none, Compression::zstd}) {
    SinkOptions opt;
    opt.compression = c;
    auto s = Sink::create("/dev/full", opt);
    REQUIRE(s.ok());
    Sink& sink = **s;
    Status w = sink.write("a small record\n");
    Status result = w.ok() ? sink.commit() : w;
    REQUIRE_FALSE(result.ok());
    CHECK(result.error().kind == ErrorKind::output);
    CHECK(result.error().file == "/dev/full");
    CHECK(result.error().reason == "disk full");
    CHECK_FALSE(sink.write("more").ok());  // aborted after the error
  }
  // A big write fails in write() itself once the buffer fills.
  auto s = Sink::create("/dev/full", {});
  REQUIRE(s.ok());
  Status w = (*s)->write(std::string(3 << 20, 'z'));
  REQUIRE_FALSE(w.ok());
  CHECK(w.error().reason == "disk full");
  // The device is still a device: nothing was renamed over it.
  REQUIRE(::stat("/dev/full", &st) == 0);
  CHECK(S_ISCHR(st.st_mode));
}

TEST_CASE("sink: /dev/null is written in place", "[sink]") {
  struct stat st;
  if (::stat("/dev/null", &st) != 0 || !S_ISCHR(st.st_mode)) {
    WARN("/dev/null is not available here; case skipped");
    return;
  }
  auto s = Sink::create("/dev/null", {});
  REQUIRE(s.ok());
  REQUIRE((*s)->write("discarded\n").ok());
  REQUIRE((*s)->commit().ok());
  CHECK((*s)->bytes_written() == 10);
  REQUIRE(::stat("/dev/null", &st) == 0);
  CHECK(S_ISCHR(st.st_mode));
}

// A write error in the middle of a regular file: the file size limit (RLIMIT_FSIZE, with
// SIGXFSZ ignored) makes write(2) fail with EFBIG. source: POSIX setrlimit / write(2).
TEST_CASE("sink: a write error leaves nothing behind", "[sink]") {
  TempDir dir;
  const std::string path = dir.file("big.txt");
  struct rlimit old_limit;
  REQUIRE(::getrlimit(RLIMIT_FSIZE, &old_limit) == 0);
  struct sigaction ignore = {}, old_action = {};
  ignore.sa_handler = SIG_IGN;
  REQUIRE(::sigaction(SIGXFSZ, &ignore, &old_action) == 0);
  struct rlimit small = old_limit;
  small.rlim_cur = 100000;
  REQUIRE(::setrlimit(RLIMIT_FSIZE, &small) == 0);

  auto s = Sink::create(path, {});
  Status w = s.ok() ? (*s)->write(std::string(3 << 20, 'q')) : Status(s.error());
  Status again = s.ok() ? (*s)->commit() : ok_status();

  ::setrlimit(RLIMIT_FSIZE, &old_limit);
  ::sigaction(SIGXFSZ, &old_action, nullptr);

  REQUIRE(s.ok());
  REQUIRE_FALSE(w.ok());
  CHECK(w.error().kind == ErrorKind::output);
  CHECK(w.error().reason.rfind("write failed: ", 0) == 0);
  CHECK_FALSE(again.ok());
  CHECK_FALSE(exists(path));
  CHECK(dir.entries().empty());
}

TEST_CASE("sink: \"-\" writes to standard output", "[sink]") {
  TempDir dir;
  const std::string capture = dir.file("stdout.zst");
  const int file = ::open(capture.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0600);
  REQUIRE(file >= 0);
  std::fflush(stdout);
  const int saved = ::dup(STDOUT_FILENO);
  REQUIRE(saved >= 0);
  REQUIRE(::dup2(file, STDOUT_FILENO) == STDOUT_FILENO);
  ::close(file);

  SinkOptions opt;
  opt.compression = Compression::zstd;
  const std::string data = sample_data(100000, 51);
  auto s = Sink::create("-", opt);
  const bool ok = s.ok() && (*s)->write(data).ok() && (*s)->commit().ok();
  s = Result<std::unique_ptr<Sink>>(make_error(ErrorKind::internal, "", "released"));

  ::dup2(saved, STDOUT_FILENO);
  ::close(saved);
  REQUIRE(ok);
  // Standard output itself is still open and usable.
  CHECK(::fcntl(STDOUT_FILENO, F_GETFD) != -1);
  CHECK(read_via_source(capture) == data);
  CHECK(dir.entries() == std::vector<std::string>{"stdout.zst"});
}

TEST_CASE("sink: compression chosen from the name", "[sink]") {
  CHECK(compression_for_name("corpus.jsonl.zst") == Compression::zstd);
  CHECK(compression_for_name("corpus.jsonl.zstd") == Compression::zstd);
  CHECK(compression_for_name("corpus.jsonl.gz") == Compression::gzip);
  CHECK(compression_for_name("corpus.jsonl") == Compression::none);
  CHECK(compression_for_name("dir.gz/corpus") == Compression::none);
  CHECK(compression_for_name("-") == Compression::none);
}
