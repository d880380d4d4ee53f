// Fuzz target: the rule-pack parser, checks and compiler (pack/builder.h via load_pack_files).
// Input: the pack's files in the container of fuzz_support.h ("%% words.txt" lines; bytes
// before the first go to pack.txt). Checked: a pack compiles exactly when no diagnostic was
// given; every diagnostic names a file of the pack and says something; a compiled pack's
// lexicon is consistent (each key finds entries that start with it, in range of the sets,
// names and groups; every set has one form per group).
#include <string>
#include <vector>

#include "fuzz_support.h"
#include "pack/pack.h"

using namespace evenhand;
using namespace evenhand::pack;

namespace {

void check_lexicon(const CompiledPack& p) {
  const size_t groups = p.groups().size();
  FUZZ_CHECK(groups > 0, "a compiled pack without groups");
  for (const WordSet& s : p.sets()) FUZZ_CHECK(s.forms.size() == groups, "a set's forms != groups");
  for (const NamePair& n : p.names())
    FUZZ_CHECK(n.names.size() == groups, "a name pair's names != groups");
  for (std::string_view key : p.keys()) {
    const std::vector<LexEntry>* entries = p.lookup(key);
    FUZZ_CHECK(entries && !entries->empty(), "a key without entries");
    size_t prev_words = SIZE_MAX;
    for (const LexEntry& e : *entries) {
      FUZZ_CHECK(!e.words.empty() && e.words.front() == key, "an entry not under its first word");
      FUZZ_CHECK(e.words.size() <= p.max_entry_words(), "an entry longer than max_entry_words");
      FUZZ_CHECK(e.words.size() <= prev_words, "entries not longest first");
      prev_words = e.words.size();
      FUZZ_CHECK(e.group < groups, "an entry's group is out of range");
      FUZZ_CHECK(e.set < (e.is_name ? p.names().size() : p.sets().size()),
                 "an entry's set is out of range");
    }
  }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  std::string_view input(reinterpret_cast<const char*>(data), size);
  auto files = fuzz::split_files(input, "pack.txt");
  std::vector<Diagnostic> diags;
  auto pack = load_pack_files("fuzz", files, diags);
  FUZZ_CHECK(pack.ok() == diags.empty(), "compiled with diagnostics, or failed without one");
  for (const Diagnostic& d : diags) {
    FUZZ_CHECK(!d.message.empty() && !d.code.empty(), "a diagnostic without message or code");
    FUZZ_CHECK(d.where.file.empty() || d.where.file == "pack.txt" || files.count(d.where.file),
               "a diagnostic names a file the pack does not have: " + d.where.file);
  }
  if (pack.ok()) check_lexicon(*pack.value());
  return 0;
}
