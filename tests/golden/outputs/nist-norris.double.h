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
 *   numeric mode:        double
 *   number formats:      IEEE binary64, Horner in scaled t = (x - c) * s (chosen: lower error than raw x)
 *   inputs checked:      2037 (36 of them calibration readings)
 *   max deviation:       1.137e-13 (not given) at reading 0.2 (not given)
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
#define NORRIS_NUMERIC_DOUBLE 1
#define NORRIS_DEGREE 1
/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the
   bit patterns of every constant the evaluation uses, in this order
   NORRIS_COEF[0..1], NORRIS_X_MIN, NORRIS_X_MAX, NORRIS_T_CENTER,
   NORRIS_T_SCALE, NORRIS_DEGREE;
   see norris_table_crc32(). */
#define NORRIS_TABLE_CRC32 0x15BFF03BUL

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

/* Valid input range (reading units: (not given)), the calibrated range rounded
   inward to double. */
#define NORRIS_X_MIN 0.2
#define NORRIS_X_MAX 999.0
/* Scaled variable: t = (x - NORRIS_T_CENTER) * NORRIS_T_SCALE, in [-1, 1] on the range. */
#define NORRIS_T_CENTER 499.6
#define NORRIS_T_SCALE 0.002002402883460152

/* Coefficients of p in powers of the scaled variable t (index = power), double. */
static const double NORRIS_COEF[NORRIS_DEGREE + 1] = {
    500.39523920924506, /* t^0 */
    500.45713891941494  /* t^1 */
};

/* norris_eval: reference value ((not given)) for reading x ((not given)).
 * Precision: IEEE 754 binary64 (double) throughout, Horner's scheme in the scaled variable t,
 *   one rounding per operation (no fused multiply-add: build with -ffp-contract=off).
 * Range: [NORRIS_X_MIN, NORRIS_X_MAX]; outside it the result is an
 *   unchecked extrapolation -- use norris_eval_checked() for untrusted input.
 * Measured max |error| against the double-precision model: 1.137e-13 (not given)
 *   (2037 inputs over the range, calibration readings included). */
NORRIS_INLINE double norris_eval(double x)
{
#if !defined(__GNUC__) || defined(__clang__)
#pragma STDC FP_CONTRACT OFF
#endif
    const double t = (x - NORRIS_T_CENTER) * NORRIS_T_SCALE;
    double y = NORRIS_COEF[1];
    y = y * t + NORRIS_COEF[0];
    return y;
}

/* norris_eval_checked: as norris_eval, but never extrapolates.
 * An input outside [NORRIS_X_MIN, NORRIS_X_MAX] (or NaN) is clamped to the
 * nearest limit (NaN: lower limit), and *status (if status is not NULL) is set to
 * NORRIS_IN_RANGE, _BELOW_RANGE, _ABOVE_RANGE or _NOT_A_NUMBER. Precision as norris_eval. */
NORRIS_INLINE double norris_eval_checked(double x, int *status)
{
    int s;
    if (x >= NORRIS_X_MIN && x <= NORRIS_X_MAX) {
        s = NORRIS_IN_RANGE;
    } else if (x < NORRIS_X_MIN) {
        s = NORRIS_BELOW_RANGE;
        x = NORRIS_X_MIN;
    } else if (x > NORRIS_X_MAX) {
        s = NORRIS_ABOVE_RANGE;
        x = NORRIS_X_MAX;
    } else { /* NaN: every comparison above is false */
        s = NORRIS_NOT_A_NUMBER;
        x = NORRIS_X_MIN;
    }
    if (status != 0)
        *status = s;
    return norris_eval(x);
}

/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over
   NORRIS_TABLE_CRC32's list, each value's bit pattern (IEEE 754 binary64; integers two's complement),
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

NORRIS_INLINE uint64_t norris_bits_d(double d)
{
    union { double d; uint64_t u; } pun;
    pun.u = 0U;
    pun.d = d;
    return pun.u;
}

NORRIS_INLINE uint32_t norris_table_crc32(void)
{
    uint32_t crc = 0xFFFFFFFFUL;
    unsigned k;
    for (k = 0U; k < (unsigned)(NORRIS_DEGREE + 1); ++k)
        crc = norris_crc32_step(crc, norris_bits_d(NORRIS_COEF[k]), 8U);
    crc = norris_crc32_step(crc, norris_bits_d(NORRIS_X_MIN), 8U);
    crc = norris_crc32_step(crc, norris_bits_d(NORRIS_X_MAX), 8U);
    crc = norris_crc32_step(crc, norris_bits_d(NORRIS_T_CENTER), 8U);
    crc = norris_crc32_step(crc, norris_bits_d(NORRIS_T_SCALE), 8U);
    crc = norris_crc32_step(crc, (uint64_t)(uint32_t)(NORRIS_DEGREE), 4U);
    return crc ^ (uint32_t)0xFFFFFFFFUL;
}

/* Start-up self-check: NORRIS_TABLE_OK when every constant is intact,
   NORRIS_TABLE_CORRUPT otherwise, NORRIS_TABLE_UNCHECKABLE where double is not
   IEEE binary64 (e.g. avr-gcc, whose double is 32 bits). */
NORRIS_INLINE int norris_check_table(void)
{
    if (sizeof(double) != 8U)
        return NORRIS_TABLE_UNCHECKABLE;
    return norris_table_crc32() == NORRIS_TABLE_CRC32 ? NORRIS_TABLE_OK : NORRIS_TABLE_CORRUPT;
}

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* NORRIS_RIDGECAL_CALIBRATION_H */
