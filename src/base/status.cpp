#include "base/status.h"

namespace evenhand {

std::string Error::message() const {
  std::string out;
  if (!file.empty()) {
    out += file;
    if (line) out += ":" + std::to_string(*line);
    out += ": ";
  }
  if (offset) out += "byte " + std::to_string(*offset) + ": ";
  out += reason;
  return out;
}

Error make_error(ErrorKind kind, std::string file, std::string reason) {
  Error e;
  e.kind = kind;
  e.file = std::move(file);
  e.reason = std::move(reason);
  return e;
}

}  // namespace evenhand
