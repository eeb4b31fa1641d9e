#!/usr/bin/env bash
# Instruction counts of the replay, per log row, with callgrind (valgrind):
# deterministic, whatever the machine's load. See BENCHMARKS.md, "Replay".
#
#   bash host-sim/benches/callgrind.sh [HOURS ...]     (default: 1 2)
#
# For each length (hours of the invented 50 Hz benchmark log, 180 000 rows
# an hour, the same generator and seed as `cargo bench --bench replay`) it
# prints:
#   * the whole `standfast replay` process (summary as JSON, event lines
#     and HTML report written; no verdict CSV), instructions per row;
#   * one run of the replay bench (`host-sim/benches/replay.rs`,
#     STANDFAST_BENCH_RUNS=1), its counters dumped at the entry of
#     `replay_pass`: the parse-only count (start-up and `parse_pass`,
#     the merge read to the end) and the full replay's count (both threads),
#     per row, and their ratio;
#   * with two or more lengths, the cost per added row between the first
#     two (the per-row figure with the fixed start-up and report costs
#     taken out).
# With STANDFAST_MAX_PARSE_PER_ROW and/or STANDFAST_MAX_FULL_PER_ROW set
# (instructions a row), it fails (exit 1) when the parse-only or the full
# replay's count a row is above them at any length: CI's regression limits
# (.ci/run).
# Needs valgrind (callgrind_annotate is not used: the totals are read from
# the output files). Builds the release binary and the bench with cargo;
# honours CARGO_TARGET_DIR. To count other builds (an older commit's, for a
# before-and-after), set STANDFAST_BIN and STANDFAST_BENCH_BIN to their
# `standfast` and replay-bench executables: nothing is built then. Logs go to target/standfast-bench/ of the
# workspace (as the bench's), outputs to a temporary folder.
set -euo pipefail
root=$(cd "$(dirname "$0")/../.." && pwd)
target=${CARGO_TARGET_DIR:-$root/target}
hours=("$@")
[ ${#hours[@]} -gt 0 ] || hours=(1 2)
command -v valgrind >/dev/null || { echo "valgrind is not installed" >&2; exit 3; }

cd "$root"
if [ -n "${STANDFAST_BIN:-}" ] && [ -n "${STANDFAST_BENCH_BIN:-}" ]; then
    bin=$STANDFAST_BIN
    bench=$STANDFAST_BENCH_BIN
else
    cargo build --release -p standfast-sim --bin standfast >&2
    bench=$(cargo bench -p standfast-sim --bench replay --no-run --message-format=json 2>/dev/null |
        sed -n 's/.*"executable":"\([^"]*\)".*/\1/p' | tail -1)
    bin=$target/release/standfast
fi
[ -x "$bench" ] || { echo "cannot find the replay bench executable" >&2; exit 3; }
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT

total() { sed -n 's/^totals: *//p; s/^summary: *//p' "$1" | head -1; }
per_row() { awk -v a="$1" -v n="$2" 'BEGIN { printf "%.0f", a / n }'; }

echo "date: $(date -u '+%Y-%m-%d %H:%M UTC'); load: $(uptime | sed 's/.*load average: //')"
echo "commit: $(git rev-parse --short HEAD)$(git diff --quiet HEAD -- . || echo ' (with changes)')"
declare -a whole_at rows_at
for h in "${hours[@]}"; do
    # The bench's folder name: Rust's Display of the f64 hours (1 → "1h").
    name=$(awk -v h="$h" 'BEGIN { s = sprintf("%.6g", h); print s "h" }')
    dir=$root/target/standfast-bench/$name
    if [ ! -f "$dir/bench-log-profile.toml" ]; then
        "$bin" gen-demo --bench --seed 1 --hours "$h" --out "$dir" >&2
    fi
    rows=$(($(wc -l <"$dir/bench-24h-50hz.csv") - 1))

    valgrind --tool=callgrind --callgrind-out-file="$out/whole.cg" \
        "$bin" replay --rig host-sim/demo/rig.toml --profile "$dir/bench-log-profile.toml" \
        --json --events "$out/events.txt" --html "$out/report.html" >"$out/summary.json" 2>"$out/whole.log"
    whole=$(total "$out/whole.cg")

    rm -f "$out"/bench.cg*
    STANDFAST_BENCH_HOURS=$h STANDFAST_BENCH_RUNS=1 valgrind --tool=callgrind \
        --callgrind-out-file="$out/bench.cg" --dump-before='*replay_pass*' \
        "$bench" >"$out/bench.txt" 2>"$out/bench.log"
    # Dump 1: start-up and the parse pass; the final dump: the replay pass.
    parse=$(total "$out/bench.cg.1")
    replay=$(total "$out/bench.cg")
    echo "log ${name}: $rows rows"
    echo "  whole process (standfast replay --json --events --html): $whole instructions, $(per_row "$whole" "$rows") a row"
    echo "  bench, parse only (start-up + parse_pass): $parse, $(per_row "$parse" "$rows") a row"
    echo "  bench, full replay (replay_pass, both threads): $replay, $(per_row "$replay" "$rows") a row"
    awk -v r="$replay" -v p="$parse" -v w="$whole" 'BEGIN {
        printf "  full replay / parse only: %.2f; whole process / parse only: %.2f\n", r / p, w / p }'
    over=0
    if [ -n "${STANDFAST_MAX_PARSE_PER_ROW:-}" ] && [ "$(per_row "$parse" "$rows")" -gt "$STANDFAST_MAX_PARSE_PER_ROW" ]; then
        echo "  parse only: $(per_row "$parse" "$rows") a row, above the limit of $STANDFAST_MAX_PARSE_PER_ROW" >&2
        over=1
    fi
    if [ -n "${STANDFAST_MAX_FULL_PER_ROW:-}" ] && [ "$(per_row "$replay" "$rows")" -gt "$STANDFAST_MAX_FULL_PER_ROW" ]; then
        echo "  full replay: $(per_row "$replay" "$rows") a row, above the limit of $STANDFAST_MAX_FULL_PER_ROW" >&2
        over=1
    fi
    [ "$over" = 0 ] || exit 1
    whole_at+=("$whole")
    rows_at+=("$rows")
done
if [ ${#hours[@]} -ge 2 ]; then
    awk -v w1="${whole_at[0]}" -v w2="${whole_at[1]}" -v n1="${rows_at[0]}" -v n2="${rows_at[1]}" 'BEGIN {
        printf "whole process, per added row between the first two lengths: %.0f\n", (w2 - w1) / (n2 - n1) }'
fi
