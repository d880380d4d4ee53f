#include "base/hash.h"

namespace evenhand {

namespace {
uint64_t splitmix64(uint64_t x) {
  x += 0x9e3779b97f4a7c15ULL;
  x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9ULL;
  x = (x ^ (x >> 27)) * 0x94d049bb133111ebULL;
  return x ^ (x >> 31);
}
}  // namespace

uint64_t stable_hash(uint64_t seed, std::string_view data) {
  uint64_t h = 0xcbf29ce484222325ULL ^ splitmix64(seed);
  for (unsigned char c : data) {
    h ^= c;
    h *= 0x100000001b3ULL;
  }
  return splitmix64(h ^ data.size());
}

}  // namespace evenhand
