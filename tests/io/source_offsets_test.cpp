// Source: a corrupt compressed stream is reported at the compressed offset where the part that
// failed starts: the zstd block (the frame, for a frame header or a checksum mismatch), the
// gzip member. The streams are made here with libzstd and zlib and corrupted at known places.
#define ZSTD_STATIC_LINKING_ONLY  // ZSTD_frameHeaderSize
#include <zlib.h>
#include <zstd.h>

#include "io/io_test_support.h"
#include "io/source.h"

using namespace evenhand;
using namespace evenhand::io;
using namespace evenhand::io::test;

namespace {

// One zstd frame of `data` with a content checksum. source: libzstd (Debian libzstd-dev).
std::string zstd_frame(const std::string& data) {
  ZSTD_CCtx* c = ZSTD_createCCtx();
  REQUIRE(c != nullptr);
  ZSTD_CCtx_setParameter(c, ZSTD_c_compressionLevel, 3);
  ZSTD_CCtx_setParameter(c, ZSTD_c_checksumFlag, 1);
  std::string out(ZSTD_compressBound(data.size()), '\0');
  const size_t n = ZSTD_compress2(c, out.data(), out.size(), data.data(), data.size());
  ZSTD_freeCCtx(c);
  REQUIRE_FALSE(ZSTD_isError(n));
  out.resize(n);
  return out;
}

// Where each block of `frame` starts and its body ends (offsets in the frame). The frame
// header's size comes from libzstd; a block is a 3-byte little-endian header (Last_Block: 1
// bit, Block_Type: 2, Block_Size: 21) and a body of Block_Size bytes, one byte for an RLE
// block. source: RFC 8878 section 3.1.1.2.
struct Block {
  size_t start, body, end;
};
std::vector<Block> blocks_of(const std::string& frame) {
  size_t pos = ZSTD_frameHeaderSize(frame.data(), frame.size());
  REQUIRE_FALSE(ZSTD_isError(pos));
  std::vector<Block> out;
  for (bool last = false; !last;) {
    REQUIRE(pos + 3 <= frame.size());
    const auto* p = reinterpret_cast<const uint8_t*>(frame.data()) + pos;
    const uint32_t h = uint32_t(p[0]) | uint32_t(p[1]) << 8 | uint32_t(p[2]) << 16;
    last = (h & 1) != 0;
    const size_t body = ((h >> 1) & 3) == 1 ? 1 : h >> 3;
    out.push_back({pos, pos + 3, pos + 3 + body});
    pos += 3 + body;
  }
  return out;
}

// One gzip member of `data` (zlib's deflate with a gzip wrapper, windowBits 15 + 16).
// source: zlib manual (deflateInit2).
std::string gzip_member(const std::string& data) {
  z_stream zs{};
  REQUIRE(deflateInit2(&zs, 6, Z_DEFLATED, 15 + 16, 8, Z_DEFAULT_STRATEGY) == Z_OK);
  std::string out(deflateBound(&zs, uLong(data.size())), '\0');
  zs.next_in = reinterpret_cast<Bytef*>(const_cast<char*>(data.data()));
  zs.avail_in = uInt(data.size());
  zs.next_out = reinterpret_cast<Bytef*>(out.data());
  zs.avail_out = uInt(out.size());
  const int ret = deflate(&zs, Z_FINISH);
  out.resize(zs.total_out);
  deflateEnd(&zs);
  REQUIRE(ret == Z_STREAM_END);
  return out;
}

// Writes `bytes` to a file, drains it through Source, and returns the error it must give.
Error read_error(const TempDir& dir, const std::string& bytes) {
  const std::string path = dir.file("corrupt");
  write_file(path, bytes);
  auto src = Source::open(path);
  REQUIRE(src.ok());
  auto got = drain(**src, 4096);
  REQUIRE_FALSE(got.ok());
  CHECK(got.error().kind == ErrorKind::input);
  CHECK(got.error().file == path);
  REQUIRE(got.error().offset.has_value());
  return got.error();
}

bool has(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

}  // namespace

TEST_CASE("source: a corrupt zstd frame is reported where its block or frame starts",
          "[source][zstd]") {
  TempDir dir;
  const std::string da = sample_data(150000, 21), db = sample_data(400000, 22),
                    dc = sample_data(50000, 23);
  const std::string a = zstd_frame(da), b = zstd_frame(db), c = zstd_frame(dc);
  const std::string good = a + b + c;
  const std::vector<Block> blocks = blocks_of(b);
  REQUIRE(blocks.size() >= 3);  // 400000 bytes make blocks of at most 128 KiB
  REQUIRE(a.size() + blocks.back().end + 4 == a.size() + b.size());  // 4: the checksum
  {
    TempDir ok_dir;
    write_file(ok_dir.file("good.zst"), good);
    CHECK(read_via_source(ok_dir.file("good.zst")) == da + db + dc);
  }

  SECTION(
      "a byte flipped in a block body: that block or a later one of the frame, or the "
      "frame when only its checksum notices") {
    for (const Block& blk : blocks) {
      const size_t where = a.size() + (blk.body + blk.end) / 2;
      std::string bad = good;
      bad[where] = char(bad[where] ^ 0xFF);
      const Error e = read_error(dir, bad);
      INFO("flipped at " << where << ": " << e.message());
      CHECK(e.reason.rfind("corrupt zstd stream: ", 0) == 0);
      if (has(e.reason, "checksum")) {
        CHECK(*e.offset == a.size());
        CHECK(has(e.reason, "in the frame starting at this byte"));
      } else {
        bool at_block = false;
        for (const Block& later : blocks)
          at_block |= later.start >= blk.start && *e.offset == a.size() + later.start;
        CHECK(at_block);
        CHECK(has(e.reason, "in the block starting at this byte"));
      }
    }
  }
  SECTION("a reserved block type in the second block's header: that block") {
    std::string bad = good;
    bad[a.size() + blocks[1].start] |= 0x06;  // Block_Type 3 is reserved (RFC 8878 3.1.1.2.2)
    const Error e = read_error(dir, bad);
    INFO(e.message());
    CHECK(*e.offset == a.size() + blocks[1].start);
    CHECK(has(e.reason, "in the block starting at this byte"));
  }
  SECTION("a checksum that does not match: the frame") {
    std::string bad = good;
    bad[a.size() + b.size() - 2] ^= 0x01;
    const Error e = read_error(dir, bad);
    INFO(e.message());
    CHECK(*e.offset == a.size());
    CHECK(has(e.reason, "checksum"));
    CHECK(has(e.reason, "in the frame starting at this byte"));
  }
  SECTION("a reserved bit set in the third frame's header: that frame") {
    std::string bad = good;
    bad[a.size() + b.size() + 4] |= 0x08;  // Frame_Header_Descriptor bit 3 (RFC 8878 3.1.1.1.1)
    const Error e = read_error(dir, bad);
    INFO(e.message());
    CHECK(*e.offset == a.size() + b.size());
    CHECK(has(e.reason, "in the frame starting at this byte"));
  }
  SECTION("bytes after the last frame that are no frame: where they start") {
    const Error e = read_error(dir, good + "no frame here");
    INFO(e.message());
    CHECK(*e.offset == good.size());
  }
}

TEST_CASE("source: a corrupt gzip member is reported where the member starts", "[source][gzip]") {
  TempDir dir;
  const std::string d1 = sample_data(120000, 31), d2 = sample_data(300000, 32);
  const std::string m1 = gzip_member(d1), m2 = gzip_member(d2);
  const std::string good = m1 + m2 + m1;
  {
    TempDir ok_dir;
    write_file(ok_dir.file("good.gz"), good);
    CHECK(read_via_source(ok_dir.file("good.gz")) == d1 + d2 + d1);
  }
  // Past the 10-byte header (its MTIME, XFL and OS bytes are not checked): the deflate data
  // and the CRC-32 and ISIZE trailer (RFC 1952 section 2.3).
  for (size_t at :
       {size_t(10), m2.size() / 3, m2.size() / 2, m2.size() - 20, m2.size() - 6, m2.size() - 2}) {
    std::string bad = good;
    bad[m1.size() + at] = char(bad[m1.size() + at] ^ 0x5A);
    const Error e = read_error(dir, bad);
    INFO("flipped at " << m1.size() + at << ": " << e.message());
    CHECK(e.reason.rfind("corrupt gzip stream: ", 0) == 0);
    CHECK(has(e.reason, "in the member starting at this byte"));
    CHECK(*e.offset == m1.size());
  }
  // A bad compression method in the second member's header (byte 2 must be 8).
  std::string bad = good;
  bad[m1.size() + 2] = 7;
  const Error e = read_error(dir, bad);
  INFO(e.message());
  CHECK(*e.offset == m1.size());
}
