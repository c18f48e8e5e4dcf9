"""Probability of detection (POD) curves in crack size, MIL-HDBK-1823A forms.

Two curve shapes, both in ln a with location μ = ln a50 and scale σ:

* ``"lognormal"`` (probit link):   POD(a) = c·Φ((ln a − μ)/σ)
* ``"loglogistic"`` (logit link):  POD(a) = c / (1 + exp(−(ln a − μ)/σ))

where c ≤ 1 is the ``ceiling`` (the largest POD the method reaches).  In the GLM form of the
handbook, POD = F(β0 + β1·ln a), so μ = −β0/β1 and σ = 1/β1.  For signal-response (â vs a)
data, ln â = β0 + β1·ln a + ε with ε ~ N(0, τ²); the crack is called when â > â_dec, so
μ = (ln â_dec − β0)/β1 and σ = τ/β1 (probit form).

Units: crack sizes in mm.

References
----------
.. [1] MIL-HDBK-1823A, *Nondestructive Evaluation System Reliability Assessment*, US DoD (2009).
.. [2] Berens, A. P., "NDE reliability data analysis", *ASM Handbook* Vol. 17, *Nondestructive
   Evaluation and Quality Control*, ASM International (1989) 689–701.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from cycj.models import names, record, register

#: standard normal quantile of 0.90 and of 0.95
Z90 = 1.2815515655446004
Z95 = 1.6448536269514722
#: logistic quantile of 0.90, ln 9
L90 = math.log(9.0)

_MIL = "MIL-HDBK-1823A (2009): Nondestructive Evaluation System Reliability Assessment (POD)"
_BERENS = "Berens, A. P. (1989), NDE reliability data analysis, ASM Handbook Vol. 17, 689–701"
POD_LOGNORMAL = register(
    "pod", "lognormal", 0, validity="0 < POD ≤ ceiling; a > 0", citation=(_MIL, _BERENS)
).code
POD_LOGLOGISTIC = register(
    "pod", "loglogistic", 1, validity="0 < POD ≤ ceiling; a > 0", citation=(_MIL, _BERENS)
).code
POD_MODELS = names("pod")


def pod_lognormal(a, mu, sigma, ceiling=1.0):
    """Cumulative log-normal POD, c·Φ((ln a − μ)/σ) (dimensionless).

    Parameters
    ----------
    a : array_like
        Crack size [mm], > 0 (0 or less gives POD 0).
    mu : float
        ln a50 [ln mm].
    sigma : float
        Scale in ln a (> 0).
    ceiling : float
        Upper asymptote c, 0 < c ≤ 1.

    References
    ----------
    MIL-HDBK-1823A (2009), probit link of the hit/miss GLM and the â-vs-a POD.
    """
    from scipy.special import ndtr

    a = np.asarray(a, float)
    with np.errstate(divide="ignore"):
        z = (np.log(np.where(a > 0, a, 0.0)) - mu) / sigma
    return ceiling * ndtr(z)


def pod_loglogistic(a, mu, sigma, ceiling=1.0):
    """Log-logistic POD, c/(1 + exp(−(ln a − μ)/σ)) (dimensionless).

    Parameters as :func:`pod_lognormal`; σ = 1/β1 of the logit GLM.

    References
    ----------
    MIL-HDBK-1823A (2009), logit link of the hit/miss GLM; Berens (1989).
    """
    from scipy.special import expit

    a = np.asarray(a, float)
    with np.errstate(divide="ignore"):
        z = (np.log(np.where(a > 0, a, 0.0)) - mu) / sigma
    return ceiling * expit(z)


def _z(model: str, p: float) -> float:
    from scipy.special import logit, ndtri

    if model == "lognormal":
        return float(ndtri(p))
    if model == "loglogistic":
        return float(logit(p))
    raise ValueError(f"unknown POD model {model!r}; known: {', '.join(POD_MODELS)}")


@dataclass(frozen=True)
class PodCurve:
    """A POD curve: ``model`` in :data:`POD_MODELS`, μ = ln a50 [ln mm], σ, ``ceiling``.

    ``a90_95`` [mm] is the 95 % upper confidence bound on a90 when the curve was fitted to
    data (``None`` otherwise).
    """

    model: str
    mu: float
    sigma: float
    ceiling: float = 1.0
    a90_95: float | None = None

    def __post_init__(self):
        if self.model not in POD_MODELS:
            raise ValueError(f"unknown POD model {self.model!r}; known: {', '.join(POD_MODELS)}")
        if not self.sigma > 0:
            raise ValueError("POD sigma must be > 0")
        if not 0 < self.ceiling <= 1:
            raise ValueError("POD ceiling must be in (0, 1]")

    @property
    def model_code(self) -> int:
        """The model's kernel code (from its record; used by the compiled kernel)."""
        return record("pod", self.model).code

    def __call__(self, a):
        """POD at crack size ``a`` [mm]."""
        f = pod_lognormal if self.model == "lognormal" else pod_loglogistic
        return f(a, self.mu, self.sigma, self.ceiling)

    def log_threshold(self, u):
        """ln of the size above which a crack is detected for detection uniforms ``u``
        (array): POD(a) > u ⇔ ln a > μ + σ·z(u/c), with z the probit or logit; +inf where
        u ≥ the ceiling c (never detected)."""
        from scipy.special import logit, ndtri

        u = np.asarray(u, float)
        q = np.minimum(u / self.ceiling, 1.0)
        z = ndtri(q) if self.model == "lognormal" else logit(q)
        return np.where(u < self.ceiling, self.mu + self.sigma * z, np.inf)

    def size_at(self, p: float) -> float:
        """Crack size [mm] whose POD (before the ceiling) is ``p``: a_p = exp(μ + z_p·σ)."""
        return math.exp(self.mu + _z(self.model, p) * self.sigma)

    @property
    def a50(self) -> float:
        return math.exp(self.mu)

    @property
    def a90(self) -> float:
        return self.size_at(0.9)

    def to_toml(self) -> str:
        """The inline table that drops into a case's ``[inspection]``."""
        parts = [
            f'model = "{self.model}"',
            f'a50 = "{self.a50:.4g} mm"',
            f"sigma = {self.sigma:.4g}",
        ]
        if self.ceiling < 1:
            parts.append(f"ceiling = {self.ceiling:.4g}")
        if self.a90_95 is not None:
            parts.append(f'a90_95 = "{self.a90_95:.4g} mm"')
        return "pod = { " + ", ".join(parts) + " }"

    def as_dict(self) -> dict:
        return {
            "model": self.model,
            "mu": self.mu,
            "sigma": self.sigma,
            "ceiling": self.ceiling,
            "a50_mm": self.a50,
            "a90_mm": self.a90,
            "a90_95_mm": self.a90_95,
        }


def pod_from_a50(
    model: str, a50: float, sigma: float, ceiling: float = 1.0, a90_95: float | None = None
) -> PodCurve:
    """POD curve from its median detectable size a50 [mm] and scale σ (ln a)."""
    return PodCurve(model, math.log(a50), sigma, ceiling, a90_95)


def pod_from_a90(
    model: str, a90: float, sigma: float, ceiling: float = 1.0, a90_95: float | None = None
) -> PodCurve:
    """POD curve from a90 [mm] and σ: μ = ln a90 − z90·σ (z90 = 1.2816 probit, ln 9 logit)."""
    return PodCurve(model, math.log(a90) - _z(model, 0.9) * sigma, sigma, ceiling, a90_95)


def pod_from_glm(link: str, beta0: float, beta1: float) -> PodCurve:
    """POD from the GLM POD = F(β0 + β1·ln a): μ = −β0/β1, σ = 1/β1.

    ``link`` is ``"logit"`` (log-logistic curve) or ``"probit"`` (log-normal curve).

    References
    ----------
    MIL-HDBK-1823A (2009), hit/miss analysis.
    """
    model = {"logit": "loglogistic", "probit": "lognormal"}[link]
    return PodCurve(model, -beta0 / beta1, 1.0 / beta1)


def pod_from_signal_response(beta0: float, beta1: float, tau: float, decision: float) -> PodCurve:
    """POD from ln â = β0 + β1·ln a + N(0, τ²) and decision threshold â_dec.

    μ = (ln â_dec − β0)/β1, σ = τ/β1 (log-normal curve).

    References
    ----------
    MIL-HDBK-1823A (2009), â vs a analysis.
    """
    return PodCurve("lognormal", (math.log(decision) - beta0) / beta1, tau / beta1)
