// Formatting of pack diagnostics and summaries for `evenhand check`.
#include "pack/check.h"

namespace evenhand::pack {

std::string format_diagnostic(const Diagnostic& d) {
  return d.where.str() + ": " + d.message;
}

std::string format_diagnostics(const std::vector<Diagnostic>& diagnostics) {
  std::string out;
  for (const auto& d : diagnostics) {
    out += format_diagnostic(d);
    out += '\n';
  }
  return out;
}

std::string describe_pack(const CompiledPack& pack) {
  std::string groups;
  for (const auto& g : pack.groups()) groups += (groups.empty() ? "" : ", ") + g;
  return pack.name() + " " + pack.version() + " (" + pack.language() + ", axis " + pack.axis() +
         ": " + groups + "): " + std::to_string(pack.sets().size()) + " sets, " +
         std::to_string(pack.names().size()) + " name pairs, " +
         std::to_string(pack.protected_phrases().size()) + " protected phrases, " +
         std::to_string(pack.guards().size()) + " guards, sha256 " + pack.sha256();
}

}  // namespace evenhand::pack
