// Test helper for the command-line tests: runs the evenhand binary in a temporary directory
// and captures its exit code, stderr and stdout.
#pragma once

#include <string>

#include "support/temp_dir.h"

namespace evenhand::testing {

struct Ran {
  int code = -1;
  std::string err;
  std::string out;
};

// Runs evenhand with `args` (already shell-quoted); stdout and stderr go to files "stdout"
// and "stderr" in `d`.
inline Ran run_evenhand(const TempDir& d, const std::string& args,
                        const std::string& stdin_file = "/dev/null") {
  Ran r;
  std::string cmd = evenhand_binary() + " " + args + " <" + stdin_file + " >" + d.file("stdout") +
                    " 2>" + d.file("stderr");
  r.code = shell(cmd);
  r.err = read_file(d.file("stderr"));
  r.out = read_file(d.file("stdout"));
  return r;
}

}  // namespace evenhand::testing
