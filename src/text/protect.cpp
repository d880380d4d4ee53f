#include "text/protect.h"

#include <unicode/regex.h>
#include <unicode/uchar.h>
#include <unicode/unistr.h>
#include <unicode/ustring.h>
#include <unicode/utf16.h>

#include <algorithm>
#include <array>
#include <cstring>

#include "text/utf8.h"

namespace evenhand::text {

const char* span_kind_name(uint8_t kind) {
  switch (kind) {
    case url:
      return "url";
    case email:
      return "email";
    case handle:
      return "handle";
    case code_fence:
      return "code_fence";
    case code_inline:
      return "code_inline";
    case user_pattern:
      return "user_pattern";
    case pack_phrase:
      return "pack_phrase";
    default:
      return "unknown";
  }
}

void merge_spans(std::vector<Span>& spans) {
  std::sort(spans.begin(), spans.end(), [](const Span& a, const Span& b) {
    return a.begin != b.begin ? a.begin < b.begin : a.end > b.end;
  });
  size_t w = 0;
  for (size_t r = 0; r < spans.size(); ++r) {
    if (w > 0 && spans[r].begin < spans[w - 1].end) {
      spans[w - 1].end = std::max(spans[w - 1].end, spans[r].end);
    } else {
      spans[w++] = spans[r];
    }
  }
  spans.resize(w);
}

namespace {

using Bytes = const unsigned char*;

inline bool is_alnum(unsigned char c) {
  return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9');
}
inline bool is_alpha(unsigned char c) {
  return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');
}
inline unsigned char lower(unsigned char c) {
  return c >= 'A' && c <= 'Z' ? c + 32 : c;
}

// A letter, digit or '_' (any script) ends right before byte i.
bool word_char_before(std::string_view text, size_t i) {
  if (i == 0) return false;
  auto c = static_cast<unsigned char>(text[i - 1]);
  if (c < 0x80) return is_alnum(c) || c == '_';
  UChar32 cp = UChar32(decode_utf8_before(text, i));
  return u_isalnum(cp);
}

// Case-insensitive match of the ASCII word `w` ending right before byte i.
bool ends_with_ci(Bytes p, size_t i, const char* w) {
  size_t len = std::strlen(w);
  if (i < len) return false;
  for (size_t k = 0; k < len; ++k)
    if (lower(p[i - len + k]) != static_cast<unsigned char>(w[k])) return false;
  return true;
}

class Scanner {
 public:
  Scanner(std::string_view text, std::vector<Span>& out)
      : t_(text), p_(reinterpret_cast<Bytes>(text.data())), n_(text.size()), out_(out) {}

  void run() {
    // Most texts hold none of these: decide that with memchr before scanning byte by byte.
    std::array<bool, 256> trigger{};
    bool any = false;
    for (unsigned char c : {':', '@', '`'}) {
      if (std::memchr(p_, c, n_)) trigger[c] = any = true;
    }
    if (has_www()) trigger['.'] = any = true;
    if (!any) return;
    size_t i = 0;
    while (i < n_) {
      unsigned char c = p_[i];
      if (!trigger[c]) {
        ++i;
        continue;
      }
      size_t next = i + 1;
      switch (c) {
        case '`':
          next = code(i);
          break;
        case ':':
          next = scheme_url(i);
          break;
        case '.':
          next = www_url(i);
          break;
        case '@':
          next = at_sign(i);
          break;
      }
      i = std::max(next, i + 1);
    }
  }

 private:
  bool has_www() const {
    const void* hit;
    for (size_t from = 0; from < n_ && (hit = std::memchr(p_ + from, '.', n_ - from));) {
      size_t i = size_t(static_cast<Bytes>(hit) - p_);
      if (ends_with_ci(p_, i, "www")) return true;
      from = i + 1;
    }
    return false;
  }

  void emit(size_t b, size_t e, SpanKind k) { out_.push_back(Span{uint32_t(b), uint32_t(e), k}); }

  size_t run_length(size_t i, unsigned char c) const {
    size_t j = i;
    while (j < n_ && p_[j] == c) ++j;
    return j - i;
  }

  // True when the apostrophes at j close an old ASCII quotation opened by `r` backticks
  // (`word' or ``words'', as in the Brown Corpus and older GNU and Usenet text, tokenised
  // or not): a run of exactly r apostrophes, followed by the end, white space or . , ; : ! ?
  bool closes_quote(size_t j, size_t r) const {
    size_t a = run_length(j, '\'');
    if (a != r || j == 0 || p_[j - 1] == '`' || p_[j - 1] == '\'') return false;
    if (j + a == n_) return true;
    unsigned char c = p_[j + a];
    return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '.' || c == ',' || c == ';' ||
           c == ':' || c == '!' || c == '?';
  }

  // Backticks at i: a fence (3+) or an inline code span (1-2). Returns where to go on.
  size_t code(size_t i) {
    size_t r = run_length(i, '`');
    size_t j = i + r;
    if (r >= 3) {
      while (j < n_) {
        const void* hit = std::memchr(p_ + j, '`', n_ - j);
        if (!hit) break;
        j = size_t(static_cast<Bytes>(hit) - p_);
        size_t rr = run_length(j, '`');
        if (rr >= r) {
          emit(i, j + rr, code_fence);
          return j + rr;
        }
        j += rr;
      }
      emit(i, n_, code_fence);  // unterminated: protect the rest of the text
      return n_;
    }
    while (j < n_ && p_[j] != '\n') {
      if (p_[j] == '\'' && closes_quote(j, r)) return i + r;  // `word' or ``words''
      if (p_[j] != '`') {
        ++j;
        continue;
      }
      size_t rr = run_length(j, '`');
      if (rr == r) {
        emit(i, j + rr, code_inline);
        return j + rr;
      }
      j += rr;
    }
    return i + r;  // no closing run on this line: the backticks are plain text
  }

  // Scans a URL body from `from`; returns its end with trailing punctuation left out.
  size_t url_body(size_t from) const {
    size_t j = from;
    size_t open_paren = 0, close_paren = 0, open_bracket = 0, close_bracket = 0;
    while (j < n_) {
      unsigned char c = p_[j];
      if (c < 0x80) {
        if (c <= 0x20 || c == 0x7F || c == '<' || c == '>' || c == '"' || c == '`') break;
        open_paren += c == '(';
        close_paren += c == ')';
        open_bracket += c == '[';
        close_bracket += c == ']';
        ++j;
        continue;
      }
      size_t k = j;
      UChar32 cp = UChar32(decode_utf8(t_, k));
      if (cp == 0xFFFD || u_isUWhiteSpace(cp) || u_ispunct(cp)) break;
      j = k;
    }
    while (j > from) {
      unsigned char c = p_[j - 1];
      if (std::strchr(".,:;!?'*~", c) && c != 0) {
        --j;
      } else if (c == ')' && close_paren > open_paren) {
        --close_paren;
        --j;
      } else if (c == ']' && close_bracket > open_bracket) {
        --close_bracket;
        --j;
      } else {
        break;
      }
    }
    return j;
  }

  // The body must start like a host name.
  bool host_start(size_t j) const {
    if (j >= n_) return false;
    unsigned char c = p_[j];
    if (c < 0x80) return is_alnum(c) || c == '[';
    size_t k = j;
    return u_isalnum(UChar32(decode_utf8(t_, k)));
  }

  // ':' at i: "scheme://" for http, https, ftp at a word start.
  size_t scheme_url(size_t i) {
    if (i + 2 >= n_ || p_[i + 1] != '/' || p_[i + 2] != '/') return i + 1;
    size_t s;
    if (ends_with_ci(p_, i, "https"))
      s = i - 5;
    else if (ends_with_ci(p_, i, "http"))
      s = i - 4;
    else if (ends_with_ci(p_, i, "ftp"))
      s = i - 3;
    else
      return i + 1;
    if (word_char_before(t_, s) || !host_start(i + 3)) return i + 1;
    size_t e = url_body(i + 3);
    if (e <= i + 3) return i + 1;
    emit(s, e, url);
    return e;
  }

  // '.' at i: "www." at a word start (not inside a longer host name or path).
  size_t www_url(size_t i) {
    if (!ends_with_ci(p_, i, "www")) return i + 1;
    size_t s = i - 3;
    if (word_char_before(t_, s)) return i + 1;
    if (s > 0 && std::strchr("./@-", p_[s - 1]) && p_[s - 1] != 0) return i + 1;
    if (i + 1 >= n_ || !is_alnum(p_[i + 1])) return i + 1;
    size_t e = url_body(i + 1);
    if (e <= i + 1) return i + 1;
    emit(s, e, url);
    return e;
  }

  static bool local_char(unsigned char c) {
    return is_alnum(c) || c == '.' || c == '_' || c == '%' || c == '+' || c == '-';
  }

  // Domain after an '@' at i: labels of [A-Za-z0-9-] joined by single dots, two or more,
  // the last all letters and two or more long. Returns its end, or 0 if there is none.
  size_t domain_end(size_t i) const {
    size_t j = i + 1, labels = 0, last_begin = j;
    while (true) {
      size_t k = j;
      while (j < n_ && (is_alnum(p_[j]) || p_[j] == '-')) ++j;
      if (j == k) break;
      ++labels;
      last_begin = k;
      if (j + 1 < n_ && p_[j] == '.' && is_alnum(p_[j + 1])) {
        ++j;
        continue;
      }
      break;
    }
    if (labels < 2 || j - last_begin < 2) return 0;
    for (size_t k = last_begin; k < j; ++k)
      if (!is_alpha(p_[k])) return 0;
    return j;
  }

  // '@' at i: an e-mail address around it, else a handle starting at it.
  size_t at_sign(size_t i) {
    size_t ls = i;
    while (ls > 0 && local_char(p_[ls - 1])) --ls;
    while (ls < i && p_[ls] == '.') ++ls;
    if (ls < i && p_[i - 1] != '.') {
      size_t de = domain_end(i);
      if (de != 0) {
        emit(ls, de, email);
        return de;
      }
    }
    if (word_char_before(t_, i)) return i + 1;
    size_t e = i + 1;
    while (e < n_ && (is_alnum(p_[e]) || p_[e] == '_')) ++e;
    if (e == i + 1) return i + 1;
    emit(i, e, handle);
    return e;
  }

  std::string_view t_;
  Bytes p_;
  size_t n_;
  std::vector<Span>& out_;
};

}  // namespace

struct ProtectedSpans::Impl {
  std::vector<std::unique_ptr<icu::RegexPattern>> patterns;
};

ProtectedSpans::ProtectedSpans() : impl_(std::make_unique<Impl>()) {}
ProtectedSpans::~ProtectedSpans() = default;

Result<std::unique_ptr<ProtectedSpans>> ProtectedSpans::create(
    const std::vector<std::string>& user_patterns) {
  std::unique_ptr<ProtectedSpans> ps(new ProtectedSpans());
  for (size_t k = 0; k < user_patterns.size(); ++k) {
    const std::string& src = user_patterns[k];
    std::string who = "protected pattern " + std::to_string(k + 1) + " \"" + src + "\"";
    if (!valid_utf8(src)) return make_error(ErrorKind::usage, "", who + " is not valid UTF-8");
    if (src.empty()) return make_error(ErrorKind::usage, "", who + " is empty");
    UParseError pe{};
    UErrorCode st = U_ZERO_ERROR;
    std::unique_ptr<icu::RegexPattern> pat(
        icu::RegexPattern::compile(icu::UnicodeString::fromUTF8(src), 0, pe, st));
    if (U_FAILURE(st) || !pat) {
      std::string reason = who + " does not compile: " + u_errorName(st);
      if (pe.offset >= 0) reason += " at offset " + std::to_string(pe.offset);
      return make_error(ErrorKind::usage, "", reason);
    }
    ps->impl_->patterns.push_back(std::move(pat));
  }
  return ps;
}

void ProtectedSpans::find(std::string_view text, std::vector<Span>& out) const {
  out.clear();
  Scanner(text, out).run();
  if (!impl_->patterns.empty() && !text.empty()) {
    thread_local std::u16string u16;
    thread_local std::vector<uint32_t> byte_of;
    utf8_to_utf16(text, u16, &byte_of);
    icu::UnicodeString input(false, u16.data(), int32_t(u16.size()));  // read-only alias
    for (const auto& pat : impl_->patterns) {
      UErrorCode st = U_ZERO_ERROR;
      std::unique_ptr<icu::RegexMatcher> m(pat->matcher(input, st));
      if (U_FAILURE(st) || !m) continue;
      while (m->find(st) && U_SUCCESS(st)) {
        int32_t b = m->start(st), e = m->end(st);
        if (U_FAILURE(st)) break;
        if (e > b) out.push_back(Span{byte_of[size_t(b)], byte_of[size_t(e)], user_pattern});
      }
    }
  }
  merge_spans(out);
}

// ---------------------------------------------------------------------------------------
// PhraseSpans

namespace {

// Letters, digits, marks and '_' make words for the whole-word test.
bool word_cp(UChar32 c) {
  return c == '_' || u_isalnum(c) || (U_GET_GC_MASK(c) & U_GC_M_MASK);
}

// Normalised matching form of `s`: full case folding, U+2019 as '\'', every run of white
// space as one ' '. If `at` is given it gets the byte in `s` where the source of each
// output byte starts (so a match [b, e) maps to [at[b], at[e])) plus s.size() at the end,
// and `starts` marks output bytes where a source code point's folding begins.
void normalise(std::string_view s, std::string& out, std::vector<uint32_t>* at,
               std::vector<bool>* starts) {
  out.clear();
  if (at) at->clear();
  if (starts) starts->clear();
  auto mark = [&](size_t before, size_t src) {
    for (size_t k = before; k < out.size(); ++k) {
      if (at) at->push_back(uint32_t(src));
      if (starts) starts->push_back(k == before);
    }
  };
  size_t i = 0;
  while (i < s.size()) {
    size_t src = i, before = out.size();
    auto b = static_cast<unsigned char>(s[i]);
    if (b < 0x80) {
      ++i;
      if (b == ' ' || (b >= '\t' && b <= '\r')) {
        while (i < s.size()) {
          size_t k = i;
          UChar32 c = UChar32(decode_utf8(s, k));
          if (!u_isUWhiteSpace(c)) break;
          i = k;
        }
        out.push_back(' ');
      } else {
        out.push_back(char(lower(b)));
      }
      mark(before, src);
      continue;
    }
    UChar32 c = UChar32(decode_utf8(s, i));
    if (u_isUWhiteSpace(c)) {
      while (i < s.size()) {
        size_t k = i;
        if (!u_isUWhiteSpace(UChar32(decode_utf8(s, k)))) break;
        i = k;
      }
      out.push_back(' ');
    } else if (c == 0x2019) {
      out.push_back('\'');
    } else {
      UChar in[2], folded[8];
      int32_t n = 0;
      U16_APPEND_UNSAFE(in, n, c);
      UErrorCode st = U_ZERO_ERROR;
      int32_t len = u_strFoldCase(folded, 8, in, n, U_FOLD_CASE_DEFAULT, &st);
      if (U_FAILURE(st)) {
        append_utf8(char32_t(c), out);
      } else {
        append_utf16_as_utf8(std::u16string_view(folded, size_t(len)), out);
      }
    }
    mark(before, src);
  }
  if (at) at->push_back(uint32_t(s.size()));
  if (starts) starts->push_back(true);
}

}  // namespace

struct PhraseSpans::Impl {
  struct Phrase {
    std::string key;  // normalised
    bool word_start;  // first character is a word character: check the one before
    bool word_end;    // last character is a word character: check the one after
  };
  std::vector<Phrase> phrases;
  std::array<std::vector<uint16_t>, 256> by_first;  // phrase indexes by first key byte
};

PhraseSpans::PhraseSpans() : impl_(std::make_unique<Impl>()) {}
PhraseSpans::~PhraseSpans() = default;

Result<std::unique_ptr<PhraseSpans>> PhraseSpans::create(const std::vector<std::string>& phrases) {
  std::unique_ptr<PhraseSpans> ps(new PhraseSpans());
  if (phrases.size() > 65535)
    return make_error(ErrorKind::usage, "", "too many protected phrases (more than 65535)");
  for (size_t k = 0; k < phrases.size(); ++k) {
    const std::string& src = phrases[k];
    std::string who = "protected phrase " + std::to_string(k + 1) + " \"" + src + "\"";
    if (!valid_utf8(src)) return make_error(ErrorKind::usage, "", who + " is not valid UTF-8");
    Impl::Phrase ph;
    normalise(src, ph.key, nullptr, nullptr);
    while (!ph.key.empty() && ph.key.back() == ' ') ph.key.pop_back();
    ph.key.erase(0, ph.key.find_first_not_of(' ') == std::string::npos
                        ? ph.key.size()
                        : ph.key.find_first_not_of(' '));
    if (ph.key.empty()) return make_error(ErrorKind::usage, "", who + " is empty");
    size_t i = 0, e = ph.key.size();
    ph.word_start = word_cp(UChar32(decode_utf8(ph.key, i)));
    ph.word_end = word_cp(UChar32(decode_utf8_before(ph.key, e)));
    ps->impl_->by_first[static_cast<unsigned char>(ph.key[0])].push_back(uint16_t(k));
    ps->impl_->phrases.push_back(std::move(ph));
  }
  return ps;
}

void PhraseSpans::find(std::string_view text, std::vector<Span>& out) const {
  out.clear();
  if (impl_->phrases.empty() || text.empty()) return;
  thread_local std::string key;
  thread_local std::vector<uint32_t> at;
  thread_local std::vector<bool> starts;
  normalise(text, key, &at, &starts);
  for (size_t i = 0; i < key.size(); ++i) {
    const auto& bucket = impl_->by_first[static_cast<unsigned char>(key[i])];
    if (bucket.empty() || !starts[i]) continue;
    size_t before = i;
    bool word_before = i > 0 && word_cp(UChar32(decode_utf8_before(key, before)));
    for (uint16_t idx : bucket) {
      const Impl::Phrase& ph = impl_->phrases[idx];
      size_t e = i + ph.key.size();
      if (e > key.size() || !starts[e] || key.compare(i, ph.key.size(), ph.key) != 0) continue;
      if (ph.word_start && word_before) continue;
      if (ph.word_end && e < key.size()) {
        size_t k = e;
        if (word_cp(UChar32(decode_utf8(key, k)))) continue;
      }
      out.push_back(Span{at[i], at[e], pack_phrase});
    }
  }
  merge_spans(out);
}

}  // namespace evenhand::text
