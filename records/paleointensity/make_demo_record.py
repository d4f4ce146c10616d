#!/usr/bin/env python3
"""Write the invented demo paleointensity record `harrowmere-deep-vadm.csv` (standard library only).

Invented scenario: core HD-3 from the (fictional) Harrowmere Deep, a 2-Myr sedimentary relative
paleointensity stack calibrated to VADM, one value per 2 kyr. The series is a seeded random walk in
log-moment pulled toward 7.5e22 A m^2, with lows put in near the polarity boundaries of
records/timescales/chrons-0-6ma.csv so that the demo has something to count. It is not data.

Usage: python3 records/paleointensity/make_demo_record.py > records/paleointensity/harrowmere-deep-vadm.csv
"""
import math
import random

BOUNDARIES = [0.781, 0.988, 1.072, 1.173, 1.185, 1.778, 1.945]  # Ma, from the bundled time scale


def main():
    rng = random.Random(3)
    print("# Invented demo record (not data): fictional core HD-3, Harrowmere Deep; see make_demo_record.py")
    print("age,vadm,vadm_sigma")
    x = 0.0
    for k in range(0, 1001):
        age = k * 0.002
        x += -0.08 * x + rng.gauss(0.0, 0.06)
        dip = sum(0.9 * math.exp(-(((age - b) / 0.006) ** 2)) for b in BOUNDARIES)
        v = 7.5e22 * math.exp(x) * max(0.08, 1.0 - dip)
        print(f"{age:.3f},{v:.4e},{0.12 * v:.3e}")


if __name__ == "__main__":
    main()
