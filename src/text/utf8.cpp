#include "text/utf8.h"

#include <cstring>

namespace evenhand::text {

namespace {

constexpr char32_t kReplacement = 0xFFFD;

// Decodes one well-formed sequence at s[i]; returns its length, or 0 if ill-formed.
// The byte ranges follow table 3-7 of the Unicode Standard (well-formed UTF-8).
inline size_t decode_one(const unsigned char* p, size_t avail, char32_t& cp) {
  unsigned char b0 = p[0];
  if (b0 < 0x80) {
    cp = b0;
    return 1;
  }
  auto cont = [&](size_t k, unsigned char lo = 0x80, unsigned char hi = 0xBF) {
    return k < avail && p[k] >= lo && p[k] <= hi;
  };
  if (b0 >= 0xC2 && b0 <= 0xDF) {
    if (!cont(1)) return 0;
    cp = (char32_t(b0 & 0x1F) << 6) | (p[1] & 0x3F);
    return 2;
  }
  if (b0 >= 0xE0 && b0 <= 0xEF) {
    unsigned char lo = b0 == 0xE0 ? 0xA0 : 0x80;
    unsigned char hi = b0 == 0xED ? 0x9F : 0xBF;
    if (!cont(1, lo, hi) || !cont(2)) return 0;
    cp = (char32_t(b0 & 0x0F) << 12) | (char32_t(p[1] & 0x3F) << 6) | (p[2] & 0x3F);
    return 3;
  }
  if (b0 >= 0xF0 && b0 <= 0xF4) {
    unsigned char lo = b0 == 0xF0 ? 0x90 : 0x80;
    unsigned char hi = b0 == 0xF4 ? 0x8F : 0xBF;
    if (!cont(1, lo, hi) || !cont(2) || !cont(3)) return 0;
    cp = (char32_t(b0 & 0x07) << 18) | (char32_t(p[1] & 0x3F) << 12) |
         (char32_t(p[2] & 0x3F) << 6) | (p[3] & 0x3F);
    return 4;
  }
  return 0;
}

inline bool ascii8(const unsigned char* p) {
  uint64_t w;
  std::memcpy(&w, p, 8);
  return (w & 0x8080808080808080ULL) == 0;
}

}  // namespace

bool is_ascii(std::string_view s) {
  const auto* p = reinterpret_cast<const unsigned char*>(s.data());
  size_t n = s.size(), i = 0;
  for (; i + 8 <= n; i += 8)
    if (!ascii8(p + i)) return false;
  for (; i < n; ++i)
    if (p[i] >= 0x80) return false;
  return true;
}

bool valid_utf8(std::string_view s) {
  const auto* p = reinterpret_cast<const unsigned char*>(s.data());
  size_t n = s.size(), i = 0;
  while (i < n) {
    if (i + 8 <= n && ascii8(p + i)) {
      i += 8;
      continue;
    }
    char32_t cp;
    size_t len = decode_one(p + i, n - i, cp);
    if (len == 0) return false;
    i += len;
  }
  return true;
}

char32_t decode_utf8(std::string_view s, size_t& i) {
  const auto* p = reinterpret_cast<const unsigned char*>(s.data());
  char32_t cp;
  size_t len = decode_one(p + i, s.size() - i, cp);
  if (len == 0) {
    ++i;
    return kReplacement;
  }
  i += len;
  return cp;
}

char32_t decode_utf8_before(std::string_view s, size_t& i) {
  const auto* p = reinterpret_cast<const unsigned char*>(s.data());
  // Step back over at most three continuation bytes to a lead byte, then check that the
  // sequence starting there is well-formed and ends exactly at i.
  size_t j = i - 1;
  size_t limit = i >= 4 ? i - 4 : 0;
  while (j > limit && (p[j] & 0xC0) == 0x80) --j;
  char32_t cp;
  size_t len = decode_one(p + j, i - j, cp);
  if (len != 0 && j + len == i) {
    i = j;
    return cp;
  }
  --i;
  return p[i] < 0x80 ? char32_t(p[i]) : kReplacement;
}

void append_utf8(char32_t c, std::string& out) {
  if (c >= 0xD800 && (c <= 0xDFFF || c > 0x10FFFF)) c = kReplacement;
  if (c < 0x80) {
    out.push_back(char(c));
  } else if (c < 0x800) {
    out.push_back(char(0xC0 | (c >> 6)));
    out.push_back(char(0x80 | (c & 0x3F)));
  } else if (c < 0x10000) {
    out.push_back(char(0xE0 | (c >> 12)));
    out.push_back(char(0x80 | ((c >> 6) & 0x3F)));
    out.push_back(char(0x80 | (c & 0x3F)));
  } else {
    out.push_back(char(0xF0 | (c >> 18)));
    out.push_back(char(0x80 | ((c >> 12) & 0x3F)));
    out.push_back(char(0x80 | ((c >> 6) & 0x3F)));
    out.push_back(char(0x80 | (c & 0x3F)));
  }
}

void utf8_to_utf16(std::string_view s, std::u16string& out, std::vector<uint32_t>* byte_of) {
  out.clear();
  if (byte_of) byte_of->clear();
  out.reserve(s.size());
  if (byte_of) byte_of->reserve(s.size() + 1);
  size_t i = 0;
  while (i < s.size()) {
    size_t start = i;
    char32_t c = decode_utf8(s, i);
    if (c < 0x10000) {
      out.push_back(char16_t(c));
      if (byte_of) byte_of->push_back(uint32_t(start));
    } else {
      c -= 0x10000;
      out.push_back(char16_t(0xD800 + (c >> 10)));
      out.push_back(char16_t(0xDC00 + (c & 0x3FF)));
      if (byte_of) {
        byte_of->push_back(uint32_t(start));
        byte_of->push_back(uint32_t(start));
      }
    }
  }
  if (byte_of) byte_of->push_back(uint32_t(s.size()));
}

void append_utf16_as_utf8(std::u16string_view s, std::string& out) {
  for (size_t i = 0; i < s.size(); ++i) {
    char32_t c = s[i];
    if (c >= 0xD800 && c <= 0xDBFF && i + 1 < s.size() && s[i + 1] >= 0xDC00 &&
        s[i + 1] <= 0xDFFF) {
      c = 0x10000 + ((c - 0xD800) << 10) + (s[i + 1] - 0xDC00);
      ++i;
    }
    append_utf8(c, out);  // lone surrogates become U+FFFD there
  }
}

}  // namespace evenhand::text
