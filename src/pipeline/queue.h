// A blocking multi-producer multi-consumer FIFO for handing batches between threads. It
// holds no limit of its own: the pipeline bounds what is in flight with a counting
// semaphore. close() wakes every waiter; pop() then drains what is left and returns false.
#pragma once

#include <condition_variable>
#include <deque>
#include <mutex>
#include <utility>

namespace evenhand::pipeline {

template <typename T>
class WorkQueue {
 public:
  WorkQueue() = default;
  WorkQueue(const WorkQueue&) = delete;
  WorkQueue& operator=(const WorkQueue&) = delete;

  // Appends an item; ignored after close().
  void push(T item) {
    {
      std::lock_guard<std::mutex> lock(mu_);
      if (closed_) return;
      items_.push_back(std::move(item));
    }
    cv_.notify_one();
  }

  // Waits for an item. Returns false when the queue is closed and empty.
  bool pop(T& out) {
    std::unique_lock<std::mutex> lock(mu_);
    cv_.wait(lock, [&] { return closed_ || !items_.empty(); });
    if (items_.empty()) return false;
    out = std::move(items_.front());
    items_.pop_front();
    return true;
  }

  void close() {
    {
      std::lock_guard<std::mutex> lock(mu_);
      closed_ = true;
    }
    cv_.notify_all();
  }

 private:
  std::mutex mu_;
  std::condition_variable cv_;
  std::deque<T> items_;
  bool closed_ = false;
};

}  // namespace evenhand::pipeline
