"""Output files of a J table: jtable.csv, jtable.json, plots and report.html."""

from __future__ import annotations

#: files written by :func:`write_outputs`
OUTPUT_FILES = ("jtable.csv", "jtable.json", "j_vs_load.png", "dj_vs_range.png", "report.html")
CAPTIONS = {
    "j_vs_load.png": "J at peak load against load per crack size (finite elements), with the "
    "elastic K²/E' and the reference-stress estimate",
    "dj_vs_range.png": "ΔJ against load range on the Masing curve, with the elastic ΔK²/E'",
}


def answer(info: dict, frame) -> str:
    from cycj.display import count, num

    return (
        f"{count(len(frame))} rows ({frame['a_mm'].nunique()} crack sizes) of J and ΔJ for the "
        f"{info['shape']} ({info['constraint']}); largest model {count(info['dofs_max'])} "
        f"degrees of freedom; worst spread between the {info['domains']} domains "
        f"{num(100 * info['worst_domain_spread'], 3)} %; {num(info['seconds'], 3)} s."
    )


def summary(case, frame, info) -> dict:
    from cycj.outputs import record_provenance

    out = {
        "title": case.title,
        "columns": list(frame.columns),
        "rows": len(frame),
        "crack_sizes_mm": sorted(frame["a_mm"].unique().tolist()),
        "units": {"load": "N", "stress": "MPa", "J": "kJ/m^2", "length": "mm"},
        "load_meaning": "load_N is the peak load for J_kJm2 and the load range for dJ_kJm2",
        **info,
    }
    record_provenance(
        out,
        {"case": case.path},
        method="2-D finite elements, J2 deformation plasticity, equivalent domain integral",
    )
    return out


def write_outputs(od, case, frame, info, plots: bool = True):
    """Write the table, its JSON and (optionally) the plots and report into ``od``."""
    from cycj.fe.plots import j_vs_load

    data = summary(case, frame, info)
    files = [od.write_csv("jtable.csv", frame)]
    figs = []
    if plots:
        for name, col in (("j_vs_load.png", "J_kJm2"), ("dj_vs_range.png", "dJ_kJm2")):
            p = od.savefig(name, j_vs_load(frame, col))
            files.append(p)
            figs.append((CAPTIONS[name], p))
        files.append(_report(od, case, frame, info, figs))
    data["outputs"] = [str(od.final_path(p.name)) for p in files] + [
        str(od.final_path("jtable.json"))
    ]
    od.write_json("jtable.json", data)
    return data


def _report(od, case, frame, info, figs):
    from cycj.display import num, units
    from cycj.report import write_report
    from cycj.report_inputs import geometry_rows, material_rows

    u = units()
    inputs = [
        ("case", str(case.path)),
        *material_rows(case.material, case.geometry.plane_strain),
        *geometry_rows(case.geometry),
        ("curve for J at peak load", info["curve_for_J"]),
        ("Masing coefficient K* = 2^(1−n')K'", u.q(info["masing_coefficient_MPa"], "stress")),
        ("elements per ring", 16 * info["refine"]),
        ("domains", info["domains"]),
    ]
    warnings = []
    if info["worst_domain_spread"] > 0.01:
        warnings.append("domains differ by more than 1 %: refine the mesh ([fe] refine)")
    warnings.append(
        "deformation plasticity: exact for proportional loading only; ΔJ uses the Masing "
        "branch of the stable cyclic curve"
    )
    return write_report(
        od.path("report.html"),
        title=f"J table by finite elements: {case.title}",
        question="What are J at peak load and ΔJ for a load range at each crack size, from a "
        "2-D elastic-plastic finite-element solution?",
        answer=answer(info, frame),
        inputs=inputs,
        figures=figs,
        tables=[("J table", frame)],
        validity=[
            (
                "crack sizes tabulated",
                f"{u.q(frame['a_mm'].min(), 'length')} to {u.q(frame['a_mm'].max(), 'length')}",
            ),
            ("worst spread between domains", f"{num(100 * info['worst_domain_spread'], 2)} %"),
        ],
        warnings=warnings,
        references=[
            "Shih, Moran & Nakamura, Int. J. Fract. 30 (1986) 79–102: equivalent domain integral",
            "Li, Shih & Needleman, Eng. Fract. Mech. 21 (1985) 405–421: domain integral",
            "Rice, J. Appl. Mech. 35 (1968) 379–386: J-integral",
            "Ramberg & Osgood, NACA TN 902 (1943): stress–strain curve",
            "Masing (1926); Lamba, Eng. Fract. Mech. 7 (1975) 693; Dowling & Begley, ASTM STP "
            "590 (1976) 82: cyclic J on the Masing branch (from memory)",
            "Ainsworth, Eng. Fract. Mech. 19 (1984) 633–642: reference stress estimate",
            *case.geometry.shape.references,
        ],
    )
