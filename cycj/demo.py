"""``cycj demo``: an invented scenario written to a folder and run end to end (fit → run → plan).

Scenario (invented for cycj): the cast-steel lug that carries the hydraulic cylinder of a
log-loading crane on a forestry trailer.  Each lift is a load cycle with gross local yielding at
the lug's bore; a crack of 1.2 mm was found at a casting pore.  Two compact tension specimens of
the same steel were cycled in an imaginary lab frame (R = 0.1 with closure, R = 0.5 without); the
growth constants fitted to their logs go into the case, which then predicts the remaining life
and plans inspections.

Layout of the folder::

    inputs/   specimen.toml, lab_r01.csv, lab_r05.csv, lift_history.csv, lug.toml
    fit/      outputs of the fit (fit.json, growth_snippet.toml, report.html …)
    life/     outputs of the remaining-life run (summary.json, history.csv, report.html …)
    plan/     outputs of the inspection plan (plan.json, what_if.csv, report.html …)
"""

from __future__ import annotations

from pathlib import Path

#: the true law of the virtual lab (da/dN = C·ΔJ_eff^m, mm/cycle, kJ/m²)
TRUE_C, TRUE_M = 8e-5, 1.45

SPECIMEN = """\
# Invented: C(T) specimen of the lug's cast steel, front-face clip gauge.
label = "lug steel C(T)"
shape = "compact-tension"
width = "50 mm"
thickness = "12.5 mm"
crack_length = "15 mm"
constraint = "plane-strain"
elastic_modulus = "203 GPa"
poisson_ratio = 0.3
yield_strength = "420 MPa"
tensile_strength = "590 MPa"
cyclic_curve = { strength_coefficient = "760 MPa", hardening_exponent = 0.14 }
displacement_at = "front-face"
log_units = { load = "kN", displacement = "mm", crack_length = "mm" }
# the virtual lab's crack opens abruptly: compliance-offset segments at their lower ends
opening_segment_point = "lower-end"
"""

CASE = """\
# Invented demonstration case (cycj demo): the cylinder lug of a log-loading crane on a
# forestry trailer.  Each lift is one pass of lift_history.csv (nominal stress at the lug's
# net section, local factor 1.6 for the bore); a 1.2 mm crack was found at a casting pore.
title = "Crane cylinder lug, crack at a casting pore"

[material]
elastic_modulus = "203 GPa"
poisson_ratio = 0.3
yield_strength = "420 MPa"
tensile_strength = "590 MPa"
cyclic_curve = { strength_coefficient = "760 MPa", hardening_exponent = 0.14 }
monotonic_curve = { strength_coefficient = "842 MPa", hardening_exponent = 0.112 }
toughness = { J_c = "95 kJ/m^2" }
{growth}

[geometry]
shape = "edge-crack-plate"
width = "40 mm"
thickness = "30 mm"
crack_length = "1.2 mm"
constraint = "plane-strain"

[loading]
history = "lift_history.csv"
column = "stress"
unit = "MPa"
quantity = "stress"
scale = 1.6
gate = "4 MPa"
duration = "0.05 h"
closure = "newman"

[analysis]
j_method = "reference-stress"
fad = "option-2"

[run]
method = "auto"
max_cycles = 1e8
crack_length_limit = "30 mm"
criteria = ["toughness", "collapse", "size-limit"]

[inspection]
detectable_size = "2.5 mm"
safety_factor = 2
design_life = 1.2e5
pod = { model = "lognormal", a50 = "1.5 mm", sigma = 0.45 }
samples = 2000
seed = 20
target_pof = 1.0e-3
repair = "renew"

[inspection.scatter]
growth_C = { distribution = "lognormal", sigma = 0.35 }
initial_crack = { distribution = "lognormal", median = "0.4 mm", sigma = 0.5 }
toughness = { distribution = "lognormal", cov = 0.1 }
"""


def lift_history(seed: int = 20):
    """One lift of the crane as nominal stress samples [MPa] (invented): a rise to a
    random-amplitude working level with sway oscillations, an occasional jerk, and the return.

    Built with :mod:`cycj.spectrum.generators` (Gaussian process of irregularity 0.8 plus
    inserted overloads)."""
    import numpy as np

    from cycj.spectrum.generators import gaussian_from_irregularity, insert_excursions

    sway = gaussian_from_irregularity(240, 0.8, 12.0, mean=105.0, seed=seed)[0]
    sway = insert_excursions(sway, 80, 150.0)
    return np.concatenate([[5.0, 60.0], sway, [60.0, 5.0]])


def write_inputs(folder: Path, *, seed: int = 20) -> dict:
    """Write the scenario's inputs (the case without its growth law yet) into ``folder``."""
    import pandas as pd

    from cycj.calibrate.simulate import simulate_test
    from cycj.calibrate.specimen import read_specimen

    folder.mkdir(parents=True, exist_ok=True)
    spec_path = folder / "specimen.toml"
    spec_path.write_text(SPECIMEN, encoding="utf-8")
    spec = read_specimen(spec_path)
    logs = []
    for name, kw in (
        ("lab_r01.csv", dict(p_max=15000, r_ratio=0.1, opening_fraction=0.2, seed=seed + 1)),
        ("lab_r05.csv", dict(p_max=17000, r_ratio=0.5, opening_fraction=0.0, seed=seed + 2)),
    ):
        sim = simulate_test(spec, TRUE_C, TRUE_M, record_every=1500, samples=40, crack_end=27, **kw)
        raw = sim.raw.copy()
        raw["load"] = (raw["load"] / 1000).round(5)
        raw["displacement"] = raw["displacement"].round(6)
        raw.to_csv(folder / name, index=False)
        logs.append(folder / name)
    pd.DataFrame({"stress": lift_history(seed).round(3)}).to_csv(
        folder / "lift_history.csv", index=False
    )
    return {
        "specimen": spec_path,
        "logs": logs,
        "history": folder / "lift_history.csv",
        "case": folder / "lug.toml",
    }


def case_text(snippet: str) -> str:
    """The case file with the fitted ``growth = {...}`` snippet (and its comments)."""
    return CASE.replace("{growth}", snippet.rstrip())


def run_demo(folder, *, force: bool = False, echo=print) -> dict:
    """Write the scenario into ``folder`` and run fit → run → plan; returns output folders.

    The inputs are written through :class:`cycj.outputs.OutputDir` (a non-empty folder is
    refused unless ``force``); each stage then writes its own folder atomically.
    """
    from cycj.calibrate.fit import fit_logs
    from cycj.calibrate.write import write_outputs
    from cycj.case import load_case
    from cycj.life.write import answer_sentence as life_answer
    from cycj.life.write import run_and_write
    from cycj.outputs import OutputDir, adopt_file
    from cycj.plan.inspections import plan_inspections
    from cycj.plan.write import answer_sentence as plan_answer
    from cycj.plan.write import write_plan

    root = Path(folder)
    with OutputDir(root, force=force) as od:
        write_inputs(od.path("inputs"))
    inp = root / "inputs"
    paths = {"inputs": inp, "fit": root / "fit", "life": root / "life", "plan": root / "plan"}
    echo(f"inputs: {inp}/ (specimen.toml, lab_r01.csv, lab_r05.csv, lift_history.csv)")

    logs = [inp / "lab_r01.csv", inp / "lab_r05.csv"]
    fit = fit_logs(logs, inp / "specimen.toml")
    write_outputs(fit, paths["fit"], logs=logs, specimens=[inp / "specimen.toml"])
    echo(
        f"fit:    C = {fit.C:.4g}, m = {fit.m:.4g} (virtual lab: {TRUE_C:g}, {TRUE_M:g}) "
        f"-> {paths['fit']}/"
    )

    case_path = inp / "lug.toml"
    case_path.write_text(case_text(fit.snippet), encoding="utf-8")
    adopt_file(root, "inputs/lug.toml")  # cycj's own file: --force may replace it
    echo(f"case:   {case_path} (growth law from {paths['fit'] / 'growth_snippet.toml'})")
    case = load_case(case_path)
    life = run_and_write(case, paths["life"])
    echo(f"run:    {life_answer(life)} -> {paths['life']}/")

    plan = plan_inspections(case)
    summary = write_plan(plan, case, paths["plan"])
    echo(f"plan:   {plan_answer(summary)} -> {paths['plan']}/")
    echo(f"reports: {', '.join(str(paths[k] / 'report.html') for k in ('fit', 'life', 'plan'))}")
    return paths
