#!/usr/bin/env bash
# Firmware example CI, called from .ci/run (runs from any directory).
# Builds the Cortex-M4F binary, prints and checks its flash and static RAM,
# replays the invented short night in QEMU (mps2-an386) and on the host, and
# requires both to print the same event lines.
set -euo pipefail
cd "$(dirname "$0")/.."

step() { printf '\n== %s ==\n' "$*"; }
TARGET=thumbv7em-none-eabihf
# Cargo's target directory (CARGO_TARGET_DIR when set, as cargo uses it).
TARGET_DIR="${CARGO_TARGET_DIR:-target}"
ELF="$TARGET_DIR/$TARGET/firmware/mps2-replay"
# The same station, rig and guard without the replay harness (size only).
STATION_ELF="$TARGET_DIR/$TARGET/firmware/mps2-station"
# The square-root self-test, a binary of its own (not part of the image).
SQRT_ELF="$TARGET_DIR/$TARGET/firmware/mps2-selftest-sqrt"
LOG=firmware-example/replay/short-night.csv
OUT="$TARGET_DIR/firmware-ci"
# Memory (README, "Memory and flash"), for the whole example image, guard
# and replay harness included, in the release firmware profile (`firmware`):
# - hard limits, CI fails above them: flash 64 KiB, static RAM (.data +
#   .bss) 16 KiB, static RAM + measured peak stack 24 KiB;
# - aims (issue 15): flash <= 48 KiB and static RAM + peak stack <= 16 KiB,
#   both met by the whole image and enforced: CI fails above either (the
#   harness-free image, mps2-station, is reported beside it);
#   STANDFAST_FIRMWARE_AIMS=report turns both back into reports.
# The peak stack is measured in the QEMU runs (the stack is painted at reset;
# the binary reports the deepest word overwritten on stderr).
FLASH_BUDGET=$((64 * 1024))
RAM_BUDGET=$((16 * 1024))
RAM_STACK_LIMIT=$((24 * 1024))
FLASH_AIM=$((48 * 1024))
RAM_STACK_AIM=$((16 * 1024))
mkdir -p "$OUT"

step "firmware: tools (qemu-system-arm, a C compiler for the plug-in, python3, llvm-objdump)"
need=()
command -v qemu-system-arm >/dev/null 2>&1 || need+=(qemu-system-arm)
command -v cc >/dev/null 2>&1 || need+=(gcc libc6-dev)
command -v python3 >/dev/null 2>&1 || need+=(python3)
command -v llvm-objdump >/dev/null 2>&1 || need+=(llvm)
if [ "${#need[@]}" -gt 0 ]; then
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq --no-install-recommends "${need[@]}" >/dev/null
fi
qemu-system-arm --version | head -n 1
rustup target add "$TARGET" >/dev/null 2>&1 || true

step "firmware: target builds and lints"
cargo clippy -p standfast-firmware --target "$TARGET" --release --features mps2 --lib --bins -- -D warnings
cargo build -p standfast-firmware --target "$TARGET" --features defmt --lib
cargo build -p standfast-firmware --target "$TARGET" --profile firmware --features mps2 --bin mps2-replay --bin mps2-station --bin mps2-selftest-sqrt

# Flash: every allocated section with contents (vector table, code, read-only
# data, and the initial image of .data). Static RAM: writable allocated
# sections (.data, .bss, .uninit). Stack comes on top; the QEMU run measures it.
# Prints the sections and totals; writes "flash ram" to $2; fails over the budgets.
section_sizes() {
  readelf -SW "$1" | sed 's/^ *\[ *[0-9]*\] *//' | awk -v flash_budget="$FLASH_BUDGET" -v ram_budget="$RAM_BUDGET" '
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
      printf "%d %d\n", flash, ram > "/dev/stderr"
      if (flash > flash_budget || ram > ram_budget) { print "over budget"; exit 1 }
    }' 2>"$2"
}

step "firmware: size of $ELF"
section_sizes "$ELF" "$OUT/size.txt"
read -r FLASH_BYTES STATIC_RAM_BYTES <"$OUT/size.txt"

step "firmware: size of $STATION_ELF (the station, rig and guard without the replay harness)"
# mps2-station (src/bin/mps2_station.rs) builds the same rig, guard and
# station in place and steps them, with no log reading, CSV parsing, event
# text, square-root self-test or stack measurement: what the example costs a
# board before its own HAL drivers. It must run to its end in QEMU (exit 0).
section_sizes "$STATION_ELF" "$OUT/size-station.txt"
read -r STATION_FLASH_BYTES STATION_RAM_BYTES <"$OUT/size-station.txt"
timeout 60 qemu-system-arm -M mps2-an386 -cpu cortex-m4 -nographic \
  -semihosting-config "enable=on,target=native,arg=mps2-station" -kernel "$STATION_ELF"

step "firmware: no software double precision in the image; square root by the FPU"
# The Cortex-M4F's FPU does single precision only: any f64 operation becomes
# a call into compiler-builtins' soft-float routines (hundreds of
# instructions each). The core keeps the guard's path in f32 (core/src/math.rs:
# its own sin, cos and hypot; libm's f32 routines otherwise; vsqrt.f32), and
# nothing else in the image uses f64 either, so the check is on the whole
# image: no double-precision helper is linked at all (a stricter form of
# "none reachable from the guard step").
llvm-objdump -d --no-show-raw-insn -C "$ELF" >"$OUT/firmware.dis"
DOUBLE_HELPERS='__aeabi_d[a-z0-9]*|__aeabi_[iuf]l?2d|__aeabi_f2d|__aeabi_l2d|__aeabi_ul2d|__(add|sub|mul|div)df3|__extendsfdf2|__truncdfsf2|__fix(uns)?df[sd]i|__float(un)?[sd]idf|__(eq|ne|lt|le|gt|ge|un)df2'
if grep -Eq "^[0-9a-f]+ <(${DOUBLE_HELPERS})>:" "$OUT/firmware.dis" ||
  grep -Eq "^[0-9a-f]+ <compiler_builtins::float::[a-z_]+::__[a-z]+df[0-9a-z]*>:" "$OUT/firmware.dis"; then
  echo "software double precision is linked into $ELF:"
  grep -E "^[0-9a-f]+ <((${DOUBLE_HELPERS})|compiler_builtins::float::[a-z_]+::__[a-z]+df[0-9a-z]*)>:" "$OUT/firmware.dis"
  echo "called from:"
  awk -v re="<((${DOUBLE_HELPERS})|compiler_builtins::float::[a-z_]+::__[a-z]+df[0-9a-z]*)>" '
    /^[0-9a-f]+ <.*>:$/ { fn = $0 }
    /\t(bl|blx|b|b\.w)\t/ && $0 ~ re { match($0, /<[^>]*>/); print "  " fn " -> " substr($0, RSTART, RLENGTH) }' "$OUT/firmware.dis" | sort | uniq -c
  exit 1
fi
if grep -Eq '\.f64\b' "$OUT/firmware.dis"; then
  echo "double-precision FPU instructions in $ELF (the Cortex-M4F has none)"
  exit 1
fi
if ! grep -Eq $'\tvsqrt\\.f32' "$OUT/firmware.dis"; then
  echo "no vsqrt.f32 in $ELF: the core's square root is not the FPU's"
  exit 1
fi
echo "no software double-precision routine linked; $(grep -c $'\tvsqrt\\.f32' "$OUT/firmware.dis") vsqrt.f32"
# The FPU's square root must give libm's bits: every f32 in [1, 4) (all the
# rounding cases of normal numbers) and a stride over the whole range. The
# check is a binary of its own (src/bin/mps2_selftest_sqrt.rs), so that it
# and its reference are not part of the image measured above; it must use
# the same instruction.
llvm-objdump -d --no-show-raw-insn "$SQRT_ELF" >"$OUT/selftest-sqrt.dis"
if ! grep -Eq $'\tvsqrt\\.f32' "$OUT/selftest-sqrt.dis"; then
  echo "no vsqrt.f32 in $SQRT_ELF: it does not test the FPU's square root"
  exit 1
fi
timeout 120 qemu-system-arm -M mps2-an386 -cpu cortex-m4 -nographic \
  -semihosting-config "enable=on,target=native,arg=mps2-selftest-sqrt" \
  -kernel "$SQRT_ELF"

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
# the backstop's limit levels and the station's health events) must equal
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

step "firmware: instructions per guard step, 100 Hz invented night (QEMU plug-in)"
# qemu-plugin/step_count.c, our own plug-in against QEMU's public plug-in API
# (header vendored in qemu-plugin/vendor/), counts every instruction executed
# from the begin mark to the end mark around Guard::step (src/marks.rs): one
# exact count per step. The night is make_short_night.py's script with a row
# every 10 ms, run at the station's 100 Hz set-up (--rate-100hz).
# Aims (issue 15): mean <= 4,000 and 99th percentile <= 40,000 instructions.
STEP_MEAN_AIM=4000
STEP_P99_AIM=40000
cc -shared -fPIC -O2 -Wall -Wextra -Werror -fvisibility=hidden \
  -I firmware-example/qemu-plugin/vendor -o "$OUT/step_count.so" firmware-example/qemu-plugin/step_count.c
mark_addr() {
  readelf -sW -C "$ELF" | awk -v name="standfast_firmware::marks::$1" '$4 == "FUNC" && $8 == name { print "0x" $2 }'
}
BEGIN_MARK=$(mark_addr guard_step_begin)
END_MARK=$(mark_addr guard_step_end)
if [ -z "$BEGIN_MARK" ] || [ -z "$END_MARK" ]; then
  echo "the step marks are not in $ELF (feature step-marks)"
  exit 1
fi
echo "marks: begin $BEGIN_MARK, end $END_MARK"
python3 firmware-example/replay/make_night_100hz.py >"$OUT/night-100hz.csv"
# Percentiles by nearest rank: the value at rank ceil(p/100 * n) of the
# ascending counts (the median is the lower middle value for an even n).
step_stats() {
  sort -n "$1" | awk -v mean_aim="$2" -v p99_aim="$3" '
    function rank(p,   r) { r = p / 100 * NR; return (r == int(r)) ? r : int(r) + 1 }
    { v[NR] = $1; sum += $1 }
    END {
      if (NR == 0) { print "no steps counted"; exit 1 }
      mean = sum / NR
      printf "steps %d  median %d  mean %.0f  p99 %d  max %d  (min %d)\n", NR, v[rank(50)], mean, v[rank(99)], v[NR], v[1]
      if (mean_aim == "") exit 0
      printf "aims: mean <= %d (%s), p99 <= %d (%s)\n", mean_aim, (mean <= mean_aim) ? "met" : "NOT MET", p99_aim, (v[rank(99)] <= p99_aim) ? "met" : "NOT MET"
      if (mean > mean_aim || v[rank(99)] > p99_aim) exit 1
    }'
}
rc=0
timeout 300 qemu-system-arm -M mps2-an386 -cpu cortex-m4 -nographic \
  -plugin "$OUT/step_count.so,begin=$BEGIN_MARK,end=$END_MARK,out=$OUT/steps-100hz.txt" \
  -semihosting-config "enable=on,target=native,arg=mps2-replay,arg=$OUT/night-100hz.csv,arg=--rate-100hz" \
  -kernel "$ELF" >"$OUT/qemu-events-100hz.txt" 2>"$OUT/qemu-stderr-100hz.txt" || rc=$?
cat "$OUT/qemu-stderr-100hz.txt"
if [ "$rc" -ne 0 ]; then
  cat "$OUT/qemu-events-100hz.txt"
  echo "QEMU replay at 100 Hz failed with exit code $rc"
  exit 1
fi
cargo run -q -p standfast-firmware --example host_replay -- "$OUT/night-100hz.csv" --rate-100hz >"$OUT/host-events-100hz.txt"
diff -u "$OUT/host-events-100hz.txt" "$OUT/qemu-events-100hz.txt"
echo "emulator and host agree at 100 Hz: $(grep -c '^event ' "$OUT/qemu-events-100hz.txt") events"
rows=$(sed -n 's/^summary rows=\([0-9]*\) .*/\1/p' "$OUT/qemu-events-100hz.txt")
counted=$(wc -l <"$OUT/steps-100hz.txt")
if [ "$rows" != "$counted" ] || ! grep -q 'unpaired=0 ' "$OUT/qemu-stderr-100hz.txt"; then
  echo "every row must be one counted guard step: rows=$rows counted=$counted"
  exit 1
fi
echo "guard step at 100 Hz, instructions:"
step_stats "$OUT/steps-100hz.txt" "$STEP_MEAN_AIM" "$STEP_P99_AIM"

step "firmware: memory budget (release firmware profile)"
peak_stack() { sed -n 's/^memory stack_peak_bytes=\([0-9]*\)$/\1/p' "$1" | tail -n 1; }
STACK_10HZ=$(peak_stack "$OUT/qemu-stderr.txt")
STACK_100HZ=$(peak_stack "$OUT/qemu-stderr-100hz.txt")
if [ -z "$STACK_10HZ" ] || [ -z "$STACK_100HZ" ]; then
  echo "a QEMU run reported no peak stack"
  exit 1
fi
STACK_BYTES=$((STACK_10HZ > STACK_100HZ ? STACK_10HZ : STACK_100HZ))
RAM_STACK_BYTES=$((STATIC_RAM_BYTES + STACK_BYTES))
aim() { if [ "$1" -le "$2" ]; then echo "met"; else echo "NOT MET"; fi; }
kib() { awk -v b="$1" 'BEGIN { printf "%.1f", b / 1024 }'; }
printf 'flash                 %6d bytes (%s KiB)  aim <= %d KiB: %s\n' "$FLASH_BYTES" \
  "$(kib "$FLASH_BYTES")" $((FLASH_AIM / 1024)) "$(aim "$FLASH_BYTES" "$FLASH_AIM")"
printf 'static RAM            %6d bytes\n' "$STATIC_RAM_BYTES"
printf 'peak stack            %6d bytes (10 Hz run %d, 100 Hz run %d)\n' "$STACK_BYTES" "$STACK_10HZ" "$STACK_100HZ"
printf 'static RAM + stack    %6d bytes (%s KiB)  aim <= %d KiB: %s; limit %d KiB\n' "$RAM_STACK_BYTES" \
  "$(kib "$RAM_STACK_BYTES")" $((RAM_STACK_AIM / 1024)) "$(aim "$RAM_STACK_BYTES" "$RAM_STACK_AIM")" \
  $((RAM_STACK_LIMIT / 1024))
if [ "$RAM_STACK_BYTES" -gt "$RAM_STACK_LIMIT" ]; then
  echo "static RAM + peak stack over the ${RAM_STACK_LIMIT}-byte limit"
  exit 1
fi
printf 'without the harness   flash %d bytes (%s KiB)  aim <= %d KiB: %s; static RAM %d bytes (mps2-station)\n' \
  "$STATION_FLASH_BYTES" "$(kib "$STATION_FLASH_BYTES")" $((FLASH_AIM / 1024)) \
  "$(aim "$STATION_FLASH_BYTES" "$FLASH_AIM")" "$STATION_RAM_BYTES"
AIMS="${STANDFAST_FIRMWARE_AIMS:-enforce}"
if [ "$AIMS" != report ] && [ "$RAM_STACK_BYTES" -gt "$RAM_STACK_AIM" ]; then
  echo "static RAM + peak stack over the ${RAM_STACK_AIM}-byte aim (enforced; issue 15)"
  exit 1
fi
if [ "$AIMS" != report ] && [ "$FLASH_BYTES" -gt "$FLASH_AIM" ]; then
  echo "flash over the ${FLASH_AIM}-byte aim (enforced; issue 15)"
  exit 1
fi

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
