// A read-mostly hash map from strings to values with open addressing: the keys live in one
// arena and each slot keeps its key's full hash, and a blocked Bloom filter (4 bits per slot,
// two bits of one 64-bit word per key, so one load a probe) turns most absent keys away
// before any slot is read. Built once, then shared read-only by threads (find() is const and does
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
  // Room for n keys (of key_bytes bytes together, if known) without growing.
  void reserve(size_t n, size_t key_bytes = 0) {
    size_t cap = 16;
    while (cap < 2 * n) cap <<= 1;
    if (cap > slots_.size()) rehash(cap);
    arena_.reserve(key_bytes);
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

  // The value of `key` for a change while the map is built, or null.
  V* find_for_update(std::string_view key) {
    return const_cast<V*>(std::as_const(*this).find(key));
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
  // The filter word and the word's bit mask for a hash: the word from a remix of the hash,
  // the two bits from its top twelve bits, neither repeating the low bits that choose the
  // slot.
  std::pair<size_t, uint64_t> bits(uint64_t h) const {
    size_t word = static_cast<size_t>((h * 0x9E3779B97F4A7C15ULL) >> 32) & filter_mask_;
    uint64_t mask = (uint64_t{1} << ((h >> 52) & 63)) | (uint64_t{1} << (h >> 58));
    return {word, mask};
  }
  void mark(uint64_t h) {
    auto [word, mask] = bits(h);
    filter_[word] |= mask;
  }
  bool maybe(uint64_t h) const {
    auto [word, mask] = bits(h);
    return (filter_[word] & mask) == mask;
  }
  void rehash(size_t cap) {
    std::vector<Slot> old = std::move(slots_);
    slots_.assign(cap, Slot{});
    mask_ = cap - 1;
    // 4 filter bits per slot and at most half the slots full: at least 8 bits per key, a
    // false positive rate of about 5% when full (two bits per key within a 64-bit word),
    // lower before.
    filter_.assign(cap / 16, 0);
    filter_mask_ = cap / 16 - 1;
    for (Slot& s : old) {
      if (s.len1 == 0) continue;
      mark(s.hash);
      size_t i = s.hash & mask_;
      while (slots_[i].len1 != 0) i = (i + 1) & mask_;
      slots_[i] = std::move(s);
    }
  }

  std::vector<Slot> slots_;
  std::vector<uint64_t> filter_;  // cap * 4 bits
  size_t filter_mask_ = 0;
  std::string arena_;
  size_t size_ = 0;
  size_t mask_ = 0;
};

}  // namespace evenhand
