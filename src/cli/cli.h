// The command-line front end: parses arguments, calls the library, prints messages and maps
// errors to exit codes. It is the only part of evenhand that writes to stderr or exits.
#pragma once

namespace evenhand::cli {

// Exit codes (documented in the README).
enum ExitCode : int {
  kOk = 0,
  kUsage = 2,      // bad options or arguments
  kInput = 3,      // unreadable or corrupt input, or a bad record with --on-bad-record fail
  kOutput = 4,     // an output could not be written
  kPack = 5,       // the rule pack is broken
  kInternal = 70,  // a bug in evenhand
};

// Runs `evenhand ARGS...` and returns the process exit code.
int main(int argc, char** argv);

}  // namespace evenhand::cli
