"""A user geometry from a table of a/W, F and the limit-load factor (e.g. from finite element
runs): K = S·√(πa)·F(a/W) with S = P/(B·W), P_L = factor(a/W)·σ_y·W·B, so the limit nominal
stress is S_L = factor·σ_y.

The table is interpolated with a monotone cubic (PCHIP, Fritsch & Carlson 1980), resampled once
onto a dense uniform grid stored in the kernel's parameter array (after the standard slots:
α_min, α_max, n, F[0..n), factor[0..n)) and read by linear interpolation in the kernel.  Valid
only inside the table's range.

References
----------
.. [1] Fritsch, F. N., Carlson, R. E., "Monotone piecewise cubic interpolation", SIAM J. Numer.
   Anal. 17 (1980) 238–246.
"""

import math
from pathlib import Path

import numpy as np

from cycj._jit import jit
from cycj.geometry._params import N_PARAMS

CODE = 9
HEADER = N_PARAMS  # standard slots before the table
DENSE = 2048  # resampled points


@jit
def _lookup(alpha, p, which):
    lo = p[HEADER]
    hi = p[HEADER + 1]
    n = int(p[HEADER + 2])
    x = (alpha - lo) / (hi - lo) * (n - 1)
    if x <= 0.0:
        i = 0
        f = 0.0
    elif x >= n - 1:
        i = n - 2
        f = 1.0
    else:
        i = int(x)
        f = x - i
    base = HEADER + 3 + which * n
    return p[base + i] * (1.0 - f) + p[base + i + 1] * f


@jit
def k_over_s(a, p):
    """K/S [√mm] = √(πa)·F(a/W)."""
    return math.sqrt(math.pi * a) * _lookup(a / p[0], p, 0)


@jit
def limit_stress(a, p, sigma_y):
    """S_L = factor(a/W)·σ_y [MPa]."""
    return _lookup(a / p[0], p, 1) * sigma_y


def size_limits(p):
    return p[HEADER] * p[0], p[HEADER + 1] * p[0]


def table_params(alpha, f, factor):
    """Dense, PCHIP-resampled table appended to the standard parameter slots."""
    from scipy.interpolate import PchipInterpolator

    grid = np.linspace(alpha[0], alpha[-1], DENSE)
    out = np.empty(3 + 2 * DENSE)
    out[0], out[1], out[2] = alpha[0], alpha[-1], DENSE
    out[3 : 3 + DENSE] = PchipInterpolator(alpha, f)(grid)
    out[3 + DENSE :] = PchipInterpolator(alpha, factor)(grid)
    return out


def _data_lines(path) -> list[int]:
    """Line numbers (1-based) of the data rows of the table: lines with text before any '#',
    after the header."""
    try:
        text = Path(path).read_text(encoding="utf-8", errors="replace")
    except OSError:
        return []
    return [n for n, ln in enumerate(text.splitlines(), 1) if ln.split("#", 1)[0].strip()][1:]


#: largest F or limit-load factor of a table (far beyond any geometry's; larger values
#: overflow the resampling)
MAX_FACTOR = 1.0e6


def read_table(path, source=None, key="geometry.table"):
    """Read the CSV ``a_over_W, F, limit_load_factor``; errors name the file and line."""
    import pandas as pd

    from cycj.errors import CycjInputError

    try:
        df = pd.read_csv(path, comment="#")
    except (OSError, ValueError, pd.errors.ParserError) as exc:
        raise CycjInputError(f"cannot read the table ({exc})", source=str(path)) from None
    need = ["a_over_W", "F", "limit_load_factor"]
    missing = [c for c in need if c not in df.columns]
    if missing:
        raise CycjInputError(
            "missing columns", source=str(path), expected=", ".join(need), found=list(df.columns)
        )
    try:
        arr = df[need].to_numpy(dtype=float)
    except (ValueError, OverflowError):  # text, or an integer beyond the float range
        raise CycjInputError(
            "a value is not a number",
            source=str(path),
            expected="numbers in a_over_W, F, limit_load_factor",
        ) from None
    rows = _data_lines(path)
    for i, row in enumerate(arr):
        if not np.all(np.isfinite(row)) or row[1] <= 0 or row[2] <= 0 or not 0 < row[0] < 1:
            raise CycjInputError(
                "bad row",
                source=str(path),
                line=rows[i] if i < len(rows) else None,
                expected="0 < a_over_W < 1, F > 0, limit_load_factor > 0",
                found=[float(x) for x in row],
            )
        if row[1] > MAX_FACTOR or row[2] > MAX_FACTOR:  # beyond any geometry; overflows
            raise CycjInputError(
                "implausible factor",
                source=str(path),
                line=rows[i] if i < len(rows) else None,
                expected=f"F and limit_load_factor at most {MAX_FACTOR:g}",
                found=[float(x) for x in row],
            )
    if arr.shape[0] < 3 or np.any(np.diff(arr[:, 0]) <= 0):
        raise CycjInputError("a_over_W must increase, with at least 3 rows", source=str(path))
    return arr[:, 0], arr[:, 1], arr[:, 2]
