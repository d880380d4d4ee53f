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
    // The 0-7 tail bytes, little-endian in the low bytes of v, read with fixed-size loads
    // (a memcpy of variable length is a library call, a byte loop was a tenth of the engine's
    // instructions): the last 8 bytes shifted down when the string has them, else two
    // overlapping loads, whose shared bytes agree.
    size_t rest = s.size() - i;
    const auto* p = reinterpret_cast<const unsigned char*>(s.data());
    uint64_t v = 0;
    if (rest == 0) {
    } else if (s.size() >= 8) {
      std::memcpy(&v, p + s.size() - 8, 8);
      v >>= 8 * (8 - rest);
    } else if (rest >= 4) {
      uint32_t lo, hi;
      std::memcpy(&lo, p, 4);
      std::memcpy(&hi, p + rest - 4, 4);
      v = lo | (static_cast<uint64_t>(hi) << (8 * (rest - 4)));
    } else {
      v = p[0] | (static_cast<uint64_t>(p[rest / 2]) << (8 * (rest / 2))) |
          (static_cast<uint64_t>(p[rest - 1]) << (8 * (rest - 1)));
    }
    h = (h ^ v) * 0xc4ceb9fe1a85ec53ULL;
    return static_cast<size_t>(h ^ (h >> 29));
  }
};

}  // namespace evenhand
