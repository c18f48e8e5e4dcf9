"""The numba-off switch: the physics kernels' tests pass with ``CYCJ_DISABLE_JIT=1``, so the
same source runs as plain Python (for coverage, debugging and mutation runs)."""

import os
import subprocess
import sys
from pathlib import Path

HERE = Path(__file__).parent
FILES = ["test_jintegral.py", "test_growth.py", "test_retardation.py", "test_geometry.py"]


def test_physics_kernels_pass_as_plain_python():
    env = dict(os.environ, CYCJ_DISABLE_JIT="1")
    r = subprocess.run(
        [
            sys.executable,
            "-m",
            "pytest",
            "-q",
            "-p",
            "no:cacheprovider",
            *[str(HERE / f) for f in FILES],
        ],
        env=env,
        cwd=HERE.parents[1],
        capture_output=True,
        text=True,
        timeout=600,
    )
    assert r.returncode == 0, r.stdout[-3000:] + r.stderr[-2000:]
    assert " passed" in r.stdout and "failed" not in r.stdout
