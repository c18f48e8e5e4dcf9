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

from tests.edges.test_report_render import _chromium, _render
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
    "run-US": ["run", f"{EX}/welded_joint_residual.toml", "--units", "US"],
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
    """The report's prose as shown (no style, no image data, no tags; file syntax inside
    ``<pre>``/``<code>`` — the growth-law line to paste into a case — left out)."""
    import html as H

    for tag in ("style", "script", "pre", "code"):
        html = re.sub(rf"<{tag}[^>]*>.*?</{tag}>", " ", html, flags=re.S)
    html = re.sub(r"src=['\"][^'\"]*['\"]", "", html)
    return H.unescape(re.sub(r"<[^>]+>", " ", html))


def sections(html: str) -> dict:
    """h2 heading → the HTML up to the next heading."""
    parts = re.split(r"<h2>(.*?)</h2>", html)
    return {parts[i]: parts[i + 1] for i in range(1, len(parts) - 1, 2)}


#: counts the images of each report section of the combined page once it has loaded
SECTION_SCRIPT = """<script>
window.addEventListener('load', function () {
  document.querySelectorAll('section[data-report]').forEach(function (s) {
    var imgs = Array.prototype.slice.call(s.querySelectorAll('img'));
    var broken = imgs.filter(function (i) { return !i.complete || i.naturalWidth === 0; });
    s.setAttribute('data-images', imgs.length);
    s.setAttribute('data-broken', broken.length);
  });
  var d = document.createElement('div');
  d.id = 'cycj-done';
  document.body.appendChild(d);
});
</script>"""


def rendered(reports, tmp_path) -> dict:
    """name → (report HTML as Chromium's DOM holds it, images, broken images): every report
    in one page (one Chromium start), each in a section of its own."""
    body = []
    for name, path in reports.items():
        html = path.read_text(encoding="utf-8")
        inner = html.split("<body>", 1)[1].rsplit("</body>", 1)[0]
        body.append(f"<section data-report='{name}'>{inner}</section>")
    page = tmp_path / "all.html"
    page.write_text(
        "<!DOCTYPE html><html><head><meta charset='utf-8'></head><body>"
        + "".join(body)
        + SECTION_SCRIPT
        + "</body></html>",
        encoding="utf-8",
    )
    proc = _render(_chromium(), page, tmp_path, "--dump-dom")
    assert 'id="cycj-done"' in proc.stdout, proc.stderr[-1500:]
    out = {}
    pattern = (
        r'<section data-report="([^"]+)" data-images="(\d+)" data-broken="(\d+)">(.*?)</section>'
    )
    for m in re.finditer(pattern, proc.stdout, flags=re.S):
        out[m.group(1)] = (m.group(4), int(m.group(2)), int(m.group(3)))
    return out


def test_every_report_reads_cleanly(reports, tmp_path):
    if _chromium() is None:
        dom = {n: (p.read_text(encoding="utf-8"), 1, 0) for n, p in reports.items()}
    else:
        dom = rendered(reports, tmp_path)
    assert set(dom) == set(reports)
    bad = []
    for name, (html, images, broken) in dom.items():
        if images < 1 or broken:
            bad.append((name, f"{images} images, {broken} broken"))
        text = visible_text(html)
        for hit in LITERALS.finditer(text):
            lo = max(hit.start() - 60, 0)
            bad.append((name, text[lo : hit.end() + 30].replace("\n", " ")))
        for heading, body in sections(html).items():
            if not visible_text(body).strip() and "<img" not in body and "<pre" not in body:
                bad.append((name, f"empty section {heading!r}"))
        for heading in ("Validity", "Inputs", "References used"):
            if f"<h2>{heading}</h2>" not in html:
                bad.append((name, f"no {heading} section"))
    assert not bad, bad[:20]


def test_a_literal_is_caught(tmp_path):
    """The check itself can fail: a report with a Python value in it is found."""
    text = visible_text("<p>threshold None, closure {'U': 0.8}, 1.006e+05 cycles</p>")
    assert len(LITERALS.findall(text)) >= 3


def test_the_us_report_uses_us_units(reports):
    text = visible_text(reports["run-US"].read_text(encoding="utf-8"))
    assert " in " in text and "ksi" in text and "in·lbf/in²" in text
    assert " mm (" not in text.split("Answer", 1)[1].split("Validity", 1)[0]


def test_tearing_run_has_its_j_r_picture_and_the_split(reports):
    folder = reports["run-lab_compact_tension"].parent
    assert (folder / "tearing.png").is_file() and (folder / "dj_split.png").is_file()
    head = (folder / "history.csv").read_text().splitlines()[0].split(",")
    assert head[-3:] == ["dK_MPa_sqrt_m", "dJ_el_kJm2", "dJ_pl_kJm2"]
