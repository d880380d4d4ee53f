// When the system refuses the threads a run asks for, evenhand ends with one line on stderr
// and exit code 4, and leaves no output and no hidden temporary file. The refusal is made
// real with a low RLIMIT_NPROC for a user of the test's own (root ignores that limit).
#include <catch2/catch.hpp>

#include <grp.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <filesystem>

#include "support/temp_dir.h"

using evenhand::testing::read_file;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

namespace {

// Runs `args` in `dir` as a user id no one else has (so no other task counts against its
// limit) that may have at most `tasks` tasks (threads count), stderr to `dir`/stderr.
// Returns the wait status; exit 120..123 when the child could not be set up.
int run_limited(const std::string& dir, const std::vector<std::string>& args, rlim_t tasks) {
  const pid_t pid = ::fork();
  if (pid == 0) {
    const uid_t uid = 3000000 + uid_t(::getpid() % 100000);
    if (::chdir(dir.c_str()) != 0) ::_exit(120);
    if (::freopen("stderr", "w", stderr) == nullptr) ::_exit(121);
    const struct rlimit lim = {tasks, tasks};
    if (::setgroups(0, nullptr) != 0 || ::setgid(uid) != 0 || ::setuid(uid) != 0 ||
        ::setrlimit(RLIMIT_NPROC, &lim) != 0) {
      ::_exit(122);
    }
    std::vector<char*> argv;
    for (const auto& a : args) argv.push_back(const_cast<char*>(a.c_str()));
    argv.push_back(nullptr);
    ::execv(argv[0], argv.data());
    ::_exit(123);
  }
  int status = -1;
  REQUIRE(pid > 0);
  REQUIRE(::waitpid(pid, &status, 0) == pid);
  return status;
}

}  // namespace

TEST_CASE("threads the system refuses end the run with one line and exit 4") {
  REQUIRE(::geteuid() == 0);  // to take another user's id; CI runs the tests as root
  TempDir d;
  const std::string work = d.file("work");
  std::filesystem::create_directory(work);
  REQUIRE(::chmod(d.path().c_str(), 0755) == 0);
  REQUIRE(::chmod(work.c_str(), 0777) == 0);
  const std::string corpus = d.file("corpus.jsonl");
  std::string records;
  for (int i = 0; i < 200; ++i) records += "{\"text\":\"She thanked her brother.\"}\n";
  write_file(corpus, records);
  REQUIRE(::chmod(corpus.c_str(), 0644) == 0);

  for (const char* threads : {"256", "8"}) {
    INFO("--threads " << threads);
    const int status =
        run_limited(work,
                    {evenhand::testing::evenhand_binary(), "run", "--pack", "en-gender", "--in",
                     corpus, "--out", "out.jsonl", "--edits", "edits.jsonl", "--manifest", "m.json",
                     "--threads", threads, "--quiet"},
                    4);
    const std::string err = read_file(work + "/stderr");
    INFO("stderr: " << err);
    REQUIRE(WIFEXITED(status));
    CHECK(WEXITSTATUS(status) == 4);
    CHECK(err.rfind("evenhand: the system refused thread ", 0) == 0);
    CHECK(err.find("try fewer --threads") != std::string::npos);
    CHECK(std::count(err.begin(), err.end(), '\n') == 1);
    std::filesystem::remove(work + "/stderr");
    for (const auto& e : std::filesystem::directory_iterator(work))
      FAIL("left in the directory: " << e.path().filename().string());
  }
}
