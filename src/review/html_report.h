// The HTML report of a run: one self-contained page (inline CSS and SVG drawn here; no
// scripts, fonts or other requests, and a Content-Security-Policy that forbids them) built
// from a manifest, optionally an audit log sample and an association audit. Rendering is a
// pure function of its input, so the same run gives the same bytes.
#pragma once

#include <cstddef>
#include <string>
#include <utility>
#include <vector>

#include "review/associations.h"
#include "review/audit_log.h"
#include "review/manifest_view.h"

namespace evenhand::review {

struct ReportFile {
  std::string role, path, sha256;
  uint64_t bytes = 0;
};

struct ReportInput {
  const ManifestView* manifest = nullptr;   // required
  std::vector<const ReviewRecord*> sample;  // diffs to show (sources attached)
  size_t sample_from = 0;                   // records of the log with edits
  // The first kReportListed guarded and flagged records of the log, and how many there are.
  std::vector<const ReviewRecord*> guarded;
  std::vector<const ReviewRecord*> flagged;
  size_t guarded_total = 0, flagged_total = 0;
  const AssociationReport* associations = nullptr;
  std::vector<ReportFile> read;       // files the report itself read
  std::vector<std::string> cautions;  // shown verbatim (plain text, `code` marked)
};

// Guarded and flagged records listed on the page, each list in log order; the rest are counted.
inline constexpr size_t kReportListed = 50;

// "Look here first" lists a pack entry with at least kLookEntryHits edits that are at least
// kLookEntryShare of all edits, in one item the first kLookWordNames name pairs marked ~word
// that were swapped (most swapped first), a balance share outside the tolerance, and the guarded
// and flagged record counts when not zero.
inline constexpr uint64_t kLookEntryHits = 20;
inline constexpr double kLookEntryShare = 0.10;
inline constexpr size_t kLookWordNames = 5;

// The cautions of the README ("## Cautions"), as plain-text paragraphs.
const std::vector<std::string>& report_cautions();

// The page. Element ids that tests and readers rely on: chart-groups-mentions,
// chart-groups-records, chart-entries, chart-flagged, chart-guarded, chart-associations
// (when associations are given), chart-balance, table-balance, balance-verdict and
// balance-plan (balance runs only), section ids balance (balance runs only), look-first
// (its items are li elements with data-kind balance, entry, word-name, guarded or flagged),
// summary, groups, entries, agreement, guards, associations, sample, files, cautions.
std::string render_report(const ReportInput& in);

}  // namespace evenhand::review
