// `evenhand review`: shows the records an audit log talks about, with their edits drawn
// against the corpus text, filtered and optionally sampled. Colour only on a terminal.
// Streams: two passes over the log, memory bounded by a batch or the sample.
#include <sys/ioctl.h>
#include <unistd.h>

#include <cstdlib>
#include <iostream>

#include "cli/cli.h"
#include "cli/command_options.h"
#include "cli/common.h"
#include "cli/review_args.h"
#include "review/audit_log.h"
#include "review/diff.h"
#include "review/manifest_view.h"
#include "review/select.h"
#include "review/sources.h"
#include "rewrite/engine.h"

namespace evenhand::cli {

namespace {

// The most words of context each side of an edit (--context).
constexpr size_t kMaxContext = 200;

size_t terminal_width(bool tty) {
  if (const char* c = std::getenv("COLUMNS")) {
    long v = std::strtol(c, nullptr, 10);
    if (v >= 20) return static_cast<size_t>(v);
  }
  winsize ws{};
  if (tty && ioctl(STDOUT_FILENO, TIOCGWINSZ, &ws) == 0 && ws.ws_col >= 20) return ws.ws_col;
  return 100;
}

}  // namespace

int corpus_layout(const std::string& command, const review::ManifestView* m,
                  const std::string& format, bool paragraphs, const std::string& root,
                  review::CorpusLayout& layout) {
  std::string f = !format.empty() ? format : (m && !m->format.empty() ? m->format : "jsonl");
  if (f != "jsonl" && f != "text") {
    print_error(command + ": --format must be jsonl or text");
    return kUsage;
  }
  layout.format = f == "text" ? review::CorpusFormat::text : review::CorpusFormat::jsonl;
  bool para = paragraphs || (m && m->paragraphs && format.empty());
  if (para && layout.format != review::CorpusFormat::text) {
    print_error(command + ": --paragraphs needs --format text");
    return kUsage;
  }
  layout.framing = para ? corpus::Framing::paragraphs : corpus::Framing::lines;
  layout.root = root;
  // The run accepted records up to its own limit; the records its log names are read back
  // under that limit.
  if (m && m->max_record_bytes > 0) layout.max_record_bytes = m->max_record_bytes;
  return -1;
}

void add_review_options(po::options_description& opts, po::positional_options_description& pos,
                        ReviewArgs& a) {
  review::Filter& filter = a.filter;
  // clang-format off
  opts.add_options()
    ("help,h", "show this help")
    ("edits", po::value(&a.edits)->value_name("PATH"), "the audit log to review (run --edits); also positional")
    ("manifest", po::value(&a.manifest)->value_name("PATH"), "the run's manifest: corpus format and framing from it")
    ("format", po::value(&a.format)->value_name("jsonl|text"), "corpus format jsonl|text (default: the manifest's, else jsonl)")
    ("paragraphs", po::bool_switch(&a.paragraphs), "text records are blank-line separated paragraphs")
    ("root", po::value(&a.root)->value_name("DIR"), "read relative input paths of the log from this directory")
    ("stdin-corpus", po::value(&a.stdin_corpus)->value_name("PATH"), "a copy of what a run read from standard input (logged as <stdin>)")
    ("rule", po::value(&filter.rules)->value_name("FILE:LINE")->composing(), "only records with an edit by this pack entry (words.txt:67); repeatable")
    ("why", po::value(&filter.whys)->value_name("REASON")->composing(), "only records with an edit of this reason: lexicon|name|context|agreement; repeatable")
    ("field", po::value(&filter.fields)->value_name("POINTER")->composing(), "only records with an edit in this field (JSON Pointer as logged); repeatable")
    ("flag", po::value(&filter.flags)->value_name("CODE")->composing(), "only flagged records with this code ('any': all flagged); repeatable")
    ("guard", po::value(&filter.guards)->value_name("REASON")->composing(), "only guarded records with this reason ('any': all guarded); repeatable");
  add_defaulted(opts, "sample", whole_number("--sample", &a.sample, 0, kMaxSample), a.sample,
                "show N records, 0 to " + std::to_string(kMaxSample) + ", sampled evenly across pack entries", "all");
  add_defaulted(opts, "seed", whole_number("--seed", &a.seed, 0, UINT64_MAX), a.seed, "seed of the sample, 0 to 2^64-1");
  add_defaulted(opts, "layout", po::value(&a.layout)->value_name("inline|columns"), a.layout, "inline or columns: original | counterfactual");
  add_defaulted(opts, "color", po::value(&a.color)->value_name("auto|always|never"), a.color,
                "auto (on a terminal unless NO_COLOR is set), always, never");
  opts.add_options()
    ("width", whole_number("--width", &a.width, 20, 1000), "line width, 20 to 1000 (default: $COLUMNS, else the terminal's, else 100)")
    ("whole", po::bool_switch(&a.whole), "show every edited field whole, not windows around its edits")
    ("no-rules", po::bool_switch(&a.no_rules), "do not list the edits and their rules under each record");
  add_defaulted(opts, "context", whole_number("--context", &a.context, 0, kMaxContext), a.context,
                "words shown each side of an edit, 0 to " + std::to_string(kMaxContext) +
                    " (fewer at a clause end or line break)");
  // clang-format on
  pos.add("edits", 1);
}

int review_command(const std::vector<std::string>& args) {
  po::options_description opts("Options");
  po::positional_options_description pos;
  ReviewArgs a;
  add_review_options(opts, pos, a);
  const std::string &edits = a.edits, &manifest = a.manifest, &format = a.format, &root = a.root,
                    &layout_name = a.layout, &color = a.color;
  const bool &paragraphs = a.paragraphs, &no_rules = a.no_rules, &whole = a.whole;
  const size_t &sample = a.sample, &width = a.width, &context = a.context;
  const review::Filter& filter = a.filter;
  po::variables_map vm;
  int rc = parse_args("review", kReviewSynopsis, opts, args, vm, &pos);
  if (rc >= 0) return rc;
  if (edits.empty()) {
    print_error("review: give the audit log (--edits PATH)");
    return kUsage;
  }
  for (const std::string& why : filter.whys) {
    bool known = false;
    for (auto r : {rewrite::EditReason::lexicon, rewrite::EditReason::name,
                   rewrite::EditReason::context, rewrite::EditReason::agreement})
      known = known || why == rewrite::edit_reason_name(r);
    if (!known) {
      print_error("review: --why must be lexicon, name, context or agreement, not '" + why + "'");
      return kUsage;
    }
  }
  if (layout_name != "inline" && layout_name != "columns") {
    print_error("review: --layout must be inline or columns");
    return kUsage;
  }
  if (whole && !vm["context"].defaulted()) {
    print_error("review: --context sets the windows that --whole replaces; give one of them");
    return kUsage;
  }
  if (color != "auto" && color != "always" && color != "never") {
    print_error("review: --color must be auto, always or never");
    return kUsage;
  }
  std::optional<review::ManifestView> mv;
  if (!manifest.empty()) {
    auto m = review::read_manifest(manifest);
    if (!m.ok()) return report(m.error());
    mv = std::move(*m);
  }
  review::CorpusLayout layout;
  rc = corpus_layout("review", mv ? &*mv : nullptr, format, paragraphs, root, layout);
  if (rc >= 0) return rc;
  layout.stdin_corpus = a.stdin_corpus;

  // Pass 1 checks the whole log before anything is printed, counts it and, with --sample,
  // counts the pack entries the sample's strata are drawn from.
  uint64_t total = 0, matched = 0;
  review::StratifiedSampler sampler(sample, a.seed);
  Status s = review::for_each_review_record(edits, [&](review::ReviewRecord& r) {
    ++total;
    if (review::passes(r, filter)) {
      ++matched;
      sampler.count(r);
    }
    return ok_status();
  });
  if (!s.ok()) return report(s.error());

  bool tty = isatty(STDOUT_FILENO);
  const char* no_color = std::getenv("NO_COLOR");
  review::TerminalStyle style;
  style.color = color == "always" || (color == "auto" && tty && !(no_color && *no_color));
  style.columns = layout_name == "columns";
  style.width = width ? width : terminal_width(tty);
  style.show_rules = !no_rules;
  style.whole = whole;
  style.context_words = context;

  // Pass 2 prints the records (all matching ones a batch at a time, or the sample) with
  // their corpus text; memory is one batch or the sampler's candidates.
  uint64_t shown = 0;
  auto print = [&](std::vector<review::ReviewRecord>& batch) -> Status {
    std::string out;
    for (const auto& r : batch) {
      out += review::render_terminal(r, style);
      out += '\n';
    }
    shown += batch.size();
    std::cout << out;
    if (!std::cout) return make_error(ErrorKind::output, "", "cannot write standard output");
    return ok_status();
  };
  auto wanted = [&](const review::ReviewRecord& r) { return review::passes(r, filter); };
  if (sample == 0) {
    s = review::for_each_attached(edits, layout, review::kAttachBatch, wanted, print);
  } else {
    s = review::for_each_review_record(edits, [&](review::ReviewRecord& r) {
      if (wanted(r)) sampler.offer(r);
      return ok_status();
    });
    std::vector<review::ReviewRecord> chosen = sampler.take();
    std::vector<review::ReviewRecord*> ptrs;
    for (auto& r : chosen) ptrs.push_back(&r);
    if (s.ok()) s = review::attach_sources(ptrs, layout);
    if (s.ok()) s = print(chosen);
  }
  if (!s.ok()) {
    if (s.error().kind == ErrorKind::output) return kOutput;
    return report(s.error());
  }
  std::cout << "shown " << shown << " of " << matched << " matching records (" << total
            << " in the log)\n"
            << std::flush;
  return std::cout ? kOk : kOutput;
}

}  // namespace evenhand::cli
