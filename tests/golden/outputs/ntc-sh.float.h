/* ==========================================================================
 * GENERATED FILE -- DO NOT EDIT.
 * Written by ridgecal 0.1.0 (ridgecal export). Regenerate it from the calibration record
 * instead of editing: the self-check CRC and the QA figures below would no
 * longer match.
 * Header format version 2 (NTC_FORMAT_VERSION).
 * ==========================================================================
 *
 * Calibration QA (extended model, transforms)
 *   sensor:              cold-store NTC ch2
 *   reading unit:        counts
 *   reference unit:      degC
 *   transforms:          reading -> divider(sensor-low, 47000 ohm, full scale 4095) -> resistance -> ln; reference -> 1/(reference + 273.15)
 *   calibrated reading:  [1147, 3316] counts
 *                        (transformed: [9.81392574, 12.2064064])
 *   terms, degrees:      3 terms (power basis), reading degree 3
 *   lambda:              0
 *   validation:          RMSE 0.0117743, max |error| 0.0256964 degC
 *   test:                RMSE 0.0164747, max |error| 0.0343773 degC
 *   tolerance:           none in the record
 *   tolerance used:      0.0117743 degC (validation RMSE, fallback: no absolute tolerance given)
 *   result:              not assessed (no tolerance in the record)
 *   record SHA-256:      6eb39dccb2be4cf077033c8403d9d8dbc7a43ef241de52e30b003f78d0cf7718
 *   tool version:        ridgecal 0.1.0
 *
 * Export proof (evaluated at export time by a host emulation of the
 * arithmetic below over a grid of (reading) points, compared with the double-precision model)
 *   numeric mode:        float
 *   number formats:      IEEE binary32, nested Horner in scaled t, ln by logf (C library)
 *   inputs checked:      861 (60 of them calibration points)
 *   max deviation:       5.235e-05 degC at reading 1231.04871
 *   log() allowance:     7.861e-05 degC (a target C library whose log/logf
 *                        differs from the host's by up to 4 ulps, propagated)
 *   bound on a target:   0.000131 degC (max deviation + log() allowance)
 *   allowed deviation:   0.001177 degC (0.1 x tolerance used)
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
 * Uses <stdint.h> and <math.h>: needs log()/logf() from the C library (libm;
 * newlib and avr-libc provide it; link with -lm). No malloc, no other libc calls.
 * log/logf results may differ by a few ulps between C libraries, so results
 * agree with the export proof within the bound above, not bit for bit.
 */
#ifndef NTC_RIDGECAL_CALIBRATION_H
#define NTC_RIDGECAL_CALIBRATION_H

#include <stdint.h>
#include <math.h>

#define NTC_FORMAT_VERSION 2
#define NTC_NUMERIC_FLOAT 1
#define NTC_EXTENDED_MODEL 1 /* transforms and/or aux input: see the functions */
#define NTC_READING_DEGREE 3
#define NTC_AUX_DEGREE 0
#define NTC_N_COEF 4 /* (READING_DEGREE + 1) * (AUX_DEGREE + 1) */
/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the
   bit patterns of every constant the evaluation uses, in this order
   NTC_COEF[0..3], NTC_X_MIN, NTC_X_MAX, NTC_DIVIDER_R,
   NTC_DIVIDER_FULL_SCALE, NTC_T_CENTER, NTC_T_SCALE, NTC_KELVIN_OFFSET,
   NTC_READING_DEGREE, NTC_AUX_DEGREE, NTC_N_COEF;
   see ntc_table_crc32(). */
#define NTC_TABLE_CRC32 0x999F98EFUL

/* The record behind this header, for compile-time checks, e.g.
 *   #if NTC_VERDICT != NTC_VERDICT_PASS
 *   #error "this calibration did not pass"
 *   #endif */
#define NTC_VERDICT_NOT_JUDGED 0 /* no tolerance in the record: nothing judged */
#define NTC_VERDICT_PASS 1
#define NTC_VERDICT_FAIL 2
#define NTC_VERDICT_RECORD_MODIFIED 3 /* record edited after ridgecal wrote it */
#define NTC_VERDICT_UNDECIDED 4 /* no point outside the tolerance, but conformity not shown (guard band, U or model adequacy) */
#define NTC_VERDICT NTC_VERDICT_NOT_JUDGED
#define NTC_RECORD_SHA256 "6eb39dccb2be4cf077033c8403d9d8dbc7a43ef241de52e30b003f78d0cf7718" /* SHA-256 of the calibration record */
#define NTC_CALIBRATION_DATE "2026-01-01T00:00:00Z" /* when the record was made, UTC; "" if it does not say */

/* Status codes of the range-checked evaluation */
#define NTC_IN_RANGE 0     /* input inside the valid range */
#define NTC_BELOW_RANGE 1  /* reading below: evaluated at the lower limit */
#define NTC_ABOVE_RANGE 2  /* reading above: evaluated at the upper limit */
#define NTC_NOT_A_NUMBER 3 /* NaN reading: evaluated at the lower limit */
/* Results of ntc_check_table() */
#define NTC_TABLE_OK 0
#define NTC_TABLE_CORRUPT 1
#define NTC_TABLE_UNCHECKABLE 2 /* double mode where double is not 64-bit */

/* C99/C++: static inline. GNU C89: static __inline__. Other C89: static. */
#if defined(__cplusplus) || (defined(__STDC_VERSION__) && __STDC_VERSION__ >= 199901L)
#define NTC_INLINE static inline
#elif defined(__GNUC__)
#define NTC_INLINE static __inline__
#else
#define NTC_INLINE static
#endif

#ifdef __cplusplus
extern "C" {
#endif

/* Valid reading range (counts), the calibrated range rounded inward to float. */
#define NTC_X_MIN 1147.0f
#define NTC_X_MAX 3316.0f
/* Divider (sensor-low): r = R * x / (FULL_SCALE - x), ohms. */
#define NTC_DIVIDER_R 47000.0f
#define NTC_DIVIDER_FULL_SCALE 4095.0f
/* logf is C99; a C89 compiler gets log() rounded to float (within the bound). */
#if defined(__cplusplus) || (defined(__STDC_VERSION__) && __STDC_VERSION__ >= 199901L)
#define NTC_LOG(v) logf(v)
#else
#define NTC_LOG(v) ((float)log((double)(v)))
#endif
/* Scaled variables: t = (u - NTC_T_CENTER) * NTC_T_SCALE,
   in [-1, 1] on the calibrated region (u = the transformed reading). */
#define NTC_T_CENTER 0.0f
#define NTC_T_SCALE 0.08192419f
/* Inverse reference transform: reference = 1 / v - KELVIN_OFFSET (degC). */
#define NTC_KELVIN_OFFSET 273.15f

/* Coefficients m[k][l] of v = sum_k t^k (sum_l m[k][l] s^l), entry k * (AUX_DEGREE + 1) + l, float. */
static const float NTC_COEF[NTC_N_COEF] = {
    0.0010132332f, /* t^0 */
    0.00310538f, /* t^1 */
    0.0f, /* t^2 */
    -6.1679375e-06f  /* t^3 */
};

/* ntc_eval: reference value (degC) for reading x (counts).
 * Computes: divider -> ln -> scaling -> nested Horner v = sum_k t^k (sum_l m[k][l] s^l) -> 1/v - 273.15.
 * Precision: IEEE 754 binary32 (float) throughout, one rounding per operation
 *   (no fused multiply-add: build with -ffp-contract=off), ln by logf (C library).
 * Range: [NTC_X_MIN, NTC_X_MAX]; outside it the result is an
 *   unchecked extrapolation -- use ntc_eval_checked() for untrusted input.
 * Measured max |error| against the double-precision model: 5.235e-05 degC
 *   (861 inputs over the region, calibration points included; on a target add the log() allowance 7.86e-05 degC). */
NTC_INLINE float ntc_eval(float x)
{
#if !defined(__GNUC__) || defined(__clang__)
#pragma STDC FP_CONTRACT OFF
#endif
    float u, t;
    float w, v;
    u = (NTC_DIVIDER_R * x) / (NTC_DIVIDER_FULL_SCALE - x);
    u = NTC_LOG(u);
    t = (u - NTC_T_CENTER) * NTC_T_SCALE;
    w = NTC_COEF[3];
    v = w;
    w = NTC_COEF[2];
    v = v * t + w;
    w = NTC_COEF[1];
    v = v * t + w;
    w = NTC_COEF[0];
    v = v * t + w;
    v = 1.0f / v - NTC_KELVIN_OFFSET;
    return v;
}

/* ntc_eval_checked: as ntc_eval, but never extrapolates.
 * A reading outside [NTC_X_MIN, NTC_X_MAX] (or NaN) is clamped to the nearest
 * limit (NaN: lower limit);
 * *status (if status is not NULL) is set to NTC_IN_RANGE, _BELOW_RANGE, _ABOVE_RANGE
 * or _NOT_A_NUMBER. Precision as ntc_eval. */
NTC_INLINE float ntc_eval_checked(float x, int *status)
{
    int st;
    if (x >= NTC_X_MIN && x <= NTC_X_MAX) {
        st = NTC_IN_RANGE;
    } else if (x < NTC_X_MIN) {
        st = NTC_BELOW_RANGE;
        x = NTC_X_MIN;
    } else if (x > NTC_X_MAX) {
        st = NTC_ABOVE_RANGE;
        x = NTC_X_MAX;
    } else { /* NaN: every comparison above is false */
        st = NTC_NOT_A_NUMBER;
        x = NTC_X_MIN;
    }
    if (status != 0)
        *status = st;
    return ntc_eval(x);
}

/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over
   NTC_TABLE_CRC32's list, each value's bit pattern (IEEE 754 binary32; integers two's complement),
   least significant byte first -- the same on little- and big-endian targets.
   Bitwise (no table). Call it at start-up via ntc_check_table(). */
NTC_INLINE uint32_t ntc_crc32_step(uint32_t crc, uint64_t bits, unsigned n)
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

NTC_INLINE uint64_t ntc_bits_f(float f)
{
    union { float f; uint32_t u; } pun;
    pun.f = f;
    return pun.u;
}

NTC_INLINE uint32_t ntc_table_crc32(void)
{
    uint32_t crc = 0xFFFFFFFFUL;
    unsigned k;
    for (k = 0U; k < (unsigned)(NTC_N_COEF); ++k)
        crc = ntc_crc32_step(crc, ntc_bits_f(NTC_COEF[k]), 4U);
    crc = ntc_crc32_step(crc, ntc_bits_f(NTC_X_MIN), 4U);
    crc = ntc_crc32_step(crc, ntc_bits_f(NTC_X_MAX), 4U);
    crc = ntc_crc32_step(crc, ntc_bits_f(NTC_DIVIDER_R), 4U);
    crc = ntc_crc32_step(crc, ntc_bits_f(NTC_DIVIDER_FULL_SCALE), 4U);
    crc = ntc_crc32_step(crc, ntc_bits_f(NTC_T_CENTER), 4U);
    crc = ntc_crc32_step(crc, ntc_bits_f(NTC_T_SCALE), 4U);
    crc = ntc_crc32_step(crc, ntc_bits_f(NTC_KELVIN_OFFSET), 4U);
    crc = ntc_crc32_step(crc, (uint64_t)(uint32_t)(NTC_READING_DEGREE), 4U);
    crc = ntc_crc32_step(crc, (uint64_t)(uint32_t)(NTC_AUX_DEGREE), 4U);
    crc = ntc_crc32_step(crc, (uint64_t)(uint32_t)(NTC_N_COEF), 4U);
    return crc ^ (uint32_t)0xFFFFFFFFUL;
}

/* Start-up self-check: NTC_TABLE_OK when every constant is intact,
   NTC_TABLE_CORRUPT otherwise. */
NTC_INLINE int ntc_check_table(void)
{
    return ntc_table_crc32() == NTC_TABLE_CRC32 ? NTC_TABLE_OK : NTC_TABLE_CORRUPT;
}

#ifdef __cplusplus
} /* extern "C" */
#endif

#endif /* NTC_RIDGECAL_CALIBRATION_H */
