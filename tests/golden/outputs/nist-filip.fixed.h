/* ==========================================================================
 * GENERATED FILE -- DO NOT EDIT.
 * Written by ridgecal 0.1.0 (ridgecal export). Regenerate it from the calibration record
 * instead of editing: the self-check CRC and the QA figures below would no
 * longer match.
 * Header format version 2 (FILIP_FORMAT_VERSION).
 * ==========================================================================
 *
 * Calibration QA
 *   sensor:              (not given)
 *   reading unit:        (not given)
 *   reference unit:      (not given)
 *   calibrated range:    [-8.78146449, -3.13200249] (not given) (reading)
 *   degree, lambda:      10, 0
 *   validation:          RMSE 0.00337435, max |error| 0.0091317 (not given)
 *   test:                RMSE n/a, max |error| n/a (not given)
 *   tolerance:           none in the record
 *   tolerance used:      0.00337435 (not given) (validation RMSE, fallback: no absolute tolerance given)
 *   result:              not assessed (no tolerance in the record)
 *   record SHA-256:      746669df2c433f37d3ba6f627796930b7004fc156b323734a53d46fc55edc91d
 *   tool version:        ridgecal 0.1.0
 *
 * Export proof (evaluated at export time by an exact host emulation of the
 * arithmetic below, compared with the double-precision model)
 *   numeric mode:        fixed
 *   number formats:      int32 coefficients Q[8,8,7,7,7,7,7,7,7,9,9] (t^0..t^n), t in Q30, int64 intermediates, output = round(y * 1000000) int32
 *   inputs checked:      77 (72 of them calibration readings)
 *   max deviation:       4.542e-07 (not given) at reading -8 (not given) (raw -8)
 *   allowed deviation:   0.0003374 (not given) (0.1 x tolerance used)
 *
 * CAUTION: this header reproduces a fitted calibration curve, nothing more.
 * Where the measurement is safety-relevant (medical, legal metrology, gas,
 * pressure, process safety, ...) calibration, verification and release of
 * the instrument must follow local codes and certified procedures; the QA
 * figures above do not replace them.
 *
 * Build requirement: compile every file that includes this header with
 * -ffp-contract=off and never with -ffast-math / -Ofast. GCC ignores
 * '#pragma STDC FP_CONTRACT OFF' (used below for other compilers), and a
 * fused multiply-add changes the last bits of the float/double results.
 * Uses <stdint.h> only: no libm, no malloc, no libc calls.
 */
#ifndef FILIP_RIDGECAL_CALIBRATION_H
#define FILIP_RIDGECAL_CALIBRATION_H

#include <stdint.h>

#define FILIP_FORMAT_VERSION 2
#define FILIP_NUMERIC_FIXED 1
#define FILIP_DEGREE 10
/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the
   bit patterns of every constant the evaluation uses, in this order
   FILIP_COEF[0..10], FILIP_RAW_MIN, FILIP_RAW_MAX, FILIP_T_R0, FILIP_T_MUL,
   FILIP_T_ADD, FILIP_T_SHIFT, FILIP_T_STEP_SHIFT[0..9], FILIP_OUT_SHIFT,
   FILIP_DEGREE;
   see filip_table_crc32(). */
#define FILIP_TABLE_CRC32 0x811716B8UL

/* The record behind this header, for compile-time checks, e.g.
 *   #if FILIP_VERDICT != FILIP_VERDICT_PASS
 *   #error "this calibration did not pass"
 *   #endif */
#define FILIP_VERDICT_NOT_JUDGED 0 /* no tolerance in the record: nothing judged */
#define FILIP_VERDICT_PASS 1
#define FILIP_VERDICT_FAIL 2
#define FILIP_VERDICT_RECORD_MODIFIED 3 /* record edited after ridgecal wrote it */
#define FILIP_VERDICT_UNDECIDED 4 /* no point outside the tolerance, but conformity not shown (guard band, U or model adequacy) */
#define FILIP_VERDICT FILIP_VERDICT_NOT_JUDGED
#define FILIP_RECORD_SHA256 "746669df2c433f37d3ba6f627796930b7004fc156b323734a53d46fc55edc91d" /* SHA-256 of the calibration record */
#define FILIP_CALIBRATION_DATE "2026-01-01T00:00:00Z" /* when the record was made, UTC; "" if it does not say */

/* Status codes of the range-checked evaluation */
#define FILIP_IN_RANGE 0     /* input inside the valid range */
#define FILIP_BELOW_RANGE 1  /* input below: result at the lower limit */
#define FILIP_ABOVE_RANGE 2  /* input above: result at the upper limit */
#define FILIP_NOT_A_NUMBER 3 /* NaN input: result at the lower limit */
/* Results of filip_check_table() */
#define FILIP_TABLE_OK 0
#define FILIP_TABLE_CORRUPT 1
#define FILIP_TABLE_UNCHECKABLE 2 /* double mode where double is not 64-bit */

/* C99/C++: static inline. GNU C89: static __inline__. Other C89: static. */
#if defined(__cplusplus) || (defined(__STDC_VERSION__) && __STDC_VERSION__ >= 199901L)
#define FILIP_INLINE static inline
#elif defined(__GNUC__)
#define FILIP_INLINE static __inline__
#else
#define FILIP_INLINE static
#endif

#ifdef __cplusplus
extern "C" {
#endif

/* Valid raw input range (integers; reading = raw / 1 (not given)). */
#define FILIP_RAW_MIN -8L
#define FILIP_RAW_MAX -4L
/* Output unit: 1 / 1000000 (not given) (output = round(reference * 1000000)). */

/* Coefficients of p * 1000000 in powers of t; entry k is in Q(q_k) (value * 2^q_k):
 *   k=0: q_k = 8
 *   k=1: q_k = 8
 *   k=2: q_k = 7
 *   k=3: q_k = 7
 *   k=4: q_k = 7
 *   k=5: q_k = 7
 *   k=6: q_k = 7
 *   k=7: q_k = 7
 *   k=8: q_k = 7
 *   k=9: q_k = 9
 *   k=10: q_k = 9
 */
static const int32_t FILIP_COEF[FILIP_DEGREE + 1] = {
    227287414L, /* t^0, Q8 */
    27851077L, /* t^1, Q8 */
    -68654973L, /* t^2, Q7 */
    36796252L, /* t^3, Q7 */
    282326230L, /* t^4, Q7 */
    -167772363L, /* t^5, Q7 */
    -539957224L, /* t^6, Q7 */
    225574268L, /* t^7, Q7 */
    487629120L, /* t^8, Q7 */
    -395527970L, /* t^9, Q9 */
    -667276124L  /* t^10, Q9 */
};

/* t_q = t * 2^30 = rshift_round((raw - FILIP_T_R0) * FILIP_T_MUL + FILIP_T_ADD, FILIP_T_SHIFT). */
#define FILIP_T_R0 ((int64_t)-6L)
#define FILIP_T_MUL ((int64_t)1520487187L)
#define FILIP_T_ADD ((int64_t)-65786170L)
#define FILIP_T_SHIFT 2U
/* Shift after the product with t_q in Horner step k (entry k). */
static const uint8_t FILIP_T_STEP_SHIFT[10] = {30U, 29U, 30U, 30U, 30U, 30U, 30U, 30U, 32U, 30U};
/* Final shift from Q8 to the output unit. */
#define FILIP_OUT_SHIFT 8U

/* floor((v + 2^(s-1)) / 2^s), i.e. v / 2^s rounded half up, for
   -2^62 <= v + 2^(s-1) < 2^62 and 1 <= s <= 61. Only a non-negative value is
   shifted (v is offset by 2^62 first), so the result does not depend on how
   the compiler shifts negative numbers (implementation-defined in C). */
FILIP_INLINE int64_t filip_rshift_round(int64_t v, unsigned s)
{
    const int64_t bias = (int64_t)1 << 62;
    const uint64_t biased = (uint64_t)(v + bias + ((int64_t)1 << (s - 1U)));
    return (int64_t)(biased >> s) - (bias >> s);
}

/* filip_eval_fixed: round(reference * 1000000) as int32 (1/1000000 (not given))
 * for a raw integer reading in [FILIP_RAW_MIN, FILIP_RAW_MAX].
 * Precision: integer only -- int32 coefficients, int64 intermediates, every
 * shift rounds half up; output resolution 1/1000000 (not given).
 * t_q = t * 2^30 = rshift_round((raw - -6) * 1520487187 + -65786170, 2)
 * Overflow proof (exact integer interval arithmetic over the whole raw range,
 * every value below is a proved bound of that intermediate):
 *   (raw - r0) * mul + add in [-3106760544, 2975188204]
 *   t_q in [-776690136, 743797051]
 *   step 9: acc*t_q in [-496318013233910324, 518266783499112864], >> 30, acc (Q9) in [-857760140, 87145585]
 *   step 8: acc*t_q in [-637999462597347140, 666213839791979040], >> 32, acc (Q7) in [339083294, 642744117]
 *   step 7: acc*t_q in [-499213015645929912, 478071178772198967], >> 30, acc (Q7) in [-239354083, 670812749]
 *   step 6: acc*t_q in [-521013645251343864, 498948544479403199], >> 30, acc (Q7) in [-1025188994, -75275181]
 *   step 5: acc*t_q in [-762532550454856694, 796254179175563184], >> 30, acc (Q7) in [-877936141, 573797129]
 *   step 4: acc*t_q in [-653006312642120191, 681884340752605176], >> 30, acc (Q7) in [-325833290, 917380510]
 *   step 3: acc*t_q in [-712520393075649360, 682344917982876010], >> 30, acc (Q7) in [-626790075, 672279478]
 *   step 2: acc*t_q in [-522152839197829008, 500039493184219378], >> 30, acc (Q7) in [-554947700, 397043095]
 *   step 1: acc*t_q in [-412768462719232700, 431022404585887200], >> 29, acc (Q8) in [-740990098, 830692868]
 *   step 0: acc*t_q in [-645190956621150048, 617866905505132268], >> 30, acc (Q8) in [-373593489, 802720811]
 *   output in [-1459350, 3135628]
 *   limits: every shifted value within [-2^62, 2^62), every product within
 *   +/-2^62, accumulators and output within int32.
 * Measured max |error| against the double-precision model, output rounding
 * included: 4.542e-07 (not given) (77 raw inputs checked). Outside the raw range the
 * bounds do not hold: use filip_eval_fixed_checked() for untrusted input. */
FILIP_INLINE int32_t filip_eval_fixed(int32_t raw)
{
    const int64_t t = filip_rshift_round(((int64_t)raw - FILIP_T_R0) * FILIP_T_MUL + FILIP_T_ADD, FILIP_T_SHIFT);
    int64_t acc = (int64_t)FILIP_COEF[10];
    acc = filip_rshift_round(acc * t, (unsigned)FILIP_T_STEP_SHIFT[9]) + FILIP_COEF[9];
    acc = filip_rshift_round(acc * t, (unsigned)FILIP_T_STEP_SHIFT[8]) + FILIP_COEF[8];
    acc = filip_rshift_round(acc * t, (unsigned)FILIP_T_STEP_SHIFT[7]) + FILIP_COEF[7];
    acc = filip_rshift_round(acc * t, (unsigned)FILIP_T_STEP_SHIFT[6]) + FILIP_COEF[6];
    acc = filip_rshift_round(acc * t, (unsigned)FILIP_T_STEP_SHIFT[5]) + FILIP_COEF[5];
    acc = filip_rshift_round(acc * t, (unsigned)FILIP_T_STEP_SHIFT[4]) + FILIP_COEF[4];
    acc = filip_rshift_round(acc * t, (unsigned)FILIP_T_STEP_SHIFT[3]) + FILIP_COEF[3];
    acc = filip_rshift_round(acc * t, (unsigned)FILIP_T_STEP_SHIFT[2]) + FILIP_COEF[2];
    acc = filip_rshift_round(acc * t, (unsigned)FILIP_T_STEP_SHIFT[1]) + FILIP_COEF[1];
    acc = filip_rshift_round(acc * t, (unsigned)FILIP_T_STEP_SHIFT[0]) + FILIP_COEF[0];
    return (int32_t)filip_rshift_round(acc, FILIP_OUT_SHIFT);
}

/* filip_eval_fixed_checked: as filip_eval_fixed, but never leaves the raw range:
 * raw outside [FILIP_RAW_MIN, FILIP_RAW_MAX] is clamped to the nearest limit and
 * *status (if status is not NULL) is set to FILIP_IN_RANGE, _BELOW_RANGE or
 * _ABOVE_RANGE. Precision as filip_eval_fixed. */
FILIP_INLINE int32_t filip_eval_fixed_checked(int32_t raw, int *status)
{
    int s = FILIP_IN_RANGE;
    if (raw < FILIP_RAW_MIN) {
        s = FILIP_BELOW_RANGE;
        raw = FILIP_RAW_MIN;
    } else if (raw > FILIP_RAW_MAX) {
        s = FILIP_ABOVE_RANGE;
        raw = FILIP_RAW_MAX;
    }
    if (status != 0)
        *status = s;
    return filip_eval_fixed(raw);
}

/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over
   FILIP_TABLE_CRC32's list, each value's bit pattern (two's complement),
   least significant byte first -- the same on little- and big-endian targets.
   Bitwise (no table). Call it at start-up via filip_check_table(). */
FILIP_INLINE uint32_t filip_crc32_step(uint32_t crc, uint64_t bits, unsigned n)
{
    unsigned b, i;
    for (b = 0U; b < n; ++b) {
        crc ^= (uint32_t)((bits >> (8U * b)) & 0xFFU);
        for (i = 0U; i < 8U; ++i) {
            if ((crc & 1U) != 0U)
                crc = (crc >> 1) ^ (uint32_t)0xEDB88320UL;
            else
                crc >>= 1;
        }
    }
    return crc;
}

FILIP_INLINE uint32_t filip_table_crc32(void)
{
    uint32_t crc = 0xFFFFFFFFUL;
    unsigned k;
    for (k = 0U; k < (unsigned)(FILIP_DEGREE + 1); ++k)
        crc = filip_crc32_step(crc, (uint64_t)(uint32_t)(FILIP_COEF[k]), 4U);
    crc = filip_crc32_step(crc, (uint64_t)(uint32_t)(FILIP_RAW_MIN), 4U);
    crc = filip_crc32_step(crc, (uint64_t)(uint32_t)(FILIP_RAW_MAX), 4U);
    crc = filip_crc32_step(crc, (uint64_t)(FILIP_T_R0), 8U);
    crc = filip_crc32_step(crc, (uint64_t)(FILIP_T_MUL), 8U);
    crc = filip_crc32_step(crc, (uint64_t)(FILIP_T_ADD), 8U);
    crc = filip_crc32_step(crc, (uint64_t)(uint32_t)(FILIP_T_SHIFT), 4U);
    for (k = 0U; k < (unsigned)(10); ++k)
        crc = filip_crc32_step(crc, (uint64_t)FILIP_T_STEP_SHIFT[k], 1U);
    crc = filip_crc32_step(crc, (uint64_t)(uint32_t)(FILIP_OUT_SHIFT), 4U);
    crc = filip_crc32_step(crc, (uint64_t)(uint32_t)(FILIP_DEGREE), 4U);
    return crc ^ (uint32_t)0xFFFFFFFFUL;
}

/* Start-up self-check: FILIP_TABLE_OK when every constant is intact,
   FILIP_TABLE_CORRUPT otherwise. */
FILIP_INLINE int filip_check_table(void)
{
    return filip_table_crc32() == FILIP_TABLE_CRC32 ? FILIP_TABLE_OK : FILIP_TABLE_CORRUPT;
}

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* FILIP_RIDGECAL_CALIBRATION_H */
