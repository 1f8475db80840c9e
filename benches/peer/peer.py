"""The vectorised peer of `beamsift select` for benches/peer/job.toml.

Written with numpy 2.4.6 and pandas 3.1.1 on Python 3.11.7 (the versions
benches/peer/run.sh was measured with). It reads a catalogue written by
`beamsift catalog generate welded-i`, computes each welded I's properties
(A = 2·bf·tf + hw·tw, Ix = bf·d³/12 − (bf − tw)·hw³/12), and checks the
9 m simple span of the job: uniform dead 10 kN/m plus the section's
self-weight (the mass column × 9.806 65 m/s²) and live 15 kN/m;
M = wL²/8 against Fb·Ix/c, V = wL/2 against Fv·d·tw, and the live-load
deflection 5·w·L⁴/(384·E·Ix) against L/360. It prints the rows read, how
many pass, and the lightest that passes, so run.sh can compare the answer
with beamsift's as well as the time.

Usage: python peer.py CATALOGUE.csv
"""

import sys
import time

import numpy as np
import pandas as pd

L = 9000.0  # mm
E, FB, FV = 200_000.0, 207.0, 138.0  # MPa
WD, WL = 10.0, 15.0  # N/mm (kN/m)
G = 9.80665


def main(path):
    t0 = time.perf_counter()
    df = pd.read_csv(
        path,
        comment="#",
        usecols=["name", "bf [mm]", "tf [mm]", "hw [mm]", "tw [mm]", "mass [kg/m]"],
        dtype={"name": str},
        engine="c",
    )
    bf = df["bf [mm]"].to_numpy(float)
    tf = df["tf [mm]"].to_numpy(float)
    hw = df["hw [mm]"].to_numpy(float)
    tw = df["tw [mm]"].to_numpy(float)
    mass = df["mass [kg/m]"].to_numpy(float)
    d = hw + 2.0 * tf
    ix = bf * d**3 / 12.0 - (bf - tw) * hw**3 / 12.0
    w = WD + mass * G / 1000.0 + WL  # N/mm
    m = w * L**2 / 8.0
    v = w * L / 2.0
    bending = m * (d / 2.0) / ix / FB
    shear = v / (d * tw) / FV
    deflection = 5.0 * WL * L**4 / (384.0 * E * ix) / (L / 360.0)
    util = np.maximum(np.maximum(bending, shear), deflection)
    passes = util <= 1.0
    order = np.lexsort((d, mass))  # lightest, then shallowest
    best = next((i for i in order if passes[i]), None)
    t1 = time.perf_counter()
    print(f"rows {len(df)}")
    print(f"passing {int(passes.sum())}")
    if best is not None:
        print(f"lightest {df['name'].iloc[best]} utilisation {util[best]:.3f}")
    print(f"seconds {t1 - t0:.3f}")


if __name__ == "__main__":
    main(sys.argv[1])
