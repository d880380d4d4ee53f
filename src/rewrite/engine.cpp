#include "rewrite/engine.h"

#include <algorithm>
#include <string>

namespace evenhand::rewrite {

const char* edit_reason_name(EditReason r) {
  switch (r) {
    case EditReason::lexicon:
      return "lexicon";
    case EditReason::name:
      return "name";
    case EditReason::context:
      return "context";
    case EditReason::agreement:
      return "agreement";
  }
  return "unknown";
}

bool RecordResult::has_mentions() const {
  for (uint32_t n : before)
    if (n > 0) return true;
  return false;
}

void RecordResult::clear() {
  edits.clear();
  for (auto& n : before) n = 0;
  for (auto& n : after) n = 0;
  guard = nullptr;
  protected_spans = 0;
  ambiguous = 0;
  entry_hits.clear();
  flags.clear();
  mentions.clear();
}

void keep_edits_apart(RecordResult& out) {
  // The engine's rules are written to keep edits apart; this is the net under them.
  auto before = [](const Edit& a, const Edit& b) {
    return a.field != b.field ? a.field < b.field : a.begin < b.begin;
  };
  if (!std::is_sorted(out.edits.begin(), out.edits.end(), before))
    std::stable_sort(out.edits.begin(), out.edits.end(), before);
  size_t w = 0;
  for (size_t r = 0; r < out.edits.size(); ++r) {
    Edit& e = out.edits[r];
    if (w > 0 && out.edits[w - 1].field == e.field && e.begin < out.edits[w - 1].end) {
      out.flags.push_back({"overlapping_edits", "'" + e.replacement + "' at byte " +
                                                    std::to_string(e.begin) +
                                                    " overlaps an earlier edit; left out"});
      // The mention stays as written: it counts in its own group after, as before.
      if (e.from_group < out.after.size() && e.to_group < out.after.size() &&
          out.after[e.to_group] > 0) {
        --out.after[e.to_group];
        ++out.after[e.from_group];
      }
      if (e.hit != Edit::kNone) {
        auto it = std::find(out.entry_hits.begin(), out.entry_hits.end(), e.hit);
        if (it != out.entry_hits.end()) out.entry_hits.erase(it);
      }
      continue;
    }
    if (w != r) out.edits[w] = std::move(e);
    ++w;
  }
  out.edits.resize(w);
}

namespace {

class IdentityWorker final : public Worker {
 public:
  void rewrite(std::span<const std::string_view>, RecordResult& out) override { out.clear(); }
};

class IdentityEngine final : public Engine {
 public:
  const pack::CompiledPack* pack() const override { return nullptr; }
  std::unique_ptr<Worker> make_worker() const override {
    return std::make_unique<IdentityWorker>();
  }
};

}  // namespace

std::unique_ptr<Engine> make_identity_engine() {
  return std::make_unique<IdentityEngine>();
}

}  // namespace evenhand::rewrite
