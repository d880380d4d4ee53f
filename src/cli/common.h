// Shared plumbing of the subcommands: error reporting, exit-code mapping, option helpers.
#pragma once

#include <boost/program_options.hpp>
#include <charconv>
#include <string>
#include <type_traits>
#include <utility>
#include <vector>

#include "base/status.h"
#include "io/paths.h"

namespace evenhand::cli {

namespace po = boost::program_options;

// Prints "evenhand: MESSAGE" on stderr.
void print_error(const std::string& message);
// Prints the error and returns its exit code.
int report(const Error& e);
// Exit code for an error kind.
int exit_code_for(ErrorKind kind);

// The help of `command`: "Usage: evenhand COMMAND SYNOPSIS", a blank line, the options.
std::string help_text(const std::string& command, const std::string& synopsis,
                      const po::options_description& options);

// Parses `args` against `options`; prints help_text for --help. Returns -1 to continue, else the
// exit code to return right away (0 after --help, kUsage after a parse error).
int parse_args(const std::string& command, const std::string& synopsis,
               const po::options_description& options, const std::vector<std::string>& args,
               po::variables_map& vm,
               const po::positional_options_description* positional = nullptr);

// Throws the po::error that parse_args reports (exit kUsage): "--NAME must be WHAT, not
// 'TEXT'".
[[noreturn]] void bad_number(const std::string& name, const std::string& what,
                             const std::string& text);

// The value semantic of a whole-number option stored in `*out`: checked when the options are
// parsed, so a fraction, trailing text, a sign on an unsigned option (which Boost would wrap
// to a huge number) or a value outside [lo, hi] is a usage error naming `name` ("--threads")
// and the range, before any file is opened.
template <typename T>
po::typed_value<std::string>* whole_number(const std::string& name, T* out,
                                           std::type_identity_t<T> lo, std::type_identity_t<T> hi) {
  static_assert(std::is_integral_v<T>);
  return po::value<std::string>()->value_name("N")->notifier([name, out, lo,
                                                              hi](const std::string& text) {
    T v{};
    auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), v);
    if (ec != std::errc() || end != text.data() + text.size() || v < lo || v > hi) {
      bad_number(name, "a whole number from " + std::to_string(lo) + " to " + std::to_string(hi),
                 text);
    }
    *out = v;
  });
}

// A default value as help shows it: text as it is, numbers as the shortest text that reads
// back to them, a list joined by ','.
std::string default_text(const std::string& value);
std::string default_text(double value);
std::string default_text(const std::vector<std::string>& value);
template <typename T>
requires std::is_integral_v<T> std::string default_text(T value) {
  return std::to_string(value);
}

// Adds option `name` with the value semantic `v` and the default `value`: the parser stores
// `value` when the option is absent (po's default_value; for whole_number() and
// real_number(), whose semantic takes text, the text of `value`, so their checks hold it
// too), and help shows "WHAT (default TEXT)" or "WHAT (default TEXT: MEANING)" with TEXT
// made from that same value by default_text(). Help never states a default any other way.
template <typename T, typename V>
void add_defaulted(po::options_description& opts, const char* name, po::typed_value<T>* v,
                   const V& value, const std::string& what, const std::string& meaning = "") {
  std::string text = default_text(value);
  if constexpr (std::is_same_v<T, V>) {
    v->default_value(value, "");  // "" hides po's own "(=...)"; the description shows it
  } else {
    static_assert(std::is_same_v<T, std::string>);
    v->default_value(text, "");
  }
  opts.add_options()(
      name, v,
      (what + " (default " + text + (meaning.empty() ? "" : ": " + meaning) + ")").c_str());
}

// Largest --sample of review and report: the sample is held in memory.
inline constexpr size_t kMaxSample = 1000000;

// Bounds of a real-number option; an open bound excludes its value.
struct RealRange {
  double lo, hi;
  bool lo_open = false, hi_open = false;
};

// As whole_number() for a finite real number within `range` (NaN and infinities refused).
po::typed_value<std::string>* real_number(const std::string& name, double* out, RealRange range);

// The current UTC time as ISO 8601 ("2026-12-01T22:11:04Z").
std::string utc_now();

// Refuses an output that would replace an input or another output
// (io::check_outputs_distinct): prints why and returns kUsage; else returns -1.
int check_outputs(const std::string& command, const std::vector<io::NamedPath>& inputs,
                  const std::vector<io::NamedPath>& outputs);

// Adds --pack to `inputs` when it names a directory (files under it are then kept from
// being overwritten); a built-in pack's name names no file.
void add_pack_input(std::vector<io::NamedPath>& inputs, const std::string& pack);

// SIGINT, SIGTERM, SIGHUP and SIGPIPE: from now on (call before any thread starts) one
// thread waits for them, removes every temporary output file and exits with 128 + the
// signal's number; a set of outputs being renamed into place is completed first. Signals
// that were ignored when evenhand started (nohup) stay ignored. A write to a closed pipe
// then fails with EPIPE and leaves SIGPIPE pending for the writing thread (see pipe_closed).
void install_stop_signals();

// True when a write of this thread (the main thread writes every output) found its pipe
// closed: SIGPIPE, blocked by install_stop_signals(), is pending. print_error() is then
// silent, as a process ended by SIGPIPE would be.
bool pipe_closed();

// For a command that ended after a write to a closed pipe: removes every temporary output
// file and returns the exit code 128 + SIGPIPE (141).
int stop_for_closed_pipe();

// Writes `text` to `path` all-or-nothing ("-" is stdout).
Status write_file_atomic(const std::string& path, const std::string& text);

// The subcommands: each takes the arguments after its name.
int run_command(const std::vector<std::string>& args, const std::vector<std::string>& argv_all);
int check_command(const std::vector<std::string>& args);
int packs_command(const std::vector<std::string>& args);
int pair_names_command(const std::vector<std::string>& args);
int tally_command(const std::vector<std::string>& args);
int plan_command(const std::vector<std::string>& args);
int merge_manifests_command(const std::vector<std::string>& args);
int review_command(const std::vector<std::string>& args);
int report_command(const std::vector<std::string>& args);
int associations_command(const std::vector<std::string>& args);

}  // namespace evenhand::cli
