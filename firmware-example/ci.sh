#!/usr/bin/env bash
# Firmware example CI, called from .ci/run (runs from any directory).
# Builds the Cortex-M4F binary, prints and checks its flash and static RAM,
# replays the invented short night in QEMU (mps2-an386) and on the host, and
# requires both to print the same event lines.
set -euo pipefail
cd "$(dirname "$0")/.."

step() { printf '\n== %s ==\n' "$*"; }
TARGET=thumbv7em-none-eabihf
ELF="target/$TARGET/firmware/mps2-replay"
LOG=firmware-example/replay/short-night.csv
OUT=target/firmware-ci
# The issue's aim: flash under 64 KiB and static RAM (.data + .bss) under
# 16 KiB for the whole example, guard included (README, "Memory and flash").
# The stack is not in these figures; the QEMU run prints its peak on stderr.
FLASH_BUDGET=$((64 * 1024))
RAM_BUDGET=$((16 * 1024))
mkdir -p "$OUT"

step "firmware: tools (qemu-system-arm)"
if ! command -v qemu-system-arm >/dev/null 2>&1; then
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq --no-install-recommends qemu-system-arm >/dev/null
fi
qemu-system-arm --version | head -n 1
rustup target add "$TARGET" >/dev/null 2>&1 || true

step "firmware: target builds and lints"
cargo clippy -p standfast-firmware --target "$TARGET" --release --features mps2 --lib --bins -- -D warnings
cargo build -p standfast-firmware --target "$TARGET" --features defmt --lib
cargo build -p standfast-firmware --target "$TARGET" --profile firmware --features mps2 --bin mps2-replay

step "firmware: size of $ELF"
# Flash: every allocated section with contents (vector table, code, read-only
# data, and the initial image of .data). Static RAM: writable allocated
# sections (.data, .bss, .uninit). Stack comes on top; the QEMU run measures it.
readelf -SW "$ELF" | sed 's/^ *\[ *[0-9]*\] *//' | awk -v flash_budget="$FLASH_BUDGET" -v ram_budget="$RAM_BUDGET" '
  function hex(s,   i, n) {
    n = 0; s = tolower(s)
    for (i = 1; i <= length(s); i++) n = n * 16 + index("0123456789abcdef", substr(s, i, 1)) - 1
    return n
  }
  $1 ~ /^\./ && NF >= 7 {
    name = $1; type = $2; size = hex($5); flags = $7
    if (flags !~ /A/ || size == 0) next
    printf "  %-16s %-9s %7d bytes  flags %s\n", name, type, size, flags
    if (type != "NOBITS") flash += size
    if (flags ~ /W/) ram += size
  }
  END {
    printf "flash: %d bytes (%.1f KiB of %d KiB budget)\n", flash, flash / 1024, flash_budget / 1024
    printf "static RAM: %d bytes (%.1f KiB of %d KiB budget)\n", ram, ram / 1024, ram_budget / 1024
    if (flash > flash_budget || ram > ram_budget) { print "over budget"; exit 1 }
  }'

step "firmware: QEMU mps2-an386 replay of $LOG"
rc=0
timeout 120 qemu-system-arm -M mps2-an386 -cpu cortex-m4 -nographic \
  -semihosting-config "enable=on,target=native,arg=mps2-replay,arg=$LOG" \
  -kernel "$ELF" >"$OUT/qemu-events.txt" 2>"$OUT/qemu-stderr.txt" || rc=$?
cat "$OUT/qemu-events.txt"
cat "$OUT/qemu-stderr.txt"
if [ "$rc" -ne 0 ]; then
  echo "QEMU replay failed with exit code $rc"
  exit 1
fi

step "firmware: host replay of the same log, compared line by line"
cargo run -q -p standfast-firmware --example host_replay -- "$LOG" >"$OUT/host-events.txt"
diff -u "$OUT/host-events.txt" "$OUT/qemu-events.txt"
echo "emulator and host agree: $(grep -c '^event ' "$OUT/qemu-events.txt") events"

step "firmware: host-sim replay (standfast replay) of the same rig and log, guard events compared"
# The guard's own events (printed by the board as `guard event ...`, without
# the backstop's limit stages and the station's health events) must equal
# what host-sim's replay of the same core guard gives for the same rig
# (replay/rig.toml = example_rig_spec() and example_guard_config()) and the same
# inputs, bit for bit (replay/profile.toml; replay/short-night-host.csv made by
# replay/make_host_inputs.py). host-sim reads no comment line, so the log goes
# in without its `#` line.
grep -v '^#' "$LOG" >"$OUT/short-night.csv"
cargo run -q --release -p standfast-sim -- replay --rig firmware-example/replay/rig.toml \
  --profile firmware-example/replay/profile.toml --events "$OUT/host-sim-events.txt" \
  "$OUT/short-night.csv" firmware-example/replay/short-night-host.csv >"$OUT/host-sim-summary.txt"
sed -n 's/^guard //p' "$OUT/qemu-events.txt" >"$OUT/qemu-guard-events.txt"
if [ ! -s "$OUT/qemu-guard-events.txt" ]; then
  echo "the emulated run printed no guard events: nothing to compare"
  exit 1
fi
diff -u "$OUT/host-sim-events.txt" "$OUT/qemu-guard-events.txt"
echo "emulator and host-sim agree: $(wc -l <"$OUT/qemu-guard-events.txt") guard events"

step "firmware: a HardFault ends the emulated run with a failure"
rc=0
timeout 60 qemu-system-arm -M mps2-an386 -cpu cortex-m4 -nographic \
  -semihosting-config "enable=on,target=native,arg=mps2-replay,arg=$LOG,arg=--selftest-hardfault" \
  -kernel "$ELF" >"$OUT/qemu-hardfault.txt" 2>&1 || rc=$?
cat "$OUT/qemu-hardfault.txt"
if [ "$rc" -ne 4 ]; then
  echo "expected exit code 4 from the HardFault handler, got $rc"
  exit 1
fi
