"""Growth-law parameters as data: da/dN = C·ΔJ^m with threshold, basis and units resolved.

The compiled laws live in :mod:`cycj.growth`; this module only holds and converts parameters.

References
----------
.. [1] Paris, P. C., Erdogan, F., J. Basic Eng. 85 (1963) 528: da/dN = C·ΔK^m.
.. [2] Dowling, N. E., Begley, J. A., ASTM STP 590 (1976) 82: da/dN = C·ΔJ^m.
.. [3] ΔJ = ΔK²/E' (Rice 1968), so m_J = m_K/2 and C_J = C_K·E'^(m_K/2).
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class GrowthLaw:
    """da/dN [mm/cycle] = C·ΔJ^m (ΔJ in kJ/m²), zero below ``threshold`` [kJ/m²].

    ``basis`` is ``"applied"`` (fitted on the applied range) or ``"effective"`` (fitted on the
    range above the opening load).  ``toughness_exponent`` q > 0 adds the acceleration
    1/(1 − J_max/J_c)^q as J_max nears the toughness (0 = none).
    """

    C: float
    m: float
    threshold: float = 0.0
    basis: str = "applied"
    law: str = "paris"
    toughness_exponent: float = 0.0
    converted_from: dict | None = None

    def rate(self, delta_j):
        """da/dN [mm/cycle] for ΔJ [kJ/m²] (vectorised; no acceleration term)."""
        import numpy as np

        from cycj.growth import paris_rate

        return np.vectorize(paris_rate, otypes=[float])(np.asarray(delta_j, float), self.C,
                                                        self.m, self.threshold)


def from_delta_k(C_k: float, m_k: float, e_prime: float, threshold_k: float = 0.0,
                 **kw) -> GrowthLaw:
    """Convert da/dN = C_K·ΔK^m_K (mm/cycle, ΔK in MPa√mm) to the ΔJ form.

    ΔK = √(E'·ΔJ) ⇒ da/dN = C_K·E'^(m_K/2)·ΔJ^(m_K/2);  ΔJ_th = ΔK_th²/E'.
    """
    return GrowthLaw(C=C_k * e_prime ** (m_k / 2), m=m_k / 2,
                     threshold=threshold_k**2 / e_prime, **kw)
