"""The [inspection] table: defaults, distributions and one-line errors."""

import math
import tomllib
from dataclasses import replace
from pathlib import Path

import pytest

from cycj.case import load_case
from cycj.errors import CycjInputError
from cycj.plan import scatter as sc
from cycj.plan.inputs import read_inspection

EXAMPLE = Path(__file__).resolve().parents[2] / "examples" / "plate_inspection.toml"


@pytest.fixture(scope="module")
def case():
    return load_case(EXAMPLE)


def with_inspection(case, **changes):
    raw = tomllib.loads(EXAMPLE.read_text())["inspection"]
    for k, v in changes.items():
        if v is None:
            raw.pop(k, None)
        else:
            raw[k] = v
    return replace(case, inspection=raw)


def test_example_reads(case):
    inp = read_inspection(case)
    assert inp.detectable_size == 3.0 and inp.safety_factor == 2
    assert inp.pod.a50 == pytest.approx(2.0)
    assert inp.scatter.growth_C.median == pytest.approx(1.0)
    assert inp.scatter.initial_crack.median == pytest.approx(0.5)
    # log-normal cov 0.1 → σ = √ln(1.01) (Johnson, Kotz & Balakrishnan 1994)
    assert inp.scatter.toughness.p2 == pytest.approx(math.sqrt(math.log(1.01)))


def test_detectable_size_defaults_to_a90_or_a90_95(case):
    c = with_inspection(case, detectable_size=None)
    inp = read_inspection(c)
    assert inp.detectable_size == pytest.approx(inp.pod.a90)
    c = with_inspection(
        case,
        detectable_size=None,
        pod={"model": "loglogistic", "a50": "2 mm", "sigma": 0.2, "a90_95": "3.9 mm"},
    )
    inp = read_inspection(c)
    assert inp.detectable_size == pytest.approx(3.9) and "a90/95" in inp.detectable_source


@pytest.mark.parametrize(
    "changes, words",
    [
        ({"safty_factor": 2}, "did you mean 'safety_factor'"),
        ({"pod": {"model": "lognormal", "a50": "2 mm"}}, "inspection.pod.sigma"),
        ({"pod": {"model": "gaussian", "a50": "2 mm", "sigma": 0.3}}, "unknown value"),
        ({"pod": {"a50": "2 mm", "a90": "3 mm", "sigma": 0.3}}, "exactly one of a50 and a90"),
        ({"pod": {"a50": "2 kg", "sigma": 0.3}}, "inspection.pod.a50"),
        ({"repair": "replace"}, "inspection.repair"),
        ({"target_pof": 2.0}, "inspection.target_pof"),
        ({"intervals": [1e5, -3]}, "inspection.intervals"),
        ({"schedule": [2e5, 3e6]}, "within the design life"),
        ({"design_life": None}, "inspection.design_life"),
        ({"max_samples": 10}, "inspection.max_samples"),
        ({"pof_tolerance": 0}, "inspection.pof_tolerance"),
        ({"confidence": 1.0}, "inspection.confidence"),
        ({"method": "subset"}, "inspection.method"),
        ({"hours_per_year": 0}, "inspection.hours_per_year"),
        ({"pod_lower_bound": True}, "needs a POD with a90_95"),
        (
            {"scatter": {"growth_c": {"distribution": "lognormal", "sigma": 0.3}}},
            "did you mean 'growth_C'",
        ),
        (
            {"scatter": {"toughness": {"distribution": "lognormal", "sd": 0.3}}},
            "needs exactly one spread",
        ),
        (
            {"scatter": {"toughness": {"distribution": "gamma", "cov": 0.1}}},
            "inspection.scatter.toughness.distribution",
        ),
        ({"findings": [{"cycles": 2e5, "result": "found"}]}, "inspection.findings[0].size"),
        (
            {
                "findings": [
                    {"cycles": 3e5, "result": "not-found"},
                    {"cycles": 2e5, "result": "not-found"},
                ]
            },
            "time order",
        ),
    ],
)
def test_bad_keys_give_one_line_errors(case, changes, words):
    with pytest.raises(CycjInputError) as exc:
        read_inspection(with_inspection(case, **changes))
    msg = str(exc.value)
    assert "\n" not in msg and str(EXAMPLE) in msg and words in msg


def test_weibull_and_normal_distributions(case):
    c = with_inspection(
        case,
        scatter={
            "toughness": {"distribution": "weibull", "cov": 0.1},
            "initial_crack": {"distribution": "normal", "mean": "1 mm", "sd": "0.5 mm"},
        },
    )
    inp = read_inspection(c)
    tough = inp.scatter.toughness
    assert tough.kind == "weibull" and tough.median == pytest.approx(1.0, rel=1e-9)
    import numpy as np

    draws = inp.scatter.sample(np.random.default_rng(0), 20000)
    x = draws["toughness_factor"]
    assert x.min() > 0 and x.std() / x.mean() == pytest.approx(0.1, rel=0.05)
    assert draws["a0_mm"].min() > 0  # truncated at zero


def test_weibull_shape_from_cov():
    # Weibull cov² = Γ(1+2/k)/Γ(1+1/k)² − 1 (Johnson, Kotz & Balakrishnan 1994)
    k = sc.weibull_shape_from_cov(0.1)
    cov = math.sqrt(math.gamma(1 + 2 / k) / math.gamma(1 + 1 / k) ** 2 - 1)
    assert cov == pytest.approx(0.1, rel=1e-8)


def test_findings_read(case):
    c = with_inspection(
        case,
        findings=[
            {"cycles": 2e5, "result": "not-found"},
            {
                "cycles": 3e5,
                "result": "found",
                "size": "4 mm",
                "pod": {"model": "loglogistic", "a90": "2 mm", "sigma": 0.2},
            },
        ],
    )
    f = read_inspection(c).findings
    assert not f[0].found and f[1].found
    assert f[1].sizing_sd_mm == pytest.approx(0.4)  # default 10 % of the size
    assert f[1].pod.a90 == pytest.approx(2.0)
