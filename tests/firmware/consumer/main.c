/* Consumer of a generated calibration header: start-up table check, then one
 * range-checked evaluation in the middle of the range. Exit 0 when the table
 * is intact and the input was in range. */
#include <stdio.h>
#include "coldstore_calibration.h"

/* The build refuses a calibration that did not pass (format version 2). */
#if COLDSTORE_VERDICT != COLDSTORE_VERDICT_PASS
#error "the calibration record behind coldstore_calibration.h did not pass"
#endif

int main(void)
{
    int status = -1;
    if (coldstore_check_table() != COLDSTORE_TABLE_OK) {
        puts("coefficient table corrupt");
        return 1;
    }
#if defined(CONSUMER_fixed)
    {
        const int32_t mid = (int32_t)((COLDSTORE_RAW_MIN + COLDSTORE_RAW_MAX) / 2);
        const int32_t y = coldstore_eval_fixed_checked(mid, &status);
        printf("format %d: raw %ld -> %ld (status %d)\n", COLDSTORE_FORMAT_VERSION, (long)mid, (long)y,
               status);
    }
#elif defined(CONSUMER_float)
    {
        const float mid = 0.5f * (COLDSTORE_X_MIN + COLDSTORE_X_MAX);
        const float y = coldstore_eval_checked(mid, &status);
        printf("format %d: reading %g -> %g (status %d)\n", COLDSTORE_FORMAT_VERSION, (double)mid,
               (double)y, status);
    }
#else
    {
        const double mid = 0.5 * (COLDSTORE_X_MIN + COLDSTORE_X_MAX);
        const double y = coldstore_eval_checked(mid, &status);
        printf("format %d: reading %g -> %g (status %d)\n", COLDSTORE_FORMAT_VERSION, mid, y, status);
    }
#endif
    return status == COLDSTORE_IN_RANGE ? 0 : 1;
}
