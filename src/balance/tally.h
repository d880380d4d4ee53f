// Group tallies for rebalancing: per group, how many mentions and records a corpus has, and a
// small histogram of record signatures (binned per-group mention counts of a record and of its
// counterfactual) from which the planner works. A tally's size depends on how many distinct
// signatures occur, not on the corpus size; tallies of shards merge by plain addition into
// exactly the tally of the shards' concatenation, and round-trip through JSON
// ("evenhand.tally/1").
#pragma once

#include <compare>
#include <cstdint>
#include <map>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "base/status.h"
#include "rewrite/engine.h"

namespace evenhand::balance {

// ---- Count bins ----------------------------------------------------------------------------
// A mention count c is kept exactly up to kExactCountMax; above that it falls into a
// power-of-two bin: 9-16, 17-32, 33-64, ... (bin 9 is 9-16, bin 10 is 17-32, and so on; bin
// 37, the last, is 2^31+1 .. 2^32-1). Bins keep the number of distinct signatures small
// whatever the corpus size; the exact sums per signature (SignatureTotals) keep the totals
// exact all the same.
inline constexpr uint32_t kExactCountMax = 8;

// Returns the bin of count `c` (0..37): c itself up to 8, then 9 + floor(log2(c - 1)) - 3.
uint8_t count_bin(uint32_t c);
// Returns the smallest count in bin `b` (b itself up to 8; 9, 17, 33, ... above).
uint64_t bin_low(uint8_t b);
// Returns the largest count in bin `b` (b itself up to 8; 16, 32, 64, ... above; the last bin
// ends at 2^32 - 1).
uint64_t bin_high(uint8_t b);
// Returns the bin whose smallest count is `low`, or -1 when `low` is no bin's lower end.
int bin_of_low(uint64_t low);

// ---- Signatures ----------------------------------------------------------------------------
// The group a record "leads" with: the group it mentions most, or one of these.
inline constexpr int16_t kLeadTie = -1;   // two or more groups share the highest count (> 0)
inline constexpr int16_t kLeadNone = -2;  // no mention at all

// Returns the index of the group with the highest count, kLeadTie when the highest count
// (> 0) is shared, kLeadNone when every count is 0.
int16_t lead_group(std::span<const uint32_t> counts);

// What the planner needs to know about one record. Records with equal signatures are
// interchangeable for planning. The lead fields are part of the key because binned counts
// above 8 no longer tell which group leads.
struct Signature {
  bool changeable = false;      // has mentions, no guard and at least one edit
  std::vector<uint8_t> before;  // count_bin of each group's mentions in the record as read
  std::vector<uint8_t> after;   // the same for its counterfactual; empty when not changeable
  int16_t lead_before = kLeadNone;
  int16_t lead_after = kLeadNone;  // kLeadNone when not changeable

  auto operator<=>(const Signature&) const = default;
};

// Returns the signature of a record from its per-group counts as read (`before`) and in its
// counterfactual (`after`, ignored unless `changeable`). Counts are padded with zeros or cut
// to `groups` entries.
Signature make_signature(std::span<const uint32_t> before, std::span<const uint32_t> after,
                         bool changeable, size_t groups);

// Returns whether the engine's result can be rewritten: it has mentions, no guard blocked it
// and it has at least one edit (the rule the pipeline applies before writing a
// counterfactual).
bool is_changeable(const rewrite::RecordResult& r);

// Returns the signature of an engine result (see make_signature, is_changeable).
Signature signature_of(const rewrite::RecordResult& r, size_t groups);

// Exact totals of the records that share one signature.
struct SignatureTotals {
  uint64_t records = 0;
  std::vector<uint64_t> before;  // per group: sum of the records' mentions as read
  std::vector<uint64_t> after;   // per group: sum over their counterfactuals (empty when
                                 // the signature is not changeable)
  bool operator==(const SignatureTotals&) const = default;
};

struct GroupTotals {
  uint64_t mentions = 0;  // mentions of the group over all records
  uint64_t records = 0;   // records that lead with the group (ties and none counted apart)
  bool operator==(const GroupTotals&) const = default;
};

// The tally of one axis (one pack) over a set of records.
struct Tally {
  std::string axis;                 // e.g. "gender"
  std::vector<std::string> groups;  // indexed like the pack's groups
  std::string pack_sha256;          // of the pack that counted; may be empty

  uint64_t records = 0;                   // every record added
  uint64_t records_changeable = 0;        // see is_changeable
  uint64_t records_guarded = 0;           // a guard phrase blocked the rewrite
  uint64_t records_without_mentions = 0;  // lead kLeadNone
  uint64_t records_tied = 0;              // lead kLeadTie
  std::vector<GroupTotals> by_group;      // indexed like groups
  std::map<Signature, SignatureTotals> signatures;

  // Returns an empty tally for these groups.
  static Tally make(std::string axis, std::vector<std::string> groups,
                    std::string pack_sha256 = {});

  // Adds one record: its counts as read and in its counterfactual (used only when
  // `changeable`), and whether a guard blocked it (counted in records_guarded; a guarded
  // record should not be changeable). Counts are padded or cut to groups.size().
  void add(std::span<const uint32_t> before, std::span<const uint32_t> after, bool changeable,
           bool guarded);
  // Adds the engine's result for one record.
  void add(const rewrite::RecordResult& r);

  // Adds `other` into this. Returns an Error (kind usage) when the two differ in axis, groups
  // or pack hash; a tally with no groups and no records takes on the other's header.
  Status merge(const Tally& other);

  bool operator==(const Tally&) const = default;
};

// The schema name written into and expected in tally documents.
inline constexpr const char* kTallySchema = "evenhand.tally/1";

// Returns the tally as a JSON document (`indent` as for audit::JsonWriter). Signatures are
// written in key order, so equal tallies give equal bytes.
std::string tally_to_json(const Tally& t, int indent = 2);

// Parses a tally document. Returns an Error (kind input, naming `file`) when it is not valid
// JSON, has another schema, or is inconsistent (counts of the wrong length, a bin that does
// not exist, totals that do not add up).
Result<Tally> tally_from_json(std::string_view json, const std::string& file = {});

}  // namespace evenhand::balance
