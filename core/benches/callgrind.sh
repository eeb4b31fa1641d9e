#!/usr/bin/env bash
# Instruction counts of the core's sky scan, payload envelope and park
# search, and of the guard's step (callgrind, deterministic whatever the machine's load): one call of
# each on the invented rig of `core/benches/sky.rs`, counted inclusively in
# its own `once_*` function. See BENCHMARKS.md, "Core".
#
#   bash core/benches/callgrind.sh
#
# Needs valgrind; builds the bench with cargo (honours CARGO_TARGET_DIR).
set -euo pipefail
root=$(cd "$(dirname "$0")/../.." && pwd)
cd "$root"
command -v valgrind >/dev/null || { echo "valgrind is not installed" >&2; exit 3; }
bench_exe() {
    cargo bench -p standfast --bench "$1" --no-run --message-format=json 2>/dev/null |
        sed -n 's/.*"executable":"\([^"]*\)".*/\1/p' | tail -1
}
bench=$(bench_exe sky)
guard_bench=$(bench_exe guard)
[ -x "$bench" ] || { echo "cannot find the sky bench executable" >&2; exit 3; }
[ -x "$guard_bench" ] || { echo "cannot find the guard bench executable" >&2; exit 3; }
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT
echo "date: $(date -u '+%Y-%m-%d %H:%M UTC'); load: $(uptime | sed 's/.*load average: //')"
echo "commit: $(git rev-parse --short HEAD)$(git diff --quiet HEAD -- . || echo ' (with changes)')"
STANDFAST_BENCH_ONCE=1 valgrind --tool=callgrind --callgrind-out-file="$out/sky.cg" "$bench" \
    >"$out/out.txt" 2>"$out/log.txt"
cat "$out/out.txt"
callgrind_annotate --inclusive=yes "$out/sky.cg" 2>/dev/null |
    awk '/:sky::once_/ && /\[/ { gsub(",", "", $1); n = $0; sub(/.*::once_/, "", n); sub(/ .*/, "", n); printf "%-22s %12d instructions\n", n, $1 }'
# The guard's step (core/benches/guard.rs): one minute at 50 Hz, 3,000
# steps, with step and with step_into; instructions a step.
STANDFAST_BENCH_ONCE=1 valgrind --tool=callgrind --callgrind-out-file="$out/guard.cg" "$guard_bench" \
    >"$out/guard.txt" 2>"$out/guard-log.txt"
cat "$out/guard.txt"
callgrind_annotate --inclusive=yes "$out/guard.cg" 2>/dev/null |
    awk '/:guard::once_/ && /\[/ { gsub(",", "", $1); n = $0; sub(/.*::once_/, "", n); sub(/ .*/, "", n); printf "%-22s %12d instructions, %.0f a step\n", n, $1, $1 / 3000 }'
