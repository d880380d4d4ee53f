// Options shared by the commands that read a corpus back (review, report, associations):
// the corpus format and framing, taken from a run's manifest unless given on the line.
#pragma once

#include <string>

#include "review/manifest_view.h"
#include "review/sources.h"

namespace evenhand::cli {

// Fills `layout` from `format`/`paragraphs` (when given) or the manifest `m` (may be null),
// and the record size limit from the manifest (else the run's default).
// Returns -1 to go on, else the exit code after printing why.
int corpus_layout(const std::string& command, const review::ManifestView* m,
                  const std::string& format, bool paragraphs, const std::string& root,
                  review::CorpusLayout& layout);

}  // namespace evenhand::cli
