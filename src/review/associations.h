// The association audit: how strongly target words (occupations, roles) co-occur with each
// group's words in a corpus, before and after augmentation. For two groups a and b, the
// statistic is the log-odds ratio with an informative Dirichlet prior in z-score form
// (Monroe, Colaresi & Quinn 2008, "Fightin' Words"); its significance is the exact
// conditional (permutation) test of that z, two-sided. Counts and results are deterministic.
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
  size_t window = 10;  // words on either side of a group word that are its context
  double prior = 100;  // alpha_0, the prior's total count (see README)
  // Below this many co-occurrences with the two groups (y_a + y_b) a pair gets no p-value
  // but "too few": about 5 expected per group, the common rule for a 2x2 table (README).
  uint64_t min_cooccurrences = 10;
};

// Co-occurrence counts of one corpus. Pairs of groups are indexed a < b in order
// (0-1, 0-2, ..., 1-2, ...); see pair_index.
struct CooccurrenceCounts {
  size_t groups = 0;
  uint64_t records = 0;                             // records read
  uint64_t words = 0;                               // word tokens that are not group words (N)
  std::vector<uint64_t> occurrences;                // per target: c_w, occurrences anywhere
  std::vector<uint64_t> context_total;              // per group: n, words in its contexts
  std::vector<std::vector<uint64_t>> target_total;  // [target][group]: y
  std::vector<uint64_t> shared_context;             // per pair: words in both groups' contexts
  std::vector<std::vector<uint64_t>> shared_total;  // [target][pair]: of them, the target's
};

// The index of the pair a < b among `groups` groups' pairs.
size_t pair_index(size_t groups, size_t a, size_t b);

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

// The exact conditional test of z for one target and two groups. Null hypothesis: the
// target's co-occurrences are spread over the pair's context words without regard to group.
// Given the context words only in a's context (`only_a`), only in b's (`only_b`) and in both
// (`shared`), and the target's count in each (`y_only_a`, `y_only_b`, `y_shared`), every
// placement of the target's y_only_a + y_only_b + y_shared tokens among the context words is
// equally likely, so (k_a, k_b, k_s) is multivariate hypergeometric; p is the probability of
// an outcome whose |z| (y_a = k_a + k_s, y_b = k_b + k_s) is at least the observed |z|
// (two-sided; ties count). This is the exact permutation distribution of which a Monte Carlo
// permutation test only estimates p (Fisher's exact test with the z ordering; Agresti,
// "Categorical Data Analysis", 2002, 3.5; from memory). Sums run in log space; outcomes
// less probable than e^-40 times both the likeliest and the observed one are left out, so p
// is exact to about 1e-15 of itself and never 0 (below the least normal double it is that).
struct PairTable {
  uint64_t only_a = 0, only_b = 0, shared = 0, y_only_a = 0, y_only_b = 0, y_shared = 0;
};
double exact_p(const PairTable& t, double alpha_w, double alpha_0);

struct PairResult {
  uint16_t a = 0, b = 0;  // group indexes
  LogOdds stat;
  uint64_t shared_context = 0, shared_cooccurrences = 0;  // words in both contexts; targets
  bool too_few = false;     // y_a + y_b below options.min_cooccurrences: no p-value
  std::optional<double> p;  // exact_p; unset when too few (or read from a file without it)
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

// Computes every target's statistic for every pair of groups and, for a pair with at least
// options.min_cooccurrences co-occurrences (y_a + y_b), its exact_p.
CorpusAssociations compute_associations(const CooccurrenceCounts& counts,
                                        const AssociationOptions& options);

inline constexpr const char* kAssociationsSchema = "evenhand.associations/2";

struct AssociationReport {
  std::string pack_name, pack_version, pack_sha256, axis;
  std::vector<std::string> groups;
  TargetList targets;
  AssociationOptions options;
  std::vector<std::string> protect;         // the --protect patterns the engine applied
  std::vector<CorpusAssociations> corpora;  // before, then after when measured
};

// The report as pretty-printed JSON (schema evenhand.associations/2, README) with a newline.
std::string render_associations(const AssociationReport& r);
// Reads it back. Errors (kind input) name the file and what is wrong.
Result<AssociationReport> read_associations(const std::string& path);

}  // namespace evenhand::review
