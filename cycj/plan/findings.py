"""Updating the Monte Carlo samples on what inspections found (Bayes, by reweighting).

A finding is one inspection already done, at ``cycles``:

* ``not-found``: nothing was found; likelihood 1 − POD(a(N)) with the inspection's POD;
* ``found``: a crack of measured size s was found; likelihood POD(a(N))·φ((s − a(N))/σ_s)/σ_s,
  with σ_s the sizing error (normal).

The part was intact at each finding, so samples that failed before it get weight 0.  The
cracks are not repaired by the findings (the plan re-starts from the last one with the crack
in place).  Posterior weights are the product of likelihoods; the probability of failure over
the rest of the design life is the weighted mean (importance sampling with the prior as the
proposal).

References
----------
.. [1] Berens, A. P., ASM Handbook Vol. 17 (1989) 689–701 (POD as detection likelihood).
.. [2] Smith, A. F. M., Gelfand, A. E., "Bayesian statistics without tears: a sampling–
   resampling perspective", *Am. Stat.* 46 (1992) 84–88 (weighting prior samples).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from cycj.plan.pod import PodCurve


@dataclass(frozen=True)
class Finding:
    """One past inspection: ``cycles``, ``found``, measured ``size_mm`` and ``sizing_sd_mm``
    (when found), and the ``pod`` of the method used."""

    cycles: float
    found: bool
    pod: PodCurve
    size_mm: float | None = None
    sizing_sd_mm: float | None = None


def finding_likelihood(a_mm, finding: Finding):
    """Likelihood of ``finding`` for cracks of size ``a_mm`` at its time (array)."""
    p = finding.pod(a_mm)
    if not finding.found:
        return 1.0 - p
    sd = finding.sizing_sd_mm
    z = (finding.size_mm - a_mm) / sd
    return p * np.exp(-0.5 * z * z) / (sd * math.sqrt(2 * math.pi))


def apply_findings(draws: dict, table, findings) -> tuple[np.ndarray, np.ndarray]:
    """Posterior weights and ln crack size at the last finding, for one chunk's samples.

    ``draws`` as from :func:`cycj.plan.montecarlo.draw_chunk`; ``findings`` in time order.
    """
    k, w, xc = draws["k"], draws["w"], draws["xc"]
    phi0 = table.phi(draws["la0"], k, w)
    weights = np.ones(phi0.size)
    la_now = draws["la0"]
    for f in findings:
        phi_t = phi0 + xc * f.cycles
        alive = phi_t < draws["phic"]
        la_now = table.log_size(np.minimum(phi_t, draws["phic"]), k, w)
        weights = weights * np.where(alive, finding_likelihood(np.exp(la_now), f), 0.0)
    return weights, la_now
