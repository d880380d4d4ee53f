// The options every corpus-reading command shares (run, tally): pack, inputs, fields,
// framing, bad-record policy, threads. Parsing them in one place keeps the commands'
// spelling and behaviour identical.
#pragma once

#include <memory>
#include <string>
#include <vector>

#include "cli/common.h"
#include "pack/pack.h"
#include "pipeline/options.h"
#include "rewrite/engine.h"

namespace evenhand::cli {

struct CorpusArgs {
  std::string pack_name;
  std::string format = "jsonl";
  std::string on_bad = "fail";
  std::string max_bytes;  // --max-record-bytes as given; its default is ro's
  std::vector<std::string> fields;
  std::vector<std::string> protect;
  std::string toward;
  std::string on_flagged = "original";
  bool themselves = false;
  bool paragraphs = false;
  bool quiet = false;
  pipeline::RunOptions ro;

  std::shared_ptr<const pack::CompiledPack> pack;
  std::unique_ptr<rewrite::Engine> engine;
};

// What a command does with the corpus: run rewrites it; tally only counts mentions and what a
// counterfactual would change, so it takes no option that only a rewrite reads (--seed,
// --id-field, --themselves, --on-flagged).
enum class CorpusUse { rewrite, count };

// Adds the shared options for `use` to `opts`, bound to `a`; defaults are a's and a.ro's.
void add_corpus_options(po::options_description& opts, CorpusArgs& a, CorpusUse use);

// Adds --protect (user patterns of protected spans, rewrite::EngineOptions::protect_patterns),
// bound to `patterns`: one of the shared options, also taken by `associations` so that it
// counts the mentions a run with the same patterns counts.
void add_protect_option(po::options_description& opts, std::vector<std::string>& patterns);

// Checks the parsed options and fills a.ro. Returns -1 to go on, else the exit code.
int finish_corpus_args(const std::string& command, CorpusArgs& a);

// Loads the pack (required unless `pack_optional`) with load_full_pack (every problem of it
// printed, one a line) and makes the engine for a.ro.mode.
// Returns -1 to go on, else the exit code (after printing why).
int load_engine(const std::string& command, CorpusArgs& a, bool pack_optional);

// Installs the progress line (terminal only, not with --quiet) and the rejection messages.
// `shown` is set once a progress line is on screen; call clear_progress() after the run.
void attach_reporting(CorpusArgs& a, bool& shown);
void clear_progress(bool shown);

// The files the shared options read (--in, a --pack directory) and write (--quarantine,
// --rejects), named by option for check_outputs().
std::vector<io::NamedPath> corpus_inputs(const CorpusArgs& a);
std::vector<io::NamedPath> corpus_side_outputs(const CorpusArgs& a);

// Parses "16M", "512K", "1G" or a plain byte count.
bool parse_size(const std::string& s, size_t& out);
// The shortest text parse_size reads back as `n` ("16M" for 16 MiB).
std::string format_size(size_t n);

}  // namespace evenhand::cli
