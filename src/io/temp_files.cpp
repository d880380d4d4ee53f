// The temporary-file registry: a mutex and a list of paths that live for the whole process
// (never destroyed, so a thread abandoning the files at exit never meets a dead object).
#include "io/temp_files.h"

#include <unistd.h>

#include <algorithm>
#include <vector>

namespace evenhand::io {

namespace {

struct Registry {
  std::mutex mu;
  std::vector<std::string> paths;
};

Registry& registry() {
  static Registry* r = new Registry();  // leaked on purpose: see above
  return *r;
}

}  // namespace

namespace temp_files {

std::unique_lock<std::mutex> lock() {
  return std::unique_lock<std::mutex>(registry().mu);
}

void add(const std::string& path) {
  registry().paths.push_back(path);
}

void remove(const std::string& path) {
  auto& v = registry().paths;
  auto it = std::find(v.begin(), v.end(), path);
  if (it != v.end()) v.erase(it);
}

}  // namespace temp_files

void abandon_temp_files() {
  Registry& r = registry();
  r.mu.lock();  // never unlocked: see the header
  for (const auto& p : r.paths) ::unlink(p.c_str());
  r.paths.clear();
}

}  // namespace evenhand::io
