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
 *   numeric mode:        double
 *   number formats:      IEEE binary64, Horner in scaled t = (x - c) * s (chosen: lower error than raw x)
 *   inputs checked:      2083 (82 of them calibration readings)
 *   max deviation:       8.882e-16 (not given) at reading -8.74756772 (not given)
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
#define FILIP_NUMERIC_DOUBLE 1
#define FILIP_DEGREE 10
/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the
   bit patterns of every constant the evaluation uses, in this order
   FILIP_COEF[0..10], FILIP_X_MIN, FILIP_X_MAX, FILIP_T_CENTER,
   FILIP_T_SCALE, FILIP_DEGREE;
   see filip_table_crc32(). */
#define FILIP_TABLE_CRC32 0x349995AAUL

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

/* Valid input range (reading units: (not given)), the calibrated range rounded
   inward to double. */
#define FILIP_X_MIN -8.781464495
#define FILIP_X_MAX -3.13200249
/* Scaled variable: t = (x - FILIP_T_CENTER) * FILIP_T_SCALE, in [-1, 1] on the range. */
#define FILIP_T_CENTER -5.9567334925
#define FILIP_T_SCALE 0.3540160104147828

/* Coefficients of p in powers of the scaled variable t (index = power), double. */
static const double FILIP_COEF[FILIP_DEGREE + 1] = {
    0.8878414612891526, /* t^0 */
    0.10879326921077763, /* t^1 */
    -0.5363669755333416, /* t^2 */
    0.2874707216711269, /* t^3 */
    2.205673670108497, /* t^4 */
    -1.3107215849301952, /* t^5 */
    -4.218415814637457, /* t^6 */
    1.762298972559671, /* t^7 */
    3.8096025001168305, /* t^8 */
    -0.7725155669761262, /* t^9 */
    -1.303273679264489  /* t^10 */
};

/* filip_eval: reference value ((not given)) for reading x ((not given)).
 * Precision: IEEE 754 binary64 (double) throughout, Horner's scheme in the scaled variable t,
 *   one rounding per operation (no fused multiply-add: build with -ffp-contract=off).
 * Range: [FILIP_X_MIN, FILIP_X_MAX]; outside it the result is an
 *   unchecked extrapolation -- use filip_eval_checked() for untrusted input.
 * Measured max |error| against the double-precision model: 8.882e-16 (not given)
 *   (2083 inputs over the range, calibration readings included). */
FILIP_INLINE double filip_eval(double x)
{
#if !defined(__GNUC__) || defined(__clang__)
#pragma STDC FP_CONTRACT OFF
#endif
    const double t = (x - FILIP_T_CENTER) * FILIP_T_SCALE;
    double y = FILIP_COEF[10];
    y = y * t + FILIP_COEF[9];
    y = y * t + FILIP_COEF[8];
    y = y * t + FILIP_COEF[7];
    y = y * t + FILIP_COEF[6];
    y = y * t + FILIP_COEF[5];
    y = y * t + FILIP_COEF[4];
    y = y * t + FILIP_COEF[3];
    y = y * t + FILIP_COEF[2];
    y = y * t + FILIP_COEF[1];
    y = y * t + FILIP_COEF[0];
    return y;
}

/* filip_eval_checked: as filip_eval, but never extrapolates.
 * An input outside [FILIP_X_MIN, FILIP_X_MAX] (or NaN) is clamped to the
 * nearest limit (NaN: lower limit), and *status (if status is not NULL) is set to
 * FILIP_IN_RANGE, _BELOW_RANGE, _ABOVE_RANGE or _NOT_A_NUMBER. Precision as filip_eval. */
FILIP_INLINE double filip_eval_checked(double x, int *status)
{
    int s;
    if (x >= FILIP_X_MIN && x <= FILIP_X_MAX) {
        s = FILIP_IN_RANGE;
    } else if (x < FILIP_X_MIN) {
        s = FILIP_BELOW_RANGE;
        x = FILIP_X_MIN;
    } else if (x > FILIP_X_MAX) {
        s = FILIP_ABOVE_RANGE;
        x = FILIP_X_MAX;
    } else { /* NaN: every comparison above is false */
        s = FILIP_NOT_A_NUMBER;
        x = FILIP_X_MIN;
    }
    if (status != 0)
        *status = s;
    return filip_eval(x);
}

/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over
   FILIP_TABLE_CRC32's list, each value's bit pattern (IEEE 754 binary64; integers two's complement),
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

FILIP_INLINE uint64_t filip_bits_d(double d)
{
    union { double d; uint64_t u; } pun;
    pun.u = 0U;
    pun.d = d;
    return pun.u;
}

FILIP_INLINE uint32_t filip_table_crc32(void)
{
    uint32_t crc = 0xFFFFFFFFUL;
    unsigned k;
    for (k = 0U; k < (unsigned)(FILIP_DEGREE + 1); ++k)
        crc = filip_crc32_step(crc, filip_bits_d(FILIP_COEF[k]), 8U);
    crc = filip_crc32_step(crc, filip_bits_d(FILIP_X_MIN), 8U);
    crc = filip_crc32_step(crc, filip_bits_d(FILIP_X_MAX), 8U);
    crc = filip_crc32_step(crc, filip_bits_d(FILIP_T_CENTER), 8U);
    crc = filip_crc32_step(crc, filip_bits_d(FILIP_T_SCALE), 8U);
    crc = filip_crc32_step(crc, (uint64_t)(uint32_t)(FILIP_DEGREE), 4U);
    return crc ^ (uint32_t)0xFFFFFFFFUL;
}

/* Start-up self-check: FILIP_TABLE_OK when every constant is intact,
   FILIP_TABLE_CORRUPT otherwise, FILIP_TABLE_UNCHECKABLE where double is not
   IEEE binary64 (e.g. avr-gcc, whose double is 32 bits). */
FILIP_INLINE int filip_check_table(void)
{
    if (sizeof(double) != 8U)
        return FILIP_TABLE_UNCHECKABLE;
    return filip_table_crc32() == FILIP_TABLE_CRC32 ? FILIP_TABLE_OK : FILIP_TABLE_CORRUPT;
}

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* FILIP_RIDGECAL_CALIBRATION_H */
