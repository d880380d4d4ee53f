// SHA-256 as specified in FIPS 180-4 (sections 4.1.2, 4.2.2, 5.1.1, 5.3.3, 6.2): a portable
// compression function and one built on the x86 SHA extensions, picked at run time.
#include "base/sha256.h"

#include <algorithm>
#include <cstring>

#if defined(__x86_64__) || defined(__i386__)
#include <cpuid.h>
#include <immintrin.h>
#define EVENHAND_SHA256_X86 1
#endif

namespace evenhand {
namespace {

// FIPS 180-4 section 4.2.2: the first 32 bits of the fractional parts of the cube roots of
// the first 64 primes.
alignas(16) constexpr uint32_t kK[64] = {
    0x428a2f98, 0x71374491, 0xb5c0fbcf, 0xe9b5dba5, 0x3956c25b, 0x59f111f1, 0x923f82a4, 0xab1c5ed5,
    0xd807aa98, 0x12835b01, 0x243185be, 0x550c7dc3, 0x72be5d74, 0x80deb1fe, 0x9bdc06a7, 0xc19bf174,
    0xe49b69c1, 0xefbe4786, 0x0fc19dc6, 0x240ca1cc, 0x2de92c6f, 0x4a7484aa, 0x5cb0a9dc, 0x76f988da,
    0x983e5152, 0xa831c66d, 0xb00327c8, 0xbf597fc7, 0xc6e00bf3, 0xd5a79147, 0x06ca6351, 0x14292967,
    0x27b70a85, 0x2e1b2138, 0x4d2c6dfc, 0x53380d13, 0x650a7354, 0x766a0abb, 0x81c2c92e, 0x92722c85,
    0xa2bfe8a1, 0xa81a664b, 0xc24b8b70, 0xc76c51a3, 0xd192e819, 0xd6990624, 0xf40e3585, 0x106aa070,
    0x19a4c116, 0x1e376c08, 0x2748774c, 0x34b0bcb5, 0x391c0cb3, 0x4ed8aa4a, 0x5b9cca4f, 0x682e6ff3,
    0x748f82ee, 0x78a5636f, 0x84c87814, 0x8cc70208, 0x90befffa, 0xa4506ceb, 0xbef9a3f7, 0xc67178f2};

// FIPS 180-4 section 5.3.3: initial hash value.
constexpr std::array<uint32_t, 8> kInit = {0x6a09e667, 0xbb67ae85, 0x3c6ef372, 0xa54ff53a,
                                           0x510e527f, 0x9b05688c, 0x1f83d9ab, 0x5be0cd19};

inline uint32_t rotr(uint32_t x, int n) {
  return (x >> n) | (x << (32 - n));
}

inline uint32_t load_be32(const uint8_t* p) {
  return (uint32_t(p[0]) << 24) | (uint32_t(p[1]) << 16) | (uint32_t(p[2]) << 8) | uint32_t(p[3]);
}

// FIPS 180-4 section 6.2.2, one 64-byte block at a time.
void compress_portable(uint32_t* state, const uint8_t* blocks, size_t count) {
  uint32_t w[64];
  for (; count > 0; --count, blocks += 64) {
    for (int t = 0; t < 16; ++t) w[t] = load_be32(blocks + 4 * t);
    for (int t = 16; t < 64; ++t) {
      uint32_t s0 = rotr(w[t - 15], 7) ^ rotr(w[t - 15], 18) ^ (w[t - 15] >> 3);
      uint32_t s1 = rotr(w[t - 2], 17) ^ rotr(w[t - 2], 19) ^ (w[t - 2] >> 10);
      w[t] = w[t - 16] + s0 + w[t - 7] + s1;
    }
    uint32_t a = state[0], b = state[1], c = state[2], d = state[3];
    uint32_t e = state[4], f = state[5], g = state[6], h = state[7];
    for (int t = 0; t < 64; ++t) {
      uint32_t big_s1 = rotr(e, 6) ^ rotr(e, 11) ^ rotr(e, 25);
      uint32_t ch = (e & f) ^ (~e & g);
      uint32_t t1 = h + big_s1 + ch + kK[t] + w[t];
      uint32_t big_s0 = rotr(a, 2) ^ rotr(a, 13) ^ rotr(a, 22);
      uint32_t maj = (a & b) ^ (a & c) ^ (b & c);
      uint32_t t2 = big_s0 + maj;
      h = g;
      g = f;
      f = e;
      e = d + t1;
      d = c;
      c = b;
      b = a;
      a = t1 + t2;
    }
    state[0] += a;
    state[1] += b;
    state[2] += c;
    state[3] += d;
    state[4] += e;
    state[5] += f;
    state[6] += g;
    state[7] += h;
  }
}

#ifdef EVENHAND_SHA256_X86
// The same function with SHA256RNDS2 / SHA256MSG1 / SHA256MSG2. The instructions keep the
// working variables as ABEF and CDGH halves, so the state is shuffled in and out.
__attribute__((target("sha,sse4.1"))) void compress_sha_ni(uint32_t* state, const uint8_t* blocks,
                                                           size_t count) {
  // Byte order within each 32-bit word: message words are big-endian.
  const __m128i bswap = _mm_set_epi64x(0x0c0d0e0f08090a0bULL, 0x0405060700010203ULL);

  __m128i tmp = _mm_loadu_si128(reinterpret_cast<const __m128i*>(&state[0]));     // ABCD
  __m128i state1 = _mm_loadu_si128(reinterpret_cast<const __m128i*>(&state[4]));  // EFGH
  tmp = _mm_shuffle_epi32(tmp, 0xB1);                                             // CDAB
  state1 = _mm_shuffle_epi32(state1, 0x1B);                                       // EFGH rev
  __m128i state0 = _mm_alignr_epi8(tmp, state1, 8);                               // ABEF
  state1 = _mm_blend_epi16(state1, tmp, 0xF0);                                    // CDGH

  for (; count > 0; --count, blocks += 64) {
    const __m128i abef_save = state0;
    const __m128i cdgh_save = state1;
    __m128i w[4];
    for (int i = 0; i < 4; ++i) {
      w[i] = _mm_shuffle_epi8(_mm_loadu_si128(reinterpret_cast<const __m128i*>(blocks + 16 * i)),
                              bswap);
    }
    for (int g = 0; g < 16; ++g) {
      // Four rounds with W[4g..4g+3] + K[4g..4g+3]; RNDS2 does two rounds per call.
      __m128i msg =
          _mm_add_epi32(w[g & 3], _mm_load_si128(reinterpret_cast<const __m128i*>(&kK[4 * g])));
      state1 = _mm_sha256rnds2_epu32(state1, state0, msg);
      msg = _mm_shuffle_epi32(msg, 0x0E);
      state0 = _mm_sha256rnds2_epu32(state0, state1, msg);
      if (g < 12) {
        // W[4g+16..4g+19] = sigma1(W[t-2]) + W[t-7] + sigma0(W[t-15]) + W[t-16].
        __m128i s = _mm_sha256msg1_epu32(w[g & 3], w[(g + 1) & 3]);
        s = _mm_add_epi32(s, _mm_alignr_epi8(w[(g + 3) & 3], w[(g + 2) & 3], 4));
        w[g & 3] = _mm_sha256msg2_epu32(s, w[(g + 3) & 3]);
      }
    }
    state0 = _mm_add_epi32(state0, abef_save);
    state1 = _mm_add_epi32(state1, cdgh_save);
  }

  tmp = _mm_shuffle_epi32(state0, 0x1B);        // FEBA
  state1 = _mm_shuffle_epi32(state1, 0xB1);     // DCHG
  state0 = _mm_blend_epi16(tmp, state1, 0xF0);  // DCBA
  state1 = _mm_alignr_epi8(state1, tmp, 8);     // ABEF
  _mm_storeu_si128(reinterpret_cast<__m128i*>(&state[0]), state0);
  _mm_storeu_si128(reinterpret_cast<__m128i*>(&state[4]), state1);
}
#endif

bool detect_sha_ni() {
#ifdef EVENHAND_SHA256_X86
  // CPUID directly: clang 14's __builtin_cpu_supports does not know "sha".
  unsigned eax = 0, ebx = 0, ecx = 0, edx = 0;
  if (!__get_cpuid(1, &eax, &ebx, &ecx, &edx) || !(ecx & bit_SSE4_1)) return false;
  if (!__get_cpuid_count(7, 0, &eax, &ebx, &ecx, &edx)) return false;
  return (ebx & bit_SHA) != 0;
#else
  return false;
#endif
}

}  // namespace

namespace detail {

bool sha256_sha_ni_available() {
  static const bool available = detect_sha_ni();
  return available;
}

std::string sha256_hex_via(Sha256Path path, std::string_view data) {
  Sha256 h;
  h.use_sha_ni_ = path == Sha256Path::sha_ni && sha256_sha_ni_available();
  h.update(data);
  return h.finish_hex();
}

}  // namespace detail

Sha256::Sha256() : use_sha_ni_(detail::sha256_sha_ni_available()), h_(kInit), buf_{} {}

void Sha256::compress(const uint8_t* blocks, size_t count) {
#ifdef EVENHAND_SHA256_X86
  if (use_sha_ni_) {
    compress_sha_ni(h_.data(), blocks, count);
    return;
  }
#endif
  compress_portable(h_.data(), blocks, count);
}

void Sha256::update(const void* data, size_t size) {
  if (size == 0) return;
  const uint8_t* p = static_cast<const uint8_t*>(data);
  total_ += size;
  if (buf_len_ > 0) {
    size_t take = std::min(size, buf_.size() - buf_len_);
    std::memcpy(buf_.data() + buf_len_, p, take);
    buf_len_ += take;
    p += take;
    size -= take;
    if (buf_len_ < buf_.size()) return;
    compress(buf_.data(), 1);
    buf_len_ = 0;
  }
  if (size >= 64) {
    size_t blocks = size / 64;
    compress(p, blocks);
    p += blocks * 64;
    size -= blocks * 64;
  }
  if (size > 0) {
    std::memcpy(buf_.data(), p, size);
    buf_len_ = size;
  }
}

std::array<uint8_t, 32> Sha256::finish() {
  // FIPS 180-4 section 5.1.1: append 0x80, zeros to 56 mod 64, then the bit length (64-bit
  // big-endian).
  const uint64_t bits = total_ * 8;
  buf_[buf_len_++] = 0x80;
  if (buf_len_ > 56) {
    std::memset(buf_.data() + buf_len_, 0, buf_.size() - buf_len_);
    compress(buf_.data(), 1);
    buf_len_ = 0;
  }
  std::memset(buf_.data() + buf_len_, 0, 56 - buf_len_);
  for (int i = 0; i < 8; ++i) buf_[56 + i] = uint8_t(bits >> (56 - 8 * i));
  compress(buf_.data(), 1);

  std::array<uint8_t, 32> out;
  for (int i = 0; i < 8; ++i) {
    out[4 * i] = uint8_t(h_[i] >> 24);
    out[4 * i + 1] = uint8_t(h_[i] >> 16);
    out[4 * i + 2] = uint8_t(h_[i] >> 8);
    out[4 * i + 3] = uint8_t(h_[i]);
  }
  h_ = kInit;
  buf_len_ = 0;
  total_ = 0;
  return out;
}

std::string Sha256::finish_hex() {
  static constexpr char kHex[] = "0123456789abcdef";
  const std::array<uint8_t, 32> digest = finish();
  std::string out(64, '0');
  for (size_t i = 0; i < digest.size(); ++i) {
    out[2 * i] = kHex[digest[i] >> 4];
    out[2 * i + 1] = kHex[digest[i] & 15];
  }
  return out;
}

std::string sha256_hex(std::string_view data) {
  Sha256 h;
  h.update(data);
  return h.finish_hex();
}

}  // namespace evenhand
