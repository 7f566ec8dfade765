#!/usr/bin/env python3
"""Regenerates the demo calibration runs in this folder (invented scenarios).

Standard library only; deterministic (fixed seeds). The physics is simplified
and the numbers are invented for demonstration: do not use them as reference
data for anything.
"""
import math
import random


def ntc_coldstore(path):
    # A cold-store logger measures air temperature with a 10 kOhm NTC in a
    # divider (NTC to ground, 47 kOhm fixed resistor to the 3.3 V reference,
    # chosen to straighten the curve over the cold-store range) read by a
    # 12-bit ADC. Calibrated in a stirred bath against a reference
    # thermometer, 15 setpoints from -30 to +12 degC, 4 readings each.
    rng = random.Random(20261202)
    beta, r25, r_fixed = 3950.0, 10000.0, 47000.0
    lines = [
        "# ridgecal demo data (invented scenario): cold-store logger, NTC channel 2",
        "# reading: 12-bit ADC counts of the NTC divider; reference: bath reference thermometer, degC",
        "setpoint,reading,reference",
    ]
    for i, sp in enumerate(range(-30, 13, 3)):
        bath = sp + rng.gauss(0.0, 0.05)  # the bath settles near the setpoint
        for _ in range(4):
            t_true = bath + rng.gauss(0.0, 0.004)  # short-term bath stability
            r = r25 * math.exp(beta * (1.0 / (t_true + 273.15) - 1.0 / 298.15))
            v = r / (r + r_fixed)
            counts = round(4095.0 * v + rng.gauss(0.0, 0.6))
            ref = t_true + rng.gauss(0.0, 0.01)  # reference thermometer noise
            lines.append(f"S{i+1:02d},{counts},{ref:.3f}")
    open(path, "w").write("\n".join(lines) + "\n")


def loadcell_hopper(path):
    # A batching plant weighs a feed hopper with a strain-gauge load cell on a
    # 24-bit ADC. Calibrated with certified dead weights from 0 to 200 kg in
    # 20 kg steps, 4 readings each, loading and unloading.
    rng = random.Random(42)
    offset, gain, fs = 51234.0, 31250.0, 200.0  # counts, counts/kg, kg
    lines = [
        "# ridgecal demo data (invented scenario): feed hopper scale, load cell LC-3",
        "# reading: 24-bit ADC counts; reference: dead weights, kg",
        "setpoint,direction,reading,reference",
    ]
    for direction, loads in (("up", range(0, 201, 20)), ("down", range(200, -1, -20))):
        for m in loads:
            for _ in range(2):
                x = m / fs
                nonlin = 0.0004 * fs * gain * (x - x * x)  # 0.01 % FS bow
                counts = offset + gain * m - nonlin + rng.gauss(0.0, 40.0)
                lines.append(f"L{m:03d},{direction},{round(counts)},{m:.3f}")
    open(path, "w").write("\n".join(lines) + "\n")


# Pressure transmitter with temperature drift (invented): shared by the
# generator and, as constants, by tests/unit/test_extended_fit.cpp.
PT_OFFSET0, PT_OFFSET_TC, PT_OFFSET_TC2 = 6000.0, 4.0, 0.02  # counts, counts/degC, counts/degC^2
PT_GAIN0, PT_GAIN_TC = 3200.0, -0.0015  # counts/bar at 25 degC, relative change per degC
PT_BOW = 3.0  # counts/bar^2, bridge nonlinearity


def pressure_counts(p_bar, t_c):
    dt = t_c - 25.0
    offset = PT_OFFSET0 + PT_OFFSET_TC * dt + PT_OFFSET_TC2 * dt * dt
    gain = PT_GAIN0 * (1.0 + PT_GAIN_TC * dt)
    return offset + gain * p_bar - PT_BOW * p_bar * p_bar


def pressure_tempco(path):
    # A hydraulic test rig's 0..16 bar pressure transmitter: a piezoresistive
    # bridge read by a 16-bit ADC, with an on-chip temperature sensor. Its
    # zero and span drift with temperature. Calibrated in a climatic chamber
    # at six temperatures from -20 to +80 degC, at each one nine pressures
    # from 0 to 16 bar set by a pressure controller with a reference gauge,
    # three readings per point.
    rng = random.Random(7070)
    lines = [
        "# ridgecal demo data (invented scenario): test-rig pressure transmitter PT-7 with temperature drift",
        "# reading: 16-bit ADC counts of the bridge; temperature: the transmitter's own sensor, degC;",
        "# reference: reference gauge, bar; chamber: climatic chamber setpoint",
        "setpoint,chamber,temperature,reading,reference",
    ]
    for chamber in (-20, 0, 20, 40, 60, 80):
        soak = chamber + rng.gauss(0.0, 0.3)  # the sensor settles near the chamber setpoint
        for p_set in range(0, 17, 2):
            for _ in range(3):
                t_true = soak + rng.gauss(0.0, 0.02)
                p_true = p_set + rng.gauss(0.0, 0.002)  # controller settling
                counts = pressure_counts(p_true, t_true) + rng.gauss(0.0, 2.0)
                t_meas = t_true + rng.gauss(0.0, 0.05)  # on-chip sensor noise
                ref = p_true + rng.gauss(0.0, 0.0005)  # reference gauge noise
                lines.append(f"P{p_set:02d},C{chamber:+d},{t_meas:.2f},{counts:.1f},{ref:.4f}")
    open(path, "w").write("\n".join(lines) + "\n")


if __name__ == "__main__":
    ntc_coldstore("ntc-coldstore/ntc-coldstore.csv")
    loadcell_hopper("loadcell-hopper/loadcell-hopper.csv")
    pressure_tempco("pressure-tempco/pressure-tempco.csv")
