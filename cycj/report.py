"""The self-contained HTML report every command writes (plots embedded, no external links).

Readable on a phone and in print: what was asked, the inputs, the answer in one sentence, the
plots, the validity of the answer (the ranges used, extrapolation, warnings), the references the
run used, and the caution.  Every value is shown through :mod:`cycj.display` (engineering
numbers, no programming-language literal); an empty table says "none".
"""

from __future__ import annotations

import base64
import html
import re
from dataclasses import dataclass
from pathlib import Path

from cycj.display import frame_text, text

CAUTION = (
    "Caution: these results are estimates for engineering judgement. They depend on the "
    "quality of the inputs and do not replace the applicable design code, "
    "fitness-for-service standard, or a qualified engineer's review."
)

_CSS = """
body{font-family:system-ui,-apple-system,Segoe UI,Roboto,sans-serif;margin:0 auto;max-width:60em;
padding:1em;line-height:1.45;color:#1b1b1b}
h1{font-size:1.5em;margin-bottom:.2em}h2{font-size:1.15em;border-bottom:1px solid #ccc;
padding-bottom:.2em;margin-top:1.6em}
.answer{font-size:1.15em;background:#eef5ee;border-left:4px solid #3a7d44;padding:.6em .8em}
.caution{background:#fff4e5;border-left:4px solid #d98200;padding:.6em .8em}
.warn{color:#8a4b00}table{border-collapse:collapse;width:100%;font-size:.92em;
display:block;overflow-x:auto}td,th{border:1px solid #ddd;padding:.25em .5em;text-align:left;
vertical-align:top}th{background:#f3f3f3}figure{margin:1em 0}img{max-width:100%;height:auto}
figcaption{font-size:.9em;color:#444}pre{white-space:pre-wrap;overflow-wrap:anywhere;
background:#f6f6f6;padding:.5em}@media print{body{max-width:none}figure{break-inside:avoid}}
"""


def _img(src) -> str:
    data = Path(src).read_bytes()
    return "data:image/png;base64," + base64.b64encode(data).decode("ascii")


@dataclass(frozen=True)
class Rows:
    """A report table given as its column names and rows of values (no DataFrame needed)."""

    columns: tuple
    rows: list


def _rows(frame) -> Rows:
    """A table argument (:class:`Rows`, DataFrame, or what ``pandas.DataFrame`` takes) as
    :class:`Rows` of cells shown by :func:`cycj.display.text`."""
    if not isinstance(frame, Rows):
        import pandas as pd

        df = frame_text(frame if isinstance(frame, pd.DataFrame) else pd.DataFrame(frame))
        frame = Rows(tuple(df.columns), list(df.itertuples(index=False, name=None)))
    return Rows(
        tuple(str(c) for c in frame.columns),
        [tuple(text(v) for v in row) for row in frame.rows],
    )


def _table(frame, max_rows: int = 60) -> str:
    """One table as HTML (the layout pandas' ``to_html(index=False)`` gives); beyond
    ``max_rows`` rows its first and last halves with a note."""
    t = _rows(frame)
    if not t.rows:
        return "<p>none</p>"
    rows, note = t.rows, ""
    if len(rows) > max_rows:
        note = f"<p><small>first and last {max_rows // 2} of {len(rows):,} rows</small></p>"
        rows = rows[: max_rows // 2] + rows[-(max_rows // 2) :]

    def e(cell):
        return html.escape(cell, quote=False)

    lines = ['<table class="dataframe">', "  <thead>", '    <tr style="text-align: right;">']
    lines += [f"      <th>{e(c)}</th>" for c in t.columns]
    lines += ["    </tr>", "  </thead>", "  <tbody>"]
    for row in rows:
        lines += ["    <tr>", *(f"      <td>{e(v)}</td>" for v in row), "    </tr>"]
    lines += ["  </tbody>", "</table>"]
    return "\n".join(lines) + note


#: verification notes kept out of printed citations (their status belongs in docs/)
_NOTE = re.compile(r"\s*[(\[]\s*(from memory|common practice)\s*[)\]]", re.I)
_NOTE_IN = re.compile(
    r"(;\s*(from memory|common practice)\b|\b(from memory|common practice)[;,]\s*)", re.I
)


def citation(ref) -> str:
    """A reference as printed: without a verification note such as "(from memory)" or
    "common practice; " (docs/references.md records which values are confirmed)."""
    return _NOTE_IN.sub("", _NOTE.sub("", str(ref))).strip()


def render_report(
    *,
    title: str,
    question: str,
    answer: str,
    inputs=(),
    figures=(),
    tables=(),
    warnings=(),
    references=(),
    extra_html: str = "",
    validity=(),
) -> str:
    """The report as one HTML string (images embedded as base64 PNG).

    ``inputs`` and ``validity`` are (item, value) rows; values go through
    :func:`cycj.display.text`.  The validity section is always there: its rows (ranges used,
    extrapolation) and the ``warnings``, or "no validity warnings"."""

    def e(text):
        return html.escape(text, quote=False)

    parts = [
        "<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'>",
        "<meta name='viewport' content='width=device-width, initial-scale=1'>",
        f"<title>{e(title)}</title><style>{_CSS}</style></head><body>",
        f"<h1>{e(title)}</h1>",
        f"<p class='caution'>{e(CAUTION)}</p>",
        f"<h2>What was asked</h2><p>{e(question)}</p>",
        f"<h2>Answer</h2><p class='answer'>{e(answer)}</p>",
    ]
    parts.append("<h2>Validity</h2>")
    if validity:
        parts.append("<table><tr><th>check</th><th>value</th></tr>")
        parts += [f"<tr><td>{e(text(k))}</td><td>{e(text(v))}</td></tr>" for k, v in validity]
        parts.append("</table>")
    if warnings:
        parts.append("<ul>")
        parts += [f"<li class='warn'>{e(text(w))}</li>" for w in warnings]
        parts.append("</ul>")
    else:
        parts.append("<p>No validity warnings.</p>")
    if inputs:
        parts.append("<h2>Inputs</h2><table><tr><th>item</th><th>value</th></tr>")
        parts += [f"<tr><td>{e(text(k))}</td><td>{e(text(v))}</td></tr>" for k, v in inputs]
        parts.append("</table>")
    if figures:
        parts.append("<h2>Plots</h2>")
    for caption, src in figures:
        parts.append(
            f"<figure><img src='{_img(src)}' alt='{html.escape(caption)}'>"
            f"<figcaption>{e(caption)}</figcaption></figure>"
        )
    for caption, frame in tables:
        parts.append(f"<h2>{e(caption)}</h2>{_table(frame)}")
    parts.append(extra_html)
    if references:
        parts.append("<h2>References used</h2><ol>")
        parts += [f"<li>{e(citation(r))}</li>" for r in references]
        parts.append("</ol>")
    from cycj._version import __version__

    parts.append(f"<p><small>cycj {e(__version__)}</small></p></body></html>")
    return "\n".join(parts)


def write_report(path, **kw) -> Path:
    """Write :func:`render_report` to ``path`` (UTF-8)."""
    path = Path(path)
    path.write_text(render_report(**kw), encoding="utf-8")
    return path
