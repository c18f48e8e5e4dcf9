"""J2 deformation plasticity with the Ramberg–Osgood curve (a nonlinear elastic solid).

Uniaxially the law is cycj's curve ε = σ/E + (σ/K)^(1/n'); in three dimensions (small strain)

    ε_ij = (1+ν)/E·s_ij + (1−2ν)/(3E)·σ_kk·δ_ij + (3/2)·(σ_e/K)^(1/n')·s_ij/σ_e,

so the mean stress is K_b·ε_kk (K_b = E/(3(1−2ν))), and given the deviatoric strain e the
deviatoric stress is s = (2/3)·(σ_e/ε_e)·e, with σ_e the root of the one scalar equation

    ε_e = σ_e/(3G) + (σ_e/K)^(1/n'),   ε_e = √(2/3·e:e),  G = E/(2(1+ν)),

solved per integration point by Newton's method on ln σ_e.  The strain energy density follows
the same law: W = ½K_b·ε_kk² + σ_e²/(6G) + σ_e·ε_p/(1+n'), ε_p = (σ_e/K)^(1/n').  The tangent
∂σ/∂ε = K_b·1⊗1 + 2G_s·P_dev + (4/9)(E_t − 3G_s)/ε_e²·e⊗e (G_s = σ_e/(3ε_e), E_t = dσ_e/dε_e)
is symmetric and positive definite.  Plane strain sets ε_zz = 0; plane stress finds ε_zz with
σ_zz = 0 by a local Newton iteration and condenses the tangent.

Units: MPa, strains dimensionless, W in MPa (= mJ/mm³).  Valid for proportional (monotonic)
loading, where deformation and incremental J2 plasticity agree; not for unloading.

References
----------
.. [1] Ramberg, W., Osgood, W. R., NACA TN 902 (1943): the curve.
.. [2] Hencky, H. (1924); Ilyushin, A. A. (1946): J2 deformation theory, as used for the fully
   plastic crack solutions of Kumar, German & Shih, EPRI NP-1931 (1981) (from memory).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

_M = np.array([1.0, 1.0, 1.0, 0.0])  # δ_ij in (xx, yy, zz, xy)


@dataclass(frozen=True)
class DeformationLaw:
    """E [MPa], ν, K [MPa], n' of ε = σ/E + (σ/K)^(1/n'); ``plane_strain`` or plane stress.

    The methods take an optional boolean mask ``elastic`` over the integration points: those
    points stay linear elastic (round point loads and supports).  Validity: 0 ≤ ν < 0.5,
    0 < n' ≤ 1, proportional loading."""

    E: float
    nu: float
    K: float
    n_prime: float
    plane_strain: bool = True

    def __post_init__(self):
        if not (self.E > 0 and 0 <= self.nu < 0.5 and self.K > 0 and 0 < self.n_prime <= 1):
            raise ValueError("need E > 0, 0 ≤ ν < 0.5, K > 0 and 0 < n' ≤ 1")

    @property
    def G(self) -> float:
        return self.E / (2 * (1 + self.nu))

    @property
    def bulk(self) -> float:
        return self.E / (3 * (1 - 2 * self.nu))

    def effective_stress(self, eps_e, elastic=None):
        """σ_e [MPa] for equivalent strain ε_e (arrays); ``elastic`` marks linear points."""
        eps_e = np.asarray(eps_e, float)
        g3, k, big_n = 3 * self.G, self.K, 1.0 / self.n_prime
        pos = eps_e > 0
        e = np.where(pos, eps_e, 1.0)
        sig = np.minimum(g3 * e, k * e**self.n_prime)
        for _ in range(60):
            ep = (sig / k) ** big_n
            total = sig / g3 + ep
            step = np.log(total / e) * total / (sig / g3 + big_n * ep)
            sig = sig * np.exp(-step)
            if np.max(np.abs(step)) < 1e-13:
                break
        if elastic is not None:
            sig = np.where(elastic, g3 * e, sig)
        return np.where(pos, sig, 0.0)

    def response3d(self, eps4, elastic=None, tangent=True):
        """Stress (…, 4), tangent (…, 4, 4) and W (…) for strains (xx, yy, zz, γ_xy)."""
        tr = eps4[..., 0] + eps4[..., 1] + eps4[..., 2]
        e = eps4.copy()
        e[..., :3] -= tr[..., None] / 3
        e[..., 3] *= 0.5  # tensor shear component
        ee = np.sqrt(np.maximum(2.0 / 3.0 * (np.sum(e[..., :3] ** 2, -1) + 2 * e[..., 3] ** 2), 0))
        sig_e = self.effective_stress(ee, elastic)
        g3 = 3 * self.G
        small = ee <= 1e-300
        safe = np.where(small, 1.0, ee)
        gs = np.where(small, self.G, sig_e / (3 * safe))
        stress = 2 * gs[..., None] * e + self.bulk * tr[..., None] * _M
        ep = np.where(small, 0.0, (sig_e / self.K) ** (1.0 / self.n_prime))
        if elastic is not None:
            ep = np.where(elastic, 0.0, ep)
        w = 0.5 * self.bulk * tr**2 + sig_e**2 / (2 * g3) + sig_e * ep / (1 + self.n_prime)
        if not tangent:
            return stress, None, w
        slope = np.where(small, 0.0, ep / self.n_prime / np.where(small, 1.0, sig_e))
        et = 1.0 / (1.0 / g3 + slope)
        c = np.where(small, 0.0, 4.0 / 9.0 * (et - 3 * gs) / safe**2)
        d = np.zeros(eps4.shape + (4,))
        d += self.bulk * np.outer(_M, _M)
        pdev = np.diag([1.0, 1.0, 1.0, 0.5]) - np.outer(_M, _M) / 3
        pdev[3, :3] = pdev[:3, 3] = 0.0
        d += 2 * gs[..., None, None] * pdev
        d += c[..., None, None] * e[..., :, None] * e[..., None, :]
        return stress, d, w

    def response(self, eps, ezz=None, elastic=None, tangent=True):
        """In-plane stress (…, 3), tangent (…, 3, 3), W (…) and ε_zz for strains
        (ε_xx, ε_yy, γ_xy); ``ezz`` is the starting guess of ε_zz in plane stress."""
        shape = eps.shape[:-1]
        eps4 = np.zeros(shape + (4,))
        eps4[..., [0, 1, 3]] = eps
        ip = [0, 1, 3]
        if self.plane_strain:
            s, d, w = self.response3d(eps4, elastic, tangent)
            return s[..., ip], None if d is None else d[..., ip][..., ip, :], w, None
        if ezz is None:
            ezz = -self.nu / (1 - self.nu) * (eps[..., 0] + eps[..., 1])
        eps4[..., 2] = ezz
        for _ in range(50):
            s, d, w = self.response3d(eps4, elastic, True)
            szz = s[..., 2]
            step = szz / d[..., 2, 2]
            eps4[..., 2] -= step
            if np.max(np.abs(szz)) < 1e-10 * (1 + np.max(np.abs(s))):
                break
        s, d, w = self.response3d(eps4, elastic, True)
        dp = d[..., ip][..., ip, :]
        if tangent:
            dz = d[..., ip, 2]
            dp = dp - dz[..., :, None] * dz[..., None, :] / d[..., 2, 2][..., None, None]
        return s[..., ip], dp if tangent else None, w, eps4[..., 2]
