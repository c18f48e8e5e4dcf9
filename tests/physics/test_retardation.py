"""Retardation models against published check values."""

import pytest

from cycj.retardation import plastic_zone_size, wheeler, willenborg_effective_range


def test_wheeler_kłysz_check():
    # Wheeler (1972) as written in Kłysz, JTAM 39(4) (2001) Eq. (1.1) (docs/references.md R17,
    # confirmed): r_i = 0.2, a_OL = 10, r_OL = 1, a_i = 10.3 mm, m = 1.5 → C_p = 0.15272
    assert wheeler(0.2, 10.3, 10.0, 1.0, 1.5) == pytest.approx(0.15272, abs=1e-5)
    assert wheeler(0.2, 10.9, 10.0, 1.0, 1.5) == 1.0  # current zone past the boundary


def test_willenborg_check_value():
    # Willenborg, Engle & Wood (1971), docs/references.md R17 (from memory): K_OL = 30, K_max = 15,
    # K_min = 1.5 MPa√m, Δa/z_OL = 0.25 → ΔK_eff = 4.019 MPa√m; z_OL = 1.169 mm at 350 MPa
    z = plastic_zone_size(30.0 * 31.6228, 350.0, 2.0)
    assert z == pytest.approx(1.169, abs=1e-3)
    dk = willenborg_effective_range(30.0, 0.0, 1.0, 0.25, 15.0, 1.5)
    assert dk == pytest.approx(4.019, abs=1e-3)
