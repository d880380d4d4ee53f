// Path identity: every spelling of one file is the same file (./, absolute, a/../, hard and
// symbolic links, a dangling link's target, a new file under a linked directory), and
// check_outputs_distinct names the two options that clash.
#include <unistd.h>

#include <filesystem>

#include "io/io_test_support.h"
#include "io/paths.h"

using namespace evenhand;
using namespace evenhand::io;
using namespace evenhand::io::test;

namespace {

// `path` relative to the working directory, spelled with a leading "./".
std::string dot_relative(const std::string& path) {
  return "./" + std::filesystem::relative(path, std::filesystem::current_path()).string();
}

}  // namespace

TEST_CASE("paths: one existing file in every spelling", "[paths]") {
  TempDir dir;
  const std::string in = dir.file("in.jsonl");
  write_file(in, "x\n");
  REQUIRE(::mkdir(dir.file("sub").c_str(), 0700) == 0);
  REQUIRE(::link(in.c_str(), dir.file("hard").c_str()) == 0);
  REQUIRE(::symlink("in.jsonl", dir.file("soft").c_str()) == 0);
  CHECK(same_file(in, in));
  CHECK(same_file(in, dot_relative(in)));
  CHECK(same_file(in, dir.path().string() + "/./in.jsonl"));
  CHECK(same_file(in, dir.file("sub/../in.jsonl")));
  CHECK(same_file(in, dir.file("hard")));
  CHECK(same_file(dir.file("soft"), in));
  CHECK(same_file(dir.file("soft"), dir.file("hard")));
  write_file(dir.file("other"), "x\n");
  CHECK_FALSE(same_file(in, dir.file("other")));
  CHECK_FALSE(same_file(in, dir.file("new")));
}

TEST_CASE("paths: a/../ follows the link a before going up", "[paths]") {
  // link -> deep/er, so link/../in.jsonl is deep/in.jsonl, not in.jsonl (what the kernel does;
  // a lexical clean-up would get it wrong). source: path_resolution(7).
  TempDir dir;
  REQUIRE(std::filesystem::create_directories(dir.file("deep/er")));
  write_file(dir.file("in.jsonl"), "top\n");
  write_file(dir.file("deep/in.jsonl"), "deep\n");
  REQUIRE(::symlink("deep/er", dir.file("link").c_str()) == 0);
  CHECK(same_file(dir.file("link/../in.jsonl"), dir.file("deep/in.jsonl")));
  CHECK_FALSE(same_file(dir.file("link/../in.jsonl"), dir.file("in.jsonl")));
  // The same for files that do not exist yet.
  CHECK(same_file(dir.file("link/../new"), dir.file("deep/new")));
  CHECK_FALSE(same_file(dir.file("link/../new"), dir.file("new")));
}

TEST_CASE("paths: files that do not exist yet", "[paths]") {
  TempDir dir;
  const std::string fresh = dir.file("new.jsonl");
  CHECK(same_file(fresh, dot_relative(fresh)));
  CHECK(same_file(fresh, dir.file("x/../new.jsonl")));
  // A dangling link (relative or absolute) names its target.
  REQUIRE(::symlink("new.jsonl", dir.file("dangling").c_str()) == 0);
  REQUIRE(::symlink(fresh.c_str(), dir.file("dangling-abs").c_str()) == 0);
  REQUIRE(::symlink("dangling", dir.file("chain").c_str()) == 0);
  CHECK(same_file(dir.file("dangling"), fresh));
  CHECK(same_file(dir.file("dangling-abs"), fresh));
  CHECK(same_file(dir.file("chain"), fresh));
  CHECK_FALSE(same_file(dir.file("dangling"), dir.file("other.jsonl")));
  // A new file under a linked directory.
  REQUIRE(::mkdir(dir.file("real").c_str(), 0700) == 0);
  REQUIRE(::symlink("real", dir.file("linked").c_str()) == 0);
  CHECK(same_file(dir.file("linked/new.jsonl"), dir.file("real/new.jsonl")));
  CHECK_FALSE(same_file(dir.file("linked/new.jsonl"), dir.file("real/other.jsonl")));
}

TEST_CASE("paths: stdin/stdout and character devices are never the same file", "[paths]") {
  CHECK_FALSE(same_file("-", "-"));
  CHECK_FALSE(same_file("", ""));
  CHECK_FALSE(same_file("/dev/null", "/dev/null"));
}

TEST_CASE("paths: check_outputs_distinct names both options", "[paths]") {
  TempDir dir;
  const std::string in = dir.file("in.jsonl");
  write_file(in, "x\n");
  auto clash =
      check_outputs_distinct({{in, "--in"}}, {{"-", "--out"}, {dot_relative(in), "--manifest"}});
  REQUIRE_FALSE(clash.ok());
  CHECK(clash.error().kind == ErrorKind::usage);
  CHECK(clash.error().reason.find("--manifest names the same file as --in") != std::string::npos);

  auto two = check_outputs_distinct(
      {{in, "--in"}}, {{dir.file("o.jsonl"), "--out"}, {dir.file("sub/../o.jsonl"), "--edits"}});
  REQUIRE_FALSE(two.ok());
  CHECK(two.error().reason.find("--edits names the same file as --out") != std::string::npos);

  CHECK(check_outputs_distinct({{in, "--in"}, {"-", "--in"}},
                               {{"-", "--out"}, {"", "--edits"}, {dir.file("o"), "--manifest"}})
            .ok());
}

TEST_CASE("paths: an output may not replace a file of an input directory", "[paths]") {
  TempDir dir;
  REQUIRE(::mkdir(dir.file("pack").c_str(), 0700) == 0);
  write_file(dir.file("pack/pack.txt"), "x\n");
  REQUIRE(::symlink("pack", dir.file("alias").c_str()) == 0);
  const std::vector<NamedPath> ins = {{dir.file("pack"), "--pack"}};
  auto st = check_outputs_distinct(ins, {{dir.file("alias/pack.txt"), "--out"}});
  REQUIRE_FALSE(st.ok());
  CHECK(st.error().reason.find("--out names a file in the --pack directory") != std::string::npos);
  // A new file there replaces nothing.
  CHECK(check_outputs_distinct(ins, {{dir.file("pack/new.jsonl"), "--out"}}).ok());
  CHECK(check_outputs_distinct(ins, {{dir.file("beside.jsonl"), "--out"}}).ok());
}
