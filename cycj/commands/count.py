"""``cycj count``: rainflow-count a load history file."""

from __future__ import annotations

import math

import click

from cycj.commands.options import units_option
from cycj.errors import CycjInputError


@click.command()
@click.argument("history", type=click.Path(dir_okay=False))
@click.option("--column", default=None, help="Channel to count (name or 0-based position).")
@click.option("--sheet", default=None, help="Worksheet of an .xlsx history, by name.")
@click.option(
    "--gate",
    default="0",
    show_default=True,
    help="Drop reversal pairs smaller than this: a number in the file's unit or a "
    "quantity such as '0.2 kN'.",
)
@click.option(
    "--unit",
    default=None,
    help="Unit of the file's loads (e.g. kN, MPa); loads are converted to N or MPa.",
)
@click.option(
    "--scale", default=1.0, show_default=True, type=float, help="Factor applied to the loads."
)
@click.option(
    "--repeat", is_flag=True, help="Count the history as a repeating block (full cycles only)."
)
@click.option(
    "--bins",
    default=32,
    show_default=True,
    type=click.IntRange(2, 1000),
    help="Bins on each axis of the rainflow matrices.",
)
@click.option(
    "--out",
    "out_dir",
    default=None,
    type=click.Path(file_okay=False),
    help="Folder for count.json, cycles.csv, the matrices, plots and report (e.g. "
    "out/count-<history stem>; without --out the count is printed only).",
)
@click.option("--force", is_flag=True, help="Replace an --out folder cycj wrote before.")
@click.option(
    "--stream",
    is_flag=True,
    help="Read and count the history in chunks (memory bounded by the cycle table); "
    "automatic beyond 5e6 samples or 100 MB.",
)
@click.option(
    "--cycles-format",
    type=click.Choice(["auto", "csv", "parquet"]),
    default="auto",
    show_default=True,
    help="Format of the cycle and exceedance tables (auto: Parquet beyond 1e7 cycles).",
)
@click.option("--no-plots", is_flag=True, help="Skip the PNG plots and the report.")
@click.option("--json", "as_json", is_flag=True, help="Print the summary as JSON.")
@units_option
def count(
    history,
    column,
    sheet,
    gate,
    unit,
    scale,
    repeat,
    bins,
    out_dir,
    force,
    stream,
    cycles_format,
    no_plots,
    as_json,
    units_system,
):
    """Rainflow-count the load history in HISTORY (CSV/TSV, Parquet or .npy)."""
    import contextlib
    import tempfile

    from cycj import _ahead
    from cycj.outputs import OutputDir, dumps
    from cycj.spectrum.reading import history_unit
    from cycj.spectrum.stream_count import wants_streaming

    _ahead.save_after_command()  # a warm count after this one needs no numba

    factor, internal, kind = history_unit(unit, key="--unit")
    if not math.isfinite(scale) or scale == 0:
        raise CycjInputError(
            "the scale must be a finite non-zero number", key="--scale", found=scale
        )
    gate_value = _gate(gate, factor * scale, kind)
    if stream and repeat:
        raise CycjInputError(
            "a repeating block is counted in memory: drop --stream or --repeat", key="--stream"
        )
    od = OutputDir(out_dir, force=force, inputs=[history]) if out_dir is not None else None
    streamed = stream or (not repeat and wants_streaming(history))
    from cycj.display import using

    spill = contextlib.ExitStack()
    with spill, using(units_system or "SI"):
        if streamed:
            folder = spill.enter_context(tempfile.TemporaryDirectory(prefix="cycj-count-"))
            result, write = _streamed(history, column, factor, scale, gate_value, folder, internal)
        else:
            result, write = _in_memory(
                history, column, factor, scale, gate_value, repeat, internal, sheet
            )
        summary = _finish(
            od,
            history,
            column,
            unit,
            factor,
            scale,
            gate_value,
            repeat,
            bins,
            internal,
            result,
            write,
            streamed,
            cycles_format,
            no_plots,
        )
    if as_json:
        click.echo(dumps(summary))
        return
    _print(summary, history, gate_value, repeat, internal, out_dir, no_plots)


def _in_memory(history, column, factor, scale, gate_value, repeat, internal, sheet=None):
    """Summary of the count of the whole history in memory, and its output writer."""
    from cycj.spectrum.rainflow import rainflow_cycles
    from cycj.spectrum.reading import read_history_with_time
    from cycj.spectrum.write import count_summary, write_count_outputs

    values, times = read_history_with_time(history, column, factor, scale, sheet=sheet)
    cycles = rainflow_cycles(values, gate_value, repeat)
    result = count_summary(values, cycles, gate_value, repeat, internal)

    def write(od, bins, plots, cycles_format):
        return write_count_outputs(
            od, values, cycles, internal, times, bins, plots=plots, cycles_format=cycles_format
        )

    return result, write


def _streamed(history, column, factor, scale, gate_value, folder, internal):
    """Summary of the streaming count (cycle table spilled to ``folder``) and its writer."""
    from cycj.spectrum.stream_count import count_file_streaming
    from cycj.spectrum.write import summary_of_totals, write_count_files

    sc = count_file_streaming(history, column, factor, scale, gate_value, folder)
    p = sc.parts
    result = summary_of_totals(
        samples=sc.samples,
        reversals=sc.reversals,
        full=p.full,
        half=p.half,
        largest_range=p.range_max if p.n else 0.0,
        vmax=sc.vmax,
        vmin=sc.vmin,
        irregularity=sc.irregularity,
        gate=gate_value,
        repeat=False,
        unit=internal,
    )

    def write(od, bins, plots, cycles_format):
        return write_count_files(
            od,
            p,
            sc.samples,
            (sc.vmin, sc.vmax),
            sc.preview,
            sc.preview_times,
            internal,
            bins,
            plots,
            cycles_format,
        )

    return result, write


def _finish(
    od, history, column, unit, factor, scale, gate_value, repeat, bins, internal,
    result, write, streamed, cycles_format, no_plots,
):  # fmt: skip
    """The count's JSON summary, with its files written into ``od`` (if any)."""
    from cycj.outputs import record_provenance
    from cycj.spectrum.write import CAPTIONS, write_count_report

    summary = {"history": str(history), "column": column, **result}
    summary["method"] = "rainflow (ASTM E1049-85 §5.4)" + (
        ", repeating block" if repeat else ", residue as half cycles"
    )
    summary["parameters"] = {
        "column": column,
        "unit": unit,
        "unit_factor": factor,
        "scale": scale,
        "gate": gate_value,
        "repeat": repeat,
        "bins": bins,
        "internal_unit": internal,
        "stream": bool(streamed),
        "cycles_format": cycles_format,
    }
    record_provenance(summary, {"history": history}, method=summary["method"])
    if od is not None:
        with od:
            files = write(od, bins, not no_plots, cycles_format)
            if not no_plots:
                figs = [(CAPTIONS[p.name], p) for p in files if p.suffix == ".png"]
                files.append(write_count_report(od, summary, figs))
            summary["outputs"] = [str(od.final_path(p.name)) for p in files] + [
                str(od.final_path("count.json"))
            ]
            od.write_json("count.json", summary)
    return summary


def _print(summary, history, gate_value, repeat, internal, out_dir, no_plots):
    """The plain-text summary."""
    u = f" {internal}" if internal else ""
    click.echo(f"history: {history}")
    click.echo(f"samples: {summary['samples']}")
    click.echo(
        f"reversals: {summary['reversals']}" + (f" (gate {gate_value:g}{u})" if gate_value else "")
    )
    if summary["full_cycles"] + summary["half_cycles"] == 0:
        click.echo("cycles: none (the history is constant or every change is below the gate)")
    else:
        click.echo(
            f"cycles: {summary['cycles']:g} ({summary['full_cycles']} full + "
            f"{summary['half_cycles']} half)" + (" [repeating block]" if repeat else "")
        )
        click.echo(f"largest range: {summary['largest_range']:.6g}{u}")
    if out_dir is not None:
        tables = (
            "cycles.parquet"
            if any(o.endswith(".parquet") for o in summary["outputs"])
            else "cycles.csv"
        )
        click.echo(
            f"wrote {len(summary['outputs'])} files to {out_dir}/ (count.json, {tables}"
            + (", plots, report.html)" if not no_plots else ")")
        )


def _gate(text: str, factor: float, kind: str | None) -> float:
    """The gate in the loads' unit: a bare number is in the file's unit (times the factor)."""
    from cycj.units import to_internal

    try:
        g = float(text) * factor
    except ValueError:
        if kind is None:
            raise CycjInputError(
                "a gate with a unit needs --unit", key="--gate", found=text
            ) from None
        g = to_internal(text, kind, key="--gate")
    if not g >= 0:
        raise CycjInputError("the gate must be >= 0", key="--gate", found=text)
    return g
