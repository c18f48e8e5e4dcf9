"""A virtual test frame: synthetic fatigue crack growth logs from a known growth law.

The specimen's crack grows by da/dN = C·ΔJ_eff^m.  Every recorded cycle is a loop of load and
displacement samples built from the elastic compliance of the specimen at the current crack
length (E647 C(T) expressions, or the Castigliano compliance of other shapes), stiffened below
an opening load (closure), plus a Masing-type plastic branch whose size matches the plastic
part of ΔJ by the cyclic reference stress method (taken to the measuring point by the
elastic compliance ratio for the elastic part and by the plastic hinge ratio of the arms for
the plastic part), plus Gaussian noise (seeded).  Demos and
tests get realistic data whose true constants are known.

Units: N, mm, MPa, kJ/m², cycles.

References
----------
.. [1] Masing, G. (1926); Morrow, J. D., ASTM STP 378 (1965): branch shape and plastic work
   ΔP·ΔV_p/(1+n') of the loading branch.
.. [2] Ainsworth, Eng. Fract. Mech. 19 (1984) 633 (cyclic reference stress, via
   :mod:`cycj.jintegral`); Dowling & Begley, ASTM STP 590 (1976).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from cycj.errors import ValidityRangeError
from cycj.material import masing_plastic_strain_range

#: uncracked-body part of the compliance for shapes without an E647 expression (a short gauge
#: across the crack),
#: as E·B·C0 (dimensionless; any value works: the reduction anchors it at the first loop)
_C0_NORMALISED = 0.3


@dataclass
class SimulatedTest:
    """Synthetic logs: ``raw`` (cycle, load, displacement), ``crack`` (cycle, crack_length,
    load_max, load_min) and the ``truth`` per recorded cycle (cycle, a_mm, P_max_N, P_min_N,
    P_open_N, dJ_eff_kJm2, dadN_mm_per_cycle), all in N and mm."""

    raw: object
    crack: object
    truth: object


def point_compliance(specimen, a):
    """Compliance [mm/N] at the specimen's measuring point and at the load line, for crack
    length(s) ``a`` [mm]: returns (C_point, C_load_line).  For shapes without an E647
    expression, the load-line compliance is the Castigliano integral plus a fixed body part."""
    from cycj.calibrate import compliance as cm

    a = np.asarray(a, float)
    geo = specimen.geometry
    e = specimen.material.elastic_modulus
    be = cm.effective_thickness(geo.dims["thickness"], geo.dims["net_thickness"])
    if specimen.shape == "compact-tension":
        alpha = a / specimen.width
        c_ll = cm.e647_ct_normalised_compliance(alpha, "load-line") / (e * be)
        c_pt = cm.e647_ct_normalised_compliance(alpha, specimen.compliance_point) / (e * be)
        return c_pt, c_ll
    a_grid, dc = cm.castigliano_compliance_table(geo, specimen.e_prime, tips=_tips(specimen.shape))
    c_ll = _C0_NORMALISED / (e * be) + np.interp(a, a_grid, dc)
    return c_ll, c_ll


def _tips(shape):
    return 2 if shape == "center-crack-plate" else 1


def true_delta_j(specimen, a, p_max, p_min, p_open, j_table=None):
    """ΔJ_eff [kJ/m²] that the loop reduction measures for a noise-free loop of this frame.

    ΔJ_el = ΔK_eff²/E' with ΔK_eff from P_max − P_op; plastic part: the reference stress
    plastic term of the full range — or, with ``j_table`` (a finite-element J table,
    jtable.csv columns), the table's ΔJ − ΔJ_el — scaled by f_pl(U) (the Masing branch's share
    above the opening load).  For M(T) without a table the whole estimate is the reference
    stress method.
    """
    from cycj.jintegral import plastic_fraction, reference_stress_delta_j

    a = np.asarray(a, float)
    geo = specimen.geometry
    mat = specimen.material
    s_per_p = geo.nominal_stress_per_force()
    dp_full = np.asarray(p_max, float) - np.maximum(np.asarray(p_min, float), 0.0)
    u = (np.asarray(p_max, float) - np.asarray(p_open, float)) / dp_full
    kos = geo.k_over_s(a)
    dj_el_full = (dp_full * s_per_p * kos) ** 2 / specimen.e_prime
    if mat.cyclic_curve is None:
        return u**2 * dj_el_full
    dsig_ref = dp_full * s_per_p * mat.yield_strength / geo.limit_stress(a, mat.yield_strength)
    if specimen.shape == "center-crack-plate" and j_table is None:
        return reference_stress_delta_j(dj_el_full, dsig_ref, mat, u)
    return u**2 * dj_el_full + plastic_fraction(u, mat.cyclic_curve.hardening_exponent) * (
        _plastic_full(specimen, a, dp_full, dj_el_full, j_table)
    )


def _plastic_full(specimen, a, dp, dj_el, j_table):
    """Plastic part of ΔJ [kJ/m²] for the full load range ``dp`` [N]: the finite-element
    table's (g − 1)·ΔJ_el (the stepper's look-up) or the cyclic reference stress term."""
    geo, mat = specimen.geometry, specimen.material
    ds = dp * geo.nominal_stress_per_force()
    if j_table is not None:
        from cycj.fe.lookup import table_ratio

        g = table_ratio(j_table, geo, mat.yield_strength, a, ds, 0)
        return np.maximum(g - 1.0, 0.0) * dj_el
    dsig = ds * mat.yield_strength / geo.limit_stress(a, mat.yield_strength)
    return _plastic_ref(dj_el, dsig, mat)


def _plastic_ref(dj_el, dsig_ref, mat):
    c = mat.cyclic_curve
    dep = np.array(
        [
            masing_plastic_strain_range(float(s), c.strength_coefficient, c.hardening_exponent)
            for s in np.ravel(dsig_ref)
        ]
    )
    dep = dep.reshape(np.shape(dsig_ref))
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(dsig_ref > 0, dj_el * mat.elastic_modulus * dep / dsig_ref, 0.0)


def simulate_test(
    specimen,
    C,
    m,
    *,
    p_max,
    r_ratio=0.1,
    opening_fraction=0.0,
    threshold=0.0,
    crack_end=None,
    record_every=1000,
    samples=120,
    closed_stiffness=0.6,
    k_gradient=0.0,
    noise_load=0.0005,
    noise_disp=0.0005,
    crack_noise=0.0,
    max_cycles=5e7,
    rate_floor=2e-8,
    start_cycle=0,
    seed=0,
    j_table=None,
):
    """Synthesise a fatigue crack growth test.

    Parameters
    ----------
    specimen : cycj.calibrate.specimen.Specimen (initial crack = ``specimen.initial_crack``)
    C, m : growth law da/dN = C·ΔJ_eff^m [mm/cycle, kJ/m²]
    p_max : float [N], maximum load at the start
    r_ratio : P_min/P_max, 0 ≤ R < 1
    opening_fraction : x = (P_op − P_min)/ΔP in [0, 0.8] (closure: the loop stiffens below)
    threshold : ΔJ_th [kJ/m²]; no growth below it
    crack_end : final crack length [mm] (default: 95 % of the upper validity limit)
    record_every : cycles between recorded loops
    samples : samples per recorded loop (sinusoidal in time, starting at the minimum)
    closed_stiffness : compliance below the opening load as a fraction of the open one
    k_gradient : ASTM E647 normalised K gradient (1/K)dK/da [1/mm]; negative sheds load
    noise_load, noise_disp : noise standard deviation as a fraction of the load range and of
        the displacement range of the loop
    crack_noise : standard deviation of the crack length readings of ``crack`` [mm]
    max_cycles, rate_floor : stop when either is reached (rate_floor [mm/cycle])
    seed : random seed
    j_table : optional finite-element J table (DataFrame with the jtable.csv columns, the
        specimen's shape and width): the plastic part of ΔJ, and so the loops' plastic branch,
        come from its ΔJ instead of the reference stress estimate

    Returns
    -------
    SimulatedTest
    """
    import pandas as pd

    if not (C > 0 and m > 0 and p_max > 0 and 0 <= r_ratio < 1):
        raise ValidityRangeError("need C, m, P_max > 0 and 0 ≤ R < 1")
    if not 0 <= opening_fraction <= 0.8:
        raise ValidityRangeError("opening fraction must lie in [0, 0.8]")
    if samples < 8:
        raise ValidityRangeError("need at least 8 samples a loop")
    rng = np.random.default_rng(seed)
    geo = specimen.geometry
    a0 = specimen.initial_crack
    a_end = crack_end if crack_end is not None else 0.95 * geo.size_limits[1]
    a_grid = np.linspace(a0, a_end, 1500)
    k0 = geo.k_over_s(a0)
    scale = (
        np.exp(k_gradient * (a_grid - a0)) * k0 / geo.k_over_s(a_grid)
        if k_gradient
        else np.ones_like(a_grid)
    )
    pmax_g = p_max * scale
    pmin_g = r_ratio * pmax_g
    pop_g = pmin_g + opening_fraction * (pmax_g - pmin_g)
    dj_g = true_delta_j(specimen, a_grid, pmax_g, pmin_g, pop_g, j_table)
    rate_g = np.where(dj_g > threshold, C * dj_g**m, 0.0)
    stop = np.flatnonzero(rate_g < rate_floor)
    if stop.size:
        if stop[0] < 2:
            raise ValidityRangeError("the crack does not grow at these loads")
        a_grid, rate_g = a_grid[: stop[0]], rate_g[: stop[0]]
        pmax_g, pmin_g, pop_g, dj_g = (x[: stop[0]] for x in (pmax_g, pmin_g, pop_g, dj_g))
    inv = 1.0 / rate_g
    n_grid = start_cycle + np.concatenate(
        [[0.0], np.cumsum(0.5 * (inv[1:] + inv[:-1]) * np.diff(a_grid))]
    )
    n_last = min(n_grid[-1], start_cycle + max_cycles)
    rec = np.arange(start_cycle, n_last + 1, record_every, dtype=float)
    a_rec = np.interp(rec, n_grid, a_grid)
    pmax_r, pmin_r, pop_r, dj_r, rate_r = (
        np.interp(rec, n_grid, g) for g in (pmax_g, pmin_g, pop_g, dj_g, rate_g)
    )
    truth = pd.DataFrame(
        {
            "cycle": rec,
            "a_mm": a_rec,
            "P_max_N": pmax_r,
            "P_min_N": pmin_r,
            "P_open_N": pop_r,
            "dJ_eff_kJm2": dj_r,
            "dadN_mm_per_cycle": rate_r,
        }
    )
    load, disp = _loops(
        specimen,
        a_rec,
        pmax_r,
        pmin_r,
        pop_r,
        samples,
        closed_stiffness,
        noise_load,
        noise_disp,
        rng,
        j_table,
    )
    raw = pd.DataFrame(
        {"cycle": np.repeat(rec, samples).astype(np.int64), "load": load, "displacement": disp}
    )
    crack = pd.DataFrame(
        {
            "cycle": rec.astype(np.int64),
            "crack_length": a_rec + crack_noise * rng.standard_normal(rec.size),
            "load_max": pmax_r,
            "load_min": pmin_r,
        }
    )
    return SimulatedTest(raw, crack, truth)


def _loops(specimen, a, pmax, pmin, pop, samples, kappa, noise_load, noise_disp, rng, j_table):
    """Samples of every loop (concatenated), displacement at the specimen's measuring point."""
    mat = specimen.material
    geo = specimen.geometry
    c_pt, c_ll = point_compliance(specimen, a)
    dp = pmax - pmin
    s_op = pop - pmin
    # plastic branch amplitude D [mm, load line] so that η·A_pl/(B_N·b) equals the plastic
    # part of ΔJ of the full range (A_pl = D·ΔP/(1+n'))
    if mat.cyclic_curve is not None:
        n_p = mat.cyclic_curve.hardening_exponent
        s_per_p = geo.nominal_stress_per_force()
        dj_el = (dp * s_per_p * geo.k_over_s(a)) ** 2 / specimen.e_prime
        jpl = _plastic_full(specimen, a, dp, dj_el, j_table)
        b = specimen.width - a
        eta = _eta_for_sim(specimen, a)
        d_pl = (1 + n_p) * geo.dims["net_thickness"] * b * jpl / (eta * dp)
        p_exp = 1.0 / n_p
    else:
        d_pl = np.zeros_like(a)
        p_exp = 1.0
    t = np.arange(samples) / samples
    phase = 0.5 * (1 - np.cos(2 * np.pi * t))  # 0 → 1 → 0, starting at the minimum
    rising = t <= 0.5
    s = phase[None, :] * dp[:, None]  # load above the minimum
    load = pmin[:, None] + s
    c = c_ll[:, None]
    cc = kappa * c
    sop = s_op[:, None]
    d = d_pl[:, None]
    top_el = cc * sop + c * (dp[:, None] - sop)
    r = dp[:, None] - s  # drop below the maximum
    v_el = np.where(
        rising[None, :],
        cc * np.minimum(s, sop) + c * np.maximum(s - sop, 0),
        top_el
        - (c * np.minimum(r, dp[:, None] - sop) + cc * np.maximum(r - (dp[:, None] - sop), 0)),
    )
    v_pl = np.where(
        rising[None, :], d * (s / dp[:, None]) ** p_exp, d - d * (r / dp[:, None]) ** p_exp
    )
    # at the measuring point: the elastic part by the compliance ratio, the plastic part by the
    # arms' hinge (compliance.ct_plastic_displacement_ratio)
    el_ratio = (c_pt / c_ll)[:, None]
    pl_ratio = 1.0 / _plastic_ratio(specimen, a)[:, None]
    v = (v_el + c * pmin[:, None]) * el_ratio + v_pl * pl_ratio
    v_range = top_el * el_ratio + d * pl_ratio
    load = load + noise_load * dp[:, None] * rng.standard_normal(load.shape)
    v = v + noise_disp * v_range * rng.standard_normal(v.shape)
    return load.ravel(), v.ravel()


def _plastic_ratio(specimen, a):
    """Plastic load-line displacement per unit plastic displacement at the measuring point."""
    from cycj.calibrate.compliance import ct_plastic_displacement_ratio

    if specimen.shape == "compact-tension":
        return ct_plastic_displacement_ratio(a / specimen.width, specimen.compliance_point)
    return np.ones(np.shape(a))


def _eta_for_sim(specimen, a):
    from cycj.calibrate.loops import eta_plastic

    if specimen.shape in ("compact-tension", "three-point-bend"):
        return eta_plastic(specimen.shape, a, specimen.width, "load-line")
    return np.full(np.shape(a), 2.0)


#: maximum loads [N] the tests of a simulated programme cycle through (C(T), W = 50 mm)
PROGRAMME_LOADS = (10000.0, 12000.0, 14000.0, 16000.0)


@dataclass
class SimulatedProgramme:
    """Crack-length logs of a replicate programme: ``crack`` (one long-format DataFrame with
    ``specimen, cycle, crack_length, load_max, load_min``), ``C_specimens`` (each specimen's
    true C), ``C``, ``m`` (the population median C and the exponent) and ``sigma_ln_C``."""

    crack: object
    C_specimens: np.ndarray
    C: float
    m: float
    sigma_ln_C: float


def simulate_programme(
    specimen,
    C,
    m,
    *,
    n_specimens=8,
    sigma_ln_C=0.15,
    p_max=PROGRAMME_LOADS,
    r_ratio=0.1,
    readings=200,
    crack_end=None,
    crack_noise=0.01,
    spacing="crack",
    seed=0,
    paths=None,
):
    """A replicate programme on the virtual test frame: ``n_specimens`` tests of one specimen
    geometry whose C scatters lognormally between specimens (median ``C``, σ_ln ``sigma_ln_C``),
    common ``m``, at constant load amplitude (loads cycled through ``p_max``), each logged as
    ``readings`` crack lengths with Gaussian noise ``crack_noise`` [mm] on a, read at equal
    crack extension (``spacing="crack"``, the E647 way) or equal cycles (``"cycles"``).

    The noise-free a(N) of each load level is integrated once (the frame's ΔJ,
    :func:`true_delta_j`, without closure); a specimen with C_i follows it with the cycles
    scaled by C/C_i (da/dN ∝ C), so a programme of many tests takes milliseconds.

    ``crack_end`` [mm] defaults to half way from the initial crack to the upper validity limit.
    ``paths`` (from :func:`programme_paths` with the same arguments) saves integrating the
    noise-free paths again when many programmes share them.

    Returns
    -------
    SimulatedProgramme
    """
    import pandas as pd

    if n_specimens < 1 or readings < 8:
        raise ValidityRangeError("need at least one specimen and eight readings a test")
    rng = np.random.default_rng(seed)
    loads = np.atleast_1d(np.asarray(p_max, float))
    paths = paths or programme_paths(specimen, C, m, loads, r_ratio, crack_end)
    c_i = C * np.exp(sigma_ln_C * rng.standard_normal(n_specimens))
    frames = []
    for i in range(n_specimens):
        p = float(loads[i % loads.size])
        n_grid, a_grid = paths[p]
        life = n_grid[-1] * C / c_i[i]
        if spacing == "crack":  # readings at equal crack extension (as E647 asks)
            a_read = np.linspace(a_grid[0], a_grid[-1], readings)
            cyc = np.round(np.interp(a_read, a_grid, n_grid) * C / c_i[i])
        else:
            cyc = np.round(np.linspace(0.0, life, readings))
        step = np.arange(readings)
        cyc = np.maximum.accumulate(cyc - step) + step  # strictly increasing counts
        a = np.interp(cyc * c_i[i] / C, n_grid, a_grid)
        frames.append(
            pd.DataFrame(
                {
                    "specimen": f"S{i + 1:03d}",
                    "cycle": cyc.astype(np.int64),
                    "crack_length": a + crack_noise * rng.standard_normal(readings),
                    "load_max": p,
                    "load_min": r_ratio * p,
                }
            )
        )
    return SimulatedProgramme(pd.concat(frames, ignore_index=True), c_i, C, m, sigma_ln_C)


def programme_paths(specimen, C, m, p_max, r_ratio=0.1, crack_end=None):
    """Noise-free (cycles, a) of each load level of :func:`simulate_programme` (a dict)."""
    return {
        float(p): _path(specimen, C, m, float(p), r_ratio, crack_end) for p in np.atleast_1d(p_max)
    }


def _path(specimen, C, m, p_max, r_ratio, crack_end):
    """Noise-free (cycles, a) of a constant-amplitude test without closure (fine grid)."""
    geo = specimen.geometry
    a0 = specimen.initial_crack
    # default: half way from the initial crack to the upper validity limit (a test's usual
    # stretch of stable growth)
    a_end = crack_end if crack_end is not None else a0 + 0.5 * (geo.size_limits[1] - a0)
    a = np.linspace(a0, a_end, 2000)
    pmax = np.full_like(a, p_max)
    dj = true_delta_j(specimen, a, pmax, r_ratio * pmax, r_ratio * pmax)
    inv = 1.0 / (C * dj**m)
    return np.concatenate([[0.0], np.cumsum(0.5 * (inv[1:] + inv[:-1]) * np.diff(a))]), a
