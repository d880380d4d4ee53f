// SHA-256 (FIPS 180-4) for the manifest's file and pack identities. Incremental: feed bytes
// as they stream past, then take the digest. Uses the x86 SHA extensions when the CPU has
// them and a portable implementation otherwise; both give the same digest.
#pragma once

#include <array>
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

namespace evenhand {

namespace detail {
// Which compression function a Sha256 uses; exposed so tests can compare the two paths.
enum class Sha256Path { portable, sha_ni };
// True when this CPU has the x86 SHA extensions (and SSE4.1) and the SHA-NI path can run.
bool sha256_sha_ni_available();
// Hex SHA-256 of `data` computed with the given path. Falls back to the portable path when
// sha_ni is asked for but not available (check sha256_sha_ni_available() first).
std::string sha256_hex_via(Sha256Path path, std::string_view data);
}  // namespace detail

class Sha256 {
 public:
  Sha256();
  // Adds bytes to the message.
  void update(const void* data, size_t size);
  void update(std::string_view s) { update(s.data(), s.size()); }
  // Finishes the message and returns the 32-byte digest; the object is reset afterwards.
  std::array<uint8_t, 32> finish();
  // finish() as 64 lower-case hex digits.
  std::string finish_hex();

 private:
  friend std::string detail::sha256_hex_via(detail::Sha256Path path, std::string_view data);
  void compress(const uint8_t* blocks, size_t count);
  bool use_sha_ni_ = false;
  std::array<uint32_t, 8> h_;
  std::array<uint8_t, 64> buf_;
  size_t buf_len_ = 0;
  uint64_t total_ = 0;
};

// Hex SHA-256 of a whole buffer.
std::string sha256_hex(std::string_view data);

}  // namespace evenhand
