"""``cycj pod``: a POD curve from hit/miss or signal-response (â vs a) inspection data."""

from __future__ import annotations

from pathlib import Path

import click


@click.command()
@click.argument("data_file", type=click.Path(dir_okay=False))
@click.option(
    "--out",
    "out_dir",
    type=click.Path(file_okay=False),
    help="Output folder for pod.json, pod.toml, pod.png and report.html (e.g. "
    "out/pod-<data stem>; without --out the fit is printed only).",
)
@click.option(
    "--link",
    type=click.Choice(["logit", "probit"]),
    default=None,
    help="Hit/miss link (default logit, or '# link = ...' in the file).",
)
@click.option(
    "--decision",
    type=float,
    default=None,
    help="â decision threshold (signal response; or '# decision = ...' in the file).",
)
@click.option("--floor", type=float, default=None, help="â recording floor (left-censored).")
@click.option("--saturation", type=float, default=None, help="â saturation (right-censored).")
@click.option("--force", is_flag=True, help="Replace an output folder cycj wrote before.")
@click.option("--no-plots", is_flag=True, help="Skip the plot and the report.")
@click.option("--json", "as_json", is_flag=True, help="Print the fit as JSON.")
def pod(data_file, out_dir, link, decision, floor, saturation, force, no_plots, as_json):
    """Fit a POD curve to DATA_FILE, a CSV with columns a_mm and hit (0/1), or a_mm and ahat.

    Lines starting with '#' are comments; '# key = value' lines may give link, decision,
    floor and saturation.  Prints a50, a90, a90/95 and the pod = {...} line for a case's
    [inspection] table.
    """
    from cycj.outputs import dumps
    from cycj.plan.pod_data import fit_file

    if out_dir:
        from cycj.outputs import OutputDir

        OutputDir(Path(out_dir), force=force, inputs=[data_file])  # refuse early
    fit, a, y = fit_file(
        data_file, link=link, decision=decision, floor=floor, saturation=saturation
    )
    if out_dir:
        from cycj.plan.write import write_pod

        options = {"link": link, "decision": decision, "floor": floor, "saturation": saturation}
        summary = write_pod(
            fit,
            a,
            y,
            Path(out_dir),
            source=str(data_file),
            force=force,
            plots=not no_plots,
            options=options,
        )
    else:
        summary = fit.summary()
    if as_json:
        click.echo(dumps(summary))
        return
    c = fit.curve
    click.echo(
        f"{fit.method} ({fit.link}), n = {fit.n}: a50 = {c.a50:.4g} mm, "
        f"a90 = {c.a90:.4g} mm, a90/95 = {fit.a90_95:.4g} mm"
    )
    click.echo("for [inspection]:")
    click.echo(summary["pod_toml"])
    if out_dir:
        click.echo(
            f"outputs: {out_dir}/ (pod.json, pod.toml"
            + (", pod.png, report.html)" if not no_plots else ")")
        )
