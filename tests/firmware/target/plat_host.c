/* plat_host.c -- the test driver on the build machine: stdout and exit(). */
#include <stdio.h>
#include <stdlib.h>
#include "fw_plat.h"

void fw_plat_init(void)
{
}

void fw_plat_putc(char c)
{
    (void)putchar((unsigned char)c);
}

void fw_plat_exit(int status)
{
    (void)fflush(stdout);
    exit(status);
}
