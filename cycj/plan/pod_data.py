"""Reading POD data files (CSV) and fitting them; errors are one line naming file and line.

Format: a CSV with a header; ``a_mm`` (or ``a``) and either ``hit`` (0/1, hit/miss) or
``ahat`` (signal response).  Lines starting with ``#`` are comments; ``# key = value`` lines
set ``link``, ``decision``, ``floor``, ``saturation`` (command-line options win).
"""

from __future__ import annotations

import csv
import math
from pathlib import Path

from cycj.errors import CycjInputError

META_KEYS = ("link", "decision", "floor", "saturation")


def read_pod_data(path):
    """(kind, a, y, meta): kind ``"hit-miss"`` or ``"signal-response"``."""
    import numpy as np

    path = Path(path)
    if not path.is_file():
        raise CycjInputError("file not found", source=str(path))
    from cycj.inputs_read import note_input

    note_input(path, "pod_data")
    from cycj.spectrum.reading import _split, sniff_delimiter

    try:
        lines = path.read_text(encoding="utf-8-sig").splitlines()
        sep = sniff_delimiter(path)  # , ; tab | or whitespace, as histories
    except UnicodeDecodeError:
        raise CycjInputError("not a UTF-8 text file", source=str(path)) from None
    meta, rows, header, hline = {}, [], None, 0
    for ln, line in enumerate(lines, 1):
        s = line.strip()
        if not s:
            continue
        if s.startswith("#"):
            body = s.lstrip("#").strip()
            if "=" in body:
                k, v = (x.strip() for x in body.split("=", 1))
                if k in META_KEYS:
                    meta[k] = v.strip("\"'")
            continue
        cells = next(csv.reader([s])) if sep == "," else _split(s, sep)
        if header is None:
            header, hline = [c.strip() for c in cells], ln
            continue
        rows.append((ln, cells))
    if header is None:
        raise CycjInputError("no header line", source=str(path))
    size_col = next((c for c in ("a_mm", "a") if c in header), None)
    kind_col = next((c for c in ("hit", "ahat") if c in header), None)
    if size_col is None or kind_col is None:
        raise CycjInputError(
            "needs columns a_mm and hit (hit/miss) or a_mm and ahat",
            source=str(path),
            line=hline,
            found=",".join(header),
        )
    ia, iy = header.index(size_col), header.index(kind_col)
    a, y = [], []
    for ln, cells in rows:
        try:
            av, yv = float(cells[ia]), float(cells[iy])
        except (ValueError, IndexError):
            raise CycjInputError(
                "not a number", source=str(path), line=ln, found=",".join(cells)
            ) from None
        if not (math.isfinite(av) and av > 0):
            raise CycjInputError(
                "crack size must be > 0", source=str(path), line=ln, found=cells[ia]
            )
        if kind_col == "hit" and yv not in (0.0, 1.0):
            raise CycjInputError("hit must be 0 or 1", source=str(path), line=ln, found=cells[iy])
        if kind_col == "ahat" and not yv > 0:
            raise CycjInputError("ahat must be > 0", source=str(path), line=ln, found=cells[iy])
        a.append(av)
        y.append(yv)
    kind = "hit-miss" if kind_col == "hit" else "signal-response"
    return kind, np.array(a), np.array(y), meta


def fit_file(path, *, link=None, decision=None, floor=None, saturation=None):
    """Read and fit a POD data file; returns (PodFit, a, y)."""
    import numpy as np

    from cycj.plan.pod_fit import fit_hit_miss, fit_signal_response

    kind, a, y, meta = read_pod_data(path)

    def num(key, given):
        if given is not None:
            return given
        if key not in meta:
            return None
        try:
            return float(meta[key])
        except ValueError:
            raise CycjInputError(
                "not a number", source=str(path), key=key, found=meta[key]
            ) from None

    try:
        if kind == "hit-miss":
            lk = link or meta.get("link", "logit")
            if lk not in ("logit", "probit"):
                raise CycjInputError(
                    "unknown link",
                    source=str(path),
                    key="link",
                    expected="'logit' or 'probit'",
                    found=lk,
                )
            return fit_hit_miss(a, y, lk), a, y
        dec = num("decision", decision)
        if dec is None:
            raise CycjInputError(
                "signal-response data need a decision threshold",
                source=str(path),
                key="decision",
                expected="--decision X or a '# decision = X' line",
            )
        return (
            fit_signal_response(a, y, dec, num("floor", floor), num("saturation", saturation)),
            a,
            y,
        )
    except (ValueError, ArithmeticError, np.linalg.LinAlgError) as exc:
        if isinstance(exc, CycjInputError):
            raise
        raise CycjInputError(f"cannot fit: {exc}", source=str(path)) from None
