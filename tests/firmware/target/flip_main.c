/* flip_main.c -- prints the self-check of a generated header (fwt_calib.h,
 * prefix "fwt") as one line "S <fwt_check_table()>", for constant-flip.sh:
 * 0 intact, 1 corrupt, 2 uncheckable. C89, no C library.
 */
#include <stdint.h>
#include "fwt_calib.h"
#include "fw_plat.h"

int main(void)
{
    const int r = fwt_check_table();
    fw_plat_init();
    fw_plat_putc('S');
    fw_plat_putc(' ');
    fw_plat_putc((char)('0' + r));
    fw_plat_putc('\n');
    fw_plat_exit(0);
    return 0;
}
