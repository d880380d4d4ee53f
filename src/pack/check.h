// The text of `evenhand check PACK`: diagnostics as "FILE:LINE: message" lines, and a short
// summary of a pack that loaded cleanly. Pure formatting; the CLI does the printing.
#pragma once

#include <string>
#include <vector>

#include "pack/pack.h"

namespace evenhand::pack {

// "words.txt:12: message" ("pack.txt: message" for a problem about a whole file).
std::string format_diagnostic(const Diagnostic& d);

// One format_diagnostic line per diagnostic, each ending in '\n'; "" when there is none.
std::string format_diagnostics(const std::vector<Diagnostic>& diagnostics);

// One line describing a loaded pack, e.g. "en-gender 1.0.0 (en, axis gender: female, male):
// 250 sets, 0 name pairs, 12 protected phrases, 30 guards, sha256 ab12...".
std::string describe_pack(const CompiledPack& pack);

}  // namespace evenhand::pack
