// Fuzz target: the association audit's target list (review/associations.h parse_targets,
// rules/en-gender/targets.data). Input: a list text. Checked: an error names the source and,
// for a bad line, the line; a parsed list has one variant list per label, each led by a word, and
// no word twice.
#include <set>
#include <string>

#include "fuzz_support.h"
#include "review/associations.h"

using namespace evenhand;

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  std::string_view text(reinterpret_cast<const char*>(data), size);
  auto list = review::parse_targets(text, "targets.data");
  if (!list.ok()) {
    // A bad line names its line; a list without any word is about the whole text.
    FUZZ_CHECK(list.error().file == "targets.data" &&
                   (list.error().line.has_value() || list.error().reason == "no target words"),
               "a target list error without source and line");
    return 0;
  }
  const review::TargetList& t = list.value();
  FUZZ_CHECK(t.labels.size() == t.variants.size(), "labels and variant lists differ in number");
  std::set<std::string> seen;
  for (const auto& vs : t.variants) {
    FUZZ_CHECK(!vs.empty(), "a target without its own form");
    for (const std::string& v : vs) {
      FUZZ_CHECK(!v.empty(), "an empty target word");
      FUZZ_CHECK(seen.insert(v).second, "a word listed twice was accepted: " + v);
    }
  }
  return 0;
}
