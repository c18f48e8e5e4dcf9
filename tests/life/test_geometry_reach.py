"""Surface cracks, the pressurised cylinder and tabulated geometries (issue: geometry reach)."""

import math
from pathlib import Path

import numpy as np
import pytest

from cycj.errors import CycjInputError
from cycj.geometry import make_geometry
from cycj.life import predict_life
from tests.helpers import make_case, read_check_csv

NEWMAN_RAJU_CHECKS = [
    (
        float(r["a_mm"]),
        float(r["c_mm"]),
        float(r["t_mm"]),
        float(r["width_mm"]),
        float(r["deepest"]),
        float(r["surface"]) if r["surface"] else None,
    )
    for r in read_check_csv(Path(__file__).parents[1] / "data" / "newman_raju_1981_checks.csv")
]


def nr(a, c, t, w=1e12, beta=0.0):
    g = make_geometry(
        "surface-crack-plate", a, width=w, thickness=t, half_length=c, bending_ratio=beta
    )
    s = math.sqrt(math.pi * a)
    return g.k_over_s(a) / s, g.k_over_s_surface(a) / s


# Newman & Raju (1981), Eng. Fract. Mech. 15:185 — K/(S√πa) values computed from the published
# equation (docs/references.md R14; coefficients from memory); the rows (a/c = 1, 0.5, 0.2, 0.2
# with c/b = 0.2, and 2) are in tests/data/newman_raju_1981_checks.csv
@pytest.mark.parametrize("a,c,t,w,deep,surf", NEWMAN_RAJU_CHECKS)
def test_newman_raju_values(a, c, t, w, deep, surf):
    d, s = nr(a, c, t, w)
    assert d == pytest.approx(deep, abs=2e-5)
    if surf is not None:
        assert s == pytest.approx(surf, abs=2e-5)


def test_newman_raju_bending_reduces_deepest_point():
    # pure bending (β → ∞ relative to membrane) gives H < 1 at the deepest point (Newman & Raju
    # 1981): adding bending raises K less at φ = 90° than at the surface
    d0, s0 = nr(4.0, 8.0, 10.0)
    d1, s1 = nr(4.0, 8.0, 10.0, beta=1.0)
    assert 1.0 < d1 / d0 < s1 / s0 < 2.0


def test_surface_crack_aspect_ratio_tends_to_stable_band():
    # Under cyclic tension, semi-elliptical surface cracks of different start shapes converge
    # to a/c ≈ 0.7–0.9 (Carpinteri, Int. J. Fatigue 15 (1993) 21; Lin & Smith, Fatigue Fract.
    # Eng. Mater. Struct. 22 (1999) 495; from memory)
    ratios = []
    for c0 in ("1.5 mm", "10 mm"):
        case = make_case(
            geometry={
                "shape": "surface-crack-plate",
                "width": "200 mm",
                "thickness": "20 mm",
                "crack_length": "1.5 mm",
                "half_length": c0,
            },
            loading={"constant": {"max": "150 MPa", "min": "0 MPa"}},
            run={"criteria": ["size-limit"], "crack_length_limit": "100 mm"},
        )
        res = predict_life(case)
        assert res.summary["end_reason"] == "leak"
        h = res.history
        row = h[h.a_mm >= 12.0].iloc[0]  # a/t = 0.6
        ratios.append(row.a_mm / row.c_mm)
    assert all(0.7 <= r <= 0.9 for r in ratios)
    assert abs(ratios[0] - ratios[1]) < 0.15


def test_surface_crack_rejects_block_mode():
    case = make_case(
        geometry={
            "shape": "surface-crack-plate",
            "width": "200 mm",
            "thickness": "20 mm",
            "crack_length": "2 mm",
            "half_length": "4 mm",
        },
        run={"method": "block"},
    )
    with pytest.raises(CycjInputError, match="block mode"):
        predict_life(case)


@pytest.mark.parametrize("lam", [0.5, 1.0, 2.0, 4.0])
def test_folias_factor(lam):
    # Kiefner et al., ASTM STP 536 (1973): M = √(1 + 1.255λ² − 0.0135λ⁴) (from memory); for
    # small λ it approaches Folias's (1965) √(1 + 1.61λ²) within a few per cent
    from cycj.geometry.axial_crack_cylinder import folias_factor

    m = folias_factor(lam)
    assert m == pytest.approx(math.sqrt(1 + 1.255 * lam**2 - 0.0135 * lam**4), rel=1e-12)
    if lam <= 1.0:
        assert m == pytest.approx(math.sqrt(1 + 1.61 * lam**2), rel=0.08)


def test_cylinder_pressure_loading_and_collapse():
    # hoop stress p·R_i/t (equilibrium); flow-stress collapse σ_h = σ_flow/M (Kiefner 1973)
    case = make_case(
        geometry={
            "shape": "axial-crack-cylinder",
            "inner_radius": "400 mm",
            "thickness": "10 mm",
            "crack_length": "20 mm",
        },
        loading={"constant": {"max": "6 MPa", "min": "0.5 MPa"}},
        run={"criteria": ["collapse"], "crack_length_limit": "300 mm"},
    )
    assert case.loading.quantity == "pressure"
    res = predict_life(case)
    assert res.summary["peak_nominal_stress_MPa"] == pytest.approx(6 * 400 / 10)
    a_c = res.summary["critical_crack_length_mm"]
    from cycj.geometry.axial_crack_cylinder import folias_factor

    m = folias_factor(a_c / math.sqrt(405 * 10))
    assert 240.0 == pytest.approx(425.0 / m, rel=1e-4)  # σ_flow = (350 + 500)/2


def _ct_table(tmp_path):
    # the ASTM E399 C(T) solution (Srawley 1976) written as a table: F = f(α)/√(πα) and the
    # EPRI NP-1931 plane-strain limit-load factor 1.455·η·(1 − α)
    alpha = np.linspace(0.2, 0.9, 36)
    f = (
        (2 + alpha)
        * (0.886 + 4.64 * alpha - 13.32 * alpha**2 + 14.72 * alpha**3 - 5.6 * alpha**4)
        / (1 - alpha) ** 1.5
    )
    r = 2 * alpha / (1 - alpha)
    eta = np.sqrt(r**2 + 2 * r + 2) - (r + 1)
    path = tmp_path / "ct.csv"
    np.savetxt(
        path,
        np.column_stack([alpha, f / np.sqrt(np.pi * alpha), 1.455 * eta * (1 - alpha)]),
        delimiter=",",
        header="a_over_W,F,limit_load_factor",
        comments="",
    )
    return path


def test_tabulated_reproduces_compact_tension_life(tmp_path):
    from cycj.case import case_from_dict
    from tests.helpers import case_dict

    path = _ct_table(tmp_path)
    common = {
        "analysis": {"j_method": "reference-stress"},
        "loading": {"constant": {"max": "9 kN", "min": "0.9 kN"}},
        "run": {"criteria": ["size-limit"], "crack_length_limit": "35 mm"},
    }
    geo = {"width": "50 mm", "thickness": "12.5 mm", "crack_length": "12.5 mm"}
    ct = case_from_dict(case_dict(geometry={"shape": "compact-tension", **geo}, **common))
    tab = case_from_dict(
        case_dict(geometry={"shape": "tabulated", "table": path.name, **geo}, **common),
        base=tmp_path,
    )
    n_ct = predict_life(ct).summary["cycles_to_end"]
    n_tab = predict_life(tab).summary["cycles_to_end"]
    assert n_tab == pytest.approx(n_ct, rel=5e-3)


def test_tabulated_outside_range_is_an_error(tmp_path):
    from cycj.case import case_from_dict
    from tests.helpers import case_dict

    path = _ct_table(tmp_path)
    d = case_dict(
        geometry={
            "shape": "tabulated",
            "table": path.name,
            "width": "50 mm",
            "thickness": "12.5 mm",
            "crack_length": "5 mm",
        }
    )
    with pytest.raises(CycjInputError, match="validity"):
        case_from_dict(d, base=tmp_path)


def test_leak_then_through_crack():
    # after break-through, the flaw is re-characterised as a through crack of the same length
    # (BS 7910 §8, from memory): the run goes on and ends later, by collapse or the FAD
    geo = {
        "shape": "surface-crack-plate",
        "width": "200 mm",
        "thickness": "12 mm",
        "crack_length": "3 mm",
        "half_length": "6 mm",
    }
    stop = predict_life(
        make_case(
            geometry=geo,
            loading={"constant": {"max": "180 MPa", "min": "0 MPa"}},
            material={"toughness": {"J_c": "80 kJ/m^2"}},
            run={"criteria": ["fad", "collapse"]},
        )
    )
    go = predict_life(
        make_case(
            geometry=geo,
            loading={"constant": {"max": "180 MPa", "min": "0 MPa"}},
            material={"toughness": {"J_c": "80 kJ/m^2"}},
            run={"criteria": ["fad", "collapse"], "after_leak": "through-crack"},
        )
    )
    assert stop.summary["end_reason"] == "leak"
    assert go.summary["leak_cycles"] == stop.summary["cycles_to_end"]
    assert go.summary["end_reason"] in ("fad", "collapse")
    assert go.summary["cycles_to_end"] > stop.summary["cycles_to_end"]
    h = go.history
    assert np.all(np.diff(h["cycle"]) >= 0) and h["c_mm"].iloc[-1] > h["c_mm"].iloc[0]
