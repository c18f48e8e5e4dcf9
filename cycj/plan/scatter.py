"""Scatter in the planning inputs: distributions, their resolution from a case, and sampling.

Four scattered inputs, drawn per Monte Carlo sample in this fixed order (so a seed always
gives the same samples): ``growth_C`` (factor on the case's C), ``initial_crack`` (size in mm),
``toughness`` (factor on the case's toughness) and ``load_scale`` (factor on the history).

Distributions (all positive):

* ``lognormal``: x = exp(μ + σ·z); σ given directly (natural-log scale) or from the coefficient
  of variation, σ = √(ln(1 + cov²)); centred by ``median`` (default: the case's value) or ``mean``
  (median = mean·exp(−σ²/2)).
* ``weibull``: x = λ·(−ln(1 − u))^(1/k); shape k given or solved from ``cov``; λ from the median
  (λ = median/(ln 2)^(1/k)) or the mean (λ = mean/Γ(1 + 1/k)).
* ``normal``: truncated at zero (sampled by inverse CDF on the positive part); ``sd`` or ``cov``.
* ``fixed``: the value itself.

Every draw goes through one uniform number per sample, by inverse CDF, so the draws are
reproducible and independent of which inputs scatter.

References
----------
.. [1] Johnson, N. L., Kotz, S., Balakrishnan, N., *Continuous Univariate Distributions*, Vol. 1,
   2nd ed., Wiley (1994): log-normal (ch. 14) and Weibull (ch. 21) moments.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

DISTRIBUTIONS = ("lognormal", "weibull", "normal", "fixed")
#: scattered inputs in draw order
VARIABLES = ("growth_C", "initial_crack", "toughness", "load_scale")


@dataclass(frozen=True)
class Dist:
    """A resolved distribution: ``kind`` and two parameters.

    lognormal: (μ, σ) of ln x;  weibull: (k, λ);  normal: (mean, sd);  fixed: (value, 0).
    """

    kind: str
    p1: float
    p2: float = 0.0

    def ppf(self, u):
        """Inverse CDF at uniforms ``u`` (array)."""
        from scipy.special import ndtr, ndtri

        u = np.asarray(u, float)
        if self.kind == "fixed" or (self.kind in ("lognormal", "normal") and self.p2 == 0):
            return np.full(u.shape, self.p1 if self.kind != "lognormal" else math.exp(self.p1))
        if self.kind == "lognormal":
            return np.exp(self.p1 + self.p2 * ndtri(u))
        if self.kind == "weibull":
            return self.p2 * (-np.log1p(-u)) ** (1.0 / self.p1)
        if self.kind == "normal":
            lo = ndtr(-self.p1 / self.p2)
            return self.p1 + self.p2 * ndtri(lo + u * (1.0 - lo))
        raise ValueError(f"unknown distribution {self.kind!r}")

    def log_ppf(self, u):
        """ln of the inverse CDF at uniforms ``u`` (the log-normal's without exp and log)."""
        from scipy.special import ndtri

        if self.kind == "lognormal" and self.p2 > 0:
            return self.p1 + self.p2 * ndtri(np.asarray(u, float))
        return np.log(self.ppf(u))

    def from_normal(self, x):
        """The value whose CDF is Φ(x), for standard normal ``x`` (array): the same map as
        :meth:`ppf` at u = Φ(x), computed so that the upper tail keeps its precision."""
        from scipy.special import log_ndtr, ndtr, ndtri

        x = np.asarray(x, float)
        if not self.scatters:
            return self.ppf(np.full(x.shape, 0.5))
        if self.kind == "lognormal":
            return np.exp(self.p1 + self.p2 * x)
        if self.kind == "weibull":
            return self.p2 * (-log_ndtr(-x)) ** (1.0 / self.p1)
        if self.kind == "normal":
            lo = ndtr(-self.p1 / self.p2)
            return self.p1 - self.p2 * ndtri((1.0 - lo) * ndtr(-x))
        raise ValueError(f"unknown distribution {self.kind!r}")

    def quantile(self, p: float) -> float:
        return float(self.ppf(np.array([p]))[0])

    @property
    def median(self) -> float:
        return self.quantile(0.5)

    @property
    def scatters(self) -> bool:
        return self.kind in ("weibull",) or (self.kind in ("lognormal", "normal") and self.p2 > 0)


def lognormal(median: float, sigma: float) -> Dist:
    """Log-normal with the given median and σ of ln x."""
    return Dist("lognormal", math.log(median), sigma)


def lognormal_sigma_from_cov(cov: float) -> float:
    """σ of ln x for a log-normal of coefficient of variation ``cov``: √(ln(1 + cov²))."""
    return math.sqrt(math.log1p(cov * cov))


def weibull_shape_from_cov(cov: float) -> float:
    """Weibull shape k whose coefficient of variation is ``cov`` (0.01 ≤ cov ≤ 5).

    cov² = Γ(1 + 2/k)/Γ(1 + 1/k)² − 1, solved for k by Brent's method.
    """
    from scipy.optimize import brentq
    from scipy.special import gammaln

    def f(lk):
        k = math.exp(lk)
        return math.exp(gammaln(1 + 2 / k) - 2 * gammaln(1 + 1 / k)) - 1 - cov * cov

    return math.exp(brentq(f, math.log(0.2), math.log(500.0)))


def weibull(shape: float, *, median: float | None = None, mean: float | None = None) -> Dist:
    """Weibull of shape k centred by its median or its mean."""
    if median is not None:
        return Dist("weibull", shape, median / math.log(2.0) ** (1.0 / shape))
    return Dist("weibull", shape, mean / math.gamma(1.0 + 1.0 / shape))


def fixed(value: float) -> Dist:
    return Dist("fixed", value, 0.0)


@dataclass(frozen=True)
class Scatter:
    """The four scattered inputs (see :data:`VARIABLES`); factors have median 1 by default."""

    growth_C: Dist = fixed(1.0)
    initial_crack: Dist = fixed(1.0)
    toughness: Dist = fixed(1.0)
    load_scale: Dist = fixed(1.0)

    def sample(self, rng: np.random.Generator, n: int) -> dict:
        """Draw ``n`` samples: dict of arrays ``c_factor``, ``a0_mm``, ``toughness_factor``,
        ``load_factor`` (one uniform per variable per sample, in :data:`VARIABLES` order)."""
        u = rng.random((4, n))
        return {
            "c_factor": self.growth_C.ppf(u[0]),
            "a0_mm": self.initial_crack.ppf(u[1]),
            "toughness_factor": self.toughness.ppf(u[2]),
            "load_factor": self.load_scale.ppf(u[3]),
        }

    def from_normal(self, x) -> dict:
        """Values at standard normal points ``x`` (4, n), in :data:`VARIABLES` order."""
        return {
            "c_factor": self.growth_C.from_normal(x[0]),
            "a0_mm": self.initial_crack.from_normal(x[1]),
            "toughness_factor": self.toughness.from_normal(x[2]),
            "load_factor": self.load_scale.from_normal(x[3]),
        }

    @property
    def scattering(self) -> np.ndarray:
        """Mask of the inputs that scatter (in :data:`VARIABLES` order)."""
        return np.array([getattr(self, v).scatters for v in VARIABLES])

    def sample_shifted(self, rng: np.random.Generator, n: int, shift) -> tuple[dict, np.ndarray]:
        """Importance sampling: ``n`` draws x = z + shift in standard normal space (z ~ N(0, I);
        the shift of an input that does not scatter is ignored) and their likelihood ratios
        w = φ(x)/φ(x − shift) = exp(−z·shift − |shift|²/2); the dict also holds the points x
        (``u_normal``).

        References
        ----------
        Rubinstein, R. Y., Kroese, D. P., *Simulation and the Monte Carlo Method*, 3rd ed.,
        Wiley (2016), §5.7 (importance sampling).
        """
        s = np.where(self.scattering, np.asarray(shift, float), 0.0)
        z = rng.standard_normal((4, n))
        w = np.exp(-(s @ z) - 0.5 * float(s @ s))
        x = z + s[:, None]
        return self.from_normal(x) | {"u_normal": x}, w
