#include "review/sources.h"

#include <simdjson.h>

#include <algorithm>
#include <charconv>
#include <filesystem>
#include <map>

#include "corpus/json_fields.h"
#include "io/source.h"

namespace evenhand::review {

bool is_stdin_input(const std::string& input) {
  return input == "<stdin>" || input == "-";
}

std::string resolve_input(const std::string& input, const CorpusLayout& layout) {
  if (is_stdin_input(input)) return layout.stdin_corpus;
  if (layout.root.empty() || input.empty() || input[0] == '/') return input;
  return (std::filesystem::path(layout.root) / input).string();
}

Result<std::string> for_each_record(
    const std::string& path, const CorpusLayout& layout,
    const std::function<Result<bool>(const corpus::RawRecord&)>& fn) {
  auto src = io::Source::open(path);
  if (!src.ok()) return std::move(src).error();
  corpus::RecordReader reader(**src, layout.framing, layout.max_record_bytes);
  corpus::RawRecord raw;
  for (;;) {
    auto kind = reader.next(raw);
    if (!kind.ok()) return std::move(kind).error();
    if (*kind == corpus::RecordReader::Kind::end) return (*src)->raw_sha256();
    Result<bool> more = true;
    if (*kind == corpus::RecordReader::Kind::oversized) {
      more = make_error(ErrorKind::input, "",
                        "record of " + std::to_string(raw.size) + " bytes is over the limit of " +
                            std::to_string(layout.max_record_bytes) + " bytes");
    } else {
      more = fn(raw);
    }
    if (!more.ok()) {
      Error e = std::move(more).error();
      if (e.file.empty()) e.file = path;
      if (!e.line) e.line = raw.line;
      return e;
    }
    if (!*more) return std::string();
  }
}

Result<std::string> for_each_fields(
    const std::string& path, const CorpusLayout& layout, const std::vector<std::string>& patterns,
    const std::function<void(std::span<const std::string_view>)>& fn) {
  std::vector<corpus::PointerPattern> parsed;
  for (const auto& p : patterns) {
    auto pp = corpus::PointerPattern::parse(p);
    if (!pp.ok()) return std::move(pp).error();
    parsed.push_back(std::move(*pp));
  }
  corpus::FieldSelector selector(std::move(parsed));
  std::vector<corpus::FieldMatch> matches;
  std::vector<std::string_view> fields;
  return for_each_record(path, layout, [&](const corpus::RawRecord& raw) -> Result<bool> {
    fields.clear();
    if (layout.format == CorpusFormat::text) {
      if (!simdjson::validate_utf8(raw.bytes.data(), raw.bytes.size()))
        return make_error(ErrorKind::input, "", "invalid UTF-8 in text record");
      fields.push_back(raw.bytes);
    } else {
      corpus::SelectStats ss;
      Status s = selector.select(raw.bytes, matches, ss);
      if (!s.ok()) return std::move(s).error();
      for (const auto& m : matches)
        if (m.is_string) fields.push_back(m.text);
    }
    fn(fields);
    return true;
  });
}

namespace {

// The string at the concrete pointer `pointer` of `doc` (as logged: "*" is a member name
// here). A member name on the way that appears twice in its object is an Error in the run's
// words: the run refuses such records, so a log that edits one does not fit the corpus.
Result<std::string_view> string_at(simdjson::dom::element doc, const std::string& pointer) {
  auto parsed = corpus::PointerPattern::parse(pointer);
  auto missing = [&] {
    return make_error(ErrorKind::input, "",
                      "no string at " + pointer + " although the audit log edits it");
  };
  if (!parsed.ok()) return missing();
  std::string at;  // pointer of `doc` so far
  for (const auto& tok : parsed->tokens()) {
    simdjson::dom::object obj;
    simdjson::dom::array arr;
    if (!doc.get_object().get(obj)) {
      int found = 0;
      for (auto member : obj) {
        if (member.key != tok.key) continue;
        if (++found > 1)
          return make_error(ErrorKind::input, "", corpus::duplicate_key_reason(tok.key, at));
        doc = member.value;
      }
      if (!found) return missing();
    } else if (!doc.get_array().get(arr)) {
      size_t index = 0;
      auto [end, ec] = std::from_chars(tok.key.data(), tok.key.data() + tok.key.size(), index);
      if (ec != std::errc() || end != tok.key.data() + tok.key.size() || tok.key.empty() ||
          (tok.key.size() > 1 && tok.key[0] == '0') || arr.at(index).get(doc))
        return missing();
    } else {
      return missing();
    }
    corpus::append_pointer_token(at, tok.key);
  }
  std::string_view sv;
  if (doc.get_string().get(sv)) return missing();
  return sv;
}

// Fills `r` from its corpus record `raw` and checks every edit against it.
Status fill_record(ReviewRecord& r, const corpus::RawRecord& raw, const std::string& path,
                   const CorpusLayout& layout, simdjson::dom::parser& parser) {
  auto fail = [&](const std::string& why) {
    Error e = make_error(ErrorKind::input, path, why);
    e.line = raw.line;
    return e;
  };
  r.raw.assign(raw.bytes);
  r.fields.clear();
  std::vector<std::string> pointers;
  for (const auto& e : r.edits)
    if (std::find(pointers.begin(), pointers.end(), e.field) == pointers.end())
      pointers.push_back(e.field);
  for (const auto& p : pointers) {
    FieldText ft{p, {}};
    if (layout.format == CorpusFormat::text) {
      ft.text = r.raw;
    } else {
      simdjson::dom::element doc;
      if (parser.parse(raw.bytes.data(), raw.bytes.size()).get(doc))
        return fail("not a JSON record (is the corpus plain text?)");
      auto sv = string_at(doc, p);
      if (!sv.ok()) return fail(sv.error().reason);
      ft.text.assign(*sv);
    }
    r.fields.push_back(std::move(ft));
  }
  for (const auto& e : r.edits) {
    const std::string* text = nullptr;
    for (const auto& f : r.fields)
      if (f.pointer == e.field) text = &f.text;
    if (!text || e.at + e.len > text->size() ||
        std::string_view(*text).substr(e.at, e.len) != e.from) {
      return fail("the audit log does not match this corpus: '" + e.from + "' is not at byte " +
                  std::to_string(e.at) + " of " + (e.field.empty() ? "the line" : e.field));
    }
  }
  return ok_status();
}

}  // namespace

// An open input, read forward.
struct SourceAttacher::Cursor {
  std::unique_ptr<io::Source> src;
  std::unique_ptr<corpus::RecordReader> reader;
  corpus::RawRecord raw;  // the last record read, while `have`
  bool have = false;
  bool end = false;
  uint64_t last = 0;  // line of the last record read
};

struct SourceAttacher::State {
  simdjson::dom::parser parser;
  std::map<std::string, Cursor> open;  // by input as logged
};

SourceAttacher::SourceAttacher(CorpusLayout layout)
    : layout_(std::move(layout)), state_(std::make_unique<State>()) {}

SourceAttacher::~SourceAttacher() = default;

Status SourceAttacher::attach(std::vector<ReviewRecord*>& records) {
  // input -> line -> records wanting it
  std::map<std::string, std::multimap<uint64_t, ReviewRecord*>> wanted;
  for (ReviewRecord* r : records) wanted[r->input].emplace(r->line, r);
  for (auto it = state_->open.begin(); it != state_->open.end();)
    it = wanted.count(it->first) ? std::next(it) : state_->open.erase(it);
  for (auto& [input, by_line] : wanted) {
    if (is_stdin_input(input) && layout_.stdin_corpus.empty())
      return make_error(ErrorKind::usage, input,
                        "the run read standard input, which cannot be read again: give a copy "
                        "of what it read with --stdin-corpus PATH");
    std::string path = resolve_input(input, layout_);
    Cursor& c = state_->open[input];
    for (auto lo = by_line.begin(); lo != by_line.end();) {
      uint64_t line = lo->first;
      auto hi = by_line.upper_bound(line);
      bool behind = c.have ? c.raw.line > line : c.end && c.last >= line;
      if (!c.src || behind) {
        c.reader.reset();  // before the source it reads from
        c = Cursor{};
        auto src = io::Source::open(path);
        if (!src.ok()) return std::move(src).error();
        c.src = std::move(*src);
        c.reader = std::make_unique<corpus::RecordReader>(*c.src, layout_.framing,
                                                          layout_.max_record_bytes);
      }
      while (!c.end && (!c.have || c.raw.line < line)) {
        auto kind = c.reader->next(c.raw);
        if (!kind.ok()) return std::move(kind).error();
        if (*kind == corpus::RecordReader::Kind::end) {
          c.end = true;
          c.have = false;
          break;
        }
        c.last = c.raw.line;
        c.have = *kind == corpus::RecordReader::Kind::record;
        // A record over the limit that the log does not name (one the run rejected) is
        // passed over; the one it names is an error.
        if (!c.have && c.raw.line == line) {
          Error e = make_error(ErrorKind::input, path,
                               "record of " + std::to_string(c.raw.size) +
                                   " bytes is over the limit of " +
                                   std::to_string(layout_.max_record_bytes) +
                                   " bytes (the run's manifest tells its --max-record-bytes)");
          e.line = c.raw.line;
          c.reader.reset();
          c = Cursor{};
          return e;
        }
        if (!c.have && c.raw.line > line) break;
      }
      if (!c.have || c.raw.line != line) {
        Error e = make_error(ErrorKind::input, path,
                             "no record at this line although the audit log names it");
        e.line = line;
        return e;
      }
      for (auto i = lo; i != hi; ++i) {
        Status s = fill_record(*i->second, c.raw, path, layout_, state_->parser);
        if (!s.ok()) return s;
      }
      lo = hi;
    }
  }
  return ok_status();
}

Status for_each_attached(const std::string& log, const CorpusLayout& layout, size_t batch,
                         const std::function<bool(const ReviewRecord&)>& want,
                         const std::function<Status(std::vector<ReviewRecord>&)>& fn) {
  SourceAttacher attacher(layout);
  std::vector<ReviewRecord> records;
  auto flush = [&]() -> Status {
    if (records.empty()) return ok_status();
    std::vector<ReviewRecord*> wanted;
    for (auto& r : records) wanted.push_back(&r);
    EVENHAND_TRY(attacher.attach(wanted));
    Status s = fn(records);
    records.clear();
    return s;
  };
  EVENHAND_TRY(for_each_review_record(log, [&](ReviewRecord& r) -> Status {
    if (!want(r)) return ok_status();
    records.push_back(std::move(r));
    return records.size() < batch ? ok_status() : flush();
  }));
  return flush();
}

Status attach_sources(std::vector<ReviewRecord*>& records, const CorpusLayout& layout) {
  return SourceAttacher(layout).attach(records);
}

}  // namespace evenhand::review
