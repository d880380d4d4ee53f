// Fuzz target: the audit-log reader (review/audit_log.h). Input: the bytes of a log file
// (plain, or zstd or gzip: the reader sniffs them), written to a scratch file each run.
// Checked: reading ends in records or in an Error naming the file (and the line, for a line
// that is not the shape the pipeline writes); records come in log order, each with its source
// line; an edit's "len" is the byte length of its "from".
#include <unistd.h>

#include <cstdio>
#include <string>

#include "fuzz_support.h"
#include "review/audit_log.h"

using namespace evenhand;

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  static const std::string path =
      (getenv("TMPDIR") ? std::string(getenv("TMPDIR")) : std::string("/tmp")) +
      "/evenhand-fuzz-audit-" + std::to_string(getpid()) + ".jsonl";
  FILE* f = std::fopen(path.c_str(), "wb");
  FUZZ_CHECK(f != nullptr, "cannot write the scratch file " + path);
  FUZZ_CHECK(std::fwrite(data, 1, size, f) == size && std::fclose(f) == 0, "short write");
  uint64_t last_log_line = 0;
  size_t records = 0;
  Status s = review::for_each_review_record(path, [&](review::ReviewRecord& r) -> Status {
    FUZZ_CHECK(r.log_line > last_log_line, "records out of log order");
    last_log_line = r.log_line;
    for (const auto& e : r.edits)
      FUZZ_CHECK(e.len == e.from.size(), "an edit whose len is not the length of its from");
    ++records;
    return ok_status();
  });
  if (!s.ok()) FUZZ_CHECK(s.error().file == path, "an error that does not name the log");
  std::remove(path.c_str());
  return 0;
}
