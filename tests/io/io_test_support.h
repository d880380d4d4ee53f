// Helpers shared by the io tests: a scratch directory removed on exit, whole-file read and
// write, running the reference zstd/gzip commands, draining a Source, and running a check
// without root's privileges.
// They exist only for tests and may abort the test (REQUIRE) on setup failures.
#pragma once

#include <grp.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <catch2/catch.hpp>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <functional>
#include <random>
#include <sstream>
#include <string>
#include <vector>

#include "io/source.h"

namespace evenhand::io::test {

// A fresh directory under /tmp, removed with its contents when the object dies. Not copyable.
class TempDir {
 public:
  TempDir() {
    char tmpl[] = "/tmp/evenhand-io-test-XXXXXX";
    REQUIRE(::mkdtemp(tmpl) != nullptr);
    path_ = tmpl;
  }
  ~TempDir() {
    std::error_code ec;
    // Undo chmod tricks so removal works.
    std::filesystem::permissions(path_, std::filesystem::perms::owner_all,
                                 std::filesystem::perm_options::add, ec);
    std::filesystem::remove_all(path_, ec);
  }
  TempDir(const TempDir&) = delete;
  TempDir& operator=(const TempDir&) = delete;

  // Path of `name` inside the directory.
  std::string file(const std::string& name) const { return (path_ / name).string(); }
  const std::filesystem::path& path() const { return path_; }
  // Names of all entries, sorted (hidden ones included).
  std::vector<std::string> entries() const {
    std::vector<std::string> out;
    for (const auto& e : std::filesystem::directory_iterator(path_))
      out.push_back(e.path().filename().string());
    std::sort(out.begin(), out.end());
    return out;
  }

 private:
  std::filesystem::path path_;
};

// Runs `check` in a child process that has dropped to the unprivileged user "nobody" (uid
// and gid 65534, the Debian convention), for permission cases that root cannot see: root
// bypasses file permissions (CAP_DAC_OVERRIDE). `check` returns 0 when all is as expected.
// Returns the child's exit status: 100 when it could not drop its privileges, -1 when it
// could not be started or did not exit normally.
inline int as_nobody(const std::function<int()>& check) {
  pid_t pid = ::fork();
  if (pid < 0) return -1;
  if (pid == 0) {
    if (::setgroups(0, nullptr) != 0 || ::setgid(65534) != 0 || ::setuid(65534) != 0) {
      ::_exit(100);
    }
    ::_exit(check());
  }
  int status = 0;
  if (::waitpid(pid, &status, 0) != pid) return -1;
  return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

inline void write_file(const std::string& path, const std::string& data) {
  std::ofstream out(path, std::ios::binary | std::ios::trunc);
  REQUIRE(out.good());
  out.write(data.data(), std::streamsize(data.size()));
  REQUIRE(out.good());
}

inline std::string read_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  REQUIRE(in.good());
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

inline bool exists(const std::string& path) {
  struct stat st;
  return ::lstat(path.c_str(), &st) == 0;
}

inline std::string quote(const std::string& s) {
  std::string out = "'";
  for (char c : s) {
    if (c == '\'')
      out += "'\\''";
    else
      out += c;
  }
  return out + "'";
}

// Runs a shell command; returns its exit status (0 = success).
inline int run(const std::string& cmd) {
  const int st = std::system(cmd.c_str());
  return st == -1 ? -1 : WEXITSTATUS(st);
}

// The reference command-line tools must be on PATH (Debian packages zstd and gzip).
inline void require_tool(const std::string& name) {
  INFO("the '" << name << "' command (Debian package " << name << ") must be on PATH");
  REQUIRE(run("command -v " + name + " >/dev/null 2>&1") == 0);
}

// Some text that compresses well, with a sprinkle of random bytes so blocks vary.
inline std::string sample_data(size_t size, unsigned seed) {
  std::mt19937 rng(seed);
  static const char* const words[] = {"river",  "lantern", "orchard",  "copper", "meadow",
                                      "signal", "harbor",  "{\"id\":", "\n",     "quartz"};
  std::string s;
  s.reserve(size);
  while (s.size() < size) {
    if (rng() % 16 == 0) {
      s.push_back(char(rng() & 0xFF));
    } else {
      s += words[rng() % 10];
      s.push_back(' ');
    }
  }
  s.resize(size);
  return s;
}

// Reads `src` to its end with reads of `chunk` bytes. Returns the bytes or the first error.
inline Result<std::string> drain(Source& src, size_t chunk = 65536) {
  std::string out;
  std::vector<char> buf(chunk);
  for (;;) {
    Result<size_t> n = src.read(buf.data(), buf.size());
    if (!n.ok()) return std::move(n).error();
    if (*n == 0) return out;
    out.append(buf.data(), *n);
  }
}

// Opens and drains `path`, requiring success.
inline std::string read_via_source(const std::string& path) {
  auto src = Source::open(path);
  INFO(path);
  REQUIRE(src.ok());
  auto data = drain(**src);
  INFO((data.ok() ? std::string() : data.error().message()));
  REQUIRE(data.ok());
  return *data;
}

}  // namespace evenhand::io::test
