/* size_probe.c -- one out-of-line wrapper per build (PROBE = 1: evaluation,
 * 2: range-checked evaluation, 3: table check), so that the .text size of the
 * object is the code of that generated function and what it inlines or
 * calls from the header (the header's functions are static inline). */
#include "fwt_calib.h"

#if defined(FWT_HAS_AUX)
#if defined(FWT_NUMERIC_FIXED)
#define PT int32_t
#define PE(a, b) fwt_eval_fixed(a, b)
#define PC(a, b, st) fwt_eval_fixed_checked(a, b, st)
#elif defined(FWT_NUMERIC_FLOAT)
#define PT float
#define PE(a, b) fwt_eval(a, b)
#define PC(a, b, st) fwt_eval_checked(a, b, st)
#else
#define PT double
#define PE(a, b) fwt_eval(a, b)
#define PC(a, b, st) fwt_eval_checked(a, b, st)
#endif
#if PROBE == 1
PT probe_eval(PT x, PT aux);
PT probe_eval(PT x, PT aux)
{
    return PE(x, aux);
}
#elif PROBE == 2
PT probe_eval_checked(PT x, PT aux, int *status);
PT probe_eval_checked(PT x, PT aux, int *status)
{
    return PC(x, aux, status);
}
#endif
#elif defined(FWT_NUMERIC_FIXED)
#if PROBE == 1
int32_t probe_eval(int32_t raw);
int32_t probe_eval(int32_t raw)
{
    return fwt_eval_fixed(raw);
}
#elif PROBE == 2
int32_t probe_eval_checked(int32_t raw, int *status);
int32_t probe_eval_checked(int32_t raw, int *status)
{
    return fwt_eval_fixed_checked(raw, status);
}
#endif
#elif defined(FWT_NUMERIC_FLOAT)
#if PROBE == 1
float probe_eval(float x);
float probe_eval(float x)
{
    return fwt_eval(x);
}
#elif PROBE == 2
float probe_eval_checked(float x, int *status);
float probe_eval_checked(float x, int *status)
{
    return fwt_eval_checked(x, status);
}
#endif
#else
#if PROBE == 1
double probe_eval(double x);
double probe_eval(double x)
{
    return fwt_eval(x);
}
#elif PROBE == 2
double probe_eval_checked(double x, int *status);
double probe_eval_checked(double x, int *status)
{
    return fwt_eval_checked(x, status);
}
#endif
#endif
#if PROBE == 3
int probe_check_table(void);
int probe_check_table(void)
{
    return fwt_check_table();
}
#endif
