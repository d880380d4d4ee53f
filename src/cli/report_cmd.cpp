// `evenhand report`: writes one self-contained HTML page about a run from its manifest and,
// optionally, its audit log (a sample of diffs, guarded and flagged records; read in two
// streaming passes, the second checking every edit against the corpus as review does) and
// an association audit. The page appears under its final name only
// when complete.
#include <fstream>
#include <vector>

#include "base/sha256.h"
#include "cli/cli.h"
#include "cli/command_options.h"
#include "cli/common.h"
#include "cli/review_args.h"
#include "review/associations.h"
#include "review/audit_log.h"
#include "review/html_report.h"
#include "review/select.h"

namespace evenhand::cli {

namespace {

// SHA-256 and size of a file the report read, for its "Inputs and outputs" table; the file
// streams through the hash.
Result<review::ReportFile> describe(const std::string& role, const std::string& path) {
  std::ifstream f(path, std::ios::binary);
  if (!f) return make_error(ErrorKind::input, path, "cannot read");
  Sha256 hash;
  uint64_t size = 0;
  std::vector<char> buf(1 << 16);
  while (f) {
    f.read(buf.data(), static_cast<std::streamsize>(buf.size()));
    hash.update(buf.data(), static_cast<size_t>(f.gcount()));
    size += static_cast<uint64_t>(f.gcount());
  }
  if (f.bad()) return make_error(ErrorKind::input, path, "cannot read");
  return review::ReportFile{role, path, hash.finish_hex(), size};
}

}  // namespace

void add_report_options(po::options_description& opts, ReportArgs& a) {
  // clang-format off
  opts.add_options()
    ("help,h", "show this help")
    ("manifest", po::value(&a.manifest)->value_name("PATH"), "the run's manifest (required)")
    ("edits", po::value(&a.edits)->value_name("PATH"), "the run's audit log: adds a sample of diffs, guarded and flagged records")
    ("associations", po::value(&a.associations)->value_name("PATH"), "an 'evenhand associations' result to show")
    ("out", po::value(&a.out)->value_name("PATH"), "write the HTML page here (required)");
  add_defaulted(opts, "sample", whole_number("--sample", &a.sample, 0, kMaxSample), a.sample,
                "rewritten records to show, 0 to " + std::to_string(kMaxSample) + ", spread across pack entries");
  add_defaulted(opts, "seed", whole_number("--seed", &a.seed, 0, UINT64_MAX), a.seed, "seed of the sample, 0 to 2^64-1");
  opts.add_options()
    ("format", po::value(&a.format)->value_name("jsonl|text"), "corpus format jsonl|text (default: the manifest's)")
    ("paragraphs", po::bool_switch(&a.paragraphs), "text records are blank-line separated paragraphs")
    ("root", po::value(&a.root)->value_name("DIR"), "read relative input paths of the audit log from this directory")
    ("stdin-corpus", po::value(&a.stdin_corpus)->value_name("PATH"), "a copy of what the run read from standard input (logged as <stdin>)");
  // clang-format on
}

int report_command(const std::vector<std::string>& args) {
  po::options_description opts("Options");
  ReportArgs ra;
  add_report_options(opts, ra);
  const std::string &manifest = ra.manifest, &edits = ra.edits, &assoc = ra.associations,
                    &out = ra.out;
  po::variables_map vm;
  int rc = parse_args("report", kReportSynopsis, opts, args, vm);
  if (rc >= 0) return rc;
  if (manifest.empty() || out.empty()) {
    print_error("report: give --manifest and --out");
    return kUsage;
  }
  std::vector<io::NamedPath> ins = {
      {manifest, "--manifest"}, {edits, "--edits"}, {assoc, "--associations"}};
  rc = check_outputs("report", ins, {{out, "--out"}});
  if (rc >= 0) return rc;
  auto m = review::read_manifest(manifest);
  if (!m.ok()) return report(m.error());
  review::CorpusLayout layout;
  rc = corpus_layout("report", &*m, ra.format, ra.paragraphs, ra.root, layout);
  if (rc >= 0) return rc;
  layout.stdin_corpus = ra.stdin_corpus;
  // The corpus files the audit log points at are read too.
  for (const auto& f : m->inputs)
    if (std::string p = review::resolve_input(f.path, layout); !p.empty())
      ins.push_back({p, "the manifest's input"});
  for (const auto& f : m->outputs)
    if (std::string p = review::resolve_input(f.path, layout); !p.empty())
      ins.push_back({p, "the manifest's output"});
  rc = check_outputs("report", ins, {{out, "--out"}});
  if (rc >= 0) return rc;

  review::ReportInput in;
  in.manifest = &*m;
  in.cautions = review::report_cautions();
  auto add_read = [&](const std::string& role, const std::string& path) -> Status {
    auto d = describe(role, path);
    if (!d.ok()) return std::move(d).error();
    in.read.push_back(*d);
    return ok_status();
  };
  Status s = add_read("report input: manifest", manifest);
  if (!s.ok()) return report(s.error());

  // Two passes over the audit log: the first counts and keeps the first guarded and flagged
  // records, the second keeps the sample's candidates; memory does not grow with the log.
  std::vector<review::ReviewRecord> guarded, flagged, chosen;
  if (!edits.empty()) {
    review::StratifiedSampler sampler(ra.sample, ra.seed);
    s = review::for_each_review_record(edits, [&](review::ReviewRecord& r) {
      if (!r.edits.empty()) {
        ++in.sample_from;
        sampler.count(r);
      }
      if (!r.guard.empty() && in.guarded_total++ < review::kReportListed) guarded.push_back(r);
      if (!r.flags.empty() && in.flagged_total++ < review::kReportListed) flagged.push_back(r);
      return ok_status();
    });
    if (!s.ok()) return report(s.error());
    s = add_read("report input: audit log", edits);
    if (!s.ok()) return report(s.error());
    // Every edited record is checked against the corpus, as review does, so a log that
    // does not fit its corpus is refused in the same words; the sample keeps no corpus text
    // (it is read again for the few records chosen).
    auto edited = [](const review::ReviewRecord& r) { return !r.edits.empty(); };
    s = review::for_each_attached(edits, layout, review::kAttachBatch, edited,
                                  [&](std::vector<review::ReviewRecord>& batch) {
                                    for (auto& r : batch) {
                                      std::vector<review::FieldText>().swap(r.fields);
                                      std::string().swap(r.raw);
                                      sampler.offer(r);
                                    }
                                    return ok_status();
                                  });
    if (!s.ok()) return report(s.error());
    chosen = sampler.take();
    std::vector<review::ReviewRecord*> wanted;
    for (auto& r : chosen) wanted.push_back(&r);
    s = review::attach_sources(wanted, layout);
    if (!s.ok()) return report(s.error());
    for (const auto& r : guarded) in.guarded.push_back(&r);
    for (const auto& r : flagged) in.flagged.push_back(&r);
    for (const auto& r : chosen) in.sample.push_back(&r);
  }
  std::optional<review::AssociationReport> ar;
  if (!assoc.empty()) {
    auto a = review::read_associations(assoc);
    if (!a.ok()) return report(a.error());
    ar = std::move(*a);
    if (!m->pack_sha256.empty() && ar->pack_sha256 != m->pack_sha256) {
      return report(make_error(ErrorKind::input, assoc,
                               "measured with another pack than the manifest's (sha256 differs)"));
    }
    in.associations = &*ar;
    s = add_read("report input: associations", assoc);
    if (!s.ok()) return report(s.error());
  }
  s = write_file_atomic(out, review::render_report(in));
  if (!s.ok()) return report(s.error());
  return kOk;
}

}  // namespace evenhand::cli
