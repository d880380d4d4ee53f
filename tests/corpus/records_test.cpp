// Record framing: lines, CRLF, BOM, blank lines, a last line without a terminator,
// paragraphs, and oversized records skipped without being buffered.
#include <catch2/catch.hpp>

#include "corpus/records.h"
#include "io/source.h"
#include "support/temp_dir.h"

using evenhand::corpus::Framing;
using evenhand::corpus::RawRecord;
using evenhand::corpus::RecordReader;
using evenhand::testing::TempDir;

namespace {

struct Framed {
  std::vector<std::string> records;
  std::vector<std::string> eols;
  std::vector<uint64_t> lines;
  std::vector<uint64_t> oversized_lines;
  uint64_t blanks = 0;
};

Framed frame(const std::string& bytes, Framing framing, size_t max = 1 << 20,
             size_t read_size = RecordReader::kReadSize) {
  TempDir dir;
  std::string path = dir.file("in.txt");
  evenhand::testing::write_file(path, bytes);
  auto src = evenhand::io::Source::open(path);
  REQUIRE(src.ok());
  RecordReader reader(**src, framing, max, read_size);
  Framed f;
  RawRecord r;
  for (;;) {
    auto k = reader.next(r);
    REQUIRE(k.ok());
    if (*k == RecordReader::Kind::end) break;
    if (*k == RecordReader::Kind::oversized) {
      f.oversized_lines.push_back(r.line);
      continue;
    }
    f.records.emplace_back(r.bytes);
    f.eols.emplace_back(r.eol);
    f.lines.push_back(r.line);
  }
  f.blanks = reader.blank_lines();
  return f;
}

}  // namespace

TEST_CASE("lines keep their terminators and numbers") {
  auto f = frame("{\"a\":1}\r\n\n  \n{\"b\":2}\n{\"c\":3}", Framing::lines);
  REQUIRE(f.records == std::vector<std::string>{"{\"a\":1}", "{\"b\":2}", "{\"c\":3}"});
  REQUIRE(f.eols == std::vector<std::string>{"\r\n", "\n", ""});
  REQUIRE(f.lines == std::vector<uint64_t>{1, 4, 5});
  REQUIRE(f.blanks == 2);
}

TEST_CASE("a UTF-8 BOM at the start is dropped, elsewhere kept") {
  auto f = frame("\xEF\xBB\xBFone\n\xEF\xBB\xBFtwo\n", Framing::lines);
  REQUIRE(f.records == std::vector<std::string>{"one", "\xEF\xBB\xBFtwo"});
}

TEST_CASE("a BOM is dropped also when the reads hand it out byte by byte") {
  // Found by tests/fuzz/fuzz_records (regressions/records/bom-split-across-reads).
  for (size_t read_size : {1, 2, 3, 4}) {
    auto f = frame("\xEF\xBB\xBFone\ntwo", Framing::lines, 1 << 20, read_size);
    REQUIRE(f.records == std::vector<std::string>{"one", "two"});
  }
  auto f = frame("\xEF\xBBx\n", Framing::lines, 1 << 20, 1);
  REQUIRE(f.records == std::vector<std::string>{"\xEF\xBBx"});
}

TEST_CASE("a record limit of SIZE_MAX does not wrap around") {
  // Found by tests/fuzz/fuzz_records (regressions/records/max-record-bytes-overflow).
  auto f = frame("{\"a\":1}\n{\"b\"", Framing::lines, SIZE_MAX);
  REQUIRE(f.records == std::vector<std::string>{"{\"a\":1}", "{\"b\""});
  REQUIRE(f.oversized_lines.empty());
}

TEST_CASE("empty input has no records") {
  auto f = frame("", Framing::lines);
  REQUIRE(f.records.empty());
  REQUIRE(f.blanks == 0);
}

TEST_CASE("oversized lines are reported with their line number and skipped") {
  std::string big(5000, 'x');
  auto f = frame("short\n" + big + "\nafter\n" + big, Framing::lines, 100);
  REQUIRE(f.records == std::vector<std::string>{"short", "after"});
  REQUIRE(f.oversized_lines == std::vector<uint64_t>{2, 4});
}

TEST_CASE("a line longer than the read chunk is framed whole") {
  std::string big(3 << 20, 'y');
  auto f = frame("a\n" + big + "\nb\n", Framing::lines, 4 << 20);
  REQUIRE(f.records.size() == 3);
  REQUIRE(f.records[1] == big);
  REQUIRE(f.lines == std::vector<uint64_t>{1, 2, 3});
}

TEST_CASE("an oversized line much longer than the buffer is skipped in bounded memory") {
  std::string big(5 << 20, 'z');
  auto f = frame(big + "\nnext\n", Framing::lines, 1000);
  REQUIRE(f.oversized_lines == std::vector<uint64_t>{1});
  REQUIRE(f.records == std::vector<std::string>{"next"});
}

TEST_CASE("paragraph framing joins lines and splits on blank lines") {
  auto f = frame("\n\nDear club,\r\nthanks.\n\n\n\nSecond letter\nends here", Framing::paragraphs);
  REQUIRE(f.records == std::vector<std::string>{"Dear club,\nthanks.", "Second letter\nends here"});
  REQUIRE(f.lines == std::vector<uint64_t>{3, 8});
}

TEST_CASE("an oversized paragraph is reported once") {
  auto f = frame("aaaa\nbbbb\ncccc\n\nok\n", Framing::paragraphs, 8);
  REQUIRE(f.oversized_lines == std::vector<uint64_t>{1});
  REQUIRE(f.records == std::vector<std::string>{"ok"});
}
