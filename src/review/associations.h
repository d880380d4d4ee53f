// The association audit: how strongly target words (occupations, roles) co-occur with each
// group's words in a corpus, before and after augmentation. For two groups a and b, the
// statistic is the log-odds ratio with an informative Dirichlet prior in z-score form
// (Monroe, Colaresi & Quinn 2008, "Fightin' Words"); its significance is a seeded
// permutation test over records. Counts and results are deterministic.
#pragma once

#include <cstdint>
#include <memory>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "base/status.h"
#include "pack/pack.h"
#include "rewrite/engine.h"

namespace evenhand::review {

// Target words: one per line, '#' comments; further words on a line are variants counted
// as the same target ("nurse nurses"). Words are stored case-folded.
struct TargetList {
  std::string source;  // where the list came from ("en-gender:targets.data" or a path)
  std::vector<std::string> labels;
  std::vector<std::vector<std::string>> variants;  // folded, the label's own form first
};

// Parses a target list. Errors (kind input, naming `source` and the line) for a word listed
// twice, an empty list, and, when `pack` is given, a word the pack rewrites: a one-word form
// or name of it, also before a clitic ("mother's"), which the counter takes for a group word
// and so would never count.
Result<TargetList> parse_targets(std::string_view text, const std::string& source,
                                 const pack::CompiledPack* pack = nullptr);

struct AssociationOptions {
  size_t window = 10;           // words on either side of a group word that are its context
  double prior = 100;           // alpha_0, the prior's total count (see README)
  uint32_t permutations = 999;  // permutation test draws; 0: no test
  uint64_t seed = 0;
};

// Co-occurrence counts of one corpus, kept per record (sparse) for the permutation test.
struct CooccurrenceCounts {
  size_t groups = 0;
  uint64_t records = 0;               // records read
  uint64_t words = 0;                 // word tokens that are not group words (N)
  std::vector<uint64_t> occurrences;  // per target: c_w, occurrences anywhere
  struct Record {
    std::vector<uint32_t> context;  // per group: words within the window of its words (n)
    std::vector<std::pair<uint32_t, std::vector<uint32_t>>> targets;  // target -> y per group
  };
  std::vector<Record> with_context;                 // only records where some group has context
  std::vector<uint64_t> context_total;              // per group: sum of n
  std::vector<std::vector<uint64_t>> target_total;  // [target][group]: sum of y
};

// Counts co-occurrences record by record. Group words are the mentions the rewrite engine
// counts in RecordResult::before (listed with RecordResult::list_mentions), so the audit, a
// run and `tally` count the same mentions: set forms and names as the engine matches them,
// names only with the engine's person evidence, nothing inside a protected span. A guarded
// record's mentions count too (the engine counts them without rewriting them): they are
// mentions, and the audit measures the text as it is. Not copyable; not thread-safe.
class CooccurrenceCounter {
 public:
  // `engine`: one made by rewrite::make_engine (it has a pack), kept alive by the counter.
  CooccurrenceCounter(std::shared_ptr<const rewrite::Engine> engine, const TargetList& targets,
                      size_t window);
  ~CooccurrenceCounter();
  CooccurrenceCounter(const CooccurrenceCounter&) = delete;
  CooccurrenceCounter& operator=(const CooccurrenceCounter&) = delete;

  // Adds one record (its selected string fields, valid UTF-8 each; a window never crosses
  // fields).
  void add_record(std::span<const std::string_view> fields);
  const CooccurrenceCounts& counts() const;

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

// The "Fightin' Words" statistic for one word and two groups a, b (the z-score form of
// Monroe, Colaresi & Quinn 2008, informative Dirichlet prior; written from memory):
//   delta = ln((y_a + alpha_w) / (n_a + alpha_0 - y_a - alpha_w))
//         - ln((y_b + alpha_w) / (n_b + alpha_0 - y_b - alpha_w))
//   var   = 1 / (y_a + alpha_w) + 1 / (y_b + alpha_w)
//   z     = delta / sqrt(var)
struct LogOdds {
  double delta = 0, variance = 0, z = 0;
};
LogOdds log_odds_z(double y_a, double n_a, double y_b, double n_b, double alpha_w, double alpha_0);

struct PairResult {
  uint16_t a = 0, b = 0;  // group indexes
  LogOdds stat;
  std::optional<double> p;  // two-sided permutation p-value; unset with no test
};

struct TargetResult {
  uint64_t occurrences = 0;
  std::vector<uint64_t> y;        // per group
  double alpha = 0;               // alpha_w = alpha_0 * c_w / N
  std::vector<PairResult> pairs;  // every pair a < b; empty when the target is absent
};

struct CorpusAssociations {
  std::string label;                                        // "before", "after"
  std::vector<std::pair<std::string, std::string>> inputs;  // path, sha256
  uint64_t records = 0, words = 0;
  std::vector<uint64_t> context;  // per group: n
  std::vector<TargetResult> targets;
};

// Computes every target's statistic for every pair of groups and, with permutations > 0,
// the permutation p-value: in each draw, the labels a and b are exchanged within each record
// with probability 1/2 (std::mt19937_64 seeded with options.seed), and
// p = (1 + #{|z*| >= |z|}) / (1 + draws).
CorpusAssociations compute_associations(const CooccurrenceCounts& counts,
                                        const AssociationOptions& options);

inline constexpr const char* kAssociationsSchema = "evenhand.associations/1";

struct AssociationReport {
  std::string pack_name, pack_version, pack_sha256, axis;
  std::vector<std::string> groups;
  TargetList targets;
  AssociationOptions options;
  std::vector<std::string> protect;         // the --protect patterns the engine applied
  std::vector<CorpusAssociations> corpora;  // before, then after when measured
};

// The report as pretty-printed JSON (schema evenhand.associations/1, README) with a newline.
std::string render_associations(const AssociationReport& r);
// Reads it back. Errors (kind input) name the file and what is wrong.
Result<AssociationReport> read_associations(const std::string& path);

}  // namespace evenhand::review
