"""One place that decides how cycj's kernels are compiled.

``jit`` is numba's ``njit`` with ``cache=True`` and ``fastmath`` off.  The numba cache lives in a
folder keyed on cycj's version and a hash of its sources, so an upgrade (or an edit) never runs
stale machine code.  Setting the
environment variable ``CYCJ_DISABLE_JIT=1`` runs the same source as plain Python (for coverage
and debugging).
"""

from __future__ import annotations

import os
from pathlib import Path

from cycj._version import __version__


def _source_key() -> str:
    """Hash of the compiled modules' sources: numba's own cache check looks only at the file
    of the cached function, not at the kernels it calls from other modules."""
    import hashlib

    h = hashlib.sha1()
    root = Path(__file__).resolve().parent
    for path in sorted(root.rglob("*.py")):
        h.update(path.read_bytes())
    h.update(_extension_sources())
    return h.hexdigest()[:12]


def _extension_sources() -> bytes:
    """Names and sources of the extension modules in ``CYCJ_EXTENSIONS`` (found, not
    imported): their models are compiled into the kernels, so they key the cache too."""
    import importlib.util

    from cycj.models import extension_modules

    names = extension_modules()
    out = ",".join(names).encode()
    for name in names:
        try:
            spec = importlib.util.find_spec(name)
        except (ImportError, ValueError):
            spec = None
        if spec is not None and spec.origin and Path(spec.origin).is_file():
            out += Path(spec.origin).read_bytes()
    return out


def _cache_dir() -> str:
    base = os.environ.get("CYCJ_CACHE_DIR")
    if base is None:
        xdg = os.environ.get("XDG_CACHE_HOME", str(Path.home() / ".cache"))
        base = str(Path(xdg) / "cycj")
    return str(Path(base) / f"numba-{__version__}-{_source_key()}")


os.environ.setdefault("NUMBA_CACHE_DIR", _cache_dir())

JIT_DISABLED = os.environ.get("CYCJ_DISABLE_JIT", "") not in ("", "0")

_NUMBA = []  # numba, once imported: a warm run served by the ahead-of-time copy never imports it


def numba_module():
    """numba, imported on first need (with cycj's cache folder and the compile notice)."""
    if not _NUMBA:
        import numba

        if numba.config.CACHE_DIR in ("", None):  # numba imported earlier without our setting
            numba.config.CACHE_DIR = _cache_dir()
        if os.environ.get("CYCJ_COMPILE_NOTICE", "") not in ("", "0"):
            _compile_notice(numba)
        _bind_libm()
        _NUMBA.append(numba)
    return _NUMBA[0]


def _bind_libm() -> None:
    """Point the math functions of numba's machine code (pow, exp, log, cos, …) at the C
    library's own current entries.

    numba binds them to the addresses its helper library was linked with; on glibc those are
    the old compatibility versions of pow, exp and log (an error-handling wrapper around the
    same routine, reached through a PLT jump), which cost about 10 % of the stepper's time
    against a C program of the same arithmetic, linked against the current versions
    (bench/bench_stepper.py).  The results are the same: one routine computes both.  Done once
    numba has installed its own bindings (its CPU target is set up first), before any kernel
    is compiled or loaded from the cache; elsewhere than glibc nothing changes.
    """
    import ctypes
    import ctypes.util
    import sys

    if not sys.platform.startswith("linux"):
        return
    try:
        libm = ctypes.CDLL(ctypes.util.find_library("m") or "libm.so.6")
    except OSError:
        return
    import llvmlite.binding as ll
    from numba.core import intrinsics
    from numba.core.registry import cpu_target

    cpu_target.target_context  # noqa: B018 - sets up the target: numba's bindings come first
    for name in sorted(intrinsics.INTR_MATH):
        fn = getattr(libm, name, None)
        if fn is not None:
            ll.add_symbol(name, ctypes.cast(fn, ctypes.c_void_p).value)


def _compile_notice(numba) -> None:
    """One line on stderr the first time a kernel is really compiled (a cache miss; loading
    from the cache says nothing).  On when ``CYCJ_COMPILE_NOTICE`` is set (the command line
    sets it)."""
    import sys

    from numba.core import event

    class _Once(event.Listener):
        said = False

        def on_start(self, ev):
            if not _Once.said:
                _Once.said = True
                print(
                    "cycj: compiling the numerical kernels (first run after an install or an "
                    f"edit, about a minute; cached in {numba.config.CACHE_DIR})",
                    file=sys.stderr,
                    flush=True,
                )

        def on_end(self, ev):
            pass

    event.register("numba:compile", _Once())


def jit(func=None, **options):
    """Compile ``func`` with numba (nopython, cached), or return it unchanged when disabled.

    The result is a :class:`cycj._ahead.Kernel`: called from Python it runs the ahead-of-time
    copy of its machine code when one was built for the arguments' types (no numba import),
    else numba's dispatcher (compiled, or loaded from numba's cache, on first use); called
    from another kernel numba sees it as that dispatcher."""

    def wrap(f):
        if JIT_DISABLED:
            return f
        from cycj._ahead import Kernel

        opts = {"cache": True, "nogil": True, "error_model": "numpy"}
        opts.update(options)
        return Kernel(f, opts)

    return wrap if func is None else wrap(func)


class _LazyUfunc:
    """An element-wise function of float64 arrays (numpy broadcasting, float64 out) made from
    the scalar source of a kernel: one compiled loop over the broadcast inputs, so it has a
    start-up copy like any kernel (a numba ufunc would need numba at every start)."""

    def __init__(self, func):
        self.src = getattr(func, "py_func", func)
        self.kernel = func if hasattr(func, "py_func") else None
        self.built = None

    def __call__(self, *args):
        import numpy as np

        if self.built is None:
            if JIT_DISABLED:
                self.built = np.vectorize(self.src, otypes=[float])
            else:
                self.built = _elementwise(self.kernel or jit(self.src), len(args))
        if JIT_DISABLED:
            return self.built(*args)
        arrays = np.broadcast_arrays(*(np.asarray(a, dtype=np.float64) for a in args))
        shape = arrays[0].shape
        x = np.ascontiguousarray(np.stack([a.ravel() for a in arrays]))
        out = np.empty(x.shape[1])
        self.built(x, out)
        return out.reshape(shape) if shape else out[0]


def _elementwise(fn, nargs):
    """A kernel ``loop(x, out)``: out[i] = fn(x[0, i], …, x[nargs − 1, i]) (1 ≤ nargs ≤ 6)."""
    if nargs == 1:

        def loop(x, out):
            for i in range(out.size):
                out[i] = fn(x[0, i])
    elif nargs == 2:

        def loop(x, out):
            for i in range(out.size):
                out[i] = fn(x[0, i], x[1, i])
    elif nargs == 3:

        def loop(x, out):
            for i in range(out.size):
                out[i] = fn(x[0, i], x[1, i], x[2, i])
    elif nargs == 4:

        def loop(x, out):
            for i in range(out.size):
                out[i] = fn(x[0, i], x[1, i], x[2, i], x[3, i])
    elif nargs == 5:

        def loop(x, out):
            for i in range(out.size):
                out[i] = fn(x[0, i], x[1, i], x[2, i], x[3, i], x[4, i])
    elif nargs == 6:

        def loop(x, out):
            for i in range(out.size):
                out[i] = fn(x[0, i], x[1, i], x[2, i], x[3, i], x[4, i], x[5, i])
    else:
        raise ValueError(f"an element-wise kernel takes 1 to 6 inputs, not {nargs}")
    return jit(loop)


def ufunc(func):
    """An element-wise function (float64 in, float64 out, numpy broadcasting) made from the same
    scalar source as the kernel; compiled (or loaded from the cache) on first use."""
    return _LazyUfunc(func)
