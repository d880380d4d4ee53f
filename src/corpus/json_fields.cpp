// Field selection with simdjson On-Demand: the whole record is walked (every value consumed,
// so syntax errors anywhere are found) and the values the patterns match are recorded with
// their raw byte ranges; splicing then rebuilds the record from those ranges.
#include "corpus/json_fields.h"

#include <simdjson.h>

#include <algorithm>
#include <charconv>
#include <cstring>
#include <limits>

#include "corpus/json_reason.h"
#include "corpus/json_string.h"

namespace evenhand::corpus {

namespace od = simdjson::ondemand;

namespace {

// Containers nested deeper than this are refused (the walk is recursive).
constexpr uint32_t kMaxDepth = 1024;

std::string_view trim_right(std::string_view s) {
  while (!s.empty() && is_json_ws(s.back())) s.remove_suffix(1);
  return s;
}

bool is_digit(char c) {
  return c >= '0' && c <= '9';
}

// The number grammar of RFC 8259 section 6, for numbers simdjson will not convert (integers
// beyond 64 bits, exponents out of double range) but which are still valid JSON.
bool is_json_number(std::string_view s) {
  size_t i = 0;
  const size_t n = s.size();
  if (i < n && s[i] == '-') ++i;
  if (i >= n) return false;
  if (s[i] == '0') {
    ++i;
  } else if (s[i] >= '1' && s[i] <= '9') {
    while (i < n && is_digit(s[i])) ++i;
  } else {
    return false;
  }
  if (i < n && s[i] == '.') {
    ++i;
    if (i >= n || !is_digit(s[i])) return false;
    while (i < n && is_digit(s[i])) ++i;
  }
  if (i < n && (s[i] == 'e' || s[i] == 'E')) {
    ++i;
    if (i < n && (s[i] == '+' || s[i] == '-')) ++i;
    if (i >= n || !is_digit(s[i])) return false;
    while (i < n && is_digit(s[i])) ++i;
  }
  return i == n;
}

// A parser with a small capacity. simdjson's depth bookkeeping (checked in its development
// builds) must have room for every level the walk accepts; later growth of the capacity keeps
// this depth. A failure here shows again, as an error, when select() grows the capacity.
void allocate_small(od::parser& parser) {
  simdjson::error_code e = parser.allocate(64 * 1024, kMaxDepth + 8);
  (void)e;
}

Error input_error(std::string reason) {
  return make_error(ErrorKind::input, "", std::move(reason));
}

Error json_error(simdjson::error_code code) {
  if (code == simdjson::UTF8_ERROR) return input_error("invalid UTF-8");
  std::string msg = simdjson::error_message(code);
  while (!msg.empty() && (msg.back() == '.' || msg.back() == ' ')) msg.pop_back();
  return input_error("invalid JSON: " + msg);
}

bool is_hex(char c) {
  return is_digit(c) || (c >= 'a' && c <= 'f') || (c >= 'A' && c <= 'F');
}

// Why unescape_json_string refused `raw` (the inside of a string token): the first unpaired
// surrogate or malformed escape.
Error escape_error(std::string_view raw) {
  auto hex4 = [&](size_t pos) -> int32_t {
    if (pos + 4 > raw.size()) return -1;
    for (size_t k = pos; k < pos + 4; ++k)
      if (!is_hex(raw[k])) return -1;
    uint32_t v = 0;
    std::from_chars(raw.data() + pos, raw.data() + pos + 4, v, 16);
    return static_cast<int32_t>(v);
  };
  for (size_t i = 0; i < raw.size(); ++i) {
    if (raw[i] != '\\') continue;
    if (i + 1 < raw.size() && raw[i + 1] == 'u') {
      int32_t cp = hex4(i + 2);
      if (cp < 0) break;
      if (cp >= 0xDC00 && cp <= 0xDFFF) {
        return input_error("invalid UTF-8: unpaired low surrogate escape in a string");
      }
      if (cp >= 0xD800 && cp <= 0xDBFF) {
        int32_t lo =
            i + 7 < raw.size() && raw[i + 6] == '\\' && raw[i + 7] == 'u' ? hex4(i + 8) : -1;
        if (lo < 0xDC00 || lo > 0xDFFF) {
          return input_error("invalid UTF-8: unpaired high surrogate escape in a string");
        }
        i += 6;
      }
      i += 5;
      continue;
    }
    if (i + 1 >= raw.size() ||
        std::string_view("\"\\/bfnrt").find(raw[i + 1]) == std::string_view::npos)
      break;
    ++i;
  }
  return input_error("invalid JSON: bad escape sequence in a string");
}

const char* type_name(od::json_type t) {
  switch (t) {
    case od::json_type::array:
      return "array";
    case od::json_type::object:
      return "object";
    case od::json_type::number:
      return "number";
    case od::json_type::string:
      return "string";
    case od::json_type::boolean:
      return "boolean";
    case od::json_type::null:
      return "null";
  }
  return "unknown value";
}

// A reference token that can name an array element (RFC 6901 section 4: "0" or digits with
// no leading zero); -1 for any other token, which matches no element.
int64_t array_index_of(const std::string& key) {
  if (key.empty() || key.size() > 10) return -1;
  if (key.size() > 1 && key[0] == '0') return -1;
  int64_t v = 0;
  for (char c : key) {
    if (!is_digit(c)) return -1;
    v = v * 10 + (c - '0');
  }
  return v;
}

}  // namespace

struct FieldSelector::Impl {
  struct Tok {
    std::string key;
    bool wildcard = false;
    int64_t index = -1;  // array index this token names, or -1
  };
  // Alignment table of one escaped string match: align_arena[align_begin .. +text_size+1),
  // decoded text in text_arena[text_begin .. +text_size).
  struct Table {
    uint32_t align_begin = 0;
    uint32_t text_begin = 0;
    uint32_t text_size = 0;
  };

  std::vector<std::vector<Tok>> toks;  // compiled patterns
  od::parser parser;
  std::string buffer;  // padded copy of the record
  std::vector<Table> tables;
  std::vector<uint32_t> align_arena;
  std::string text_arena;
  std::string scratch;
  std::vector<uint32_t> scratch_align;
  std::string key_scratch;
  std::vector<uint32_t> active;  // stack of pattern lists, one slice per open level
  std::vector<char> hit;         // per pattern: matched something in this record
  std::string path;              // concrete pointer of the current value (when needed)
  // Decoded names of the selected members of the open objects, one slice per object, to
  // refuse a name that appears twice (which of the two values counts is up to the reader).
  std::string seen_bytes;
  std::vector<std::pair<uint32_t, uint32_t>> seen;  // (offset, size) in seen_bytes
  std::vector<std::string_view> seen_sorted;

  // Per select() call.
  const char* base = nullptr;
  std::string_view record;
  uint32_t root_end = 0;
  std::vector<FieldMatch>* out = nullptr;
  SelectStats* stats = nullptr;

  Status run(std::string_view rec, std::vector<FieldMatch>& matches, SelectStats& st);
  // Opens a match for the value at `begin` if a pattern in active[ab, ae) ends at `level`.
  int64_t open_match(size_t ab, size_t ae, uint32_t level, uint32_t begin);
  Status walk_value(od::value& v, size_t ab, size_t ae, uint32_t level, uint32_t depth);
  Status walk_object(od::object& o, size_t ab, size_t ae, uint32_t level, uint32_t depth);
  Status walk_array(od::array& a, size_t ab, size_t ae, uint32_t level, uint32_t depth);
  Status walk_string(std::string_view token, int64_t mi);
  Status check_unique(size_t first_seen);
  uint32_t container_end(od::value& v, uint32_t begin);
  uint32_t raw_offset(const FieldMatch& m, uint32_t decoded) const;
};

FieldSelector::FieldSelector(std::vector<PointerPattern> patterns) : impl_(new Impl) {
  allocate_small(impl_->parser);
  impl_->toks.reserve(patterns.size());
  for (const PointerPattern& p : patterns) {
    std::vector<Impl::Tok> ts;
    for (const PointerPattern::Token& t : p.tokens()) {
      Impl::Tok tok;
      tok.key = t.key;
      tok.wildcard = t.wildcard;
      tok.index = t.wildcard ? -1 : array_index_of(t.key);
      ts.push_back(std::move(tok));
    }
    impl_->toks.push_back(std::move(ts));
  }
}

FieldSelector::~FieldSelector() = default;

void FieldSelector::trim() {
  Impl& m = *impl_;
  m.parser = od::parser{};
  allocate_small(m.parser);
  m.buffer = {};
  m.tables = {};
  m.align_arena = {};
  m.text_arena = {};
  m.scratch = {};
  m.scratch_align = {};
  m.active = {};
  m.path = {};
}

Status FieldSelector::select(std::string_view record, std::vector<FieldMatch>& out,
                             SelectStats& stats) {
  Status s = impl_->run(record, out, stats);
  if (!s.ok()) {
    out.clear();
    stats = SelectStats{};
    // simdjson's message can mislead (trailing text, NaN): say what is wrong when we can.
    if (s.error().reason.rfind("invalid JSON", 0) == 0) {
      if (auto why = explain_invalid_json(record)) {
        Error e = std::move(s).error();
        e.reason = std::move(*why);
        return e;
      }
    }
  }
  return s;
}

Status FieldSelector::Impl::run(std::string_view rec, std::vector<FieldMatch>& matches,
                                SelectStats& st) {
  matches.clear();
  st = SelectStats{};
  tables.clear();
  align_arena.clear();
  text_arena.clear();
  active.clear();
  path.clear();
  seen_bytes.clear();
  seen.clear();
  hit.assign(toks.size(), 0);
  if (rec.size() > std::numeric_limits<uint32_t>::max() - simdjson::SIMDJSON_PADDING) {
    return input_error("record larger than 4 GiB");
  }

  // simdjson reads up to SIMDJSON_PADDING bytes past the end: give it a padded copy.
  buffer.resize(rec.size() + simdjson::SIMDJSON_PADDING);
  if (!rec.empty()) std::memcpy(buffer.data(), rec.data(), rec.size());
  std::memset(buffer.data() + rec.size(), 0, simdjson::SIMDJSON_PADDING);
  base = buffer.data();
  record = rec;
  out = &matches;
  stats = &st;

  od::document doc;
  if (auto e = parser.iterate(buffer.data(), rec.size(), buffer.size()).get(doc)) {
    return json_error(e);
  }
  od::json_type type;
  if (auto e = doc.type().get(type)) return json_error(e);
  if (type != od::json_type::object) {
    // On demand, the type comes from the first byte alone ("not json" reads as null): a
    // full parse tells a broken record from a valid non-object one. Rare, so not reused.
    simdjson::dom::parser full;
    simdjson::dom::element ignored;
    if (auto e = full.parse(buffer.data(), rec.size(), false).get(ignored)) return json_error(e);
    return input_error(std::string("record is not a JSON object (found ") + type_name(type) + ")");
  }
  uint32_t begin = 0;
  while (begin < rec.size() && is_json_ws(rec[begin])) ++begin;
  std::string_view trimmed = trim_right(rec);
  root_end = static_cast<uint32_t>(trimmed.size());

  for (uint32_t p = 0; p < toks.size(); ++p) active.push_back(p);
  int64_t mi = open_match(0, active.size(), 0, begin);
  od::object obj;
  if (auto e = doc.get_object().get(obj)) return json_error(e);
  EVENHAND_TRY(walk_object(obj, 0, active.size(), 0, 1));
  // After the object nothing may follow but whitespace.
  if (doc.current_location().error() != simdjson::OUT_OF_BOUNDS) {
    return json_error(simdjson::TRAILING_CONTENT);
  }
  if (mi >= 0) {
    matches[mi].raw_end = root_end;
    ++st.not_string;
  }

  // Decoded texts live in text_arena, which may have moved while it grew: point now.
  for (FieldMatch& m : matches) {
    if (m.align >= 0) {
      const Table& t = tables[m.align];
      m.text = std::string_view(text_arena.data() + t.text_begin, t.text_size);
    }
  }
  for (char h : hit)
    if (!h) ++st.missing;
  return ok_status();
}

int64_t FieldSelector::Impl::open_match(size_t ab, size_t ae, uint32_t level, uint32_t begin) {
  int64_t mi = -1;
  for (size_t k = ab; k < ae; ++k) {
    uint32_t p = active[k];
    if (toks[p].size() != level) continue;
    hit[p] = 1;
    if (mi >= 0) continue;  // one match per value: the first pattern names it
    mi = static_cast<int64_t>(out->size());
    FieldMatch m;
    m.pointer = path;
    m.pattern = p;
    m.raw_begin = begin;
    m.raw_end = begin;
    out->push_back(std::move(m));
  }
  return mi;
}

uint32_t FieldSelector::Impl::container_end(od::value& v, uint32_t begin) {
  // The iterator now stands on the token after the closing bracket; the bracket is the last
  // non-whitespace byte before it.
  const char* loc = nullptr;
  uint32_t end = root_end;
  if (!v.current_location().get(loc)) end = static_cast<uint32_t>(loc - base);
  while (end > begin && is_json_ws(base[end - 1])) --end;
  return end;
}

Status FieldSelector::Impl::walk_value(od::value& v, size_t ab, size_t ae, uint32_t level,
                                       uint32_t depth) {
  std::string_view token = v.raw_json_token();  // the value's first token, not consumed
  const uint32_t begin = static_cast<uint32_t>(token.data() - base);
  const int64_t mi = open_match(ab, ae, level, begin);
  od::json_type type;
  if (auto e = v.type().get(type)) return json_error(e);
  switch (type) {
    case od::json_type::object: {
      if (depth >= kMaxDepth) {
        return input_error("nesting deeper than " + std::to_string(kMaxDepth) + " levels");
      }
      od::object o;
      if (auto e = v.get_object().get(o)) return json_error(e);
      EVENHAND_TRY(walk_object(o, ab, ae, level, depth + 1));
      if (mi >= 0) (*out)[mi].raw_end = container_end(v, begin);
      break;
    }
    case od::json_type::array: {
      if (depth >= kMaxDepth) {
        return input_error("nesting deeper than " + std::to_string(kMaxDepth) + " levels");
      }
      od::array a;
      if (auto e = v.get_array().get(a)) return json_error(e);
      EVENHAND_TRY(walk_array(a, ab, ae, level, depth + 1));
      if (mi >= 0) (*out)[mi].raw_end = container_end(v, begin);
      break;
    }
    case od::json_type::string: {
      od::raw_json_string raw;
      if (auto e = v.get_raw_json_string().get(raw)) return json_error(e);
      return walk_string(trim_right(token), mi);
    }
    case od::json_type::number: {
      od::number num;
      if (auto e = v.get_number().get(num)) {
        // Valid JSON numbers simdjson cannot represent are kept as they are; the value is
        // then left unconsumed and the iterator skips it.
        if (e != simdjson::NUMBER_ERROR || !is_json_number(trim_right(token))) return json_error(e);
      }
      if (mi >= 0) (*out)[mi].raw_end = begin + static_cast<uint32_t>(trim_right(token).size());
      break;
    }
    case od::json_type::boolean: {
      bool b = false;
      if (auto e = v.get_bool().get(b)) {
        if (e == simdjson::INCORRECT_TYPE) {
          e = token[0] == 't' ? simdjson::T_ATOM_ERROR : simdjson::F_ATOM_ERROR;
        }
        return json_error(e);
      }
      if (mi >= 0) (*out)[mi].raw_end = begin + static_cast<uint32_t>(trim_right(token).size());
      break;
    }
    case od::json_type::null: {
      bool is_null = false;
      auto e = v.is_null().get(is_null);
      if (e || !is_null) {
        return json_error(e && e != simdjson::INCORRECT_TYPE ? e : simdjson::N_ATOM_ERROR);
      }
      if (mi >= 0) (*out)[mi].raw_end = begin + static_cast<uint32_t>(trim_right(token).size());
      break;
    }
  }
  if (mi >= 0) ++stats->not_string;
  return ok_status();
}

Status FieldSelector::Impl::walk_string(std::string_view token, int64_t mi) {
  if (token.size() < 2 || token.front() != '"' || token.back() != '"') {
    return json_error(simdjson::UNCLOSED_STRING);
  }
  std::string_view inner = token.substr(1, token.size() - 2);
  const bool escaped = std::memchr(inner.data(), '\\', inner.size()) != nullptr;
  if (mi < 0) {
    // Not selected, but its escapes must still be valid.
    if (escaped && !unescape_json_string(inner, scratch, nullptr)) return escape_error(inner);
    return ok_status();
  }
  FieldMatch& m = (*out)[mi];
  const uint32_t begin = static_cast<uint32_t>(token.data() - base);
  m.is_string = true;
  m.raw_end = begin + static_cast<uint32_t>(token.size());
  if (!escaped) {
    m.text = record.substr(begin + 1, inner.size());  // zero copy: a view into the record
    return ok_status();
  }
  if (!unescape_json_string(inner, scratch, &scratch_align)) return escape_error(inner);
  Table t;
  t.align_begin = static_cast<uint32_t>(align_arena.size());
  t.text_begin = static_cast<uint32_t>(text_arena.size());
  t.text_size = static_cast<uint32_t>(scratch.size());
  align_arena.insert(align_arena.end(), scratch_align.begin(), scratch_align.end());
  text_arena += scratch;
  m.align = static_cast<int32_t>(tables.size());
  tables.push_back(t);
  return ok_status();
}

Status FieldSelector::Impl::walk_object(od::object& o, size_t ab, size_t ae, uint32_t level,
                                        uint32_t depth) {
  const char* const limit = base + record.size();
  const size_t first_seen = seen.size();
  for (auto field_result : o) {
    od::field field;
    if (auto e = std::move(field_result).get(field)) return json_error(e);
    // raw() points just after the key's opening quote; the key ends at the first quote that
    // is not escaped (stage 1 already checked that the string is closed).
    const char* kraw = field.key().raw();
    const char* kend = kraw;
    while (kend < limit && *kend != '"') kend += *kend == '\\' ? 2 : 1;
    if (kend >= limit) return json_error(simdjson::UNCLOSED_STRING);
    std::string_view key(kraw, static_cast<size_t>(kend - kraw));
    if (std::memchr(key.data(), '\\', key.size()) != nullptr) {
      if (!unescape_json_string(key, key_scratch, nullptr)) return escape_error(key);
      key = key_scratch;
    }
    const size_t cb = active.size();
    for (size_t k = ab; k < ae; ++k) {
      uint32_t p = active[k];
      if (toks[p].size() <= level) continue;
      const Tok& t = toks[p][level];
      if (t.wildcard || t.key == key) active.push_back(p);
    }
    const size_t ce = active.size();
    const size_t path_size = path.size();
    if (ce > cb) {
      append_pointer_token(path, key);
      seen.emplace_back(static_cast<uint32_t>(seen_bytes.size()),
                        static_cast<uint32_t>(key.size()));
      seen_bytes.append(key);
    }
    Status s = walk_value(field.value(), cb, ce, level + 1, depth);
    path.resize(path_size);
    active.resize(cb);
    if (!s.ok()) return s;
  }
  return check_unique(first_seen);
}

Status FieldSelector::Impl::check_unique(size_t first_seen) {
  const size_t n = seen.size() - first_seen;
  if (n < 2) {
    if (n == 1) seen_bytes.resize(seen[first_seen].first);
    seen.resize(first_seen);
    return ok_status();
  }
  // Few names (the usual case) are compared pairwise; many (a wildcard over a wide object)
  // are sorted.
  seen_sorted.clear();
  for (size_t k = first_seen; k < seen.size(); ++k)
    seen_sorted.emplace_back(seen_bytes.data() + seen[k].first, seen[k].second);
  const std::string_view* dup = nullptr;
  if (n <= 16) {
    for (size_t a = 0; a < n && !dup; ++a)
      for (size_t b = a + 1; b < n && !dup; ++b)
        if (seen_sorted[a] == seen_sorted[b]) dup = &seen_sorted[a];
  } else {
    std::sort(seen_sorted.begin(), seen_sorted.end());
    auto it = std::adjacent_find(seen_sorted.begin(), seen_sorted.end());
    if (it != seen_sorted.end()) dup = &*it;
  }
  if (dup) return input_error(duplicate_key_reason(*dup, path));
  seen_bytes.resize(seen[first_seen].first);
  seen.resize(first_seen);
  return ok_status();
}

Status FieldSelector::Impl::walk_array(od::array& a, size_t ab, size_t ae, uint32_t level,
                                       uint32_t depth) {
  int64_t index = 0;
  for (auto element_result : a) {
    od::value element;
    if (auto e = std::move(element_result).get(element)) return json_error(e);
    const size_t cb = active.size();
    for (size_t k = ab; k < ae; ++k) {
      uint32_t p = active[k];
      if (toks[p].size() <= level) continue;
      const Tok& t = toks[p][level];
      if (t.wildcard || t.index == index) active.push_back(p);
    }
    const size_t ce = active.size();
    const size_t path_size = path.size();
    if (ce > cb) {
      char digits[24];
      auto [end, ec] = std::to_chars(digits, digits + sizeof digits, index);
      (void)ec;
      append_pointer_token(path, std::string_view(digits, static_cast<size_t>(end - digits)));
    }
    Status s = walk_value(element, cb, ce, level + 1, depth);
    path.resize(path_size);
    active.resize(cb);
    if (!s.ok()) return s;
    ++index;
  }
  return ok_status();
}

uint32_t FieldSelector::Impl::raw_offset(const FieldMatch& m, uint32_t decoded) const {
  if (m.align < 0) {
    // Raw and decoded bytes coincide; an offset inside a character snaps to its start, as
    // the alignment table does for escaped strings.
    while (decoded > 0 && decoded < m.text.size() &&
           (static_cast<unsigned char>(m.text[decoded]) & 0xC0) == 0x80) {
      --decoded;
    }
    return decoded;
  }
  const Table& t = tables[m.align];
  return align_arena[t.align_begin + decoded];
}

void FieldSelector::splice(std::string_view record, std::span<const FieldMatch> matches,
                           std::span<const FieldEdits> edits, std::string& out) const {
  std::vector<const FieldEdits*> order;
  order.reserve(edits.size());
  for (const FieldEdits& fe : edits) {
    if (fe.match < matches.size()) order.push_back(&fe);
  }
  std::stable_sort(order.begin(), order.end(), [&](const FieldEdits* x, const FieldEdits* y) {
    return matches[x->match].raw_begin < matches[y->match].raw_begin;
  });
  std::vector<MatchEdit> flat;
  for (const FieldEdits* fe : order)
    for (const StringEdit& ed : fe->edits) flat.push_back({fe->match, ed});
  splice_flat(record, matches, flat, out);
}

void FieldSelector::splice_flat(std::string_view record, std::span<const FieldMatch> matches,
                                std::span<const MatchEdit> edits, std::string& out) const {
  auto usable = [&](uint32_t match) {
    if (match >= matches.size()) return false;
    const FieldMatch& m = matches[match];
    if (!m.is_string || m.raw_end > record.size() || m.raw_end < m.raw_begin + 2) return false;
    return m.align < 0 || static_cast<size_t>(m.align) < impl_->tables.size();
  };
  size_t cursor = 0;  // bytes of `record` before this are already written
  for (const MatchEdit& me : edits) {
    if (!usable(me.match)) continue;
    const FieldMatch& m = matches[me.match];
    const StringEdit& ed = me.edit;
    const size_t inner = m.raw_begin + 1;  // just after the opening quote
    const uint32_t size = static_cast<uint32_t>(m.text.size());
    uint32_t b = std::min(ed.begin, size);
    uint32_t e = std::min(std::max(ed.end, b), size);
    size_t rb = inner + impl_->raw_offset(m, b);
    size_t re = inner + impl_->raw_offset(m, e);
    if (rb < cursor) continue;  // overlaps an earlier edit: ignored
    out.append(record.substr(cursor, rb - cursor));
    append_json_escaped(ed.replacement, out);
    cursor = std::max(re, rb);
  }
  out.append(record.substr(cursor));
}

std::string duplicate_key_reason(std::string_view key, std::string_view object_pointer) {
  std::string reason = "duplicate key \"";
  append_json_escaped(key, reason);
  if (object_pointer.empty()) return reason + "\" in the top-level object";
  reason += "\" in the object at \"";
  append_json_escaped(object_pointer, reason);
  return reason + '"';
}

void append_with_member(std::string_view record, std::string_view key, std::string_view raw_value,
                        std::string& out) {
  size_t close = record.size();
  while (close > 0 && is_json_ws(record[close - 1])) --close;
  if (close == 0 || record[close - 1] != '}') {
    out.append(record);  // not an object text: nothing to insert into
    return;
  }
  --close;  // the final '}'
  size_t prev = close;
  while (prev > 0 && is_json_ws(record[prev - 1])) --prev;
  // Before the final brace stands either the end of the last member's value or, for an
  // empty object, its opening brace (no value ends with '{').
  const bool empty = prev > 0 && record[prev - 1] == '{';
  out.append(record.substr(0, close));
  if (!empty) out.push_back(',');
  out.push_back('"');
  append_json_escaped(key, out);
  out += "\":";
  out.append(raw_value);
  out.append(record.substr(close));
}

}  // namespace evenhand::corpus
