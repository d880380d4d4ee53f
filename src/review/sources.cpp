#include "review/sources.h"

#include <simdjson.h>

#include <algorithm>
#include <filesystem>
#include <map>

#include "corpus/json_fields.h"
#include "io/source.h"

namespace evenhand::review {

std::string resolve_input(const std::string& input, const CorpusLayout& layout) {
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
                        "record of " + std::to_string(raw.size) + " bytes is over the limit");
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

Status attach_sources(std::vector<ReviewRecord*>& records, const CorpusLayout& layout) {
  // input -> line -> records wanting it
  std::map<std::string, std::multimap<uint64_t, ReviewRecord*>> wanted;
  for (ReviewRecord* r : records) wanted[r->input].emplace(r->line, r);
  simdjson::dom::parser parser;
  for (auto& [input, by_line] : wanted) {
    if (input == "-")
      return make_error(
          ErrorKind::usage, input,
          "the run read standard input; the corpus cannot be read again to review it");
    std::string path = resolve_input(input, layout);
    Status failed = ok_status();
    uint64_t last = by_line.rbegin()->first;
    auto s = for_each_record(path, layout, [&](const corpus::RawRecord& raw) -> Result<bool> {
      auto [lo, hi] = by_line.equal_range(raw.line);
      for (auto it = lo; it != hi && failed.ok(); ++it) {
        ReviewRecord& r = *it->second;
        r.raw.assign(raw.bytes);
        r.fields.clear();
        auto fail = [&](const std::string& why) {
          Error e = make_error(ErrorKind::input, path, why);
          e.line = raw.line;
          failed = e;
        };
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
            std::string_view sv;
            if (parser.parse(raw.bytes.data(), raw.bytes.size()).get(doc)) {
              fail("not a JSON record (is the corpus plain text?)");
              break;
            }
            if (doc.at_pointer(p).get_string().get(sv)) {
              fail("no string at " + p + " although the audit log edits it");
              break;
            }
            ft.text.assign(sv);
          }
          r.fields.push_back(std::move(ft));
        }
        if (!failed.ok()) break;
        for (const auto& e : r.edits) {
          const std::string* text = nullptr;
          for (const auto& f : r.fields)
            if (f.pointer == e.field) text = &f.text;
          if (!text || e.at + e.len > text->size() ||
              std::string_view(*text).substr(e.at, e.len) != e.from) {
            fail("the audit log does not match this corpus: '" + e.from + "' is not at byte " +
                 std::to_string(e.at) + " of " + (e.field.empty() ? "the line" : e.field));
            break;
          }
        }
      }
      return failed.ok() && raw.line < last;
    });
    if (!s.ok()) return std::move(s).error();
    if (!failed.ok()) return failed;
    for (auto& [line, r] : by_line) {
      if (r->raw.empty() && r->fields.empty()) {
        Error e = make_error(ErrorKind::input, path,
                             "no record at this line although the audit log names it");
        e.line = line;
        return e;
      }
    }
  }
  return ok_status();
}

}  // namespace evenhand::review
