/* ==========================================================================
 * GENERATED FILE -- DO NOT EDIT.
 * Written by ridgecal 0.1.0 (ridgecal export). Regenerate it from the calibration record
 * instead of editing: the self-check CRC and the QA figures below would no
 * longer match.
 * Header format version 2 (NORRIS_FORMAT_VERSION).
 * ==========================================================================
 *
 * Calibration QA
 *   sensor:              (not given)
 *   reading unit:        (not given)
 *   reference unit:      (not given)
 *   calibrated range:    [0.2, 999] (not given) (reading)
 *   degree, lambda:      1, 0
 *   validation:          RMSE 0.848826, max |error| 1.97318 (not given)
 *   test:                RMSE n/a, max |error| n/a (not given)
 *   tolerance:           none in the record
 *   tolerance used:      0.848826 (not given) (validation RMSE, fallback: no absolute tolerance given)
 *   result:              not assessed (no tolerance in the record)
 *   record SHA-256:      ed6fae6c8ae47467057454243fb76844167eb8edac5de5c8271449bba3b600f4
 *   tool version:        ridgecal 0.1.0
 *
 * Export proof (evaluated at export time by an exact host emulation of the
 * arithmetic below, compared with the double-precision model)
 *   numeric mode:        fixed
 *   number formats:      int32 coefficients Q[10,11] (t^0..t^n), t in Q30, int64 intermediates, output = round(y * 1000) int32
 *   inputs checked:      1030 (31 of them calibration readings)
 *   max deviation:       0.0005 (not given) at reading 923 (not given) (raw 923)
 *   allowed deviation:   0.08488 (not given) (0.1 x tolerance used)
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
#ifndef NORRIS_RIDGECAL_CALIBRATION_H
#define NORRIS_RIDGECAL_CALIBRATION_H

#include <stdint.h>

#define NORRIS_FORMAT_VERSION 2
#define NORRIS_NUMERIC_FIXED 1
#define NORRIS_DEGREE 1
/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the
   bit patterns of every constant the evaluation uses, in this order
   NORRIS_COEF[0..1], NORRIS_RAW_MIN, NORRIS_RAW_MAX, NORRIS_T_R0,
   NORRIS_T_MUL, NORRIS_T_ADD, NORRIS_T_SHIFT, NORRIS_T_STEP_SHIFT[0..0],
   NORRIS_OUT_SHIFT, NORRIS_DEGREE;
   see norris_table_crc32(). */
#define NORRIS_TABLE_CRC32 0x40E0703DUL

/* The record behind this header, for compile-time checks, e.g.
 *   #if NORRIS_VERDICT != NORRIS_VERDICT_PASS
 *   #error "this calibration did not pass"
 *   #endif */
#define NORRIS_VERDICT_NOT_JUDGED 0 /* no tolerance in the record: nothing judged */
#define NORRIS_VERDICT_PASS 1
#define NORRIS_VERDICT_FAIL 2
#define NORRIS_VERDICT_RECORD_MODIFIED 3 /* record edited after ridgecal wrote it */
#define NORRIS_VERDICT_UNDECIDED 4 /* no point outside the tolerance, but conformity not shown (guard band, U or model adequacy) */
#define NORRIS_VERDICT NORRIS_VERDICT_NOT_JUDGED
#define NORRIS_RECORD_SHA256 "ed6fae6c8ae47467057454243fb76844167eb8edac5de5c8271449bba3b600f4" /* SHA-256 of the calibration record */
#define NORRIS_CALIBRATION_DATE "2026-01-01T00:00:00Z" /* when the record was made, UTC; "" if it does not say */

/* Status codes of the range-checked evaluation */
#define NORRIS_IN_RANGE 0     /* input inside the valid range */
#define NORRIS_BELOW_RANGE 1  /* input below: result at the lower limit */
#define NORRIS_ABOVE_RANGE 2  /* input above: result at the upper limit */
#define NORRIS_NOT_A_NUMBER 3 /* NaN input: result at the lower limit */
/* Results of norris_check_table() */
#define NORRIS_TABLE_OK 0
#define NORRIS_TABLE_CORRUPT 1
#define NORRIS_TABLE_UNCHECKABLE 2 /* double mode where double is not 64-bit */

/* C99/C++: static inline. GNU C89: static __inline__. Other C89: static. */
#if defined(__cplusplus) || (defined(__STDC_VERSION__) && __STDC_VERSION__ >= 199901L)
#define NORRIS_INLINE static inline
#elif defined(__GNUC__)
#define NORRIS_INLINE static __inline__
#else
#define NORRIS_INLINE static
#endif

#ifdef __cplusplus
extern "C" {
#endif

/* Valid raw input range (integers; reading = raw / 1 (not given)). */
#define NORRIS_RAW_MIN 1L
#define NORRIS_RAW_MAX 999L
/* Output unit: 1 / 1000 (not given) (output = round(reference * 1000)). */

/* Coefficients of p * 1000 in powers of t; entry k is in Q(q_k) (value * 2^q_k):
 *   k=0: q_k = 10
 *   k=1: q_k = 11
 */
static const int32_t NORRIS_COEF[NORRIS_DEGREE + 1] = {
    512404725L, /* t^0, Q10 */
    1024936221L  /* t^1, Q11 */
};

/* t_q = t * 2^30 = rshift_round((raw - NORRIS_T_R0) * NORRIS_T_MUL + NORRIS_T_ADD, NORRIS_T_SHIFT). */
#define NORRIS_T_R0 ((int64_t)500L)
#define NORRIS_T_MUL ((int64_t)1100832627L)
#define NORRIS_T_ADD ((int64_t)440333051L)
#define NORRIS_T_SHIFT 9U
/* Shift after the product with t_q in Horner step k (entry k). */
static const uint8_t NORRIS_T_STEP_SHIFT[1] = {31U};
/* Final shift from Q10 to the output unit. */
#define NORRIS_OUT_SHIFT 10U

/* floor((v + 2^(s-1)) / 2^s), i.e. v / 2^s rounded half up, for
   -2^62 <= v + 2^(s-1) < 2^62 and 1 <= s <= 61. Only a non-negative value is
   shifted (v is offset by 2^62 first), so the result does not depend on how
   the compiler shifts negative numbers (implementation-defined in C). */
NORRIS_INLINE int64_t norris_rshift_round(int64_t v, unsigned s)
{
    const int64_t bias = (int64_t)1 << 62;
    const uint64_t biased = (uint64_t)(v + bias + ((int64_t)1 << (s - 1U)));
    return (int64_t)(biased >> s) - (bias >> s);
}

/* norris_eval_fixed: round(reference * 1000) as int32 (1/1000 (not given))
 * for a raw integer reading in [NORRIS_RAW_MIN, NORRIS_RAW_MAX].
 * Precision: integer only -- int32 coefficients, int64 intermediates, every
 * shift rounds half up; output resolution 1/1000 (not given).
 * t_q = t * 2^30 = rshift_round((raw - 500) * 1100832627 + 440333051, 9)
 * Overflow proof (exact integer interval arithmetic over the whole raw range,
 * every value below is a proved bound of that intermediate):
 *   (raw - r0) * mul + add in [-548875147822, 549755813924]
 *   t_q in [-1072021773, 1073741824]
 *   step 0: acc*t_q in [-1098753944848339833, 1100516887420207104], >> 31, acc (Q10) in [757549, 1024872836]
 *   output in [740, 1000852]
 *   limits: every shifted value within [-2^62, 2^62), every product within
 *   +/-2^62, accumulators and output within int32.
 * Measured max |error| against the double-precision model, output rounding
 * included: 0.0005 (not given) (1030 raw inputs checked). Outside the raw range the
 * bounds do not hold: use norris_eval_fixed_checked() for untrusted input. */
NORRIS_INLINE int32_t norris_eval_fixed(int32_t raw)
{
    const int64_t t = norris_rshift_round(((int64_t)raw - NORRIS_T_R0) * NORRIS_T_MUL + NORRIS_T_ADD, NORRIS_T_SHIFT);
    int64_t acc = (int64_t)NORRIS_COEF[1];
    acc = norris_rshift_round(acc * t, (unsigned)NORRIS_T_STEP_SHIFT[0]) + NORRIS_COEF[0];
    return (int32_t)norris_rshift_round(acc, NORRIS_OUT_SHIFT);
}

/* norris_eval_fixed_checked: as norris_eval_fixed, but never leaves the raw range:
 * raw outside [NORRIS_RAW_MIN, NORRIS_RAW_MAX] is clamped to the nearest limit and
 * *status (if status is not NULL) is set to NORRIS_IN_RANGE, _BELOW_RANGE or
 * _ABOVE_RANGE. Precision as norris_eval_fixed. */
NORRIS_INLINE int32_t norris_eval_fixed_checked(int32_t raw, int *status)
{
    int s = NORRIS_IN_RANGE;
    if (raw < NORRIS_RAW_MIN) {
        s = NORRIS_BELOW_RANGE;
        raw = NORRIS_RAW_MIN;
    } else if (raw > NORRIS_RAW_MAX) {
        s = NORRIS_ABOVE_RANGE;
        raw = NORRIS_RAW_MAX;
    }
    if (status != 0)
        *status = s;
    return norris_eval_fixed(raw);
}

/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over
   NORRIS_TABLE_CRC32's list, each value's bit pattern (two's complement),
   least significant byte first -- the same on little- and big-endian targets.
   Bitwise (no table). Call it at start-up via norris_check_table(). */
NORRIS_INLINE uint32_t norris_crc32_step(uint32_t crc, uint64_t bits, unsigned n)
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

NORRIS_INLINE uint32_t norris_table_crc32(void)
{
    uint32_t crc = 0xFFFFFFFFUL;
    unsigned k;
    for (k = 0U; k < (unsigned)(NORRIS_DEGREE + 1); ++k)
        crc = norris_crc32_step(crc, (uint64_t)(uint32_t)(NORRIS_COEF[k]), 4U);
    crc = norris_crc32_step(crc, (uint64_t)(uint32_t)(NORRIS_RAW_MIN), 4U);
    crc = norris_crc32_step(crc, (uint64_t)(uint32_t)(NORRIS_RAW_MAX), 4U);
    crc = norris_crc32_step(crc, (uint64_t)(NORRIS_T_R0), 8U);
    crc = norris_crc32_step(crc, (uint64_t)(NORRIS_T_MUL), 8U);
    crc = norris_crc32_step(crc, (uint64_t)(NORRIS_T_ADD), 8U);
    crc = norris_crc32_step(crc, (uint64_t)(uint32_t)(NORRIS_T_SHIFT), 4U);
    for (k = 0U; k < (unsigned)(1); ++k)
        crc = norris_crc32_step(crc, (uint64_t)NORRIS_T_STEP_SHIFT[k], 1U);
    crc = norris_crc32_step(crc, (uint64_t)(uint32_t)(NORRIS_OUT_SHIFT), 4U);
    crc = norris_crc32_step(crc, (uint64_t)(uint32_t)(NORRIS_DEGREE), 4U);
    return crc ^ (uint32_t)0xFFFFFFFFUL;
}

/* Start-up self-check: NORRIS_TABLE_OK when every constant is intact,
   NORRIS_TABLE_CORRUPT otherwise. */
NORRIS_INLINE int norris_check_table(void)
{
    return norris_table_crc32() == NORRIS_TABLE_CRC32 ? NORRIS_TABLE_OK : NORRIS_TABLE_CORRUPT;
}

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* NORRIS_RIDGECAL_CALIBRATION_H */
