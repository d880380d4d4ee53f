// JSON string escaping and unescaping (RFC 8259 section 7) with a decoded-to-raw alignment.
#include "corpus/json_string.h"

namespace evenhand::corpus {

namespace {

bool needs_escape(unsigned char c) {
  return c < 0x20 || c == '"' || c == '\\';
}

bool is_continuation(unsigned char c) {
  return (c & 0xC0) == 0x80;
}

// Parses 4 hex digits at raw[pos..pos+4); returns -1 when they are missing or not hex.
int32_t parse_hex4(std::string_view raw, size_t pos) {
  if (pos + 4 > raw.size()) return -1;
  int32_t v = 0;
  for (size_t k = pos; k < pos + 4; ++k) {
    char c = raw[k];
    int d;
    if (c >= '0' && c <= '9') {
      d = c - '0';
    } else if (c >= 'a' && c <= 'f') {
      d = c - 'a' + 10;
    } else if (c >= 'A' && c <= 'F') {
      d = c - 'A' + 10;
    } else {
      return -1;
    }
    v = v * 16 + d;
  }
  return v;
}

void append_utf8(uint32_t cp, std::string& out) {
  if (cp < 0x80) {
    out.push_back(static_cast<char>(cp));
  } else if (cp < 0x800) {
    out.push_back(static_cast<char>(0xC0 | (cp >> 6)));
    out.push_back(static_cast<char>(0x80 | (cp & 0x3F)));
  } else if (cp < 0x10000) {
    out.push_back(static_cast<char>(0xE0 | (cp >> 12)));
    out.push_back(static_cast<char>(0x80 | ((cp >> 6) & 0x3F)));
    out.push_back(static_cast<char>(0x80 | (cp & 0x3F)));
  } else {
    out.push_back(static_cast<char>(0xF0 | (cp >> 18)));
    out.push_back(static_cast<char>(0x80 | ((cp >> 12) & 0x3F)));
    out.push_back(static_cast<char>(0x80 | ((cp >> 6) & 0x3F)));
    out.push_back(static_cast<char>(0x80 | (cp & 0x3F)));
  }
}

}  // namespace

void append_json_escaped(std::string_view utf8, std::string& out) {
  static constexpr char kHex[] = "0123456789abcdef";
  size_t run = 0;  // start of the pending run of bytes copied as they are
  for (size_t i = 0; i < utf8.size(); ++i) {
    unsigned char c = static_cast<unsigned char>(utf8[i]);
    if (!needs_escape(c)) continue;
    out.append(utf8.data() + run, i - run);
    run = i + 1;
    switch (c) {
      case '"':
        out += "\\\"";
        break;
      case '\\':
        out += "\\\\";
        break;
      case '\b':
        out += "\\b";
        break;
      case '\f':
        out += "\\f";
        break;
      case '\n':
        out += "\\n";
        break;
      case '\r':
        out += "\\r";
        break;
      case '\t':
        out += "\\t";
        break;
      default:
        out += "\\u00";
        out.push_back(kHex[c >> 4]);
        out.push_back(kHex[c & 0xF]);
    }
  }
  out.append(utf8.data() + run, utf8.size() - run);
}

// `out` and `*align` are replaced, not appended to.
bool unescape_json_string(std::string_view raw, std::string& out, std::vector<uint32_t>* align) {
  out.clear();
  if (align) align->clear();
  out.reserve(raw.size());
  if (align) align->reserve(raw.size() + 1);
  size_t i = 0;
  const size_t n = raw.size();
  while (i < n) {
    if (raw[i] != '\\') {
      size_t j = i;
      while (j < n && raw[j] != '\\') ++j;
      if (align) {
        // Each byte maps to the start of its character: a continuation byte inherits the
        // offset of the byte before it.
        for (size_t k = i; k < j; ++k) {
          bool cont = k > i && is_continuation(static_cast<unsigned char>(raw[k]));
          align->push_back(cont ? align->back() : static_cast<uint32_t>(k));
        }
      }
      out.append(raw.data() + i, j - i);
      i = j;
      continue;
    }
    const size_t start = i;
    if (i + 1 >= n) return false;  // a lone backslash at the end
    char e = raw[i + 1];
    size_t before = out.size();
    switch (e) {
      case '"':
        out.push_back('"');
        i += 2;
        break;
      case '\\':
        out.push_back('\\');
        i += 2;
        break;
      case '/':
        out.push_back('/');
        i += 2;
        break;
      case 'b':
        out.push_back('\b');
        i += 2;
        break;
      case 'f':
        out.push_back('\f');
        i += 2;
        break;
      case 'n':
        out.push_back('\n');
        i += 2;
        break;
      case 'r':
        out.push_back('\r');
        i += 2;
        break;
      case 't':
        out.push_back('\t');
        i += 2;
        break;
      case 'u': {
        int32_t hi = parse_hex4(raw, i + 2);
        if (hi < 0) return false;
        i += 6;
        uint32_t cp = static_cast<uint32_t>(hi);
        if (cp >= 0xDC00 && cp <= 0xDFFF) return false;  // low surrogate without a high one
        if (cp >= 0xD800 && cp <= 0xDBFF) {
          // A high surrogate must be followed at once by an escaped low surrogate.
          if (i + 1 >= n || raw[i] != '\\' || raw[i + 1] != 'u') return false;
          int32_t lo = parse_hex4(raw, i + 2);
          if (lo < 0xDC00 || lo > 0xDFFF) return false;
          i += 6;
          cp = 0x10000 + ((cp - 0xD800) << 10) + (static_cast<uint32_t>(lo) - 0xDC00);
        }
        append_utf8(cp, out);
        break;
      }
      default:
        return false;
    }
    if (align) align->insert(align->end(), out.size() - before, static_cast<uint32_t>(start));
  }
  if (align) align->push_back(static_cast<uint32_t>(n));
  return true;
}

}  // namespace evenhand::corpus
