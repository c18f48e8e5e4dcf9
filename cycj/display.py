"""Numbers, units and plot axes as an engineer reads them: one formatter for every report,
answer sentence and plot of cycj.

* :func:`num` — significant figures, thousands separators, ``× 10ⁿ`` beyond a million or
  below a thousandth (never ``1.006e+05``); :func:`text` — any value a report shows, with no
  programming-language literal (``yes``/``no`` for booleans, ``—`` for a missing value);
* :class:`OutputUnits` — the quantities of reports and plots in SI (N, mm, MPa, MPa√m, kJ/m²)
  or US customary units (lbf, in, ksi, ksi√in, in·lbf/in²); files keep SI columns named with
  their units.  The system in force is set with :func:`using` (a context variable) and read
  with :func:`units`;
* :func:`log_axis`, :func:`plain_axis` — log axes labelled at decades only (or at a few plain
  values when the data span less than a decade), linear axes without an offset.

Conversion factors come from pint's definitions (1 in = 25.4 mm, 1 lbf = 4.4482216152605 N,
exact by NIST SP 811 (2008), Appendix B); ``tests/edges/test_display.py`` checks them against
those exact numbers.
"""

from __future__ import annotations

import contextlib
import math
from contextvars import ContextVar
from dataclasses import dataclass
from functools import cache

_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")
#: shown for a value that does not exist (not computed, not applicable)
MISSING = "—"
#: "×" between a mantissa and its power of ten, with no-break spaces (never split in a table)
TIMES = "\u00a0×\u00a0"
#: hours in a year (365.25 days) for lives shown in years
HOURS_PER_YEAR = 8766.0


def _finite(x) -> bool:
    try:
        return math.isfinite(float(x))
    except (TypeError, ValueError):
        return False


def power_of_ten(n: int) -> str:
    """``10⁵`` (``10⁻³``) for the integer exponent ``n``."""
    return "10" + str(int(n)).translate(_SUPERSCRIPT)


def num(x, sig: int = 4) -> str:
    """``x`` to ``sig`` significant figures: ``100,600``, ``12.35``, ``0.0123``,
    ``4.123 × 10⁶``, ``2.5 × 10⁻⁵``; ``—`` for None, ``∞`` for an infinity, ``not a number``
    never (a NaN is shown as ``—``).  Integers below a million keep every digit."""
    if x is None or isinstance(x, bool):
        return MISSING if x is None else ("yes" if x else "no")
    try:
        v = float(x)
    except (TypeError, ValueError):
        return str(x)
    if math.isnan(v):
        return MISSING
    if math.isinf(v):
        return "∞" if v > 0 else "−∞"
    if v == 0.0:
        return "0"
    sign = "−" if v < 0 else ""
    v = abs(v)
    rounded = float(f"{v:.{sig - 1}e}")
    exp = math.floor(math.log10(rounded))
    if 1e-3 <= rounded < 1e6:
        if float(x) == int(float(x)) and rounded == v:
            return sign + f"{int(v):,}"
        decimals = max(0, sig - 1 - exp)
        s = f"{rounded:,.{decimals}f}"
        if "." in s:
            s = s.rstrip("0").rstrip(".")
        return sign + s
    mant = rounded / 10.0**exp
    m = f"{mant:.{sig - 1}f}".rstrip("0").rstrip(".")
    return f"{sign}{m}{TIMES}{power_of_ten(exp)}"


def count(x) -> str:
    """A whole number of things (cycles, samples): every digit below a million."""
    if not _finite(x):
        return num(x)
    v = float(x)
    return num(v, 4) if abs(v) >= 1e6 or v != round(v) else f"{int(round(v)):,}"


def hours(h, sig: int = 4) -> str:
    """``1,234 h``, and years beside hours from one year on: ``412,300 h (47.06 years)``."""
    if not _finite(h):
        return MISSING
    s = f"{num(h, sig)} h"
    if abs(float(h)) >= HOURS_PER_YEAR:
        s += f" ({num(float(h) / HOURS_PER_YEAR, 3)} years)"
    return s


def text(value, sig: int = 4) -> str:
    """Any value a report shows, as words and numbers: booleans ``yes``/``no``, None and NaN
    ``—``, numbers by :func:`num`, lists joined by commas, dicts as ``key = value; …``."""
    import numpy as np

    if isinstance(value, np.generic):
        value = value.item()
    if value is None or isinstance(value, bool):
        return num(value)
    if isinstance(value, int):
        return count(value)
    if isinstance(value, float):
        return num(value, sig)
    if isinstance(value, dict):
        return "; ".join(f"{k} = {text(v, sig)}" for k, v in value.items()) or MISSING
    if isinstance(value, (list, tuple, np.ndarray)):
        return ", ".join(text(v, sig) for v in value) or MISSING
    s = str(value)
    return s if s.strip() else MISSING


def frame_text(frame, sig: int = 4):
    """A copy of a DataFrame with every cell as :func:`text` (for the report's tables)."""
    out = frame.copy().astype(object)
    for col in out.columns:
        out[col] = [text(v, sig) for v in frame[col]]
    return out


# ------------------------------------------------------------------------------- units
@cache
def _factor(si: str, us: str) -> float:
    """How many ``us`` units one ``si`` unit is (pint)."""
    from cycj.units import registry

    return float(registry().Quantity(1.0, si).to(us).magnitude)


#: kind → (SI unit shown, pint spelling of it, US unit shown, pint spelling)
KINDS = {
    "length": ("mm", "millimeter", "in", "inch"),
    "stress": ("MPa", "megapascal", "ksi", "kip / inch ** 2"),
    "stress_intensity": (
        "MPa√m",
        "megapascal * meter ** 0.5",
        "ksi√in",
        "kip / inch ** 2 * inch ** 0.5",
    ),
    "energy_per_area": ("kJ/m²", "kilojoule / meter ** 2", "in·lbf/in²", "inch * lbf / inch ** 2"),
    "force": ("N", "newton", "lbf", "lbf"),
    "rate": ("mm/cycle", "millimeter", "in/cycle", "inch"),
}


@dataclass(frozen=True)
class OutputUnits:
    """The unit system of reports and plots: ``"SI"`` or ``"US"``.

    Values are given in cycj's SI display units (mm, MPa, MPa√m, kJ/m², N, mm/cycle);
    :meth:`value` converts, :meth:`unit` names the unit, :meth:`q` formats ``value unit``."""

    system: str = "SI"

    def __post_init__(self):
        if self.system not in ("SI", "US"):
            raise ValueError(f"unknown unit system {self.system!r} (SI or US)")

    @property
    def us(self) -> bool:
        return self.system == "US"

    def factor(self, kind: str) -> float:
        si_name, si, us_name, us = KINDS[kind]
        return _factor(si, us) if self.us else 1.0

    def unit(self, kind: str) -> str:
        return KINDS[kind][2 if self.us else 0]

    def value(self, x, kind: str):
        """``x`` (SI display unit of ``kind``; a number or an array) in this system."""
        if x is None:
            return None
        return x * self.factor(kind) if self.us else x

    def q(self, x, kind: str, sig: int = 4) -> str:
        """``x`` with its unit: ``25.4 mm`` or ``1 in``; ``—`` when missing."""
        if x is None or not _finite(x):
            return MISSING
        return f"{num(self.value(float(x), kind), sig)} {self.unit(kind)}"

    def label(self, what: str, kind: str) -> str:
        """An axis label ``what [unit]``."""
        return f"{what} [{self.unit(kind)}]"


SI = OutputUnits("SI")
_CURRENT: ContextVar[OutputUnits] = ContextVar("cycj_output_units", default=SI)


def units() -> OutputUnits:
    """The unit system reports and plots use now (SI unless :func:`using` set another)."""
    return _CURRENT.get()


@contextlib.contextmanager
def using(system):
    """Reports and plots written inside the block use ``system`` ("SI", "US" or an
    :class:`OutputUnits`)."""
    u = system if isinstance(system, OutputUnits) else OutputUnits(str(system or "SI").upper())
    token = _CURRENT.set(u)
    try:
        yield u
    finally:
        _CURRENT.reset(token)


# ------------------------------------------------------------------------------- axes
def _log_labeller(lo: float, hi: float):
    """Tick labels of a log axis shown over [lo, hi]: every decade as a plain number when the
    axis stays within 0.01 … 1000, else every decade as ``10ⁿ`` (never a mix)."""
    plain = lo >= 0.00999 and hi <= 1000.1

    def label(value, _pos=None) -> str:
        if value <= 0 or not math.isfinite(value):
            return ""
        e = math.log10(value)
        if abs(e - round(e)) < 1e-9:
            return num(value, 1) if plain else power_of_ten(int(round(e)))
        return num(value, 2)

    return label


def log_axis(ax, which: str = "y") -> None:
    """Label a log axis cleanly: decades (as ``10ⁿ``, or plain numbers on an axis within
    0.01 … 1000); when the shown span is under two decades also 2 and 5 of each decade,
    under one decade every integer multiple; no label on the other minor ticks (so labels
    never run into each other).  The ticks are then fixed where they fall inside the shown
    span (:func:`_keep_shown_ticks`): call after the limits are set."""
    from matplotlib.ticker import FuncFormatter, LogLocator, NullFormatter

    axes = {"x": [ax.xaxis], "y": [ax.yaxis], "both": [ax.xaxis, ax.yaxis]}[which]
    for axis in axes:
        lo, hi = sorted(axis.get_view_interval())
        span = math.log10(hi / lo) if lo > 0 and hi > 0 else 10.0
        if span < 1.0:  # within a decade: every integer multiple labelled
            axis.set_major_locator(LogLocator(base=10, subs=tuple(float(k) for k in range(1, 10))))
        elif span < 2.0:
            axis.set_major_locator(LogLocator(base=10, subs=(1.0, 2.0, 5.0)))
        else:
            axis.set_major_locator(LogLocator(base=10, subs=(1.0,), numticks=12))
        axis.set_major_formatter(FuncFormatter(_log_labeller(lo, hi)))
        axis.set_minor_locator(LogLocator(base=10, subs=tuple(range(2, 10)), numticks=12))
        axis.set_minor_formatter(NullFormatter())
        if lo > 0:
            _keep_shown_ticks(axis, lo, hi)


def _keep_shown_ticks(axis, lo: float, hi: float) -> None:
    """Fix the major and minor ticks of a log ``axis`` at the positions its locators give
    inside [lo, hi] (a hair wider, so that no tick on a limit is lost).  A log locator gives
    whole decades, the parts beyond the view included, and matplotlib asks it again at each
    draw and makes a tick for every position: the same picture with fewer ticks made."""
    from matplotlib.ticker import FixedLocator

    low, high = lo * (1.0 - 1e-9), hi * (1.0 + 1e-9)
    for get, put in (
        (axis.get_major_locator, axis.set_major_locator),
        (axis.get_minor_locator, axis.set_minor_locator),
    ):
        put(FixedLocator([x for x in get()() if low <= x <= high]))


@cache
def _plain_formatter_class():
    """A ``ScalarFormatter`` whose labels are plain text (no mathtext: its parser costs more
    than drawing the whole figure) and whose common factor is ``×10ⁿ`` in superscript digits,
    as :func:`power_of_ten` writes it."""
    from matplotlib.ticker import ScalarFormatter

    class PlainFormatter(ScalarFormatter):
        def get_offset(self):
            plain = super().get_offset()  # "1e6" (no offset is used): the factor's exponent
            if not plain.startswith("1e"):
                return plain
            return "×" + power_of_ten(int(plain[2:].replace("\u2212", "-")))

    return PlainFormatter


def plain_axis(ax, which: str = "both") -> None:
    """A linear axis with no offset (no ``1e−5+4``): plain numbers below a million, a common
    ``×10ⁿ`` factor beyond."""
    from matplotlib.ticker import ScalarFormatter

    for axis in {"x": [ax.xaxis], "y": [ax.yaxis], "both": [ax.xaxis, ax.yaxis]}[which]:
        if axis.get_scale() == "linear" and isinstance(axis.get_major_formatter(), ScalarFormatter):
            f = _plain_formatter_class()(useOffset=False, useMathText=False)
            f.set_powerlimits((-3, 6))
            axis.set_major_formatter(f)


def tidy(fig) -> None:
    """:func:`log_axis` or :func:`plain_axis` on every axis of ``fig`` by its scale (call
    after the limits are set, before saving)."""
    for ax in fig.axes:
        for name, axis in (("x", ax.xaxis), ("y", ax.yaxis)):
            scale = axis.get_scale()
            if scale == "log":
                log_axis(ax, name)
            elif scale == "linear":
                plain_axis(ax, name)
