"""Stress-field, channel and notch keys: bad input is one line and exit status 2."""

from pathlib import Path

import pytest

from tests.helpers import run_cli

EX = Path(__file__).parents[2] / "examples"


def _variant(tmp_path, name, old, new):
    """The example with one edit, in a copy of the examples/ and loadspectra/ layout."""
    text = (EX / name).read_text()
    assert old in text, old
    ex, spectra = tmp_path / "examples", tmp_path / "loadspectra"
    ex.mkdir()
    spectra.mkdir()
    (ex / name).write_text(text.replace(old, new, 1))
    (ex / "pipe_startstop_channels.csv").write_text(
        (EX / "pipe_startstop_channels.csv").read_text()
    )
    (spectra / "crane_duty.csv").write_text(
        (EX.parent / "loadspectra" / "crane_duty.csv").read_text()
    )
    return ex / name


BAD = [
    (
        "welded_joint_residual.toml",
        'stress_profile = { kind = "polynomial", coefficients = [1.0] }',
        'stress_profile = { kind = "cubic", coefficients = [1.0] }',
        "unknown value",
    ),
    (
        "welded_joint_residual.toml",
        'stress_profile = { kind = "polynomial", coefficients = [1.0] }',
        'stress_profile = { kind = "polynomial", coefficients = "1.0" }',
        "list of numbers",
    ),
    ("welded_joint_residual.toml", "relaxation = 1.0 }", "relaxation = 1.5 }", "out of range"),
    (
        "welded_joint_residual.toml",
        "residual_stress = { profile",
        'residual_stress = { uniform = "100 MPa", profile',
        "either uniform",
    ),
    ("pipe_pressure_thermal.toml", 'column = "thermal_bore_MPa"', 'column = "nope"', "nope"),
    ("pipe_pressure_thermal.toml", "secondary = true", "secondary = 3", "true or false"),
    (
        "notched_bar_lcf.toml",
        'notch = { kt = 2.6, depth = "4 mm", root_radius = "1.5 mm" }',
        'notch = { kt = 2.6, root_radius = "1.5 mm" }',
        "missing required key",
    ),
    (
        "notched_bar_lcf.toml",
        'notch = { kt = 2.6, depth = "4 mm", root_radius = "1.5 mm" }',
        "",
        "needs [geometry] notch",
    ),
    (
        "notched_bar_lcf.toml",
        'criteria = ["toughness", "size-limit"]',
        'criteria = ["toughness", "size-limit"]\nafter_leak = "through-crack"',
        "surface crack",
    ),
]


@pytest.mark.parametrize("name,old,new,msg", BAD)
def test_bad_field_input_one_line(tmp_path, capsys, name, old, new, msg):
    path = _variant(tmp_path, name, old, new)
    code, _, err = run_cli(["run", path, "--out", tmp_path / "o", "--no-plots"], capsys)
    lines = [ln for ln in err.splitlines() if ln.strip()]
    assert code == 2, err
    assert len(lines) == 1 and msg in lines[0]
    assert not (tmp_path / "o").exists()


def test_notch_deeper_than_the_k_solution_allows_is_refused():
    # the long crack of j_method "notch" is a + D; SE(T) holds to a/W = 0.9
    from cycj.case import case_from_dict
    from cycj.errors import CycjInputError
    from tests.helpers import case_dict

    d = case_dict(
        geometry={
            "shape": "edge-crack-plate",
            "width": "50 mm",
            "thickness": "10 mm",
            "crack_length": "10 mm",
            "notch": {"kt": 2.0, "depth": "40 mm"},
        },
        analysis={"j_method": "notch"},
        run={"criteria": ["size-limit"], "crack_length_limit": "20 mm"},
    )
    with pytest.raises(CycjInputError, match="notch depth"):
        case_from_dict(d)
