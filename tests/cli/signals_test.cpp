// SIGINT, SIGTERM, SIGHUP and SIGPIPE at many points of a run, the commit included: evenhand
// exits with 128 + the signal (or 0 when it finished first), leaves no hidden temporary file,
// and leaves either every output complete or none. A read blocked on stdin ends too, and so
// does a run whose standard output is a pipe its reader closed.
#include <catch2/catch.hpp>

#include <fcntl.h>
#include <poll.h>
#include <signal.h>
#include <sys/inotify.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <filesystem>
#include <map>
#include <thread>

#include "support/temp_dir.h"

using evenhand::testing::read_file;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

namespace {

const std::vector<std::string> kFinals = {"out.jsonl", "edits.jsonl", "rejects.jsonl", "m.json"};

// A synthetic corpus (invented records) big enough for a run of about a second, with a bad
// line now and then so that every output has something in it.
std::string synthetic_corpus() {
  std::string s;
  for (int i = 0; i < 40000; ++i) {
    if (i % 997 == 0) {
      s += "not json " + std::to_string(i) + "\n";
      continue;
    }
    s += "{\"id\":" + std::to_string(i) +
         ",\"text\":\"She told her brother that he should thank the nurse; Mary said his "
         "father was proud of her, and the waiter agreed with them. Record " +
         std::to_string(i) + ".\"}\n";
  }
  return s;
}

std::vector<std::string> run_args(const std::string& corpus) {
  return {evenhand::testing::evenhand_binary(),
          "run",
          "--pack",
          "en-gender",
          "--in",
          corpus,
          "--out",
          "out.jsonl",
          "--edits",
          "edits.jsonl",
          "--rejects",
          "rejects.jsonl",
          "--on-bad-record",
          "skip",
          "--manifest",
          "m.json",
          "--threads",
          "2",
          "--quiet"};
}

// Starts `args` in `dir` with default signal handling, stdin from `stdin_fd`, stdout to
// `stdout_fd` and stderr to `stderr_fd` (each /dev/null when -1).
pid_t start(const std::string& dir, const std::vector<std::string>& args, int stdin_fd = -1,
            int stdout_fd = -1, int stderr_fd = -1) {
  pid_t pid = ::fork();
  if (pid != 0) return pid;
  sigset_t none;
  sigemptyset(&none);
  ::sigprocmask(SIG_SETMASK, &none, nullptr);
  for (int sig : {SIGINT, SIGTERM, SIGHUP, SIGPIPE}) ::signal(sig, SIG_DFL);
  int null = ::open("/dev/null", O_RDWR);
  ::dup2(stdin_fd >= 0 ? stdin_fd : null, 0);
  ::dup2(stdout_fd >= 0 ? stdout_fd : null, 1);
  ::dup2(stderr_fd >= 0 ? stderr_fd : null, 2);
  if (::chdir(dir.c_str()) != 0) ::_exit(120);
  std::vector<char*> argv;
  for (const auto& a : args) argv.push_back(const_cast<char*>(a.c_str()));
  argv.push_back(nullptr);
  ::execv(argv[0], argv.data());
  ::_exit(121);
}

// Waits for `pid`, at most `limit` (then kills it: the test fails); returns its status.
int wait_for(pid_t pid, std::chrono::seconds limit = std::chrono::seconds(60)) {
  auto until = std::chrono::steady_clock::now() + limit;
  int status = 0;
  while (::waitpid(pid, &status, WNOHANG) == 0) {
    if (std::chrono::steady_clock::now() > until) {
      ::kill(pid, SIGKILL);
      ::waitpid(pid, &status, 0);
      FAIL("evenhand did not end after the signal");
    }
    std::this_thread::sleep_for(std::chrono::milliseconds(5));
  }
  return status;
}

void clear_dir(const std::string& dir) {
  for (const auto& e : std::filesystem::directory_iterator(dir)) std::filesystem::remove(e.path());
}

struct Reference {
  std::map<std::string, std::string> files;  // final name -> bytes (the manifest excluded)
  double seconds = 0;
};

// What `dir` holds after a signalled run: no hidden file, and either no output or every
// output with the reference's bytes (the manifest: present and complete). Returns how many
// outputs are there (0 or all).
size_t check_outputs(const std::string& dir, const Reference& ref) {
  size_t present = 0;
  for (const auto& e : std::filesystem::directory_iterator(dir)) {
    const std::string name = e.path().filename().string();
    INFO("left in the directory: " << name);
    CHECK(std::find(kFinals.begin(), kFinals.end(), name) != kFinals.end());
    ++present;
  }
  CHECK((present == 0 || present == kFinals.size()));
  if (present == kFinals.size()) {
    for (const auto& [name, bytes] : ref.files) {
      INFO(name);
      CHECK(read_file(dir + "/" + name) == bytes);
    }
    const std::string m = read_file(dir + "/m.json");
    CHECK(m.find("\"schema\"") != std::string::npos);
    CHECK(m.size() > 2);
    CHECK(m.substr(m.size() - 2) == "}\n");
  }
  return present;
}

// The exit status of a run signalled with `sig`: 128 + sig, or 0 when it finished first.
// A signal that lands before main() has set its handling up (process start-up is slow under
// the sanitizers) ends the process by the signal itself: allowed only when it left nothing.
void check_status(int status, int sig, const std::string& dir) {
  INFO("signal " << sig << ", status " << status);
  if (WIFSIGNALED(status) && WTERMSIG(status) == sig) {
    CHECK(std::filesystem::is_empty(dir));
    return;
  }
  REQUIRE(WIFEXITED(status));
  CHECK((WEXITSTATUS(status) == 128 + sig || WEXITSTATUS(status) == 0));
}

Reference reference_run(const std::string& dir, const std::string& corpus) {
  Reference ref;
  auto t0 = std::chrono::steady_clock::now();
  int status = wait_for(start(dir, run_args(corpus)));
  ref.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  REQUIRE(WIFEXITED(status));
  REQUIRE(WEXITSTATUS(status) == 0);
  for (const auto& name : kFinals)
    if (name != "m.json") ref.files[name] = read_file(dir + "/" + name);
  REQUIRE(ref.files["rejects.jsonl"].size() > 0);
  clear_dir(dir);
  return ref;
}

// SIGPIPE here is sent to the process (kill -PIPE); a write to a closed pipe is tested below.
const int kSignals[] = {SIGTERM, SIGINT, SIGHUP, SIGPIPE};

}  // namespace

TEST_CASE("a signal at any point of a run leaves every output or none, and no hidden file") {
  TempDir d;
  const std::string corpus = d.file("corpus.jsonl");
  write_file(corpus, synthetic_corpus());
  const std::string work = d.file("work");
  std::filesystem::create_directory(work);
  const Reference ref = reference_run(work, corpus);
  // 20 points spread over the run, then 6 around its end, where the outputs are committed.
  std::vector<double> at;
  for (int i = 0; i < 20; ++i) at.push_back((i + 0.5) / 20);
  for (double f : {0.85, 0.9, 0.95, 1.0, 1.05, 1.1}) at.push_back(f);
  size_t complete = 0, none = 0;
  for (size_t i = 0; i < at.size(); ++i) {
    const int sig = kSignals[i % std::size(kSignals)];
    INFO("signal " << sig << " after " << at[i] << " of the reference run's " << ref.seconds
                   << " s");
    pid_t pid = start(work, run_args(corpus));
    std::this_thread::sleep_for(std::chrono::duration<double>(at[i] * ref.seconds));
    ::kill(pid, sig);
    check_status(wait_for(pid), sig, work);
    (check_outputs(work, ref) == 0 ? none : complete) += 1;
    clear_dir(work);
  }
  WARN(none << " runs left nothing, " << complete << " every output");
  CHECK(none > 0);  // the early signals
}

// The signal arrives right after the first output is renamed into place (inotify reports the
// rename): the renames have begun, so the whole set must be there.
TEST_CASE("a signal during the renames lets the set complete") {
  TempDir d;
  const std::string corpus = d.file("corpus.jsonl");
  write_file(corpus, synthetic_corpus().substr(0, 2000000));
  const std::string work = d.file("work");
  std::filesystem::create_directory(work);
  const Reference ref = reference_run(work, corpus);
  for (int sig : kSignals) {
    INFO("signal " << sig);
    int fd = ::inotify_init1(IN_CLOEXEC);
    REQUIRE(fd >= 0);
    REQUIRE(::inotify_add_watch(fd, work.c_str(), IN_MOVED_TO) >= 0);
    pid_t pid = start(work, run_args(corpus));
    bool seen = false;
    for (int tries = 0; !seen && tries < 6000; ++tries) {
      pollfd p{fd, POLLIN, 0};
      if (::poll(&p, 1, 10) > 0) {
        alignas(inotify_event) char buf[4096];
        if (::read(fd, buf, sizeof buf) > 0) seen = true;
      }
    }
    ::close(fd);
    REQUIRE(seen);
    ::kill(pid, sig);
    check_status(wait_for(pid), sig, work);
    CHECK(check_outputs(work, ref) == kFinals.size());
    clear_dir(work);
  }
}

TEST_CASE("a signal ends a run blocked on reading stdin and leaves nothing") {
  TempDir d;
  const std::string work = d.file("work");
  std::filesystem::create_directory(work);
  for (int sig : kSignals) {
    INFO("signal " << sig);
    int fds[2];
    REQUIRE(::pipe2(fds, O_CLOEXEC) == 0);
    auto args = run_args("-");
    pid_t pid = start(work, args, fds[0]);
    ::close(fds[0]);
    const std::string some = "{\"text\":\"she said\"}\n{\"text\":\"he said\"}\n";
    REQUIRE(::write(fds[1], some.data(), some.size()) == ssize_t(some.size()));
    // Wait until the outputs' hidden files exist: the run has started and now waits on stdin.
    size_t hidden = 0;
    for (int tries = 0; hidden < kFinals.size() && tries < 3000; ++tries) {
      std::this_thread::sleep_for(std::chrono::milliseconds(10));
      hidden = 0;
      for (const auto& e : std::filesystem::directory_iterator(work))
        hidden += e.path().filename().string().find(".tmp-") != std::string::npos;
    }
    REQUIRE(hidden == kFinals.size());
    ::kill(pid, sig);
    const int status = wait_for(pid);
    ::close(fds[1]);
    REQUIRE(WIFEXITED(status));
    CHECK(WEXITSTATUS(status) == 128 + sig);
    CHECK(std::filesystem::is_empty(work));
    clear_dir(work);
  }
}

// `run --out - | head -1`: the write to the closed pipe ends the run as SIGPIPE would (exit
// 141, no message), but with no hidden file left and nothing under a final name.
TEST_CASE("a closed output pipe ends the run with 141 and leaves nothing") {
  TempDir d;
  const std::string corpus = d.file("corpus.jsonl");
  write_file(corpus, synthetic_corpus());
  const std::string work = d.file("work");
  std::filesystem::create_directory(work);
  auto args = run_args(corpus);
  *std::find(args.begin(), args.end(), "out.jsonl") = "-";
  int out[2];
  REQUIRE(::pipe2(out, O_CLOEXEC) == 0);
  const std::string err_path = d.file("stderr");
  const int err = ::open(err_path.c_str(), O_WRONLY | O_CREAT | O_TRUNC | O_CLOEXEC, 0644);
  REQUIRE(err >= 0);
  pid_t pid = start(work, args, -1, out[1], err);
  ::close(out[1]);
  ::close(err);
  // Read the first line, as head -1 does, then go away.
  std::string got;
  char c = 0;
  while (got.find('\n') == std::string::npos && ::read(out[0], &c, 1) == 1) got += c;
  ::close(out[0]);
  const int status = wait_for(pid);
  INFO("first line: " << got << "stderr: " << read_file(err_path));
  CHECK(got.rfind("{\"id\":", 0) == 0);
  REQUIRE(WIFEXITED(status));
  CHECK(WEXITSTATUS(status) == 128 + SIGPIPE);
  CHECK(read_file(err_path).empty());
  for (const auto& e : std::filesystem::directory_iterator(work))
    FAIL("left in the directory: " << e.path().filename().string());
}
