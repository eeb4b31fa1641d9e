#!/usr/bin/env bash
# C ABI CI (core/ffi), called from .ci/run (runs from any directory).
# Installs its tools, checks the committed header against a fresh cbindgen
# run, compiles the header as C99 and C++17, builds the static and shared
# libraries, runs the C and Python examples on the firmware example's
# invented short night and requires the same event lines as
# `standfast replay --events`, and cross-links the same C file for
# Cortex-M4F against the thumbv7em-none-eabihf static library.
set -euo pipefail
cd "$(dirname "$0")/../.."

step() { printf '\n== %s ==\n' "$*"; }
OUT=target/ffi-ci
TARGET=thumbv7em-none-eabihf
CBINDGEN_VERSION=0.29.4          # the header is compared byte for byte: pin the generator
CFLAGS_STRICT="-Wall -Wextra -Werror -pedantic"
RIG=firmware-example/replay/rig.toml
LOG=firmware-example/replay/short-night.csv
HOST_INPUTS=firmware-example/replay/short-night-host.csv
mkdir -p "$OUT"

step "ffi: tools (gcc, g++, arm-none-eabi-gcc with newlib, qemu-system-arm, python3, cbindgen $CBINDGEN_VERSION)"
need=()
command -v gcc >/dev/null 2>&1 || need+=(gcc)
command -v g++ >/dev/null 2>&1 || need+=(g++)
command -v python3 >/dev/null 2>&1 || need+=(python3)
command -v arm-none-eabi-gcc >/dev/null 2>&1 || need+=(gcc-arm-none-eabi)
[ -e /usr/lib/arm-none-eabi/newlib/libc.a ] || need+=(libnewlib-arm-none-eabi)
command -v qemu-system-arm >/dev/null 2>&1 || need+=(qemu-system-arm)
if [ "${#need[@]}" -gt 0 ]; then
  export DEBIAN_FRONTEND=noninteractive
  apt-get update -qq
  apt-get install -y -qq --no-install-recommends "${need[@]}" >/dev/null
fi
if ! cbindgen --version 2>/dev/null | grep -q " $CBINDGEN_VERSION\$"; then
  cargo install cbindgen --locked --version "$CBINDGEN_VERSION"
fi
rustup target add "$TARGET" >/dev/null 2>&1 || true
gcc --version | head -n 1
arm-none-eabi-gcc --version | head -n 1
python3 --version
cbindgen --version

step "ffi: the committed header is what cbindgen generates"
cbindgen --quiet --config core/ffi/cbindgen.toml --output "$OUT/standfast.h" core/ffi
if ! diff -u core/ffi/include/standfast.h "$OUT/standfast.h"; then
  echo "core/ffi/include/standfast.h is out of date; regenerate it with:"
  echo "  cbindgen --config core/ffi/cbindgen.toml --output core/ffi/include/standfast.h core/ffi"
  exit 1
fi

step "ffi: the header compiles as C99 and C++17 (-Wall -Wextra -Werror -pedantic)"
cat >"$OUT/header_check.c" <<'EOF'
#include "standfast.h"
int main(void) {
    SfVerdict v;
    SfInputs in;
    SfError e;
    (void)v; (void)in; (void)e;
    return sf_abi_version() == SF_ABI_VERSION ? 0 : 1;
}
EOF
for std_define in "" "-DSTANDFAST_FFI_STD"; do
  gcc -std=c99 $CFLAGS_STRICT $std_define -Icore/ffi/include -c "$OUT/header_check.c" -o "$OUT/header_check_c.o"
  g++ -std=c++17 $CFLAGS_STRICT $std_define -Icore/ffi/include -x c++ -c "$OUT/header_check.c" -o "$OUT/header_check_cpp.o"
done
echo "C99 and C++17: ok"

step "ffi: Rust tests of the boundary, with the heap convenience"
cargo test -q -p standfast-ffi --features std

step "ffi: host static and shared libraries"
cargo build -q -p standfast-ffi --release --features std
ls -l target/release/libstandfast_ffi.a target/release/libstandfast_ffi.so

step "ffi: the rig image and the host-sim replay of the short night"
cargo run -q --release -p standfast-sim -- rig-image "$RIG" --out "$OUT/rig.sfri"
grep -v '^#' "$LOG" >"$OUT/short-night.csv"
cargo run -q --release -p standfast-sim -- replay --rig "$RIG" \
  --profile firmware-example/replay/profile.toml --events "$OUT/host-sim-events.txt" \
  "$OUT/short-night.csv" "$HOST_INPUTS" >"$OUT/host-sim-summary.txt"
cat "$OUT/host-sim-events.txt"
if [ ! -s "$OUT/host-sim-events.txt" ]; then
  echo "the host replay printed no events: nothing to compare"
  exit 1
fi

step "ffi: C example (gcc, C99, static library) against standfast replay --events"
# Native libraries the Rust static library needs on this host: rustc's list
# (cargo rustc -- --print native-static-libs), for glibc Linux.
gcc -std=c99 $CFLAGS_STRICT -O2 -Icore/ffi/include core/ffi/examples/c/replay_events.c \
  target/release/libstandfast_ffi.a -lpthread -lm -ldl -o "$OUT/replay_events"
g++ -std=c++17 $CFLAGS_STRICT -Icore/ffi/include -x c++ -c core/ffi/examples/c/replay_events.c \
  -o "$OUT/replay_events_cpp.o"
"$OUT/replay_events" "$OUT/rig.sfri" "$LOG" "$HOST_INPUTS" >"$OUT/c-events.txt"
diff -u "$OUT/host-sim-events.txt" "$OUT/c-events.txt"
echo "C and host-sim agree: $(wc -l <"$OUT/c-events.txt") events"

step "ffi: Python example (ctypes, shared library) against standfast replay --events"
python3 core/ffi/examples/python/replay_events.py target/release/libstandfast_ffi.so \
  "$OUT/rig.sfri" "$LOG" "$HOST_INPUTS" >"$OUT/python-events.txt"
diff -u "$OUT/host-sim-events.txt" "$OUT/python-events.txt"
echo "Python and host-sim agree: $(wc -l <"$OUT/python-events.txt") events"

step "ffi: the same C file cross-linked for Cortex-M4F (arm-none-eabi-gcc, newlib) against the $TARGET static library"
# Only the static library (a cdylib has no meaning on bare metal); the
# firmware profile: opt-level z, fat LTO, one codegen unit.
cargo rustc -q -p standfast-ffi --target "$TARGET" --profile firmware --crate-type staticlib
LIB_M4="target/$TARGET/firmware/libstandfast_ffi.a"
ELF="$OUT/replay_events-cortex-m4f.elf"
# nosys.specs: newlib's stubs for the system calls (a link test; the board
# supplies real ones). Their "not implemented" notes are expected.
arm-none-eabi-gcc -std=c99 $CFLAGS_STRICT -Os -mcpu=cortex-m4 -mthumb -mfloat-abi=hard -mfpu=fpv4-sp-d16 \
  -ffunction-sections -fdata-sections -Icore/ffi/include core/ffi/examples/c/replay_events.c "$LIB_M4" \
  -Wl,--gc-sections -Wl,-Map="$OUT/replay_events-cortex-m4f.map" --specs=nosys.specs -lm -o "$ELF" 2>"$OUT/arm-link.txt" || {
  cat "$OUT/arm-link.txt"
  exit 1
}
grep -v -e 'is not implemented and will always fail' -e 'missing .note.GNU-stack' -e 'NOTE: This behaviour is deprecated' \
  "$OUT/arm-link.txt" || true
arm-none-eabi-size "$ELF"
# The library's share: text of every input section that came from the Rust
# static library, from the link map.
awk -v lib="libstandfast_ffi.a" '
  function hex(s,   i, n) {
    n = 0; s = tolower(s); sub(/^0x/, "", s)
    for (i = 1; i <= length(s); i++) n = n * 16 + index("0123456789abcdef", substr(s, i, 1)) - 1
    return n
  }
  /^ \.(text|rodata|data)/ && NF >= 4 && index($4, lib) { n += hex($3) }
  /^ \.(text|rodata|data)[^ ]*$/ { pending = 1; next }
  pending && NF >= 3 && index($3, lib) { n += hex($2) }
  { pending = 0 }
  END { printf "from libstandfast_ffi.a: %d bytes of code and read-only data (the rest is the example and newlib stdio)\n", n }
' "$OUT/replay_events-cortex-m4f.map"
arm-none-eabi-nm "$ELF" | grep -q ' T sf_guard_step$'
echo "Cortex-M4F link: ok"

step "ffi: the Cortex-M4F build run on QEMU mps2-an386 against standfast replay --events"
# The same C file again, with newlib's semihosting library (files and
# standard output through QEMU) and examples/c/mps2_start.c (vector table,
# FPU on, newlib's start-up), run on the emulated Cortex-M4F board.
QELF="$OUT/replay_events-mps2.elf"
arm-none-eabi-gcc -std=c99 $CFLAGS_STRICT -O2 -mcpu=cortex-m4 -mthumb -mfloat-abi=hard -mfpu=fpv4-sp-d16 \
  -ffunction-sections -fdata-sections -Icore/ffi/include core/ffi/examples/c/replay_events.c \
  core/ffi/examples/c/mps2_start.c "$LIB_M4" -Wl,--gc-sections -Wl,--undefined=sf_example_vectors \
  -Wl,--section-start=.vectors=0x0 --specs=rdimon.specs -lm -o "$QELF" 2>"$OUT/mps2-link.txt" || {
  cat "$OUT/mps2-link.txt"
  exit 1
}
rc=0
timeout 300 qemu-system-arm -M mps2-an386 -cpu cortex-m4 -nographic \
  -semihosting-config "enable=on,target=native,arg=replay_events,arg=$OUT/rig.sfri,arg=$LOG,arg=$HOST_INPUTS" \
  -kernel "$QELF" >"$OUT/m4f-events.txt" 2>"$OUT/m4f-stderr.txt" || rc=$?
cat "$OUT/m4f-stderr.txt"
if [ "$rc" -ne 0 ]; then
  echo "the emulated run failed with exit code $rc"
  exit 1
fi
diff -u "$OUT/host-sim-events.txt" "$OUT/m4f-events.txt"
echo "Cortex-M4F (QEMU) and host-sim agree: $(wc -l <"$OUT/m4f-events.txt") events"

step "ffi: rig image reader fuzz smoke run (cargo-fuzz on nightly, core/fuzz, 30 s)"
rustup toolchain install nightly --profile minimal
command -v cargo-fuzz >/dev/null || cargo install cargo-fuzz --locked
image_corpus="$(mktemp -d)"
# New inputs go to the temporary folder; the committed seed is read only.
(cd core && cargo +nightly fuzz run rig_image "$image_corpus" fuzz/corpus/rig_image -- \
    -max_total_time=30 -print_final_stats=1)
rm -rf "$image_corpus"

if [ "${STANDFAST_FFI_MIRI:-0}" = 1 ]; then
  step "ffi: boundary tests under Miri (opt-in: STANDFAST_FFI_MIRI=1)"
  rustup toolchain install nightly --profile minimal --component miri,rust-src
  cargo +nightly miri test -p standfast-ffi --features miri,std
fi
