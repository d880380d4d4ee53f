#include "review/audit_log.h"

#include <simdjson.h>

#include "review/sources.h"

namespace evenhand::review {

namespace {

using simdjson::dom::element;

// Reads member `key` as a string into `out`; false when it is missing or not a string.
bool get_string(element obj, const char* key, std::string& out) {
  std::string_view v;
  if (obj[key].get_string().get(v)) return false;
  out.assign(v);
  return true;
}

bool get_uint(element obj, const char* key, uint64_t& out) {
  return !obj[key].get_uint64().get(out);
}

Result<LoggedEdit> parse_edit(element e) {
  LoggedEdit out;
  if (!e.is_object()) return make_error(ErrorKind::input, "", "an edit is not a JSON object");
  if (!get_string(e, "field", out.field) || !get_uint(e, "at", out.at) ||
      !get_uint(e, "len", out.len) || !get_string(e, "from", out.from) ||
      !get_string(e, "to", out.to) || !get_string(e, "why", out.why)) {
    return make_error(ErrorKind::input, "",
                      "an edit lacks one of field, at, len, from, to, why (or has the wrong type)");
  }
  if (out.from.size() != out.len)
    return make_error(ErrorKind::input, "", "an edit's 'len' is not the byte length of 'from'");
  get_string(e, "rule", out.rule);
  get_string(e, "note", out.note);
  double score = 0;
  if (!e["score"].get_double().get(score)) out.score = score;
  return out;
}

}  // namespace

Status for_each_review_record(const std::string& path,
                              const std::function<Status(ReviewRecord&)>& fn) {
  simdjson::dom::parser parser;
  std::optional<ReviewRecord> cur;
  Status handed = ok_status();  // an Error from `fn`, returned as it is
  auto hand_over = [&]() {
    if (cur) handed = fn(*cur);
    cur.reset();
    return handed.ok();
  };
  // An audit line can be many times its record's size (a short edit logs about a hundred
  // bytes), so lines are not held to any record limit: one is buffered whole, as long as it
  // is, up to the most the JSON parser takes.
  CorpusLayout lines;
  lines.max_record_bytes = simdjson::SIMDJSON_MAXSIZE_BYTES;
  auto read = for_each_record(path, lines, [&](const corpus::RawRecord& raw) -> Result<bool> {
    auto fail = [](const std::string& why) { return make_error(ErrorKind::input, "", why); };
    element doc;
    if (auto err = parser.parse(raw.bytes.data(), raw.bytes.size()).get(doc))
      return fail(std::string("invalid JSON: ") + simdjson::error_message(err));
    if (!doc.is_object()) return fail("audit line is not a JSON object");
    std::string input, action;
    uint64_t line = 0;
    if (!get_string(doc, "input", input) || !get_uint(doc, "line", line) ||
        !get_string(doc, "action", action))
      return fail("audit line lacks 'input', 'line' or 'action'");
    if (!cur || cur->input != input || cur->line != line) {
      if (!hand_over()) return false;
      cur.emplace();
      cur->input = input;
      cur->line = line;
      cur->log_line = raw.line;
    }
    ReviewRecord& r = *cur;
    if (action == "added" || action == "replaced") {
      simdjson::dom::array edits;
      if (doc["edits"].get_array().get(edits)) return fail("'edits' is missing or not an array");
      r.action = action;
      for (element e : edits) {
        auto edit = parse_edit(e);
        if (!edit.ok()) return fail(edit.error().reason);
        r.edits.push_back(std::move(*edit));
      }
    } else if (action == "guarded") {
      if (!get_string(doc, "guard", r.guard)) return fail("guarded line lacks 'guard'");
      get_string(doc, "phrase", r.guard_phrase);
      get_string(doc, "rule", r.guard_rule);
    } else if (action == "flagged") {
      simdjson::dom::array flags;
      if (doc["flags"].get_array().get(flags)) return fail("'flags' is missing or not an array");
      for (element f : flags) {
        simdjson::dom::object o;
        if (f.get_object().get(o)) return fail("a flag is not a JSON object");
        for (auto member : o) {
          std::string_view detail;
          if (member.value.get_string().get(detail)) return fail("a flag's detail is not a string");
          r.flags.push_back({std::string(member.key), std::string(detail)});
        }
      }
      get_string(doc, "outcome", r.flag_outcome);
    } else {
      return fail("unknown action '" + action + "'");
    }
    return true;
  });
  if (!read.ok()) return std::move(read).error();
  if (!handed.ok()) return handed;
  hand_over();
  return handed;
}

Result<std::vector<ReviewRecord>> read_audit_log(const std::string& path) {
  std::vector<ReviewRecord> out;
  Status s = for_each_review_record(path, [&](ReviewRecord& r) {
    out.push_back(std::move(r));
    return ok_status();
  });
  if (!s.ok()) return std::move(s).error();
  return out;
}

}  // namespace evenhand::review
