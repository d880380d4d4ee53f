// Choosing which reviewed records to show: filters on pack entry (rule), edit reason, field,
// flag code and guard reason, and a seeded sample stratified by pack entry, so that rare
// entries are seen as well as frequent ones; deterministic, and in memory bounded by the sample.
#pragma once

#include <cstddef>
#include <cstdint>
#include <map>
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

// A seeded sample of up to `n` records, stratified by pack entry, taken in two passes over
// the candidates (the records that pass the filter, in log order) and holding at most `n`
// records a stratum. The stratum of a record is the rule of its edit whose rule is rarest
// among the candidates (ties: the first by rule_less); "guard:REASON", "flag:CODE" or
// "other" for records without a ruled edit. Strata in rule order are visited round-robin,
// and within a stratum records go in the order of stable_hash(seed, "input:line"), ties in
// log order. The sample comes out in log order.
class StratifiedSampler {
 public:
  StratifiedSampler(size_t n, uint64_t seed) : n_(n), seed_(seed) {}

  // Pass 1: every candidate, in log order.
  void count(const ReviewRecord& r);
  // Pass 2: every candidate again, in the same order. Keeps (moves from) `r` while it is
  // among the best `n` of its stratum.
  void offer(ReviewRecord& r);
  // After pass 2: the sample, in log order. Leaves the sampler empty.
  std::vector<ReviewRecord> take();

 private:
  struct Kept {
    uint64_t hash = 0;
    uint64_t ordinal = 0;  // position among the candidates
    ReviewRecord record;
  };
  struct Stratum {
    std::string key;
    std::vector<Kept> best;  // a max-heap on (hash, ordinal), at most n_ entries
  };
  std::string stratum_of(const ReviewRecord& r) const;

  size_t n_;
  uint64_t seed_;
  std::map<std::string, size_t> rule_count_;
  std::map<std::string, size_t> pos_;  // stratum key -> index into strata_
  std::vector<Stratum> strata_;        // in the order first offered
  uint64_t offered_ = 0;
};

}  // namespace evenhand::review
