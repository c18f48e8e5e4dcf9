"""Finite-element J over cycj's reference-stress J at L_r = 0.2 … 1.2 (the table of
docs/finite_element_j.md, section 9).  A script, not a test.

Material: Ramberg–Osgood ε/ε0 = σ/σ0 + (σ/σ0)^n with σ0 = 400 MPa (the yield strength that
L_r uses, the 0.2 % proof stress here), E = 200 GPa, ν = 0.3, n = 5 and 10; the same curve
for J at peak load in both methods.  Each shape at a/W = 0.5 (M(T): 2a/W = 0.5), W = 50 mm,
plane strain, and plane stress for the plates (M(T), SE(T)).  L_r = S/S_L(a) with the shape's
limit load in cycj.geometry.  Prints a Markdown table.

Run from the repository root::

    python bench/fe_ratio_table.py [--refine 1] [--workers 2]
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from cycj.fe.law import DeformationLaw  # noqa: E402
from cycj.fe.parallel import run_jobs  # noqa: E402
from cycj.geometry import make_geometry  # noqa: E402
from cycj.jintegral import j_max  # noqa: E402
from cycj.material import Material, StressStrainCurve  # noqa: E402

E, NU, SIGMA_0, W = 200e3, 0.3, 400.0, 50.0
LR = (0.2, 0.4, 0.6, 0.8, 1.0, 1.2)
CASES = [
    ("compact-tension", True),
    ("three-point-bend", True),
    ("center-crack-plate", True),
    ("center-crack-plate", False),
    ("edge-crack-plate", True),
    ("edge-crack-plate", False),
]
LABEL = {
    "compact-tension": "C(T)",
    "three-point-bend": "SE(B)",
    "center-crack-plate": "M(T)",
    "edge-crack-plate": "SE(T)",
}


def _setup(shape, plane_strain, n):
    a = 0.5 * W * (0.5 if shape == "center-crack-plate" else 1.0)
    k = SIGMA_0 * (SIGMA_0 / E) ** (-1.0 / n)
    curve = StressStrainCurve(k, 1.0 / n)
    mat = Material(E, NU, SIGMA_0, None, curve, curve)
    extra = {"span": 4 * W} if shape == "three-point-bend" else {}
    geo = make_geometry(
        shape,
        a,
        width=W,
        thickness=10.0,
        constraint="plane-strain" if plane_strain else "plane-stress",
        **extra,
    )
    s = np.array(LR) * float(geo.limit_stress(a, SIGMA_0))
    law = DeformationLaw(E, NU, k, 1.0 / n, plane_strain)
    return a, geo, mat, s, law


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__)
    ap.add_argument("--refine", type=int, default=1)
    ap.add_argument("--workers", type=int, default=None)
    args = ap.parse_args(argv)
    keys, jobs, refs = [], [], []
    for shape, ps in CASES:
        for n in (5, 10):
            a, geo, mat, s, law = _setup(shape, ps, n)
            span = 4 * W if shape == "three-point-bend" else None
            jobs.append(
                dict(shape=shape, width=W, a=a, law=law, stresses=s, refine=args.refine, span=span)
            )
            refs.append(np.atleast_1d(j_max(geo, mat, np.full(len(s), a), s)))
            keys.append((shape, ps, n))
    t0 = time.perf_counter()
    results = run_jobs(jobs, args.workers)
    print("| shape | constraint | n | " + " | ".join(f"L_r {x}" for x in LR) + " |")
    print("|---|---|---|" + "---|" * len(LR))
    worst = 0.0
    for (shape, ps, n), ref, (j, spread, _) in zip(keys, refs, results, strict=True):
        worst = max(worst, float(spread.max()))
        cells = " | ".join(f"{r:.2f}" for r in j / ref)
        con = "plane strain" if ps else "plane stress"
        print(f"| {LABEL[shape]} | {con} | {n} | {cells} |")
    print(
        f"\nrefine {args.refine}; worst domain spread {worst:.1e}; {time.perf_counter() - t0:.0f} s"
    )


if __name__ == "__main__":
    main()
