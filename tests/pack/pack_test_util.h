// Helpers shared by the pack tests: small in-memory packs, diagnostic lookup, and the path of
// the source tree (for the shipped rules/ folder).
#pragma once

#include <cstdlib>
#include <filesystem>
#include <map>
#include <memory>
#include <string>
#include <vector>

#include "pack/check.h"
#include "pack/pack.h"

namespace evenhand::pack::testing {

// A valid header for a two-group test pack; tests append sections to it.
inline const char* const kHeader =
    "pack test\n"
    "version 1.0.0\n"
    "language en\n"
    "axis gender\n"
    "groups female male\n";

struct Loaded {
  std::shared_ptr<const CompiledPack> pack;  // null when loading failed
  std::vector<Diagnostic> diags;
  std::string error;  // Error::message() when loading failed
  std::string error_reason;
  std::string error_file;
};

inline Loaded load(const std::map<std::string, std::string>& files) {
  Loaded out;
  auto r = load_pack_files("testpack", files, out.diags);
  if (r.ok()) {
    out.pack = r.value();
  } else {
    out.error = r.error().message();
    out.error_reason = r.error().reason;
    out.error_file = r.error().file;
  }
  return out;
}

// Loads pack.txt = kHeader and words.txt = `words`.
inline Loaded load_words(const std::string& words) {
  return load({{"pack.txt", kHeader}, {"words.txt", words}});
}

// The diagnostics with this code, formatted "FILE:LINE: message".
inline std::vector<std::string> with_code(const Loaded& l, const std::string& code) {
  std::vector<std::string> out;
  for (const auto& d : l.diags)
    if (d.code == code) out.push_back(format_diagnostic(d));
  return out;
}

// True when a diagnostic with `code` is at `where` ("words.txt:3" or "pack.txt").
inline bool has(const Loaded& l, const std::string& where, const std::string& code) {
  for (const auto& d : l.diags)
    if (d.code == code && d.where.str() == where) return true;
  return false;
}

inline std::string all(const Loaded& l) {
  return format_diagnostics(l.diags);
}

// The source tree: $EVENHAND_SOURCE_DIR (set by ctest), else derived from this file's path.
inline std::filesystem::path source_dir() {
  if (const char* env = std::getenv("EVENHAND_SOURCE_DIR"); env && *env) return env;
  return std::filesystem::path(__FILE__).parent_path().parent_path().parent_path();
}

}  // namespace evenhand::pack::testing
