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


if __name__ == "__main__":
    ntc_coldstore("ntc-coldstore/ntc-coldstore.csv")
    loadcell_hopper("loadcell-hopper/loadcell-hopper.csv")
