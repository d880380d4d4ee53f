// `evenhand run`: the main job. Wires options into pipeline::RunOptions, loads the pack,
// runs (twice in balance mode without a plan: tally, plan, apply), writes the manifest and
// prints where everything went.
#include <cmath>
#include <cstdio>
#include <fstream>
#include <iostream>
#include <sstream>

#include "audit/json_writer.h"
#include "audit/manifest.h"
#include "balance/plan.h"
#include "cli/cli.h"
#include "cli/command_options.h"
#include "cli/common.h"
#include "cli/corpus_args.h"
#include "io/sink.h"
#include "pipeline/run.h"

namespace evenhand::cli {

namespace {

std::string json_string(const std::string& s) {
  std::string out;
  audit::JsonWriter(out).value(s);
  return out;
}

std::string json_strings(const std::vector<std::string>& v) {
  std::string out;
  audit::JsonWriter w(out);
  w.begin_array();
  for (const auto& s : v) w.value(s);
  w.end_array();
  return out;
}

std::string json_number(double d) {
  std::string out;
  audit::JsonWriter(out).value(d);
  return out;
}

// The "balance" section of the manifest.
std::string balance_section(const balance::Plan& plan, const std::string& plan_source,
                            double tolerance, const audit::Stats& st) {
  std::string out;
  audit::JsonWriter w(out);
  w.begin_object();
  w.key("plan").value(plan_source);
  w.key("basis").value(balance::basis_name(plan.basis));
  w.key("target").begin_object();
  for (const auto& t : plan.target) w.key(t.group).value(t.weight);
  w.end_object();
  w.key("tolerance").value(tolerance);
  w.key("planned_tolerance").value(plan.tolerance);
  w.key("planned_changed").value(plan.changed);
  w.key("lower_bound").value(plan.lower_bound);
  w.key("minimal").value(plan.minimal);
  w.key("expected_share").begin_object();
  for (const auto& o : plan.outcome) w.key(o.group).value(o.share_after);
  w.end_object();
  w.key("actions").begin_object();
  w.key("kept").value(st.records_kept - st.records_added);
  w.key("flipped").value(st.records_replaced);
  w.key("added").value(st.records_added);
  w.key("dropped").value(st.records_dropped);
  w.end_object();
  w.end_object();
  return out;
}

Result<std::string> read_whole(const std::string& path) {
  std::ifstream f(path, std::ios::binary);
  if (!f) return make_error(ErrorKind::input, path, "cannot open");
  std::stringstream ss;
  ss << f.rdbuf();
  return ss.str();
}

// Plan options from the command line; the plan aims within half the tolerance (see README).
Result<balance::PlanOptions> plan_options(const BalanceArgs& b) {
  balance::PlanOptions po;
  auto t = balance::parse_target(b.target);
  if (!t.ok()) return std::move(t).error();
  po.target = std::move(*t);
  auto basis = balance::parse_basis(b.basis);
  if (!basis) return make_error(ErrorKind::usage, "", "--basis must be mentions or records");
  po.basis = *basis;
  po.tolerance = b.tolerance / 2;
  po.allow_drop = b.allow_drop;
  po.allow_add = !b.no_add;
  po.allow_flip = !b.no_flip;
  return po;
}

void print_plan(const balance::Plan& p) {
  std::fprintf(stderr, "evenhand: plan: %llu records changed (flip %llu, add %llu, drop %llu)%s\n",
               static_cast<unsigned long long>(p.changed), static_cast<unsigned long long>(p.flip),
               static_cast<unsigned long long>(p.add), static_cast<unsigned long long>(p.drop),
               p.minimal ? ", minimal" : "");
  for (const auto& o : p.outcome) {
    std::fprintf(stderr, "  %-10s share %.3f -> %.3f (target %.3f)\n", o.group.c_str(),
                 o.share_before, o.share_after, o.target_share);
  }
}

// The run's manifest; `plan` is the applied plan in balance mode, else null.
std::string run_manifest(const std::vector<std::string>& argv_all, const CorpusArgs& a,
                         const std::string& mode, const std::string& started,
                         const pipeline::RunResult& r, const balance::Plan* plan,
                         const std::string& plan_source, double tolerance) {
  const pipeline::RunOptions& ro = a.ro;
  audit::ManifestData md;
  md.command_line = argv_all;
  md.pack = a.pack.get();
  md.options = {
      {"mode", json_string(mode)},
      {"format", json_string(a.format)},
      {"paragraphs", a.paragraphs ? "true" : "false"},
      {"fields", json_strings(ro.fields)},
      {"seed", std::to_string(ro.seed)},
      {"rate", json_number(ro.rate)},
      {"id_field", json_string(ro.id_pointer)},
      {"on_bad_record", json_string(a.on_bad)},
      {"max_record_bytes", std::to_string(ro.max_record_bytes)},
      {"provenance", ro.provenance ? "true" : "false"},
      {"toward", a.toward.empty() ? "null" : json_string(a.toward)},
      {"themselves", a.themselves ? "true" : "false"},
      {"on_flagged", json_string(a.on_flagged)},
  };
  md.stats = &r.stats;
  md.inputs = r.inputs;
  md.outputs = r.outputs;
  md.first_rejections = r.first_rejections;
  md.seconds = r.seconds;
  md.threads = r.threads;
  md.started_at = started;
  if (plan && a.pack) {
    md.planned_basis = balance::basis_name(plan->basis);
    md.planned.assign(a.pack->groups().size(), std::nan(""));
    for (const auto& o : plan->outcome) {
      if (auto g = a.pack->group_index(o.group)) md.planned[*g] = o.after;
    }
    md.balance_json = balance_section(*plan, plan_source, tolerance, r.stats);
  }
  return audit::render_manifest(md);
}

}  // namespace

void add_balance_options(po::options_description& opts, BalanceArgs& b) {
  // clang-format off
  opts.add_options()
    ("target", po::value(&b.target)->value_name("SPEC"), "balance: the mix to reach, e.g. female=1,male=1");
  add_defaulted(opts, "basis", po::value(&b.basis)->value_name("mentions|records"), b.basis, "balance: count mentions or records");
  add_defaulted(opts, "tolerance", real_number("--tolerance", &b.tolerance, {0, 1, true, true}), b.tolerance,
                "balance: allowed distance of each share from the target, above 0 and below 1");
  opts.add_options()
    ("allow-drop", po::bool_switch(&b.allow_drop), "balance: the plan may leave records out")
    ("no-add", po::bool_switch(&b.no_add), "balance: the plan may not add counterfactual copies")
    ("no-flip", po::bool_switch(&b.no_flip), "balance: the plan may not replace records by their counterfactual");
  // clang-format on
}

void add_run_options(po::options_description& opts, RunArgs& a) {
  pipeline::RunOptions& ro = a.corpus.ro;
  io::SinkOptions& so = ro.output_options;
  const io::IntRange zl = io::zstd_levels(), zw = io::zstd_worker_counts(), gl = io::kGzipLevels;
  auto range = [](io::IntRange r) { return std::to_string(r.lo) + " to " + std::to_string(r.hi); };
  add_corpus_options(opts, a.corpus, CorpusUse::rewrite);
  // clang-format off
  opts.add_options()
    ("out", po::value(&ro.output)->value_name("PATH"), "output file ('-' is stdout); .zst/.gz names are compressed")
    ("manifest", po::value(&a.manifest_path)->value_name("PATH"), "write the run manifest (JSON) here")
    ("edits", po::value(&ro.edits_path)->value_name("PATH"), "write the audit log (JSONL, one line per rewritten record) here");
  add_defaulted(opts, "mode", po::value(&a.mode)->value_name("MODE"), a.mode,
                "augment (add a counterfactual copy after each record with mentions), substitute (replace with probability --rate), balance (reach --target with the fewest changes, or apply --plan), passthrough (copy and validate only)");
  add_defaulted(opts, "rate", real_number("--rate", &ro.rate, {0, 1}), ro.rate, "substitute: probability that a record with mentions is replaced, 0 to 1");
  opts.add_options()
    ("plan", po::value(&a.balance.plan_path)->value_name("PATH"), "balance: apply this plan (from 'evenhand plan') instead of making one");
  add_defaulted(opts, "compress", po::value(&a.compress)->value_name("auto|none|zstd|gzip"), a.compress, "output compression: auto (by name), none, zstd, gzip");
  add_defaulted(opts, "zstd-level", whole_number("--zstd-level", &so.zstd_level, zl.lo, zl.hi), so.zstd_level,
                "zstd level, " + range(zl) + "; 0: libzstd's own default; below 1: faster");
  add_defaulted(opts, "zstd-threads", whole_number("--zstd-threads", &so.zstd_workers, zw.lo, zw.hi), so.zstd_workers,
                "zstd worker threads, " + range(zw), "in the writer thread");
  add_defaulted(opts, "gzip-level", whole_number("--gzip-level", &so.gzip_level, gl.lo, gl.hi), so.gzip_level,
                "gzip level, " + range(gl) + "; -1: zlib's own default; 0: store");
  opts.add_options()
    ("provenance", po::bool_switch(&ro.provenance), "add a \"_evenhand\" member to each written record: source file, line, original or counterfactual");
  // clang-format on
  add_balance_options(opts, a.balance);
}

void add_tally_options(po::options_description& opts, TallyArgs& a) {
  add_corpus_options(opts, a.corpus, CorpusUse::count);
  opts.add_options()("out", po::value(&a.out)->value_name("PATH"),
                     "write the tally (JSON) here ('-' is stdout)");
}

void add_plan_options(po::options_description& opts, PlanArgs& a) {
  opts.add_options()("help,h", "show this help")(
      "tally", po::value(&a.tallies)->value_name("PATH")->composing(),
      "a tally from 'evenhand tally'; repeatable: the tallies of shards are merged")(
      "out", po::value(&a.out)->value_name("PATH"), "write the plan (JSON) here ('-' is stdout)")(
      "quiet,q", po::bool_switch(&a.quiet), "print nothing but errors");
  add_balance_options(opts, a.balance);
}

int run_command(const std::vector<std::string>& args, const std::vector<std::string>& argv_all) {
  po::options_description opts("Options");
  RunArgs run;
  add_run_options(opts, run);
  CorpusArgs& a = run.corpus;
  BalanceArgs& b = run.balance;
  pipeline::RunOptions& ro = a.ro;
  const std::string &mode = run.mode, &compress = run.compress, &manifest_path = run.manifest_path;
  po::variables_map vm;
  int rc = parse_args("run", kRunSynopsis, opts, args, vm);
  if (rc >= 0) return rc;
  if (mode == "augment") {
    ro.mode = pipeline::Mode::augment;
  } else if (mode == "substitute") {
    ro.mode = pipeline::Mode::substitute;
  } else if (mode == "passthrough") {
    ro.mode = pipeline::Mode::passthrough;
  } else if (mode == "balance") {
    ro.mode = pipeline::Mode::balance;
  } else {
    print_error("run: --mode must be augment, substitute, balance or passthrough, not '" + mode +
                "'");
    return kUsage;
  }
  rc = finish_corpus_args("run", a);
  if (rc >= 0) return rc;
  if (compress == "none") {
    ro.output_options.compression = io::Compression::none;
  } else if (compress == "zstd") {
    ro.output_options.compression = io::Compression::zstd;
  } else if (compress == "gzip") {
    ro.output_options.compression = io::Compression::gzip;
  } else if (compress != "auto") {
    print_error("run: --compress must be auto, none, zstd or gzip, not '" + compress + "'");
    return kUsage;
  }
  if (ro.output.empty()) {
    print_error("run: no output given (--out PATH)");
    return kUsage;
  }
  {
    std::vector<io::NamedPath> ins = corpus_inputs(a), outs = {{ro.output, "--out"}};
    ins.push_back({b.plan_path, "--plan"});
    outs.push_back({ro.edits_path, "--edits"});
    for (auto& o : corpus_side_outputs(a)) outs.push_back(std::move(o));
    outs.push_back({manifest_path, "--manifest"});
    rc = check_outputs("run", ins, outs);
    if (rc >= 0) return rc;
  }
  bool balance_mode = ro.mode == pipeline::Mode::balance;
  if (balance_mode) {
    if (b.plan_path.empty() && b.target.empty()) {
      print_error("run: --mode balance needs --target SPEC (e.g. female=1,male=1) or --plan PLAN");
      return kUsage;
    }
    if (!b.plan_path.empty() && !b.target.empty()) {
      print_error("run: give either --target or --plan, not both");
      return kUsage;
    }
    if (b.plan_path.empty()) {
      for (const auto& in : ro.inputs) {
        if (in == "-") {
          print_error(
              "run: --mode balance --target reads the input twice (tally, then apply), so it "
              "cannot read stdin; save it to a file, or use 'evenhand tally', 'evenhand plan' "
              "and 'run --mode balance --plan'");
          return kUsage;
        }
      }
    }
  } else if (!b.target.empty() || !b.plan_path.empty()) {
    print_error("run: --target and --plan go with --mode balance");
    return kUsage;
  }
  rc = load_engine("run", a, ro.mode == pipeline::Mode::passthrough);
  if (rc >= 0) return rc;

  // Open the manifest first so an unwritable path fails before any work is done.
  std::unique_ptr<io::Sink> manifest_sink;
  if (!manifest_path.empty()) {
    io::SinkOptions so;
    so.compression = io::Compression::none;
    auto ms = io::Sink::create(manifest_path, so);
    if (!ms.ok()) return report(ms.error());
    manifest_sink = std::move(*ms);
  }

  bool shown = false;
  attach_reporting(a, shown);
  std::string started = utc_now();

  balance::Plan plan;
  std::string plan_source;
  double tolerance = b.tolerance;
  if (balance_mode) {
    if (!b.plan_path.empty()) {
      auto text = read_whole(b.plan_path);
      if (!text.ok()) return report(text.error());
      auto p = balance::plan_from_json(*text, b.plan_path);
      if (!p.ok()) return report(p.error());
      plan = std::move(*p);
      plan_source = b.plan_path;
      tolerance = plan.tolerance * 2;
      if (!plan.pack_sha256.empty() && plan.pack_sha256 != a.pack->sha256()) {
        print_error("run: " + b.plan_path + " was made with another pack (sha256 " +
                    plan.pack_sha256 + ", this one " + a.pack->sha256() + ")");
        return kUsage;
      }
    } else {
      auto popts = plan_options(b);
      if (!popts.ok()) return report(popts.error());
      pipeline::RunOptions tro = ro;
      tro.mode = pipeline::Mode::tally;
      tro.output.clear();
      tro.edits_path.clear();
      tro.quarantine_path.clear();
      tro.rejects_path.clear();
      tro.on_rejection = nullptr;
      tro.before_publish = nullptr;
      auto tallied = pipeline::run(tro, *a.engine);
      clear_progress(shown);
      if (!tallied.ok()) return report(tallied.error());
      auto p = balance::make_plan(tallied->tally, *popts);
      if (!p.ok()) return report(p.error());
      plan = std::move(*p);
      plan_source = "made from the input";
    }
    if (!a.quiet) print_plan(plan);
    ro.plan = &plan;
  }

  if (manifest_sink) {
    // The manifest joins the run's outputs: written before any is renamed, renamed last.
    ro.before_publish = [&](const pipeline::RunResult& r, io::OutputSet& set) -> Status {
      EVENHAND_TRY(manifest_sink->write(run_manifest(
          argv_all, a, mode, started, r, balance_mode ? &plan : nullptr, plan_source, tolerance)));
      set.add(*manifest_sink);
      return ok_status();
    };
  }
  auto result = pipeline::run(ro, *a.engine);
  clear_progress(shown);
  if (!result.ok()) return report(result.error());
  const auto& r = *result;

  if (!a.quiet) {
    const auto& st = r.stats;
    std::fprintf(stderr,
                 "evenhand: read %llu records (%llu rejected), wrote %llu (%llu counterfactual) "
                 "in %.2f s\n",
                 static_cast<unsigned long long>(st.records_read),
                 static_cast<unsigned long long>(st.records_rejected),
                 static_cast<unsigned long long>(st.records_written),
                 static_cast<unsigned long long>(st.records_added + st.records_replaced),
                 r.seconds);
    for (const auto& f : r.outputs) {
      std::fprintf(stderr, "  %-10s %s\n", (f.role + ":").c_str(), f.path.c_str());
    }
    if (!manifest_path.empty())
      std::fprintf(stderr, "  %-10s %s\n", "manifest:", manifest_path.c_str());
  }
  return kOk;
}

int tally_command(const std::vector<std::string>& args) {
  po::options_description opts("Options");
  TallyArgs tally;
  add_tally_options(opts, tally);
  CorpusArgs& a = tally.corpus;
  const std::string& out = tally.out;
  po::variables_map vm;
  int rc = parse_args("tally", kTallySynopsis, opts, args, vm);
  if (rc >= 0) return rc;
  a.ro.mode = pipeline::Mode::tally;
  rc = finish_corpus_args("tally", a);
  if (rc >= 0) return rc;
  if (out.empty()) {
    print_error("tally: no output given (--out PATH)");
    return kUsage;
  }
  std::vector<io::NamedPath> outs = corpus_side_outputs(a);
  outs.insert(outs.begin(), {out, "--out"});
  rc = check_outputs("tally", corpus_inputs(a), outs);
  if (rc >= 0) return rc;
  rc = load_engine("tally", a, false);
  if (rc >= 0) return rc;
  io::SinkOptions so;
  so.compression = io::Compression::none;
  auto sink = io::Sink::create(out, so);
  if (!sink.ok()) return report(sink.error());
  // The tally joins the run's outputs (rejects, quarantine): all appear or none.
  a.ro.before_publish = [&](const pipeline::RunResult& res, io::OutputSet& set) -> Status {
    EVENHAND_TRY((*sink)->write(balance::tally_to_json(res.tally)));
    set.add(**sink);
    return ok_status();
  };
  bool shown = false;
  attach_reporting(a, shown);
  auto r = pipeline::run(a.ro, *a.engine);
  clear_progress(shown);
  if (!r.ok()) return report(r.error());
  if (!a.quiet) {
    std::fprintf(stderr, "evenhand: tallied %llu records (%llu rejected) into %s\n",
                 static_cast<unsigned long long>(r->stats.records_read),
                 static_cast<unsigned long long>(r->stats.records_rejected), out.c_str());
  }
  return kOk;
}

int plan_command(const std::vector<std::string>& args) {
  po::options_description opts("Options");
  PlanArgs plan;
  add_plan_options(opts, plan);
  const BalanceArgs& b = plan.balance;
  const std::vector<std::string>& tallies = plan.tallies;
  const std::string& out = plan.out;
  po::variables_map vm;
  int rc = parse_args("plan", kPlanSynopsis, opts, args, vm);
  if (rc >= 0) return rc;
  if (tallies.empty() || out.empty() || b.target.empty()) {
    print_error("plan: --tally, --target and --out are required");
    return kUsage;
  }
  std::vector<io::NamedPath> ins;
  for (const auto& t : tallies) ins.push_back({t, "--tally"});
  rc = check_outputs("plan", ins, {{out, "--out"}});
  if (rc >= 0) return rc;
  balance::Tally merged;
  for (const auto& t : tallies) {
    auto text = read_whole(t);
    if (!text.ok()) return report(text.error());
    auto tally = balance::tally_from_json(*text, t);
    if (!tally.ok()) return report(tally.error());
    Status s = merged.merge(*tally);
    if (!s.ok()) {
      Error e = std::move(s).error();
      if (e.file.empty()) e.file = t;
      return report(e);
    }
  }
  auto popts = plan_options(b);
  if (!popts.ok()) return report(popts.error());
  auto p = balance::make_plan(merged, *popts);
  if (!p.ok()) return report(p.error());
  Status s = write_file_atomic(out, balance::plan_to_json(*p));
  if (!s.ok()) return report(s.error());
  if (!plan.quiet) print_plan(*p);
  return kOk;
}

}  // namespace evenhand::cli
