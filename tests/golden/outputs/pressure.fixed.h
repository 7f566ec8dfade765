/* ==========================================================================
 * GENERATED FILE -- DO NOT EDIT.
 * Written by ridgecal 0.1.0 (ridgecal export). Regenerate it from the calibration record
 * instead of editing: the self-check CRC and the QA figures below would no
 * longer match.
 * Header format version 2 (PT7_FORMAT_VERSION).
 * ==========================================================================
 *
 * Calibration QA (extended model, second input aux)
 *   sensor:              test rig PT-7
 *   reading unit:        counts
 *   reference unit:      bar
 *   aux unit:            temperature units
 *   transforms:          reading; reference
 *   calibrated reading:  [5861, 59787.5] counts
 *   calibrated aux:      [-20.53, 79.87] temperature units
 *   terms, degrees:      12 terms (chebyshev basis), reading degree 2, aux degree 3
 *   lambda:              4.17532e-05
 *   validation:          RMSE 0.00114136, max |error| 0.00282947 bar
 *   test:                RMSE 0.00115269, max |error| 0.00261416 bar
 *   tolerance:           none in the record
 *   tolerance used:      0.00114136 bar (validation RMSE, fallback: no absolute tolerance given)
 *   result:              not assessed (no tolerance in the record)
 *   record SHA-256:      1409132242253a39baf005a4397474486374eb53364b528447153f67bc71a6ac
 *   tool version:        ridgecal 0.1.0
 *
 * Export proof (evaluated at export time by a host emulation of the
 * arithmetic below over a grid of (reading, aux) points, compared with the double-precision model)
 *   numeric mode:        fixed
 *   number formats:      int32 coefficients (Q per entry), t in Q30, s in Q30, int64 intermediates, output = round(y * 100000) int32
 *   inputs checked:      81062 (161 of them calibration points)
 *   max deviation:       5.015e-06 bar at reading 56282, aux 64.81
 *   allowed deviation:   0.0001141 bar (0.1 x tolerance used)
 *
 * CAUTION: this header reproduces a fitted calibration surface, nothing more,
 * and only inside the calibrated region of every input. Where the measurement
 * is safety-relevant (medical, legal metrology, gas, pressure, process
 * safety, ...) calibration, verification and release of the instrument must
 * follow local codes and certified procedures; the QA figures above do not
 * replace them.
 *
 * Build requirement: compile every file that includes this header with
 * -ffp-contract=off and never with -ffast-math / -Ofast. GCC ignores
 * '#pragma STDC FP_CONTRACT OFF' (used below for other compilers), and a
 * fused multiply-add changes the last bits of the float/double results.
 * Uses <stdint.h> only: no libm, no malloc, no libc calls.
 */
#ifndef PT7_RIDGECAL_CALIBRATION_H
#define PT7_RIDGECAL_CALIBRATION_H

#include <stdint.h>

#define PT7_FORMAT_VERSION 2
#define PT7_NUMERIC_FIXED 1
#define PT7_EXTENDED_MODEL 1 /* transforms and/or aux input: see the functions */
#define PT7_HAS_AUX 1 /* the functions take (reading, aux) */
#define PT7_READING_DEGREE 2
#define PT7_AUX_DEGREE 3
#define PT7_N_COEF 12 /* (READING_DEGREE + 1) * (AUX_DEGREE + 1) */
/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the
   bit patterns of every constant the evaluation uses, in this order
   PT7_COEF[0..11], PT7_RAW_MIN, PT7_RAW_MAX, PT7_AUX_RAW_MIN,
   PT7_AUX_RAW_MAX, PT7_T_R0, PT7_T_MUL, PT7_T_ADD, PT7_T_SHIFT, PT7_S_R0,
   PT7_S_MUL, PT7_S_ADD, PT7_S_SHIFT, PT7_T_STEP_SHIFT[0..1],
   PT7_S_STEP_SHIFT[0..8], PT7_OUT_SHIFT, PT7_READING_DEGREE,
   PT7_AUX_DEGREE, PT7_N_COEF;
   see pt7_table_crc32(). */
#define PT7_TABLE_CRC32 0x4181F906UL

/* The record behind this header, for compile-time checks, e.g.
 *   #if PT7_VERDICT != PT7_VERDICT_PASS
 *   #error "this calibration did not pass"
 *   #endif */
#define PT7_VERDICT_NOT_JUDGED 0 /* no tolerance in the record: nothing judged */
#define PT7_VERDICT_PASS 1
#define PT7_VERDICT_FAIL 2
#define PT7_VERDICT_RECORD_MODIFIED 3 /* record edited after ridgecal wrote it */
#define PT7_VERDICT_UNDECIDED 4 /* no point outside the tolerance, but conformity not shown (guard band, U or model adequacy) */
#define PT7_VERDICT PT7_VERDICT_NOT_JUDGED
#define PT7_RECORD_SHA256 "1409132242253a39baf005a4397474486374eb53364b528447153f67bc71a6ac" /* SHA-256 of the calibration record */
#define PT7_CALIBRATION_DATE "2026-01-01T00:00:00Z" /* when the record was made, UTC; "" if it does not say */

/* Status codes of the range-checked evaluation: the reading's code plus the aux input's code */
#define PT7_IN_RANGE 0     /* input inside the valid range */
#define PT7_BELOW_RANGE 1  /* reading below: evaluated at the lower limit */
#define PT7_ABOVE_RANGE 2  /* reading above: evaluated at the upper limit */
#define PT7_NOT_A_NUMBER 3 /* NaN reading: evaluated at the lower limit */
#define PT7_AUX_BELOW_RANGE 4  /* aux below: evaluated at its lower limit */
#define PT7_AUX_ABOVE_RANGE 8  /* aux above: evaluated at its upper limit */
#define PT7_AUX_NOT_A_NUMBER 12 /* NaN aux: evaluated at its lower limit */
/* e.g. status & 3 is the reading's code, status & 12 the aux input's. */
/* Results of pt7_check_table() */
#define PT7_TABLE_OK 0
#define PT7_TABLE_CORRUPT 1
#define PT7_TABLE_UNCHECKABLE 2 /* double mode where double is not 64-bit */

/* C99/C++: static inline. GNU C89: static __inline__. Other C89: static. */
#if defined(__cplusplus) || (defined(__STDC_VERSION__) && __STDC_VERSION__ >= 199901L)
#define PT7_INLINE static inline
#elif defined(__GNUC__)
#define PT7_INLINE static __inline__
#else
#define PT7_INLINE static
#endif

#ifdef __cplusplus
extern "C" {
#endif

/* Valid raw reading range (integers; reading = raw / 1 counts). */
#define PT7_RAW_MIN 5861L
#define PT7_RAW_MAX 59787L
/* Valid raw aux range (integers; aux = raw_aux / 100 temperature units). */
#define PT7_AUX_RAW_MIN -2053L
#define PT7_AUX_RAW_MAX 7987L
/* Output unit: 1 / 100000 bar (output = round(reference * 100000)). */

/* Coefficients m[k][l] * 100000 of v = sum_k t^k (sum_l m[k][l] s^l), entry k * (AUX_DEGREE + 1) + l,
   each in Q(q) (value * 2^q, q in the comment). */
static const int32_t PT7_COEF[PT7_N_COEF] = {
    435395107L, /* t^0 s^0, Q9 */
    964446206L, /* t^0 s^1, Q14 */
    783858138L, /* t^0 s^2, Q18 */
    846258259L, /* t^0 s^3, Q22 */
    883064278L, /* t^1 s^0, Q10 */
    551841268L, /* t^1 s^1, Q13 */
    704760611L, /* t^1 s^2, Q17 */
    1039264889L, /* t^1 s^3, Q21 */
    467579075L, /* t^2 s^0, Q16 */
    785414198L, /* t^2 s^1, Q19 */
    463832430L, /* t^2 s^2, Q21 */
    628848760L  /* t^2 s^3, Q22 */
};

/* t_q = t * 2^30 = rshift_round((raw - PT7_T_R0) * PT7_T_MUL + PT7_T_ADD, PT7_T_SHIFT). */
#define PT7_T_R0 ((int64_t)32824L)
#define PT7_T_MUL ((int64_t)1304901007L)
#define PT7_T_ADD ((int64_t)-326225252L)
#define PT7_T_SHIFT 15U
/* s_q = s * 2^30 = rshift_round((raw_aux - PT7_S_R0) * PT7_S_MUL + PT7_S_ADD, PT7_S_SHIFT). */
#define PT7_S_R0 ((int64_t)2967L)
#define PT7_S_MUL ((int64_t)1752209765L)
#define PT7_S_ADD ((int64_t)0L)
#define PT7_S_SHIFT 13U
/* Shift after the product with t_q in Horner step k (entry k). */
static const uint8_t PT7_T_STEP_SHIFT[2] = {31U, 36U};
/* Shift after the product with s_q, entry k * PT7_AUX_DEGREE + l (row k, step l). */
static const uint8_t PT7_S_STEP_SHIFT[9] = {35U, 34U, 34U, 33U, 34U, 34U, 33U, 32U, 31U};
/* Final shift from Q9 to the output unit. */
#define PT7_OUT_SHIFT 9U

/* floor((v + 2^(s-1)) / 2^s), i.e. v / 2^s rounded half up, for
   -2^62 <= v + 2^(s-1) < 2^62 and 1 <= s <= 61. Only a non-negative value is
   shifted (v is offset by 2^62 first), so the result does not depend on how
   the compiler shifts negative numbers (implementation-defined in C). */
PT7_INLINE int64_t pt7_rshift_round(int64_t v, unsigned s)
{
    const int64_t bias = (int64_t)1 << 62;
    const uint64_t biased = (uint64_t)(v + bias + ((int64_t)1 << (s - 1U)));
    return (int64_t)(biased >> s) - (bias >> s);
}

/* pt7_eval_fixed: round(reference * 100000) as int32 (1/100000 bar)
 * for a raw integer reading in [PT7_RAW_MIN, PT7_RAW_MAX] and raw aux in [PT7_AUX_RAW_MIN, PT7_AUX_RAW_MAX].
 * Precision: integer only -- int32 coefficients, int64 intermediates, every
 * shift rounds half up; output resolution 1/100000 bar.
 * t_q = t * 2^30 = rshift_round((raw - 32824) * 1304901007 + -326225252, 15)
 * s_q = s * 2^30 = rshift_round((raw_aux - 2967) * 1752209765 + 0, 13)
 * Overflow proof (exact integer interval arithmetic over the whole raw
 * ranges; every value is a proved bound):
 *   t_q in [-1073741824, 1073721912]
 *   s_q in [-1073741824, 1073741824]
 *   every product |acc * t_q|, |w * s_q| <= 1115902177534017536 (< 2^62)
 *   every accumulator |acc|, |w| <= 1016743036 (< 2^31)
 *   output in [-156283, 1857028]
 * Measured max |error| against the double-precision model, output rounding
 * included: 5.015e-06 bar (81062 raw input pairs checked). Outside the raw ranges the
 * bounds do not hold: use pt7_eval_fixed_checked() for untrusted input. */
PT7_INLINE int32_t pt7_eval_fixed(int32_t raw, int32_t raw_aux)
{
    const int64_t t = pt7_rshift_round(((int64_t)raw - PT7_T_R0) * PT7_T_MUL + PT7_T_ADD, PT7_T_SHIFT);
    const int64_t s = pt7_rshift_round(((int64_t)raw_aux - PT7_S_R0) * PT7_S_MUL + PT7_S_ADD, PT7_S_SHIFT);
    int64_t w, acc;
    w = (int64_t)PT7_COEF[11];
    w = pt7_rshift_round(w * s, (unsigned)PT7_S_STEP_SHIFT[8]) + PT7_COEF[10];
    w = pt7_rshift_round(w * s, (unsigned)PT7_S_STEP_SHIFT[7]) + PT7_COEF[9];
    w = pt7_rshift_round(w * s, (unsigned)PT7_S_STEP_SHIFT[6]) + PT7_COEF[8];
    acc = w;
    w = (int64_t)PT7_COEF[7];
    w = pt7_rshift_round(w * s, (unsigned)PT7_S_STEP_SHIFT[5]) + PT7_COEF[6];
    w = pt7_rshift_round(w * s, (unsigned)PT7_S_STEP_SHIFT[4]) + PT7_COEF[5];
    w = pt7_rshift_round(w * s, (unsigned)PT7_S_STEP_SHIFT[3]) + PT7_COEF[4];
    acc = pt7_rshift_round(acc * t, (unsigned)PT7_T_STEP_SHIFT[1]) + w;
    w = (int64_t)PT7_COEF[3];
    w = pt7_rshift_round(w * s, (unsigned)PT7_S_STEP_SHIFT[2]) + PT7_COEF[2];
    w = pt7_rshift_round(w * s, (unsigned)PT7_S_STEP_SHIFT[1]) + PT7_COEF[1];
    w = pt7_rshift_round(w * s, (unsigned)PT7_S_STEP_SHIFT[0]) + PT7_COEF[0];
    acc = pt7_rshift_round(acc * t, (unsigned)PT7_T_STEP_SHIFT[0]) + w;
    return (int32_t)pt7_rshift_round(acc, PT7_OUT_SHIFT);
}

/* pt7_eval_fixed_checked: as pt7_eval_fixed, but never leaves the raw ranges:
 * raw outside [PT7_RAW_MIN, PT7_RAW_MAX] is clamped to the nearest limit, and so is
 * raw_aux to [PT7_AUX_RAW_MIN, PT7_AUX_RAW_MAX];
 * *status (if status is not NULL) is set to PT7_IN_RANGE, _BELOW_RANGE or _ABOVE_RANGE
 * plus PT7_AUX_BELOW_RANGE or _AUX_ABOVE_RANGE. Precision as pt7_eval_fixed. */
PT7_INLINE int32_t pt7_eval_fixed_checked(int32_t raw, int32_t raw_aux, int *status)
{
    int st = PT7_IN_RANGE;
    if (raw < PT7_RAW_MIN) {
        st = PT7_BELOW_RANGE;
        raw = PT7_RAW_MIN;
    } else if (raw > PT7_RAW_MAX) {
        st = PT7_ABOVE_RANGE;
        raw = PT7_RAW_MAX;
    }
    if (raw_aux < PT7_AUX_RAW_MIN) {
        st += PT7_AUX_BELOW_RANGE;
        raw_aux = PT7_AUX_RAW_MIN;
    } else if (raw_aux > PT7_AUX_RAW_MAX) {
        st += PT7_AUX_ABOVE_RANGE;
        raw_aux = PT7_AUX_RAW_MAX;
    }
    if (status != 0)
        *status = st;
    return pt7_eval_fixed(raw, raw_aux);
}

/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over
   PT7_TABLE_CRC32's list, each value's bit pattern (two's complement),
   least significant byte first -- the same on little- and big-endian targets.
   Bitwise (no table). Call it at start-up via pt7_check_table(). */
PT7_INLINE uint32_t pt7_crc32_step(uint32_t crc, uint64_t bits, unsigned n)
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

PT7_INLINE uint32_t pt7_table_crc32(void)
{
    uint32_t crc = 0xFFFFFFFFUL;
    unsigned k;
    for (k = 0U; k < (unsigned)(PT7_N_COEF); ++k)
        crc = pt7_crc32_step(crc, (uint64_t)(uint32_t)(PT7_COEF[k]), 4U);
    crc = pt7_crc32_step(crc, (uint64_t)(uint32_t)(PT7_RAW_MIN), 4U);
    crc = pt7_crc32_step(crc, (uint64_t)(uint32_t)(PT7_RAW_MAX), 4U);
    crc = pt7_crc32_step(crc, (uint64_t)(uint32_t)(PT7_AUX_RAW_MIN), 4U);
    crc = pt7_crc32_step(crc, (uint64_t)(uint32_t)(PT7_AUX_RAW_MAX), 4U);
    crc = pt7_crc32_step(crc, (uint64_t)(PT7_T_R0), 8U);
    crc = pt7_crc32_step(crc, (uint64_t)(PT7_T_MUL), 8U);
    crc = pt7_crc32_step(crc, (uint64_t)(PT7_T_ADD), 8U);
    crc = pt7_crc32_step(crc, (uint64_t)(uint32_t)(PT7_T_SHIFT), 4U);
    crc = pt7_crc32_step(crc, (uint64_t)(PT7_S_R0), 8U);
    crc = pt7_crc32_step(crc, (uint64_t)(PT7_S_MUL), 8U);
    crc = pt7_crc32_step(crc, (uint64_t)(PT7_S_ADD), 8U);
    crc = pt7_crc32_step(crc, (uint64_t)(uint32_t)(PT7_S_SHIFT), 4U);
    for (k = 0U; k < (unsigned)(2); ++k)
        crc = pt7_crc32_step(crc, (uint64_t)PT7_T_STEP_SHIFT[k], 1U);
    for (k = 0U; k < (unsigned)(9); ++k)
        crc = pt7_crc32_step(crc, (uint64_t)PT7_S_STEP_SHIFT[k], 1U);
    crc = pt7_crc32_step(crc, (uint64_t)(uint32_t)(PT7_OUT_SHIFT), 4U);
    crc = pt7_crc32_step(crc, (uint64_t)(uint32_t)(PT7_READING_DEGREE), 4U);
    crc = pt7_crc32_step(crc, (uint64_t)(uint32_t)(PT7_AUX_DEGREE), 4U);
    crc = pt7_crc32_step(crc, (uint64_t)(uint32_t)(PT7_N_COEF), 4U);
    return crc ^ (uint32_t)0xFFFFFFFFUL;
}

/* Start-up self-check: PT7_TABLE_OK when every constant is intact,
   PT7_TABLE_CORRUPT otherwise. */
PT7_INLINE int pt7_check_table(void)
{
    return pt7_table_crc32() == PT7_TABLE_CRC32 ? PT7_TABLE_OK : PT7_TABLE_CORRUPT;
}

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* PT7_RIDGECAL_CALIBRATION_H */
