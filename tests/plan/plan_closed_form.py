"""Closed-form Paris-law growth of a centre crack in an infinite plate, for the plan tests.

K = S·√(πa) (exact, Tada–Paris–Irwin), ΔJ = ΔK²/E', da/dN = C·ΔJ^m.  With B = Δσ²π/E':
N(a0 → a) = (a0^(1−m) − a^(1−m)) / ((m − 1)·C·(s²B)^m) for a load factor s, and the critical
size from J_max = J_c·t: a_c = t·J_c·E'/(π·(s·σ_max)²).

BS 7910:2013+A1:2015 §8, docs/references.md R13 (from memory): C_K = 1.648e-8 mm/cycle per
(MPa√m)^3, m_K = 3; Δσ = 100 MPa, a = 1 → 10 mm gives N = 4.714e5 cycles.
"""

import math

import numpy as np

E_PRIME = 200_000.0  # MPa (plane stress)
C_K = 1.648e-8 / 1000.0**1.5  # mm/cycle per (MPa√mm)^3 (docs/references.md R13, from memory)
M_J = 1.5  # m_K/2
C_J = C_K * E_PRIME**M_J  # mm/cycle per (kJ/m²)^1.5
DSIGMA = 100.0  # MPa, R = 0
SIGMA_MAX = 100.0
J_C = 12.0  # kJ/m² → a_c = 76.4 mm at s = t = 1


def b_coef(s=1.0):
    return (s * DSIGMA) ** 2 * math.pi / E_PRIME


def cycles(a0, a, s=1.0, c=C_J, m=M_J):
    """Cycles from a0 to a [mm] (closed form)."""
    return (a0 ** (1 - m) - a ** (1 - m)) / ((m - 1) * c * b_coef(s) ** m)


def size_after(a0, n, s=1.0, c=C_J, m=M_J):
    """Crack size after n cycles from a0 (closed form inverse)."""
    return (a0 ** (1 - m) - (m - 1) * c * b_coef(s) ** m * n) ** (1 / (1 - m))


def critical_size(s=1.0, t=1.0):
    return t * J_C * E_PRIME / (math.pi * (s * SIGMA_MAX) ** 2)


def growth_curve(a_start, s=1.0, t_max=1.0, n=4000):
    """(a_mm, cycles) from a_start to the critical size at toughness factor t_max."""
    a = np.geomspace(a_start, critical_size(s, t_max), n)
    return a, cycles(a_start, a, s)
