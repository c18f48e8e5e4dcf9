"""numba's math calls go to the C library's current entries (cycj/_jit.py ``_bind_libm``).

On glibc numba binds pow, exp and log to the old compatibility versions its helper library was
linked with (an error-handling wrapper around the same routine); cycj rebinds them so that the
stepper runs at the speed of a C loop of the same arithmetic (bench/bench_stepper.py).  The
values must not change: the same routine computes both (checked here on a few exponents).
"""

import ctypes
import ctypes.util
import math
import sys

import numpy as np
import pytest

from cycj import _jit

pytestmark = pytest.mark.skipif(not sys.platform.startswith("linux"), reason="glibc only")


def test_math_symbols_point_at_the_c_library():
    _jit.numba_module()
    import llvmlite.binding as ll

    libm = ctypes.CDLL(ctypes.util.find_library("m") or "libm.so.6")
    for name in ("pow", "exp", "log", "cos"):
        want = ctypes.cast(getattr(libm, name), ctypes.c_void_p).value
        assert ll.address_of_symbol(name) == want, name


def test_compiled_pow_gives_the_c_library_values():
    numba = _jit.numba_module()

    @numba.njit
    def powers(x, y, out):
        for i in range(x.shape[0]):
            out[i] = x[i] ** y[i]

    rng = np.random.default_rng(3)
    x = rng.uniform(1e-6, 1e3, 2000)
    y = rng.uniform(-3.0, 7.0, 2000)
    out = np.empty_like(x)
    powers(x, y, out)
    # CPython's float ** float calls the same C library's pow
    assert all(o == math.pow(a, b) for o, a, b in zip(out, x, y, strict=True))
