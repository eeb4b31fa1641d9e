/*
 * Start-up for running replay_events.c unchanged on QEMU's Arm MPS2 board
 * (mps2-an386, Cortex-M4 with FPU), with newlib's semihosting library
 * (--specs=rdimon.specs): a vector table at address 0, a reset handler that
 * switches the FPU on (the hard-float code needs it before its first float
 * instruction) and enters newlib's start-up (_start: stack and heap from
 * the debugger, .bss cleared, argv from the semihosting command line,
 * main, exit). A fault ends the run through semihosting with a failure.
 * For the CI run only (core/ffi/ci.sh); a board has its own start-up.
 */
#include <stdint.h>

extern void _start(void);

void sf_example_reset(void);
void sf_example_fault(void);

/* Top of the MPS2's 4 MiB SSRAM at 0x2000_0000; newlib moves the stack to
 * where the semihosting heap information puts it. */
#define STACK_TOP 0x20400000u

__attribute__((section(".vectors"), used)) const uintptr_t sf_example_vectors[16] = {
    STACK_TOP,
    (uintptr_t)&sf_example_reset,
    (uintptr_t)&sf_example_fault, /* NMI */
    (uintptr_t)&sf_example_fault, /* HardFault */
    (uintptr_t)&sf_example_fault, /* MemManage */
    (uintptr_t)&sf_example_fault, /* BusFault */
    (uintptr_t)&sf_example_fault, /* UsageFault */
    0, 0, 0, 0,
    (uintptr_t)&sf_example_fault, /* SVCall */
    (uintptr_t)&sf_example_fault, /* DebugMonitor */
    0,
    (uintptr_t)&sf_example_fault, /* PendSV */
    (uintptr_t)&sf_example_fault, /* SysTick */
};

void sf_example_reset(void) {
    /* CPACR (0xE000ED88): full access to coprocessors 10 and 11, the FPU. */
    *(volatile uint32_t *)0xE000ED88u |= 0xFu << 20;
    __asm volatile("dsb\n\tisb" ::: "memory");
    _start();
    for (;;) {
    }
}

void sf_example_fault(void) {
    /* Semihosting SYS_EXIT (0x18) with ADP_Stopped_RunTimeErrorUnknown
     * (0x20023): QEMU exits with status 1. */
    __asm volatile("mov r0, #0x18\n\tldr r1, =0x20023\n\tbkpt #0xab" ::: "r0", "r1", "memory");
    for (;;) {
    }
}
