// Fuzz target: the Spanish noun-phrase data files (rewrite/es/np_agreement.h: noun-phrase.data,
// adjectives.data, common-gender.data, stressed-a.data). Input: replacement data files in the
// container of fuzz_support.h (bytes before the first "%% NAME" line replace
// noun-phrase.data); the other files are the built-in es-gender pack's. Checked: the engine
// either builds or fails with an Error of kind pack naming a file; a built engine rewrites a
// few sentences keeping the promises of engine_checks.h.
#include <string>
#include <vector>

#include "engine_checks.h"
#include "fuzz_support.h"
#include "pack/pack.h"
#include "rewrite/engine.h"

using namespace evenhand;

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  static const auto* base =
      new std::map<std::string, std::string>(pack::builtin_pack_files("es-gender").value());
  std::string_view input(reinterpret_cast<const char*>(data), size);
  auto files = *base;
  for (auto& [name, bytes] : fuzz::split_files(input, "noun-phrase.data")) {
    if (name.size() > 5 && name.substr(name.size() - 5) == ".data") files[name] = std::move(bytes);
  }
  std::vector<pack::Diagnostic> diags;
  auto pack = pack::load_pack_files("es-gender", files, diags);
  FUZZ_CHECK(pack.ok(), "the es-gender pack with other data files does not load");
  auto engine = rewrite::make_engine(pack.value(), {});
  if (!engine.ok()) {
    FUZZ_CHECK(engine.error().kind == ErrorKind::pack, "a data file error not of kind pack");
    return 0;
  }
  static const std::vector<std::string_view> kFields = {
      "La directora amable del coro está cansada antes del concierto.",
      "Mi nieta canta en el coro; ella estaba muy optimista. Vi a mi vecina y la saludé.",
      "El ama de llaves y la estudiante son buenas amigas de todas las niñas.",
      "Esa es la tía de Juan, una de las chicas del ayuntamiento."};
  auto worker = engine.value()->make_worker();
  rewrite::RecordResult result;
  worker->rewrite(kFields, result);
  fuzz::check_result(kFields, result, pack.value()->groups().size());
  return 0;
}
