// Shared plumbing of the subcommands: error reporting, exit-code mapping, option helpers.
#pragma once

#include <boost/program_options.hpp>
#include <string>
#include <vector>

#include "base/status.h"

namespace evenhand::cli {

namespace po = boost::program_options;

// Prints "evenhand: MESSAGE" on stderr.
void print_error(const std::string& message);
// Prints the error and returns its exit code.
int report(const Error& e);
// Exit code for an error kind.
int exit_code_for(ErrorKind kind);

// Parses `args` against `options`; prints help for --help. Returns -1 to continue, else the
// exit code to return right away (0 after --help, kUsage after a parse error).
int parse_args(const std::string& command, const std::string& synopsis,
               const po::options_description& options, const std::vector<std::string>& args,
               po::variables_map& vm,
               const po::positional_options_description* positional = nullptr);

// The current UTC time as ISO 8601 ("2026-12-01T22:11:04Z").
std::string utc_now();

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
