#include "pipeline/run.h"

#include <algorithm>
#include <atomic>
#include <chrono>
#include <filesystem>
#include <map>
#include <memory>
#include <optional>
#include <semaphore>
#include <system_error>
#include <thread>

#include "audit/json_writer.h"
#include "corpus/json_pointer.h"
#include "corpus/records.h"
#include "io/output_set.h"
#include "io/paths.h"
#include "io/sink.h"
#include "io/source.h"
#include "pipeline/budget.h"
#include "pipeline/queue.h"
#include "pipeline/record_processor.h"

namespace evenhand::pipeline {

namespace {

constexpr size_t kBatchBytes = 256 << 10;
constexpr size_t kBatchRecords = 4096;
constexpr size_t kFirstRejectionsKept = 100;

struct InRec {
  uint32_t begin = 0;
  uint32_t len = 0;
  uint8_t eol_len = 0;
  bool oversized = false;
  uint64_t line = 0;
  uint64_t offset = 0;
  uint64_t size = 0;
};

struct Batch {
  uint64_t seq = 0;
  uint32_t input = 0;
  std::string data;
  std::vector<InRec> recs;
  bool last = false;       // the end of all inputs; carries no records
  bool input_end = false;  // the last batch of `input`
  FileInfo input_info;
  uint64_t blank_lines = 0;
  uint64_t raw_pos = 0;   // raw bytes consumed over all inputs when this batch was cut
  uint64_t budgeted = 0;  // bytes taken from the in-flight byte budget
  std::optional<Error> fatal;

  std::string out, edits, quarantine, rejects;
  audit::Stats stats;
  balance::Tally tally;
  std::vector<Error> rejections;
};

using BatchPtr = std::unique_ptr<Batch>;

// The ordered hand-over from workers to the writer.
class Reorder {
 public:
  void put(BatchPtr b) {
    {
      std::lock_guard<std::mutex> lock(mu_);
      uint64_t seq = b->seq;
      done_.emplace(seq, std::move(b));
    }
    cv_.notify_all();
  }
  BatchPtr take(uint64_t seq) {
    std::unique_lock<std::mutex> lock(mu_);
    cv_.wait(lock, [&] { return done_.count(seq) > 0; });
    auto it = done_.find(seq);
    BatchPtr b = std::move(it->second);
    done_.erase(it);
    return b;
  }

 private:
  std::mutex mu_;
  std::condition_variable cv_;
  std::map<uint64_t, BatchPtr> done_;
};

void reject_line(const Error& e, const std::string& code, std::string& out) {
  audit::JsonWriter w(out);
  w.begin_object().key("input").value(e.file);
  if (e.line) w.key("line").value(*e.line);
  if (e.offset) w.key("offset").value(*e.offset);
  w.key("reason").value(code).key("message").value(e.reason).end_object();
  out += '\n';
}

class Runner {
 public:
  Runner(const RunOptions& o, const rewrite::Engine& e) : opt_(o), engine_(e) {}

  Result<RunResult> run();

 private:
  Status prepare();
  void reader_main();
  void worker_main();
  void process_batch(Batch& b, RecordProcessor& proc);
  Status write_batch(Batch& b);
  // After the first kUnmatchedWarnAfter records: reports each --field that matched nothing.
  void warn_unmatched();
  // At the end: the usage error for a --field that matched nothing (unless allowed).
  Status unmatched_fields() const;
  // Starts the workers and the reader. When the system refuses a thread, returns an error
  // (kind output); the threads already started are left for stop_all() and joining.
  Status start_threads(std::thread& reader, std::vector<std::thread>& workers);
  // Writes the batches in order until the last one or the first error.
  Status write_all(std::chrono::steady_clock::time_point t0);
  Status publish();
  void stop_all();
  BatchPtr new_batch(uint32_t input);
  void send(BatchPtr b);
  balance::Tally empty_tally() const {
    const pack::CompiledPack* p = engine_.pack();
    if (!p) return {};
    return balance::Tally::make(p->axis(), p->groups(), p->sha256());
  }

  const RunOptions& opt_;
  const rewrite::Engine& engine_;
  unsigned threads_ = 1;
  std::vector<corpus::PointerPattern> patterns_;
  std::vector<std::string> names_;  // inputs as named in messages ("-" is "<stdin>")
  std::optional<corpus::PointerPattern> id_pattern_;

  std::unique_ptr<io::Sink> out_, edits_, quarantine_, rejects_;

  std::unique_ptr<std::counting_semaphore<>> tokens_;
  std::unique_ptr<ByteBudget> budget_;  // input bytes of batches sent and not yet written
  unsigned max_in_flight_ = 4;
  WorkQueue<BatchPtr> work_;
  Reorder reorder_;
  std::atomic<bool> stop_{false};
  uint64_t next_seq_ = 0;  // reader side
  uint64_t raw_done_ = 0;  // reader side: raw bytes of finished inputs
  uint64_t raw_total_ = 0;
  bool warned_unmatched_ = false;
  RunResult result_;
};

Status Runner::prepare() {
  if (opt_.inputs.empty()) return make_error(ErrorKind::usage, "", "no input given (--in)");
  if (opt_.output.empty() && opt_.mode != Mode::tally)
    return make_error(ErrorKind::usage, "", "no output given (--out)");
  if (opt_.mode == Mode::balance && opt_.plan == nullptr)
    return make_error(ErrorKind::usage, "", "balance mode needs a plan");
  if (opt_.format == Format::jsonl) {
    for (const auto& f : opt_.fields) {
      auto p = corpus::PointerPattern::parse(f);
      if (!p.ok()) return std::move(p).error();
      patterns_.push_back(std::move(*p));
    }
    if (!opt_.id_pointer.empty()) {
      auto p = corpus::PointerPattern::parse(opt_.id_pointer);
      if (!p.ok()) return std::move(p).error();
      id_pattern_ = std::move(*p);
    }
  } else if (opt_.provenance) {
    return make_error(ErrorKind::usage, "", "--provenance needs JSONL records (--format jsonl)");
  }
  if (opt_.mode == Mode::substitute && !(opt_.rate >= 0 && opt_.rate <= 1)) {
    return make_error(ErrorKind::usage, "", "--rate must be between 0 and 1");
  }
  if (opt_.max_record_bytes == 0 || opt_.max_record_bytes > kMaxRecordBytesLimit) {
    return make_error(ErrorKind::usage, "", "--max-record-bytes must be between 1 and 2 GiB");
  }
  if (opt_.threads > kMaxThreads) {
    return make_error(ErrorKind::usage, "",
                      "--threads must be at most " + std::to_string(kMaxThreads));
  }
  int stdin_count = 0;
  for (const auto& in : opt_.inputs) stdin_count += in == "-";
  if (stdin_count > 1) return make_error(ErrorKind::usage, "-", "stdin given as input twice");
  for (const auto& in : opt_.inputs) names_.push_back(in == "-" ? "<stdin>" : in);

  // No output may overwrite an input or another output.
  std::vector<io::NamedPath> ins, outs;
  for (const auto& in : opt_.inputs) ins.push_back({in, "--in"});
  outs.push_back({opt_.output, "--out"});
  outs.push_back({opt_.edits_path, "--edits"});
  outs.push_back({opt_.quarantine_path, "--quarantine"});
  outs.push_back({opt_.rejects_path, "--rejects"});
  EVENHAND_TRY(io::check_outputs_distinct(ins, outs));

  auto make = [](const std::string& path, const io::SinkOptions& so,
                 std::unique_ptr<io::Sink>& into) -> Status {
    auto s = io::Sink::create(path, so);
    if (!s.ok()) return std::move(s).error();
    into = std::move(*s);
    return ok_status();
  };
  if (!opt_.output.empty()) EVENHAND_TRY(make(opt_.output, opt_.output_options, out_));
  io::SinkOptions plain;
  if (!opt_.edits_path.empty()) EVENHAND_TRY(make(opt_.edits_path, plain, edits_));
  if (!opt_.quarantine_path.empty() && opt_.on_bad == OnBadRecord::quarantine) {
    EVENHAND_TRY(make(opt_.quarantine_path, plain, quarantine_));
  }
  if (!opt_.rejects_path.empty()) EVENHAND_TRY(make(opt_.rejects_path, plain, rejects_));
  return ok_status();
}

BatchPtr Runner::new_batch(uint32_t input) {
  tokens_->acquire();
  auto b = std::make_unique<Batch>();
  b->seq = next_seq_++;
  b->input = input;
  b->data.reserve(kBatchBytes + 1024);
  return b;
}

void Runner::send(BatchPtr b) {
  b->budgeted = b->data.size();
  if (!budget_->acquire(b->budgeted)) return;  // stopped
  work_.push(std::move(b));
}

void Runner::reader_main() {
  uint32_t n_inputs = static_cast<uint32_t>(opt_.inputs.size());
  for (uint32_t i = 0; i < n_inputs && !stop_; ++i) {
    const std::string& path = opt_.inputs[i];
    auto src = io::Source::open(path);
    if (!src.ok()) {
      BatchPtr b = new_batch(i);
      b->fatal = std::move(src).error();
      send(std::move(b));
      return;
    }
    io::Source& source = **src;
    corpus::RecordReader reader(source, opt_.framing, opt_.max_record_bytes);
    uint64_t records = 0;
    uint64_t blanks_sent = 0;
    BatchPtr b = new_batch(i);
    corpus::RawRecord rec;
    for (;;) {
      if (stop_) return;
      auto k = reader.next(rec);
      if (!k.ok()) {
        b->fatal = std::move(k).error();
        send(std::move(b));
        return;
      }
      if (*k == corpus::RecordReader::Kind::end) break;
      InRec r;
      r.line = rec.line;
      r.offset = rec.offset;
      r.size = rec.size;
      if (*k == corpus::RecordReader::Kind::oversized) {
        r.oversized = true;
      } else {
        r.begin = static_cast<uint32_t>(b->data.size());
        r.len = static_cast<uint32_t>(rec.bytes.size());
        r.eol_len = static_cast<uint8_t>(rec.eol.size());
        b->data.append(rec.bytes);
        b->data.append(rec.eol);
      }
      b->recs.push_back(r);
      ++records;
      if (b->data.size() >= kBatchBytes || b->recs.size() >= kBatchRecords) {
        b->blank_lines = reader.blank_lines() - blanks_sent;
        blanks_sent = reader.blank_lines();
        b->raw_pos = raw_done_ + source.raw_offset();
        send(std::move(b));
        b = new_batch(i);
      }
    }
    b->blank_lines = reader.blank_lines() - blanks_sent;
    b->input_end = true;
    FileInfo& info = b->input_info;
    info.path = path;
    info.compression = io::compression_name(source.compression());
    info.bytes = source.raw_offset();
    info.sha256 = source.raw_sha256();
    info.records = records;
    info.data_bytes = reader.data_bytes();
    raw_done_ += source.raw_offset();
    b->raw_pos = raw_done_;
    send(std::move(b));
  }
  if (stop_) return;
  BatchPtr last = new_batch(0);
  last->last = true;
  send(std::move(last));
}

void Runner::process_batch(Batch& b, RecordProcessor& proc) {
  if (b.fatal || b.last) return;
  const std::string& path = names_[b.input];
  RecordOutput out{&b.out, edits_ ? &b.edits : nullptr, &b.stats,
                   opt_.mode == Mode::tally ? &b.tally : nullptr};
  if (opt_.mode == Mode::tally) b.tally = empty_tally();
  b.out.reserve(b.data.size() * (opt_.mode == Mode::augment ? 2 : 1) + 64);
  b.stats.blank_lines = b.blank_lines;
  for (const InRec& r : b.recs) {
    if (stop_) return;
    Error err;
    bool bad = false;
    if (r.oversized) {
      err =
          make_error(ErrorKind::input, path,
                     "record of " + std::to_string(r.size) + " bytes is over --max-record-bytes " +
                         std::to_string(opt_.max_record_bytes));
      err.line = r.line;
      bad = true;
    } else {
      std::string_view rec(b.data.data() + r.begin, r.len);
      std::string_view eol(b.data.data() + r.begin + r.len, r.eol_len);
      RecordOrigin origin{&path, r.line, r.offset};
      Status s = proc.process(rec, eol, origin, out);
      if (!s.ok()) {
        err = std::move(s).error();
        bad = true;
        if (quarantine_) {
          ++b.stats.quarantined;
          b.quarantine.append(rec);
          b.quarantine.append(eol.empty() ? std::string_view("\n") : eol);
        }
      }
    }
    if (bad) {
      std::string code = rejection_code(err);
      b.stats.reject(code);
      ++b.stats.records_read;
      if (rejects_) reject_line(err, code, b.rejects);
      b.rejections.push_back(std::move(err));
      if (opt_.on_bad == OnBadRecord::fail) return;
    }
  }
}

void Runner::worker_main() {
  RecordProcessor proc(opt_, patterns_, id_pattern_, engine_);
  BatchPtr b;
  while (work_.pop(b)) {
    process_batch(*b, proc);
    reorder_.put(std::move(b));
  }
}

void Runner::warn_unmatched() {
  const audit::Stats& st = result_.stats;
  const uint64_t parsed = st.records_read - st.records_rejected;  // rejected: never selected
  if (warned_unmatched_ || !opt_.on_unmatched_field || parsed < kUnmatchedWarnAfter) return;
  warned_unmatched_ = true;
  for (size_t p = 0; p < opt_.fields.size() && opt_.format == Format::jsonl; ++p)
    if (p >= st.pattern_records.size() || st.pattern_records[p] == 0)
      opt_.on_unmatched_field(opt_.fields[p], parsed);
}

Status Runner::unmatched_fields() const {
  const audit::Stats& st = result_.stats;
  const uint64_t parsed = st.records_read - st.records_rejected;
  if (opt_.allow_unmatched_fields || opt_.format != Format::jsonl || parsed == 0)
    return ok_status();
  for (size_t p = 0; p < opt_.fields.size(); ++p) {
    if (p < st.pattern_records.size() && st.pattern_records[p] > 0) continue;
    return make_error(ErrorKind::usage, "",
                      "--field " + opt_.fields[p] + " matched no value in any of the " +
                          std::to_string(parsed) +
                          " records read (check the pointer; --allow-unmatched-field runs anyway)");
  }
  return ok_status();
}

Status Runner::write_batch(Batch& b) {
  if (b.fatal) return *b.fatal;
  if (!b.rejections.empty()) {
    if (opt_.on_bad == OnBadRecord::fail) return b.rejections.front();
    for (auto& e : b.rejections) {
      if (opt_.on_rejection) opt_.on_rejection(e);
      if (result_.first_rejections.size() < kFirstRejectionsKept) {
        result_.first_rejections.push_back(e);
      }
    }
  }
  if (out_ && !b.out.empty()) EVENHAND_TRY(out_->write(b.out));
  if (edits_ && !b.edits.empty()) EVENHAND_TRY(edits_->write(b.edits));
  if (quarantine_ && !b.quarantine.empty()) EVENHAND_TRY(quarantine_->write(b.quarantine));
  if (rejects_ && !b.rejects.empty()) EVENHAND_TRY(rejects_->write(b.rejects));
  result_.stats.merge(b.stats);
  if (opt_.mode == Mode::tally && !b.tally.groups.empty())
    EVENHAND_TRY(result_.tally.merge(b.tally));
  if (b.input_end) result_.inputs.push_back(b.input_info);
  return ok_status();
}

// Finishes every output, describes them in result_, lets the caller add its own (the
// manifest), then renames the whole set into place; any failure leaves no final name.
Status Runner::publish() {
  struct Named {
    io::Sink* sink;
    const char* role;
    uint64_t records;
  };
  const audit::Stats& st = result_.stats;
  const Named named[] = {{out_.get(), "corpus", st.records_written},
                         {edits_.get(), "edits", st.audit_lines},
                         {quarantine_.get(), "quarantine", st.quarantined},
                         {rejects_.get(), "rejects", st.records_rejected}};
  io::OutputSet set;
  for (const auto& n : named)
    if (n.sink) set.add(*n.sink);
  EVENHAND_TRY(set.finish());
  for (const auto& n : named) {
    if (!n.sink) continue;
    FileInfo f;
    f.path = n.sink->path();
    f.compression = io::compression_name(n.sink->compression());
    f.bytes = n.sink->bytes_written();
    f.sha256 = n.sink->sha256();
    f.records = n.records;
    f.role = n.role;
    result_.outputs.push_back(std::move(f));
  }
  if (opt_.before_publish) {
    Status s = opt_.before_publish(result_, set);
    if (!s.ok()) {
      set.abort();
      return s;
    }
  }
  return set.commit();
}

void Runner::stop_all() {
  stop_ = true;
  work_.close();
  budget_->close();
  tokens_->release(static_cast<std::ptrdiff_t>(max_in_flight_) + 2);
}

Status Runner::start_threads(std::thread& reader, std::vector<std::thread>& workers) {
  // Workers first: until the reader runs they wait on the work queue, which stop_all()
  // closes, while a reader could be blocked reading a pipe.
  try {
    workers.reserve(threads_);
    for (unsigned i = 0; i < threads_; ++i) workers.emplace_back([this] { worker_main(); });
    reader = std::thread([this] { reader_main(); });
  } catch (const std::system_error& e) {
    const size_t started = workers.size() + (reader.joinable() ? 1 : 0);
    return make_error(ErrorKind::output, "",
                      "the system refused thread " + std::to_string(started + 1) + " of " +
                          std::to_string(threads_ + 1) + " (" + std::to_string(threads_) +
                          " workers and a reader): " + e.what() + "; try fewer --threads");
  }
  return ok_status();
}

Status Runner::write_all(std::chrono::steady_clock::time_point t0) {
  auto last_progress = t0;
  for (uint64_t seq = 0;; ++seq) {
    BatchPtr b = reorder_.take(seq);
    bool last = b->last;
    Status status = write_batch(*b);
    uint64_t raw_pos = b->raw_pos;
    uint64_t budgeted = b->budgeted;
    b.reset();
    budget_->release(budgeted);
    tokens_->release();
    if (!status.ok() || last) return status;
    warn_unmatched();
    if (opt_.on_progress) {
      auto now = std::chrono::steady_clock::now();
      if (now - last_progress >= std::chrono::milliseconds(250)) {
        last_progress = now;
        Progress p;
        p.records = result_.stats.records_read;
        p.raw_bytes = raw_pos;
        p.raw_total = raw_total_;
        p.seconds = std::chrono::duration<double>(now - t0).count();
        opt_.on_progress(p);
      }
    }
  }
}

Result<RunResult> Runner::run() {
  auto t0 = std::chrono::steady_clock::now();
  EVENHAND_TRY(prepare());
  threads_ = effective_threads(opt_.threads);
  result_.threads = threads_;
  max_in_flight_ = 2 * threads_ + 2;
  tokens_ = std::make_unique<std::counting_semaphore<>>(max_in_flight_);
  budget_ = std::make_unique<ByteBudget>(in_flight_byte_cap(threads_, opt_.max_record_bytes));
  result_.batch_byte_cap = budget_->cap();
  result_.tally = empty_tally();
  if (const auto* p = engine_.pack()) {
    result_.stats.before.resize(p->groups().size());
    result_.stats.after.resize(p->groups().size());
  }
  for (const auto& in : opt_.inputs) {
    std::error_code ec;
    if (in == "-" || !std::filesystem::is_regular_file(in, ec)) {
      raw_total_ = 0;
      break;
    }
    raw_total_ += std::filesystem::file_size(in, ec);
  }

  std::thread reader;
  std::vector<std::thread> workers;
  Status status = start_threads(reader, workers);
  if (status.ok()) status = write_all(t0);
  stop_all();
  if (reader.joinable()) reader.join();
  for (auto& w : workers) w.join();
  if (status.ok()) status = unmatched_fields();
  if (!status.ok()) {
    for (auto* s : {&out_, &edits_, &quarantine_, &rejects_})
      if (*s) (*s)->abort();
    return std::move(status).error();
  }

  result_.peak_batch_bytes = budget_->peak();
  result_.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  EVENHAND_TRY(publish());
  return std::move(result_);
}

}  // namespace

uint64_t in_flight_byte_cap(unsigned threads, uint64_t max_record_bytes) {
  return std::max(1u, threads) * (max_record_bytes + 2 * kBatchBytes);
}

unsigned effective_threads(unsigned threads) {
  if (threads > 0) return threads;
  unsigned hw = std::thread::hardware_concurrency();
  return hw == 0 ? 1 : hw;
}

Result<RunResult> run(const RunOptions& options, const rewrite::Engine& engine) {
  Runner runner(options, engine);
  return runner.run();
}

}  // namespace evenhand::pipeline
