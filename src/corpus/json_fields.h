// Field selection in one JSONL record. A FieldSelector parses a record with simdjson
// On-Demand, validates all of it (syntax and UTF-8), and returns the values the pointer
// patterns match, with their raw byte ranges, so edits can be spliced into the original bytes
// and everything outside the edited strings leaves exactly as it came.
#pragma once

#include <cstdint>
#include <memory>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "base/status.h"
#include "corpus/json_pointer.h"

namespace evenhand::corpus {

struct FieldMatch {
  std::string pointer;     // concrete pointer of the value, e.g. "/messages/2/content"
  uint32_t pattern = 0;    // index of the pattern that matched
  bool is_string = false;  // only string values are rewritten
  uint32_t raw_begin = 0;  // value's JSON token in the record: [raw_begin, raw_end);
  uint32_t raw_end = 0;    //   for a string, the quotes included
  std::string_view text;   // decoded string value (strings only); valid until next select()
  int32_t align = -1;      // internal: alignment table of an escaped string, or -1
};

// Counts for one select() call.
struct SelectStats {
  uint32_t missing = 0;     // patterns that matched no value at all
  uint32_t not_string = 0;  // matched values that are not strings
};

// A replacement of decoded bytes [begin, end) of one matched string.
struct StringEdit {
  uint32_t begin = 0;
  uint32_t end = 0;
  std::string_view replacement;  // valid UTF-8
};

// Edits for one FieldMatch, sorted by begin and not overlapping.
struct FieldEdits {
  uint32_t match = 0;  // index into the select() output
  std::vector<StringEdit> edits;
};

// One edit of a flat list: a replacement in the string of match `match`.
struct MatchEdit {
  uint32_t match = 0;  // index into the select() output
  StringEdit edit;
};

// One per worker thread: owns the parser and scratch buffers, reused across records.
// Not copyable; not thread-safe.
class FieldSelector {
 public:
  explicit FieldSelector(std::vector<PointerPattern> patterns);
  ~FieldSelector();
  FieldSelector(const FieldSelector&) = delete;
  FieldSelector& operator=(const FieldSelector&) = delete;

  // Parses `record` (one JSON text, no line terminator) and fills `out` with every value the
  // patterns match, in document order. Errors (kind input, reason only; the caller adds file
  // and line) for malformed JSON, a value that is not an object, invalid UTF-8, or a member
  // name that a pattern selects appearing twice in one object ("duplicate key ...": readers
  // differ on which value counts); duplicates no pattern reaches pass as they are.
  Status select(std::string_view record, std::vector<FieldMatch>& out, SelectStats& stats);

  // Appends to `out` the record with the edits applied: each edited string keeps its original
  // raw bytes (escapes included) outside the edit ranges; replacements are JSON-escaped.
  // `matches` must be the output of the last select() on this same `record`.
  void splice(std::string_view record, std::span<const FieldMatch> matches,
              std::span<const FieldEdits> edits, std::string& out) const;
  // The same from one flat list, already in document order: sorted by match, then by begin
  // (no per-field lists to allocate for a record with many fields).
  void splice_flat(std::string_view record, std::span<const FieldMatch> matches,
                   std::span<const MatchEdit> edits, std::string& out) const;

  // Gives back the scratch memory (parser, padded copy, decoded texts), which grows to the
  // largest record seen; matches of the last select() are invalid afterwards.
  void trim();

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

// The reason select() gives for member name `key` appearing twice in the object at
// `object_pointer` ("" for the record itself); review refuses such a record in the same words.
std::string duplicate_key_reason(std::string_view key, std::string_view object_pointer);

// Appends `record` (a JSON object text) with one more member `"key": raw_value` inserted
// before its closing brace. `raw_value` must be valid JSON.
void append_with_member(std::string_view record, std::string_view key, std::string_view raw_value,
                        std::string& out);

}  // namespace evenhand::corpus
