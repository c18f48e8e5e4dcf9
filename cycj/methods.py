"""Records of the methods a run uses without the user naming them (kind ``method``).

Each is declared once here with its citation; the stage that applies a method cites it in the
run's :class:`cycj.citations.Citations` at the moment it is used (rainflow counting when a
history is counted, block integration when the block method runs, and so on).  Sources marked
``from memory`` are recalled, not confirmed against the printed text (docs/references.md).
"""

from __future__ import annotations

from cycj.models import register

_METHODS = {
    # job 1: life
    "rainflow": (
        "ASTM E1049-85 (reapproved 2017), Standard Practices for Cycle Counting in "
        "Fatigue Analysis: rainflow counting",
    ),
    "range-mean-matrices": (
        "ASTM E1049-85 (reapproved 2017) §5.4: range–mean and from–to matrices of the count",
        "Matsuishi, M., Endo, T. (1968), Fatigue of metals subjected to varying stress, "
        "Japan Society of Mechanical Engineers: the rainflow method",
    ),
    "compressive-part-excluded": (
        "ASTM E647: the compressive part of a cycle (P < 0) is "
        "excluded from the driving-force range",
    ),
    "delta-k-conversion": (
        "Paris, P. C., Erdogan, F., J. Basic Eng. 85 (1963) 528–534: "
        "da/dN = C·ΔK^m, converted with ΔJ = ΔK²/E'",
    ),
    "block-integration": (
        "Block integration of the repeated history with the crack frozen "
        "within a block, dN/da = n/G(a) (common practice; checked against "
        "the cycle stepper)",
    ),
    "weight-functions": (
        "Glinka, G., Shen, G., Eng. Fract. Mech. 40 (1991) 1135–1146: "
        "universal weight functions, K of an arbitrary stress profile",
    ),
    "plate-reference-stress": (
        "BS 7910:2013+A1:2015, Annex P: reference stress of a surface "
        "flaw in a plate under membrane and bending stress "
        "(from memory)",
    ),
    "residual-stress": (
        "R6 Rev. 4, Section II.2 and BS 7910:2013+A1:2015 §7.3: secondary "
        "(residual) stresses in K_r with the plasticity interaction ρ",
    ),
    "surface-to-through": (
        "BS 7910:2013+A1:2015 §8: a surface flaw that breaks through is "
        "re-characterised as a through-thickness flaw of the same length "
        "(from memory)",
    ),
    # job 2: calibration
    "e647-reduction": (
        "ASTM E647, Standard Test Method for Measurement of Fatigue Crack Growth "
        "Rates: secant and incremental polynomial da/dN, reading spacing, "
        "operational threshold",
    ),
    "compliance-crack-length": (
        "ASTM E647: crack length from unloading compliance, opening load by compliance offset",
        "Saxena, A., Hudak, S. J., Int. J. Fract. 14 (1978) 453: C(T) load-line compliance",
        "Tada, Paris & Irwin, The Stress Analysis of Cracks Handbook (2000): compliance from K",
    ),
    "loop-area-delta-j": (
        "Dowling, N. E., Begley, J. A., ASTM STP 590 (1976) 82–103: ΔJ from "
        "the loop area above the crack-opening point",
        "ASTM E1820, Standard Test Method for Measurement of Fracture "
        "Toughness: η factors, B_e, ligament size b > 10·J/σ_Y",
    ),
    "reference-stress-specimen": (
        "Ainsworth, R. A., Eng. Fract. Mech. 19 (1984) 633–642: "
        "reference stress J (shapes without an η factor)",
    ),
    "cluster-bootstrap": (
        "Davison, A. C., Hinkley, D. V., Bootstrap Methods and their Application, Cambridge "
        "University Press (1997) §3.8: resampling whole specimens (cluster bootstrap) for "
        "intervals of C, m and da/dN (section from memory)",
    ),
    "moving-block-bootstrap": (
        "Künsch, H. R., Ann. Statist. 17 (1989) 1217–1241: the moving-block bootstrap of a "
        "serially correlated series",
        "Davison, A. C., Hinkley, D. V., Bootstrap Methods and their Application (1997) §8.2: "
        "block resampling of a dependent series (section from memory)",
    ),
    "between-specimen-scatter": (
        "Laird, N. M., Ware, J. H., Biometrics 38 (1982) 963–974: random-effects model, one "
        "intercept ln C per specimen with m fixed; the scatter of ln C between specimens",
    ),
    # job 3: planning
    "life-scaling": (
        "Paris, P. C., Erdogan, F., J. Basic Eng. 85 (1963) 528–534: life scales as 1/C",
    ),
    "monte-carlo": (
        "Rubinstein, R. Y., Kroese, D. P., Simulation and the Monte Carlo Method, "
        "3rd ed. (2016): common random numbers, importance weights",
    ),
    "common-random-numbers": (
        "Rubinstein, R. Y., Kroese, D. P., Simulation and the Monte Carlo Method, "
        "3rd ed. (2016), §5.2: common random numbers across the candidate intervals",
    ),
    "isotonic-regression": (
        "Barlow, R. E., Bartholomew, D. J., Bremner, J. M., Brunk, H. D., Statistical "
        "Inference under Order Restrictions, Wiley (1972): pool-adjacent-violators fit",
    ),
    "importance-sampling": (
        "Rubinstein, R. Y., Kroese, D. P., Simulation and the Monte Carlo Method, "
        "3rd ed. (2016), §5.7: importance sampling, here a normal density shifted to the "
        "design point",
    ),
    "cross-entropy": (
        "Rubinstein, R. Y., Kroese, D. P., The Cross-Entropy Method, Springer (2004), ch. 3: "
        "multi-level centre of the importance-sampling density",
    ),
    "subset-simulation": (
        "Au, S.-K., Beck, J. L., Probabilistic Engineering Mechanics 16 (2001) 263–277: "
        "subset simulation (cross-check of the no-inspection probability of failure)",
    ),
    "form": (
        "Hasofer, A. M., Lind, N. C., J. Eng. Mech. Div. ASCE 100 (1974) 111–121: "
        "reliability index",
        "Rackwitz, R., Fiessler, B., Comput. Struct. 9 (1978) 489–494: design-point iteration",
    ),
}

for _code, (_name, _citation) in enumerate(_METHODS.items()):
    register("method", _name, _code, citation=_citation)
