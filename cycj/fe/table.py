"""J tables by finite elements: J at peak load and ΔJ for a load range, per crack size.

For every crack size a the shape's model is solved twice over a rising sequence of loads:

* J [kJ/m²] at load P on the monotonic curve (the cyclic one when the case gives no monotonic
  curve; the table's JSON says which), deformation plasticity;
* ΔJ [kJ/m²] for a load range ΔP = P on the Masing-scaled cyclic curve: the loading branch
  Δε = Δσ/E + 2(Δσ/2K')^(1/n') is the curve ε = σ/E + (σ/K*)^(1/n') with K* = 2^(1−n')·K', so
  ranges obey the monotonic law with K* (Masing 1926; Lamba 1975; Dowling & Begley 1976).

With equal cyclic and monotonic curves this gives ΔJ(2P) = 4·J(P) exactly.  Each row also holds
the elastic J = K²/E' of the shape's published K solution and the reference-stress estimate at
the same load, so the plastic part can be judged against both.

Columns: ``a_mm, load_N, nominal_stress_MPa, J_kJm2, dJ_kJm2, J_el_kJm2, J_ref_kJm2,
domain_spread``; in a row ``load_N`` is the peak load for ``J_kJm2`` and the load range for
``dJ_kJm2``.

References
----------
.. [1] Masing, G. (1926): the cyclic branch as the doubled curve (from memory).
.. [2] Lamba, H. S., "The J-integral applied to cyclic loading", Eng. Fract. Mech. 7 (1975)
   693–703 (from memory).
.. [3] Dowling, N. E., Begley, J. A., ASTM STP 590 (1976) 82–103: ΔJ (from memory).
.. [4] Ainsworth, R. A., Eng. Fract. Mech. 19 (1984) 633–642: the reference-stress column.
"""

from __future__ import annotations

import time

import numpy as np

from cycj.errors import CycjInputError
from cycj.fe.domain import j_domains
from cycj.fe.law import DeformationLaw
from cycj.fe.parallel import processes, run_jobs
from cycj.fe.shapes import FE_SHAPES, build
from cycj.fe.solver import Unconverged, linear_solver, solve_loads

COLUMNS = (
    "a_mm",
    "load_N",
    "nominal_stress_MPa",
    "J_kJm2",
    "dJ_kJm2",
    "J_el_kJm2",
    "J_ref_kJm2",
    "domain_spread",
)
#: default number of crack sizes and of load levels per size
DEFAULT_SIZES, DEFAULT_LOADS = 5, 10
#: default load levels span L_r = S/S_L(a) from … to …
LR_LOW, LR_HIGH = 0.05, 2.0


def masing_coefficient(k_prime: float, n_prime: float) -> float:
    """K* = 2^(1−n')·K' [MPa]: the Masing branch written as a monotonic curve in ranges."""
    return 2.0 ** (1.0 - n_prime) * k_prime


def laws(material, plane_strain: bool):
    """(law for J at peak load, law for ΔJ, name of the curve used for J)."""
    cyc = material.cyclic_curve
    if cyc is None:
        raise CycjInputError(
            "finite-element ΔJ needs the cyclic curve",
            key="material.cyclic_curve",
            expected="{ strength_coefficient = ..., hardening_exponent = ... }",
        )
    mono = material.monotonic_curve
    peak, which = (mono, "monotonic") if mono is not None else (cyc, "cyclic")
    e, nu = material.elastic_modulus, material.poisson_ratio
    law_j = DeformationLaw(e, nu, peak.strength_coefficient, peak.hardening_exponent, plane_strain)
    k_star = masing_coefficient(cyc.strength_coefficient, cyc.hardening_exponent)
    law_dj = DeformationLaw(e, nu, k_star, cyc.hardening_exponent, plane_strain)
    return law_j, law_dj, which


def solve_series(shape, width, a, law, stresses, *, refine=1, domains=4, span=None, linear="reuse"):
    """J [kJ/m²] and domain spread at nominal stresses ``stresses`` [MPa] (any order), with
    the mesh size, Newton iterations and seconds of each level.  Raises
    :class:`cycj.errors.ValidityRangeError` naming the crack size, the nominal stress that
    failed, the last one reached and why, when Newton does not converge."""
    t0 = time.perf_counter()
    pb = build(shape, width, a, law, refine=refine, span=span)
    order = np.argsort(stresses)
    try:
        lin = linear_solver(pb, linear)
        sols = solve_loads(pb, np.asarray(stresses, float)[order], linear=lin)
    except Unconverged as exc:
        from cycj.errors import ValidityRangeError

        raise ValidityRangeError(
            f"finite-element solution at a = {a:.6g} mm did not converge at nominal stress "
            f"{exc.target:.6g} MPa (last converged {exc.reached:.6g} MPa: {exc.reason}); "
            "lower the largest load ([fe] loads or nominal_stresses)"
        ) from None
    j = np.empty(len(order))
    spread = np.empty(len(order))
    iters = np.empty(len(order), int)
    secs = np.empty(len(order))
    for k, sol in zip(order, sols, strict=True):
        vals, sp = j_domains(pb, sol, domains)
        j[k], spread[k], iters[k], secs[k] = vals.mean(), sp, sol.iterations, sol.seconds
    info = {
        "elements": int(len(pb.mesh.elements)),
        "nodes": int(len(pb.mesh.nodes)),
        "dofs": int(pb.n_dofs),
        "rings": int(len(pb.mesh.ring_sizes) - 1),
        "newton_iterations": iters.tolist(),
        "linear_solver": {"method": linear, **lin.stats},
        "seconds": secs.tolist(),
        "total_seconds": time.perf_counter() - t0,
    }
    return j, spread, info


def _check_shape(geometry):
    name = geometry.shape.name
    if name not in FE_SHAPES:
        raise CycjInputError(
            f"no finite-element model of shape {name}",
            key="geometry.shape",
            expected="one of " + ", ".join(FE_SHAPES),
            found=name,
        )
    d = geometry.dims
    if abs(d.get("net_thickness", d["thickness"]) - d["thickness"]) > 1e-9 * d["thickness"]:
        raise CycjInputError(
            "side grooves are not modelled by the finite-element J",
            key="geometry.net_thickness",
            expected="= thickness",
        )


def crack_sizes(case, sizes=None):
    """Crack sizes [mm]: given, or ``sizes`` (a count) spanning the case's crack range."""
    geo = case.geometry
    if sizes is not None and not np.isscalar(sizes):
        out = np.asarray(sizes, float)
        geo.check_crack(out)
        return np.unique(out)
    lo_v, hi_v = geo.size_limits
    a0 = geo.crack_length
    end = min(case.run.crack_length_limit or hi_v, hi_v)
    n = DEFAULT_SIZES if sizes is None else int(sizes)
    if n < 1:
        raise CycjInputError("need at least one crack size", key="--sizes", found=sizes)
    if n == 1 or end <= a0:
        return np.array([a0])
    return np.linspace(max(a0, lo_v), end, n)


def load_levels(case, a, loads=None, fe=None):
    """Nominal stresses [MPa] at crack size ``a``: from ``loads`` (a count, or forces [N]),
    from the case's ``[fe]`` table, or L_r from 0.05 to 2 (geometric)."""
    geo = case.geometry
    per_force = geo.nominal_stress_per_force()
    if loads is not None and not np.isscalar(loads):
        return np.asarray(loads, float) * per_force
    if loads is None and fe is not None:
        if fe.nominal_stresses is not None:
            return np.asarray(fe.nominal_stresses, float)
        if fe.loads is not None:
            return np.asarray(fe.loads, float) * per_force
    n = DEFAULT_LOADS if loads is None else int(loads)
    if n < 1:
        raise CycjInputError("need at least one load level", key="--loads", found=loads)
    s_l = float(geo.limit_stress(a, case.material.yield_strength))
    return s_l * np.geomspace(LR_LOW, LR_HIGH, n) if n > 1 else np.array([LR_LOW * s_l])


def compute(case, sizes=None, loads=None, progress=None, *, workers=1, scheduler=None):
    """The J table (DataFrame with :data:`COLUMNS`) and its run information (dict).

    The load sequences (two per crack size: J and ΔJ) run in ``workers`` processes (default
    1: in this process, which is safe in a script without a ``__main__`` guard; None: the
    usable cores, as ``cycj j-table`` does) or on the Dask ``scheduler``
    (:mod:`cycj.fe.parallel`); the table is the same either way."""
    import pandas as pd

    from cycj.fe.inputs import read_fe
    from cycj.jintegral import j_max

    geo, mat = case.geometry, case.material
    _check_shape(geo)
    fe = read_fe(case.raw.get("fe"), str(case.path) if case.path else None)
    if sizes is None and fe.crack_lengths is not None:
        sizes = fe.crack_lengths
    law_j, law_dj, which = laws(mat, geo.plane_strain)
    e_prime = mat.effective_modulus(geo.plane_strain)
    width = geo.dims["width"]
    span = geo.dims.get("span")
    t0 = time.perf_counter()
    sizes_mm = crack_sizes(case, sizes)
    levels = [load_levels(case, a, loads, fe) for a in sizes_mm]
    common = {"refine": fe.refine, "domains": fe.domains, "span": span}
    jobs = [
        dict(shape=geo.shape.name, width=width, a=float(a), law=law, stresses=s, **common)
        for a, s in zip(sizes_mm, levels, strict=True)
        for law in (law_j, law_dj)
    ]
    results = run_jobs(jobs, workers, scheduler)
    rows, runs = [], []
    for i, (a, s) in enumerate(zip(sizes_mm, levels, strict=True)):
        (j, sp_j, info_j), (dj, sp_dj, info_dj) = results[2 * i], results[2 * i + 1]
        j_el = (s * geo.k_over_s(a)) ** 2 / e_prime
        j_ref = np.atleast_1d(j_max(geo, mat, np.full(len(s), a), s))
        for k in range(len(s)):
            rows.append(
                (a, s[k] / geo.nominal_stress_per_force(), s[k], j[k], dj[k], j_el[k])
                + (j_ref[k], max(sp_j[k], sp_dj[k]))
            )
        runs.append({"a_mm": float(a), "J": info_j, "dJ": info_dj})
        if progress is not None:
            progress(a)
    frame = pd.DataFrame(rows, columns=list(COLUMNS)).sort_values(["a_mm", "load_N"])
    info = {
        "shape": geo.shape.name,
        "constraint": "plane-strain" if geo.plane_strain else "plane-stress",
        "curve_for_J": which,
        "masing_coefficient_MPa": law_dj.K,
        "refine": fe.refine,
        "domains": fe.domains,
        "per_crack": runs,
        "worst_domain_spread": float(frame["domain_spread"].max()),
        "dofs_max": max(r["J"]["dofs"] for r in runs),
        "seconds": sum(r["J"]["total_seconds"] + r["dJ"]["total_seconds"] for r in runs),
        "wall_seconds": time.perf_counter() - t0,
        "parallel": "dask"
        if scheduler is not None
        else f"{processes(workers, len(jobs))} processes",
    }
    return frame.reset_index(drop=True), info


def j_table(case, sizes=None, loads=None, *, workers=1, scheduler=None):
    """J and ΔJ by finite elements for ``case`` (a :class:`cycj.case.Case` or a path).

    Parameters
    ----------
    case : Case or path of a case file
    sizes : None, a count, or crack sizes [mm] (half length for center-crack-plate)
    loads : None, a count of load levels per size, or loads [N]
    workers : processes for the load sequences (default 1, in this process; None: the usable
        cores — worker processes are spawned, so a script needs an ``if __name__ ==
        "__main__":`` guard)
    scheduler : Dask scheduler address or client (the sequences run there instead)

    Returns
    -------
    pandas.DataFrame
        Columns :data:`COLUMNS` (J in kJ/m², loads in N, stresses in MPa).
    """
    if not hasattr(case, "geometry"):
        from cycj.case import load_case

        case = load_case(case)
    return compute(case, sizes, loads, workers=workers, scheduler=scheduler)[0]
