// Shared by the fuzz targets under tests/fuzz/: a property check that aborts with a message
// (so libFuzzer keeps the input as a crash), an in-memory byte source that hands out short
// reads, and the small multi-file container that targets reading several files take.
#pragma once

#include <algorithm>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <map>
#include <string>
#include <string_view>
#include <vector>

#include "base/status.h"
#include "io/source.h"

namespace evenhand::fuzz {

[[noreturn]] inline void fail(const char* cond, const std::string& what, const char* file,
                              int line) {
  std::fprintf(stderr, "%s:%d: property violated: %s\n  %s\n", file, line, cond, what.c_str());
  std::abort();
}

// Aborts (a finding) when `cond` is false; `what` says what was being checked.
#define FUZZ_CHECK(cond, what)                                              \
  do {                                                                      \
    if (!(cond)) ::evenhand::fuzz::fail(#cond, (what), __FILE__, __LINE__); \
  } while (0)

// Bytes from memory, at most `chunk` per read(), so readers meet their refill paths.
class MemorySource final : public io::Source {
 public:
  MemorySource(std::string_view data, size_t chunk)
      : data_(data), chunk_(std::max<size_t>(1, chunk)) {
    path_ = "fuzz-input";
  }
  Result<size_t> read(char* buf, size_t size) override {
    size_t n = std::min({size, chunk_, data_.size() - pos_});
    if (n) std::memcpy(buf, data_.data() + pos_, n);
    pos_ += n;
    raw_offset_ += n;
    return n;
  }

 private:
  std::string_view data_;
  size_t chunk_;
  size_t pos_ = 0;
};

// Splits a fuzz input into named files: each file starts with a line "%% NAME" (at the start
// of the input or right after a '\n'); bytes before the first such line go to `first_name`.
// A later file of the same name replaces an earlier one.
inline std::map<std::string, std::string> split_files(std::string_view data,
                                                      const std::string& first_name) {
  std::vector<size_t> heads;  // offsets of the "%% NAME" lines
  for (size_t p = 0; p < data.size();
       p = data.find('\n', p) == std::string_view::npos ? data.size() : data.find('\n', p) + 1) {
    if (data.substr(p, 3) == "%% ") heads.push_back(p);
  }
  std::map<std::string, std::string> files;
  size_t first_end = heads.empty() ? data.size() : heads.front();
  if (first_end > 0) files[first_name] = std::string(data.substr(0, first_end));
  for (size_t h = 0; h < heads.size(); ++h) {
    size_t end = h + 1 < heads.size() ? heads[h + 1] : data.size();
    size_t nl = std::min(data.find('\n', heads[h]), end);
    std::string name(data.substr(heads[h] + 3, nl - heads[h] - 3));
    files[name] = std::string(data.substr(std::min(nl + 1, end), end - std::min(nl + 1, end)));
  }
  return files;
}

// True when byte `i` of valid UTF-8 `s` starts a character (or is its end).
inline bool at_char_boundary(std::string_view s, size_t i) {
  return i == s.size() || (i < s.size() && (static_cast<unsigned char>(s[i]) & 0xC0) != 0x80);
}

// A small deterministic generator (splitmix64) for choices derived from the input.
struct Mix {
  uint64_t state;
  uint64_t next() {
    uint64_t z = (state += 0x9E3779B97F4A7C15ull);
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
    return z ^ (z >> 31);
  }
  size_t below(size_t n) { return n ? static_cast<size_t>(next() % n) : 0; }
};

// A data file text with a record: a line that is neither blank nor a '#' comment (CR before
// LF ignored). Loaders may refuse a text without one as a whole, without a line.
inline bool has_record(std::string_view text) {
  for (size_t pos = 0; pos < text.size();) {
    size_t end = std::min(text.find('\n', pos), text.size());
    std::string_view line = text.substr(pos, end - pos);
    if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
    if (!line.empty() && line[0] != '#') return true;
    pos = end + 1;
  }
  return false;
}

}  // namespace evenhand::fuzz
