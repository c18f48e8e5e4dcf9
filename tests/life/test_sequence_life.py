"""Sequence models in the stepper: qualitative behaviour reported by Wheeler (1972) and by
Willenborg, Engle & Wood (1971): an overload delays growth, the delay ends once the crack has
grown through the overload zone, a higher overload ratio gives a longer delay, and without
overloads the models change nothing."""

import numpy as np
import pytest

from cycj.case import case_from_dict
from cycj.errors import CycjInputError
from cycj.life import predict_life
from tests.helpers import case_dict

N_CA = 3000


def _case(tmp_path, overload, sequence, name="h.csv"):
    peaks = np.full(N_CA, 100.0)
    peaks[0] = overload
    values = np.zeros(2 * N_CA + 1)
    values[1::2] = peaks
    path = tmp_path / name
    np.savetxt(path, values, header="load", comments="")
    d = case_dict(
        loading={"history": name, "unit": "MPa", "sequence": sequence},
        material={"growth": {"law": "paris", "C": 1e-3, "m": 1.6}},
        analysis={"j_method": "reference-stress"},
        geometry={"shape": "center-crack-infinite-plate", "crack_length": "2 mm"},
        run={"criteria": ["size-limit"], "crack_length_limit": "5 mm", "method": "cycle"},
    )
    d["loading"].pop("constant")
    return case_from_dict(d, base=tmp_path)


def _first_block_rates(res):
    """Mean growth rates over the first 5 % and the last 10 % of the first block, and the
    crack size at the end of the block."""
    h = res.history
    a = np.interp([0.0, 0.05 * N_CA, 0.9 * N_CA, N_CA], h["cycle"], h["a_mm"])
    return (a[1] - a[0]) / (0.05 * N_CA), (a[3] - a[2]) / (0.1 * N_CA), 0.5 * (a[2] + a[3])


def _rate_at(res, a):
    h = res.history
    return np.interp(a, h["a_mm"], h["dadN_mm_per_cycle"])


@pytest.mark.parametrize("model", ["wheeler", "willenborg"])
def test_no_overload_no_change(tmp_path, model):
    base = predict_life(_case(tmp_path, 100.0, "none")).summary["cycles_to_end"]
    seq = predict_life(_case(tmp_path, 100.0, model)).summary["cycles_to_end"]
    assert seq == pytest.approx(base, rel=1e-3)


# Willenborg's reduction is strong (near arrest at ratio ~2), so its overload is milder here so
# that the crack leaves the overload zone within one block
@pytest.mark.parametrize("model,overload", [("wheeler", 170.0), ("willenborg", 125.0)])
def test_overload_delays_and_delay_ends(tmp_path, model, overload):
    none = predict_life(_case(tmp_path, overload, "none"), history_rows=3000)
    seq = predict_life(_case(tmp_path, overload, model), history_rows=3000)
    assert seq.summary["cycles_to_end"] > 1.01 * none.summary["cycles_to_end"]  # a delay
    e_n, _, _ = _first_block_rates(none)
    e_s, l_s, a_late = _first_block_rates(seq)
    assert e_s < 0.6 * e_n  # retarded right after the overload
    # through the zone: the constant-amplitude rate at the same crack size
    assert l_s == pytest.approx(_rate_at(none, a_late), rel=0.03)


@pytest.mark.parametrize("model", ["wheeler", "willenborg"])
def test_higher_overload_longer_delay(tmp_path, model):
    gains = []
    for ol in (150.0, 190.0):
        n0 = predict_life(_case(tmp_path, ol, "none", f"a{ol}.csv")).summary["cycles_to_end"]
        n1 = predict_life(_case(tmp_path, ol, model, f"b{ol}.csv")).summary["cycles_to_end"]
        gains.append(n1 / n0)
    assert gains[1] > gains[0] > 1.0


def test_sequence_model_refuses_block_mode(tmp_path):
    case = _case(tmp_path, 170.0, "wheeler")
    with pytest.raises(CycjInputError, match="block mode"):
        predict_life(case, method="block")
