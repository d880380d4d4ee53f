// A read-mostly hash map from strings to values with open addressing: the keys live in one
// arena and each slot keeps its key's full hash, and a two-probe Bloom filter of 8 bits per
// slot (one byte per slot, small enough to stay in cache) turns most absent keys away before
// any slot is read. Built once, then shared read-only by threads (find() is const and does
// not allocate); for the large lexicons and feature tables probed per token.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "base/word_hash.h"

namespace evenhand {

template <class V>
class FlatStringMap {
 public:
  // Room for n keys without growing.
  void reserve(size_t n) {
    size_t cap = 16;
    while (cap < 2 * n) cap <<= 1;
    if (cap > slots_.size()) rehash(cap);
  }

  // Inserts key -> value; false (and no change) if the key is already there.
  bool emplace(std::string_view key, V value) {
    if (2 * (size_ + 1) > slots_.size()) rehash(slots_.empty() ? 16 : 2 * slots_.size());
    uint64_t h = WordHash{}(key);
    size_t i = h & mask_;
    for (; slots_[i].len1 != 0; i = (i + 1) & mask_) {
      if (slots_[i].hash == h && key_of(slots_[i]) == key) return false;
    }
    Slot& s = slots_[i];
    mark(h);
    s.hash = h;
    s.off = static_cast<uint32_t>(arena_.size());
    s.len1 = static_cast<uint32_t>(key.size() + 1);
    s.value = std::move(value);
    arena_.append(key);
    ++size_;
    return true;
  }

  const V* find(std::string_view key) const { return find(key, WordHash{}(key)); }

  // find() for a caller that has hashed `key` with WordHash already.
  const V* find(std::string_view key, uint64_t h) const {
    if (size_ == 0 || !maybe(h)) return nullptr;
    for (size_t i = h & mask_; slots_[i].len1 != 0; i = (i + 1) & mask_) {
      const Slot& s = slots_[i];
      if (s.hash == h && key_of(s) == key) return &s.value;
    }
    return nullptr;
  }

  size_t size() const { return size_; }

 private:
  struct Slot {
    uint64_t hash = 0;
    uint32_t off = 0;
    uint32_t len1 = 0;  // key length + 1; 0 marks an empty slot
    V value{};
  };
  std::string_view key_of(const Slot& s) const {
    return std::string_view(arena_.data() + s.off, s.len1 - 1);
  }
  // The filter's two bits for a hash: taken from the high bits and from a remix, so that
  // they do not repeat the low bits that choose the slot.
  std::pair<size_t, size_t> bits(uint64_t h) const {
    uint64_t h2 = h * 0x9E3779B97F4A7C15ULL;
    return {static_cast<size_t>(h >> 40) & filter_mask_,
            static_cast<size_t>(h2 >> 40) & filter_mask_};
  }
  void mark(uint64_t h) {
    auto [a, b] = bits(h);
    filter_[a >> 6] |= uint64_t{1} << (a & 63);
    filter_[b >> 6] |= uint64_t{1} << (b & 63);
  }
  bool maybe(uint64_t h) const {
    auto [a, b] = bits(h);
    return ((filter_[a >> 6] >> (a & 63)) & (filter_[b >> 6] >> (b & 63)) & 1) != 0;
  }
  void rehash(size_t cap) {
    std::vector<Slot> old = std::move(slots_);
    slots_.assign(cap, Slot{});
    mask_ = cap - 1;
    // 8 filter bits per slot, at most half the slots full: a false positive rate near 1.4%
    // when full (two probes, 16 bits per key), lower before.
    filter_.assign(cap / 8, 0);
    filter_mask_ = cap * 8 - 1;
    for (Slot& s : old) {
      if (s.len1 == 0) continue;
      mark(s.hash);
      size_t i = s.hash & mask_;
      while (slots_[i].len1 != 0) i = (i + 1) & mask_;
      slots_[i] = std::move(s);
    }
  }

  std::vector<Slot> slots_;
  std::vector<uint64_t> filter_;  // cap * 8 bits
  size_t filter_mask_ = 0;
  std::string arena_;
  size_t size_ = 0;
  size_t mask_ = 0;
};

}  // namespace evenhand
