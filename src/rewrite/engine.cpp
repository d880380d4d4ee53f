#include "rewrite/engine.h"

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
