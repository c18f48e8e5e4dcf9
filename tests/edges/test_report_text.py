"""Every report of every example and of ``cycj demo``, rendered in headless Chromium and read
as an engineer would: no programming-language literal (None, True, False, NaN, dict or list
reprs, ``1.006e+05``), no empty section, every image decodes; and one report in US customary
units.

Commands run in-process (the compiled kernels stay loaded) with ``--no-plots`` skipped only
where a command has no report; the Chromium part reuses tests/edges/test_report_render.py.
Without a Chromium binary the rendering is skipped and the HTML text is checked alone.
"""

import re
from pathlib import Path

import pytest

from tests.edges.test_report_render import CHECK_SCRIPT, _chromium, _render
from tests.helpers import run_cli

ROOT = Path(__file__).parents[2]
EX = "examples"
LIFE = sorted(
    p.name
    for p in (ROOT / EX).glob("*.toml")
    if p.name not in ("lab_specimen_ct.toml", "plate_inspection.toml")
)
COMMANDS = {
    **{f"run-{n[:-5]}": ["run", f"{EX}/{n}"] for n in LIFE},
    "run-US": ["run", f"{EX}/lab_compact_tension.toml", "--units", "US"],
    "plan": ["plan", f"{EX}/plate_inspection.toml"],
    "fit": [
        "fit",
        f"{EX}/lab_log_ct_r01.csv",
        f"{EX}/lab_log_ct_r05.csv",
        "--specimen",
        f"{EX}/lab_specimen_ct.toml",
    ],
    "pod-hit-miss": ["pod", f"{EX}/pod_hit_miss.csv"],
    "pod-signal": ["pod", f"{EX}/pod_signal_response.csv"],
    "count": ["count", "loadspectra/crane_duty.csv", "--column", "load", "--unit", "kN"],
}

#: what must never appear in a report's visible text
LITERALS = re.compile(
    r"\b(None|True|False|NaN|nan|inf)\b|\{'|\['|'\]|'\}|\b\d(\.\d+)?e[+-]?\d+\b|column None"
    r"|\(from memory\)"
)


@pytest.fixture(scope="module")
def reports(tmp_path_factory):
    d = tmp_path_factory.mktemp("reports")
    mp = pytest.MonkeyPatch()
    mp.chdir(ROOT)
    out = {}

    class _Cap:  # run_cli's capsys stand-in: nothing to read back
        def readouterr(self):
            return type("C", (), {"out": "", "err": ""})()

    try:
        for name, args in COMMANDS.items():
            code, _, err = run_cli([*args, "--out", d / name], _Cap())
            assert code == 0, (name, err)
            out[name] = d / name / "report.html"
        code, _, err = run_cli(["demo", d / "demo"], _Cap())
        assert code == 0, err
        for stage in ("fit", "life", "plan"):
            found = sorted((d / "demo").glob(f"{stage}*/report.html"))
            assert found, stage
            out[f"demo-{stage}"] = found[0]
    finally:
        mp.undo()
    return out


def visible_text(html: str) -> str:
    """The report's text as shown (no style, no image data, no tags)."""
    html = re.sub(r"<style>.*?</style>", "", html, flags=re.S)
    html = re.sub(r"<script>.*?</script>", "", html, flags=re.S)
    html = re.sub(r"src=['\"][^'\"]*['\"]", "", html)
    import html as H

    return H.unescape(re.sub(r"<[^>]+>", " ", html))


def sections(html: str) -> dict:
    """h2 heading → the HTML up to the next heading."""
    parts = re.split(r"<h2>(.*?)</h2>", html)
    return {parts[i]: parts[i + 1] for i in range(1, len(parts) - 1, 2)}


def test_every_report_reads_cleanly(reports, tmp_path):
    browser = _chromium()
    bad = []
    for name, path in reports.items():
        html = path.read_text(encoding="utf-8")
        if browser is not None:
            page = tmp_path / f"{name}.html"
            page.write_text(html.replace("</body>", CHECK_SCRIPT + "</body>"), encoding="utf-8")
            proc = _render(browser, page, tmp_path, "--dump-dom")
            m = re.search(r'id="cycj-check" data-images="(\d+)" data-broken="(\d+)"', proc.stdout)
            assert m, (name, proc.stderr[-800:])
            assert int(m.group(1)) >= 1 and m.group(2) == "0", (name, m.groups())
            html = proc.stdout
        text = visible_text(html)
        for hit in LITERALS.finditer(text):
            lo = max(hit.start() - 60, 0)
            bad.append((name, text[lo : hit.end() + 30].replace("\n", " ")))
        for heading, body in sections(html).items():
            if not visible_text(body).strip() and "<img" not in body:
                bad.append((name, f"empty section {heading!r}"))
        for heading in ("Validity", "Inputs", "References used"):
            assert f"<h2>{heading}</h2>" in html, (name, heading)
    assert not bad, bad[:20]


def test_the_us_report_uses_us_units(reports):
    text = visible_text(reports["run-US"].read_text(encoding="utf-8"))
    assert " in " in text and "ksi" in text and "in·lbf/in²" in text
    assert " mm (" not in text.split("Answer", 1)[1].split("Validity", 1)[0]


def test_tearing_run_has_its_j_r_picture_and_the_split(reports):
    folder = reports["run-lab_compact_tension"].parent
    assert (folder / "tearing.png").is_file() and (folder / "dj_split.png").is_file()
    head = (folder / "history.csv").read_text().splitlines()[0].split(",")
    assert head[-3:] == ["dK_MPa_sqrt_m", "dJ_el_kJm2", "dJ_pl_kJm2"]
