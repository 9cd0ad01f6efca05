#!/usr/bin/env python3
# Makes samples/curves.csv: invented demo titration curves for the
# Kestrel Ridge fruit works, from the charge balance of a weak acid
# titrated with NaOH (METHODS.md s.8; pKa from the CRC Handbook) plus a
# little Gaussian noise on the pH (seeded, so the file is the same each
# time). Demo data only: the tests make their own curves.
# SPDX-License-Identifier: GPL-3.0-or-later
import random

random.seed(20261202)
KW = 1e-14


def nu(pkas, ph):
    term, total, mean = 1.0, 1.0, 0.0
    for i, pka in enumerate(pkas, 1):
        term *= 10 ** (ph - pka)
        total += term
        mean += i * term
    return mean / total


def volume(pkas, mmol, v0, cb, ph):
    h = 10 ** -ph
    x = h - KW / h
    return (mmol * nu(pkas, ph) - x * v0) / (cb + x)


def ph_at(pkas, mmol, v0, cb, v):
    lo, hi = 0.0, 14.0
    for _ in range(100):
        mid = (lo + hi) / 2
        if volume(pkas, mmol, v0, cb, mid) < v:
            lo = mid
        else:
            hi = mid
    return (lo + hi) / 2


# product, lot, sample, acid, its pKa, molar mass, g acid per 100 g, density,
# sample masses (g), water added (mL), NaOH (mol/L), date, step near the
# end (mL), last volume (mL past the end, or None to stop short)
LOTS = [
    ("LEM-SS", "L2612-A", "S1", "citric", [3.13, 4.76, 6.40], 192.123, 5.02, 1.035,
     [2.0031, 2.0012, 1.9987], 50, 0.1002, "2026-12-02", 0.02, 3),
    ("APJ-CL", "AP-0951", "S1", "malic", [3.40, 5.20], 134.087, 0.48, 1.045,
     [10.021, 10.006], 40, 0.1002, "2026-12-03", 0.01, 3),
    ("APJ-CL", "AP-0952", "S1", "malic", [3.40, 5.20], 134.087, 0.47, 1.045,
     [10.013], 40, 0.1002, "2026-12-03", 0.02, None),
]

print("product,lot,sample,replicate,acid,mass_g,density_g_ml,start_ml,"
      "titrant_mol_l,date,curve,titrant_ml,ph")
for (product, lot, sample, acid, pkas, molar, pct, density, masses, water, cb,
     date, step, past) in LOTS:
    for rep, mass in enumerate(masses, 1):
        mmol = mass * pct / 100 / molar * 1000
        v0 = water + mass / density
        ve = len(pkas) * mmol / cb
        vols = [float(k) for k in range(int(ve - 1))]
        v = ve - 1 if past is not None else ve - 0.6
        end = ve + (past if past is not None else -0.3)
        while v < min(end, ve + 0.5):
            vols.append(round(v, 3))
            v += step
        v = vols[-1] + 1
        while v <= end:
            vols.append(round(v, 3))
            v += 1
        curve = f"{lot}-{rep}"
        for vol in vols:
            ph = ph_at(pkas, mmol, v0, cb, vol) + random.gauss(0, 0.004)
            print(f"{product},{lot},{sample},{rep},{acid},{mass},{density},"
                  f"{water},"
                  f"{cb},{date},{curve},{vol:.3f},{ph:.3f}")
