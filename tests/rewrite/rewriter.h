// Test helper: runs the rewrite engine on one string and applies its edits, so tests can
// compare a sentence with its counterfactual. Shared by the engine and table tests.
#pragma once

#include <catch2/catch.hpp>

#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "pack/pack.h"
#include "rewrite/engine.h"

namespace evenhand::testing {

inline std::shared_ptr<const pack::CompiledPack> shipped_pack(const std::string& name) {
  std::vector<pack::Diagnostic> diags;
  auto p = pack::load_pack(name, diags);
  REQUIRE(p.ok());
  return *p;
}

inline std::string apply_edits(std::string_view text, const rewrite::RecordResult& r) {
  std::string out;
  size_t pos = 0;
  for (const auto& e : r.edits) {
    REQUIRE(e.begin >= pos);  // sorted, not overlapping
    out.append(text.substr(pos, e.begin - pos));
    out.append(e.replacement);
    pos = e.end;
  }
  out.append(text.substr(pos));
  return out;
}

struct Rewriter {
  std::unique_ptr<rewrite::Engine> engine;
  std::unique_ptr<rewrite::Worker> worker;
  rewrite::RecordResult result;
  explicit Rewriter(std::shared_ptr<const pack::CompiledPack> p, rewrite::EngineOptions o = {}) {
    auto e = rewrite::make_engine(std::move(p), o);
    REQUIRE(e.ok());
    engine = std::move(*e);
    worker = engine->make_worker();
  }
  std::string operator()(std::string_view text) {
    std::string_view f[] = {text};
    worker->rewrite(f, result);
    return apply_edits(text, result);
  }
  // Whether the last rewrite flagged the record with `code`.
  bool flagged(std::string_view code) const {
    for (const auto& f : result.flags)
      if (f.code == code) return true;
    return false;
  }
};

}  // namespace evenhand::testing
