// Path identity: device and inode for files that exist, resolved paths for those that do not
// yet, and the one check every command runs on its outputs.
#include "io/paths.h"

#include <sys/stat.h>

#include <filesystem>

namespace evenhand::io {

namespace {

namespace fs = std::filesystem;

// What a path names, as far as it can be known before anything is written.
struct Identity {
  bool named = false;   // not "-" nor empty
  bool exists = false;  // stat() succeeded (links followed)
  bool device = false;  // a character device such as /dev/null
  bool dir = false;
  dev_t dev = 0;
  ino_t ino = 0;
  fs::path resolved;  // absolute, links resolved as far as they exist
};

// The absolute path with symbolic links resolved: the existing part made canonical, a
// dangling link at the end followed to its target (at most 40 links, the kernel's limit).
fs::path resolve(const std::string& p) {
  std::error_code ec;
  fs::path cur = fs::absolute(p, ec);
  if (ec) return fs::path(p).lexically_normal();
  for (int hops = 0; hops < 40; ++hops) {
    fs::path w = fs::weakly_canonical(cur, ec);
    if (ec) return cur.lexically_normal();
    if (!fs::is_symlink(fs::symlink_status(w, ec))) return w;
    fs::path target = fs::read_symlink(w, ec);
    if (ec) return w;
    cur = target.is_absolute() ? target : w.parent_path() / target;
  }
  return cur.lexically_normal();
}

Identity identify(const std::string& p) {
  Identity id;
  if (p.empty() || p == "-") return id;
  id.named = true;
  struct stat st;
  if (::stat(p.c_str(), &st) == 0) {
    id.exists = true;
    id.device = S_ISCHR(st.st_mode);
    id.dir = S_ISDIR(st.st_mode);
    id.dev = st.st_dev;
    id.ino = st.st_ino;
  }
  id.resolved = resolve(p);
  return id;
}

bool same(const Identity& a, const Identity& b) {
  if (!a.named || !b.named || a.device || b.device) return false;
  if (a.exists && b.exists) return a.dev == b.dev && a.ino == b.ino;
  return a.resolved == b.resolved;
}

// Whether the existing file `out` lies under the directory `dir` (compared by inode, so
// links to the directory count too).
bool inside(const Identity& dir, const Identity& out) {
  if (!dir.dir || !out.exists || out.dir || out.device) return false;
  for (fs::path p = out.resolved.parent_path();; p = p.parent_path()) {
    struct stat st;
    if (::stat(p.c_str(), &st) == 0 && st.st_dev == dir.dev && st.st_ino == dir.ino) return true;
    if (p == p.root_path() || p.empty()) return false;
  }
}

Error refusal(const NamedPath& out, const std::string& why) {
  return make_error(ErrorKind::usage, out.path,
                    out.option + " " + why + "; refusing to overwrite it");
}

}  // namespace

bool same_file(const std::string& a, const std::string& b) {
  return same(identify(a), identify(b));
}

Status check_outputs_distinct(const std::vector<NamedPath>& inputs,
                              const std::vector<NamedPath>& outputs) {
  std::vector<Identity> ins, outs;
  for (const auto& in : inputs) ins.push_back(identify(in.path));
  for (const auto& out : outputs) outs.push_back(identify(out.path));
  for (size_t o = 0; o < outputs.size(); ++o) {
    for (size_t i = 0; i < inputs.size(); ++i) {
      if (same(outs[o], ins[i])) {
        return refusal(outputs[o],
                       "names the same file as " + inputs[i].option + " (" + inputs[i].path + ")");
      }
      if (inside(ins[i], outs[o])) {
        return refusal(outputs[o], "names a file in the " + inputs[i].option + " directory (" +
                                       inputs[i].path + ")");
      }
    }
    for (size_t p = 0; p < o; ++p) {
      if (same(outs[o], outs[p])) {
        return refusal(outputs[o], "names the same file as " + outputs[p].option + " (" +
                                       outputs[p].path + ")");
      }
    }
  }
  return ok_status();
}

}  // namespace evenhand::io
