"""The case's ``[inspection]`` table → validated :class:`PlanInputs` (one-line errors).

Keys (all quantities may carry units; bare numbers are mm, cycles, kJ/m²)::

    [inspection]
    detectable_size = "3 mm"     # default: the POD's a90/95 if given (fitted), else its a90
    safety_factor = 2
    design_life = 1.0e6          # cycles
    intervals = [5.0e4, 1.0e5]   # what-if intervals (cycles); default: design life / 2, 4, 8, 16
    pod = { model = "lognormal", a50 = "2 mm", sigma = 0.4, ceiling = 1.0 }   # or a90 = ...
    schedule = [2.0e5, 3.5e5]    # optional fixed inspection times (cycles)
    samples = 20000
    seed = 7
    target_pof = 1.0e-4
    repair = "renew"             # or "remove"
    max_inspections = 100        # smallest interval searched = design life / this
    chunk_size = 10000           # samples per Monte Carlo chunk (fixed: results do not
                                 # depend on the number of workers)
    max_samples = 1000000        # budget: samples are added up to this until the
    pof_tolerance = 0.2          # half-width of the PoF's confidence interval at the
    confidence = 0.95            # recommended interval ≤ pof_tolerance × target_pof
    method = "auto"              # "monte-carlo", "importance-sampling" (auto: the latter for
                                 # target_pof < 1e-3 without findings)
    hours_per_year = 8766        # operating hours in a year (default: continuous)
    pod_lower_bound = false      # also plot the POD through a90/95 (needs a90_95)
    findings = [ { cycles = 2.0e5, result = "not-found" },
                 { cycles = 3.5e5, result = "found", size = "2.5 mm", sizing_sd = "0.3 mm",
                   pod = { ... } } ]   # pod per finding optional (default: the plan's pod)
    [inspection.scatter]         # any subset of growth_C, initial_crack, toughness, load_scale
    growth_C = { distribution = "lognormal", sigma = 0.3 }
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from cycj.errors import CycjInputError
from cycj.plan import scatter as sc
from cycj.plan.findings import Finding
from cycj.plan.pod import POD_MODELS, PodCurve, pod_from_a50, pod_from_a90
from cycj.tables import Table


@dataclass(frozen=True)
class PlanInputs:
    """Validated ``[inspection]`` inputs in internal units (mm, cycles)."""

    pod: PodCurve
    design_life: float
    detectable_size: float
    detectable_source: str
    safety_factor: float = 2.0
    intervals: tuple = ()
    schedule: tuple | None = None
    samples: int = 20000
    seed: int = 0
    target_pof: float = 1e-4
    repair: str = "renew"
    max_inspections: int = 100
    chunk_size: int = 10_000
    scatter: sc.Scatter = sc.Scatter()
    findings: tuple = ()
    max_samples: int = 1_000_000
    pof_tolerance: float = 0.2
    confidence: float = 0.95
    method: str = "auto"
    hours_per_year: float = 8766.0
    pod_lower_bound: bool = False


#: widest POD curve accepted (spread in ln a; a90/a50 = e^(1.28·5) ≈ 600 already)
POD_SIGMA_MAX = 5.0


def read_pod(t: Table) -> PodCurve:
    """A POD inline table: ``model``, one of ``a50``/``a90``, ``sigma``, ``ceiling``, and
    optionally ``a90_95`` (from a fit to data)."""
    model = t.choice("model", POD_MODELS, default="lognormal")
    a50 = t.quantity("a50", "length", positive=True)
    a90 = t.quantity("a90", "length", positive=True)
    sigma = t.number(
        "sigma", required=True, lo=(1e-6, "0"), hi=(POD_SIGMA_MAX, f"{POD_SIGMA_MAX:g}")
    )
    ceiling = t.number("ceiling", default=1.0)
    if not 0 < ceiling <= 1:
        raise t.error("ceiling", "out of range", expected="0 < ceiling ≤ 1", found=ceiling)
    a9095 = t.quantity("a90_95", "length", positive=True)
    t.finish()
    if (a50 is None) == (a90 is None):
        raise t.error("a50", "give exactly one of a50 and a90")
    if a50 is not None:
        return pod_from_a50(model, a50, sigma, ceiling, a9095)
    return pod_from_a90(model, a90, sigma, ceiling, a9095)


_KINDS = {
    "growth_C": "C",
    "initial_crack": "length",
    "toughness": "energy_per_area",
    "load_scale": "factor",
}


#: most inspections over a design life (what-if intervals and the interval search)
MAX_INSPECTIONS = 2000
#: spreads beyond these make the sampled values overflow (e^(6σ) at σ = 3 is already 7e7)
SIGMA_MAX, COV_MAX, SHAPE_MIN = 3.0, 10.0, 0.5


def read_dist(t: Table, name: str, base: float, kind: str) -> sc.Dist:
    """One scattered input.  ``base`` is the case's value (median by default)."""
    dist = t.choice("distribution", sc.DISTRIBUTIONS, required=True)

    def centre(key):
        if kind == "length":
            return t.quantity(key, "length", positive=True)
        if kind == "energy_per_area":
            v = t.quantity(key, "energy_per_area", positive=True)
            return None if v is None else v / base_raw
        v = t.number(key, positive=True)
        return None if v is None else (v if kind == "factor" else v / base_raw)

    base_raw = base
    base = 1.0 if kind in ("C", "energy_per_area", "factor") else base
    median, mean = centre("median"), centre("mean")
    if median is not None and mean is not None:
        raise t.error("mean", "give median or mean, not both")
    if dist == "fixed":
        value = t.quantity("value", "length", positive=True) if kind == "length" else None
        t.finish()
        return sc.fixed(value if value is not None else (median or mean or base))
    sigma = t.number("sigma", lo=(1e-12, "0"), hi=(SIGMA_MAX, f"{SIGMA_MAX:g}"))
    cov = t.number("cov", lo=(1e-12, "0"), hi=(COV_MAX, f"{COV_MAX:g}"))
    sd = (
        t.quantity("sd", "length", positive=True)
        if kind == "length"
        else t.number("sd", positive=True)
    )
    shape = t.number("shape", lo=(SHAPE_MIN, f"{SHAPE_MIN:g}"), hi=(1e3, "1000"))
    t.finish()
    given = [
        k
        for k, v in (("sigma", sigma), ("cov", cov), ("sd", sd), ("shape", shape))
        if v is not None
    ]
    allowed = {"lognormal": ("sigma", "cov"), "weibull": ("shape", "cov"), "normal": ("sd", "cov")}[
        dist
    ]
    bad = [g for g in given if g not in allowed]
    if bad or len(given) != 1:
        raise t.error(
            bad[0] if bad else "distribution",
            f"a {dist} {name} needs exactly one spread",
            expected=" or ".join(allowed),
            found=", ".join(given) or None,
        )
    if dist == "lognormal":
        s = sigma if sigma is not None else sc.lognormal_sigma_from_cov(cov)
        med = (
            median
            if median is not None
            else (mean * math.exp(-s * s / 2) if mean is not None else base)
        )
        return sc.lognormal(med, s)
    if dist == "weibull":
        if shape is None:
            if not 0.01 <= cov <= 5:
                raise t.error("cov", "out of range", expected="0.01 to 5", found=cov)
            shape = sc.weibull_shape_from_cov(cov)
        return (
            sc.weibull(shape, mean=mean)
            if mean is not None
            else sc.weibull(shape, median=median if median is not None else base)
        )
    m = mean if mean is not None else (median if median is not None else base)
    return sc.Dist("normal", m, sd if sd is not None else cov * m)


def _times(t: Table, key: str, design_life: float | None = None):
    raw = t.get(key)
    if raw is None:
        return None
    if not isinstance(raw, list) or not all(
        isinstance(v, (int, float)) and not isinstance(v, bool) and v > 0 for v in raw
    ):
        raise t.error(key, "must be a list of positive numbers (cycles)", found=raw)
    if design_life is not None and any(v >= design_life for v in raw):
        raise t.error(
            key,
            "inspection times must fall within the design life",
            expected=f"< {design_life:g}",
            found=raw,
        )
    return tuple(float(v) for v in raw)


def read_inspection(case) -> PlanInputs:
    """Validate ``case.inspection``; every error is one line naming the file and key."""
    src = str(case.path) if case.path is not None else None
    if case.inspection is None:
        raise CycjInputError(
            "the case has no [inspection] table",
            source=src,
            key="inspection",
            expected="see `cycj plan --help`",
        )
    t = Table(case.inspection, "inspection", src)
    pod_t = t.table("pod", required=True)
    pod = read_pod(pod_t)
    life = t.number("design_life", required=True, positive=True)
    sf = t.number("safety_factor", default=2.0)
    if not sf >= 1:
        raise t.error("safety_factor", "out of range", expected="≥ 1", found=sf)
    det = t.quantity("detectable_size", "length", positive=True)
    if det is not None:
        det_src = "detectable_size"
    elif pod.a90_95 is not None:
        det, det_src = pod.a90_95, "the POD's a90/95"
    else:
        det, det_src = pod.a90, "the POD's a90"
    intervals = _times(t, "intervals")
    if intervals == ():
        raise t.error("intervals", "needs at least one what-if interval", found=[])
    if intervals is not None and min(intervals) < life / MAX_INSPECTIONS:
        raise t.error(
            "intervals",
            f"an interval this short means more than {MAX_INSPECTIONS} "
            "inspections in the design life",
            expected=f"≥ {life / MAX_INSPECTIONS:g} cycles",
            found=min(intervals),
        )
    if intervals is None:
        intervals = tuple(life / n for n in (16, 8, 4, 2))
    schedule = _times(t, "schedule", life)
    samples = t.number("samples", default=20000, integer=True)
    if not 100 <= samples <= 100_000_000:
        raise t.error("samples", "out of range", expected="100 to 1e8", found=samples)
    seed = t.number("seed", default=0, integer=True, nonnegative=True)
    target = t.number("target_pof", default=1e-4)
    if not 0 < target < 1:
        raise t.error("target_pof", "out of range", expected="0 < target_pof < 1", found=target)
    repair = t.choice("repair", ("renew", "remove"), default="renew")
    max_insp = t.number("max_inspections", default=100, integer=True)
    if not 1 <= max_insp <= MAX_INSPECTIONS:
        raise t.error(
            "max_inspections", "out of range", expected=f"1 to {MAX_INSPECTIONS}", found=max_insp
        )
    chunk = t.number("chunk_size", default=10_000, integer=True)
    if not 100 <= chunk <= 1_000_000:
        raise t.error("chunk_size", "out of range", expected="100 to 1e6", found=chunk)
    budget = t.number("max_samples", default=max(1_000_000, samples), integer=True)
    if not samples <= budget <= 100_000_000:
        raise t.error(
            "max_samples", "out of range", expected=f"{samples} (samples) to 1e8", found=budget
        )
    tol = t.number("pof_tolerance", default=0.2)
    if not 0.01 <= tol <= 1:
        raise t.error("pof_tolerance", "out of range", expected="0.01 to 1", found=tol)
    conf = t.number("confidence", default=0.95)
    if not 0.5 <= conf < 1:
        raise t.error("confidence", "out of range", expected="0.5 ≤ confidence < 1", found=conf)
    method = t.choice("method", ("auto", "monte-carlo", "importance-sampling"), default="auto")
    hpy = t.number("hours_per_year", default=8766.0)
    if not 0 < hpy <= 8784:
        raise t.error("hours_per_year", "out of range", expected="0 < h ≤ 8784", found=hpy)
    lower = t.get("pod_lower_bound", False)
    if not isinstance(lower, bool):
        raise t.error("pod_lower_bound", "must be true or false", found=lower)
    if lower and pod.a90_95 is None:
        raise t.error(
            "pod_lower_bound", "needs a POD with a90_95 (from a fit)", expected="pod.a90_95"
        )
    scat = _scatter(t.table("scatter"), case)
    findings = _findings(t, pod, life)
    if method == "importance-sampling" and findings:
        raise t.error("method", "importance sampling does not combine with findings")
    t.finish()
    return PlanInputs(
        pod,
        life,
        det,
        det_src,
        sf,
        intervals,
        schedule,
        samples,
        seed,
        target,
        repair,
        max_insp,
        chunk,
        scat,
        findings,
        budget,
        tol,
        conf,
        method,
        hpy,
        lower,
    )


def _scatter(t: Table | None, case) -> sc.Scatter:
    a0 = case.geometry.crack_length
    if t is None:
        return sc.Scatter(initial_crack=sc.fixed(a0))
    out = {"initial_crack": sc.fixed(a0)}
    bases = {
        "growth_C": case.growth.C,
        "initial_crack": a0,
        "toughness": case.material.J_c,
        "load_scale": 1.0,
    }
    for name in sc.VARIABLES:
        sub = t.table(name)
        if sub is None:
            continue
        if name == "toughness" and bases["toughness"] is None:
            raise t.error(name, "toughness scatter needs material.toughness.J_c (or K_c)")
        out[name] = read_dist(sub, name, bases[name], _KINDS[name])
    t.finish()
    return sc.Scatter(**out)


def _findings(t: Table, pod: PodCurve, life: float) -> tuple:
    raw = t.get("findings")
    if raw is None:
        return ()
    if not isinstance(raw, list):
        raise t.error(
            "findings",
            "must be a list of tables",
            expected='[{ cycles = 2e5, result = "not-found" }, ...]',
            found=raw,
        )
    out, last = [], 0.0
    for i, item in enumerate(raw):
        ft = Table(item, f"{t.key('findings')}[{i}]", t.source)
        cyc = ft.number("cycles", required=True, positive=True)
        if cyc <= last or cyc >= life:
            raise ft.error(
                "cycles",
                "findings must be in time order within the design life",
                expected=f"{last:g} < cycles < {life:g}",
                found=cyc,
            )
        last = cyc
        result = ft.choice("result", ("found", "not-found"), required=True)
        p_t = ft.table("pod")
        fpod = read_pod(p_t) if p_t is not None else pod
        size = sd = None
        if result == "found":
            size = ft.quantity("size", "length", required=True, positive=True)
            sd = ft.quantity("sizing_sd", "length", positive=True, default=0.1 * size)
        ft.finish()
        out.append(Finding(cyc, result == "found", fpod, size, sd))
    return tuple(out)
