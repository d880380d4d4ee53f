// OutputSet: finish all, then rename all under the temporary-file lock, then make the
// renames durable.
#include "io/output_set.h"

#include <fcntl.h>
#include <unistd.h>

#include <algorithm>

#include "io/temp_files.h"

namespace evenhand::io {

namespace {

// Makes the renames in `dir` durable; a failure here does not undo them.
void sync_directory(const std::string& dir) {
  const int dfd = ::open(dir.c_str(), O_RDONLY | O_DIRECTORY | O_CLOEXEC);
  if (dfd < 0) return;
  (void)::fsync(dfd);
  ::close(dfd);
}

}  // namespace

void OutputSet::add(Sink& sink) {
  members_.push_back(&sink);
}

Status OutputSet::finish() {
  for (Sink* s : members_) {
    Status st = s->finish();
    if (!st.ok()) {
      abort();
      return st;
    }
  }
  return ok_status();
}

void OutputSet::abort() {
  for (Sink* s : members_) s->abort();
}

Status OutputSet::commit() {
  EVENHAND_TRY(finish());
  std::vector<std::string> dirs;
  {
    auto lock = temp_files::lock();
    for (Sink* s : members_) {
      if (s->is_directory_now()) {
        for (Sink* m : members_) m->discard_locked();
        return make_error(ErrorKind::output, s->path(), "is a directory");
      }
    }
    for (size_t i = 0; i < members_.size(); ++i) {
      Status st = members_[i]->publish_locked();
      if (!st.ok()) {
        for (size_t j = i + 1; j < members_.size(); ++j) members_[j]->discard_locked();
        return st;
      }
    }
  }
  for (Sink* s : members_) {
    std::string d = s->directory();
    if (!d.empty() && std::find(dirs.begin(), dirs.end(), d) == dirs.end()) dirs.push_back(d);
  }
  for (const auto& d : dirs) sync_directory(d);
  return ok_status();
}

}  // namespace evenhand::io
