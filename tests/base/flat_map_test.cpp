// FlatStringMap against std::unordered_map (libstdc++) as the reference: the same keys give the
// same answers through growth, for present and absent keys alike, whatever the filter says.
#include <catch2/catch.hpp>
#include <random>
#include <string>
#include <unordered_map>
#include <vector>

#include "base/flat_map.h"

using evenhand::FlatStringMap;

namespace {

// Random lower-case words of 1 to 24 bytes (so the hash's 8-byte blocks and tails both occur),
// with some repeats.
std::vector<std::string> random_words(size_t n, uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::vector<std::string> out;
  for (size_t i = 0; i < n; ++i) {
    size_t len = 1 + rng() % 24;
    std::string w;
    for (size_t k = 0; k < len; ++k) w += static_cast<char>('a' + rng() % 26);
    out.push_back(std::move(w));
  }
  return out;
}

}  // namespace

TEST_CASE("flat map: agrees with std::unordered_map through growth") {
  FlatStringMap<int> map;
  std::unordered_map<std::string, int> ref;
  std::vector<std::string> keys = random_words(20000, 7);
  for (size_t i = 0; i < keys.size(); ++i) {
    bool fresh = ref.emplace(keys[i], static_cast<int>(i)).second;
    CHECK(map.emplace(keys[i], static_cast<int>(i)) == fresh);
  }
  REQUIRE(map.size() == ref.size());
  for (const auto& [k, v] : ref) {
    const int* got = map.find(k);
    REQUIRE(got != nullptr);
    CHECK(*got == v);  // the first value stays: a second emplace changes nothing
  }
  // Absent keys: other random words, and prefixes and extensions of present ones.
  size_t absent = 0;
  for (const std::string& w : random_words(20000, 8)) {
    if (ref.count(w)) continue;
    ++absent;
    CHECK(map.find(w) == nullptr);
  }
  for (const std::string& w : keys) {
    std::string longer = w + "x", shorter = w.substr(0, w.size() - 1);
    CHECK((map.find(longer) != nullptr) == (ref.count(longer) == 1));
    CHECK((map.find(shorter) != nullptr) == (ref.count(shorter) == 1));
  }
  CHECK(absent > 10000);
}

TEST_CASE("flat map: reserve, empty keys and the empty map") {
  FlatStringMap<std::string> map;
  CHECK(map.find("anything") == nullptr);
  CHECK(map.find("") == nullptr);
  map.reserve(1000);
  CHECK(map.emplace("", "empty"));
  CHECK_FALSE(map.emplace("", "again"));
  CHECK(map.emplace("her", "pp$"));
  REQUIRE(map.find("") != nullptr);
  CHECK(*map.find("") == "empty");
  REQUIRE(map.find("her") != nullptr);
  CHECK(*map.find("her") == "pp$");
  CHECK(map.find("he") == nullptr);
  CHECK(map.find("hers") == nullptr);
  CHECK(map.size() == 2);
}
