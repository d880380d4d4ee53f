// A byte budget shared by threads: the pipeline takes a batch's input bytes from it before
// handing the batch to the workers and gives them back once the batch is written, so the
// bytes held by batches in flight never exceed the cap (one batch larger than the whole cap
// is let through alone). close() wakes every waiter for good.
#pragma once

#include <algorithm>
#include <condition_variable>
#include <cstdint>
#include <mutex>

namespace evenhand::pipeline {

class ByteBudget {
 public:
  explicit ByteBudget(uint64_t cap) : cap_(cap) {}
  ByteBudget(const ByteBudget&) = delete;
  ByteBudget& operator=(const ByteBudget&) = delete;

  // Waits until `n` more bytes fit under the cap, or nothing is held, and takes them.
  // Returns false (taking nothing) when the budget was closed.
  bool acquire(uint64_t n) {
    std::unique_lock<std::mutex> lock(mu_);
    cv_.wait(lock, [&] { return closed_ || fits(n); });
    if (closed_) return false;
    take(n);
    return true;
  }

  // Takes `n` bytes if they fit now (as acquire() would without waiting); true if taken.
  bool try_acquire(uint64_t n) {
    std::lock_guard<std::mutex> lock(mu_);
    if (closed_ || !fits(n)) return false;
    take(n);
    return true;
  }

  // Gives back `n` bytes taken before.
  void release(uint64_t n) {
    {
      std::lock_guard<std::mutex> lock(mu_);
      held_ -= std::min(n, held_);
    }
    cv_.notify_all();
  }

  void close() {
    {
      std::lock_guard<std::mutex> lock(mu_);
      closed_ = true;
    }
    cv_.notify_all();
  }

  uint64_t cap() const { return cap_; }
  // The most bytes ever held at once.
  uint64_t peak() const {
    std::lock_guard<std::mutex> lock(mu_);
    return peak_;
  }

 private:
  bool fits(uint64_t n) const { return held_ == 0 || held_ + n <= cap_; }
  void take(uint64_t n) {
    held_ += n;
    peak_ = std::max(peak_, held_);
  }

  const uint64_t cap_;
  mutable std::mutex mu_;
  std::condition_variable cv_;
  uint64_t held_ = 0;
  uint64_t peak_ = 0;
  bool closed_ = false;
};

}  // namespace evenhand::pipeline
