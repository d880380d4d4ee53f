#include "cli/common.h"

#include <pthread.h>
#include <signal.h>
#include <unistd.h>

#include <cmath>
#include <ctime>
#include <filesystem>
#include <iostream>
#include <sstream>
#include <system_error>
#include <thread>

#include "cli/cli.h"
#include "io/sink.h"
#include "io/temp_files.h"

namespace evenhand::cli {

void print_error(const std::string& message) {
  if (pipe_closed()) return;  // the reader went away: end quietly, as on SIGPIPE
  std::cerr << "evenhand: " << message << "\n";
}

int exit_code_for(ErrorKind kind) {
  switch (kind) {
    case ErrorKind::usage:
      return kUsage;
    case ErrorKind::input:
      return kInput;
    case ErrorKind::output:
      return kOutput;
    case ErrorKind::pack:
      return kPack;
    case ErrorKind::internal:
      return kInternal;
  }
  return kInternal;
}

int report(const Error& e) {
  print_error(e.message());
  return exit_code_for(e.kind);
}

std::string help_text(const std::string& command, const std::string& synopsis,
                      const po::options_description& options) {
  std::ostringstream os;
  os << "Usage: evenhand " << command << " " << synopsis << "\n\n" << options << "\n";
  return os.str();
}

std::string default_text(const std::string& value) {
  return value;
}

std::string default_text(double value) {
  char buf[32];
  auto [end, ec] = std::to_chars(buf, buf + sizeof buf, value);
  return ec == std::errc() ? std::string(buf, end) : std::string("?");
}

std::string default_text(const std::vector<std::string>& value) {
  std::string out;
  for (const auto& v : value) out += (out.empty() ? "" : ",") + v;
  return out;
}

int parse_args(const std::string& command, const std::string& synopsis,
               const po::options_description& options, const std::vector<std::string>& args,
               po::variables_map& vm, const po::positional_options_description* positional) {
  try {
    auto parser = po::command_line_parser(args).options(options);
    if (positional) parser.positional(*positional);
    po::store(parser.run(), vm);
    if (vm.count("help")) {
      std::cout << help_text(command, synopsis, options);
      return kOk;
    }
    po::notify(vm);
  } catch (const po::error& e) {
    print_error(command + ": " + e.what() + " (see 'evenhand " + command + " --help')");
    return kUsage;
  }
  return -1;
}

void bad_number(const std::string& name, const std::string& what, const std::string& text) {
  throw po::error(name + " must be " + what + ", not '" + text + "'");
}

namespace {

std::string shortest(double d) {
  std::ostringstream os;
  os << d;
  return os.str();
}

// "a number from 0 to 1", "a number above 0 and below 1", "a number above 0".
std::string describe(const RealRange& r) {
  bool closed = !r.lo_open && !r.hi_open;
  std::string s = "a number ";
  s += r.lo_open ? "above " : closed ? "from " : "at least ";
  s += shortest(r.lo);
  if (std::isinf(r.hi)) return s;
  if (closed) return s + " to " + shortest(r.hi);
  return s + " and " + (r.hi_open ? "below " : "at most ") + shortest(r.hi);
}

}  // namespace

po::typed_value<std::string>* real_number(const std::string& name, double* out, RealRange r) {
  return po::value<std::string>()->value_name("X")->notifier(
      [name, out, r](const std::string& text) {
        double v = 0;
        auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), v);
        bool fits = ec == std::errc() && end == text.data() + text.size() && std::isfinite(v) &&
                    (r.lo_open ? v > r.lo : v >= r.lo) && (r.hi_open ? v < r.hi : v <= r.hi);
        if (!fits) bad_number(name, describe(r), text);
        *out = v;
      });
}

std::string utc_now() {
  std::time_t t = std::time(nullptr);
  std::tm tm{};
  gmtime_r(&t, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

int check_outputs(const std::string& command, const std::vector<io::NamedPath>& inputs,
                  const std::vector<io::NamedPath>& outputs) {
  Status s = io::check_outputs_distinct(inputs, outputs);
  if (s.ok()) return -1;
  print_error(command + ": " + s.error().message());
  return kUsage;
}

void add_pack_input(std::vector<io::NamedPath>& inputs, const std::string& pack) {
  std::error_code ec;
  if (!pack.empty() && std::filesystem::is_directory(pack, ec)) inputs.push_back({pack, "--pack"});
}

void install_stop_signals() {
  sigset_t set;
  sigemptyset(&set);
  bool any = false;
  for (int sig : {SIGINT, SIGTERM, SIGHUP, SIGPIPE}) {
    struct sigaction old;
    if (::sigaction(sig, nullptr, &old) == 0 && old.sa_handler == SIG_IGN) continue;
    sigaddset(&set, sig);
    any = true;
  }
  if (!any || ::pthread_sigmask(SIG_BLOCK, &set, nullptr) != 0) return;
  // Blocked in every thread (they all start later and inherit the mask), so only this one
  // receives them, as an ordinary thread that may lock the temporary-file registry.
  try {
    std::thread([set] {
      int sig = 0;
      while (::sigwait(&set, &sig) != 0) {
      }
      io::abandon_temp_files();
      ::_exit(128 + sig);
    }).detach();
  } catch (const std::system_error&) {
    // No thread to wait for them: the signals keep their default action (the run ends at
    // once and may leave its hidden temporary files, as after SIGKILL).
    ::pthread_sigmask(SIG_UNBLOCK, &set, nullptr);
  }
}

bool pipe_closed() {
  sigset_t pending;
  sigemptyset(&pending);
  return ::sigpending(&pending) == 0 && sigismember(&pending, SIGPIPE) == 1;
}

int stop_for_closed_pipe() {
  io::abandon_temp_files();
  return 128 + SIGPIPE;
}

Status write_file_atomic(const std::string& path, const std::string& text) {
  io::SinkOptions so;
  so.compression = io::Compression::none;
  auto sink = io::Sink::create(path, so);
  if (!sink.ok()) return std::move(sink).error();
  EVENHAND_TRY((*sink)->write(text));
  return (*sink)->commit();
}

}  // namespace evenhand::cli
