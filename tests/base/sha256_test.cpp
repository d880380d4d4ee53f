// SHA-256 against the NIST example vectors, the coreutils sha256sum command, and the two
// compression paths (portable and SHA-NI) against each other.
#include <unistd.h>

#include <catch2/catch.hpp>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <random>
#include <string>

#include "base/sha256.h"

using evenhand::Sha256;
using evenhand::sha256_hex;
namespace detail = evenhand::detail;

namespace {

std::string random_bytes(std::mt19937& rng, size_t n) {
  std::string s(n, '\0');
  for (char& c : s) c = char(rng() & 0xFF);
  return s;
}

// Both paths when the CPU allows it, else only the portable one.
std::vector<detail::Sha256Path> paths() {
  std::vector<detail::Sha256Path> p = {detail::Sha256Path::portable};
  if (detail::sha256_sha_ni_available()) p.push_back(detail::Sha256Path::sha_ni);
  return p;
}

}  // namespace

// source: NIST FIPS 180-4 example "SHA256.pdf" (CSRC examples, one-block message "abc").
TEST_CASE("sha256: NIST one-block message abc", "[sha256]") {
  const std::string expected = "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad";
  CHECK(sha256_hex("abc") == expected);
  for (auto p : paths()) CHECK(detail::sha256_hex_via(p, "abc") == expected);
}

// source: NIST FIPS 180-4 example "SHA256.pdf" (two-block 448-bit message).
TEST_CASE("sha256: NIST two-block 448-bit message", "[sha256]") {
  const std::string msg = "abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq";
  REQUIRE(msg.size() * 8 == 448);
  const std::string expected = "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1";
  CHECK(sha256_hex(msg) == expected);
  for (auto p : paths()) CHECK(detail::sha256_hex_via(p, msg) == expected);
}

// source: NIST FIPS 180-2 appendix B.3 / NIST SHA-256 examples (one million 'a').
TEST_CASE("sha256: NIST one million a", "[sha256]") {
  const std::string msg(1000000, 'a');
  const std::string expected = "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0";
  CHECK(sha256_hex(msg) == expected);
  for (auto p : paths()) CHECK(detail::sha256_hex_via(p, msg) == expected);
  // Fed one byte at a time through the streaming interface.
  Sha256 h;
  for (size_t i = 0; i < msg.size(); ++i) h.update(&msg[i], 1);
  CHECK(h.finish_hex() == expected);
}

// source: from memory (well-known digest of the empty message); cross-checked against
// sha256sum below.
TEST_CASE("sha256: empty message", "[sha256]") {
  CHECK(sha256_hex("") == "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
}

TEST_CASE("sha256: finish resets the object", "[sha256]") {
  Sha256 h;
  h.update("abc");
  const std::string first = h.finish_hex();
  h.update("abc");
  CHECK(h.finish_hex() == first);
  CHECK(h.finish_hex() == sha256_hex(""));
}

// The SHA-NI path must agree with the portable one on every length, including lengths
// around the 55/56/64-byte padding boundaries.
TEST_CASE("sha256: portable and SHA-NI paths agree", "[sha256]") {
  if (!detail::sha256_sha_ni_available()) {
    WARN("CPU lacks the SHA extensions; only the portable path is available");
    return;
  }
  std::mt19937 rng(12345);
  for (size_t n = 0; n <= 1000; ++n) {
    const std::string data = random_bytes(rng, n);
    INFO("length " << n);
    REQUIRE(detail::sha256_hex_via(detail::Sha256Path::portable, data) ==
            detail::sha256_hex_via(detail::Sha256Path::sha_ni, data));
  }
}

TEST_CASE("sha256: incremental updates in odd pieces equal one shot", "[sha256]") {
  std::mt19937 rng(777);
  for (int trial = 0; trial < 200; ++trial) {
    const size_t n = rng() % 5000;
    const std::string data = random_bytes(rng, n);
    Sha256 h;
    size_t pos = 0;
    while (pos < n) {
      size_t piece = std::min<size_t>(n - pos, rng() % 131);  // includes 0-length pieces
      h.update(data.data() + pos, piece);
      pos += piece;
    }
    INFO("length " << n);
    REQUIRE(h.finish_hex() == sha256_hex(data));
  }
}

// source: GNU coreutils sha256sum (Debian package coreutils).
TEST_CASE("sha256: agrees with the sha256sum command", "[sha256]") {
  if (std::system("command -v sha256sum >/dev/null 2>&1") != 0) {
    WARN("sha256sum not on PATH; skipped");
    return;
  }
  char tmpl[] = "/tmp/evenhand-sha256-XXXXXX";
  REQUIRE(mkdtemp(tmpl) != nullptr);
  const std::filesystem::path dir = tmpl;
  std::mt19937 rng(2024);
  for (size_t n : {size_t(0), size_t(55), size_t(64), size_t(1000), size_t(3 * 1024 * 1024 + 7)}) {
    const std::string data = random_bytes(rng, n);
    const std::filesystem::path file = dir / ("data-" + std::to_string(n));
    {
      std::ofstream out(file, std::ios::binary);
      out.write(data.data(), std::streamsize(data.size()));
    }
    const std::string cmd = "sha256sum '" + file.string() + "'";
    FILE* pipe = popen(cmd.c_str(), "r");
    REQUIRE(pipe != nullptr);
    char line[256] = {};
    const bool got = std::fgets(line, sizeof line, pipe) != nullptr;
    pclose(pipe);
    REQUIRE(got);
    INFO("length " << n);
    CHECK(std::string(line, 64) == sha256_hex(data));
  }
  std::filesystem::remove_all(dir);
}
