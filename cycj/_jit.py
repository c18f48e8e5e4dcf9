"""One place that decides how cycj's kernels are compiled.

``jit`` is numba's ``njit`` with ``cache=True`` and ``fastmath`` off.  The numba cache lives in a
folder keyed on cycj's version, so an upgrade never runs stale machine code.  Setting the
environment variable ``CYCJ_DISABLE_JIT=1`` runs the same source as plain Python (for coverage
and debugging).
"""

from __future__ import annotations

import os
from pathlib import Path

from cycj._version import __version__


def _cache_dir() -> str:
    base = os.environ.get("CYCJ_CACHE_DIR")
    if base is None:
        xdg = os.environ.get("XDG_CACHE_HOME", str(Path.home() / ".cache"))
        base = str(Path(xdg) / "cycj")
    return str(Path(base) / f"numba-{__version__}")


os.environ.setdefault("NUMBA_CACHE_DIR", _cache_dir())

import numba  # noqa: E402

if numba.config.CACHE_DIR in ("", None):  # numba imported earlier without our setting
    numba.config.CACHE_DIR = _cache_dir()

JIT_DISABLED = os.environ.get("CYCJ_DISABLE_JIT", "") not in ("", "0")


def jit(func=None, **options):
    """Compile ``func`` with numba (nopython, cached), or return it unchanged when disabled."""

    def wrap(f):
        if JIT_DISABLED:
            return f
        opts = {"cache": True, "nogil": True}
        opts.update(options)
        return numba.njit(**opts)(f)

    return wrap if func is None else wrap(func)


def ufunc(func):
    """A numpy ufunc (float64 in, float64 out) made from the same scalar source as the kernel."""
    import numpy as np

    src = getattr(func, "py_func", func)
    if JIT_DISABLED:
        return np.vectorize(src, otypes=[float])
    nargs = src.__code__.co_argcount
    sig = "float64(" + ",".join(["float64"] * nargs) + ")"
    return numba.vectorize([sig], cache=True)(src)
