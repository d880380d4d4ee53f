// Reads the corpus records an audit log talks about, so edits can be shown in context, and
// checks that the log fits the corpus: every edit's `from` must be the bytes at its offset.
// A log that names a missing record, field or different text is an Error naming where.
#pragma once

#include <cstdint>
#include <functional>
#include <memory>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "base/status.h"
#include "corpus/records.h"
#include "review/audit_log.h"

namespace evenhand::review {

enum class CorpusFormat { jsonl, text };

struct CorpusLayout {
  CorpusFormat format = CorpusFormat::jsonl;
  corpus::Framing framing = corpus::Framing::lines;
  size_t max_record_bytes = 16u << 20;
  // Relative input paths of the log are read relative to this directory ("" = as given).
  std::string root;
  // The file holding what a run read from standard input (logged as "<stdin>"); "" = none.
  std::string stdin_corpus;
};

// True for the names a log gives standard input ("<stdin>", and "-").
bool is_stdin_input(const std::string& input);

// Calls `fn(record)` for every record of `path` in order. `fn` returns true to go on, false
// to stop, or an Error whose file and line, when empty, are filled in with this record's.
// Returns the hex SHA-256 of the file's bytes when it was read to its end (else empty).
// Errors from the source pass through; an oversized record is an Error naming its line.
Result<std::string> for_each_record(
    const std::string& path, const CorpusLayout& layout,
    const std::function<Result<bool>(const corpus::RawRecord&)>& fn);

// Calls `fn(fields)` with the selected string fields of every record of `path` (JSONL: the
// values `patterns` match; text: the whole record). Returns the hex SHA-256 of the file's
// bytes. A bad record is an Error naming the file, line and reason.
Result<std::string> for_each_fields(
    const std::string& path, const CorpusLayout& layout, const std::vector<std::string>& patterns,
    const std::function<void(std::span<const std::string_view>)>& fn);

// Fills `fields` (the decoded text of every field the edits name) and `raw` of records,
// handed over a batch at a time. Each input stays open between batches and is read forward,
// so batches in log order read each input once in all (a record before the read position
// reopens its input); inputs a batch does not name are closed. Errors when an input cannot
// be read again (standard input), a record or field is not there, or an edit's `from`
// differs from the corpus bytes.
class SourceAttacher {
 public:
  explicit SourceAttacher(CorpusLayout layout);
  ~SourceAttacher();
  SourceAttacher(const SourceAttacher&) = delete;
  SourceAttacher& operator=(const SourceAttacher&) = delete;

  Status attach(std::vector<ReviewRecord*>& records);

 private:
  struct Cursor;
  struct State;
  CorpusLayout layout_;
  std::unique_ptr<State> state_;
};

// Records attached at once by review and report: bounds their memory.
inline constexpr size_t kAttachBatch = 256;

// Streams the audit log at `log` and hands the records `want` keeps to `fn` in log order,
// `batch` at a time, each with its corpus text attached and checked, so a log that does not
// fit its corpus fails at its first misfit whoever reads it. `fn` may move from the records.
// Errors from the log, the corpus or `fn` stop it and are returned.
Status for_each_attached(const std::string& log, const CorpusLayout& layout, size_t batch,
                         const std::function<bool(const ReviewRecord&)>& want,
                         const std::function<Status(std::vector<ReviewRecord>&)>& fn);

// One batch: SourceAttacher(layout).attach(records).
Status attach_sources(std::vector<ReviewRecord*>& records, const CorpusLayout& layout);

// The path a logged input is read from under `layout.root` (standard input: stdin_corpus).
std::string resolve_input(const std::string& input, const CorpusLayout& layout);

}  // namespace evenhand::review
