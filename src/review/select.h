// Choosing which reviewed records to show: filters on pack entry (rule), edit reason, field,
// flag code and guard reason, and a seeded sample stratified by pack entry, so that rare
// entries are seen as well as frequent ones. Deterministic for a given log and seed.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "review/audit_log.h"

namespace evenhand::review {

struct Filter {
  // Edit filters: a record passes when one of its edits matches every non-empty list
  // (a list matches when it holds the edit's value).
  std::vector<std::string> rules;   // "words.txt:67"
  std::vector<std::string> whys;    // lexicon, name, context, agreement
  std::vector<std::string> fields;  // JSON Pointers as logged
  // Record filters: flag codes ("any" for every flagged record) and guard reasons ("any").
  std::vector<std::string> flags;
  std::vector<std::string> guards;
};

// True when `r` passes `f`. With no filter at all, every record passes.
bool passes(const ReviewRecord& r, const Filter& f);

// The stratum of a record: the rule of its edit whose rule is rarest among `records`
// ("guard:REASON" or "flag:CODE" for records without edits).
// Returns the indexes of up to `n` records of `candidates` (indexes into `records`): strata
// in rule order are visited round-robin, and within a stratum records go in the order of
// stable_hash(seed, "input:line"). The result is sorted back into log order.
std::vector<size_t> stratified_sample(const std::vector<ReviewRecord>& records,
                                      const std::vector<size_t>& candidates, size_t n,
                                      uint64_t seed);

}  // namespace evenhand::review
