# %% [markdown]
# # A tour of cycj's Python API
#
# A script in notebook form (`# %%` cells: open it in Jupyter with jupytext, VS Code or
# Spyder, or run it whole with `python examples/api_tour.py` from the repository root).  It
# walks the three jobs on the bundled invented examples: read a case, predict its remaining
# life, count a load history, fit growth constants to test logs, plan inspections, and
# tabulate J by finite elements.  Settings are kept small so that the tour runs in a minute.
#
# Caution: cycj gives estimates for engineering judgement; they do not replace the applicable
# design code, fitness-for-service standard or a qualified engineer's review.

# %%
import tomllib
from pathlib import Path

import numpy as np

import cycj
from cycj.case import case_from_dict

ROOT = Path(__file__).resolve().parents[1] if "__file__" in globals() else Path.cwd()
EX = ROOT / "examples"

# %% [markdown]
# ## 1. A case and its remaining life
# `load_case` validates the file and returns every quantity in internal units
# (N, mm, MPa, kJ/m², h); `predict_life` integrates the growth law until an end criterion.

# %%
case = cycj.load_case(EX / "lab_compact_tension.toml")
print(case.title, "|", case.geometry.shape.name, "| a0 =", case.geometry.crack_length, "mm")
life = cycj.predict_life(case)
s = life.summary
print(f"ends by {s['end_reason']} after {s['cycles_to_end']:.4g} cycles")
print(life.history[["cycle", "a_mm", "dJ_kJm2"]].tail(3).to_string(index=False))

# %% [markdown]
# ## 2. Counting a load history
# `count_cycles` is the rainflow count (ASTM E1049) of an array of loads.

# %%
loads = np.array([0.0, 10.0, 2.0, 8.0, 1.0, 9.0, 0.0])
cycles = cycj.count_cycles(loads, gate=0.0)
print(cycles.to_string(index=False))

# %% [markdown]
# ## 3. Growth constants from test logs
# `fit_logs` reduces raw C(T) logs (load, displacement per loop) to rates and fits
# da/dN = C·ΔJ^m with intervals; few resamples here to keep the tour quick.

# %%
fit = cycj.fit_logs(
    [EX / "lab_log_ct_r01.csv", EX / "lab_log_ct_r05.csv"],
    EX / "lab_specimen_ct.toml",
    resamples=100,
)
f = fit.summary
print(f"C = {f['C']:.4g}, m = {f['m']:.4g} ({f['recommended_fit']} fit)")
print(fit.snippet.strip().splitlines()[-1])

# %% [markdown]
# ## 4. Inspection planning
# The deck plate case carries an `[inspection]` table; the tour shrinks its sample budget
# (a case is a dict before it is validated, so any key can be changed in code).

# %%
raw = tomllib.loads((EX / "plate_inspection.toml").read_text(encoding="utf-8"))
raw["inspection"].update(samples=2000, max_samples=2000, intervals=[1.0e5, 2.0e5])
plate = case_from_dict(raw, source="plate_inspection.toml (tour)", base=EX)
plan = cycj.plan_inspections(plate, workers=1)
print("deterministic interval [cycles]:", plan.summary["deterministic"]["interval_cycles"])

# %% [markdown]
# ## 5. J by finite elements
# `j_table` solves the 2-D elastic–plastic problem of a C(T) for a few crack sizes and loads.

# %%
table = cycj.j_table(case, sizes=2, loads=2)
print(table[["a_mm", "load_N", "J_kJm2", "dJ_kJm2"]].to_string(index=False))
