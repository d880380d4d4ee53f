#include "cli/corpus_args.h"

#include <unistd.h>

#include <cstdio>
#include <limits>

#include "cli/cli.h"
#include "cli/pack_load.h"

namespace evenhand::cli {

namespace {

std::string format_eta(double s) {
  if (s < 0 || s > 360000) return "--:--";
  int t = static_cast<int>(s + 0.5);
  char buf[32];
  std::snprintf(buf, sizeof buf, "%d:%02d:%02d", t / 3600, (t / 60) % 60, t % 60);
  return buf;
}

}  // namespace

bool parse_size(const std::string& s, size_t& out) {
  if (s.empty() || s[0] < '0' || s[0] > '9') return false;
  size_t pos = 0;
  unsigned long long n = 0;
  try {
    n = std::stoull(s, &pos);
  } catch (...) {
    return false;
  }
  std::string suffix = s.substr(pos);
  unsigned long long mul = 1;
  if (suffix == "K" || suffix == "KiB")
    mul = 1ull << 10;
  else if (suffix == "M" || suffix == "MiB")
    mul = 1ull << 20;
  else if (suffix == "G" || suffix == "GiB")
    mul = 1ull << 30;
  else if (!suffix.empty())
    return false;
  if (n > std::numeric_limits<size_t>::max() / mul) return false;
  out = static_cast<size_t>(n * mul);
  return true;
}

std::string format_size(size_t n) {
  for (auto [suffix, shift] : {std::pair{"G", 30}, {"M", 20}, {"K", 10}}) {
    size_t unit = size_t{1} << shift;
    if (n >= unit && n % unit == 0) return std::to_string(n / unit) + suffix;
  }
  return std::to_string(n);
}

void add_corpus_options(po::options_description& opts, CorpusArgs& a, CorpusUse use) {
  pipeline::RunOptions& ro = a.ro;
  const bool rewrite = use == CorpusUse::rewrite;
  // clang-format off
  opts.add_options()
    ("help,h", "show this help")
    ("pack", po::value(&a.pack_name)->value_name("PACK"), "rule pack: a built-in name (see 'evenhand packs') or a directory")
    ("in", po::value(&ro.inputs)->value_name("PATH")->composing(), "input file (plain, zstd or gzip; '-' is stdin); repeatable, read in order");
  add_defaulted(opts, "field", po::value(&a.fields)->value_name("POINTER")->composing(), ro.fields,
                std::string("JSON Pointer of a string to ") + (rewrite ? "rewrite" : "count mentions in") +
                ", '*' matches every element or member; repeatable");
  add_defaulted(opts, "format", po::value(&a.format)->value_name("jsonl|text"), a.format, "record format: jsonl or text");
  opts.add_options()
    ("paragraphs", po::bool_switch(&a.paragraphs), "text: documents are separated by blank lines instead of one per line");
  if (rewrite) {
    add_defaulted(opts, "seed", whole_number("--seed", &ro.seed, 0, UINT64_MAX), ro.seed, "seed for per-record decisions, 0 to 2^64-1");
    opts.add_options()
      ("id-field", po::value(&ro.id_pointer)->value_name("POINTER"), "JSON Pointer of a record's identity for per-record decisions (default: a hash of its raw bytes)");
  }
  add_defaulted(opts, "threads", whole_number("--threads", &ro.threads, 0, pipeline::kMaxThreads), ro.threads,
                "worker threads, 0 to " + std::to_string(pipeline::kMaxThreads), "the machine's cores");
  add_defaulted(opts, "on-bad-record", po::value(&a.on_bad)->value_name("fail|skip|quarantine"), a.on_bad,
                "fail, skip, or quarantine (copy raw lines to --quarantine)");
  opts.add_options()
    ("quarantine", po::value(&ro.quarantine_path)->value_name("PATH"), "file for rejected records' raw lines")
    ("rejects", po::value(&ro.rejects_path)->value_name("PATH"), "write one JSON line per rejected record (file, line, reason) here")
    ("allow-unmatched-field", po::bool_switch(&ro.allow_unmatched_fields), "JSONL: finish even when a --field matched no value in the whole run (without it the run fails, exit 2)");
  add_defaulted(opts, "max-record-bytes", po::value(&a.max_bytes)->value_name("SIZE"), format_size(ro.max_record_bytes),
                "reject records longer than this, 1 to " + format_size(pipeline::kMaxRecordBytesLimit) + "; K, M, G suffixes");
  add_protect_option(opts, a.protect);
  if (rewrite) {
    opts.add_options()
      ("toward", po::value(&a.toward)->value_name("GROUP"), "rewrite the other groups' forms toward this group only (e.g. neutral) (default: swap the pack's first two groups)")
      ("themselves", po::bool_switch(&a.themselves), "English neutral: write 'themselves' instead of 'themself'");
    add_defaulted(opts, "on-flagged", po::value(&a.on_flagged)->value_name("original|counterfactual|reject"), a.on_flagged,
                  "a counterfactual whose agreement cannot be settled: original (write the original only), counterfactual (write it anyway, flagged in --provenance), reject (as a bad record)");
  } else {
    opts.add_options()
      ("toward", po::value(&a.toward)->value_name("GROUP"), "count what rewriting the other groups' forms toward this group only would change as run --toward (default: swap the pack's first two groups)");
  }
  opts.add_options()
    ("quiet,q", po::bool_switch(&a.quiet), "print nothing but errors");
  // clang-format on
}

void add_protect_option(po::options_description& opts, std::vector<std::string>& patterns) {
  opts.add_options()("protect", po::value(&patterns)->value_name("REGEX")->composing(),
                     "ICU regular expression of spans never to rewrite nor count as mentions; "
                     "repeatable");
}

int finish_corpus_args(const std::string& cmd, CorpusArgs& a) {
  pipeline::RunOptions& ro = a.ro;
  if (!a.fields.empty()) ro.fields = a.fields;
  if (a.format == "jsonl") {
    ro.format = pipeline::Format::jsonl;
  } else if (a.format == "text") {
    ro.format = pipeline::Format::text;
  } else {
    print_error(cmd + ": --format must be jsonl or text, not '" + a.format + "'");
    return kUsage;
  }
  if (a.paragraphs) {
    if (ro.format != pipeline::Format::text) {
      print_error(cmd + ": --paragraphs needs --format text");
      return kUsage;
    }
    ro.framing = corpus::Framing::paragraphs;
  }
  if (a.on_bad == "fail") {
    ro.on_bad = pipeline::OnBadRecord::fail;
  } else if (a.on_bad == "skip") {
    ro.on_bad = pipeline::OnBadRecord::skip;
  } else if (a.on_bad == "quarantine") {
    ro.on_bad = pipeline::OnBadRecord::quarantine;
    if (ro.quarantine_path.empty()) {
      print_error(cmd + ": --on-bad-record quarantine needs --quarantine PATH");
      return kUsage;
    }
  } else {
    print_error(cmd + ": --on-bad-record must be fail, skip or quarantine, not '" + a.on_bad + "'");
    return kUsage;
  }
  if (!parse_size(a.max_bytes, ro.max_record_bytes) || ro.max_record_bytes == 0 ||
      ro.max_record_bytes > pipeline::kMaxRecordBytesLimit) {
    print_error(cmd +
                ": --max-record-bytes must be a byte count from 1 to 2G (such as 16M), not '" +
                a.max_bytes + "'");
    return kUsage;
  }
  if (a.on_flagged == "original") {
    ro.on_flagged = pipeline::OnFlagged::original;
  } else if (a.on_flagged == "counterfactual") {
    ro.on_flagged = pipeline::OnFlagged::counterfactual;
  } else if (a.on_flagged == "reject") {
    ro.on_flagged = pipeline::OnFlagged::reject;
  } else {
    print_error(cmd + ": --on-flagged must be original, counterfactual or reject, not '" +
                a.on_flagged + "'");
    return kUsage;
  }
  if (ro.inputs.empty()) {
    print_error(cmd + ": no input given (--in PATH)");
    return kUsage;
  }
  return -1;
}

int load_engine(const std::string& cmd, CorpusArgs& a, bool pack_optional) {
  if (a.pack_name.empty()) {
    if (!pack_optional) {
      print_error(cmd + ": --pack is required (see 'evenhand packs' for the built-in packs)");
      return kUsage;
    }
    a.engine = rewrite::make_identity_engine();
    return -1;
  }
  std::vector<Error> problems;
  auto loaded = load_full_pack(a.pack_name, problems);
  if (!loaded.ok()) return report_pack_problems(problems, loaded.error());
  a.pack = loaded->pack;
  if (a.ro.mode == pipeline::Mode::passthrough) {
    a.engine = rewrite::make_identity_engine();
    return -1;
  }
  for (const auto& [key, value] : a.pack->meta()) {
    if (key == "status" && value == "draft") {
      print_error(cmd + ": pack " + a.pack->name() +
                  " is a draft (meta status draft in pack.txt): it validates, but it is not "
                  "ready to rewrite text; see rules/README.md");
      return kPack;
    }
  }
  rewrite::EngineOptions eo;
  eo.protect_patterns = a.protect;
  eo.themselves = a.themselves;
  if (!a.toward.empty()) {
    auto g = a.pack->group_index(a.toward);
    if (!g) {
      std::string groups;
      for (const auto& n : a.pack->groups()) groups += (groups.empty() ? "" : ", ") + n;
      print_error(cmd + ": --toward " + a.toward + ": pack " + a.pack->name() +
                  " has no such group (it has " + groups + ")");
      return kUsage;
    }
    eo.toward = *g;
  }
  auto made = rewrite::make_engine(a.pack, std::move(loaded->engine_data), eo);
  if (!made.ok()) return report(made.error());
  a.engine = std::move(*made);
  return -1;
}

std::vector<io::NamedPath> corpus_inputs(const CorpusArgs& a) {
  std::vector<io::NamedPath> ins;
  for (const auto& in : a.ro.inputs) ins.push_back({in, "--in"});
  add_pack_input(ins, a.pack_name);
  return ins;
}

std::vector<io::NamedPath> corpus_side_outputs(const CorpusArgs& a) {
  return {{a.ro.quarantine_path, "--quarantine"}, {a.ro.rejects_path, "--rejects"}};
}

void attach_reporting(CorpusArgs& a, bool& shown) {
  bool quiet = a.quiet;
  if (!quiet && isatty(STDERR_FILENO)) {
    a.ro.on_progress = [&shown](const pipeline::Progress& p) {
      double mbs = p.seconds > 0 ? p.raw_bytes / 1e6 / p.seconds : 0;
      std::fprintf(stderr, "\r\033[Kevenhand: %llu records  %.1f MB/s",
                   static_cast<unsigned long long>(p.records), mbs);
      if (p.raw_total > 0) {
        double frac = static_cast<double>(p.raw_bytes) / p.raw_total;
        double eta = frac > 0 ? p.seconds * (1 - frac) / frac : -1;
        std::fprintf(stderr, "  %.0f%%  ETA %s", 100 * frac, format_eta(eta).c_str());
      }
      std::fflush(stderr);
      shown = true;
    };
  }
  auto count = std::make_shared<uint64_t>(0);
  std::string rejects = a.ro.rejects_path;
  a.ro.on_rejection = [quiet, count, rejects, &shown](const Error& e) {
    if (quiet) return;
    constexpr uint64_t kShow = 10;
    if (shown) std::fputs("\r\033[K", stderr);
    if (*count < kShow) {
      print_error(e.message());
    } else if (*count == kShow) {
      print_error("more records rejected; counts are in the manifest" +
                  std::string(rejects.empty() ? "" : " and every one in " + rejects));
    }
    ++*count;
  };
  a.ro.on_unmatched_field = [quiet, &shown](const std::string& pattern, uint64_t records) {
    if (quiet) return;
    if (shown) std::fputs("\r\033[K", stderr);
    print_error("warning: --field " + pattern + " has matched no value in the first " +
                std::to_string(records) + " records");
  };
}

void clear_progress(bool shown) {
  if (shown) std::fputs("\r\033[K", stderr);
}

}  // namespace evenhand::cli
