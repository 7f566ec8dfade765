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
 *   numeric mode:        double
 *   number formats:      IEEE binary64, Horner in scaled t = (x - c) * s (chosen: lower error than raw x)
 *   inputs checked:      2012 (11 of them calibration readings)
 *   max deviation:       2.842e-14 (not given) at reading 61.88 (not given)
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
#define NOINT1_NUMERIC_DOUBLE 1
#define NOINT1_DEGREE 1
/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the
   bit patterns of every constant the evaluation uses, in this order
   NOINT1_COEF[0..1], NOINT1_X_MIN, NOINT1_X_MAX, NOINT1_T_CENTER,
   NOINT1_T_SCALE, NOINT1_DEGREE;
   see noint1_table_crc32(). */
#define NOINT1_TABLE_CRC32 0x8817ACA0UL

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

/* Valid input range (reading units: (not given)), the calibrated range rounded
   inward to double. */
#define NOINT1_X_MIN 60.0
#define NOINT1_X_MAX 70.0
/* Scaled variable: t = (x - NOINT1_T_CENTER) * NOINT1_T_SCALE, in [-1, 1] on the range. */
#define NOINT1_T_CENTER 65.0
#define NOINT1_T_SCALE 0.2

/* Coefficients of p in powers of the scaled variable t (index = power), double. */
static const double NOINT1_COEF[NOINT1_DEGREE + 1] = {
    134.83471074380168, /* t^0 */
    10.371900826446282  /* t^1 */
};

/* noint1_eval: reference value ((not given)) for reading x ((not given)).
 * Precision: IEEE 754 binary64 (double) throughout, Horner's scheme in the scaled variable t,
 *   one rounding per operation (no fused multiply-add: build with -ffp-contract=off).
 * Range: [NOINT1_X_MIN, NOINT1_X_MAX]; outside it the result is an
 *   unchecked extrapolation -- use noint1_eval_checked() for untrusted input.
 * Measured max |error| against the double-precision model: 2.842e-14 (not given)
 *   (2012 inputs over the range, calibration readings included). */
NOINT1_INLINE double noint1_eval(double x)
{
#if !defined(__GNUC__) || defined(__clang__)
#pragma STDC FP_CONTRACT OFF
#endif
    const double t = (x - NOINT1_T_CENTER) * NOINT1_T_SCALE;
    double y = NOINT1_COEF[1];
    y = y * t + NOINT1_COEF[0];
    return y;
}

/* noint1_eval_checked: as noint1_eval, but never extrapolates.
 * An input outside [NOINT1_X_MIN, NOINT1_X_MAX] (or NaN) is clamped to the
 * nearest limit (NaN: lower limit), and *status (if status is not NULL) is set to
 * NOINT1_IN_RANGE, _BELOW_RANGE, _ABOVE_RANGE or _NOT_A_NUMBER. Precision as noint1_eval. */
NOINT1_INLINE double noint1_eval_checked(double x, int *status)
{
    int s;
    if (x >= NOINT1_X_MIN && x <= NOINT1_X_MAX) {
        s = NOINT1_IN_RANGE;
    } else if (x < NOINT1_X_MIN) {
        s = NOINT1_BELOW_RANGE;
        x = NOINT1_X_MIN;
    } else if (x > NOINT1_X_MAX) {
        s = NOINT1_ABOVE_RANGE;
        x = NOINT1_X_MAX;
    } else { /* NaN: every comparison above is false */
        s = NOINT1_NOT_A_NUMBER;
        x = NOINT1_X_MIN;
    }
    if (status != 0)
        *status = s;
    return noint1_eval(x);
}

/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over
   NOINT1_TABLE_CRC32's list, each value's bit pattern (IEEE 754 binary64; integers two's complement),
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

NOINT1_INLINE uint64_t noint1_bits_d(double d)
{
    union { double d; uint64_t u; } pun;
    pun.u = 0U;
    pun.d = d;
    return pun.u;
}

NOINT1_INLINE uint32_t noint1_table_crc32(void)
{
    uint32_t crc = 0xFFFFFFFFUL;
    unsigned k;
    for (k = 0U; k < (unsigned)(NOINT1_DEGREE + 1); ++k)
        crc = noint1_crc32_step(crc, noint1_bits_d(NOINT1_COEF[k]), 8U);
    crc = noint1_crc32_step(crc, noint1_bits_d(NOINT1_X_MIN), 8U);
    crc = noint1_crc32_step(crc, noint1_bits_d(NOINT1_X_MAX), 8U);
    crc = noint1_crc32_step(crc, noint1_bits_d(NOINT1_T_CENTER), 8U);
    crc = noint1_crc32_step(crc, noint1_bits_d(NOINT1_T_SCALE), 8U);
    crc = noint1_crc32_step(crc, (uint64_t)(uint32_t)(NOINT1_DEGREE), 4U);
    return crc ^ (uint32_t)0xFFFFFFFFUL;
}

/* Start-up self-check: NOINT1_TABLE_OK when every constant is intact,
   NOINT1_TABLE_CORRUPT otherwise, NOINT1_TABLE_UNCHECKABLE where double is not
   IEEE binary64 (e.g. avr-gcc, whose double is 32 bits). */
NOINT1_INLINE int noint1_check_table(void)
{
    if (sizeof(double) != 8U)
        return NOINT1_TABLE_UNCHECKABLE;
    return noint1_table_crc32() == NOINT1_TABLE_CRC32 ? NOINT1_TABLE_OK : NOINT1_TABLE_CORRUPT;
}

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* NOINT1_RIDGECAL_CALIBRATION_H */
