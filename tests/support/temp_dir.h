// Test helper: a fresh temporary directory removed with everything in it at scope exit, and
// small file and process utilities shared by the test executables.
#pragma once

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace evenhand::testing {

class TempDir {
 public:
  TempDir() {
    std::string tmpl = (std::filesystem::temp_directory_path() / "evenhand-test-XXXXXX").string();
    char* p = mkdtemp(tmpl.data());
    if (p == nullptr) throw std::runtime_error("mkdtemp failed");
    path_ = p;
  }
  ~TempDir() {
    std::error_code ec;
    std::filesystem::remove_all(path_, ec);
  }
  TempDir(const TempDir&) = delete;
  TempDir& operator=(const TempDir&) = delete;
  const std::filesystem::path& path() const { return path_; }
  std::string file(const std::string& name) const { return (path_ / name).string(); }

 private:
  std::filesystem::path path_;
};

inline void write_file(const std::string& path, const std::string& bytes) {
  std::ofstream f(path, std::ios::binary);
  f << bytes;
}

inline std::string read_file(const std::string& path) {
  std::ifstream f(path, std::ios::binary);
  std::stringstream ss;
  ss << f.rdbuf();
  return ss.str();
}

// The evenhand binary under test ($EVENHAND_BINARY, else the one this build made).
inline std::string evenhand_binary() {
  const char* b = std::getenv("EVENHAND_BINARY");
  return b ? b : EVENHAND_BINARY_PATH;
}

// The repository root ($EVENHAND_SOURCE_DIR, else the tree this build came from).
inline std::string source_dir() {
  const char* s = std::getenv("EVENHAND_SOURCE_DIR");
  return s ? s : EVENHAND_SOURCE_PATH;
}

// Runs a shell command; returns its exit status (-1 if it could not run).
inline int shell(const std::string& cmd) {
  int rc = std::system(cmd.c_str());
  if (rc == -1) return -1;
  return WIFEXITED(rc) ? WEXITSTATUS(rc) : -1;
}

// What one run of the binary did: its exit status and what it printed.
struct Ran {
  int code = -1;
  std::string out, err;
};

// Runs the evenhand binary with `args` (already shell-quoted), stdin from `stdin_file`,
// after the shell assignments `env` (e.g. "NO_COLOR=1"), capturing stdout and stderr through
// files in `d`.
inline Ran run_evenhand(const TempDir& d, const std::string& args,
                        const std::string& stdin_file = "/dev/null", const std::string& env = "") {
  Ran r;
  r.code = shell(env + " " + evenhand_binary() + " " + args + " <" + stdin_file + " >" +
                 d.file("stdout") + " 2>" + d.file("stderr"));
  r.out = read_file(d.file("stdout"));
  r.err = read_file(d.file("stderr"));
  return r;
}

}  // namespace evenhand::testing
