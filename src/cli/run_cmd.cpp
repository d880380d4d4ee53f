// `evenhand run`: the main job. Wires options into pipeline::RunOptions, loads the pack,
// runs, writes the manifest and prints where everything went.
#include <unistd.h>

#include <cstdio>
#include <iostream>

#include "audit/json_writer.h"
#include "audit/manifest.h"
#include "cli/cli.h"
#include "cli/common.h"
#include "io/sink.h"
#include "pack/pack.h"
#include "pipeline/run.h"
#include "rewrite/engine.h"

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

// Parses "16M", "512K", "1G" or a plain byte count.
bool parse_size(const std::string& s, size_t& out) {
  if (s.empty()) return false;
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
  out = static_cast<size_t>(n * mul);
  return true;
}

std::string format_eta(double s) {
  if (s < 0 || s > 360000) return "--:--";
  int t = static_cast<int>(s + 0.5);
  char buf[32];
  std::snprintf(buf, sizeof buf, "%d:%02d:%02d", t / 3600, (t / 60) % 60, t % 60);
  return buf;
}

}  // namespace

int run_command(const std::vector<std::string>& args, const std::vector<std::string>& argv_all) {
  po::options_description opts("Options");
  std::string pack_name, format = "jsonl", mode = "augment", on_bad = "fail", compress = "auto";
  std::string manifest_path, max_bytes = "16M";
  pipeline::RunOptions ro;
  std::vector<std::string> fields;
  // clang-format off
  opts.add_options()
    ("help,h", "show this help")
    ("pack", po::value(&pack_name), "rule pack: a built-in name (see 'evenhand packs') or a directory")
    ("in", po::value(&ro.inputs)->composing(), "input file (plain, zstd or gzip; '-' is stdin); repeatable, read in order")
    ("out", po::value(&ro.output), "output file ('-' is stdout); .zst/.gz names are compressed")
    ("manifest", po::value(&manifest_path), "write the run manifest (JSON) here")
    ("edits", po::value(&ro.edits_path), "write the audit log (JSONL, one line per rewritten record) here")
    ("field", po::value(&fields)->composing(), "JSON Pointer of a string to rewrite, '*' matches every element or member; repeatable (default /text)")
    ("format", po::value(&format), "record format: jsonl or text (default jsonl)")
    ("paragraphs", po::bool_switch(), "text: documents are separated by blank lines instead of one per line")
    ("mode", po::value(&mode), "augment (add a counterfactual copy after each record with mentions), substitute (replace with probability --rate), passthrough (copy and validate only); default augment")
    ("seed", po::value(&ro.seed), "seed for per-record decisions (default 0)")
    ("rate", po::value(&ro.rate), "substitute: probability that a record with mentions is replaced (default 0.5)")
    ("id-field", po::value(&ro.id_pointer), "substitute: JSON Pointer of a record's identity (default: a hash of its raw bytes)")
    ("threads", po::value(&ro.threads), "worker threads (default: the machine's cores)")
    ("on-bad-record", po::value(&on_bad), "fail (default), skip, or quarantine (copy raw lines to --quarantine)")
    ("quarantine", po::value(&ro.quarantine_path), "file for rejected records' raw lines")
    ("rejects", po::value(&ro.rejects_path), "write one JSON line per rejected record (file, line, reason) here")
    ("max-record-bytes", po::value(&max_bytes), "reject records longer than this (default 16M; K, M, G suffixes)")
    ("compress", po::value(&compress), "output compression: auto (by name), none, zstd, gzip")
    ("zstd-level", po::value(&ro.output_options.zstd_level), "zstd level (default 3)")
    ("zstd-threads", po::value(&ro.output_options.zstd_workers), "zstd worker threads (default 0: in the writer thread)")
    ("gzip-level", po::value(&ro.output_options.gzip_level), "gzip level (default 6)")
    ("provenance", po::bool_switch(&ro.provenance), "add a \"_evenhand\" member to each written record: source file, line, original or counterfactual")
    ("protect", po::value<std::vector<std::string>>()->composing(), "ICU regular expression of spans never to rewrite; repeatable")
    ("quiet,q", po::bool_switch(), "print nothing but errors");
  // clang-format on
  po::variables_map vm;
  int rc = parse_args("run", "--pack PACK --in PATH [--in PATH ...] --out PATH [OPTIONS]", opts,
                      args, vm);
  if (rc >= 0) return rc;
  bool quiet = vm["quiet"].as<bool>();
  if (!fields.empty()) ro.fields = fields;
  if (format == "jsonl") {
    ro.format = pipeline::Format::jsonl;
  } else if (format == "text") {
    ro.format = pipeline::Format::text;
  } else {
    print_error("run: --format must be jsonl or text, not '" + format + "'");
    return kUsage;
  }
  if (vm["paragraphs"].as<bool>()) {
    if (ro.format != pipeline::Format::text) {
      print_error("run: --paragraphs needs --format text");
      return kUsage;
    }
    ro.framing = corpus::Framing::paragraphs;
  }
  if (mode == "augment") {
    ro.mode = pipeline::Mode::augment;
  } else if (mode == "substitute") {
    ro.mode = pipeline::Mode::substitute;
  } else if (mode == "passthrough") {
    ro.mode = pipeline::Mode::passthrough;
  } else if (mode == "balance") {
    print_error(
        "run: --mode balance is not available in this version (it needs the tally and plan steps)");
    return kUsage;
  } else {
    print_error("run: --mode must be augment, substitute, balance or passthrough, not '" + mode +
                "'");
    return kUsage;
  }
  if (on_bad == "fail") {
    ro.on_bad = pipeline::OnBadRecord::fail;
  } else if (on_bad == "skip") {
    ro.on_bad = pipeline::OnBadRecord::skip;
  } else if (on_bad == "quarantine") {
    ro.on_bad = pipeline::OnBadRecord::quarantine;
    if (ro.quarantine_path.empty()) {
      print_error("run: --on-bad-record quarantine needs --quarantine PATH");
      return kUsage;
    }
  } else {
    print_error("run: --on-bad-record must be fail, skip or quarantine, not '" + on_bad + "'");
    return kUsage;
  }
  if (!parse_size(max_bytes, ro.max_record_bytes)) {
    print_error("run: --max-record-bytes takes a byte count such as 16M, not '" + max_bytes + "'");
    return kUsage;
  }
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
  if (ro.inputs.empty()) {
    print_error("run: no input given (--in PATH)");
    return kUsage;
  }
  if (ro.output.empty()) {
    print_error("run: no output given (--out PATH)");
    return kUsage;
  }
  if (!manifest_path.empty()) {
    for (const auto& in : ro.inputs) {
      if (in == manifest_path && in != "-") {
        print_error("run: --manifest names an input file; refusing to overwrite it");
        return kUsage;
      }
    }
  }

  std::shared_ptr<const pack::CompiledPack> pack;
  std::unique_ptr<rewrite::Engine> engine;
  if (pack_name.empty()) {
    if (ro.mode != pipeline::Mode::passthrough) {
      print_error("run: --pack is required (see 'evenhand packs' for the built-in packs)");
      return kUsage;
    }
    engine = rewrite::make_identity_engine();
  } else {
    std::vector<pack::Diagnostic> diags;
    auto loaded = pack::load_pack(pack_name, diags);
    if (!loaded.ok()) {
      for (const auto& d : diags) print_error(pack_name + ": " + d.where.str() + ": " + d.message);
      return report(loaded.error());
    }
    pack = *loaded;
    for (const auto& [key, value] : pack->meta()) {
      if (key == "status" && value == "draft" && ro.mode != pipeline::Mode::passthrough) {
        print_error("run: pack " + pack->name() +
                    " is a draft (meta status draft in pack.txt): it validates, but it is not "
                    "ready to rewrite text; see rules/README.md");
        return kPack;
      }
    }
    if (ro.mode == pipeline::Mode::passthrough) {
      engine = rewrite::make_identity_engine();
    } else {
      rewrite::EngineOptions eo;
      if (vm.count("protect")) eo.protect_patterns = vm["protect"].as<std::vector<std::string>>();
      auto made = rewrite::make_engine(pack, eo);
      if (!made.ok()) return report(made.error());
      engine = std::move(*made);
    }
  }

  bool tty = !quiet && isatty(STDERR_FILENO);
  bool progress_shown = false;
  if (tty) {
    ro.on_progress = [&](const pipeline::Progress& p) {
      double mbs = p.seconds > 0 ? p.raw_bytes / 1e6 / p.seconds : 0;
      std::fprintf(stderr, "\r\033[Kevenhand: %llu records  %.1f MB/s",
                   static_cast<unsigned long long>(p.records), mbs);
      if (p.raw_total > 0) {
        double frac = static_cast<double>(p.raw_bytes) / p.raw_total;
        double eta = frac > 0 ? p.seconds * (1 - frac) / frac : -1;
        std::fprintf(stderr, "  %.0f%%  ETA %s", 100 * frac, format_eta(eta).c_str());
      }
      std::fflush(stderr);
      progress_shown = true;
    };
  }
  uint64_t rejections_shown = 0;
  constexpr uint64_t kShowRejections = 10;
  ro.on_rejection = [&](const Error& e) {
    if (quiet) return;
    if (progress_shown) {
      std::fputs("\r\033[K", stderr);
    }
    if (rejections_shown < kShowRejections) {
      print_error("rejected: " + e.message());
    } else if (rejections_shown == kShowRejections) {
      print_error(
          "more records rejected; counts are in the manifest" +
          std::string(ro.rejects_path.empty() ? "" : " and every one in " + ro.rejects_path));
    }
    ++rejections_shown;
  };

  // Open the manifest first so an unwritable path fails before any work is done.
  std::unique_ptr<io::Sink> manifest_sink;
  if (!manifest_path.empty()) {
    io::SinkOptions so;
    so.compression = io::Compression::none;
    auto ms = io::Sink::create(manifest_path, so);
    if (!ms.ok()) return report(ms.error());
    manifest_sink = std::move(*ms);
  }

  std::string started = utc_now();
  auto result = pipeline::run(ro, *engine);
  if (progress_shown) std::fputs("\r\033[K", stderr);
  if (!result.ok()) return report(result.error());
  const auto& r = *result;

  if (!manifest_path.empty()) {
    audit::ManifestData md;
    md.command_line = argv_all;
    md.pack = pack.get();
    md.options = {
        {"mode", json_string(mode)},
        {"format", json_string(format)},
        {"paragraphs", vm["paragraphs"].as<bool>() ? "true" : "false"},
        {"fields", json_strings(ro.fields)},
        {"seed", std::to_string(ro.seed)},
        {"rate",
         [&] {
           std::string s;
           audit::JsonWriter(s).value(ro.rate);
           return s;
         }()},
        {"id_field", json_string(ro.id_pointer)},
        {"on_bad_record", json_string(on_bad)},
        {"max_record_bytes", std::to_string(ro.max_record_bytes)},
        {"provenance", ro.provenance ? "true" : "false"},
    };
    md.stats = &r.stats;
    md.inputs = r.inputs;
    md.outputs = r.outputs;
    md.first_rejections = r.first_rejections;
    md.seconds = r.seconds;
    md.threads = r.threads;
    md.started_at = started;
    Status s = manifest_sink->write(audit::render_manifest(md));
    if (s.ok()) s = manifest_sink->commit();
    if (!s.ok()) return report(s.error());
  }

  if (!quiet) {
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

}  // namespace evenhand::cli
