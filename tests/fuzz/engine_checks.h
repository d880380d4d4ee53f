// Shared by the fuzz targets that run the rewrite engine: checks the promises of one
// RecordResult (rewrite/engine.h) against the fields it was made from, aborting on the first
// one broken.
#pragma once

#include <algorithm>
#include <numeric>
#include <span>
#include <string>
#include <string_view>

#include "fuzz_support.h"
#include "rewrite/engine.h"
#include "text/utf8.h"

namespace evenhand::fuzz {

// Edits sorted by (field, begin), apart, inside their field, on character boundaries, with
// valid UTF-8 replacements; counts per group, as many mentions after as before; the entry
// hits include those the edits of mentions carry, and every such edit carries one.
inline void check_result(std::span<const std::string_view> fields, const rewrite::RecordResult& r,
                         size_t groups) {
  FUZZ_CHECK(r.before.size() == groups && r.after.size() == groups, "counts are not per group");
  std::vector<uint32_t> hits;  // the entry hits the edits of mentions carry
  const rewrite::Edit* prev = nullptr;
  for (const rewrite::Edit& e : r.edits) {
    FUZZ_CHECK(e.field < fields.size(), "an edit of a field that does not exist");
    std::string_view f = fields[e.field];
    FUZZ_CHECK(e.begin <= e.end && e.end <= f.size(), "an edit outside its field");
    FUZZ_CHECK(at_char_boundary(f, e.begin) && at_char_boundary(f, e.end),
               "an edit cuts a character");
    FUZZ_CHECK(text::valid_utf8(e.replacement), "a replacement that is not valid UTF-8");
    if (prev) {
      FUZZ_CHECK(prev->field < e.field || (prev->field == e.field && prev->end <= e.begin),
                 "edits out of order or overlapping");
    }
    prev = &e;
    if (e.hit != rewrite::Edit::kNone) hits.push_back(e.hit);
    FUZZ_CHECK(e.from_group == rewrite::Edit::kNone || e.from_group < groups, "bad from_group");
    FUZZ_CHECK(e.to_group == rewrite::Edit::kNone || e.to_group < groups, "bad to_group");
  }
  // Every edit of a mention carries an entry hit of the record (keep_edits_apart relies on
  // it); a mention may count a hit without an edit of its own (its determiners changed).
  std::vector<uint32_t> listed = r.entry_hits;
  std::sort(hits.begin(), hits.end());
  std::sort(listed.begin(), listed.end());
  FUZZ_CHECK(std::includes(listed.begin(), listed.end(), hits.begin(), hits.end()),
             "an edit of a mention whose entry hit the record does not list");
  size_t mentions = 0;
  for (const rewrite::Edit& e : r.edits)
    if (e.reason == rewrite::EditReason::lexicon || e.reason == rewrite::EditReason::name ||
        e.reason == rewrite::EditReason::context)
      ++mentions;
  FUZZ_CHECK(mentions == hits.size(), "an edit of a mention without its entry hit");
  // A coordinated pair that collapses toward one form ("he/she" -> "they") is one mention
  // after for two before; nothing adds mentions.
  FUZZ_CHECK(std::accumulate(r.before.begin(), r.before.end(), 0u) >=
                 std::accumulate(r.after.begin(), r.after.end(), 0u),
             "more mentions after than before");
}

}  // namespace evenhand::fuzz
