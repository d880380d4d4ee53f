// Helpers shared by the pack tests: small in-memory packs, diagnostic lookup, and the path of
// the source tree (for the shipped rules/ folder).
#pragma once

#include <catch2/catch.hpp>

#include <cstdlib>
#include <filesystem>
#include <map>
#include <memory>
#include <set>
#include <string>
#include <vector>

#include "pack/check.h"
#include "pack/pack.h"

namespace evenhand::pack::testing {

// A valid header for a two-group test pack; tests append sections to it.
inline const char* const kHeader =
    "pack test\n"
    "version 1.0.0\n"
    "language en\n"
    "axis gender\n"
    "groups female male\n";

struct Loaded {
  std::shared_ptr<const CompiledPack> pack;  // null when loading failed
  std::vector<Diagnostic> diags;
  std::string error;  // Error::message() when loading failed
  std::string error_reason;
  std::string error_file;
};

inline Loaded load(const std::map<std::string, std::string>& files) {
  Loaded out;
  auto r = load_pack_files("testpack", files, out.diags);
  if (r.ok()) {
    out.pack = r.value();
  } else {
    out.error = r.error().message();
    out.error_reason = r.error().reason;
    out.error_file = r.error().file;
  }
  return out;
}

// Loads pack.txt = kHeader and words.txt = `words`.
inline Loaded load_words(const std::string& words) {
  return load({{"pack.txt", kHeader}, {"words.txt", words}});
}

// The diagnostics with this code, formatted "FILE:LINE: message".
inline std::vector<std::string> with_code(const Loaded& l, const std::string& code) {
  std::vector<std::string> out;
  for (const auto& d : l.diags)
    if (d.code == code) out.push_back(format_diagnostic(d));
  return out;
}

// True when a diagnostic with `code` is at `where` ("words.txt:3" or "pack.txt").
inline bool has(const Loaded& l, const std::string& where, const std::string& code) {
  for (const auto& d : l.diags)
    if (d.code == code && d.where.str() == where) return true;
  return false;
}

inline std::string all(const Loaded& l) {
  return format_diagnostics(l.diags);
}

// The source tree: $EVENHAND_SOURCE_DIR (set by ctest), else derived from this file's path.
inline std::filesystem::path source_dir() {
  if (const char* env = std::getenv("EVENHAND_SOURCE_DIR"); env && *env) return env;
  return std::filesystem::path(__FILE__).parent_path().parent_path().parent_path();
}

// Checks every set mapping of `p` leads back to its source form (A -> B in group h, and B's
// entries in group g, chosen by the set's tag, give A again). Returns the mappings checked.
// Shared by the shipped-pack tests of every language.
inline size_t check_mappings_go_back(const CompiledPack& p) {
  size_t checked = 0;
  for (const WordSet& set : p.sets()) {
    for (uint16_t g = 0; g < set.forms.size(); ++g) {
      for (uint16_t h = 0; h < set.forms.size(); ++h) {
        if (g == h || set.forms[g].empty() || set.forms[h].empty()) continue;
        INFO(set.where.str() << ": " << set.forms[g] << " -> " << set.forms[h]);
        // B = the counterpart; its entries in group h must lead back to A through the set the
        // tag selects: either B has one set (this one) or each of its sets has its own tag.
        std::vector<std::string> words;
        for (const auto& t : form_tokens(set.forms[h])) words.push_back(fold_word(t));
        const auto* list = p.lookup(words.front());
        REQUIRE(list != nullptr);
        std::vector<const LexEntry*> mine;
        for (const auto& e : *list)
          if (e.words == words && e.group == h && !e.is_name) mine.push_back(&e);
        REQUIRE_FALSE(mine.empty());
        std::set<Tag> tags;
        for (const auto* e : mine) tags.insert(e->tag);
        if (mine.size() > 1) {
          CHECK(tags.size() == mine.size());
          CHECK(tags.count(Tag::none) == 0);
        }
        const LexEntry* back = nullptr;
        for (const auto* e : mine)
          if (mine.size() == 1 || e->tag == set.tag) back = e;
        REQUIRE(back != nullptr);
        CHECK(fold_word(p.sets()[back->set].forms[g]) == fold_word(set.forms[g]));
        ++checked;
      }
    }
  }
  return checked;
}

}  // namespace evenhand::pack::testing
