"""Kernels with an ahead-of-time copy of their machine code, so a warm start needs no numba.

Loading a kernel from numba's cache costs about half a second whatever its size (numba
imports and sets up its whole compiler first).  So each kernel is a :class:`Kernel`: a call
from Python whose argument types have an ahead-of-time copy runs that copy (an extension
module built with ``numba.pycc``, loaded in a millisecond, no numba import); any other call
goes to numba's dispatcher as before, and numba, compiling a caller, types a ``Kernel`` as
its dispatcher.

The copies are built by :func:`build` at the end of ``cycj run`` and ``cycj count`` for the
kernels and argument types that command called from Python and did not find (one line on
stderr says so; ``CYCJ_AHEAD=0`` turns building and using them off).  They live in numba's
cache folder, which is keyed on cycj's version and the hash of its sources, in one module a
build, listed in ``ahead.json``.  Both copies are made by the same compiler from the same
source with fastmath off, so they give the same bits (``tests/edges/test_ahead.py``).  Calls
from a thread other than the main one use the dispatcher, which releases the GIL.
"""

from __future__ import annotations

import functools
import json
import os
import threading
from pathlib import Path

import numpy as np

from cycj import _jit

MANIFEST = "ahead.json"
_MAIN_THREAD = threading.main_thread().ident
_KERNELS: list = []  # every Kernel made, in order
_STATE: dict = {}  # "manifest": {kernel id: {type key: [module, name]}}, "modules": {}


def enabled() -> bool:
    """Whether ahead-of-time copies are used and built (``CYCJ_AHEAD`` not 0)."""
    return os.environ.get("CYCJ_AHEAD", "1") not in ("0", "") and not _jit.JIT_DISABLED


def folder() -> Path:
    """Where the copies live: in numba's cache folder (keyed on cycj's version and sources),
    one folder a processor model and feature set, since the copies are built for this host's
    processor (a cache folder shared between machines keeps each machine's own)."""
    return Path(os.environ["NUMBA_CACHE_DIR"]) / f"ahead-{_host_key()}"


@functools.cache
def _host_key() -> str:
    import hashlib

    text = (
        os.uname().machine if hasattr(os, "uname") else os.environ.get("PROCESSOR_IDENTIFIER", "")
    )
    try:
        with open("/proc/cpuinfo", encoding="utf-8", errors="replace") as f:
            for line in f:
                if line.startswith(("model name", "flags", "Features", "CPU part")):
                    text += line
                if line.strip() == "":  # the first processor tells the model
                    break
    except OSError:
        pass
    return hashlib.sha1(text.encode()).hexdigest()[:10]


class Kernel:
    """A compiled kernel: the Python source ``py_func`` with numba options ``options``."""

    _dispatcher = None
    _copies = None  # {type key: compiled function} once looked up
    wanted = False  # called from Python with types that have no copy

    def __init__(self, func, options):
        self.py_func = func
        self.options = options
        for name in ("__module__", "__name__", "__qualname__", "__doc__"):
            setattr(self, name, getattr(func, name, None))
        self.__wrapped__ = func
        _KERNELS.append(self)

    @property
    def dispatcher(self):
        """numba's dispatcher of the kernel (made on first need; imports numba)."""
        if self._dispatcher is None:
            self._dispatcher = _jit.numba_module().njit(**self.options)(self.py_func)
        return self._dispatcher

    @property
    def _numba_type_(self):  # numba types a Kernel met in a kernel's globals as its dispatcher
        return self.dispatcher._numba_type_

    def __call__(self, *args):
        copies = self._copies
        if copies is None:
            copies = self._copies = _copies_of(self)
        if copies and threading.get_ident() == _MAIN_THREAD:
            fn = copies.get(type_key(args))
            if fn is not None:
                return fn(*args)
        if threading.get_ident() == _MAIN_THREAD:
            self.wanted = True
        return self.dispatcher(*args)

    def __getattr__(self, name):  # signatures, overloads, … of the dispatcher
        if name.startswith("__"):
            raise AttributeError(name)
        return getattr(self.dispatcher, name)

    def __repr__(self):
        return f"<cycj kernel {self.__module__}.{self.__qualname__}>"

    def __reduce__(self):  # pickled by name, as a function is
        return _by_name, (self.__module__, self.__qualname__)


def _by_name(module: str, qualname: str):
    import importlib

    obj = importlib.import_module(module)
    for part in qualname.split("."):
        obj = getattr(obj, part)
    return obj


def kernel_id(k: Kernel) -> str | None:
    """Name of a kernel: module and qualified name, and for a closure the values it closes
    over (None when one is not a plain number, flag, text or kernel: no copy then)."""
    f = k.py_func
    parts = [f"{f.__module__}:{f.__qualname__}"]
    for cell in f.__closure__ or ():
        v = cell.cell_contents
        if isinstance(v, Kernel):
            v = kernel_id(v)
            if v is None:
                return None
        elif not isinstance(v, (bool, int, float, str)):
            return None
        parts.append(repr(v))
    return "|".join(parts)


_SCALAR_KEYS = {float: "d", np.float64: "d", int: "q", np.int64: "q", bool: "?", np.bool_: "?"}


def type_key(args) -> str | None:
    """Key of the argument types as numba would type them (None: a type with no copy)."""
    out = []
    for a in args:
        t = type(a)
        if t is np.ndarray:
            fl = a.flags
            layout = "C" if fl.c_contiguous else "F" if fl.f_contiguous else "A"
            out.append(f"{a.dtype.char}{a.ndim}{layout}{'' if fl.writeable else 'r'}")
        else:
            s = _SCALAR_KEYS.get(t)
            if s is None:
                return None
            out.append(s)
    return ",".join(out)


def numba_type_key(argtypes) -> str | None:
    """:func:`type_key` of a numba signature's argument types (None: not exportable)."""
    from numba.core import types

    out = []
    for t in argtypes:
        if isinstance(t, types.Array) and isinstance(
            t.dtype, (types.Float, types.Integer, types.Boolean)
        ):
            if not t.aligned:
                return None
            ch = np.dtype(str(t.dtype)).char
            out.append(f"{ch}{t.ndim}{t.layout}{'' if t.mutable else 'r'}")
        elif t == types.float64:
            out.append("d")
        elif t == types.int64:
            out.append("q")
        elif t == types.boolean:
            out.append("?")
        else:
            return None
    return ",".join(out)


def _manifest() -> dict:
    if "manifest" not in _STATE:
        m = {}
        if enabled():
            try:
                m = json.loads((folder() / MANIFEST).read_text())
            except (OSError, ValueError):
                m = {}
        _STATE["manifest"] = m
        _STATE["modules"] = {}
    return _STATE["manifest"]


def _copies_of(k: Kernel) -> dict:
    """{type key: compiled function} of the ahead-of-time copies of ``k`` (may be empty)."""
    rows = _manifest().get(kernel_id(k) or "", {})
    out = {}
    for key, row in rows.items():
        if row is None:  # its build failed
            continue
        module, name = row
        mod = _load_module(module)
        if mod is not None and hasattr(mod, name):
            out[key] = getattr(mod, name)
    return out


def _load_module(name: str):
    mods = _STATE["modules"]
    if name not in mods:
        import importlib.machinery
        import importlib.util

        mods[name] = None
        for suffix in importlib.machinery.EXTENSION_SUFFIXES:
            path = folder() / f"{name}{suffix}"
            if path.is_file():
                spec = importlib.util.spec_from_file_location(name, path)
                try:
                    mod = importlib.util.module_from_spec(spec)
                    spec.loader.exec_module(mod)
                except ImportError:
                    break
                mods[name] = mod
                break
    return mods[name]


def pending() -> list:
    """(kernel, kernel id, type key, numba signature) of the calls from Python this process
    made that have no ahead-of-time copy yet."""
    if not enabled():
        return []
    have = _manifest()
    out = []
    for k in _KERNELS:
        if not k.wanted or k._dispatcher is None:
            continue
        kid = kernel_id(k)
        if kid is None:
            continue
        for argtypes, cres in list(k._dispatcher.overloads.items()):
            key = numba_type_key(argtypes)
            if key is not None and key not in have.get(kid, {}):
                out.append((k, kid, key, cres.signature))
    return out


def build(todo=None, say=None) -> int:
    """Build an ahead-of-time copy of every call in ``todo`` (default :func:`pending`) and add
    it to the manifest; return how many were built.  ``say`` gets the number to build first.
    A call whose copy fails to build is listed as failed, so it is not tried again until the
    sources change.  Another process building at the same time makes this one skip (a lock
    file, taken over when older than 15 minutes)."""
    import time

    todo = pending() if todo is None else todo
    if not todo:
        return 0
    out = folder()
    out.mkdir(parents=True, exist_ok=True)
    lock = out / "build.lock"
    try:
        if time.time() - lock.stat().st_mtime > 900:
            lock.unlink(missing_ok=True)
    except OSError:
        pass
    try:
        fd = os.open(lock, os.O_CREAT | os.O_EXCL | os.O_WRONLY)
    except FileExistsError:
        return 0
    try:
        if say:
            say(len(todo))
        return _build_locked(todo, out)
    finally:
        os.close(fd)
        lock.unlink(missing_ok=True)


def _build_locked(todo, out: Path) -> int:
    """One extension module a call (numba's typing of one export can disturb the next in the
    same module), the manifest rewritten atomically after each."""
    import logging

    from numba.pycc import CC

    logging.getLogger("numba.pycc").setLevel(logging.ERROR)
    try:
        manifest = json.loads((out / MANIFEST).read_text())
    except (OSError, ValueError):
        manifest = {}
    n_modules = sum(len(rows) for rows in manifest.values())
    built, error = 0, None
    for i, (k, kid, key, sig) in enumerate(todo):
        name = f"cycj_ahead_{n_modules + i}"
        try:
            cc = CC(name)
            cc.output_dir = str(out)
            cc.target_cpu = "host"
            cc.verbose = False
            cc.export("kernel", sig)(k.py_func)
            cc.compile()
            manifest.setdefault(kid, {})[key] = [name, "kernel"]
            built += 1
        except Exception as exc:  # no compiler, or a kernel pycc cannot take: numba serves it
            manifest.setdefault(kid, {})[key] = None
            error = error or exc
        tmp = out / f"{MANIFEST}.{os.getpid()}.tmp"
        tmp.write_text(json.dumps(manifest, indent=1, sort_keys=True))
        os.replace(tmp, out / MANIFEST)
    _STATE.clear()
    if error is not None and not built:
        raise error
    return built


def save_after_command() -> None:
    """Ask :func:`save_if_asked` (called by the command line when a command succeeds) to
    build the copies this command's calls lacked: ``cycj run`` and ``cycj count`` do."""
    _STATE["save"] = True


def save_if_asked(echo) -> int:
    """Build the pending copies if the command asked for it; ``echo`` prints one line."""
    if not _STATE.pop("save", False) or not enabled():
        return 0

    def say(n):
        echo(
            f"cycj: saving a start-up copy of {n} kernel{'s' if n > 1 else ''} so that warm "
            f"runs need no compiler (once after an install or an edit, a few seconds each; "
            f"CYCJ_AHEAD=0 turns this off)"
        )

    try:
        return build(say=say)
    except Exception as exc:  # a missing C compiler only loses the faster start
        echo(f"cycj: no start-up copy saved ({type(exc).__name__}: {exc}); runs stay correct")
        return 0
