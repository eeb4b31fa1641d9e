//! What the replay and self-test binaries for QEMU `mps2-an386` share: the
//! semihosting exit with a code, the host's output streams as a
//! [`TextSink`], the HardFault handler and the panic handler (included with
//! `#[path]`; not a binary of its own: the crate sets `autobins = false`).

use core::panic::PanicInfo;
use cortex_m_rt::{exception, ExceptionFrame};
use cortex_m_semihosting::hio::{self, HostStream};
use cortex_m_semihosting::syscall;
use standfast_firmware::event::TextSink;

/// Exit code: done.
pub const EXIT_OK: u32 = 0;
/// Exit code: a HardFault.
pub const EXIT_HARDFAULT: u32 = 4;
/// Exit code: a panic (the crate and the core are written not to panic).
pub const EXIT_PANIC: u32 = 101;

/// SYS_EXIT_EXTENDED: like SYS_EXIT, but its parameter block carries an exit
/// code, so codes other than 0 and 1 reach the host (Arm semihosting
/// specification v2; from memory).
const SYS_EXIT_EXTENDED: usize = 0x20;
/// ADP_Stopped_ApplicationExit, the reason code for a normal exit.
const ADP_STOPPED_APPLICATION_EXIT: usize = 0x20026;

/// Ends the emulated run with `code` as QEMU's exit status.
pub fn exit(code: u32) -> ! {
    let block: [usize; 2] = [ADP_STOPPED_APPLICATION_EXIT, code as usize];
    // SAFETY: a valid semihosting operation with a two-word parameter block.
    unsafe {
        syscall(SYS_EXIT_EXTENDED, &block);
    }
    // Not reached under QEMU; on a debugger that resumes, stay here.
    loop {
        cortex_m::asm::bkpt();
    }
}

/// A semihosting stream of the host (stdout or stderr) as a [`TextSink`]:
/// every line is written piece by piece, without `core::fmt` (whose
/// formatting machinery and 64-bit division would take about 3 KiB of
/// flash), and byte for byte as the host replay's `Display` prints it (both
/// go through the same `write_text`). A stream that cannot be opened or
/// written drops the text: the output is the emulated board's log, not
/// part of its safety function.
pub struct Host(Option<HostStream>);

impl TextSink for Host {
    fn bytes(&mut self, b: &[u8]) {
        if let Some(h) = self.0.as_mut() {
            // A failed write means the host is gone; nothing to tell it.
            let _ = h.write_all(b);
        }
    }
}

impl Host {
    /// Writes `parts` and a line ending.
    pub fn line(&mut self, parts: &[&str]) {
        for p in parts {
            self.text(p);
        }
        self.text("\n");
    }
}

/// The host's standard output.
pub fn stdout() -> Host {
    Host(hio::hstdout().ok())
}

/// The host's standard error.
pub fn stderr() -> Host {
    Host(hio::hstderr().ok())
}

#[exception]
unsafe fn HardFault(ef: &ExceptionFrame) -> ! {
    let mut out = stdout();
    // The address in decimal, by the one number writer the event lines use.
    out.text("hardfault pc=");
    out.decimal(u64::from(ef.pc()));
    out.text("\n");
    exit(EXIT_HARDFAULT)
}

/// The crate and the core are written not to panic (clippy denies the usual
/// sources); should one happen anyway, say so and exit with 101. The message
/// is not formatted: that would keep every panic message and `core::fmt` in
/// flash.
#[panic_handler]
fn panic(_info: &PanicInfo) -> ! {
    stderr().line(&["panic"]);
    exit(EXIT_PANIC)
}
