// The rewrite engine: given the selected string fields of one record, finds every mention of
// the pack's groups and produces the edits that turn the record into its counterfactual,
// each edit explained (which pack entry fired and why). The Engine is immutable and shared by
// all threads; each thread makes its own Worker for scratch state.
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

namespace evenhand::rewrite {

// Why an edit was made.
enum class EditReason : uint8_t {
  lexicon,    // a one-to-one word form of the pack
  name,       // a first name
  context,    // a one-to-many form decided from context (score says how sure)
  agreement,  // a dependent word changed to agree with an edit (verbs, articles)
};
const char* edit_reason_name(EditReason r);

struct Edit {
  uint32_t field = 0;  // index of the field in the record
  uint32_t begin = 0;  // decoded byte range in that field's text
  uint32_t end = 0;
  std::string replacement;
  EditReason reason = EditReason::lexicon;
  const pack::SourceRef* rule = nullptr;  // the pack line that fired (owned by the pack)
  float score = 0;                        // decision margin for context edits
  std::string note;                       // agreement edits: what was agreed and why
  // For the edit of a mention (not agreement): the group it was counted in before and after
  // (RecordResult::before/after) and its RecordResult::entry_hits value; kNone otherwise.
  static constexpr uint32_t kNone = UINT32_MAX;
  uint32_t from_group = kNone, to_group = kNone, hit = kNone;
};

// Counts per group, indexed like CompiledPack::groups().
using GroupCounts = std::vector<uint32_t>;

struct RecordResult {
  std::vector<Edit> edits;             // sorted by (field, begin), not overlapping
  GroupCounts before;                  // mentions of each group in the record as read
  GroupCounts after;                   // mentions of each group in the counterfactual
  const pack::Guard* guard = nullptr;  // set when a guard phrase blocked the rewrite
  uint32_t protected_spans = 0;        // mentions skipped because they sat in protected spans
  uint32_t ambiguous = 0;              // context decisions with a low margin
  std::vector<uint32_t> entry_hits;    // sets/names that fired, one per non-agreement edit
  // Agreement that could not be settled: a short code ("unsettled_verb",
  // "unsettled_contraction"; "overlapping_edits" if two rules ever claimed the same bytes and
  // the later edit was left out) and what was seen.
  struct Flag {
    std::string code;
    std::string detail;
  };
  std::vector<Flag> flags;
  // Every mention counted in `before`, in order, when the caller sets `list_mentions` (the
  // association audit counts the same mentions as the engine; a run does not need them).
  struct Mention {
    uint32_t field = 0, begin = 0, end = 0;  // decoded byte range in the field
    uint16_t group = 0;                      // as read
  };
  std::vector<Mention> mentions;
  bool list_mentions = false;  // set by the caller; clear() keeps it

  // Counts a mention of group g as read (and lists it when list_mentions is set).
  void count_mention(uint16_t g, uint32_t field, uint32_t begin, uint32_t end) {
    ++before[g];
    if (list_mentions) mentions.push_back({field, begin, end, g});
  }
  bool has_mentions() const;
  void clear();
};

// Keeps the promise of RecordResult::edits: sorts the edits by (field, begin) and, should two
// of them ever claim the same bytes, leaves out the later one and flags the record
// ("overlapping_edits"); a mention's edit left out is counted back in its own group (after),
// and its entry hit removed, so counts, output and audit log still agree.
void keep_edits_apart(RecordResult& out);

struct EngineOptions {
  // Protected-span user patterns (ICU regular expressions).
  std::vector<std::string> protect_patterns;
  // Rewrite every other group's forms toward this group; nullopt: the first two groups swap
  // and further groups (e.g. neutral) stay as they are.
  std::optional<uint16_t> toward;
  // English: write "themselves" where the pack's neutral reflexive is "themself".
  bool themselves = false;
};

class Engine;

// Per-thread scratch. Not copyable; not thread-safe.
class Worker {
 public:
  virtual ~Worker() = default;
  // Analyses the fields of one record (valid UTF-8 each) and fills `out`.
  // Scratch grows to the largest record seen; most of it is per field or per token.
  virtual void rewrite(std::span<const std::string_view> fields, RecordResult& out) = 0;
  // Gives the scratch memory back (called after a large record); results are unchanged.
  virtual void trim() {}
};

class Engine {
 public:
  virtual ~Engine() = default;
  // The pack in use, or null for the identity engine.
  virtual const pack::CompiledPack* pack() const = 0;
  virtual std::unique_ptr<Worker> make_worker() const = 0;
};

// An engine that finds no mentions and makes no edits (pass-through runs and tests).
std::unique_ptr<Engine> make_identity_engine();

class PossessiveModel;
class VerbTable;
class NounPhraseAgreement;
namespace en {
class PersonContext;
class Senses;
}  // namespace en

// The pack's data files the engine reads, parsed; each is null when the pack has no such file
// (possessive.model with word-classes.data, verbs.data, noun-phrase.data with the three files
// it needs, person-context.data, senses.data).
struct EngineData {
  std::shared_ptr<const PossessiveModel> possessive;
  std::shared_ptr<const VerbTable> verbs;
  std::shared_ptr<const NounPhraseAgreement> noun_phrases;
  std::shared_ptr<const en::PersonContext> persons;
  std::shared_ptr<const en::Senses> senses;  // senses.data
};

// Runs every loader of the engine's data files on `pack`, each file named in errors by
// CompiledPack::file_path ("/tmp/mypack/possessive.model:12: reason"). Every file is tried:
// `problems` receives the first problem of each file that does not load. Returns the data, or
// the first problem (kind pack) when there is any.
Result<EngineData> load_engine_data(const std::shared_ptr<const pack::CompiledPack>& pack,
                                    std::vector<Error>& problems);

// The pack-driven engine over data loaded by load_engine_data. Errors (kind usage) for bad
// options, e.g. a broken protect pattern.
Result<std::unique_ptr<Engine>> make_engine(std::shared_ptr<const pack::CompiledPack> pack,
                                            EngineData data, const EngineOptions& options);
// The same, loading the data first: also an Error (kind pack) for the first data file that
// does not load.
Result<std::unique_ptr<Engine>> make_engine(std::shared_ptr<const pack::CompiledPack> pack,
                                            const EngineOptions& options);

}  // namespace evenhand::rewrite
