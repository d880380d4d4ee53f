// Test helper: asks the hunspell command (Debian hunspell and its dictionaries) which of a set
// of words a dictionary rejects, and checks the answer against a test's list of accepted
// exceptions. Shared by the pack and external checks of both languages.
#pragma once

#include <catch2/catch.hpp>

#include <fstream>
#include <map>
#include <set>
#include <sstream>
#include <string>

#include "support/temp_dir.h"

namespace evenhand::testing {

// The words of `words` that `hunspell -d DICT -i UTF-8 -l` prints, i.e. does not accept.
// Fails the test when hunspell cannot run (bash .ci/deps installs it and the dictionaries).
inline std::set<std::string> hunspell_rejects(const std::set<std::string>& words,
                                              const std::string& dict) {
  TempDir d;
  {
    std::ofstream out(d.file("words"));
    for (const auto& w : words) out << w << '\n';
  }
  int rc = shell("hunspell -d " + dict + " -i UTF-8 -l < " + d.file("words") + " > " +
                 d.file("rejected") + " 2> " + d.file("err"));
  INFO("hunspell -d " << dict << " failed (run bash .ci/deps): " << read_file(d.file("err")));
  REQUIRE(rc == 0);
  std::set<std::string> rejected;
  std::istringstream in(read_file(d.file("rejected")));
  for (std::string line; std::getline(in, line);)
    if (!line.empty()) rejected.insert(line);
  return rejected;
}

// Fails on every rejected word that is not an accepted exception, and on every exception
// that is no longer needed (hunspell accepts it now, or the words no longer hold it).
inline void check_hunspell_exceptions(const std::set<std::string>& rejected,
                                      const std::map<std::string, std::string>& exceptions,
                                      const std::string& dict) {
  for (const auto& w : rejected) {
    INFO("hunspell " << dict << " does not know '" << w << "'");
    CHECK(exceptions.count(w) == 1);
  }
  for (const auto& [w, why] : exceptions) {
    INFO(w << ": " << why);
    CHECK(rejected.count(w) == 1);
  }
}

}  // namespace evenhand::testing
