//! The interrupt part of the vector table of the QEMU `mps2-an386` board,
//! shared by the crate's bare-metal binaries (included with `#[path]`; not a
//! binary of its own: the crate sets `autobins = false`).

/// Number of external interrupt lines of the AN386's NVIC: QEMU's model
/// sets `num-irq` to 32 for the AN385 and AN386 images (`hw/arm/mps2.c`,
/// `mps2_common_init`).
const IRQ_LINES: usize = 32;

unsafe extern "C" {
    /// cortex-m-rt's default handler (its linker script provides it).
    fn DefaultHandler();
}

/// The interrupt part of the vector table, one entry per interrupt line of
/// the board, every one to cortex-m-rt's `DefaultHandler` (the binary
/// enables no interrupt). With cortex-m-rt's `device` feature the binary
/// gives this table itself: 32 entries (128 bytes) instead of the generic
/// 240 (960 bytes). On another board, size it to that part's interrupt
/// lines (its reference manual), or let the board's device crate supply it.
#[link_section = ".vector_table.interrupts"]
#[no_mangle]
static __INTERRUPTS: [unsafe extern "C" fn(); IRQ_LINES] = [DefaultHandler; IRQ_LINES];
