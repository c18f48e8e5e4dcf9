"""Start-up copies of the kernels (cycj._ahead): the same bits as numba's, no numba import.

A probe module of small kernels (a loop with powers, a closure made by a factory, a call to
one of cycj's kernels from inside a kernel, an error raised in a kernel) is run three times in
fresh interpreters sharing one cache folder: with numba (and the copies built after), then
from the copies.  The copies must give the same bits and the same error, and the second
interpreter must never import numba.
"""

from __future__ import annotations

import json
import os
import shutil
import subprocess
import sys
import textwrap

import numpy as np
import pytest

from cycj import _ahead
from cycj._jit import JIT_DISABLED

pytestmark = pytest.mark.skipif(JIT_DISABLED, reason="needs numba")

PROBE = """
import numpy as np
from cycj._jit import jit
from cycj.growth import elber_u  # a cycj kernel (inlined), called from a kernel below


@jit
def walk(x, p, n):
    s = 0.0
    out = np.empty(n)
    for i in range(n):
        s += abs(x[i % x.size]) ** p + elber_u(x[i % x.size])
        out[i] = s
    return s, out


def scaled(factor, shift):
    @jit
    def k(x):
        return x * factor + shift
    return k


@jit
def refuse(x):
    if x < 0.0:
        raise ValueError("negative input to the probe")
    return x ** 0.5
"""

RUN = """
import json, sys
import numpy as np
import probe
x = np.random.default_rng(3).normal(size=257)
s, out = probe.walk(x, 2.7, 1000)
k2, k3 = probe.scaled(2.0, 1), probe.scaled(3.0, 1)
y2, y3 = k2(x), k3(x)
try:
    probe.refuse(-1.0)
    err = None
except ValueError as exc:
    err = str(exc)
built = 0
if sys.argv[1] == "build":
    from cycj import _ahead
    built = _ahead.build()
print(json.dumps({
    "s": s.hex(), "out": out.tobytes().hex(), "y2": y2.tobytes().hex(),
    "y3": y3.tobytes().hex(), "err": err, "built": built,
    "numba": "numba" in sys.modules,
}))
"""


def _probe_run(tmp_path, mode):
    env = {
        **os.environ,
        "PYTHONPATH": os.pathsep.join([str(tmp_path), *sys.path]),
        "CYCJ_CACHE_DIR": str(tmp_path / "cache"),
        "CYCJ_AHEAD": "1",
    }
    env.pop("NUMBA_CACHE_DIR", None)
    res = subprocess.run(
        [sys.executable, "-c", RUN, mode], env=env, capture_output=True, text=True, check=False
    )
    assert res.returncode == 0, res.stderr[-3000:]
    return json.loads(res.stdout.splitlines()[-1])


@pytest.mark.skipif(
    not (shutil.which("cc") or shutil.which("gcc")),
    reason="no C compiler: the start-up copies cannot be built here (runs stay on numba)",
)
def test_copies_give_the_same_bits_without_numba(tmp_path):
    (tmp_path / "probe.py").write_text(textwrap.dedent(PROBE))
    first = _probe_run(tmp_path, "build")
    assert first["numba"] and first["built"] == 4  # walk, two closures, refuse
    warm = _probe_run(tmp_path, "warm")
    assert not warm["numba"], "a warm run from the copies imported numba"
    for key in ("s", "out", "y2", "y3", "err"):
        assert warm[key] == first[key], key
    assert first["err"] == "negative input to the probe"
    assert first["y2"] != first["y3"]  # the two closures are two copies


def test_type_keys_agree_with_numba():
    """The key of a call's arguments equals the key of numba's typing of them, for the
    layouts, element types, read-only arrays and scalars the kernels take."""
    import numba

    base = np.arange(24.0).reshape(2, 3, 4)
    ro = np.ones(5)
    ro.setflags(write=False)
    cases = [
        np.ones(3),
        np.ones((3, 2)),
        np.asfortranarray(np.ones((3, 2))),
        base[:, ::2, :],
        base.astype(np.int64),
        np.zeros(4, dtype=bool),
        ro,
        np.ones(3)[::2],
        1.5,
        np.float64(2.0),
        7,
        np.int64(3),
        True,
    ]
    for x in cases:
        want = _ahead.numba_type_key((numba.typeof(x),))
        assert _ahead.type_key((x,)) == want, (x, want)
    assert _ahead.type_key(("text",)) is None
    assert _ahead.type_key((np.float32(1.0),)) is None  # no copy: numba's dispatcher


def test_kernel_id_names_the_closure_values():
    from cycj._jit import jit

    def factory(flag, code):
        @jit
        def k(x):
            return x + code if flag else x

        return k

    a, b = factory(True, 2), factory(False, 2)
    assert _ahead.kernel_id(a) != _ahead.kernel_id(b)
    assert set(_ahead.kernel_id(a).split("|")[1:]) == {"True", "2"}

    arr = np.ones(2)

    @jit
    def closes_over_array(x):
        return x + arr[0]

    assert _ahead.kernel_id(closes_over_array) is None  # no copy for it


def test_a_kernel_pickles_by_name():
    import pickle

    from cycj.growth import elber_u

    assert pickle.loads(pickle.dumps(elber_u)) is elber_u
