/* ==========================================================================
 * GENERATED FILE -- DO NOT EDIT.
 * Written by ridgecal 0.1.0 (ridgecal export). Regenerate it from the calibration record
 * instead of editing: the self-check CRC and the QA figures below would no
 * longer match.
 * Header format version 2 (NOINT2_FORMAT_VERSION).
 * ==========================================================================
 *
 * Calibration QA
 *   sensor:              (not given)
 *   reading unit:        (not given)
 *   reference unit:      (not given)
 *   calibrated range:    [4, 6] (not given) (reading)
 *   degree, lambda:      1, 0
 *   validation:          RMSE n/a, max |error| n/a (not given)
 *   test:                RMSE n/a, max |error| n/a (not given)
 *   tolerance:           none in the record
 *   tolerance used:      0.5 (not given) (--tolerance, for the refusal rule only)
 *   result:              not assessed (no tolerance in the record)
 *   record SHA-256:      96e1fb5a5dbf980895f09261a0288c89b3bc53717f95e68c9d594f312a49c25b
 *   tool version:        ridgecal 0.1.0
 *
 * Export proof (evaluated at export time by an exact host emulation of the
 * arithmetic below, compared with the double-precision model)
 *   numeric mode:        float
 *   number formats:      IEEE binary32, Horner in scaled t = (x - c) * s (chosen: lower error than raw x)
 *   inputs checked:      2004 (3 of them calibration readings)
 *   max deviation:       3.468e-07 (not given) at reading 5.50299978 (not given)
 *   allowed deviation:   0.05 (not given) (0.1 x tolerance used)
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
#ifndef NOINT2_RIDGECAL_CALIBRATION_H
#define NOINT2_RIDGECAL_CALIBRATION_H

#include <stdint.h>

#define NOINT2_FORMAT_VERSION 2
#define NOINT2_NUMERIC_FLOAT 1
#define NOINT2_DEGREE 1
/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the
   bit patterns of every constant the evaluation uses, in this order
   NOINT2_COEF[0..1], NOINT2_X_MIN, NOINT2_X_MAX, NOINT2_T_CENTER,
   NOINT2_T_SCALE, NOINT2_DEGREE;
   see noint2_table_crc32(). */
#define NOINT2_TABLE_CRC32 0x38E8591FUL

/* The record behind this header, for compile-time checks, e.g.
 *   #if NOINT2_VERDICT != NOINT2_VERDICT_PASS
 *   #error "this calibration did not pass"
 *   #endif */
#define NOINT2_VERDICT_NOT_JUDGED 0 /* no tolerance in the record: nothing judged */
#define NOINT2_VERDICT_PASS 1
#define NOINT2_VERDICT_FAIL 2
#define NOINT2_VERDICT_RECORD_MODIFIED 3 /* record edited after ridgecal wrote it */
#define NOINT2_VERDICT_UNDECIDED 4 /* no point outside the tolerance, but conformity not shown (guard band, U or model adequacy) */
#define NOINT2_VERDICT NOINT2_VERDICT_NOT_JUDGED
#define NOINT2_RECORD_SHA256 "96e1fb5a5dbf980895f09261a0288c89b3bc53717f95e68c9d594f312a49c25b" /* SHA-256 of the calibration record */
#define NOINT2_CALIBRATION_DATE "2026-01-01T00:00:00Z" /* when the record was made, UTC; "" if it does not say */

/* Status codes of the range-checked evaluation */
#define NOINT2_IN_RANGE 0     /* input inside the valid range */
#define NOINT2_BELOW_RANGE 1  /* input below: result at the lower limit */
#define NOINT2_ABOVE_RANGE 2  /* input above: result at the upper limit */
#define NOINT2_NOT_A_NUMBER 3 /* NaN input: result at the lower limit */
/* Results of noint2_check_table() */
#define NOINT2_TABLE_OK 0
#define NOINT2_TABLE_CORRUPT 1
#define NOINT2_TABLE_UNCHECKABLE 2 /* double mode where double is not 64-bit */

/* C99/C++: static inline. GNU C89: static __inline__. Other C89: static. */
#if defined(__cplusplus) || (defined(__STDC_VERSION__) && __STDC_VERSION__ >= 199901L)
#define NOINT2_INLINE static inline
#elif defined(__GNUC__)
#define NOINT2_INLINE static __inline__
#else
#define NOINT2_INLINE static
#endif

#ifdef __cplusplus
extern "C" {
#endif

/* Valid input range (reading units: (not given)), the calibrated range rounded
   inward to float. */
#define NOINT2_X_MIN 4.0f
#define NOINT2_X_MAX 6.0f
/* Scaled variable: t = (x - NOINT2_T_CENTER) * NOINT2_T_SCALE, in [-1, 1] on the range. */
#define NOINT2_T_CENTER 5.0f
#define NOINT2_T_SCALE 1.0f

/* Coefficients of p in powers of the scaled variable t (index = power), float. */
static const float NOINT2_COEF[NOINT2_DEGREE + 1] = {
    3.6363637f, /* t^0 */
    0.72727275f  /* t^1 */
};

/* noint2_eval: reference value ((not given)) for reading x ((not given)).
 * Precision: IEEE 754 binary32 (float) throughout, Horner's scheme in the scaled variable t,
 *   one rounding per operation (no fused multiply-add: build with -ffp-contract=off).
 * Range: [NOINT2_X_MIN, NOINT2_X_MAX]; outside it the result is an
 *   unchecked extrapolation -- use noint2_eval_checked() for untrusted input.
 * Measured max |error| against the double-precision model: 3.468e-07 (not given)
 *   (2004 inputs over the range, calibration readings included). */
NOINT2_INLINE float noint2_eval(float x)
{
#if !defined(__GNUC__) || defined(__clang__)
#pragma STDC FP_CONTRACT OFF
#endif
    const float t = (x - NOINT2_T_CENTER) * NOINT2_T_SCALE;
    float y = NOINT2_COEF[1];
    y = y * t + NOINT2_COEF[0];
    return y;
}

/* noint2_eval_checked: as noint2_eval, but never extrapolates.
 * An input outside [NOINT2_X_MIN, NOINT2_X_MAX] (or NaN) is clamped to the
 * nearest limit (NaN: lower limit), and *status (if status is not NULL) is set to
 * NOINT2_IN_RANGE, _BELOW_RANGE, _ABOVE_RANGE or _NOT_A_NUMBER. Precision as noint2_eval. */
NOINT2_INLINE float noint2_eval_checked(float x, int *status)
{
    int s;
    if (x >= NOINT2_X_MIN && x <= NOINT2_X_MAX) {
        s = NOINT2_IN_RANGE;
    } else if (x < NOINT2_X_MIN) {
        s = NOINT2_BELOW_RANGE;
        x = NOINT2_X_MIN;
    } else if (x > NOINT2_X_MAX) {
        s = NOINT2_ABOVE_RANGE;
        x = NOINT2_X_MAX;
    } else { /* NaN: every comparison above is false */
        s = NOINT2_NOT_A_NUMBER;
        x = NOINT2_X_MIN;
    }
    if (status != 0)
        *status = s;
    return noint2_eval(x);
}

/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over
   NOINT2_TABLE_CRC32's list, each value's bit pattern (IEEE 754 binary32; integers two's complement),
   least significant byte first -- the same on little- and big-endian targets.
   Bitwise (no table). Call it at start-up via noint2_check_table(). */
NOINT2_INLINE uint32_t noint2_crc32_step(uint32_t crc, uint64_t bits, unsigned n)
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

NOINT2_INLINE uint64_t noint2_bits_f(float f)
{
    union { float f; uint32_t u; } pun;
    pun.f = f;
    return pun.u;
}

NOINT2_INLINE uint32_t noint2_table_crc32(void)
{
    uint32_t crc = 0xFFFFFFFFUL;
    unsigned k;
    for (k = 0U; k < (unsigned)(NOINT2_DEGREE + 1); ++k)
        crc = noint2_crc32_step(crc, noint2_bits_f(NOINT2_COEF[k]), 4U);
    crc = noint2_crc32_step(crc, noint2_bits_f(NOINT2_X_MIN), 4U);
    crc = noint2_crc32_step(crc, noint2_bits_f(NOINT2_X_MAX), 4U);
    crc = noint2_crc32_step(crc, noint2_bits_f(NOINT2_T_CENTER), 4U);
    crc = noint2_crc32_step(crc, noint2_bits_f(NOINT2_T_SCALE), 4U);
    crc = noint2_crc32_step(crc, (uint64_t)(uint32_t)(NOINT2_DEGREE), 4U);
    return crc ^ (uint32_t)0xFFFFFFFFUL;
}

/* Start-up self-check: NOINT2_TABLE_OK when every constant is intact,
   NOINT2_TABLE_CORRUPT otherwise. */
NOINT2_INLINE int noint2_check_table(void)
{
    return noint2_table_crc32() == NOINT2_TABLE_CRC32 ? NOINT2_TABLE_OK : NOINT2_TABLE_CORRUPT;
}

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* NOINT2_RIDGECAL_CALIBRATION_H */
