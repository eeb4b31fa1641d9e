/*
 * step_count: a QEMU TCG plug-in that counts the guest instructions executed
 * between two code addresses, once per pass, for the firmware example's
 * guard step (firmware-example/ci.sh; method in firmware-example/README.md,
 * "Cost of a guard step").
 *
 * Arguments (-plugin ./step_count.so,begin=ADDR,end=ADDR,out=FILE):
 *   begin  address of the first instruction of the begin mark
 *          (standfast_firmware::marks::guard_step_begin); bit 0, the Thumb
 *          bit of a symbol's value, is ignored
 *   end    address of the first instruction of the end mark
 *   out    file that receives one count per line, in execution order
 *   profile  (optional) file that receives, at exit, one line per translated
 *          block executed inside the marks: its address, its instruction
 *          count and how often it ran there (a profile of the steps, by
 *          block; a block left early by an exception counts in full)
 *
 * Method: every translated guest instruction gets an inline 64-bit add of
 * one to a running counter, so the counter is exact whatever way execution
 * leaves a translation block (a branch, an exception, an interrupt). The
 * first instruction of each mark also gets a callback: the begin mark saves
 * the counter, the end mark writes the difference. Both callbacks see the
 * counter in the same state relative to their own instruction, so the
 * difference is exactly the number of instructions executed from the begin
 * mark's first instruction up to, not including, the end mark's first.
 * Instructions skipped by a Thumb IT block's condition are counted, as the
 * core issues them. Only one vCPU is supported (the mps2-an386 board has one).
 *
 * Written for this project against QEMU's public plug-in API (version 1, as
 * in QEMU 7.2, Debian 12's qemu-system-arm); the header is vendored in
 * vendor/ with its licence and provenance. Licence of this file: MIT OR
 * Apache-2.0, like the project (both compatible with loading into QEMU,
 * whose plug-in interface asks for a GPL-compatible licence).
 */
#include <inttypes.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "qemu-plugin.h"

QEMU_PLUGIN_EXPORT int qemu_plugin_version = QEMU_PLUGIN_VERSION;

static uint64_t begin_addr = UINT64_MAX;
static uint64_t end_addr = UINT64_MAX;
static FILE *out;

static uint64_t executed;    /* instructions executed so far (inline add) */
static uint64_t at_begin;    /* `executed` when the begin mark last ran */
static int inside;           /* a begin mark ran and no end mark yet */
static uint64_t passes;      /* counts written */
static uint64_t unpaired;    /* a mark out of order (begin twice, end first) */
static uint64_t total_in_steps;

/* The optional profile: one record per translation, kept in a list. */
struct block {
    uint64_t vaddr;
    uint64_t n_insns;
    uint64_t runs_inside;
    struct block *next;
};
static FILE *profile;
static struct block *blocks;

static void on_block(unsigned int vcpu, void *udata)
{
    (void)vcpu;
    if (inside) {
        ((struct block *)udata)->runs_inside++;
    }
}

static void on_begin(unsigned int vcpu, void *udata)
{
    (void)vcpu;
    (void)udata;
    if (inside) {
        unpaired++;
    }
    inside = 1;
    at_begin = executed;
}

static void on_end(unsigned int vcpu, void *udata)
{
    (void)vcpu;
    (void)udata;
    if (!inside) {
        unpaired++;
        return;
    }
    inside = 0;
    uint64_t n = executed - at_begin;
    total_in_steps += n;
    passes++;
    fprintf(out, "%" PRIu64 "\n", n);
}

static void on_translate(qemu_plugin_id_t id, struct qemu_plugin_tb *tb)
{
    (void)id;
    size_t n = qemu_plugin_tb_n_insns(tb);
    if (profile) {
        struct block *b = calloc(1, sizeof *b);
        if (b) {
            b->vaddr = qemu_plugin_tb_vaddr(tb);
            b->n_insns = n;
            b->next = blocks;
            blocks = b;
            qemu_plugin_register_vcpu_tb_exec_cb(tb, on_block,
                                                 QEMU_PLUGIN_CB_NO_REGS, b);
        }
    }
    for (size_t i = 0; i < n; i++) {
        struct qemu_plugin_insn *insn = qemu_plugin_tb_get_insn(tb, i);
        uint64_t pc = qemu_plugin_insn_vaddr(insn);
        qemu_plugin_register_vcpu_insn_exec_inline(
            insn, QEMU_PLUGIN_INLINE_ADD_U64, &executed, 1);
        if (pc == begin_addr) {
            qemu_plugin_register_vcpu_insn_exec_cb(
                insn, on_begin, QEMU_PLUGIN_CB_NO_REGS, NULL);
        } else if (pc == end_addr) {
            qemu_plugin_register_vcpu_insn_exec_cb(
                insn, on_end, QEMU_PLUGIN_CB_NO_REGS, NULL);
        }
    }
}

static void on_exit_qemu(qemu_plugin_id_t id, void *udata)
{
    (void)id;
    (void)udata;
    char line[256];
    snprintf(line, sizeof line,
             "step_count: passes=%" PRIu64 " unpaired=%" PRIu64
             " instructions_in_passes=%" PRIu64 " instructions_total=%" PRIu64
             "\n",
             passes, unpaired, total_in_steps, executed);
    fputs(line, stderr);
    if (out) {
        fflush(out);
    }
    if (profile) {
        for (struct block *b = blocks; b; b = b->next) {
            if (b->runs_inside) {
                fprintf(profile, "0x%" PRIx64 " %" PRIu64 " %" PRIu64 "\n",
                        b->vaddr, b->n_insns, b->runs_inside);
            }
        }
        fflush(profile);
    }
}

static int parse_addr(const char *text, uint64_t *addr)
{
    char *rest = NULL;
    unsigned long long v = strtoull(text, &rest, 0);
    if (rest == text || *rest != '\0') {
        return -1;
    }
    *addr = (uint64_t)v & ~(uint64_t)1;
    return 0;
}

QEMU_PLUGIN_EXPORT int qemu_plugin_install(qemu_plugin_id_t id,
                                           const qemu_info_t *info, int argc,
                                           char **argv)
{
    const char *out_path = NULL;
    if (info->system_emulation && info->system.smp_vcpus != 1) {
        fprintf(stderr, "step_count: needs exactly one vCPU\n");
        return -1;
    }
    for (int i = 0; i < argc; i++) {
        const char *a = argv[i];
        if (strncmp(a, "begin=", 6) == 0) {
            if (parse_addr(a + 6, &begin_addr) != 0) {
                fprintf(stderr, "step_count: bad begin address: %s\n", a + 6);
                return -1;
            }
        } else if (strncmp(a, "end=", 4) == 0) {
            if (parse_addr(a + 4, &end_addr) != 0) {
                fprintf(stderr, "step_count: bad end address: %s\n", a + 4);
                return -1;
            }
        } else if (strncmp(a, "out=", 4) == 0) {
            out_path = a + 4;
        } else if (strncmp(a, "profile=", 8) == 0) {
            profile = fopen(a + 8, "w");
            if (!profile) {
                perror("step_count: cannot open the profile file");
                return -1;
            }
        } else {
            fprintf(stderr,
                    "step_count: unknown argument %s (accepted: begin=, end=, "
                    "out=, profile=)\n",
                    a);
            return -1;
        }
    }
    if (begin_addr == UINT64_MAX || end_addr == UINT64_MAX || !out_path) {
        fprintf(stderr, "step_count: begin=, end= and out= are required\n");
        return -1;
    }
    if (begin_addr == end_addr) {
        fprintf(stderr, "step_count: begin and end are the same address\n");
        return -1;
    }
    out = fopen(out_path, "w");
    if (!out) {
        perror("step_count: cannot open the output file");
        return -1;
    }
    qemu_plugin_register_vcpu_tb_trans_cb(id, on_translate);
    qemu_plugin_register_atexit_cb(id, on_exit_qemu, NULL);
    return 0;
}
