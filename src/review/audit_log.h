// Reading an audit log (`run --edits`) back for review, streaming: every line is checked for
// the shape the pipeline writes, and the lines about one source record are joined into one
// ReviewRecord, handed over one at a time. A bad line is an Error naming file, line, reason.
#pragma once

#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "base/status.h"

namespace evenhand::review {

struct LoggedEdit {
  std::string field;  // JSON Pointer of the string ("" for text records)
  uint64_t at = 0;    // byte offset in the decoded string
  uint64_t len = 0;   // bytes replaced
  std::string from, to;
  std::string rule;  // pack location, e.g. "words.txt:67"; empty for some agreement edits
  std::string why;   // lexicon, name, context, agreement
  std::string note;  // agreement edits: what agreed
  std::optional<double> score;
};

struct LoggedFlag {
  std::string code, detail;
};

// The text of one field as read from the corpus.
struct FieldText {
  std::string pointer;
  std::string text;
};

// Everything the log says about one source record.
struct ReviewRecord {
  std::string input;  // as written in the log (the run's --in argument)
  uint64_t line = 0;
  uint64_t log_line = 0;  // first line of the log about this record
  std::string action;     // "added" or "replaced" when rewritten, else empty
  std::vector<LoggedEdit> edits;
  std::string guard, guard_phrase, guard_rule;  // set when a guard blocked the record
  std::vector<LoggedFlag> flags;
  std::string flag_outcome;
  // Filled by attach_sources(): the fields the edits name (or, for a record without edits,
  // every selected string is unknown, so `raw` holds the record as read).
  std::vector<FieldText> fields;
  std::string raw;
};

// Calls `fn(record)` for every record of the log (plain, zstd or gzip) in log order, holding
// one record at a time. Adjacent lines about the same (input, line) are joined, as the
// pipeline writes a flag line right before the edits of that record. `fn` may move from its
// argument; an Error from `fn` stops the reading and is returned as it is.
Status for_each_review_record(const std::string& path,
                              const std::function<Status(ReviewRecord&)>& fn);

// Every record of the log in one vector (a convenience for small logs and tests).
Result<std::vector<ReviewRecord>> read_audit_log(const std::string& path);

}  // namespace evenhand::review
