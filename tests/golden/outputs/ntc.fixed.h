/* ==========================================================================
 * GENERATED FILE -- DO NOT EDIT.
 * Written by ridgecal 0.1.0 (ridgecal export). Regenerate it from the calibration record
 * instead of editing: the self-check CRC and the QA figures below would no
 * longer match.
 * Header format version 2 (NTC_FORMAT_VERSION).
 * ==========================================================================
 *
 * Calibration QA
 *   sensor:              cold-store NTC ch2
 *   reading unit:        counts
 *   reference unit:      degC
 *   calibrated range:    [1147, 3316] counts (reading)
 *   degree, lambda:      5, 4.17532e-05
 *   validation:          RMSE 0.0123587, max |error| 0.0274783 degC
 *   test:                RMSE 0.0177293, max |error| 0.0362201 degC
 *   tolerance:           none in the record
 *   tolerance used:      0.0123587 degC (validation RMSE, fallback: no absolute tolerance given)
 *   result:              not assessed (no tolerance in the record)
 *   record SHA-256:      2453c97ceb09a8686fd7a08c34159fc9d95d528c92b745de77e4250361561bad
 *   tool version:        ridgecal 0.1.0
 *
 * Export proof (evaluated at export time by an exact host emulation of the
 * arithmetic below, compared with the double-precision model)
 *   numeric mode:        fixed
 *   number formats:      int32 coefficients Q[15,15,18,18,21,21] (t^0..t^n), t in Q30, int64 intermediates, output = round(y * 1000) int32
 *   inputs checked:      2230 (60 of them calibration readings)
 *   max deviation:       0.0004998 degC at reading 1688 counts (raw 1688)
 *   allowed deviation:   0.001236 degC (0.1 x tolerance used)
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
#ifndef NTC_RIDGECAL_CALIBRATION_H
#define NTC_RIDGECAL_CALIBRATION_H

#include <stdint.h>

#define NTC_FORMAT_VERSION 2
#define NTC_NUMERIC_FIXED 1
#define NTC_DEGREE 5
/* CRC-32 (IEEE: reflected 0xEDB88320, init and xorout 0xFFFFFFFF) over the
   bit patterns of every constant the evaluation uses, in this order
   NTC_COEF[0..5], NTC_RAW_MIN, NTC_RAW_MAX, NTC_T_R0, NTC_T_MUL, NTC_T_ADD,
   NTC_T_SHIFT, NTC_T_STEP_SHIFT[0..4], NTC_OUT_SHIFT, NTC_DEGREE;
   see ntc_table_crc32(). */
#define NTC_TABLE_CRC32 0xEF8B4F96UL

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
#define NTC_RECORD_SHA256 "2453c97ceb09a8686fd7a08c34159fc9d95d528c92b745de77e4250361561bad" /* SHA-256 of the calibration record */
#define NTC_CALIBRATION_DATE "2026-01-01T00:00:00Z" /* when the record was made, UTC; "" if it does not say */

/* Status codes of the range-checked evaluation */
#define NTC_IN_RANGE 0     /* input inside the valid range */
#define NTC_BELOW_RANGE 1  /* input below: result at the lower limit */
#define NTC_ABOVE_RANGE 2  /* input above: result at the upper limit */
#define NTC_NOT_A_NUMBER 3 /* NaN input: result at the lower limit */
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

/* Valid raw input range (integers; reading = raw / 1 counts). */
#define NTC_RAW_MIN 1147L
#define NTC_RAW_MAX 3316L
/* Output unit: 1 / 1000 degC (output = round(reference * 1000)). */

/* Coefficients of p * 1000 in powers of t; entry k is in Q(q_k) (value * 2^q_k):
 *   k=0: q_k = 15
 *   k=1: q_k = 15
 *   k=2: q_k = 18
 *   k=3: q_k = 18
 *   k=4: q_k = 21
 *   k=5: q_k = 21
 */
static const int32_t NTC_COEF[NTC_DEGREE + 1] = {
    -308134072L, /* t^0, Q15 */
    -616822129L, /* t^1, Q15 */
    119777593L, /* t^2, Q18 */
    -445755013L, /* t^3, Q18 */
    -77319613L, /* t^4, Q21 */
    -988088495L  /* t^5, Q21 */
};

/* t_q = t * 2^30 = rshift_round((raw - NTC_T_R0) * NTC_T_MUL + NTC_T_ADD, NTC_T_SHIFT). */
#define NTC_T_R0 ((int64_t)2232L)
#define NTC_T_MUL ((int64_t)2027683961L)
#define NTC_T_ADD ((int64_t)1013841981L)
#define NTC_T_SHIFT 11U
/* Shift after the product with t_q in Horner step k (entry k). */
static const uint8_t NTC_T_STEP_SHIFT[5] = {30U, 33U, 30U, 33U, 30U};
/* Final shift from Q15 to the output unit. */
#define NTC_OUT_SHIFT 15U

/* floor((v + 2^(s-1)) / 2^s), i.e. v / 2^s rounded half up, for
   -2^62 <= v + 2^(s-1) < 2^62 and 1 <= s <= 61. Only a non-negative value is
   shifted (v is offset by 2^62 first), so the result does not depend on how
   the compiler shifts negative numbers (implementation-defined in C). */
NTC_INLINE int64_t ntc_rshift_round(int64_t v, unsigned s)
{
    const int64_t bias = (int64_t)1 << 62;
    const uint64_t biased = (uint64_t)(v + bias + ((int64_t)1 << (s - 1U)));
    return (int64_t)(biased >> s) - (bias >> s);
}

/* ntc_eval_fixed: round(reference * 1000) as int32 (1/1000 degC)
 * for a raw integer reading in [NTC_RAW_MIN, NTC_RAW_MAX].
 * Precision: integer only -- int32 coefficients, int64 intermediates, every
 * shift rounds half up; output resolution 1/1000 degC.
 * t_q = t * 2^30 = rshift_round((raw - 2232) * 2027683961 + 1013841981, 11)
 * Overflow proof (exact integer interval arithmetic over the whole raw range,
 * every value below is a proved bound of that intermediate):
 *   (raw - r0) * mul + add in [-2199023255704, 2199023255705]
 *   t_q in [-1073741824, 1073741824]
 *   step 4: acc*t_q in [-1060951942894714880, 1060951942894714880], >> 30, acc (Q21) in [-1065408108, 910768882]
 *   step 3: acc*t_q in [-1143973245188308992, 1143973245188308992], >> 33, acc (Q18) in [-578931026, -312578999]
 *   step 2: acc*t_q in [-621622455827431424, 621622455827431424], >> 30, acc (Q18) in [-459153433, 698708619]
 *   step 1: acc*t_q in [-750232667009581056, 750232667009581056], >> 33, acc (Q15) in [-704160706, -529483552]
 *   step 0: acc*t_q in [-756086800849567744, 756086800849567744], >> 30, acc (Q15) in [-1012294778, 396026634]
 *   output in [-30893, 12086]
 *   limits: every shifted value within [-2^62, 2^62), every product within
 *   +/-2^62, accumulators and output within int32.
 * Measured max |error| against the double-precision model, output rounding
 * included: 0.0004998 degC (2230 raw inputs checked). Outside the raw range the
 * bounds do not hold: use ntc_eval_fixed_checked() for untrusted input. */
NTC_INLINE int32_t ntc_eval_fixed(int32_t raw)
{
    const int64_t t = ntc_rshift_round(((int64_t)raw - NTC_T_R0) * NTC_T_MUL + NTC_T_ADD, NTC_T_SHIFT);
    int64_t acc = (int64_t)NTC_COEF[5];
    acc = ntc_rshift_round(acc * t, (unsigned)NTC_T_STEP_SHIFT[4]) + NTC_COEF[4];
    acc = ntc_rshift_round(acc * t, (unsigned)NTC_T_STEP_SHIFT[3]) + NTC_COEF[3];
    acc = ntc_rshift_round(acc * t, (unsigned)NTC_T_STEP_SHIFT[2]) + NTC_COEF[2];
    acc = ntc_rshift_round(acc * t, (unsigned)NTC_T_STEP_SHIFT[1]) + NTC_COEF[1];
    acc = ntc_rshift_round(acc * t, (unsigned)NTC_T_STEP_SHIFT[0]) + NTC_COEF[0];
    return (int32_t)ntc_rshift_round(acc, NTC_OUT_SHIFT);
}

/* ntc_eval_fixed_checked: as ntc_eval_fixed, but never leaves the raw range:
 * raw outside [NTC_RAW_MIN, NTC_RAW_MAX] is clamped to the nearest limit and
 * *status (if status is not NULL) is set to NTC_IN_RANGE, _BELOW_RANGE or
 * _ABOVE_RANGE. Precision as ntc_eval_fixed. */
NTC_INLINE int32_t ntc_eval_fixed_checked(int32_t raw, int *status)
{
    int s = NTC_IN_RANGE;
    if (raw < NTC_RAW_MIN) {
        s = NTC_BELOW_RANGE;
        raw = NTC_RAW_MIN;
    } else if (raw > NTC_RAW_MAX) {
        s = NTC_ABOVE_RANGE;
        raw = NTC_RAW_MAX;
    }
    if (status != 0)
        *status = s;
    return ntc_eval_fixed(raw);
}

/* Self-check of every constant the evaluation uses: CRC-32 (IEEE) over
   NTC_TABLE_CRC32's list, each value's bit pattern (two's complement),
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

NTC_INLINE uint32_t ntc_table_crc32(void)
{
    uint32_t crc = 0xFFFFFFFFUL;
    unsigned k;
    for (k = 0U; k < (unsigned)(NTC_DEGREE + 1); ++k)
        crc = ntc_crc32_step(crc, (uint64_t)(uint32_t)(NTC_COEF[k]), 4U);
    crc = ntc_crc32_step(crc, (uint64_t)(uint32_t)(NTC_RAW_MIN), 4U);
    crc = ntc_crc32_step(crc, (uint64_t)(uint32_t)(NTC_RAW_MAX), 4U);
    crc = ntc_crc32_step(crc, (uint64_t)(NTC_T_R0), 8U);
    crc = ntc_crc32_step(crc, (uint64_t)(NTC_T_MUL), 8U);
    crc = ntc_crc32_step(crc, (uint64_t)(NTC_T_ADD), 8U);
    crc = ntc_crc32_step(crc, (uint64_t)(uint32_t)(NTC_T_SHIFT), 4U);
    for (k = 0U; k < (unsigned)(5); ++k)
        crc = ntc_crc32_step(crc, (uint64_t)NTC_T_STEP_SHIFT[k], 1U);
    crc = ntc_crc32_step(crc, (uint64_t)(uint32_t)(NTC_OUT_SHIFT), 4U);
    crc = ntc_crc32_step(crc, (uint64_t)(uint32_t)(NTC_DEGREE), 4U);
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
