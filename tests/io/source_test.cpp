// Source: reading plain, zstd and gzip input made by the reference command-line tools, with
// multiple frames/members, skippable frames, truncation, corruption and unreadable paths.
#include <fcntl.h>
#include <unistd.h>

#include <thread>

#include "base/sha256.h"
#include "io/io_test_support.h"
#include "io/source.h"

using namespace evenhand;
using namespace evenhand::io;
using namespace evenhand::io::test;

namespace {

// Little-endian 32-bit value, as zstd frame headers use (RFC 8878 section 3.1).
std::string le32(uint32_t v) {
  std::string s(4, '\0');
  for (int i = 0; i < 4; ++i) s[i] = char((v >> (8 * i)) & 0xFF);
  return s;
}

// A skippable frame: magic 0x184D2A5? (any low nibble), 4-byte little-endian Frame_Size,
// then Frame_Size bytes of user data. source: RFC 8878 section 3.1.2 (Skippable Frames).
std::string skippable_frame(uint32_t nibble, const std::string& payload) {
  return le32(0x184D2A50u | (nibble & 0xF)) + le32(uint32_t(payload.size())) + payload;
}

std::string zstd_file(const TempDir& dir, const std::string& name, const std::string& data,
                      const std::string& flags = "-q") {
  const std::string plain = dir.file(name + ".txt");
  write_file(plain, data);
  const std::string out = dir.file(name + ".zst");
  // source: zstd command-line tool (Debian package zstd).
  REQUIRE(run("zstd " + flags + " -f -o " + quote(out) + " " + quote(plain)) == 0);
  return out;
}

std::string gzip_file(const TempDir& dir, const std::string& name, const std::string& data,
                      const std::string& flags = "-n") {
  const std::string plain = dir.file(name + ".txt");
  write_file(plain, data);
  const std::string out = dir.file(name + ".gz");
  // source: gzip command-line tool (Debian package gzip).
  REQUIRE(run("gzip " + flags + " -c " + quote(plain) + " > " + quote(out)) == 0);
  return out;
}

}  // namespace

TEST_CASE("source: plain file, sizes, offsets and raw hash", "[source]") {
  TempDir dir;
  for (size_t size : {size_t(0), size_t(1), size_t(3), size_t((1 << 20) + 1), size_t(3 << 20)}) {
    INFO("size " << size);
    const std::string data = sample_data(size, unsigned(size));
    const std::string path = dir.file("plain.bin");
    write_file(path, data);
    auto src = Source::open(path);
    REQUIRE(src.ok());
    CHECK((*src)->compression() == Compression::none);
    REQUIRE((*src)->raw_size().has_value());
    CHECK(*(*src)->raw_size() == size);
    CHECK((*src)->path() == path);
    auto got = drain(**src, 1000);
    REQUIRE(got.ok());
    CHECK(*got == data);
    CHECK((*src)->raw_offset() == size);
    CHECK((*src)->raw_sha256() == sha256_hex(data));
    // Further reads keep returning 0.
    char c;
    auto again = (*src)->read(&c, 1);
    REQUIRE(again.ok());
    CHECK(*again == 0);
  }
}

TEST_CASE("source: reads files made by the zstd command", "[source][zstd]") {
  require_tool("zstd");
  TempDir dir;
  for (size_t size : {size_t(0), size_t(1), size_t(100000), size_t(3 << 20)}) {
    INFO("size " << size);
    const std::string data = sample_data(size, 7);
    const std::string path = zstd_file(dir, "z", data);
    auto src = Source::open(path);
    REQUIRE(src.ok());
    CHECK((*src)->compression() == Compression::zstd);
    auto got = drain(**src, 4096);
    INFO((got.ok() ? "" : got.error().message()));
    REQUIRE(got.ok());
    CHECK(*got == data);
    const std::string raw = read_file(path);
    CHECK((*src)->raw_offset() == raw.size());
    CHECK((*src)->raw_sha256() == sha256_hex(raw));
  }
  // A high level with long-distance matching and no checksum is still one ordinary frame.
  const std::string data = sample_data(500000, 8);
  CHECK(read_via_source(zstd_file(dir, "z19", data, "-q -19 --long --no-check")) == data);
}

TEST_CASE("source: multi-frame zstd and skippable frames", "[source][zstd]") {
  require_tool("zstd");
  TempDir dir;
  const std::string a = sample_data(200000, 1);
  const std::string b = sample_data(70000, 2);
  const std::string raw_a = read_file(zstd_file(dir, "a", a));
  const std::string raw_b = read_file(zstd_file(dir, "b", b));

  SECTION("two frames (cat a.zst b.zst)") {
    const std::string path = dir.file("ab.zst");
    REQUIRE(run("cat " + quote(dir.file("a.zst")) + " " + quote(dir.file("b.zst")) + " > " +
                quote(path)) == 0);
    CHECK(read_via_source(path) == a + b);
    // source: zstd command-line tool agrees on the concatenation.
    CHECK(run("zstd -q -t " + quote(path)) == 0);
  }
  SECTION("file starting with a skippable frame") {
    const std::string path = dir.file("skip-first.zst");
    write_file(path, skippable_frame(0xA, "manifest: not part of the content") + raw_a);
    // Cross-check the hand-made frame with the reference decoder.
    CHECK(run("zstd -q -t " + quote(path)) == 0);
    auto src = Source::open(path);
    REQUIRE(src.ok());
    CHECK((*src)->compression() == Compression::zstd);
    auto got = drain(**src, 777);
    REQUIRE(got.ok());
    CHECK(*got == a);
  }
  SECTION("skippable frames between and after data frames, empty skippable payload") {
    const std::string path = dir.file("skip-mid.zst");
    write_file(path, raw_a + skippable_frame(0, "") + skippable_frame(0xF, std::string(5000, 'x')) +
                         raw_b + skippable_frame(3, "tail"));
    CHECK(run("zstd -q -t " + quote(path)) == 0);
    CHECK(read_via_source(path) == a + b);
  }
  SECTION("only a skippable frame") {
    const std::string path = dir.file("skip-only.zst");
    write_file(path, skippable_frame(5, "abc"));
    auto src = Source::open(path);
    REQUIRE(src.ok());
    CHECK((*src)->compression() == Compression::zstd);
    auto got = drain(**src);
    REQUIRE(got.ok());
    CHECK(got->empty());
  }
  SECTION("garbage after a frame is an error") {
    const std::string path = dir.file("trail.zst");
    write_file(path, raw_a + "not a frame");
    auto src = Source::open(path);
    REQUIRE(src.ok());
    auto got = drain(**src);
    REQUIRE_FALSE(got.ok());
    CHECK(got.error().kind == ErrorKind::input);
    CHECK(got.error().reason.rfind("corrupt zstd stream: ", 0) == 0);
  }
}

TEST_CASE("source: reads gzip files, including multi-member", "[source][gzip]") {
  require_tool("gzip");
  TempDir dir;
  const std::string a = sample_data(300000, 3);
  const std::string b = sample_data(12345, 4);
  const std::string ga = gzip_file(dir, "a", a);
  const std::string gb = gzip_file(dir, "b", b, "-n -9");

  auto src = Source::open(ga);
  REQUIRE(src.ok());
  CHECK((*src)->compression() == Compression::gzip);
  auto got = drain(**src, 1);  // one byte at a time also works (short outputs)
  REQUIRE(got.ok());
  CHECK(*got == a);
  CHECK((*src)->raw_sha256() == sha256_hex(read_file(ga)));

  const std::string ab = dir.file("ab.gz");
  REQUIRE(run("cat " + quote(ga) + " " + quote(gb) + " " + quote(ga) + " > " + quote(ab)) == 0);
  // source: gzip -t accepts the concatenation (RFC 1952 section 2.2: a file is a series of
  // members).
  CHECK(run("gzip -t " + quote(ab)) == 0);
  CHECK(read_via_source(ab) == a + b + a);

  const std::string empty = gzip_file(dir, "e", "");
  CHECK(read_via_source(empty).empty());

  // Bytes after the last member that do not start a new member.
  const std::string trail = dir.file("trail.gz");
  write_file(trail, read_file(ga) + "garbage");
  auto t = Source::open(trail);
  REQUIRE(t.ok());
  auto tg = drain(**t);
  REQUIRE_FALSE(tg.ok());
  CHECK(tg.error().kind == ErrorKind::input);
  CHECK(tg.error().file == trail);
}

TEST_CASE("source: truncated streams are errors with the offset", "[source]") {
  require_tool("zstd");
  require_tool("gzip");
  TempDir dir;
  const std::string data = sample_data(400000, 9);
  for (const std::string& path : {zstd_file(dir, "t", data), gzip_file(dir, "t", data)}) {
    const bool is_zstd = path.size() > 4 && path.substr(path.size() - 4) == ".zst";
    const std::string raw = read_file(path);
    const std::string cut = dir.file(is_zstd ? "cut.zst" : "cut.gz");
    write_file(cut, raw.substr(0, raw.size() / 2));
    auto src = Source::open(cut);
    REQUIRE(src.ok());
    auto got = drain(**src);
    INFO(path);
    REQUIRE_FALSE(got.ok());
    const Error& e = got.error();
    CHECK(e.kind == ErrorKind::input);
    CHECK(e.file == cut);
    CHECK(e.reason == (is_zstd ? "truncated zstd stream" : "truncated gzip stream"));
    REQUIRE(e.offset.has_value());
    CHECK(*e.offset == raw.size() / 2);
    CHECK(e.message().find("truncated") != std::string::npos);
  }
}

TEST_CASE("source: every strict prefix of a small compressed file is an error", "[source]") {
  require_tool("zstd");
  require_tool("gzip");
  TempDir dir;
  const std::string data = sample_data(3000, 10);
  // Prefixes shorter than the magic number are plain files; from there on each must fail.
  for (const std::string& path : {zstd_file(dir, "p", data), gzip_file(dir, "p", data)}) {
    const std::string raw = read_file(path);
    const size_t magic = path.substr(path.size() - 3) == "zst" ? 4 : 2;
    for (size_t len = magic; len < raw.size(); ++len) {
      const std::string cut = dir.file("prefix");
      write_file(cut, raw.substr(0, len));
      auto src = Source::open(cut);
      REQUIRE(src.ok());
      auto got = drain(**src, 512);
      INFO(path << " cut at " << len);
      REQUIRE_FALSE(got.ok());
      CHECK(got.error().offset.has_value());
    }
  }
}

TEST_CASE("source: corrupt bytes are errors, never a crash", "[source]") {
  require_tool("zstd");
  require_tool("gzip");
  TempDir dir;
  const std::string data = sample_data(200000, 11);
  for (const std::string& path : {zstd_file(dir, "c", data), gzip_file(dir, "c", data)}) {
    const bool is_zstd = path.substr(path.size() - 3) == "zst";
    const std::string raw = read_file(path);
    // Flip bytes inside the compressed body (not the header, whose gzip MTIME is unchecked).
    for (size_t where : {raw.size() / 4, raw.size() / 2, raw.size() - 6}) {
      std::string bad = raw;
      bad[where] = char(bad[where] ^ 0x5A);
      const std::string cut = dir.file("corrupt");
      write_file(cut, bad);
      auto src = Source::open(cut);
      REQUIRE(src.ok());
      auto got = drain(**src);
      INFO(path << " flipped at " << where);
      REQUIRE_FALSE(got.ok());
      CHECK(got.error().kind == ErrorKind::input);
      CHECK(got.error().offset.has_value());
      CHECK(got.error().reason.rfind(is_zstd ? "corrupt zstd stream: " : "corrupt gzip stream: ",
                                     0) == 0);
    }
  }
}

TEST_CASE("source: unreadable paths", "[source]") {
  TempDir dir;
  SECTION("missing file") {
    const std::string path = dir.file("nope.jsonl");
    auto src = Source::open(path);
    REQUIRE_FALSE(src.ok());
    CHECK(src.error().kind == ErrorKind::input);
    CHECK(src.error().file == path);
    CHECK(src.error().reason == "cannot open: No such file or directory");
  }
  SECTION("directory") {
    auto src = Source::open(dir.path().string());
    REQUIRE_FALSE(src.ok());
    CHECK(src.error().kind == ErrorKind::input);
    CHECK(src.error().reason == "is a directory");
  }
  SECTION("no read permission") {
    const std::string path = dir.file("locked");
    write_file(path, "secret");
    REQUIRE(::chmod(path.c_str(), 0) == 0);
    auto check = [&]() -> int {
      auto src = Source::open(path);
      if (src.ok()) return 1;
      if (src.error().kind != ErrorKind::input) return 2;
      return src.error().reason == "cannot open: Permission denied" ? 0 : 3;
    };
    if (::geteuid() == 0) {
      // root reads a file of mode 000 anyway (CAP_DAC_OVERRIDE): check as "nobody", who may
      // enter the directory but not read the file.
      REQUIRE(::chmod(dir.path().c_str(), 0755) == 0);
      CHECK(as_nobody(check) == 0);
    } else {
      CHECK(check() == 0);
    }
  }
}

// A pipe gives short reads (even during sniffing) and has no size.
TEST_CASE("source: zstd through a pipe fed in small pieces", "[source][zstd]") {
  require_tool("zstd");
  TempDir dir;
  const std::string data = sample_data(150000, 12);
  const std::string raw = read_file(zstd_file(dir, "pipe", data));
  int fds[2];
  REQUIRE(::pipe(fds) == 0);
  std::thread writer([&] {
    size_t pos = 0;
    size_t piece = 1;
    while (pos < raw.size()) {
      const size_t n = std::min(piece, raw.size() - pos);
      const ssize_t w = ::write(fds[1], raw.data() + pos, n);
      if (w <= 0) break;
      pos += size_t(w);
      piece = piece < 4096 ? piece * 3 : 1;
    }
    ::close(fds[1]);
  });
  auto src = Source::open("/dev/fd/" + std::to_string(fds[0]));
  std::string got;
  bool ok = src.ok();
  std::optional<uint64_t> size;
  Compression c = Compression::none;
  if (ok) {
    size = (*src)->raw_size();
    c = (*src)->compression();
    auto r = drain(**src, 10000);
    ok = r.ok();
    if (ok) got = *r;
  }
  writer.join();
  ::close(fds[0]);
  REQUIRE(ok);
  CHECK(c == Compression::zstd);
  CHECK_FALSE(size.has_value());
  CHECK(got == data);
  CHECK((*src)->raw_sha256() == sha256_hex(raw));
}

TEST_CASE("source: \"-\" reads standard input", "[source][gzip]") {
  require_tool("gzip");
  TempDir dir;
  const std::string data = sample_data(50000, 13);
  const std::string path = gzip_file(dir, "stdin", data);
  const int file = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  REQUIRE(file >= 0);
  const int saved = ::dup(STDIN_FILENO);
  REQUIRE(saved >= 0);
  REQUIRE(::dup2(file, STDIN_FILENO) == STDIN_FILENO);
  ::close(file);
  auto src = Source::open("-");
  Result<std::string> got = src.ok() ? drain(**src) : Result<std::string>(src.error());
  Compression c = src.ok() ? (*src)->compression() : Compression::none;
  ::dup2(saved, STDIN_FILENO);
  ::close(saved);
  REQUIRE(got.ok());
  CHECK(c == Compression::gzip);
  CHECK(*got == data);
  CHECK((*src)->path() == "-");
}

TEST_CASE("source: compression names", "[source]") {
  CHECK(std::string(compression_name(Compression::none)) == "none");
  CHECK(std::string(compression_name(Compression::gzip)) == "gzip");
  CHECK(std::string(compression_name(Compression::zstd)) == "zstd");
}
