// `evenhand associations`: measures how strongly each target word co-occurs with each
// group's words in a corpus and, with --after, in its augmented output; writes JSON
// (schema evenhand.associations/2) that `report --associations` shows.
#include <cmath>

#include "cli/cli.h"
#include "cli/command_options.h"
#include "cli/common.h"
#include "cli/corpus_args.h"
#include "cli/pack_load.h"
#include "cli/review_args.h"
#include "io/source.h"
#include "review/associations.h"
#include "review/sources.h"

namespace evenhand::cli {

void add_associations_options(po::options_description& opts, AssociationsArgs& a) {
  review::AssociationOptions& ao = a.options;
  // clang-format off
  opts.add_options()
    ("help,h", "show this help")
    ("pack", po::value(&a.pack_name)->value_name("PACK"), "rule pack whose groups are measured (built-in name or directory)")
    ("in", po::value(&a.before)->value_name("PATH")->composing(), "the corpus before augmentation; repeatable")
    ("after", po::value(&a.after)->value_name("PATH")->composing(), "the augmented corpus; repeatable (optional)");
  // The fields a run reads unless told otherwise.
  add_defaulted(opts, "field", po::value(&a.fields)->value_name("POINTER")->composing(), pipeline::RunOptions().fields,
                "JSON Pointer of a field to read (with '*'); repeatable");
  add_defaulted(opts, "format", po::value(&a.format)->value_name("jsonl|text"), a.format, "jsonl or text");
  opts.add_options()
    ("paragraphs", po::bool_switch(&a.paragraphs), "text records are blank-line separated paragraphs")
    ("targets", po::value(&a.targets_path)->value_name("PATH"), "target word list (default: the pack's targets.data)");
  add_defaulted(opts, "window", whole_number("--window", &ao.window, 1, 1000), ao.window,
                "context: words on either side of a group word, 1 to 1000");
  add_defaulted(opts, "prior", real_number("--prior", &ao.prior, {0, HUGE_VAL, true}), ao.prior,
                "alpha_0, total weight of the Dirichlet prior, above 0");
  add_defaulted(opts, "min-cooccurrences", whole_number("--min-cooccurrences", &ao.min_cooccurrences, 0, UINT64_MAX), ao.min_cooccurrences,
                "fewer co-occurrences of a target with two groups than this: 'too few' instead of a p-value, 0 to 2^64-1");
  opts.add_options()
    ("out", po::value(&a.out)->value_name("PATH"), "write the JSON here ('-' is stdout)");
  // clang-format on
  add_protect_option(opts, a.protect);
}

int associations_command(const std::vector<std::string>& args) {
  po::options_description opts("Options");
  AssociationsArgs a;
  add_associations_options(opts, a);
  const std::string &pack_name = a.pack_name, &targets_path = a.targets_path, &out = a.out;
  const std::vector<std::string>&before = a.before, &after = a.after, &fields = a.fields,
        &protect = a.protect;
  const review::AssociationOptions& ao = a.options;
  po::variables_map vm;
  int rc = parse_args("associations", kAssociationsSynopsis, opts, args, vm);
  if (rc >= 0) return rc;
  if (pack_name.empty() || before.empty() || out.empty()) {
    print_error("associations: give --pack, --in and --out");
    return kUsage;
  }
  std::vector<io::NamedPath> ins;
  for (const auto& p : before) ins.push_back({p, "--in"});
  for (const auto& p : after) ins.push_back({p, "--after"});
  ins.push_back({targets_path, "--targets"});
  add_pack_input(ins, pack_name);
  rc = check_outputs("associations", ins, {{out, "--out"}});
  if (rc >= 0) return rc;
  review::CorpusLayout layout;
  rc = corpus_layout("associations", nullptr, a.format, a.paragraphs, "", layout);
  if (rc >= 0) return rc;
  std::vector<Error> problems;
  auto pk = load_full_pack(pack_name, problems);
  if (!pk.ok()) return report_pack_problems(problems, pk.error());
  std::shared_ptr<const pack::CompiledPack> pack = pk->pack;
  // The engine finds the group words (its mentions), with the run's protected spans.
  rewrite::EngineOptions eo;
  eo.protect_patterns = protect;
  auto made = rewrite::make_engine(pack, std::move(pk->engine_data), eo);
  if (!made.ok()) return report(made.error());
  std::shared_ptr<const rewrite::Engine> engine = std::move(*made);

  std::optional<review::TargetList> targets = std::move(pk->targets);
  if (targets_path.empty()) {
    if (!targets) {
      print_error("associations: pack '" + pack->name() + "' ships no " + kTargetsFile +
                  "; give --targets FILE");
      return kUsage;
    }
  } else {
    std::string list_text;
    auto src = io::Source::open(targets_path);
    if (!src.ok()) return report(src.error());
    char buf[65536];
    for (;;) {
      auto n = (*src)->read(buf, sizeof buf);
      if (!n.ok()) return report(n.error());
      if (*n == 0) break;
      list_text.append(buf, *n);
    }
    auto parsed = review::parse_targets(list_text, targets_path, pack.get());
    if (!parsed.ok()) return report(parsed.error());
    targets = std::move(*parsed);
  }

  review::AssociationReport rep;
  rep.pack_name = pack->name();
  rep.pack_version = pack->version();
  rep.pack_sha256 = pack->sha256();
  rep.axis = pack->axis();
  rep.groups = pack->groups();
  rep.targets = *targets;
  rep.options = ao;
  rep.protect = protect;
  for (int which = 0; which < 2; ++which) {
    const auto& paths = which == 0 ? before : after;
    if (paths.empty()) continue;
    review::CooccurrenceCounter counter(engine, rep.targets, ao.window);
    std::vector<std::pair<std::string, std::string>> inputs;
    for (const auto& p : paths) {
      auto sha = review::for_each_fields(
          p, layout, fields, [&](std::span<const std::string_view> f) { counter.add_record(f); });
      if (!sha.ok()) return report(sha.error());
      inputs.emplace_back(p, *sha);
    }
    auto ca = review::compute_associations(counter.counts(), ao);
    ca.label = which == 0 ? "before" : "after";
    ca.inputs = std::move(inputs);
    rep.corpora.push_back(std::move(ca));
  }
  Status s = write_file_atomic(out, review::render_associations(rep));
  if (!s.ok()) return report(s.error());
  return kOk;
}

}  // namespace evenhand::cli
