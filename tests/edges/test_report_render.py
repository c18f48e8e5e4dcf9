"""Every command's report.html: self-contained (only embedded PNG images, no external links),
with the caution, the references, the question, the answer and the inputs table — and it
renders in headless Chromium with no broken image.

The Chromium check injects a small script into a copy of each report that counts the images
whose ``naturalWidth`` is 0 once the page has loaded and writes the count into the DOM, then
reads it back with ``chromium --headless --dump-dom``.  Without a Chromium binary the test is
skipped with the reason (CI installs Debian's ``chromium`` when it can; see ``.ci/run``).
"""

import base64
import os
import re
import shutil
import subprocess

import pytest

from cycj.cli import main
from cycj.report import CAUTION
from tests.edges import mutation_inputs as MI

COMMANDS = {
    "run": lambda d, out: ["run", d / "case_constant.toml", "--out", out],
    "count": lambda d, out: ["count", d / "history.csv", "--out", out],
    "fit": lambda d, out: [
        "fit",
        d / "log_raw.csv",
        "--specimen",
        d / "specimen.toml",
        "--out",
        out,
    ],
    "plan": lambda d, out: ["plan", d / "plan.toml", "--out", out],
    "pod": lambda d, out: ["pod", d / "pod_signal.csv", "--out", out],
}


@pytest.fixture(scope="module")
def reports(tmp_path_factory):
    d = tmp_path_factory.mktemp("reports")
    for name, base in MI.write_bases(d).items():
        (d / name).write_text(MI.to_toml(base) if isinstance(base, dict) else base)
    out = {}
    for cmd, args in COMMANDS.items():
        target = d / f"out-{cmd}"
        with pytest.raises(SystemExit) as exc:
            main([str(a) for a in args(d, target)])
        assert exc.value.code == 0, cmd
        out[cmd] = target / "report.html"
    return out


@pytest.mark.parametrize("cmd", sorted(COMMANDS))
def test_report_is_self_contained_and_complete(reports, cmd):
    html = reports[cmd].read_text(encoding="utf-8")
    assert CAUTION in html
    for heading in ("What was asked", "Answer", "Inputs", "References used"):
        assert f"<h2>{heading}</h2>" in html, heading
    assert "name='viewport'" in html and "@media print" in html
    srcs = re.findall(r"<img[^>]*\bsrc=['\"]([^'\"]*)['\"]", html)
    assert srcs, "no plot in the report"
    for src in srcs:
        assert src.startswith("data:image/png;base64,")
        assert base64.b64decode(src.split(",", 1)[1])[:8] == b"\x89PNG\r\n\x1a\n"
    assert not re.search(r"""(src|href)=['"]?(https?:|//|file:)""", html)
    assert "<link" not in html and "<script" not in html
    refs = html.split("<h2>References used</h2>", 1)[1]
    assert refs.count("<li>") >= 1


def _chromium():
    for name in ("chromium", "chromium-browser", "google-chrome", "chrome"):
        path = shutil.which(name)
        if path:
            return path
    return None


CHECK_SCRIPT = """<script>
window.addEventListener('load', function () {
  var imgs = Array.prototype.slice.call(document.images);
  var broken = imgs.filter(function (i) { return !i.complete || i.naturalWidth === 0; });
  var d = document.createElement('div');
  d.id = 'cycj-check';
  d.setAttribute('data-images', imgs.length);
  d.setAttribute('data-broken', broken.length);
  document.body.appendChild(d);
});
</script>"""


def _render(browser, page, tmp_path, *extra):
    cmd = [
        browser,
        "--headless=new",
        "--no-sandbox",
        "--disable-gpu",
        "--no-first-run",
        "--disable-dev-shm-usage",
        f"--user-data-dir={tmp_path / 'profile'}",
        "--virtual-time-budget=10000",
        *extra,
        page.as_uri(),
    ]
    return subprocess.run(
        cmd, capture_output=True, text=True, timeout=120, env={**os.environ, "HOME": str(tmp_path)}
    )


@pytest.mark.parametrize("cmd", sorted(COMMANDS))
def test_report_renders_in_chromium_without_broken_images(reports, tmp_path, cmd):
    browser = _chromium()
    if browser is None:
        pytest.skip(
            "no Chromium binary found (apt-get install chromium); report rendering not checked"
        )
    html = reports[cmd].read_text(encoding="utf-8")
    page = tmp_path / "page.html"
    page.write_text(html.replace("</body>", CHECK_SCRIPT + "</body>"), encoding="utf-8")
    proc = _render(browser, page, tmp_path, "--dump-dom")
    m = re.search(r'id="cycj-check" data-images="(\d+)" data-broken="(\d+)"', proc.stdout)
    assert m, f"no check result from Chromium: {proc.stderr[-1500:]}"
    images, broken = int(m.group(1)), int(m.group(2))
    assert images >= 1 and broken == 0, (images, broken)


def screenshot(report, png, width: int, height: int = 2400):
    """Screenshot of a report at a window width (for looking at the layout by eye)."""
    import tempfile
    from pathlib import Path

    with tempfile.TemporaryDirectory() as d:
        _render(
            _chromium(),
            Path(report),
            Path(d),
            f"--window-size={width},{height}",
            f"--screenshot={png}",
            "--hide-scrollbars",
        )
    return png


def test_chromium_check_detects_a_broken_image(tmp_path):
    """The check itself works: a page with a corrupt embedded image reports one broken."""
    browser = _chromium()
    if browser is None:
        pytest.skip("no Chromium binary found (apt-get install chromium)")
    page = tmp_path / "page.html"
    page.write_text(
        "<!DOCTYPE html><html><body><img src='data:image/png;base64,AAAA'>"
        + CHECK_SCRIPT
        + "</body></html>"
    )
    proc = _render(browser, page, tmp_path, "--dump-dom")
    assert 'data-images="1" data-broken="1"' in proc.stdout
