// Numeric options of every command: a value out of range, unparsable, or negative for an
// unsigned option is one usage line (exit 2) naming the option and its range, found before
// any file is made; the range's own ends are accepted.
#include <catch2/catch.hpp>

#include <algorithm>
#include <filesystem>
#include <set>

#include "support/temp_dir.h"

using evenhand::testing::Ran;
using evenhand::testing::run_evenhand;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

namespace {

constexpr int kUsage = 2;  // README, exit codes

struct BadOption {
  std::string command;  // the command line after "evenhand", {out} stands for the output
  std::string out;      // output file name in the temporary directory
  std::string expect;   // part of the message: the option and its allowed range
};

// The names in `d` apart from the ones a test made itself: leftovers such as temporary files.
std::set<std::string> leftovers(const TempDir& d) {
  std::set<std::string> names;
  for (const auto& e : std::filesystem::directory_iterator(d.path())) {
    std::string n = e.path().filename().string();
    if (n != "in.jsonl" && n != "m.json" && n != "stdout" && n != "stderr") names.insert(n);
  }
  return names;
}

std::string with_out(std::string cmd, const std::string& out) {
  auto at = cmd.find("{out}");
  return at == std::string::npos ? cmd : cmd.replace(at, 5, out);
}

}  // namespace

TEST_CASE("a bad numeric option is a usage error naming the option and its range") {
  TempDir d;
  write_file(d.file("in.jsonl"), "{\"text\":\"she went home\"}\n");
  write_file(d.file("m.json"), "{}\n");
  const std::string in = " --in " + d.file("in.jsonl");
  const std::string run = "run --pack en-gender" + in + " --out {out}";
  const std::string tally = "tally --pack en-gender" + in + " --out {out}";
  const std::string assoc = "associations --pack en-gender" + in + " --out {out}";
  const std::string report = "report --manifest " + d.file("m.json") + " --out {out}";
  const std::string review = "review " + d.file("in.jsonl");  // writes to stdout
  const std::string balance = run + " --mode balance --target female=1,male=1";
  const BadOption cases[] = {
      {run + " --threads -1", "o.jsonl",
       "--threads must be a whole number from 0 to 256, not '-1'"},
      {run + " --threads 99999", "o.jsonl", "--threads must be a whole number from 0 to 256"},
      {run + " --threads 2.5", "o.jsonl", "--threads must be a whole number from 0 to 256"},
      {run + " --threads=-3", "o.jsonl", "--threads must be a whole number from 0 to 256"},
      // zlib's levels: -1 (its default) to 9 (source: zlib manual, deflateInit)
      {run + " --gzip-level 42", "o.jsonl.gz", "--gzip-level must be a whole number from -1 to 9"},
      {run + " --gzip-level -2", "o.jsonl.gz", "--gzip-level must be a whole number from -1 to 9"},
      // libzstd's highest level is 22 (source: zstd manual, ZSTD_maxCLevel)
      {run + " --zstd-level 100", "o.jsonl.zst", "--zstd-level must be a whole number from -"},
      {run + " --zstd-level 23", "o.jsonl.zst", " to 22, not '23'"},
      {run + " --zstd-threads -1", "o.jsonl.zst", "--zstd-threads must be a whole number from 0"},
      {run + " --seed -1", "o.jsonl",
       "--seed must be a whole number from 0 to 18446744073709551615"},
      {run + " --seed 18446744073709551616", "o.jsonl", "--seed must be a whole number from 0"},
      {run + " --seed 12abc", "o.jsonl", "--seed must be a whole number"},
      {run + " --mode substitute --rate 2", "o.jsonl", "--rate must be a number from 0 to 1"},
      {run + " --rate nan", "o.jsonl", "--rate must be a number from 0 to 1, not 'nan'"},
      {run + " --max-record-bytes 0", "o.jsonl",
       "--max-record-bytes must be a byte count from 1 to 2G"},
      {run + " --max-record-bytes 99999999999999G", "o.jsonl", "--max-record-bytes must be"},
      {run + " --max-record-bytes -1", "o.jsonl", "--max-record-bytes must be"},
      {balance + " --tolerance 1", "o.jsonl", "--tolerance must be a number above 0 and below 1"},
      {tally + " --threads 1000", "t.json", "--threads must be a whole number from 0 to 256"},
      {tally + " --threads -5", "t.json", "--threads must be a whole number from 0"},
      {"plan --tally " + d.file("m.json") +
           " --target female=1,male=1 --out {out} --tolerance -0.1",
       "p.json", "--tolerance must be a number above 0 and below 1"},
      {review + " --sample -1", "-", "--sample must be a whole number from 0 to 1000000"},
      {review + " --width 3", "-", "--width must be a whole number from 20 to 1000"},
      {review + " --context 201", "-", "--context must be a whole number from 0 to 200"},
      {review + " --context -1", "-", "--context must be a whole number from 0 to 200"},
      {review + " --seed -1", "-", "--seed must be a whole number from 0"},
      {report + " --sample -1", "r.html", "--sample must be a whole number from 0 to 1000000"},
      {assoc + " --window 0", "a.json", "--window must be a whole number from 1 to 1000"},
      {assoc + " --min-cooccurrences -1", "a.json",
       "--min-cooccurrences must be a whole number from 0"},
      {assoc + " --prior nan", "a.json", "--prior must be a number above 0, not 'nan'"},
  };
  for (const auto& c : cases) {
    std::string cmd = with_out(c.command, d.file(c.out));
    INFO(cmd);
    Ran r = run_evenhand(d, cmd);
    INFO(r.err);
    CHECK(r.code == kUsage);
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    CHECK(r.err.rfind("evenhand: ", 0) == 0);
    CHECK(r.err.find(c.expect) != std::string::npos);
    CHECK(leftovers(d).empty());
  }
}

TEST_CASE("the ends of each numeric option's range are accepted") {
  TempDir d;
  write_file(d.file("in.jsonl"), "{\"text\":\"she went home\"}\n");
  const std::string run = "run -q --pack en-gender --in " + d.file("in.jsonl") + " --out ";
  const std::string ok[] = {
      run + d.file("a.jsonl") + " --threads 0 --seed 18446744073709551615",
      run + d.file("b.jsonl") + " --threads 256 --seed 0 --max-record-bytes 2G",
      run + d.file("c.jsonl") +
          " --mode substitute --rate 0 --max-record-bytes 1 --on-bad-record skip",
      run + d.file("d.jsonl") + " --mode substitute --rate 1",
      run + d.file("e.jsonl.gz") + " --gzip-level -1",
      run + d.file("f.jsonl.gz") + " --gzip-level 9",
      run + d.file("g.jsonl.zst") + " --zstd-level 22 --zstd-threads 0",
      run + d.file("h.jsonl.zst") + " --zstd-level -5 --zstd-threads 2",
  };
  for (const auto& cmd : ok) {
    INFO(cmd);
    Ran r = run_evenhand(d, cmd);
    INFO(r.err);
    CHECK(r.code == 0);
  }
}
