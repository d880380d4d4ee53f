#include "audit/stats.h"

namespace evenhand::audit {

namespace {
void add_groups(std::vector<GroupTally>& into, const std::vector<GroupTally>& from) {
  if (into.size() < from.size()) into.resize(from.size());
  for (size_t i = 0; i < from.size(); ++i) {
    into[i].mentions += from[i].mentions;
    into[i].records += from[i].records;
  }
}
}  // namespace

void Stats::merge(const Stats& o) {
  records_read += o.records_read;
  records_written += o.records_written;
  records_kept += o.records_kept;
  records_replaced += o.records_replaced;
  records_added += o.records_added;
  records_dropped += o.records_dropped;
  records_rejected += o.records_rejected;
  blank_lines += o.blank_lines;
  quarantined += o.quarantined;
  audit_lines += o.audit_lines;
  for (const auto& [k, v] : o.rejected_by_reason) rejected_by_reason[k] += v;
  fields_selected += o.fields_selected;
  fields_missing += o.fields_missing;
  fields_not_string += o.fields_not_string;
  if (pattern_records.size() < o.pattern_records.size())
    pattern_records.resize(o.pattern_records.size());
  for (size_t i = 0; i < o.pattern_records.size(); ++i) pattern_records[i] += o.pattern_records[i];
  records_with_mentions += o.records_with_mentions;
  records_guarded += o.records_guarded;
  records_flagged += o.records_flagged;
  for (const auto& [k, v] : o.flagged_by_reason) flagged_by_reason[k] += v;
  for (const auto& [k, v] : o.guarded_by_reason) guarded_by_reason[k] += v;
  protected_skips += o.protected_skips;
  ambiguous += o.ambiguous;
  edits += o.edits;
  add_groups(before, o.before);
  add_groups(after, o.after);
  for (const auto& [k, v] : o.entry_hits) entry_hits[k] += v;
}

}  // namespace evenhand::audit
