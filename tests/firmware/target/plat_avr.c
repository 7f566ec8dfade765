/* plat_avr.c -- ATmega328P under simavr.
 * Output: USART0, polled, at the fastest rate (U2X, UBRR 0); simavr prints
 * each received line on its stderr (coloured, control characters as '.'),
 * which run-target.sh strips. End: sleep with interrupts disabled, which
 * simavr takes as the end of the simulation (its exit code is always 0, so
 * the driver's END line is what proves completion). */
#include <stdint.h>
#include <avr/io.h>
#include <avr/interrupt.h>
#include <avr/sleep.h>
#include "fw_plat.h"

void fw_plat_init(void)
{
    UBRR0H = 0U;
    UBRR0L = 0U;
    UCSR0A = (uint8_t)(1U << U2X0);
    UCSR0C = (uint8_t)((1U << UCSZ01) | (1U << UCSZ00));
    UCSR0B = (uint8_t)(1U << TXEN0);
}

static void wait_tx_ready(void)
{
    while ((UCSR0A & (1U << UDRE0)) == 0U) {
    }
}

void fw_plat_putc(char c)
{
    wait_tx_ready();
    UDR0 = (uint8_t)c;
}

void fw_plat_exit(int status)
{
    wait_tx_ready();
    (void)status;
    cli();
    set_sleep_mode(SLEEP_MODE_PWR_DOWN);
    sleep_enable();
    sleep_cpu();
    for (;;) {
    }
}
