// Fuzz target: the Spanish noun-phrase data files (rewrite/es/np_agreement.h: noun-phrase.data,
// adjectives.data, common-gender.data, stressed-a.data). Input: replacement data files in the
// container of fuzz_support.h (bytes before the first "%% NAME" line replace
// noun-phrase.data; a "%% verbs.data" adds a verb table); the other files are the built-in
// es-gender pack's, compiled once. Checked: the data files either load or fail with an Error
// of kind pack naming a file; loaded ones make an engine that rewrites a few sentences keeping
// the promises of engine_checks.h.
#include <map>
#include <memory>
#include <string>
#include <vector>

#include "engine_checks.h"
#include "fuzz_support.h"
#include "pack/pack.h"
#include "rewrite/en/verb_agreement.h"
#include "rewrite/engine.h"
#include "rewrite/es/np_agreement.h"

using namespace evenhand;

namespace {

// The built-in es-gender pack, compiled once: its data files do not enter the compiled
// lexicon, so a run only parses the data files it replaces (compiling the pack per run took
// most of each run).
struct Base {
  std::shared_ptr<const pack::CompiledPack> pack;
  rewrite::EngineData data;
};

const Base& base() {
  static const Base* b = [] {
    std::vector<pack::Diagnostic> diags;
    auto files = pack::builtin_pack_files("es-gender").value();
    auto compiled = pack::load_pack_files("es-gender", files, diags);
    FUZZ_CHECK(compiled.ok(), "the built-in es-gender pack does not load");
    std::vector<Error> problems;
    auto data = rewrite::load_engine_data(compiled.value(), problems);
    FUZZ_CHECK(data.ok(), "the built-in es-gender data files do not load");
    return new Base{compiled.value(), std::move(*data)};
  }();
  return *b;
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  const Base& b = base();
  std::string_view input(reinterpret_cast<const char*>(data), size);
  std::map<std::string, std::string, std::less<>> replaced;
  for (auto& [name, bytes] : fuzz::split_files(input, rewrite::kNounPhraseFile)) {
    if (name.size() > 5 && name.substr(name.size() - 5) == ".data")
      replaced[name] = std::move(bytes);
  }
  rewrite::EngineData engine_data = b.data;
  auto checked = [&](auto loaded, auto& slot) {
    if (!loaded.ok()) {
      FUZZ_CHECK(loaded.error().kind == ErrorKind::pack, "a data file error not of kind pack");
      FUZZ_CHECK(!loaded.error().file.empty(), "a data file error that names no file");
      return false;
    }
    slot = std::move(*loaded);
    return true;
  };
  auto verbs = replaced.find(rewrite::kVerbsFile);
  if (verbs != replaced.end() &&
      !checked(rewrite::VerbTable::parse(verbs->second, b.pack->file_path(rewrite::kVerbsFile)),
               engine_data.verbs))
    return 0;
  if (!checked(rewrite::NounPhraseAgreement::from_pack(b.pack, replaced), engine_data.noun_phrases))
    return 0;
  auto engine = rewrite::make_engine(b.pack, std::move(engine_data), {});
  FUZZ_CHECK(engine.ok(), "no engine from data files that loaded");
  static const std::vector<std::string_view> kFields = {
      "La directora amable del coro está cansada antes del concierto.",
      "Mi nieta canta en el coro; ella estaba muy optimista. Vi a mi vecina y la saludé.",
      "El ama de llaves y la estudiante son buenas amigas de todas las niñas.",
      "Esa es la tía de Juan, una de las chicas del ayuntamiento."};
  auto worker = engine.value()->make_worker();
  rewrite::RecordResult result;
  worker->rewrite(kFields, result);
  fuzz::check_result(kFields, result, b.pack->groups().size());
  return 0;
}
