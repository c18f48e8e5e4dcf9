"""Stress distributions over the crack plane and their linearisation.

A profile gives the stress normal to the crack plane σ(x) [MPa] as a function of the depth x
measured from the cracked surface, normalised by the section depth t (x/t in [0, 1]; t is the
wall thickness for a surface crack, the width W for an edge crack in a plate).  Two kinds:

* a polynomial in x/t, σ = σ0 + σ1(x/t) + σ2(x/t)² + σ3(x/t)³ (the form of the standards'
  polynomial stress inputs, any number of terms);
* a table of (x/t, σ) pairs with linear interpolation.

The linearisation over the section splits σ into membrane P_m (the mean), bending P_b (from the
first moment about mid-section, positive when the cracked surface is in tension) and the peak
remainder σ_peak = σ − P_m − P_b(1 − 2x/t):

    P_m = (1/t)∫₀ᵗ σ dx,    P_b = (6/t²)∫₀ᵗ σ(x)(t/2 − x) dx.

Units: stresses in MPa, x/t dimensionless.

References
----------
.. [1] BS 7910:2013+A1:2015, *Guide to methods for assessing the acceptability of flaws in
   metallic structures*, §6.4 and Annex M (membrane and bending components of a stress
   distribution; polynomial stress distributions, from memory).
.. [2] R6 Revision 4, *Assessment of the integrity of structures containing defects*, EDF
   Energy, Section II.3 (linearisation of primary and secondary stresses, from memory).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from cycj.errors import ValidityRangeError

__all__ = [
    "StressProfile",
    "linearise_polynomial",
    "linearise_table",
    "peak_stress",
    "polynomial_stress",
    "tabulated_stress",
]


def _depth_ratio(x_over_t):
    xt = np.asarray(x_over_t, float)
    if np.any(~np.isfinite(xt)) or np.any(xt < 0.0) or np.any(xt > 1.0):
        raise ValidityRangeError("x/t must lie in [0, 1] (inside the section)")
    return xt


def _coefficients(coefficients):
    c = np.atleast_1d(np.asarray(coefficients, float))
    if c.ndim != 1 or c.size == 0 or np.any(~np.isfinite(c)):
        raise ValidityRangeError("polynomial stress coefficients must be a finite 1-D list")
    return c


def _table(x_over_t, stress):
    xt = np.asarray(x_over_t, float)
    s = np.asarray(stress, float)
    if xt.ndim != 1 or xt.shape != s.shape or xt.size < 2:
        raise ValidityRangeError("a stress table needs ≥ 2 (x/t, σ) pairs of equal length")
    if np.any(~np.isfinite(xt)) or np.any(~np.isfinite(s)):
        raise ValidityRangeError("stress table values must be finite")
    if np.any(np.diff(xt) <= 0.0):
        raise ValidityRangeError("stress table x/t must increase strictly")
    if xt[0] < 0.0 or xt[-1] > 1.0:
        raise ValidityRangeError("stress table x/t must lie in [0, 1]")
    return xt, s


def polynomial_stress(x_over_t, coefficients):
    """Polynomial stress profile σ(x) = Σ σ_i (x/t)^i [MPa].

    Parameters
    ----------
    x_over_t : array_like
        Depth from the cracked surface over the section depth, in [0, 1].
    coefficients : sequence of float
        σ0, σ1, σ2, σ3 … [MPa] (any number of terms; the standards use four).

    Returns
    -------
    numpy.ndarray
        Stress normal to the crack plane [MPa].

    Raises
    ------
    ValidityRangeError
        x/t outside [0, 1] or non-finite coefficients.

    References
    ----------
    .. [1] BS 7910:2013+A1:2015, Annex M, polynomial stress distribution (from memory).
    """
    xt = _depth_ratio(x_over_t)
    c = _coefficients(coefficients)
    return np.polynomial.polynomial.polyval(xt, c)


def tabulated_stress(x_over_t, table_x_over_t, table_stress):
    """Tabulated stress profile with linear interpolation between the points [MPa].

    Parameters
    ----------
    x_over_t : array_like
        Depth ratio x/t where the stress is wanted, within the table's range.
    table_x_over_t : sequence of float
        Strictly increasing x/t of the table points, within [0, 1].
    table_stress : sequence of float
        Stress at those points [MPa].

    Raises
    ------
    ValidityRangeError
        A requested x/t lies outside the table (no extrapolation), or the table is malformed.

    References
    ----------
    .. [1] R6 Revision 4, Section II.3: stress distributions taken from an uncracked-body
       analysis along the crack plane (from memory).
    """
    xt = _depth_ratio(x_over_t)
    tx, ts = _table(table_x_over_t, table_stress)
    if np.any(xt < tx[0] - 1e-12) or np.any(xt > tx[-1] + 1e-12):
        raise ValidityRangeError(f"x/t outside the stress table's range [{tx[0]:g}, {tx[-1]:g}]")
    return np.interp(xt, tx, ts)


def linearise_polynomial(coefficients):
    """Membrane and bending parts (P_m, P_b) [MPa] of a polynomial profile over the section.

    For σ = Σ σ_i ξ^i, ξ = x/t: P_m = Σ σ_i/(i+1), P_b = 6 Σ σ_i [1/(2(i+1)) − 1/(i+2)].

    Parameters
    ----------
    coefficients : sequence of float
        σ0, σ1, … [MPa] of the polynomial in x/t.

    Returns
    -------
    tuple of float
        (P_m, P_b) [MPa]; P_b > 0 puts the cracked surface (x = 0) in tension.

    Notes
    -----
    Exact limits: a uniform stress is all membrane; σ = σ_b(1 − 2x/t) is all bending (P_b = σ_b).

    References
    ----------
    .. [1] BS 7910:2013+A1:2015, §6.4 (linearisation of a stress distribution, from memory).
    .. [2] R6 Revision 4, Section II.3 (from memory).
    """
    c = _coefficients(coefficients)
    i = np.arange(c.size)
    pm = float(np.sum(c / (i + 1.0)))
    pb = float(6.0 * np.sum(c * (0.5 / (i + 1.0) - 1.0 / (i + 2.0))))
    return pm, pb


def linearise_table(table_x_over_t, table_stress):
    """Membrane and bending parts (P_m, P_b) [MPa] of a tabulated (piecewise linear) profile.

    The table must span the whole section, x/t from 0 to 1; the integrals are exact for the
    piecewise-linear interpolant.

    Returns
    -------
    tuple of float
        (P_m, P_b) [MPa], as in :func:`linearise_polynomial`.

    Raises
    ------
    ValidityRangeError
        The table does not start at x/t = 0 and end at x/t = 1.

    References
    ----------
    .. [1] BS 7910:2013+A1:2015, §6.4 (from memory).
    """
    tx, ts = _table(table_x_over_t, table_stress)
    if abs(tx[0]) > 1e-12 or abs(tx[-1] - 1.0) > 1e-12:
        raise ValidityRangeError("linearisation needs a table over the whole section, x/t 0…1")
    x0, x1 = tx[:-1], tx[1:]
    s0, s1 = ts[:-1], ts[1:]
    h = x1 - x0
    pm = float(np.sum(0.5 * h * (s0 + s1)))
    # ∫ σ(ξ)(½ − ξ) dξ on each segment, exact for linear σ: Simpson's rule is exact (cubic).
    xm = 0.5 * (x0 + x1)
    sm = 0.5 * (s0 + s1)
    moment = np.sum(h / 6.0 * (s0 * (0.5 - x0) + 4.0 * sm * (0.5 - xm) + s1 * (0.5 - x1)))
    return pm, float(6.0 * moment)


def peak_stress(x_over_t, stress, membrane, bending):
    """Peak (non-linear) part σ − P_m − P_b(1 − 2x/t) of a profile [MPa].

    Parameters
    ----------
    x_over_t : array_like
        Depth ratio in [0, 1].
    stress : array_like
        σ at those depths [MPa].
    membrane, bending : float
        P_m, P_b [MPa] from :func:`linearise_polynomial` or :func:`linearise_table`.

    References
    ----------
    .. [1] R6 Revision 4, Section II.3 (from memory).
    """
    xt = _depth_ratio(x_over_t)
    return np.asarray(stress, float) - membrane - bending * (1.0 - 2.0 * xt)


@dataclass(frozen=True)
class StressProfile:
    """A stress distribution over the crack plane (data only; physics in the functions).

    ``kind`` is ``"polynomial"`` (``coefficients`` σ0… [MPa] in x/t) or ``"table"``
    (``x_over_t`` and ``stress`` [MPa]).  ``scale`` multiplies the stress (load channels,
    relaxation).
    """

    kind: str
    coefficients: tuple = ()
    x_over_t: tuple = ()
    stress: tuple = ()
    scale: float = 1.0

    def __post_init__(self):
        if self.kind == "polynomial":
            _coefficients(self.coefficients)
        elif self.kind == "table":
            _table(self.x_over_t, self.stress)
        else:
            raise ValueError(
                f"unknown stress profile kind {self.kind!r}; expected 'polynomial' or 'table'"
            )

    def __call__(self, x_over_t):
        """σ [MPa] at depth ratio x/t."""
        if self.kind == "polynomial":
            return self.scale * polynomial_stress(x_over_t, self.coefficients)
        return self.scale * tabulated_stress(x_over_t, self.x_over_t, self.stress)

    def along(self, depth):
        """σ as a function of the depth x [mm] for a section of depth ``depth`` [mm]."""
        if not depth > 0:
            raise ValidityRangeError("section depth must be > 0 mm")
        return lambda x: self(np.asarray(x, float) / depth)

    def scaled(self, factor):
        """The same profile multiplied by ``factor`` (e.g. a relaxation factor)."""
        return StressProfile(
            self.kind, self.coefficients, self.x_over_t, self.stress, self.scale * float(factor)
        )

    def linearise(self):
        """(P_m, P_b) [MPa] over the section."""
        if self.kind == "polynomial":
            pm, pb = linearise_polynomial(self.coefficients)
        else:
            pm, pb = linearise_table(self.x_over_t, self.stress)
        return self.scale * pm, self.scale * pb
