// OutputSet: members appear together or not at all (a failing later member, a final name
// that became a directory), and the temporary-file registry lets a stopping process remove
// every hidden file.
#include <sys/wait.h>
#include <unistd.h>

#include "io/io_test_support.h"
#include "io/output_set.h"
#include "io/sink.h"
#include "io/temp_files.h"

using namespace evenhand;
using namespace evenhand::io;
using namespace evenhand::io::test;

namespace {

std::unique_ptr<Sink> make_sink(const std::string& path) {
  auto s = Sink::create(path, SinkOptions{});
  INFO((s.ok() ? std::string() : s.error().message()));
  REQUIRE(s.ok());
  return std::move(s).value();
}

std::vector<std::string> hidden_files(const TempDir& dir) {
  std::vector<std::string> out;
  for (const auto& e : dir.entries())
    if (e.find(".tmp-") != std::string::npos) out.push_back(e);
  return out;
}

}  // namespace

TEST_CASE("output set: every member appears, with its bytes", "[output_set]") {
  TempDir dir;
  auto a = make_sink(dir.file("a.jsonl"));
  auto b = make_sink(dir.file("b.jsonl.zst"));
  auto m = make_sink(dir.file("m.json"));
  REQUIRE(a->write("alpha\n").ok());
  REQUIRE(b->write("beta\n").ok());
  REQUIRE(m->write("{}\n").ok());
  OutputSet set;
  set.add(*a);
  set.add(*b);
  REQUIRE(set.finish().ok());
  CHECK_FALSE(exists(dir.file("a.jsonl")));  // finished, not yet renamed
  CHECK(a->sha256().size() == 64);
  set.add(*m);
  REQUIRE(set.commit().ok());
  CHECK(read_file(dir.file("a.jsonl")) == "alpha\n");
  CHECK(read_via_source(dir.file("b.jsonl.zst")) == "beta\n");
  CHECK(read_file(dir.file("m.json")) == "{}\n");
  CHECK(hidden_files(dir).empty());
}

TEST_CASE("output set: a later member that fails to finish leaves no final name", "[output_set]") {
  // /dev/full: every write fails with ENOSPC, as on a full disk. source: null(4), full(4).
  TempDir dir;
  write_file(dir.file("a.jsonl"), "old\n");
  auto a = make_sink(dir.file("a.jsonl"));
  auto full = make_sink("/dev/full");
  auto m = make_sink(dir.file("m.json"));
  REQUIRE(a->write("new\n").ok());
  REQUIRE(full->write("small enough to sit in the buffer\n").ok());
  REQUIRE(m->write("{}\n").ok());
  OutputSet set;
  set.add(*a);
  set.add(*full);
  set.add(*m);
  auto st = set.commit();
  REQUIRE_FALSE(st.ok());
  CHECK(st.error().reason == "disk full");
  CHECK(read_file(dir.file("a.jsonl")) == "old\n");
  CHECK_FALSE(exists(dir.file("m.json")));
  CHECK(hidden_files(dir).empty());
}

TEST_CASE("output set: a final name that became a directory stops the set before any rename",
          "[output_set]") {
  TempDir dir;
  auto a = make_sink(dir.file("a.jsonl"));
  auto b = make_sink(dir.file("b.jsonl"));
  REQUIRE(a->write("alpha\n").ok());
  REQUIRE(b->write("beta\n").ok());
  REQUIRE(::mkdir(dir.file("b.jsonl").c_str(), 0700) == 0);
  OutputSet set;
  set.add(*a);
  set.add(*b);
  auto st = set.commit();
  REQUIRE_FALSE(st.ok());
  CHECK(st.error().reason == "is a directory");
  CHECK_FALSE(exists(dir.file("a.jsonl")));
  CHECK(hidden_files(dir).empty());
}

TEST_CASE("temp files: abandon removes every hidden file, finished or not", "[output_set]") {
  TempDir dir;
  // In a child: abandon_temp_files() keeps the registry locked for good.
  pid_t pid = ::fork();
  REQUIRE(pid >= 0);
  if (pid == 0) {
    auto a = Sink::create(dir.file("a.jsonl"), SinkOptions{});
    auto b = Sink::create(dir.file("b.jsonl"), SinkOptions{});
    if (!a.ok() || !b.ok() || !(*a)->write("alpha\n").ok()) ::_exit(2);
    if (!(*b)->finish().ok()) ::_exit(3);  // finished files are still hidden temporaries
    abandon_temp_files();
    ::_exit(0);
  }
  int status = 0;
  REQUIRE(::waitpid(pid, &status, 0) == pid);
  REQUIRE(WIFEXITED(status));
  CHECK(WEXITSTATUS(status) == 0);
  CHECK(dir.entries().empty());
}
