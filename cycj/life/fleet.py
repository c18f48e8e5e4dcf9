"""A fleet of cases (one per component) run in parallel, optionally on a Dask cluster.

Each case writes its own output folder; the fleet table lists them by remaining life.
"""

from __future__ import annotations

from pathlib import Path


def _run_one(case_file: str, out: str, method, force):
    from cycj.case import load_case
    from cycj.errors import CycjInputError, ValidityRangeError
    from cycj.life.write import run_and_write

    try:
        case = load_case(case_file)
        s = run_and_write(case, Path(out), method=method, force=force)
        return {
            "case": case_file,
            "title": case.title,
            "j_method": case.analysis.j_method,
            "cycles_to_end": s["cycles_to_end"],
            "end_reason": s["end_reason"],
            "a_end_mm": s["a_end_mm"],
            "hours_to_end": s.get("hours_to_end"),
            "output": out,
            "error": "",
        }
    except (CycjInputError, ValidityRangeError) as exc:
        return {
            "case": case_file,
            "title": "",
            "j_method": "",
            "cycles_to_end": float("nan"),
            "end_reason": "",
            "a_end_mm": float("nan"),
            "hours_to_end": None,
            "output": "",
            "error": str(exc),
        }


def run_fleet(case_files, out_dir=None, *, method=None, force=False, scheduler=None):
    """Run every case; return a DataFrame sorted by remaining life (shortest first).

    ``scheduler``: address of a running Dask distributed scheduler (``tcp://HOST:PORT``);
    without it the cases run one after another in this process.  The table is also written to
    ``OUT/fleet.csv``.
    """
    import pandas as pd

    from cycj.case import load_case
    from cycj.errors import CycjInputError, ValidityRangeError
    from cycj.outputs import OutputDir

    for f in case_files:  # note every file the cases read: the output folder may hold none
        try:
            load_case(f)
        except (CycjInputError, ValidityRangeError):
            pass  # reported in the case's row
    root = Path(out_dir or "out/run-fleet")
    with OutputDir(root, force=force, inputs=case_files) as od:
        jobs = [(str(f), str(od.path(Path(f).stem)), method, False) for f in case_files]
        if scheduler:
            try:
                from dask.distributed import Client
            except ImportError as exc:  # pragma: no cover - optional dependency
                raise RuntimeError("--scheduler needs dask[distributed] installed") from exc
            with Client(scheduler) as client:
                futures = [client.submit(_run_one, *j, pure=False) for j in jobs]
                rows = client.gather(futures)
        else:
            rows = [_run_one(*j) for j in jobs]
        table = pd.DataFrame(rows).sort_values("cycles_to_end", na_position="last")
        for r in rows:
            r["output"] = r["output"].replace(str(od.tmp), str(root)) if r["output"] else ""
        table["output"] = [
            str(root / Path(r["output"]).name) if r["output"] else ""
            for r in table.to_dict("records")
        ]
        od.write_csv("fleet.csv", table)
    return table
