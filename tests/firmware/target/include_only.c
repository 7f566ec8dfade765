/* include_only.c -- a translation unit that includes the generated header and
 * calls none of it: must compile without a single warning (no unused static
 * functions or tables, no -Wconversion/-Wdouble-promotion findings). */
#include "fwt_calib.h"

int fw_include_only_marker(void);
int fw_include_only_marker(void)
{
    return FWT_FORMAT_VERSION;
}
