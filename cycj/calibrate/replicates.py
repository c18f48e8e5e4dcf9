"""Replicate programmes: many tests in one long-format log or in many logs, with one specimen
file for all tests or one per test.

A long-format log has a ``specimen`` column beside the columns of one of the two layouts of
:mod:`cycj.calibrate.logs` (``specimen, cycle, crack_length, load_max, load_min`` or
``specimen, cycle, load, displacement``); its rows are split by that column, in the order the
specimens first appear, and each part is read as a log of its own named ``file:specimen``.
"""

from __future__ import annotations

from dataclasses import replace
from pathlib import Path

from cycj.errors import CycjInputError

__all__ = ["read_tests"]

#: name of the column that tells the tests of a long-format log apart
SPECIMEN_COLUMN = "specimen"


def _parts(path, sheet=None):
    """(label or None, DataFrame) for each test in one log file."""
    from cycj.calibrate.logs import read_frame

    df = read_frame(path, sheet)
    cols = {str(c).strip().lower(): c for c in df.columns}
    if SPECIMEN_COLUMN not in cols:
        return [(None, df)]
    col = cols[SPECIMEN_COLUMN]
    labels = df[col].astype(str).str.strip()
    if (labels == "").any() or df[col].isna().any():
        bad = int(((labels == "") | df[col].isna()).to_numpy().argmax())
        raise CycjInputError(
            "empty specimen label", source=str(path), line=bad + 2, key=SPECIMEN_COLUMN
        )
    return [(lab, df[labels == lab].drop(columns=col)) for lab in dict.fromkeys(labels)]


def _pair(parts, per_file, specs, paths):
    """The specimen of each test: one for all, one per test (by label when every test's label
    names a specimen file's label, else in order), or one per log file."""
    n = len(parts)
    if len(specs) == 1:
        return [specs[0]] * n
    if len(specs) == n:
        by_label = {s.label: s for s in specs}
        labels = [lab for _, lab, _ in parts]
        if all(lab is not None and lab in by_label for lab in labels):
            return [by_label[lab] for lab in labels]
        return list(specs)
    if len(specs) == len(paths):
        return [specs[i] for i in per_file]
    raise CycjInputError(
        "give one specimen file for all tests, one per test or one per log file",
        key="--specimen",
        expected=f"1, {n} or {len(paths)}" if n != len(paths) else f"1 or {n}",
        found=len(specs),
    )


def read_tests(log_paths, specimen_paths, sheet=None):
    """Read every test of the logs and pair it with its specimen.

    Parameters
    ----------
    log_paths : list of paths, CSV logs (one test each, or long format with ``specimen``)
    specimen_paths : list of paths, specimen TOML files (1, one per test or one per log file)
    sheet : worksheet of .xlsx logs, by name (default: the first sheet)

    Returns
    -------
    list of (log, specimen): :class:`~cycj.calibrate.logs.RawLog` or ``CrackLog`` in N and
    mm and the :class:`~cycj.calibrate.specimen.Specimen` (its label replaced by the test's
    ``specimen`` value when one specimen file serves a long-format log).

    Raises
    ------
    CycjInputError
        unreadable logs or specimen files, a count of specimen files that fits no pairing.
    """
    from cycj.calibrate.logs import frame_log
    from cycj.calibrate.specimen import read_specimen

    if not specimen_paths:
        raise CycjInputError("no specimen file given", key="--specimen")
    specs = [read_specimen(p) for p in specimen_paths]
    parts, per_file = [], []
    for i, p in enumerate(log_paths):
        for lab, df in _parts(p, sheet):
            parts.append((p, lab, df))
            per_file.append(i)
    paired = _pair(parts, per_file, specs, log_paths)
    out = []
    for (p, lab, df), spec in zip(parts, paired, strict=True):
        name = Path(p).name if lab is None else f"{Path(p).name}:{lab}"
        if lab is not None and spec.label != lab:
            spec = replace(spec, label=lab)
        log = frame_log(
            df,
            str(p),
            name,
            spec.load_factor,
            spec.displacement_factor,
            spec.crack_factor,
        )
        out.append((log, spec))
    return out
