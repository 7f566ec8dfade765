/* plat_cortexm.c -- bare-metal Cortex-M start-up for the QEMU test boards.
 *
 * Vector table, reset handler (FPU enable on FPU builds, .data copy, .bss
 * clear), and ARM semihosting for output and exit (BKPT 0xAB, operation in r0,
 * argument in r1). QEMU needs
 *   -semihosting-config enable=on,target=native,chardev=<stdio chardev>.
 * No C library: link with -nostdlib -lgcc and cortexm.ld. Build this file
 * with -fno-tree-loop-distribute-patterns, otherwise GCC turns the copy loops
 * into memcpy/memset calls that -nostdlib cannot resolve.
 */
#include <stdint.h>
#include "fw_plat.h"

extern uint32_t __fw_data_load[], __fw_data_start[], __fw_data_end[];
extern uint32_t __fw_bss_start[], __fw_bss_end[];
extern void __fw_stack_top(void); /* a linker symbol; typed as a function for the table */

int main(void);
void fw_reset(void);
void fw_fault(void);

enum {
    SH_WRITE0 = 0x04,        /* write a NUL-terminated string */
    SH_EXIT = 0x18,          /* exit, status 0/1 only */
    SH_EXIT_EXTENDED = 0x20  /* exit with a status word */
};
#define SH_APPLICATION_EXIT 0x20026UL
#define SH_RUNTIME_ERROR 0x20023UL

static uint32_t semihosting_call(uint32_t op, const void *arg)
{
    register uint32_t r0 __asm__("r0") = op;
    register const void *r1 __asm__("r1") = arg;
    __asm__ volatile("bkpt 0xAB" : "+r"(r0) : "r"(r1) : "memory");
    return r0;
}

/* Output is collected per line: one trap per line keeps QEMU fast. */
static char out_buf[96];
static unsigned out_len;

static void out_flush(void)
{
    if (out_len > 0U) {
        out_buf[out_len] = '\0';
        (void)semihosting_call(SH_WRITE0, out_buf);
        out_len = 0U;
    }
}

void fw_plat_init(void)
{
}

void fw_plat_putc(char c)
{
    out_buf[out_len++] = c;
    if (c == '\n' || out_len + 1U >= sizeof out_buf)
        out_flush();
}

void fw_plat_exit(int status)
{
    uint32_t args[2];
    out_flush();
    args[0] = SH_APPLICATION_EXIT;
    args[1] = (uint32_t)status;
    (void)semihosting_call(SH_EXIT_EXTENDED, args);
    (void)semihosting_call(SH_EXIT, (const void *)(status == 0 ? SH_APPLICATION_EXIT : SH_RUNTIME_ERROR));
    for (;;) {
    }
}

void fw_fault(void)
{
    static const char text[] = "FAULT\n";
    out_flush();
    (void)semihosting_call(SH_WRITE0, text);
    fw_plat_exit(3);
}

__attribute__((section(".fw_vectors"), used))
static void (*const fw_vectors[16])(void) = {
    __fw_stack_top, fw_reset, fw_fault, fw_fault, fw_fault, fw_fault, fw_fault,
    0, 0, 0, 0, fw_fault, fw_fault, 0, fw_fault, fw_fault
};

void fw_reset(void)
{
    uint32_t *src = __fw_data_load;
    uint32_t *dst;
#if defined(__ARM_FP)
    /* CPACR: full access to CP10/CP11 before any FP instruction runs. */
    *(volatile uint32_t *)0xE000ED88UL |= 0xFUL << 20;
    __asm__ volatile("dsb\n\tisb" ::: "memory");
#endif
    for (dst = __fw_data_start; dst < __fw_data_end; ++dst, ++src)
        *dst = *src;
    for (dst = __fw_bss_start; dst < __fw_bss_end; ++dst)
        *dst = 0U;
    fw_plat_exit(main());
}
