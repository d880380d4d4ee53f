// ByteBudget: the in-flight byte cap of the pipeline, checked by counting (no timing).
#include <catch2/catch.hpp>

#include <thread>

#include "pipeline/budget.h"

using evenhand::pipeline::ByteBudget;

TEST_CASE("the byte budget lets bytes in only while they fit under the cap") {
  ByteBudget b(100);
  REQUIRE(b.try_acquire(60));
  REQUIRE_FALSE(b.try_acquire(41));  // 101 > 100
  REQUIRE(b.try_acquire(40));        // exactly the cap
  REQUIRE_FALSE(b.try_acquire(1));
  b.release(60);
  REQUIRE(b.try_acquire(50));
  REQUIRE_FALSE(b.try_acquire(20));
  REQUIRE(b.peak() == 100);
}

TEST_CASE("one batch larger than the whole cap passes alone") {
  ByteBudget b(100);
  REQUIRE(b.try_acquire(10));
  REQUIRE_FALSE(b.try_acquire(500));
  b.release(10);
  REQUIRE(b.try_acquire(500));  // nothing held: let through, else the pipeline would stall
  REQUIRE_FALSE(b.try_acquire(1));
  b.release(500);
  REQUIRE(b.peak() == 500);
}

TEST_CASE("a waiting acquire returns once bytes are released, and false once closed") {
  ByteBudget b(100);
  REQUIRE(b.acquire(100));
  bool got = false;
  std::thread t([&] { got = b.acquire(30); });
  b.release(100);
  t.join();
  REQUIRE(got);
  ByteBudget c(10);
  REQUIRE(c.acquire(10));
  bool closed_result = true;
  std::thread u([&] { closed_result = c.acquire(5); });
  c.close();
  u.join();
  REQUIRE_FALSE(closed_result);
}
