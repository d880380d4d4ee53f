#include "text/tokenize.h"

#include <unicode/brkiter.h>
#include <unicode/locid.h>
#include <unicode/ubrk.h>
#include <unicode/uchar.h>
#include <unicode/utext.h>

#include <algorithm>
#include <array>
#include <cstring>

#include "text/utf8.h"

namespace evenhand::text {

namespace {

// Word_Break classes that occur in ASCII (UAX #29, table 3 of the annex; ICU's word rules).
// In ASCII there are no Extend, Format, ZWJ, Regional_Indicator or Hebrew_Letter
// characters, so Single_Quote (') acts exactly like MidNumLet and Double_Quote like Other.
enum Cls : uint8_t {
  kOther,
  kCR,
  kLF,
  kNewline,    // U+000B, U+000C
  kWSegSpace,  // U+0020
  kLetter,     // ALetter: A-Z a-z (and '@' in ICU 72, see probe_tailoring)
  kDigit,      // Numeric: 0-9
  kExtNumLet,  // ExtendNumLet: '_'
  kMidLetter,  // MidLetter: ':' in UAX #29, but ICU's word rules take it out
  kMidNumLet,  // MidNumLet '.' and Single_Quote '\''
  kMidNum,     // MidNum: ',' ';'
};

using ClassTable = std::array<uint8_t, 128>;

ClassTable base_table() {
  ClassTable t{};
  t.fill(kOther);
  t['\r'] = kCR;
  t['\n'] = kLF;
  t['\v'] = kNewline;
  t['\f'] = kNewline;
  t[' '] = kWSegSpace;
  for (int c = 'a'; c <= 'z'; ++c) t[c] = kLetter;
  for (int c = 'A'; c <= 'Z'; ++c) t[c] = kLetter;
  for (int c = '0'; c <= '9'; ++c) t[c] = kDigit;
  t['_'] = kExtNumLet;
  t[':'] = kMidLetter;
  t['.'] = kMidNumLet;
  t['\''] = kMidNumLet;
  t[','] = kMidNum;
  t[';'] = kMidNum;
  return t;
}

inline bool ascii_space(unsigned char c) {
  return c == ' ' || (c >= '\t' && c <= '\r');
}

// True if there is a word boundary at byte i (p[i-1] and p[i] both ASCII) that no rule can
// look across: after ASCII white space and before an ASCII character. UAX #29 joins such a
// pair only by WB3 (CR x LF) and WB3d (space x space); WB4 cannot apply because an ASCII
// character is never Extend/Format/ZWJ, and no context rule (WB6/7, WB11/12, WB15/16)
// reaches over white space. So text on either side can be segmented on its own.
inline bool firm_boundary(const unsigned char* p, size_t i) {
  unsigned char a = p[i - 1], c = p[i];
  if (!ascii_space(a) || c >= 0x80) return false;
  if (a == '\r' && c == '\n') return false;
  if (a == ' ' && c == ' ') return false;
  return true;
}

// Length (3) of a character at p[q] that UAX #29 gives the class Other and that is common in
// prose, or 0: U+2013 EN DASH, U+2014 EM DASH, U+201C and U+201D double quotation marks,
// U+2026 HORIZONTAL ELLIPSIS (WordBreakProperty.txt lists none of them, so they are Other).
// Only when ASCII or the end follows: an Other character then stands alone (no rule joins it
// to either side; WB4 could attach only a non-ASCII Extend, Format or ZWJ after it), and as
// context it acts as the ends of a text do, so each side can be segmented on its own.
size_t lone_other(const unsigned char* p, size_t q, size_t n) {
  if (q + 3 > n || p[q] != 0xE2 || p[q + 1] != 0x80) return 0;
  unsigned char c = p[q + 2];
  bool other = c == 0x93 || c == 0x94 || c == 0x9C || c == 0x9D || c == 0xA6;
  if (!other || (q + 3 < n && p[q + 3] >= 0x80)) return 0;
  return 3;
}

size_t find_non_ascii(const unsigned char* p, size_t from, size_t n) {
  size_t i = from;
  for (; i + 8 <= n; i += 8) {
    uint64_t w;
    std::memcpy(&w, p + i, 8);
    if (w & 0x8080808080808080ULL) break;
  }
  for (; i < n; ++i)
    if (p[i] >= 0x80) return i;
  return n;
}

TokenKind kind_from_status(int32_t status, std::string_view seg) {
  if (status >= UBRK_WORD_LETTER && status < UBRK_WORD_IDEO_LIMIT) return TokenKind::word;
  if (status >= UBRK_WORD_NUMBER && status < UBRK_WORD_NUMBER_LIMIT) return TokenKind::number;
  size_t i = 0;
  while (i < seg.size())
    if (!u_isUWhiteSpace(UChar32(decode_utf8(seg, i)))) return TokenKind::punct;
  return seg.empty() ? TokenKind::punct : TokenKind::space;
}

}  // namespace

struct Tokenizer::Impl {
  std::unique_ptr<icu::BreakIterator> bi;  // null only if ICU has no word rules (no data)
  UText ut = UTEXT_INITIALIZER;
  ClassTable cls = base_table();

  Impl() {
    UErrorCode st = U_ZERO_ERROR;
    bi.reset(icu::BreakIterator::createWordInstance(icu::Locale::getRoot(), st));
    if (U_FAILURE(st)) bi.reset();
    probe_tailoring();
  }
  ~Impl() { utext_close(&ut); }

  // ICU tailors the UAX #29 classes of two ASCII characters, and the tailoring has changed
  // between ICU releases: ':' is taken out of MidLetter, and ICU 72 counts '@' as ALetter
  // (so e-mail addresses stay one word). Ask the linked ICU instead of hard-coding a version.
  void probe_tailoring() {
    if (!bi) return;
    std::vector<Token> tmp;
    for (char ch : {'@', ':'}) {
      char joined[4] = {'a', ch, 'b', 0};
      icu_chunk(std::string_view(joined, 3), 0, 3, tmp);
      if (tmp.size() != 1) {
        cls[uint8_t(ch)] = kOther;
        continue;
      }
      icu_chunk(std::string_view(joined + 1, 1), 0, 1, tmp);
      cls[uint8_t(ch)] = tmp.size() == 1 && tmp[0].kind == TokenKind::word ? kLetter : kMidLetter;
    }
  }

  // Appends ICU's segments of text[b, e) (not cleared first when called from tokenize()).
  void icu_append(std::string_view text, size_t b, size_t e, std::vector<Token>& out) {
    if (b == e) return;
    UErrorCode st = U_ZERO_ERROR;
    if (bi) {
      utext_openUTF8(&ut, text.data() + b, int64_t(e - b), &st);
      bi->setText(&ut, st);
    }
    if (!bi || U_FAILURE(st)) {
      // Without ICU's rules the best we can promise is tiling: one opaque token.
      out.push_back(Token{uint32_t(b), uint32_t(e), TokenKind::punct});
      return;
    }
    int32_t p = bi->first();
    for (int32_t q = bi->next(); q != icu::BreakIterator::DONE; p = q, q = bi->next()) {
      std::string_view seg = text.substr(b + size_t(p), size_t(q - p));
      out.push_back(
          Token{uint32_t(b + p), uint32_t(b + q), kind_from_status(bi->getRuleStatus(), seg)});
    }
  }

  void icu_chunk(std::string_view text, size_t b, size_t e, std::vector<Token>& out) {
    out.clear();
    icu_append(text, b, e, out);
  }

  // UAX #29 restricted to ASCII (see Cls), segmenting text[b, e) as if it stood alone.
  // Prose is letters, single spaces and punctuation, so each token is classified by its
  // first byte and the common shapes are scanned directly: a run of letters (with WB6/WB7
  // joining "mother's", "e.g"), a run of U+0020 (WB3d), CR LF (WB3), and single bytes that
  // no rule joins to the next one. Tokens that touch digits or '_' (WB8-WB13b) go through the
  // pairwise rules in general_end(). The random-string tests check this against ICU.
  template <bool kKeepSpace = true>
  void ascii_append(std::string_view text, size_t b, size_t e, std::vector<Token>& out) const {
    const auto* p = reinterpret_cast<const unsigned char*>(text.data());
    size_t i = b;
    while (i < e) {
      size_t start = i;
      uint8_t c0 = cls[p[i]];
      TokenKind kind = TokenKind::punct;
      if (c0 == kLetter) {
        ++i;
        for (;;) {
          while (i < e && cls[p[i]] == kLetter) ++i;
          if (i + 1 < e && (cls[p[i]] == kMidLetter || cls[p[i]] == kMidNumLet) &&
              cls[p[i + 1]] == kLetter) {
            i += 2;  // WB6/WB7
            continue;
          }
          break;
        }
        if (i < e && (cls[p[i]] == kDigit || cls[p[i]] == kExtNumLet)) {
          i = general_end(p, b, e, start);
          kind = ascii_kind(p, start, i);
        } else {
          kind = TokenKind::word;
        }
      } else if (c0 == kWSegSpace) {
        ++i;
        while (i < e && p[i] == ' ') ++i;
        kind = TokenKind::space;
      } else if (c0 == kDigit || c0 == kExtNumLet) {
        i = general_end(p, b, e, start);
        kind = ascii_kind(p, start, i);
      } else {
        // CR, LF, vertical space, MidLetter/MidNum/MidNumLet and Other: nothing joins them to
        // what follows (a Mid character between two letters or digits was taken above),
        // except CR LF.
        ++i;
        if (c0 == kCR && i < e && p[i] == '\n') ++i;
        kind = ascii_space(p[start]) ? TokenKind::space : TokenKind::punct;
      }
      if (kKeepSpace || kind != TokenKind::space)
        out.push_back(Token{uint32_t(start), uint32_t(i), kind});
    }
  }

  // End of the token that starts at `start`, by the pairwise rules (breaks_at), looking at
  // no byte outside [b, e).
  size_t general_end(const unsigned char* p, size_t b, size_t e, size_t start) const {
    // Class of byte i, or kOther outside [b, e) (i - 2 may wrap around: still outside).
    auto c = [&](size_t i) -> uint8_t { return i >= b && i < e ? cls[p[i]] : uint8_t(kOther); };
    size_t i = start + 1;
    while (i < e && !breaks_at(c(i - 2), c(i - 1), c(i), c(i + 1))) ++i;
    return i;
  }

  // Whether UAX #29 puts a boundary between classes a and c, with x before a and d after c
  // (kOther at either end of the text).
  static bool breaks_at(uint8_t x, uint8_t a, uint8_t c, uint8_t d) {
    if (a == kCR && c == kLF) return false;                  // WB3
    if (a == kCR || a == kLF || a == kNewline) return true;  // WB3a
    if (c == kCR || c == kLF || c == kNewline) return true;  // WB3b
    if (a == kWSegSpace && c == kWSegSpace) return false;    // WB3d
    if (a == kLetter && c == kLetter) return false;          // WB5
    bool c_mid_letter = c == kMidLetter || c == kMidNumLet;
    bool a_mid_letter = a == kMidLetter || a == kMidNumLet;
    if (a == kLetter && c_mid_letter && d == kLetter) return false;  // WB6
    if (x == kLetter && a_mid_letter && c == kLetter) return false;  // WB7
    if (a == kDigit && c == kDigit) return false;                    // WB8
    if (a == kLetter && c == kDigit) return false;                   // WB9
    if (a == kDigit && c == kLetter) return false;                   // WB10
    bool a_mid_num = a == kMidNum || a == kMidNumLet;
    bool c_mid_num = c == kMidNum || c == kMidNumLet;
    if (x == kDigit && a_mid_num && c == kDigit) return false;                              // WB11
    if (a == kDigit && c_mid_num && d == kDigit) return false;                              // WB12
    if ((a == kLetter || a == kDigit || a == kExtNumLet) && c == kExtNumLet) return false;  // WB13a
    if (a == kExtNumLet && (c == kLetter || c == kDigit)) return false;                     // WB13b
    return true;                                                                            // WB999
  }

  // The kind ICU's rule status gives an ASCII segment. ICU's word rules tag each joining
  // pair and the segment keeps the tag of its last pair: ending in a letter -> letter ("1a"),
  // in a digit -> number ("a1", "1.5"), in '_' -> number after a digit ("1_") and letter
  // otherwise ("a_", "0__"); a lone "_" has no status. White space runs are space; anything
  // else is a single punct byte.
  TokenKind ascii_kind(const unsigned char* p, size_t b, size_t e) const {
    uint8_t last = cls[p[e - 1]];
    if (last == kLetter) return TokenKind::word;
    if (last == kDigit) return TokenKind::number;
    if (last == kExtNumLet) {
      if (e - b == 1) return TokenKind::punct;
      return cls[p[e - 2]] == kDigit ? TokenKind::number : TokenKind::word;
    }
    return ascii_space(p[b]) ? TokenKind::space : TokenKind::punct;
  }
};

Tokenizer::Tokenizer() : impl_(std::make_unique<Impl>()) {}
Tokenizer::~Tokenizer() = default;

template <bool kKeepSpace>
void Tokenizer::run(std::string_view text, std::vector<Token>& out) {
  out.clear();
  const auto* p = reinterpret_cast<const unsigned char*>(text.data());
  size_t n = text.size(), pos = 0;
  // Invariant: pos is 0 or a firm boundary, so each stretch can be segmented on its own.
  while (pos < n) {
    size_t q = find_non_ascii(p, pos, n);
    if (q == n) {
      impl_->ascii_append<kKeepSpace>(text, pos, n, out);
      break;
    }
    if (size_t len = lone_other(p, q, n)) {
      impl_->ascii_append<kKeepSpace>(text, pos, q, out);
      out.push_back(Token{uint32_t(q), uint32_t(q + len), TokenKind::punct});
      pos = q + len;
      continue;
    }
    size_t b = q;
    while (b > pos && !firm_boundary(p, b)) --b;
    size_t e = q + 1;
    while (e < n && !firm_boundary(p, e)) ++e;
    impl_->ascii_append<kKeepSpace>(text, pos, b, out);
    size_t from = out.size();
    impl_->icu_append(text, b, e, out);
    if (!kKeepSpace) {
      out.erase(std::remove_if(out.begin() + std::ptrdiff_t(from), out.end(),
                               [](const Token& t) { return t.kind == TokenKind::space; }),
                out.end());
    }
    pos = e;
  }
}

void Tokenizer::tokenize(std::string_view text, std::vector<Token>& out) {
  run<true>(text, out);
}

void Tokenizer::tokenize_without_space(std::string_view text, std::vector<Token>& out) {
  run<false>(text, out);
}

void Tokenizer::tokenize_icu(std::string_view text, std::vector<Token>& out) {
  impl_->icu_chunk(text, 0, text.size(), out);
}

}  // namespace evenhand::text
