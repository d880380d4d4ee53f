# Shared helpers for bench/passthrough.sh and bench/augment.sh (sourced, not run).
# Provides: tool checks, the input-size cache, one timed run under /usr/bin/time -v,
# medians, load reporting. Every run's raw figures are appended to $BENCH_LOG.

BENCH_DIR="$(cd "$(dirname "${BASH_SOURCE[0]}")" && pwd)"
ROOT="$(cd "$BENCH_DIR/.." && pwd)"
DATA="${BENCH_DATA:-$BENCH_DIR/data}"
WORK="${BENCH_WORK:-$BENCH_DIR/work}"
EVENHAND="${EVENHAND:-$ROOT/build/evenhand}"
RUNS="${BENCH_RUNS:-3}"
mkdir -p "$WORK"

die() {
  echo "$(basename "$0"): $*" >&2
  exit 1
}

# check_tools: zstd, python3, GNU time (Debian package `time`) and the evenhand binary.
check_tools() {
  command -v zstd >/dev/null || die "zstd is missing (apt-get install zstd)"
  command -v python3 >/dev/null || die "python3 is missing"
  if [[ ! -x /usr/bin/time ]]; then
    if [[ $(id -u) == 0 ]] && command -v apt-get >/dev/null; then
      echo "installing the Debian package 'time' for /usr/bin/time" >&2
      apt-get install -y -q time >/dev/null || die "could not install the package 'time'"
    else
      die "/usr/bin/time is missing: install the Debian package 'time'"
    fi
  fi
  # grep without -q: -q may stop reading early, and under pipefail the SIGPIPE of the writer
  # would read as "not GNU time".
  /usr/bin/time -v true 2>&1 | grep "Maximum resident set size" > /dev/null ||
    die "/usr/bin/time is not GNU time (no -v report)"
  [[ -x "$EVENHAND" ]] ||
    die "$EVENHAND not found: cmake --preset release && cmake --build --preset release"
}

# need_input NAME: dies unless bench/data/NAME exists.
need_input() {
  [[ -s "$DATA/$1" ]] || die "$DATA/$1 missing: run bash bench/make_data.sh"
}

# raw_bytes FILE.zst: uncompressed size in bytes, cached in bench/work/.
raw_bytes() {
  local f="$1" cache
  cache="$WORK/$(basename "$f").size"
  if [[ ! -s "$cache" || "$cache" -ot "$f" ]]; then
    zstd -dc "$f" | wc -c > "$cache"
  fi
  tr -d ' \n' < "$cache"
}

# load1: the one-minute load average.
load1() { cut -d' ' -f1 /proc/loadavg; }

# wait_for_low_load [LIMIT] [MAX_SECONDS]: waits (up to MAX_SECONDS, default 300) until the
# one-minute load is below LIMIT (default 0.5); prints the load it ended with.
wait_for_low_load() {
  local limit="${1:-0.5}" max="${2:-${BENCH_WAIT:-300}}" waited=0
  while awk -v l="$(load1)" -v m="$limit" 'BEGIN{exit !(l >= m)}' && ((waited < max)); do
    sleep 10
    waited=$((waited + 10))
  done
  load1
}

# start_bench INPUT...: what every driver does first: checks the tools, waits for a quiet
# machine when BENCH_QUIET_LOAD is set (e.g. 0.5; up to BENCH_WAIT s), and makes sure each
# named corpus of bench/data exists.
start_bench() {
  check_tools
  if [[ -n "${BENCH_QUIET_LOAD:-}" ]]; then
    echo "waiting for the 1-minute load to fall below $BENCH_QUIET_LOAD (now $(load1))" >&2
    wait_for_low_load "$BENCH_QUIET_LOAD" > /dev/null
  fi
  local input
  for input in "$@"; do need_input "$input"; done
}

# timed LABEL CMD...: runs CMD under /usr/bin/time -v; sets T_WALL (seconds), T_CPU (user +
# system seconds, children included) and T_RSS_MB (peak resident set of the largest process,
# MB = 2^20 bytes); CMD's stderr is left in $WORK/last.stderr and appended to $WORK/stderr.log. Dies when CMD fails.
timed() {
  local label="$1"
  shift
  local tf="$WORK/time.$$"
  if ! /usr/bin/time -v -o "$tf" "$@" 2>"$WORK/last.stderr"; then
    cat "$WORK/last.stderr" >> "$WORK/stderr.log"
    tail -n 20 "$WORK/last.stderr" >&2
    die "$label failed: $*"
  fi
  cat "$WORK/last.stderr" >> "$WORK/stderr.log"
  T_WALL=$(awk '/Elapsed \(wall clock\) time/ {
      n = split($NF, p, ":"); s = 0; for (i = 1; i <= n; i++) s = s * 60 + p[i]; print s }' "$tf")
  T_RSS_MB=$(awk '/Maximum resident set size/ { printf "%.1f", $NF / 1024 }' "$tf")
  T_CPU=$(awk '/(User|System) time \(seconds\)/ { s += $NF } END { printf "%.2f", s }' "$tf")
  rm -f "$tf"
  printf '%s\t%s\twall_s=%s\tcpu_s=%s\trss_mb=%s\tload=%s\n' "$(date -u +%FT%TZ)" "$label" \
    "$T_WALL" "$T_CPU" "$T_RSS_MB" "$(load1)" >> "$BENCH_LOG"
}

# median V1 V2 ...: the middle value (lower middle for an even count).
median() {
  printf '%s\n' "$@" | sort -g | awk '{ v[NR] = $1 } END { print v[int((NR + 1) / 2)] }'
}

# max V1 V2 ...
max() { printf '%s\n' "$@" | sort -g | tail -n 1; }

# mbps BYTES SECONDS: decimal MB (10^6 bytes) per second, one decimal.
mbps() { awk -v b="$1" -v s="$2" 'BEGIN { printf "%.1f", (s > 0 ? b / 1e6 / s : 0) }'; }

# ratio A B: A / B with two decimals.
ratio() { awk -v a="$1" -v b="$2" 'BEGIN { printf "%.2f", (b > 0 ? a / b : 0) }'; }

# warm FILE: reads FILE once so every timed run starts from the page cache.
warm() { cat "$1" > /dev/null; }

machine_line() {
  local cpu mem
  cpu=$(awk -F': ' '/^model name/ { print $2; exit }' /proc/cpuinfo)
  mem=$(awk '/^MemTotal/ { printf "%.1f GiB", $2 / 1048576 }' /proc/meminfo)
  echo "nproc $(nproc), ${cpu:-unknown CPU}, RAM $mem"
}

# binary_line: the evenhand version, the binary's modification time and the checkout's commit.
binary_line() {
  echo "$("$EVENHAND" --version), binary built $(date -u -r "$EVENHAND" '+%F %H:%M UTC')," \
    "checkout $(git -C "$ROOT" rev-parse --short HEAD 2>/dev/null || echo unknown)"
}
