// A stable 64-bit hash for per-record decisions (substitute mode, balance plans). Stable
// means: the same bytes and seed give the same value on every machine, build and thread
// count, forever, because outputs depend on it. Do not change it without a schema bump.
#pragma once

#include <cstdint>
#include <string_view>

namespace evenhand {

// FNV-1a (64-bit) over `data`, started from a state mixed with `seed`, finished with the
// SplitMix64 finaliser so that nearby inputs give unrelated values.
uint64_t stable_hash(uint64_t seed, std::string_view data);

// Maps a hash to [0, 1) using its top 53 bits.
inline double hash_unit(uint64_t h) {
  return static_cast<double>(h >> 11) * 0x1.0p-53;
}

}  // namespace evenhand
