"""One record per model: a closure model added through its record alone is validated, dispatched
by the compiled kernels and cited; unknown names and codes are errors (never a fall-back)."""

import json
import os
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

from cycj import models

ROOT = Path(__file__).parents[2]

EXTENSION = '''
from cycj._jit import jit
from cycj.models import register


@jit
def half_open(r, smax_flow, u_const, alpha):
    """Opening at half the range, whatever the load (a dummy for the test)."""
    return 0.5


register("closure", "half-open-test", 90, validity="test only",
         citation=("Dummy, A., a closure model for tests (2026)",), kernel=half_open)
'''

SCRIPT = """
import json, sys
from cycj.case import case_from_dict
from cycj.life.predict import predict_life
from tests.helpers import case_dict

def life(closure):
    d = case_dict(loading={"closure": closure},
                  material={"growth": {"law": "paris", "C": 1e-4, "m": 1.5,
                                       "basis": "effective"}},
                  run={"method": "block"})
    return predict_life(case_from_dict(d, source="t.toml")).summary

dummy = life("half-open-test")
same = life({"model": "constant", "U": 0.5})
try:
    life("half-open-tset")
    refused = ""
except Exception as exc:
    refused = str(exc)
print(json.dumps({"dummy": dummy["cycles_to_end"], "same": same["cycles_to_end"],
                  "refs": dummy["references"], "refused": refused}))
"""


def test_dummy_closure_model_through_its_record_alone(tmp_path):
    """Validated (its name is accepted; a misspelling is refused with a hint), dispatched (the
    life equals constant U = 0.5, which the dummy's opening at half the range implies) and
    cited (its reference is printed).  Runs with the kernels as plain Python (no compile)."""
    (tmp_path / "dummy_closure_ext.py").write_text(EXTENSION)
    env = dict(
        os.environ,
        CYCJ_EXTENSIONS="dummy_closure_ext",
        CYCJ_DISABLE_JIT="1",
        PYTHONPATH=os.pathsep.join([str(tmp_path), str(ROOT), os.environ.get("PYTHONPATH", "")]),
    )
    r = subprocess.run(
        [sys.executable, "-c", textwrap.dedent(SCRIPT)],
        env=env,
        cwd=ROOT,
        capture_output=True,
        text=True,
        timeout=600,
    )
    assert r.returncode == 0, r.stderr
    out = json.loads(r.stdout.strip().splitlines()[-1])
    assert out["dummy"] == pytest.approx(out["same"], rel=1e-12)
    assert "Dummy, A., a closure model for tests (2026)" in out["refs"]
    assert "half-open-test" in out["refused"] and "did you mean" in out["refused"]


def test_record_names_feed_case_validation():
    from cycj import case, loading_inputs

    assert loading_inputs.CLOSURE_MODELS == models.names("closure")
    assert loading_inputs.SEQUENCE_MODELS == models.names("retardation")
    assert case.CRITERIA == models.names("end_criterion")
    assert set(models.names("j_method")) == {
        "elastic",
        "reference-stress",
        "small-crack",
        "notch",
        "finite-element",
    }


def test_unknown_names_and_codes_are_errors():
    with pytest.raises(ValueError, match="did you mean 'newman'"):
        models.record("closure", "neuman")
    with pytest.raises(ValueError, match="unknown geometry code"):
        models.by_code("geometry", 999)
    with pytest.raises(ValueError, match="already taken"):
        models.register("closure", "another", models.code("closure", "elber"))


def test_unknown_codes_raise_in_the_kernels():
    """The compiled dispatchers refuse an unknown code instead of falling back to a model."""
    from cycj.geometry.dispatch import k_over_s, limit_stress
    from cycj.growth import opening_fraction

    with pytest.raises(ValueError, match="unknown closure"):
        opening_fraction(77, 100.0, 10.0, 0.3, 0.8, 3.0, 0.0)
    p = __import__("numpy").zeros(16)
    with pytest.raises(ValueError, match="unknown geometry code"):
        k_over_s(999, 1.0, p)
    with pytest.raises(ValueError, match="unknown geometry code"):
        limit_stress(999, 1.0, p, 300.0)


def test_every_record_is_complete():
    """Each record has a unique code in its kind and cites a source (size-limit and 'none'
    models are not published methods and cite nothing)."""
    for kind in models.KINDS:
        recs = models.records(kind)
        assert len({r.code for r in recs}) == len(recs)
        for r in recs:
            if r.name not in ("none", "size-limit"):
                assert r.citation, f"{kind} {r.name} cites nothing"
