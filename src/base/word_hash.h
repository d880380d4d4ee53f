// A fast in-memory hash for short strings (words, feature names) in lookup tables that are
// probed once per token. Not stable across versions and never written anywhere: use
// base/hash.h for anything an output depends on.
#pragma once

#include <cstddef>
#include <cstdint>
#include <cstring>
#include <string_view>

namespace evenhand {

// Multiply-xorshift over 8-byte blocks; transparent, so string_view keys probe
// std::string-keyed maps without a copy. std::hash dominated profiles here.
struct WordHash {
  using is_transparent = void;
  size_t operator()(std::string_view s) const {
    uint64_t h = 0x9E3779B97F4A7C15ULL ^ s.size();
    size_t i = 0;
    for (; i + 8 <= s.size(); i += 8) {
      uint64_t v;
      std::memcpy(&v, s.data() + i, 8);
      h = (h ^ v) * 0xff51afd7ed558ccdULL;
      h ^= h >> 32;
    }
    // The tail byte by byte: a memcpy of variable length is a library call here.
    uint64_t v = 0;
    for (unsigned shift = 0; i < s.size(); ++i, shift += 8)
      v |= static_cast<uint64_t>(static_cast<unsigned char>(s[i])) << shift;
    h = (h ^ v) * 0xc4ceb9fe1a85ec53ULL;
    return static_cast<size_t>(h ^ (h >> 29));
  }
};

}  // namespace evenhand
