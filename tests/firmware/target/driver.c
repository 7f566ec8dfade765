/* driver.c -- runs a generated header (fwt_calib.h, prefix "fwt") on a target
 * and prints every result as a bit pattern, in the format that fw_fixture
 * writes to expected.txt (see ../fixture_main.cpp):
 *   P dbl=<sizeof(double)>                     (platform line, not compared)
 *   I mode=<float|double|fixed> n=<inputs> k=<checked inputs>
 *   C <fwt_table_crc32() hex> <fwt_check_table()>
 *   V <i> <input bits hex> [<aux bits hex>] <output bits hex>
 *   K <i> <input bits hex> [<aux bits hex>] <status> <output bits hex>   (range-checked variant)
 * The aux field is present for extended models with a second input
 * (FWT_HAS_AUX; the functions then take (reading, aux)).
 *   END <number of lines, this one included, P excluded>
 * C89, no C library: numbers are formatted with integer code only, so the
 * text is identical on every target whenever the bits are.
 */
#include <stdint.h>
#include "fwt_calib.h"
#include "fwt_inputs.h"
#include "fw_plat.h"

static unsigned n_lines;

static void put_str(const char *s)
{
    while (*s != '\0')
        fw_plat_putc(*s++);
}

static void put_hex(uint32_t v, unsigned digits)
{
    static const char hexdig[] = "0123456789abcdef";
    while (digits > 0U) {
        --digits;
        fw_plat_putc(hexdig[(v >> (4U * digits)) & 0xFU]);
    }
}

static void put_udec(uint32_t v)
{
    char buf[12];
    unsigned n = 0U;
    do {
        buf[n++] = (char)('0' + (char)(v % 10U));
        v /= 10U;
    } while (v != 0U);
    while (n > 0U)
        fw_plat_putc(buf[--n]);
}

static void end_line(void)
{
    fw_plat_putc('\n');
    ++n_lines;
}

#if defined(FWT_NUMERIC_FIXED)
#define MODE_NAME "fixed"
static int32_t to_int32(uint32_t bits)
{
    /* two's complement without an implementation-defined conversion */
    if (bits < 0x80000000UL)
        return (int32_t)bits;
    return -(int32_t)(~bits) - 1;
}
static void put_result(int32_t y)
{
    put_hex((uint32_t)y, 8U);
}
#if defined(FWT_HAS_AUX)
#define EVAL(i) fwt_eval_fixed(to_int32(fwt_inputs[i]), to_int32(fwt_aux[i]))
#define EVAL_CHECKED(i, st) fwt_eval_fixed_checked(to_int32(fwt_checked[i]), to_int32(fwt_checked_aux[i]), (st))
#else
#define EVAL(i) fwt_eval_fixed(to_int32(fwt_inputs[i]))
#define EVAL_CHECKED(i, st) fwt_eval_fixed_checked(to_int32(fwt_checked[i]), (st))
#endif
#else
typedef union {
    float f;
    uint32_t u;
} float_bits;
static float to_float(uint32_t bits)
{
    float_bits p;
    p.u = bits;
    return p.f;
}
#if defined(FWT_NUMERIC_FLOAT)
#define MODE_NAME "float"
static void put_result(float y)
{
    float_bits p;
    p.f = y;
    put_hex(p.u, 8U);
}
#if defined(FWT_HAS_AUX)
#define EVAL(i) fwt_eval(to_float(fwt_inputs[i]), to_float(fwt_aux[i]))
#define EVAL_CHECKED(i, st) fwt_eval_checked(to_float(fwt_checked[i]), to_float(fwt_checked_aux[i]), (st))
#else
#define EVAL(i) fwt_eval(to_float(fwt_inputs[i]))
#define EVAL_CHECKED(i, st) fwt_eval_checked(to_float(fwt_checked[i]), (st))
#endif
#else
#define MODE_NAME "double"
static void put_result(double y)
{
    if (sizeof(double) == 8U) {
        union {
            double d;
            uint64_t u;
        } p;
        p.u = 0U;
        p.d = y;
        put_hex((uint32_t)(p.u >> 32), 8U);
        put_hex((uint32_t)(p.u & 0xFFFFFFFFUL), 8U);
    } else { /* avr-gcc: double is binary32 */
        union {
            double d;
            uint32_t u;
        } p;
        p.u = 0U;
        p.d = y;
        put_hex(p.u, 8U);
    }
}
#if defined(FWT_HAS_AUX)
#define EVAL(i) fwt_eval((double)to_float(fwt_inputs[i]), (double)to_float(fwt_aux[i]))
#define EVAL_CHECKED(i, st) \
    fwt_eval_checked((double)to_float(fwt_checked[i]), (double)to_float(fwt_checked_aux[i]), (st))
#else
#define EVAL(i) fwt_eval((double)to_float(fwt_inputs[i]))
#define EVAL_CHECKED(i, st) fwt_eval_checked((double)to_float(fwt_checked[i]), (st))
#endif
#endif
#endif

int main(void)
{
    unsigned i;
    fw_plat_init();
    put_str("P dbl=");
    put_udec((uint32_t)sizeof(double));
    fw_plat_putc('\n');
    put_str("I mode=" MODE_NAME " n=");
    put_udec((uint32_t)FWT_N_INPUTS);
    put_str(" k=");
    put_udec((uint32_t)FWT_N_CHECKED);
    end_line();
    put_str("C ");
    put_hex(fwt_table_crc32(), 8U);
    put_str(" ");
    put_udec((uint32_t)fwt_check_table());
    end_line();
    for (i = 0U; i < (unsigned)FWT_N_INPUTS; ++i) {
        put_str("V ");
        put_udec((uint32_t)i);
        put_str(" ");
        put_hex(fwt_inputs[i], 8U);
        put_str(" ");
#if defined(FWT_HAS_AUX)
        put_hex(fwt_aux[i], 8U);
        put_str(" ");
#endif
        put_result(EVAL(i));
        end_line();
    }
    for (i = 0U; i < (unsigned)FWT_N_CHECKED; ++i) {
        int status = -1;
        put_str("K ");
        put_udec((uint32_t)i);
        put_str(" ");
        put_hex(fwt_checked[i], 8U);
        put_str(" ");
#if defined(FWT_HAS_AUX)
        put_hex(fwt_checked_aux[i], 8U);
        put_str(" ");
#endif
        {
            /* evaluate first: status is written by the call */
#if defined(FWT_NUMERIC_FIXED)
            int32_t y = EVAL_CHECKED(i, &status);
#elif defined(FWT_NUMERIC_FLOAT)
            float y = EVAL_CHECKED(i, &status);
#else
            double y = EVAL_CHECKED(i, &status);
#endif
            put_udec((uint32_t)status);
            put_str(" ");
            put_result(y);
        }
        end_line();
    }
    put_str("END ");
    put_udec((uint32_t)n_lines + 1U);
    end_line();
    fw_plat_exit(0); /* on AVR returning from main would spin forever in exit() */
    return 0;
}
