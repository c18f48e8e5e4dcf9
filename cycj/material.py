"""Material: elastic constants, strengths, cyclic and monotonic stress–strain curves, toughness.

Units: stresses and moduli in MPa, strains dimensionless, J in kJ/m² (= N/mm), K in MPa√mm.

References
----------
.. [1] Ramberg, W., Osgood, W. R., NACA TN 902 (1943): ε = σ/E + (σ/K)^(1/n).
.. [2] Masing, G. (1926), and Morrow, J. D., ASTM STP 378 (1965): the stable hysteresis branch
   Δε = Δσ/E + 2(Δσ/2K')^(1/n'); plastic work of the loading branch ΔσΔε_p/(1+n').
.. [3] ASTM E1820: J–R curve J = C1·(Δa/1 mm)^C2; flow stress σ_Y = (σ_y + σ_u)/2.
.. [4] R6 Rev. 4 / BS 7910:2013 §7: L_r,max = (σ_y + σ_u)/(2σ_y).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from cycj._jit import jit
from cycj.errors import ValidityRangeError

#: plastic strain at the proof stress used for σ'_y = K'·0.002^n'
PROOF_STRAIN = 0.002


@jit
def masing_plastic_strain_range(dsigma, k_prime, n_prime):
    """Plastic strain range of the Masing branch, 2(Δσ/2K')^(1/n') (dimensionless).

    ``dsigma`` ≥ 0 [MPa], ``k_prime`` > 0 [MPa], 0 < ``n_prime`` < 1.
    """
    if dsigma <= 0.0:
        return 0.0
    return 2.0 * (0.5 * dsigma / k_prime) ** (1.0 / n_prime)


@jit
def ramberg_osgood_strain(sigma, e_mod, k, n):
    """Total strain σ/E + (σ/K)^(1/n) of a Ramberg–Osgood curve (σ ≥ 0 [MPa])."""
    if sigma <= 0.0:
        return sigma / e_mod
    return sigma / e_mod + (sigma / k) ** (1.0 / n)


@dataclass(frozen=True)
class StressStrainCurve:
    """Ramberg–Osgood curve σ = K·ε_p^n (K [MPa], 0 < n < 1).

    Used as the stable cyclic curve (K', n') or the monotonic curve.
    """

    strength_coefficient: float
    hardening_exponent: float

    def __post_init__(self):
        if not self.strength_coefficient > 0:
            raise ValidityRangeError("strength coefficient must be > 0 MPa")
        if not 0 < self.hardening_exponent < 1:
            raise ValidityRangeError("hardening exponent must lie in (0, 1)")

    @property
    def proof_stress(self) -> float:
        """σ at 0.2 % plastic strain, K·0.002^n [MPa]."""
        return self.strength_coefficient * PROOF_STRAIN**self.hardening_exponent

    def strain(self, sigma, e_mod: float):
        """Total strain at stress ``sigma`` [MPa] (amplitude for the cyclic curve)."""
        s = np.asarray(sigma, float)
        return s / e_mod + np.abs(s / self.strength_coefficient) ** (
            1 / self.hardening_exponent
        ) * np.sign(s)

    def masing_strain_range(self, dsigma, e_mod: float):
        """Total strain range of the Masing branch for stress range ``dsigma`` [MPa]."""
        d = np.asarray(dsigma, float)
        if np.any(d < 0):
            raise ValidityRangeError("stress range must be ≥ 0")
        return d / e_mod + 2 * (d / (2 * self.strength_coefficient)) ** (
            1 / self.hardening_exponent
        )

    def masing_plastic_work(self, dsigma):
        """Plastic work of the loading branch ΔσΔε_p/(1+n') [MJ/m³ = MPa] (Morrow 1965)."""
        d = np.asarray(dsigma, float)
        dep = 2 * (d / (2 * self.strength_coefficient)) ** (1 / self.hardening_exponent)
        return d * dep / (1 + self.hardening_exponent)


@dataclass(frozen=True)
class ResistanceCurve:
    """J–R power law J_R = C1·(Δa / 1 mm)^C2 [kJ/m²] (ASTM E1820 form)."""

    C1: float
    C2: float

    def __post_init__(self):
        if not self.C1 > 0:
            raise ValidityRangeError("C1 must be > 0 kJ/m²")
        if not 0 < self.C2 < 1.5:
            raise ValidityRangeError("C2 must lie in (0, 1.5)")

    def __call__(self, da):
        d = np.asarray(da, float)
        if np.any(d < 0):
            raise ValidityRangeError("crack extension must be ≥ 0 mm")
        return self.C1 * d**self.C2


@dataclass(frozen=True)
class Material:
    """Elastic-plastic material data in internal units (MPa, kJ/m²)."""

    elastic_modulus: float
    poisson_ratio: float
    yield_strength: float
    tensile_strength: float | None = None
    cyclic_curve: StressStrainCurve | None = None
    monotonic_curve: StressStrainCurve | None = None
    J_c: float | None = None
    resistance_curve: ResistanceCurve | None = None

    def __post_init__(self):
        if not self.elastic_modulus > 0:
            raise ValidityRangeError("elastic modulus must be > 0")
        if not 0 <= self.poisson_ratio < 0.5:
            raise ValidityRangeError("Poisson's ratio must lie in [0, 0.5)")
        if not self.yield_strength > 0:
            raise ValidityRangeError("yield strength must be > 0")
        if self.tensile_strength is not None and self.tensile_strength < self.yield_strength:
            raise ValidityRangeError("tensile strength must not be below the yield strength")

    def effective_modulus(self, plane_strain: bool) -> float:
        """E' = E (plane stress) or E/(1−ν²) (plane strain) [MPa]."""
        if plane_strain:
            return self.elastic_modulus / (1 - self.poisson_ratio**2)
        return self.elastic_modulus

    @property
    def flow_stress(self) -> float:
        """σ_flow = (σ_y + σ_u)/2 [MPa], or σ_y when σ_u is not given (ASTM E1820)."""
        if self.tensile_strength is None:
            return self.yield_strength
        return 0.5 * (self.yield_strength + self.tensile_strength)

    @property
    def lr_max(self) -> float:
        """Plastic collapse cut-off L_r,max = (σ_y + σ_u)/(2σ_y) (R6, BS 7910); 1 without σ_u."""
        return self.flow_stress / self.yield_strength

    @property
    def peak_curve(self) -> StressStrainCurve | None:
        """Curve for J at peak load: the monotonic one if given, else the cyclic one."""
        return self.monotonic_curve or self.cyclic_curve


#: relative difference between the monotonic curve's 0.2 % proof stress and σ_y that is
#: reported as a contradiction (common practice: a tensile test's scatter is a few per cent)
PROOF_STRESS_TOLERANCE = 0.10


def curve_consistency_warnings(material: Material) -> list[str]:
    """Warnings for material data that contradict each other.

    The monotonic curve σ = K·ε_p^n has the 0.2 % proof stress K·0.002^n [MPa]; J at peak load
    (σ_ref = L_r·σ_y on that curve), the Option 2 FAD and L_r all assume it is σ_y.  A
    difference of more than 10 % is reported with both values.

    Parameters
    ----------
    material : Material

    Returns
    -------
    list of str (empty when consistent or when no monotonic curve is given)

    References
    ----------
    .. [1] Ainsworth, R. A., Eng. Fract. Mech. 19 (1984) 633–642 (σ_ref = L_r·σ_y on the
       material's curve, with σ_y the 0.2 % proof stress).
    """
    curve = material.monotonic_curve
    if curve is None:
        return []
    proof = curve.proof_stress
    sy = material.yield_strength
    diff = proof / sy - 1.0
    if abs(diff) <= PROOF_STRESS_TOLERANCE:
        return []
    return [
        f"monotonic_curve contradicts yield_strength: its 0.2 % proof stress "
        f"K·0.002^n = {proof:.4g} MPa differs from σ_y = {sy:.4g} MPa by {100 * diff:+.0f} % "
        f"(more than {100 * PROOF_STRESS_TOLERANCE:.0f} %); J_max, L_r and the FAD use both"
    ]


def fit_cyclic_curve(stress_amplitude, strain_amplitude, elastic_modulus: float):
    """Fit K', n' of σ_a = K'·(ε_pa)^n' to stable-loop tips by log–log least squares.

    Parameters
    ----------
    stress_amplitude : array [MPa], > 0
    strain_amplitude : array (total strain amplitude), with ε_pa = ε_a − σ_a/E > 0
    elastic_modulus : float [MPa]

    Returns
    -------
    StressStrainCurve, and the fit's standard error of log10 σ_a (dict key ``se_log10``).

    References
    ----------
    .. [1] Landgraf, R. W., Morrow, J. D., Endo, T., J. Materials 4 (1969) 176 (incremental
       step test, cyclic curve from loop tips); ASTM E606 (fit of K', n').
    """
    sa = np.asarray(stress_amplitude, float)
    ea = np.asarray(strain_amplitude, float)
    if sa.shape != ea.shape or sa.size < 3:
        raise ValidityRangeError("need at least three (stress, strain) amplitude pairs")
    epa = ea - sa / elastic_modulus
    if np.any(sa <= 0) or np.any(epa <= 0):
        raise ValidityRangeError("every loop tip needs σ_a > 0 and a positive plastic strain")
    x, y = np.log10(epa), np.log10(sa)
    n, logk = np.polyfit(x, y, 1)
    resid = y - (n * x + logk)
    se = float(math.sqrt(np.sum(resid**2) / max(sa.size - 2, 1)))
    return StressStrainCurve(float(10**logk), float(n)), {"se_log10": se}
