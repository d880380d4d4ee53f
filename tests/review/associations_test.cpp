// The association audit (review/associations.h): the statistic on a hand-computed example,
// the counting of contexts, group words that are exactly the rewrite engine's mentions
// (protected spans, --protect, person evidence, guards, multiword forms), the exact
// test and its "too few", the shipped target list, and the property that two-sided augmentation
// (run through the CLI) leaves no skew between the swapped pair.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <filesystem>

#include "review/associations.h"
#include "rewrite/engine.h"
#include "support/temp_dir.h"
#include "text/tokenize.h"

using namespace evenhand;
using evenhand::testing::read_file;
using evenhand::testing::shell;
using evenhand::testing::TempDir;
using evenhand::testing::write_file;

namespace {

std::shared_ptr<const pack::CompiledPack> en_pack() {
  std::vector<pack::Diagnostic> d;
  auto p = pack::load_pack("en-gender", d);
  REQUIRE(p.ok());
  return *p;
}

// The engine a run makes from the pack (with the run's --protect patterns).
std::shared_ptr<const rewrite::Engine> en_engine(const std::vector<std::string>& protect = {}) {
  rewrite::EngineOptions eo;
  eo.protect_patterns = protect;
  auto e = rewrite::make_engine(en_pack(), eo);
  REQUIRE(e.ok());
  return std::move(*e);
}

review::TargetList targets(const std::string& text) {
  auto t = review::parse_targets(text, "test");
  REQUIRE(t.ok());
  return *t;
}

// One record counted alone by a counter over `engine` (target nurse, window 10), what the
// engine itself reports for the record, and the number of word tokens in its fields.
struct Alone {
  review::CooccurrenceCounts counts;
  rewrite::RecordResult engine;
  uint64_t word_tokens = 0;
};

Alone count_alone(const std::shared_ptr<const rewrite::Engine>& engine,
                  std::span<const std::string_view> fields) {
  Alone a;
  review::CooccurrenceCounter counter(engine, targets("nurse\n"), 10);
  counter.add_record(fields);
  a.counts = counter.counts();
  a.engine.list_mentions = true;
  engine->make_worker()->rewrite(fields, a.engine);
  text::Tokenizer tokenizer;
  std::vector<text::Token> tokens;
  for (auto f : fields) {
    tokenizer.tokenize(f, tokens);
    for (const auto& t : tokens) a.word_tokens += t.kind == text::TokenKind::word;
  }
  return a;
}

// The counter's group words are the engine's mentions: with one-word mentions, the words it
// leaves out of N are as many as the engine counts in `before`, and a group has context
// exactly when the engine counts a mention of it.
void check_same_mentions(const Alone& a) {
  uint64_t mentions = 0;
  for (auto n : a.engine.before) mentions += n;
  CHECK(a.word_tokens - a.counts.words == mentions);
  for (size_t g = 0; g < a.engine.before.size(); ++g) {
    INFO("group " << g);
    CHECK((a.counts.context_total[g] > 0) == (a.engine.before[g] > 0));
  }
}

}  // namespace

TEST_CASE("log-odds z with an informative Dirichlet prior, by hand") {
  // The z-score form of Monroe, Colaresi & Quinn 2008 ("Fightin' Words", Political Analysis
  // 16(4)), as written in review/associations.h (formula from memory). By hand, with
  // y_a = 3, n_a = 100, y_b = 1, n_b = 50, alpha_w = 0.5, alpha_0 = 10:
  //   a: (3 + 0.5) / (100 + 10 - 3 - 0.5) = 3.5 / 106.5;  ln 3.5 = 1.252763, ln 106.5 = 4.668145
  //      -> -3.415382
  //   b: (1 + 0.5) / (50 + 10 - 1 - 0.5) = 1.5 / 58.5;    ln 1.5 = 0.405465, ln 58.5 = 4.069027
  //      -> -3.663562
  //   delta = -3.415382 - (-3.663562) = 0.248180
  //   var   = 1 / 3.5 + 1 / 1.5 = 0.285714 + 0.666667 = 0.952381;  sqrt = 0.975900
  //   z     = 0.248180 / 0.975900 = 0.254308
  auto r = review::log_odds_z(3, 100, 1, 50, 0.5, 10);
  CHECK(r.delta == Approx(0.248180).epsilon(1e-5));
  CHECK(r.variance == Approx(0.952381).epsilon(1e-5));
  CHECK(r.z == Approx(0.254308).epsilon(1e-5));
  // Swapping the groups flips the sign only.
  auto s = review::log_odds_z(1, 50, 3, 100, 0.5, 10);
  CHECK(s.z == Approx(-r.z));
  // Equal counts give exactly zero.
  CHECK(review::log_odds_z(4, 80, 4, 80, 0.3, 10).z == 0.0);
}

TEST_CASE("contexts are counted in a window of words around each group's words") {
  // By hand, window 3, one record: She(0, female) thanked(1) the(2) nurse(3) and(4)
  // he(5, male) met(6) a(7) mechanic(8).
  //   female context: words 1-3 -> thanked, the, nurse              n_f = 3, nurse 1
  //   male context:   words 2-4 and 6-8 -> the nurse and met a mechanic   n_m = 6, nurse 1,
  //                   mechanic 1
  //   words that are not group words: N = 7; nurse and mechanic occur once each.
  // With alpha_0 = 7: alpha_nurse = 7 * 1 / 7 = 1, and for nurse, female vs male:
  //   a: (1 + 1) / (3 + 7 - 1 - 1) = 2 / 8  -> ln 0.25 = -1.386294
  //   b: (1 + 1) / (6 + 7 - 1 - 1) = 2 / 11 -> ln 2 - ln 11 = 0.693147 - 2.397895 = -1.704748
  //   delta = 0.318454, var = 1/2 + 1/2 = 1, z = 0.318454
  auto pk = en_pack();
  auto t = targets("nurse nurses\nmechanic\nsurgeon\n");
  review::CooccurrenceCounter counter(en_engine(), t, 3);
  std::string_view field = "She thanked the nurse and he met a mechanic";
  counter.add_record(std::span(&field, 1));
  const auto& c = counter.counts();
  auto f = *pk->group_index("female"), m = *pk->group_index("male");
  CHECK(c.words == 7);
  CHECK(c.context_total[f] == 3);
  CHECK(c.context_total[m] == 6);
  CHECK(c.occurrences == std::vector<uint64_t>{1, 1, 0});
  CHECK(c.target_total[0][f] == 1);
  CHECK(c.target_total[0][m] == 1);
  CHECK(c.target_total[1][f] == 0);
  CHECK(c.target_total[1][m] == 1);

  review::AssociationOptions o;
  o.prior = 7;
  auto a = review::compute_associations(c, o);
  REQUIRE(a.targets[0].pairs.size() == 3);  // female-male, female-neutral, male-neutral
  CHECK(a.targets[0].alpha == Approx(1.0));
  CHECK(a.targets[0].pairs[0].stat.z == Approx(0.318454).epsilon(1e-5));
  CHECK(a.targets[0].pairs[0].too_few);  // 2 co-occurrences, below the default 10
  CHECK_FALSE(a.targets[0].pairs[0].p.has_value());
  CHECK(a.targets[2].pairs.empty());  // surgeon does not occur: no statistic
}

TEST_CASE("group words: multiword forms, clitics, names only when capitalised") {
  auto pk = en_pack();
  auto t = targets("nurse\n");
  review::CooccurrenceCounter counter(en_engine(), t, 1);
  // "mother's" is a female form with a clitic; "emma" in lower case is not a name;
  // "nurse's" counts as the target nurse.
  std::string_view fields[] = {"mother's nurse's", "emma nurse", "Emma nurse"};
  counter.add_record(fields);
  const auto& c = counter.counts();
  auto f = *pk->group_index("female");
  CHECK(c.target_total[0][f] == 2);  // fields 1 and 3; a window never crosses fields
  CHECK(c.occurrences[0] == 3);
  CHECK(c.words == 4);  // nurse's, emma, nurse, nurse
}

TEST_CASE("group words are the engine's mentions: protected spans are not group words") {
  // Invented demo sentences, for the mechanics. Each holds a group form inside a span the
  // engine protects: a protected phrase of the pack (en-gender protect.txt), a URL, inline
  // code. The engine counts no mention there, so neither does the counter (before, it
  // matched the pack's lexicon itself and took them for group words).
  auto engine = en_engine();
  auto f = *engine->pack()->group_index("female"), m = *engine->pack()->group_index("male");
  for (std::string_view field :
       {"Mother Nature sent rain on the nurse.", "See https://example.org/she/nurse for the rota.",
        "Type `his` and then ask the nurse."}) {
    INFO(field);
    Alone a = count_alone(engine, std::span(&field, 1));
    CHECK(a.engine.before[f] == 0);
    CHECK(a.engine.before[m] == 0);
    CHECK(a.engine.protected_spans >= 1);
    check_same_mentions(a);
    CHECK(a.counts.words == a.word_tokens);  // every word is a word of the corpus
    CHECK(a.counts.context_total[f] + a.counts.context_total[m] == 0);
  }
}

TEST_CASE("group words are the engine's mentions: the user's protect patterns apply") {
  // Invented demo sentence: "Duke" is a male form of the pack, inside a street name that a
  // --protect pattern covers.
  std::string_view field = "She walked to Duke Street with the nurse.";
  auto plain = en_engine(), guarded = en_engine({"Duke Street"});
  auto f = *plain->pack()->group_index("female"), m = *plain->pack()->group_index("male");
  Alone a = count_alone(plain, std::span(&field, 1));
  CHECK(a.engine.before[f] == 1);
  CHECK(a.engine.before[m] == 1);
  check_same_mentions(a);
  Alone b = count_alone(guarded, std::span(&field, 1));
  CHECK(b.engine.before[f] == 1);
  CHECK(b.engine.before[m] == 0);
  check_same_mentions(b);
  // By hand, window 10: She(0, female) walked to Duke Street with the nurse: N = 7 words,
  // all in the female context, none in the male one.
  CHECK(b.counts.words == 7);
  CHECK(b.counts.context_total[f] == 7);
  CHECK(b.counts.context_total[m] == 0);
  CHECK(b.counts.target_total[0][f] == 1);
}

TEST_CASE("group words are the engine's mentions: first names need its person evidence") {
  // Invented demo sentences. "Will" and "Hope" are listed first names (en-gender names.txt)
  // that are also common words; at a sentence start before "you" they are not people, and
  // the engine counts no mention, so the counter (which before took any capitalised listed
  // name for a group word) counts none either. As a vocative after "Dear", "Hope" names a
  // person and counts.
  auto engine = en_engine();
  auto f = *engine->pack()->group_index("female"), m = *engine->pack()->group_index("male");
  for (std::string_view field :
       {"Will you call the nurse before noon?", "Hope you can ask the nurse."}) {
    INFO(field);
    Alone a = count_alone(engine, std::span(&field, 1));
    CHECK(a.engine.before[f] + a.engine.before[m] == 0);
    check_same_mentions(a);
    CHECK(a.counts.words == a.word_tokens);
  }
  std::string_view dear = "Dear Hope, the nurse called.";
  Alone a = count_alone(engine, std::span(&dear, 1));
  CHECK(a.engine.before[f] == 1);
  check_same_mentions(a);
  CHECK(a.counts.target_total[0][f] == 1);
}

TEST_CASE("group words are the engine's mentions: guarded records count theirs") {
  // Invented demo sentence with a guard phrase of the pack (en-gender guards.txt, medical):
  // the engine counts the record's mentions but does not rewrite them, and the audit counts
  // them as mentions too (README: the audit measures the text as it is).
  auto engine = en_engine();
  auto f = *engine->pack()->group_index("female");
  std::string_view field = "She is pregnant and saw the nurse.";
  Alone a = count_alone(engine, std::span(&field, 1));
  REQUIRE(a.engine.guard != nullptr);
  CHECK(a.engine.edits.empty());
  CHECK(a.engine.before[f] == 1);
  check_same_mentions(a);
  CHECK(a.counts.target_total[0][f] == 1);
}

TEST_CASE("group words are the engine's mentions: a multiword mention is one group word") {
  // Invented demo sentences. "flight attendant" is one neutral form of the pack: the engine
  // lists it as one mention over both words, and neither word is context. Across fields, the
  // counter takes each field's own mentions (a window never crosses fields).
  auto engine = en_engine();
  auto n = *engine->pack()->group_index("neutral"), f = *engine->pack()->group_index("female");
  std::string_view fields[] = {"The nurse thanked her.", "The flight attendant asked the nurse."};
  Alone a = count_alone(engine, fields);
  REQUIRE(a.engine.mentions.size() == 2);
  CHECK(a.engine.mentions[1].field == 1);
  CHECK(fields[1].substr(a.engine.mentions[1].begin,
                         a.engine.mentions[1].end - a.engine.mentions[1].begin) ==
        "flight attendant");
  // By hand, window 10: field 0 has The nurse thanked (female context: 3 words, nurse 1);
  // field 1 has The, asked, the, nurse (neutral context: 4 words, nurse 1).
  CHECK(a.word_tokens - a.counts.words == 3);  // her, flight, attendant
  CHECK(a.counts.context_total[f] == 3);
  CHECK(a.counts.context_total[n] == 4);
  CHECK(a.counts.target_total[0][f] == 1);
  CHECK(a.counts.target_total[0][n] == 1);
}

TEST_CASE("exact test: hand-computed tables, p = 1 without skew, small with a strong one") {
  // Two words in each context, the target twice, both in a's: the hypergeometric law of
  // k_a is 1/6, 4/6, 1/6 (by hand); with n_a = n_b, k_a = 0 is as extreme as 2, so p = 1/3.
  review::PairTable tab;
  tab.only_a = tab.only_b = 2;
  tab.y_only_a = 2;
  CHECK(review::exact_p(tab, 0.5, 10) == Approx(1.0 / 3).epsilon(1e-12));
  tab.y_only_a = 1;
  tab.y_only_b = 1;
  CHECK(review::exact_p(tab, 0.5, 10) == Approx(1.0).epsilon(1e-12));
  // No co-occurrence: one possible outcome, p = 1 whatever the context sizes (the old test
  // gave 0.001 here, as n_a != n_b made z != 0 and permuted labels shrank it).
  review::PairTable none;
  none.only_a = 50;
  none.only_b = 500;
  CHECK(review::exact_p(none, 0.01, 100) == 1.0);
  // Lopsided counts of a large corpus: far in the tail, yet not 0 (summed in log space).
  review::PairTable far;
  far.only_a = 200000;
  far.only_b = 170000;
  far.y_only_a = 500;
  far.y_only_b = 100;
  double p_far = review::exact_p(far, 1, 100);
  CHECK(p_far > 0);
  CHECK(p_far < 1e-40);
  // Shared words only: every outcome has y_a = y_b.
  review::PairTable shared;
  shared.shared = 8;
  shared.y_shared = 3;
  CHECK(review::exact_p(shared, 0.5, 10) == 1.0);

  auto t = targets("nurse\nmechanic\n");
  auto engine = en_engine();
  review::CooccurrenceCounter skewed(engine, t, 5), even(engine, t, 5);
  for (int i = 0; i < 30; ++i) {
    std::string_view a = "She is the nurse on the ward", b = "He is the mechanic in the shop";
    skewed.add_record(std::span(&a, 1));
    skewed.add_record(std::span(&b, 1));
    std::string_view c = "He is the nurse on the ward", d = "She is the mechanic in the shop";
    even.add_record(std::span(&a, 1));
    even.add_record(std::span(&b, 1));
    even.add_record(std::span(&c, 1));
    even.add_record(std::span(&d, 1));
  }
  review::AssociationOptions o;
  auto s1 = review::compute_associations(skewed.counts(), o);
  const auto& p = s1.targets[0].pairs[0];
  CHECK(p.stat.z > 2);
  REQUIRE(p.p.has_value());
  // 30 nurses all with she, none with he, contexts of equal size: p is near 2 * 2^-30.
  CHECK(*p.p < 1e-6);
  CHECK(*p.p > 0);
  CHECK(s1.targets[1].pairs[0].stat.z < -2);
  auto e = review::compute_associations(even.counts(), o);
  CHECK(e.targets[0].pairs[0].stat.z == 0.0);
  CHECK(*e.targets[0].pairs[0].p == 1.0);
  o.min_cooccurrences = 61;  // 60 nurses with either group: too few
  auto few = review::compute_associations(skewed.counts(), o);
  CHECK(few.targets[0].pairs[0].too_few);
  CHECK_FALSE(few.targets[0].pairs[0].p.has_value());
}

TEST_CASE("target lists: variants, comments, duplicates refused with the line") {
  auto t = review::parse_targets("# roles\nNurse nurses  # both\n\nchef\n", "list.txt");
  REQUIRE(t.ok());
  CHECK(t->labels == std::vector<std::string>{"nurse", "chef"});
  CHECK(t->variants[0] == std::vector<std::string>{"nurse", "nurses"});
  auto bad = review::parse_targets("nurse\nchef nurse\n", "list.txt");
  REQUIRE_FALSE(bad.ok());
  CHECK(bad.error().message() == "list.txt:2: target word 'nurse' is listed twice");
  CHECK_FALSE(review::parse_targets("# nothing\n", "empty.txt").ok());
}

TEST_CASE("target lists: a word the pack rewrites is refused with the line") {
  auto pk = en_pack();
  // One-word forms and names, also before a clitic, are group words to the counter.
  for (const char* word : {"Mother", "mother's", "emma"}) {
    INFO(word);
    auto bad =
        review::parse_targets(std::string("nurse\nchef ") + word + "\n", "list.txt", pk.get());
    REQUIRE_FALSE(bad.ok());
    CHECK(bad.error().message().rfind("list.txt:2: target word '", 0) == 0);
    CHECK(bad.error().reason.find("the pack rewrites (en-gender/") != std::string::npos);
  }
  // The first word of a multiword form ("flight attendant") is no form of its own; without a
  // pack, no check.
  CHECK(review::parse_targets("nurse\nflight\n", "list.txt", pk.get()).ok());
  CHECK(review::parse_targets("nurse\nmother\n", "list.txt").ok());
}

TEST_CASE("the shipped target list holds no form or name of the pack") {
  auto pk = en_pack();
  const std::string* data = pk->file("targets.data");
  REQUIRE(data != nullptr);
  auto t = review::parse_targets(*data, "targets.data");
  REQUIRE(t.ok());
  CHECK(t->labels.size() >= 40);
  for (const auto& vs : t->variants)
    for (const auto& v : vs) {
      INFO(v);
      CHECK(pk->lookup(v) == nullptr);
    }
}

TEST_CASE("JSON round trip of an association report") {
  auto pk = en_pack();
  auto t = targets("nurse\nchef\n");
  review::CooccurrenceCounter counter(en_engine(), t, 4);
  std::string_view f = "She asked the nurse and he asked the chef";
  counter.add_record(std::span(&f, 1));
  review::AssociationReport r;
  r.pack_name = pk->name();
  r.groups = pk->groups();
  r.targets = t;
  r.options.min_cooccurrences = 1;
  r.protect = {"Duke Street", "[0-9]+"};
  r.corpora.push_back(review::compute_associations(counter.counts(), r.options));
  r.corpora.back().label = "before";
  TempDir d;
  write_file(d.file("a.json"), review::render_associations(r));
  auto back = review::read_associations(d.file("a.json"));
  REQUIRE(back.ok());
  CHECK(review::render_associations(*back) == review::render_associations(r));
  CHECK(back->protect == r.protect);
  write_file(d.file("bad.json"), "{\"schema\": \"other\"}");
  auto bad = review::read_associations(d.file("bad.json"));
  REQUIRE_FALSE(bad.ok());
  CHECK(bad.error().message().find("bad.json") != std::string::npos);
}

TEST_CASE("two-sided augmentation through the CLI drives every target's skew to zero") {
  // A corpus written for this test: each record mentions female or male words (pronouns,
  // nouns, names) near occupation words, with a strong skew (nurses with she, mechanics
  // with he). No guard phrase, protected span or multiword form, so augment mode adds an
  // exact mirror of every record with mentions.
  TempDir d;
  const char* she[] = {"She", "Emma", "Her mother", "My aunt"};
  const char* he[] = {"He", "James", "His father", "My uncle"};
  const char* f_jobs[] = {"nurse", "secretary", "teacher", "librarian"};
  const char* m_jobs[] = {"mechanic", "engineer", "pilot", "captain"};
  std::string corpus;
  int id = 0;
  auto add = [&](const char* who, const char* job) {
    corpus += "{\"id\": " + std::to_string(id++) + ", \"text\": \"" + who + " works as the " + job +
              " at the depot and likes the early shift.\"}\n";
  };
  for (int j = 0; j < 4; ++j)
    for (int r = 0; r < 6; ++r) {  // five in six records follow the stereotype
      add(she[r % 4], r < 5 ? f_jobs[j] : m_jobs[j]);
      add(he[r % 4], r < 5 ? m_jobs[j] : f_jobs[j]);
    }
  corpus += "{\"id\": 99, \"text\": \"The depot needs a driver for the late shift.\"}\n";
  write_file(d.file("in.jsonl"), corpus);
  std::string bin = evenhand::testing::evenhand_binary();
  REQUIRE(shell(bin + " run --pack en-gender --in " + d.file("in.jsonl") + " --out " +
                d.file("aug.jsonl") + " --manifest " + d.file("m.json") + " --quiet") == 0);
  REQUIRE(shell(bin + " associations --pack en-gender --in " + d.file("in.jsonl") + " --after " +
                d.file("aug.jsonl") + " --out " + d.file("assoc.json")) == 0);
  auto r = review::read_associations(d.file("assoc.json"));
  REQUIRE(r.ok());
  REQUIRE(r->corpora.size() == 2);
  CHECK(r->corpora[1].records == 48 * 2 + 1);
  size_t measured = 0, skewed_before = 0;
  for (size_t t = 0; t < r->targets.labels.size(); ++t) {
    const auto& before = r->corpora[0].targets[t];
    const auto& after = r->corpora[1].targets[t];
    if (after.pairs.empty()) continue;
    INFO(r->targets.labels[t]);
    ++measured;
    if (std::fabs(before.pairs[0].stat.z) > 1) ++skewed_before;
    REQUIRE(after.pairs[0].a == 0);
    REQUIRE(after.pairs[0].b == 1);
    CHECK(after.y[0] == after.y[1]);
    CHECK(after.pairs[0].stat.z == 0.0);
    if (after.y[0] + after.y[1] >= 10)
      CHECK(*after.pairs[0].p == 1.0);
    else
      CHECK(after.pairs[0].too_few);
  }
  CHECK(measured == 9);       // eight occupations and "driver"
  CHECK(skewed_before == 8);  // every occupation was skewed before
  CHECK(r->corpora[1].context[0] == r->corpora[1].context[1]);
}

TEST_CASE("associations --protect: the run's patterns keep mentions out, a bad one is refused") {
  // An invented demo record: "Duke" (a male form of the pack) inside a street name.
  TempDir d;
  write_file(d.file("in.jsonl"), "{\"text\": \"She walked to Duke Street with the nurse.\"}\n");
  write_file(d.file("targets.txt"), "nurse\n");
  std::string common = "associations --pack en-gender --in " + d.file("in.jsonl") + " --targets " +
                       d.file("targets.txt");
  auto ran = evenhand::testing::run_evenhand(d, common + " --out " + d.file("plain.json"));
  REQUIRE(ran.code == 0);
  ran = evenhand::testing::run_evenhand(
      d, common + " --protect 'Duke Street' --out " + d.file("protected.json"));
  REQUIRE(ran.code == 0);
  auto plain = review::read_associations(d.file("plain.json"));
  auto prot = review::read_associations(d.file("protected.json"));
  REQUIRE(plain.ok());
  REQUIRE(prot.ok());
  // By hand, window 10: without the pattern, She and Duke are group words (N = 6, both
  // groups see all six); with it, Duke is a word of the female context (N = 7).
  const auto& p = plain->corpora[0];
  const auto& q = prot->corpora[0];
  CHECK(p.words == 6);
  CHECK(p.context == std::vector<uint64_t>{6, 6, 0});
  CHECK(q.words == 7);
  CHECK(q.context == std::vector<uint64_t>{7, 0, 0});
  CHECK(q.targets[0].y == std::vector<uint64_t>{1, 0, 0});
  CHECK(prot->protect == std::vector<std::string>{"Duke Street"});
  CHECK(plain->protect.empty());

  ran = evenhand::testing::run_evenhand(d, common + " --protect '(' --out " + d.file("bad.json"));
  CHECK(ran.code == 2);
  CHECK(ran.err.find("protected pattern 1") != std::string::npos);
  CHECK(std::count(ran.err.begin(), ran.err.end(), '\n') == 1);
  CHECK_FALSE(std::filesystem::exists(d.file("bad.json")));
}
