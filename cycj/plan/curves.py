"""Growth-curve tables for the Monte Carlo: computed once, rescaled per sample.

The life engine (or a closed form in tests) supplies two functions:

* ``growth_curve(a_start_mm, load_factor) -> (a_mm, cycles)``, monotone, cycles[0] = 0, at the
  case's C, up to the critical size;
* ``critical_size(load_factor, toughness_factor) -> a_c [mm]``.

:func:`build_table` evaluates them on a few load factors (geometric grid, log-space
interpolation between them) and toughness factors, and puts the life coordinate φ(a) on one
uniform grid in ln a.  A sample then needs no stepping: life ∝ 1/C (Paris law), the initial
size is an integration limit and the toughness moves the end point.

References
----------
.. [1] Paris, P. C., Erdogan, F., J. Basic Eng. 85 (1963) 528.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from cycj.plan import simulation_kernels as kernels


@dataclass(frozen=True)
class CurveTable:
    """φ(a) [cycles at the case's C] on a uniform ln a grid, for load factors exp(log_s).

    ``logphi`` (n_s, n_a) is ln φ (−inf at the first grid point, where φ = 0); beyond a
    curve's last computed size it is extended with its last slope in ln a.  ``log_acrit``
    (n_s, n_t) is ln a_c at toughness factors exp(log_t).
    """

    la0: float
    dla: float
    logphi: np.ndarray
    log_s: np.ndarray
    la_end: np.ndarray
    log_t: np.ndarray
    log_acrit: np.ndarray

    @property
    def a_min(self) -> float:
        return math.exp(self.la0)

    def load_position(self, load_factor):
        """Row ``k`` and weight ``w`` in ln(load factor) (clamped to the grid's ends)."""
        ls = np.log(np.asarray(load_factor, float))
        n_s = self.log_s.size
        if n_s == 1:
            return np.zeros(ls.shape, np.int64), np.zeros(ls.shape)
        k = np.clip(np.searchsorted(self.log_s, ls, side="right") - 1, 0, n_s - 2)
        w = np.clip((ls - self.log_s[k]) / (self.log_s[k + 1] - self.log_s[k]), 0.0, 1.0)
        top = w >= 1.0
        k = np.where(top, n_s - 1, k)
        w = np.where(top, 0.0, w)
        return k.astype(np.int64), w

    def critical_log_size(self, k, w, toughness_factor):
        """ln a_c per sample, bilinear in (ln load factor, ln toughness factor), clamped to
        the end of the lower-load (longer) neighbouring growth curve; the higher-load curve is
        extended past its end with its last slope in ln a (a short stretch near failure)."""
        lt = np.log(np.asarray(toughness_factor, float))
        n_s = self.log_s.size
        k1 = np.minimum(k + 1, n_s - 1)
        rows = np.empty((n_s, lt.size))
        for r in range(n_s):
            rows[r] = (
                np.interp(lt, self.log_t, self.log_acrit[r])
                if self.log_t.size > 1
                else self.log_acrit[r, 0]
            )
        idx = np.arange(lt.size)
        lac = (1 - w) * rows[k, idx] + w * rows[k1, idx]
        return np.minimum(lac, self.la_end[k])

    def phi(self, log_a, k, w):
        out = np.empty(np.shape(log_a))
        kernels.phi_many(np.asarray(log_a, float), k, w, self.la0, self.dla, self.logphi, out)
        return out

    def log_size(self, phi, k, w):
        out = np.empty(np.shape(phi))
        kernels.size_many(np.asarray(phi, float), k, w, self.la0, self.dla, self.logphi, out)
        return out


def factor_grid(dist, n: int, p: float = 1e-6) -> np.ndarray:
    """Geometric grid of ``n`` factors spanning the p and 1 − p quantiles of ``dist`` (one
    point, the median, when it does not scatter)."""
    if not dist.scatters:
        return np.array([dist.median])
    lo, hi = dist.quantile(p), dist.quantile(1 - p)
    return np.exp(np.linspace(math.log(lo), math.log(hi), n))


def resample_cycles(x_new, x, n, rate=None):
    """Cycles N at ln a = ``x_new`` from a curve (x = ln a, N) and, if given, the growth rate
    da/dN at its points.

    With rates, N between two points follows a local power law in the rate (ln(dN/d ln a)
    linear in ln a, integrated exactly and scaled to the curve's own ΔN), which is exact for
    a Paris law with K ∝ √a; without, N is linear in ln a.
    """
    x_new = np.asarray(x_new, float)
    i = np.clip(np.searchsorted(x, x_new, side="right") - 1, 0, x.size - 2)
    d = x[i + 1] - x[i]
    t = np.clip(x_new - x[i], 0.0, d)
    frac = t / d
    if rate is not None:
        with np.errstate(divide="ignore", invalid="ignore"):
            g = np.log(np.exp(x) / rate)
            b = (g[i + 1] - g[i]) / d
            ok = np.isfinite(b) & (np.abs(b * d) > 1e-9)
            pw = np.expm1(b * t) / np.expm1(b * d)
        frac = np.where(ok, pw, frac)
    return n[i] + (n[i + 1] - n[i]) * frac


def build_table(
    growth_curve, critical_size, a_min: float, load_factors, toughness_factors, n_a: int = 321
) -> CurveTable:
    """Tabulate φ(a) for each load factor and a_c for each (load, toughness) factor pair.

    Parameters
    ----------
    growth_curve : callable (a_start_mm, load_factor) -> (a_mm, cycles[, dadN])
    critical_size : callable (load_factor, toughness_factor) -> a_c [mm]
    a_min : float
        Smallest crack size tabulated [mm]; smaller initial cracks are raised to it.
    load_factors, toughness_factors : array_like, ascending
    n_a : int
        Grid points in ln a.
    """
    s = np.asarray(load_factors, float)
    t = np.asarray(toughness_factors, float)
    curves = []
    rates = []
    for sk in s:
        out = growth_curve(a_min, float(sk))
        a, n = np.asarray(out[0], float), np.asarray(out[1], float)
        r = np.asarray(out[2], float) if len(out) > 2 else None
        keep = np.concatenate([[True], np.diff(a) > 0])
        a, n = a[keep], n[keep] - n[0]
        rates.append(None if r is None else r[keep])
        if a.size < 2:
            raise ValueError(
                f"the growth curve at load factor {sk:g} has no growth from {a_min:g} mm"
            )
        curves.append((np.log(a), np.maximum.accumulate(n)))
    la0 = math.log(a_min)
    la_end = np.array([c[0][-1] for c in curves])
    la_max = la_end.max()
    dla = (la_max - la0) / (n_a - 1)
    grid = la0 + dla * np.arange(n_a)
    logphi = np.empty((s.size, n_a))
    for r, (la, nn) in enumerate(curves):
        ph = resample_cycles(grid, la, nn, rates[r])
        beyond = grid > la[-1]
        if beyond.any():  # extend with the last slope in ln a (reached only after failure)
            slope = max((nn[-1] - nn[-2]) / (la[-1] - la[-2]), 1e-300)
            ph[beyond] = nn[-1] + slope * (grid[beyond] - la[-1])
        ph[0] = 0.0
        # strictly increasing (no growth would make φ flat: keep the inverse defined)
        ph[1:] = np.maximum(ph[1:], ph[1:].max() * 1e-15)
        ph = np.maximum.accumulate(ph * (1.0 + 1e-12 * np.arange(n_a)))
        with np.errstate(divide="ignore"):
            logphi[r] = np.log(ph)
    log_acrit = np.array([[math.log(critical_size(float(sk), float(tk))) for tk in t] for sk in s])
    return CurveTable(la0, dla, logphi, np.log(s), la_end, np.log(t), log_acrit)
