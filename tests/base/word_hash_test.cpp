// WordHash reads its 0-7 tail bytes with fixed-size, partly overlapping loads; on a
// little-endian machine that must give the value of the plain byte-by-byte formula (kept here
// as the reference), for every length and content, and never read outside the string.
#include <bit>
#include <catch2/catch.hpp>
#include <cstring>
#include <memory>
#include <random>
#include <string>

#include "base/word_hash.h"

namespace {

uint64_t bytewise(std::string_view s) {
  uint64_t h = 0x9E3779B97F4A7C15ULL ^ s.size();
  size_t i = 0;
  for (; i + 8 <= s.size(); i += 8) {
    uint64_t v = 0;
    for (unsigned k = 0; k < 8; ++k)
      v |= static_cast<uint64_t>(static_cast<unsigned char>(s[i + k])) << (8 * k);
    h = (h ^ v) * 0xff51afd7ed558ccdULL;
    h ^= h >> 32;
  }
  uint64_t v = 0;
  for (unsigned shift = 0; i < s.size(); ++i, shift += 8)
    v |= static_cast<uint64_t>(static_cast<unsigned char>(s[i])) << shift;
  h = (h ^ v) * 0xc4ceb9fe1a85ec53ULL;
  return h ^ (h >> 29);
}

}  // namespace

TEST_CASE("word hash: the tail loads agree with the byte-by-byte formula") {
  if constexpr (std::endian::native != std::endian::little) {
    WARN("skipped: the reference formula is the little-endian reading");
    return;
  }
  std::mt19937_64 rng(2024);
  for (size_t len = 0; len <= 40; ++len) {
    for (int round = 0; round < 50; ++round) {
      // A string of exactly `len` bytes in its own allocation, so that ASan catches a load
      // past either end; all byte values, high ones included.
      std::unique_ptr<char[]> buf(new char[len == 0 ? 1 : len]);
      for (size_t k = 0; k < len; ++k) buf[k] = static_cast<char>(rng() & 0xff);
      std::string_view s(buf.get(), len);
      INFO("length " << len);
      REQUIRE(evenhand::WordHash{}(s) == bytewise(s));
    }
  }
  // Strings that differ only in their last byte hash apart.
  CHECK(evenhand::WordHash{}("mother") != evenhand::WordHash{}("mothes"));
  CHECK(evenhand::WordHash{}("grandmothers") != evenhand::WordHash{}("grandmothert"));
}
