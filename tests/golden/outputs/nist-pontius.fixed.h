/* ==========================================================================
 * GENERATED FILE -- DO NOT EDIT.
 * Written by ridgecal 0.1.0 (ridgecal export). Regenerate it from the calibration record
 * instead of editing: the self-check CRC and the QA figures below would no
 * longer match.
 * Header format version 2 (PONTIUS_FORMAT_VERSION).
 * ==========================================================================
 *
 * Calibration QA
 *   sensor:              (not given)
 *   reading unit:        (not given)
 *   reference unit:      (not given)
 *   calibrated range:    [150000, 3000000] (not given) (reading)
 *   degree, lambda:      2, 0
 *   validation:          RMSE 0.000218386, max |error| 0.000488553 (not given)
 *   test:                RMSE n/a, max |error| n/a (not given)
 *   tolerance:           none in the record
 *   tolerance used:      0.000218386 (not given) (validation RMSE, fallback: no absolute tolerance given)
 *   result:              not assessed (no tolerance in the record)
 *   record SHA-256:      f3e1107509c17c09bd2a46c622258f5d3091f480244c193f66006af54708d5ac
 *   tool version:        ridgecal 0.1.0
 *
 * Export proof (evaluated at export time by an exact host emulation of the
 * arithmetic below, compared with the double-precision model)
 *   numeric mode:        fixed
 *   number formats:      int32 coefficients Q[8,10,17] (t^0..t^n), t in Q30, int64 intermediates, output = round(y * 1000000) int32
 *   inputs checked:      2041 (40 of them calibration readings)
 *   max deviation:       5.014e-07 (not given) at reading 2891700 (not given) (raw 2891700)
 *   allowed deviation:   2.184e-05 (not given) (0.1 x tolerance used)
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
#ifndef PONTIUS_RIDGECAL_CALIBRATION_H
#define PONTIUS_RIDGECAL_CALIBRATION_H

#include <stdint.h>

#define PONTIUS_FORMAT_VERSION 2
#define PONTIUS_NUMERIC_FIXED 1
#define PONTIUS_DEGREE 2
/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the
   bit patterns of every constant the evaluation uses, in this order
   PONTIUS_COEF[0..2], PONTIUS_RAW_MIN, PONTIUS_RAW_MAX, PONTIUS_T_R0,
   PONTIUS_T_MUL, PONTIUS_T_ADD, PONTIUS_T_SHIFT,
   PONTIUS_T_STEP_SHIFT[0..1], PONTIUS_OUT_SHIFT, PONTIUS_DEGREE;
   see pontius_table_crc32(). */
#define PONTIUS_TABLE_CRC32 0xD54AA01CUL

/* The record behind this header, for compile-time checks, e.g.
 *   #if PONTIUS_VERDICT != PONTIUS_VERDICT_PASS
 *   #error "this calibration did not pass"
 *   #endif */
#define PONTIUS_VERDICT_NOT_JUDGED 0 /* no tolerance in the record: nothing judged */
#define PONTIUS_VERDICT_PASS 1
#define PONTIUS_VERDICT_FAIL 2
#define PONTIUS_VERDICT_RECORD_MODIFIED 3 /* record edited after ridgecal wrote it */
#define PONTIUS_VERDICT_UNDECIDED 4 /* no point outside the tolerance, but conformity not shown (guard band, U or model adequacy) */
#define PONTIUS_VERDICT PONTIUS_VERDICT_NOT_JUDGED
#define PONTIUS_RECORD_SHA256 "f3e1107509c17c09bd2a46c622258f5d3091f480244c193f66006af54708d5ac" /* SHA-256 of the calibration record */
#define PONTIUS_CALIBRATION_DATE "2026-01-01T00:00:00Z" /* when the record was made, UTC; "" if it does not say */

/* Status codes of the range-checked evaluation */
#define PONTIUS_IN_RANGE 0     /* input inside the valid range */
#define PONTIUS_BELOW_RANGE 1  /* input below: result at the lower limit */
#define PONTIUS_ABOVE_RANGE 2  /* input above: result at the upper limit */
#define PONTIUS_NOT_A_NUMBER 3 /* NaN input: result at the lower limit */
/* Results of pontius_check_table() */
#define PONTIUS_TABLE_OK 0
#define PONTIUS_TABLE_CORRUPT 1
#define PONTIUS_TABLE_UNCHECKABLE 2 /* double mode where double is not 64-bit */

/* C99/C++: static inline. GNU C89: static __inline__. Other C89: static. */
#if defined(__cplusplus) || (defined(__STDC_VERSION__) && __STDC_VERSION__ >= 199901L)
#define PONTIUS_INLINE static inline
#elif defined(__GNUC__)
#define PONTIUS_INLINE static __inline__
#else
#define PONTIUS_INLINE static
#endif

#ifdef __cplusplus
extern "C" {
#endif

/* Valid raw input range (integers; reading = raw / 1 (not given)). */
#define PONTIUS_RAW_MIN 150000L
#define PONTIUS_RAW_MAX 3000000L
/* Output unit: 1 / 1000000 (not given) (output = round(reference * 1000000)). */

/* Coefficients of p * 1000000 in powers of t; entry k is in Q(q_k) (value * 2^q_k):
 *   k=0: q_k = 8
 *   k=1: q_k = 10
 *   k=2: q_k = 17
 */
static const int32_t PONTIUS_COEF[PONTIUS_DEGREE + 1] = {
    293331440L, /* t^0, Q8 */
    1053692087L, /* t^1, Q10 */
    -841277440L  /* t^2, Q17 */
};

/* t_q = t * 2^30 = rshift_round((raw - PONTIUS_T_R0) * PONTIUS_T_MUL + PONTIUS_T_ADD, PONTIUS_T_SHIFT). */
#define PONTIUS_T_R0 ((int64_t)1575000L)
#define PONTIUS_T_MUL ((int64_t)1580210396L)
#define PONTIUS_T_ADD ((int64_t)0L)
#define PONTIUS_T_SHIFT 21U
/* Shift after the product with t_q in Horner step k (entry k). */
static const uint8_t PONTIUS_T_STEP_SHIFT[2] = {32U, 37U};
/* Final shift from Q8 to the output unit. */
#define PONTIUS_OUT_SHIFT 8U

/* floor((v + 2^(s-1)) / 2^s), i.e. v / 2^s rounded half up, for
   -2^62 <= v + 2^(s-1) < 2^62 and 1 <= s <= 61. Only a non-negative value is
   shifted (v is offset by 2^62 first), so the result does not depend on how
   the compiler shifts negative numbers (implementation-defined in C). */
PONTIUS_INLINE int64_t pontius_rshift_round(int64_t v, unsigned s)
{
    const int64_t bias = (int64_t)1 << 62;
    const uint64_t biased = (uint64_t)(v + bias + ((int64_t)1 << (s - 1U)));
    return (int64_t)(biased >> s) - (bias >> s);
}

/* pontius_eval_fixed: round(reference * 1000000) as int32 (1/1000000 (not given))
 * for a raw integer reading in [PONTIUS_RAW_MIN, PONTIUS_RAW_MAX].
 * Precision: integer only -- int32 coefficients, int64 intermediates, every
 * shift rounds half up; output resolution 1/1000000 (not given).
 * t_q = t * 2^30 = rshift_round((raw - 1575000) * 1580210396 + 0, 21)
 * Overflow proof (exact integer interval arithmetic over the whole raw range,
 * every value below is a proved bound of that intermediate):
 *   (raw - r0) * mul + add in [-2251799814300000, 2251799814300000]
 *   t_q in [-1073741824, 1073741824]
 *   step 1: acc*t_q in [-903314772915650560, 903314772915650560], >> 37, acc (Q10) in [1047119607, 1060264567]
 *   step 0: acc*t_q in [-1138450410093150208, 1138450410093150208], >> 32, acc (Q8) in [28265298, 558397582]
 *   output in [110411, 2181241]
 *   limits: every shifted value within [-2^62, 2^62), every product within
 *   +/-2^62, accumulators and output within int32.
 * Measured max |error| against the double-precision model, output rounding
 * included: 5.014e-07 (not given) (2041 raw inputs checked). Outside the raw range the
 * bounds do not hold: use pontius_eval_fixed_checked() for untrusted input. */
PONTIUS_INLINE int32_t pontius_eval_fixed(int32_t raw)
{
    const int64_t t = pontius_rshift_round(((int64_t)raw - PONTIUS_T_R0) * PONTIUS_T_MUL + PONTIUS_T_ADD, PONTIUS_T_SHIFT);
    int64_t acc = (int64_t)PONTIUS_COEF[2];
    acc = pontius_rshift_round(acc * t, (unsigned)PONTIUS_T_STEP_SHIFT[1]) + PONTIUS_COEF[1];
    acc = pontius_rshift_round(acc * t, (unsigned)PONTIUS_T_STEP_SHIFT[0]) + PONTIUS_COEF[0];
    return (int32_t)pontius_rshift_round(acc, PONTIUS_OUT_SHIFT);
}

/* pontius_eval_fixed_checked: as pontius_eval_fixed, but never leaves the raw range:
 * raw outside [PONTIUS_RAW_MIN, PONTIUS_RAW_MAX] is clamped to the nearest limit and
 * *status (if status is not NULL) is set to PONTIUS_IN_RANGE, _BELOW_RANGE or
 * _ABOVE_RANGE. Precision as pontius_eval_fixed. */
PONTIUS_INLINE int32_t pontius_eval_fixed_checked(int32_t raw, int *status)
{
    int s = PONTIUS_IN_RANGE;
    if (raw < PONTIUS_RAW_MIN) {
        s = PONTIUS_BELOW_RANGE;
        raw = PONTIUS_RAW_MIN;
    } else if (raw > PONTIUS_RAW_MAX) {
        s = PONTIUS_ABOVE_RANGE;
        raw = PONTIUS_RAW_MAX;
    }
    if (status != 0)
        *status = s;
    return pontius_eval_fixed(raw);
}

/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over
   PONTIUS_TABLE_CRC32's list, each value's bit pattern (two's complement),
   least significant byte first -- the same on little- and big-endian targets.
   Bitwise (no table). Call it at start-up via pontius_check_table(). */
PONTIUS_INLINE uint32_t pontius_crc32_step(uint32_t crc, uint64_t bits, unsigned n)
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

PONTIUS_INLINE uint32_t pontius_table_crc32(void)
{
    uint32_t crc = 0xFFFFFFFFUL;
    unsigned k;
    for (k = 0U; k < (unsigned)(PONTIUS_DEGREE + 1); ++k)
        crc = pontius_crc32_step(crc, (uint64_t)(uint32_t)(PONTIUS_COEF[k]), 4U);
    crc = pontius_crc32_step(crc, (uint64_t)(uint32_t)(PONTIUS_RAW_MIN), 4U);
    crc = pontius_crc32_step(crc, (uint64_t)(uint32_t)(PONTIUS_RAW_MAX), 4U);
    crc = pontius_crc32_step(crc, (uint64_t)(PONTIUS_T_R0), 8U);
    crc = pontius_crc32_step(crc, (uint64_t)(PONTIUS_T_MUL), 8U);
    crc = pontius_crc32_step(crc, (uint64_t)(PONTIUS_T_ADD), 8U);
    crc = pontius_crc32_step(crc, (uint64_t)(uint32_t)(PONTIUS_T_SHIFT), 4U);
    for (k = 0U; k < (unsigned)(2); ++k)
        crc = pontius_crc32_step(crc, (uint64_t)PONTIUS_T_STEP_SHIFT[k], 1U);
    crc = pontius_crc32_step(crc, (uint64_t)(uint32_t)(PONTIUS_OUT_SHIFT), 4U);
    crc = pontius_crc32_step(crc, (uint64_t)(uint32_t)(PONTIUS_DEGREE), 4U);
    return crc ^ (uint32_t)0xFFFFFFFFUL;
}

/* Start-up self-check: PONTIUS_TABLE_OK when every constant is intact,
   PONTIUS_TABLE_CORRUPT otherwise. */
PONTIUS_INLINE int pontius_check_table(void)
{
    return pontius_table_crc32() == PONTIUS_TABLE_CRC32 ? PONTIUS_TABLE_OK : PONTIUS_TABLE_CORRUPT;
}

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* PONTIUS_RIDGECAL_CALIBRATION_H */
