/* ==========================================================================
 * GENERATED FILE -- DO NOT EDIT.
 * Written by ridgecal 0.1.0 (ridgecal export). Regenerate it from the calibration record
 * instead of editing: the self-check CRC and the QA figures below would no
 * longer match.
 * Header format version 2 (NOINT1_FORMAT_VERSION).
 * ==========================================================================
 *
 * Calibration QA
 *   sensor:              (not given)
 *   reading unit:        (not given)
 *   reference unit:      (not given)
 *   calibrated range:    [60, 70] (not given) (reading)
 *   degree, lambda:      1, 0
 *   validation:          RMSE 3.05461, max |error| 4.85022 (not given)
 *   test:                RMSE n/a, max |error| n/a (not given)
 *   tolerance:           none in the record
 *   tolerance used:      3.05461 (not given) (validation RMSE, fallback: no absolute tolerance given)
 *   result:              not assessed (no tolerance in the record)
 *   record SHA-256:      787f2f7afb830640f1404ec795caa68b6a1ae87ae75108da716c2f7dbb90b9b7
 *   tool version:        ridgecal 0.1.0
 *
 * Export proof (evaluated at export time by an exact host emulation of the
 * arithmetic below, compared with the double-precision model)
 *   numeric mode:        fixed
 *   number formats:      int32 coefficients Q[12,16] (t^0..t^n), t in Q30, int64 intermediates, output = round(y * 1000) int32
 *   inputs checked:      22 (11 of them calibration readings)
 *   max deviation:       0.0004711 (not given) at reading 67 (not given) (raw 67)
 *   allowed deviation:   0.3055 (not given) (0.1 x tolerance used)
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
#ifndef NOINT1_RIDGECAL_CALIBRATION_H
#define NOINT1_RIDGECAL_CALIBRATION_H

#include <stdint.h>

#define NOINT1_FORMAT_VERSION 2
#define NOINT1_NUMERIC_FIXED 1
#define NOINT1_DEGREE 1
/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the
   bit patterns of every constant the evaluation uses, in this order
   NOINT1_COEF[0..1], NOINT1_RAW_MIN, NOINT1_RAW_MAX, NOINT1_T_R0,
   NOINT1_T_MUL, NOINT1_T_ADD, NOINT1_T_SHIFT, NOINT1_T_STEP_SHIFT[0..0],
   NOINT1_OUT_SHIFT, NOINT1_DEGREE;
   see noint1_table_crc32(). */
#define NOINT1_TABLE_CRC32 0xA2CA2749UL

/* The record behind this header, for compile-time checks, e.g.
 *   #if NOINT1_VERDICT != NOINT1_VERDICT_PASS
 *   #error "this calibration did not pass"
 *   #endif */
#define NOINT1_VERDICT_NOT_JUDGED 0 /* no tolerance in the record: nothing judged */
#define NOINT1_VERDICT_PASS 1
#define NOINT1_VERDICT_FAIL 2
#define NOINT1_VERDICT_RECORD_MODIFIED 3 /* record edited after ridgecal wrote it */
#define NOINT1_VERDICT_UNDECIDED 4 /* no point outside the tolerance, but conformity not shown (guard band, U or model adequacy) */
#define NOINT1_VERDICT NOINT1_VERDICT_NOT_JUDGED
#define NOINT1_RECORD_SHA256 "787f2f7afb830640f1404ec795caa68b6a1ae87ae75108da716c2f7dbb90b9b7" /* SHA-256 of the calibration record */
#define NOINT1_CALIBRATION_DATE "2026-01-01T00:00:00Z" /* when the record was made, UTC; "" if it does not say */

/* Status codes of the range-checked evaluation */
#define NOINT1_IN_RANGE 0     /* input inside the valid range */
#define NOINT1_BELOW_RANGE 1  /* input below: result at the lower limit */
#define NOINT1_ABOVE_RANGE 2  /* input above: result at the upper limit */
#define NOINT1_NOT_A_NUMBER 3 /* NaN input: result at the lower limit */
/* Results of noint1_check_table() */
#define NOINT1_TABLE_OK 0
#define NOINT1_TABLE_CORRUPT 1
#define NOINT1_TABLE_UNCHECKABLE 2 /* double mode where double is not 64-bit */

/* C99/C++: static inline. GNU C89: static __inline__. Other C89: static. */
#if defined(__cplusplus) || (defined(__STDC_VERSION__) && __STDC_VERSION__ >= 199901L)
#define NOINT1_INLINE static inline
#elif defined(__GNUC__)
#define NOINT1_INLINE static __inline__
#else
#define NOINT1_INLINE static
#endif

#ifdef __cplusplus
extern "C" {
#endif

/* Valid raw input range (integers; reading = raw / 1 (not given)). */
#define NOINT1_RAW_MIN 60L
#define NOINT1_RAW_MAX 70L
/* Output unit: 1 / 1000 (not given) (output = round(reference * 1000)). */

/* Coefficients of p * 1000 in powers of t; entry k is in Q(q_k) (value * 2^q_k):
 *   k=0: q_k = 12
 *   k=1: q_k = 16
 */
static const int32_t NOINT1_COEF[NOINT1_DEGREE + 1] = {
    552282975L, /* t^0, Q12 */
    679732893L  /* t^1, Q16 */
};

/* t_q = t * 2^30 = rshift_round((raw - NOINT1_T_R0) * NOINT1_T_MUL + NOINT1_T_ADD, NOINT1_T_SHIFT). */
#define NOINT1_T_R0 ((int64_t)65L)
#define NOINT1_T_MUL ((int64_t)1717986918L)
#define NOINT1_T_ADD ((int64_t)0L)
#define NOINT1_T_SHIFT 3U
/* Shift after the product with t_q in Horner step k (entry k). */
static const uint8_t NOINT1_T_STEP_SHIFT[1] = {34U};
/* Final shift from Q12 to the output unit. */
#define NOINT1_OUT_SHIFT 12U

/* floor((v + 2^(s-1)) / 2^s), i.e. v / 2^s rounded half up, for
   -2^62 <= v + 2^(s-1) < 2^62 and 1 <= s <= 61. Only a non-negative value is
   shifted (v is offset by 2^62 first), so the result does not depend on how
   the compiler shifts negative numbers (implementation-defined in C). */
NOINT1_INLINE int64_t noint1_rshift_round(int64_t v, unsigned s)
{
    const int64_t bias = (int64_t)1 << 62;
    const uint64_t biased = (uint64_t)(v + bias + ((int64_t)1 << (s - 1U)));
    return (int64_t)(biased >> s) - (bias >> s);
}

/* noint1_eval_fixed: round(reference * 1000) as int32 (1/1000 (not given))
 * for a raw integer reading in [NOINT1_RAW_MIN, NOINT1_RAW_MAX].
 * Precision: integer only -- int32 coefficients, int64 intermediates, every
 * shift rounds half up; output resolution 1/1000 (not given).
 * t_q = t * 2^30 = rshift_round((raw - 65) * 1717986918 + 0, 3)
 * Overflow proof (exact integer interval arithmetic over the whole raw range,
 * every value below is a proved bound of that intermediate):
 *   (raw - r0) * mul + add in [-8589934590, 8589934590]
 *   t_q in [-1073741824, 1073741824]
 *   step 0: acc*t_q in [-729857636362616832, 729857636362616832], >> 34, acc (Q12) in [509799669, 594766281]
 *   output in [124463, 145207]
 *   limits: every shifted value within [-2^62, 2^62), every product within
 *   +/-2^62, accumulators and output within int32.
 * Measured max |error| against the double-precision model, output rounding
 * included: 0.0004711 (not given) (22 raw inputs checked). Outside the raw range the
 * bounds do not hold: use noint1_eval_fixed_checked() for untrusted input. */
NOINT1_INLINE int32_t noint1_eval_fixed(int32_t raw)
{
    const int64_t t = noint1_rshift_round(((int64_t)raw - NOINT1_T_R0) * NOINT1_T_MUL + NOINT1_T_ADD, NOINT1_T_SHIFT);
    int64_t acc = (int64_t)NOINT1_COEF[1];
    acc = noint1_rshift_round(acc * t, (unsigned)NOINT1_T_STEP_SHIFT[0]) + NOINT1_COEF[0];
    return (int32_t)noint1_rshift_round(acc, NOINT1_OUT_SHIFT);
}

/* noint1_eval_fixed_checked: as noint1_eval_fixed, but never leaves the raw range:
 * raw outside [NOINT1_RAW_MIN, NOINT1_RAW_MAX] is clamped to the nearest limit and
 * *status (if status is not NULL) is set to NOINT1_IN_RANGE, _BELOW_RANGE or
 * _ABOVE_RANGE. Precision as noint1_eval_fixed. */
NOINT1_INLINE int32_t noint1_eval_fixed_checked(int32_t raw, int *status)
{
    int s = NOINT1_IN_RANGE;
    if (raw < NOINT1_RAW_MIN) {
        s = NOINT1_BELOW_RANGE;
        raw = NOINT1_RAW_MIN;
    } else if (raw > NOINT1_RAW_MAX) {
        s = NOINT1_ABOVE_RANGE;
        raw = NOINT1_RAW_MAX;
    }
    if (status != 0)
        *status = s;
    return noint1_eval_fixed(raw);
}

/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over
   NOINT1_TABLE_CRC32's list, each value's bit pattern (two's complement),
   least significant byte first -- the same on little- and big-endian targets.
   Bitwise (no table). Call it at start-up via noint1_check_table(). */
NOINT1_INLINE uint32_t noint1_crc32_step(uint32_t crc, uint64_t bits, unsigned n)
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

NOINT1_INLINE uint32_t noint1_table_crc32(void)
{
    uint32_t crc = 0xFFFFFFFFUL;
    unsigned k;
    for (k = 0U; k < (unsigned)(NOINT1_DEGREE + 1); ++k)
        crc = noint1_crc32_step(crc, (uint64_t)(uint32_t)(NOINT1_COEF[k]), 4U);
    crc = noint1_crc32_step(crc, (uint64_t)(uint32_t)(NOINT1_RAW_MIN), 4U);
    crc = noint1_crc32_step(crc, (uint64_t)(uint32_t)(NOINT1_RAW_MAX), 4U);
    crc = noint1_crc32_step(crc, (uint64_t)(NOINT1_T_R0), 8U);
    crc = noint1_crc32_step(crc, (uint64_t)(NOINT1_T_MUL), 8U);
    crc = noint1_crc32_step(crc, (uint64_t)(NOINT1_T_ADD), 8U);
    crc = noint1_crc32_step(crc, (uint64_t)(uint32_t)(NOINT1_T_SHIFT), 4U);
    for (k = 0U; k < (unsigned)(1); ++k)
        crc = noint1_crc32_step(crc, (uint64_t)NOINT1_T_STEP_SHIFT[k], 1U);
    crc = noint1_crc32_step(crc, (uint64_t)(uint32_t)(NOINT1_OUT_SHIFT), 4U);
    crc = noint1_crc32_step(crc, (uint64_t)(uint32_t)(NOINT1_DEGREE), 4U);
    return crc ^ (uint32_t)0xFFFFFFFFUL;
}

/* Start-up self-check: NOINT1_TABLE_OK when every constant is intact,
   NOINT1_TABLE_CORRUPT otherwise. */
NOINT1_INLINE int noint1_check_table(void)
{
    return noint1_table_crc32() == NOINT1_TABLE_CRC32 ? NOINT1_TABLE_OK : NOINT1_TABLE_CORRUPT;
}

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* NOINT1_RIDGECAL_CALIBRATION_H */
