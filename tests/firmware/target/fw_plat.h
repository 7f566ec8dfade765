/* fw_plat.h -- what the firmware test driver needs from a target. */
#ifndef FW_PLAT_H
#define FW_PLAT_H

void fw_plat_init(void);
void fw_plat_putc(char c);     /* one output character; '\n' ends a line */
void fw_plat_exit(int status); /* does not return; 0 = the driver ran to its end */

#endif
