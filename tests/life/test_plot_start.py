"""The start of a run's plots: on the command line matplotlib.figure is imported without the
property lists of its artists' docstrings (and matplotlib.artist.kwdoc is put back after);
elsewhere matplotlib is imported as it is."""

import os
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).parents[2]

_PROBE = """
import matplotlib.artist as artist
kwdoc = artist.kwdoc
from cycj.life.plots import _figure_class
Figure = _figure_class()
import matplotlib.figure
from matplotlib.lines import Line2D
print(Figure is matplotlib.figure.Figure, artist.kwdoc is kwdoc,
      "antialiased" in (Line2D.set.__doc__ or ""))
"""


def _probe(command_line: bool) -> list:
    env = {k: v for k, v in os.environ.items() if k != "CYCJ_COMMAND_LINE"}
    env.update(MPLBACKEND="Agg", PYTHONPATH=str(ROOT))
    if command_line:
        env["CYCJ_COMMAND_LINE"] = "1"
    out = subprocess.run(
        [sys.executable, "-c", _PROBE], cwd=ROOT, env=env, capture_output=True, text=True
    )
    assert out.returncode == 0, out.stderr
    return out.stdout.split()


def test_command_line_imports_figure_without_property_docstrings():
    assert _probe(command_line=True) == ["True", "True", "False"]


def test_library_imports_figure_as_matplotlib_does():
    assert _probe(command_line=False) == ["True", "True", "True"]
