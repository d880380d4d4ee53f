// Run statistics: every count the manifest reports, kept per batch by the workers and merged
// in input order by the writer. Merging is plain addition, so the totals do not depend on
// how records were split into batches or threads.
#pragma once

#include <cstdint>
#include <map>
#include <string>
#include <vector>

namespace evenhand::audit {

struct GroupTally {
  uint64_t mentions = 0;  // mentions of the group's forms and names
  uint64_t records = 0;   // records that mention the group more than any other group
};

struct Stats {
  uint64_t records_read = 0;      // records framed from the inputs (blank lines excluded)
  uint64_t records_written = 0;   // lines written to the output, copies included
  uint64_t records_kept = 0;      // written as read (no edit applied)
  uint64_t records_replaced = 0;  // written as their counterfactual instead of the original
  uint64_t records_added = 0;     // counterfactual copies added after their original
  uint64_t records_dropped = 0;   // balance mode: left out by the plan
  uint64_t records_rejected = 0;  // bad records (skipped, quarantined, or the failing one)
  uint64_t blank_lines = 0;
  uint64_t quarantined = 0;  // rejected records copied to the quarantine file
  uint64_t audit_lines = 0;  // lines written to the audit log
  std::map<std::string, uint64_t> rejected_by_reason;

  uint64_t fields_selected = 0;    // string values matched by the field pointers
  uint64_t fields_missing = 0;     // pointer patterns that matched nothing in a record
  uint64_t fields_not_string = 0;  // matched values that were not strings
  // Per --field pattern (JSONL): records in which it matched at least one value.
  std::vector<uint64_t> pattern_records;

  uint64_t records_with_mentions = 0;
  uint64_t records_guarded = 0;
  uint64_t records_flagged = 0;  // counterfactuals with agreement the engine could not settle
  std::map<std::string, uint64_t> flagged_by_reason;
  std::map<std::string, uint64_t> guarded_by_reason;
  uint64_t protected_skips = 0;  // mentions inside protected spans, left alone
  uint64_t ambiguous = 0;        // context decisions with a low margin
  uint64_t edits = 0;            // edits applied in written counterfactuals

  std::vector<GroupTally> before;           // per group, over records read (not rejected)
  std::vector<GroupTally> after;            // per group, over records written
  std::map<uint32_t, uint64_t> entry_hits;  // pack entry index -> edits it produced

  // Adds `other` into this.
  void merge(const Stats& other);
  // Records one rejection.
  void reject(const std::string& reason) {
    ++records_rejected;
    ++rejected_by_reason[reason];
  }
};

}  // namespace evenhand::audit
