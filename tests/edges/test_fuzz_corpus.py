"""Fuzz corpus: every example file, mutated, through the command that reads it.

Every case file in ``examples/`` (all ``*.toml`` but the specimen file), the tabulated
geometry's table, every load history (the examples' and ``loadspectra/``), the example test
logs (the first lines of each), the specimen file and the POD data are each mutated at least
:data:`MUTANTS` times with a fixed seed: bytes and characters edited, lines deleted, duplicated,
swapped or commented out, keys or columns swapped, numbers replaced by extreme or odd values,
unit strings changed, a byte-order mark prepended, delimiters changed, truncation, very long
values (at most :data:`LONG` characters), line endings and encodings changed.

Each mutant goes into a fresh folder with copies of every file its base refers to (the case's
history, table and profile files, in the same relative places), every file there is hashed
(SHA-256), and the matching command runs in-process: ``check`` for every case and table
mutant, ``run`` for the first :data:`RUN_SUBSET` case mutants of each example that pass the
check (cycles capped at :data:`CYCLE_CAP`), ``plan`` for the first :data:`PLAN_SUBSET` of the
inspection example (samples capped at :data:`SAMPLE_CAP`), ``count`` for histories (and ``run``
of the cases that read them, for the first few), ``fit`` for logs and specimen files, ``pod``
for POD data (``count`` and ``pod`` with ``--out`` for every :data:`OUT_EVERY`-th mutant).
Every outcome must be exit 0, or exit 2 with at most three non-empty lines on stderr, the
first naming the file, the key or the line; never exit 1, a traceback or an internal error;
every file of the folder still there with its hash; no run longer than :data:`MAX_SECONDS`.
The ``max_cycles`` cap is added to a case without one and lowers a larger one (a mutation
that keeps ``max_cycles = 1e9`` on a cycle-by-cycle case would run for minutes).  Each
command also runs once with ``--out`` on the folder holding its inputs and ``--force``: exit 2,
nothing changed.

``CYCJ_FUZZ_MUTANTS=1000`` gives a longer hunt (same seed, the first mutants unchanged);
``CYCJ_FUZZ_LOG=file`` lists every outcome with the first line of its error.  A
failing mutant is kept (its folder is named in the failure) to reproduce it by hand.
"""

from __future__ import annotations

import hashlib
import json
import os
import random
import re
import shutil
import time
import tomllib
from collections import Counter, defaultdict
from pathlib import Path

import pytest

from tests.helpers import run_cli

ROOT = Path(__file__).resolve().parents[2]
EXAMPLES = ROOT / "examples"
SPECTRA = ROOT / "loadspectra"

SEED = 20261202
#: mutants per base file (the first ones do not depend on the number asked)
MUTANTS = int(os.environ.get("CYCJ_FUZZ_MUTANTS", "100"))
#: case mutants of each example that pass ``check`` and are then run
RUN_SUBSET = 10
#: mutants of each history read by a case that also run that case
HISTORY_RUNS = 3
#: inspection-example mutants that pass ``check`` and are then planned
PLAN_SUBSET = 8
#: ``[run] max_cycles`` of the cases run (added, or lowered to it): bounds a run's time
CYCLE_CAP = 2.0e5
#: ``[inspection] samples`` of the cases planned (added, or lowered to it)
SAMPLE_CAP = 200
#: ``count`` and ``pod`` write an output folder for every OUT_EVERY-th mutant (writing
#: the tables is most of their time), and print only for the others
OUT_EVERY = 4
#: lines kept of each test log (a fit stays fast)
LOG_LINES = 1500
#: the longest value written by a mutation
LONG = 2000
#: CYCJ_FUZZ_LOG=path appends every outcome there (command, input type, exit, first line)
LOG = os.environ.get("CYCJ_FUZZ_LOG")
#: no single command may take longer
MAX_SECONDS = 60.0

CASES = sorted(p.name for p in EXAMPLES.glob("*.toml") if p.name != "lab_specimen_ct.toml")
SPECIMEN = "lab_specimen_ct.toml"
LOGS = sorted(p.name for p in EXAMPLES.glob("lab_log_ct_*.csv"))
PODS = sorted(p.name for p in EXAMPLES.glob("pod_*.csv"))
HISTORIES = ["examples/pipe_startstop_channels.csv"] + sorted(
    f"loadspectra/{p.name}" for p in SPECTRA.glob("*.csv")
)
INSPECTION_CASE = "plate_inspection.toml"

#: (command, input type) -> Counter of exit statuses, over the whole module
COUNTS: dict[tuple[str, str], Counter] = defaultdict(Counter)
#: (command, input type) -> seconds spent in the command
SECONDS: dict[tuple[str, str], float] = defaultdict(float)
#: the slowest commands: (seconds, description)
SLOWEST: list[tuple[float, str]] = []


# ----------------------------------------------------------------------------- base files
def _base_bytes(rel: str) -> bytes:
    data = (ROOT / rel).read_bytes()
    if Path(rel).name in LOGS:
        data = b"".join(data.splitlines(keepends=True)[:LOG_LINES])
    return data


def _referred(rel: str) -> list[str]:
    """Files (relative to the repository) that the case file ``rel`` refers to: every string
    of the case naming an existing file beside it (history, table, profile files)."""
    raw = tomllib.loads((ROOT / rel).read_text(encoding="utf-8"))
    found: list[str] = []

    def walk(v):
        if isinstance(v, dict):
            for x in v.values():
                walk(x)
        elif isinstance(v, list):
            for x in v:
                walk(x)
        elif isinstance(v, str) and v.strip():
            p = ((ROOT / rel).parent / v).resolve()
            if p.is_file() and ROOT in p.parents:
                r = p.relative_to(ROOT).as_posix()
                if r not in found:
                    found.append(r)

    walk(raw)
    return found


def _readers(history: str) -> list[str]:
    """The example cases that read ``history``."""
    return [c for c in CASES if history in _referred(f"examples/{c}")]


# ----------------------------------------------------------------------------- mutations
NUMBER = re.compile(r"(?<![\w.])[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?(?![\w.])")
QUOTED = re.compile(r'"((?:[^"\\\n]|\\.)*)"')
QUANTITY = re.compile(r"^(\s*[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?\s+)(\S.*)$")
KEY_LINE = re.compile(r"^(\s*)([A-Za-z_][\w-]*)(\s*=)")
INLINE_KEY = re.compile(r"([{,]\s*)([A-Za-z_][\w-]*)(\s*=)")

#: replacements of a number: extreme, odd, or not a number at all (some break the syntax)
ODD_NUMBERS = [
    "0",
    "-1",
    "1e308",
    "-1e308",
    "nan",
    "inf",
    "-inf",
    "-0",
    "1e-308",
    "5e-324",
    '""',
    "",
    '"10**10 mm"',
    "10**10 mm",
    '"25 mm # c"',
    "25 mm # c",
    "1e999",
    "0x10",
    "1_0",
    "1,5",
    "١٢",
    "true",
    "[]",
    "{}",
    "99999999999999999999",
    "4.9e-324",
]
#: replacements of a quoted string value
ODD_STRINGS = [
    "",
    " ",
    "0",
    "-1 mm",
    "0 mm",
    "nan MPa",
    "inf mm",
    "1e308 MPa",
    "-1e308 kN",
    "10**10 mm",
    "25 mm # c",
    "1 parsec",
    "abc",
    "none",
    "../nowhere.csv",
    "ø∆µ",
    "\\u0000",
]
#: replacements of a unit
UNITS = [
    "",
    "mm",
    "m",
    "in",
    "ft",
    "µm",
    "MPa",
    "GPa",
    "psi",
    "ksi",
    "N",
    "kN",
    "lbf",
    "kJ/m^2",
    "J/m**2",
    "MPa*m**0.5",
    "ksi*in**0.5",
    "h",
    "s",
    "day",
    "year",
    "parsec",
    "degC",
    "kelvin",
    "%",
    "dimensionless",
    "m**10**10",
    "m^2^2^2",
    "mm/mm",
    "1/mm",
    "MPa MPa",
    "m**1e308",
    "kN # c",
    "mm)",
    "(mm",
    "nan",
    "inf m",
    "mm*" * 300 + "mm",
]
#: odd cells of a CSV file
ODD_CELLS = [
    "",
    "0",
    "-1",
    "1e308",
    "-1e308",
    "nan",
    "inf",
    "1e999",
    "-0",
    "10**10 mm",
    "25 mm # c",
    '"',
    "0x10",
    "١٢",
    "None",
    "NaN",
    "  ",
    "5e-324",
]
SPECIAL_CHARS = list('"=[]{}#,;\t \n\\.-0e') + ["é", "∆", "\x00", "\r", "'"]
SCALES = [1e-12, 1e-6, 1e-3, 0.5, 2.0, 1e3, 1e6, 1e12, -1.0]


def _lines(text: str) -> list[str]:
    return text.splitlines(keepends=True)


def _pick_line(rng: random.Random, lines: list[str], pattern=None) -> int | None:
    idx = [i for i, ln in enumerate(lines) if (pattern is None or pattern.search(ln))]
    return rng.choice(idx) if idx else None


def _header(lines: list[str]) -> int | None:
    for i, ln in enumerate(lines):
        if ln.strip() and not ln.lstrip().startswith("#"):
            return i
    return None


def _ending(line: str) -> str:
    return line[len(line.rstrip("\r\n")) :]


def _m_byte(rng, text, fmt):
    b = bytearray(text.encode("utf-8", "surrogateescape"))
    if not b:
        return bytes([rng.randrange(256)]), "byte into empty"
    k = rng.randrange(len(b))
    b[k] = rng.randrange(256)
    return bytes(b), f"byte {k} -> {b[k]:#x}"


def _m_insert_bytes(rng, text, fmt):
    b = text.encode("utf-8", "surrogateescape")
    k = rng.randrange(len(b) + 1)
    blob = bytes(rng.randrange(256) for _ in range(rng.randint(1, 8)))
    return b[:k] + blob + b[k:], f"insert {blob!r} at {k}"


def _m_delete_bytes(rng, text, fmt):
    b = text.encode("utf-8", "surrogateescape")
    k = rng.randrange(max(len(b), 1))
    n = rng.choice([1, 1, 2, 5, 40])
    return b[:k] + b[k + n :], f"delete {n} bytes at {k}"


def _m_char(rng, text, fmt):
    if not text:
        return None
    k = rng.randrange(len(text))
    c = rng.choice(SPECIAL_CHARS)
    return text[:k] + c + text[k + 1 :], f"char {k} -> {c!r}"


def _m_delete_line(rng, text, fmt):
    lines = _lines(text)
    i = _pick_line(rng, lines, re.compile(r"\S"))
    if i is None:
        return None
    n = rng.choice([1, 1, 1, 3])
    return "".join(lines[:i] + lines[i + n :]), f"delete {n} line(s) from {i + 1}"


def _m_duplicate_line(rng, text, fmt):
    lines = _lines(text)
    i = _pick_line(rng, lines, re.compile(r"\S"))
    if i is None:
        return None
    line = lines[i] if lines[i].endswith("\n") else lines[i] + "\n"
    return "".join(lines[: i + 1] + [line] + lines[i + 1 :]), f"duplicate line {i + 1}"


def _m_swap_lines(rng, text, fmt):
    lines = _lines(text)
    if len(lines) < 2:
        return None
    i, j = rng.sample(range(len(lines)), 2)
    a, b = lines[i].rstrip("\r\n"), lines[j].rstrip("\r\n")
    lines[i], lines[j] = b + _ending(lines[i]), a + _ending(lines[j])
    return "".join(lines), f"swap lines {i + 1} and {j + 1}"


def _m_comment_out(rng, text, fmt):
    lines = _lines(text)
    i = _pick_line(rng, lines, re.compile(r"^\s*[^#\s]"))
    if i is None:
        return None
    lines[i] = "# " + lines[i]
    return "".join(lines), f"comment out line {i + 1}"


def _m_swap_keys(rng, text, fmt):
    lines = _lines(text)
    if fmt == "csv":
        h = _header(lines)
        if h is None:
            return None
        body = lines[h].rstrip("\r\n")
        cells = body.split(",")
        if len(cells) < 2:
            return None
        i, j = rng.sample(range(len(cells)), 2)
        cells[i], cells[j] = cells[j], cells[i]
        lines[h] = ",".join(cells) + _ending(lines[h])
        return "".join(lines), f"swap columns {i} and {j} of the header"
    inline = [i for i, ln in enumerate(lines) if len(INLINE_KEY.findall(ln)) >= 2]
    if inline and rng.random() < 0.4:  # two keys of one inline table
        i = rng.choice(inline)
        ms = list(INLINE_KEY.finditer(lines[i]))
        a, b = rng.sample(ms, 2)
        a, b = (a, b) if a.start() < b.start() else (b, a)
        ln = lines[i]
        ln = ln[: b.start(2)] + a.group(2) + ln[b.end(2) :]
        ln = ln[: a.start(2)] + b.group(2) + ln[a.end(2) :]
        lines[i] = ln
        return "".join(lines), f"swap keys {a.group(2)}, {b.group(2)} in line {i + 1}"
    keyed = [i for i, ln in enumerate(lines) if KEY_LINE.match(ln)]
    if len(keyed) < 2:
        return None
    i, j = rng.sample(keyed, 2)
    ki, kj = KEY_LINE.match(lines[i]).group(2), KEY_LINE.match(lines[j]).group(2)
    lines[i] = KEY_LINE.sub(lambda m: m.group(1) + kj + m.group(3), lines[i], count=1)
    lines[j] = KEY_LINE.sub(lambda m: m.group(1) + ki + m.group(3), lines[j], count=1)
    return "".join(lines), f"swap keys {ki} (line {i + 1}) and {kj} (line {j + 1})"


def _replace_number(rng, text, make):
    lines = _lines(text)
    i = _pick_line(rng, lines, NUMBER)
    if i is None:
        return None
    m = rng.choice(list(NUMBER.finditer(lines[i])))
    new = make(m.group(0))
    if new is None:
        return None
    lines[i] = lines[i][: m.start()] + new + lines[i][m.end() :]
    return "".join(lines), f"line {i + 1}: {m.group(0)!r} -> {new[:40]!r}"


def _m_number_odd(rng, text, fmt):
    pool = ODD_CELLS if fmt == "csv" else ODD_NUMBERS
    return _replace_number(rng, text, lambda _: rng.choice(pool))


def _m_number_scale(rng, text, fmt):
    f = rng.choice(SCALES)

    def scaled(s):
        try:
            return repr(float(s) * f)
        except ValueError:
            return None

    return _replace_number(rng, text, scaled)


def _m_string_odd(rng, text, fmt):
    lines = _lines(text)
    if fmt == "csv":  # a cell of a data line, number or not
        h = _header(lines)
        rows = [i for i in range(len(lines)) if h is not None and i > h and lines[i].strip()]
        if not rows:
            return None
        i = rng.choice(rows)
        cells = lines[i].rstrip("\r\n").split(",")
        j = rng.randrange(len(cells))
        cells[j] = rng.choice(ODD_CELLS)
        lines[i] = ",".join(cells) + _ending(lines[i])
        return "".join(lines), f"line {i + 1} cell {j} -> {cells[j]!r}"
    i = _pick_line(rng, lines, QUOTED)
    if i is None:
        return None
    m = rng.choice(list(QUOTED.finditer(lines[i])))
    new = rng.choice(ODD_STRINGS)
    lines[i] = lines[i][: m.start(1)] + new + lines[i][m.end(1) :]
    return "".join(lines), f"line {i + 1}: {m.group(1)!r} -> {new!r}"


def _m_unit(rng, text, fmt):
    lines = _lines(text)
    unit = rng.choice(UNITS)
    spots = []  # (line, start, end) of every unit
    for i, ln in enumerate(lines):
        for m in QUOTED.finditer(ln):
            q = QUANTITY.match(m.group(1))
            if q:
                spots.append((i, m.start(1) + q.start(2), m.start(1) + q.end(2)))
            elif fmt == "toml" and re.fullmatch(r"[A-Za-z][\w*/^.]*", m.group(1)):
                spots.append((i, m.start(1), m.end(1)))  # unit = "kN" and the like
        for m in re.finditer(r"unit of \w+: (\S+?);", ln):  # a history's comment
            spots.append((i, m.start(1), m.end(1)))
    if not spots:
        return None
    i, a, b = rng.choice(spots)
    old = lines[i][a:b]
    lines[i] = lines[i][:a] + unit + lines[i][b:]
    return "".join(lines), f"line {i + 1}: unit {old!r} -> {unit[:40]!r}"


def _m_bom(rng, text, fmt):
    return b"\xef\xbb\xbf" + text.encode("utf-8", "surrogateescape"), "UTF-8 byte-order mark"


def _m_delimiter(rng, text, fmt):
    new = rng.choice([";", "\t", " ", "|"])
    if fmt == "csv":
        lines = _lines(text)
        if rng.random() < 0.6:
            return text.replace(",", new), f"every ',' -> {new!r}"
        i = _pick_line(rng, lines, re.compile(","))
        if i is None:
            return text.replace("\n", new + "\n"), f"{new!r} at every line end"
        lines[i] = lines[i].replace(",", new)
        return "".join(lines), f"line {i + 1}: ',' -> {new!r}"
    lines = _lines(text)
    if rng.random() < 0.5:
        i = _pick_line(rng, lines, KEY_LINE)
        if i is None:
            return None
        sep = rng.choice([":", "\t", " ", "=="])
        lines[i] = lines[i].replace("=", sep, 1)
        return "".join(lines), f"line {i + 1}: '=' -> {sep!r}"
    i = _pick_line(rng, lines, re.compile(","))
    if i is None:
        return None
    lines[i] = lines[i].replace(",", new)
    return "".join(lines), f"line {i + 1}: ',' -> {new!r}"


def _m_truncate(rng, text, fmt):
    b = text.encode("utf-8", "surrogateescape")
    k = rng.choice([0, 1, rng.randrange(len(b) + 1), rng.randrange(len(b) + 1)])
    return b[:k], f"truncated at byte {k}"


def _m_long(rng, text, fmt):
    lines = _lines(text)
    choice = rng.randrange(4)
    if choice == 0:  # a number of LONG digits
        digits = rng.choice(["9" * LONG, "0." + "1" * (LONG - 2), "1" + "0" * (LONG - 1)])
        return _replace_number(rng, text, lambda _: digits)
    if choice == 1 and fmt == "toml":  # a string value of LONG characters
        i = _pick_line(rng, lines, QUOTED)
        if i is None:
            return None
        m = rng.choice(list(QUOTED.finditer(lines[i])))
        filler = rng.choice(["x" * LONG, "1" * (LONG - 3) + " mm", "mm*" * (LONG // 3)])
        lines[i] = lines[i][: m.start(1)] + filler + lines[i][m.end(1) :]
        return "".join(lines), f"line {i + 1}: a string of {len(filler)} characters"
    if choice == 1:  # a cell of LONG characters
        h = _header(lines)
        i = rng.randrange(len(lines)) if h is None else rng.randrange(h, len(lines))
        lines[i] = "x" * LONG + "," + lines[i]
        return "".join(lines), f"line {i + 1}: a cell of {LONG} characters"
    if choice == 2:  # a line of LONG characters
        i = rng.randrange(len(lines) + 1)
        filler = rng.choice(["#" + "c" * (LONG - 1), "1," * (LONG // 2), "k" * LONG])
        return "".join(lines[:i] + [filler + "\n"] + lines[i:]), f"a long line at {i + 1}"
    key = "x" * (LONG // 2)  # a key (TOML) or header (CSV) of LONG / 2 characters
    if fmt == "csv":
        h = _header(lines)
        if h is None:
            return None
        lines[h] = key + "," + lines[h]
        return "".join(lines), "a header of 1000 characters"
    return f'{key} = "{key}"\n' + text, "a key of 1000 characters"


def _m_line_endings(rng, text, fmt):
    kind = rng.choice(["crlf", "cr", "none"])
    if kind == "crlf":
        return text.replace("\n", "\r\n"), "CRLF line endings"
    if kind == "cr":
        return text.replace("\n", "\r"), "CR line endings"
    return text.rstrip("\n"), "no final newline"


def _m_encoding(rng, text, fmt):
    kind = rng.choice(["utf-16", "latin-1", "nul"])
    if kind == "utf-16":
        return text.encode("utf-16", "surrogatepass"), "UTF-16"
    if kind == "latin-1":
        b = text.encode("utf-8", "surrogateescape")
        k = rng.randrange(len(b) + 1)
        return b[:k] + "é°µ".encode("latin-1") + b[k:], f"Latin-1 bytes at {k}"
    b = text.encode("utf-8", "surrogateescape")
    k = rng.randrange(len(b) + 1)
    return b[:k] + b"\x00" + b[k:], f"NUL byte at {k}"


KINDS = [
    _m_byte,
    _m_insert_bytes,
    _m_delete_bytes,
    _m_char,
    _m_delete_line,
    _m_duplicate_line,
    _m_swap_lines,
    _m_comment_out,
    _m_swap_keys,
    _m_number_odd,
    _m_number_odd,
    _m_number_scale,
    _m_string_odd,
    _m_unit,
    _m_bom,
    _m_delimiter,
    _m_truncate,
    _m_long,
    _m_line_endings,
    _m_encoding,
]


def _apply(rng: random.Random, kind, data: bytes, fmt: str) -> tuple[bytes, str]:
    text = data.decode("utf-8", errors="surrogateescape")
    got = kind(rng, text, fmt)
    if got is None:  # nothing to act on: a byte edit instead
        got = _m_byte(rng, text, fmt)
    out, what = got
    if isinstance(out, str):
        out = out.encode("utf-8", errors="surrogateescape")
    return out, f"{kind.__name__[3:]}: {what}"


def mutants(name: str, base: bytes, fmt: str, n: int = MUTANTS):
    """``n`` mutants of ``base`` as (index, bytes, description), the same for every run: each
    kind of mutation in turn, every fifth mutant with a second mutation on top."""
    rng = random.Random(f"{SEED}:{name}")
    for i in range(n):
        kind = KINDS[i % len(KINDS)]
        data, what = _apply(rng, kind, base, fmt)
        if i % 5 == 4:
            data, more = _apply(rng, rng.choice(KINDS), data, fmt)
            what += f"; {more}"
        if data == base:
            data, more = _apply(rng, _m_byte, base, fmt)
            what += f"; {more}"
        yield i, data, what


# ----------------------------------------------------------------------------- capping
def _capped(data: bytes, section: str, key: str, cap) -> bytes | None:
    """The case ``data`` with ``[section] key`` at most ``cap`` (added when absent, lowered
    when larger), edited line by line so the mutation stays; None if it cannot be."""
    try:
        text = data.decode("utf-8")
        raw = tomllib.loads(text.removeprefix("\ufeff"))
    except (UnicodeDecodeError, tomllib.TOMLDecodeError):
        return None
    sec = raw.get(section)
    if not isinstance(sec, dict):
        return None
    cur = sec.get(key)
    number = isinstance(cur, (int, float)) and not isinstance(cur, bool)
    if number and cur <= cap:
        return data  # already bounded
    if cur is not None and not number:
        return None
    lines = _lines(text)
    head = re.compile(rf"^\s*\[\s*{section}\s*\]\s*(#.*)?$")
    starts = [i for i, ln in enumerate(lines) if head.match(ln.rstrip("\r\n"))]
    if len(starts) != 1:
        return None
    s = starts[0]
    end = next(
        (i for i in range(s + 1, len(lines)) if lines[i].lstrip().startswith("[")), len(lines)
    )
    value = f"{key} = {cap!r}"
    keyed = [i for i in range(s + 1, end) if re.match(rf"^\s*{key}\s*=", lines[i])]
    if keyed:
        lines[keyed[0]] = value + (_ending(lines[keyed[0]]) or "\n")
    else:
        lines.insert(s + 1, value + (_ending(lines[s]) or "\n"))
        if not _ending(lines[s]):
            lines[s] += "\n"
    out = "".join(lines)
    try:
        got = tomllib.loads(out.removeprefix("\ufeff"))[section][key]
    except (tomllib.TOMLDecodeError, KeyError, TypeError):
        return None
    return out.encode("utf-8", "surrogateescape") if got == cap else None


# ----------------------------------------------------------------------------- running
def _hashes(folder: Path) -> dict[str, str]:
    return {
        p.relative_to(folder).as_posix(): hashlib.sha256(p.read_bytes()).hexdigest()
        for p in sorted(folder.rglob("*"))
        if p.is_file()
    }


class Fuzz:
    """Runs commands on mutants, checks every outcome, counts them and keeps the failures."""

    def __init__(self, capsys, tmp_path: Path):
        self.capsys, self.tmp, self.failures = capsys, tmp_path, []

    def folder(self, label: str, files: dict[str, bytes]) -> Path:
        d = self.tmp / label
        if d.exists():
            shutil.rmtree(d)
        for rel, data in files.items():
            (d / rel).parent.mkdir(parents=True, exist_ok=True)
            (d / rel).write_bytes(data)
        return d

    def run(self, d: Path, args, command: str, kind: str, what: str, *, refusal=False) -> int:
        """Run ``args`` on the inputs in ``d``; check the outcome; the exit status."""
        before = _hashes(d)
        t0 = time.monotonic()
        try:
            code, out, err = run_cli(args, self.capsys)
        except BaseException as exc:  # noqa: BLE001 - anything escaping main is a crash
            code, out, err = 1, "", f"Traceback: {type(exc).__name__}: {exc}"
        took = time.monotonic() - t0
        if not isinstance(code, int):
            code = 0 if code is None else 1
        key = (f"{command} (refusal)" if refusal else command, kind)
        COUNTS[key][code] += 1
        SECONDS[key] += took
        SLOWEST.append((took, f"{command}: {what}"))
        SLOWEST.sort(reverse=True)
        del SLOWEST[8:]
        lines = [ln for ln in err.splitlines() if ln.strip()]
        problems = []
        if refusal and code != 2:
            problems.append("--out on the folder of the inputs was not refused")
        if code not in (0, 2):
            problems.append(f"exit {code}")
        if "Traceback" in err + out or "internal error" in err:
            problems.append("traceback or internal error")
        if code == 2:
            if not 1 <= len(lines) <= 3:
                problems.append(f"{len(lines)} lines on stderr")
            elif not _names_something(lines[0], d):
                problems.append("the first line names no file, key or line")
        if took > MAX_SECONDS:
            problems.append(f"took {took:.0f} s")
        after = {k: v for k, v in _hashes(d).items() if k in before}
        changed = sorted(k for k in before if after.get(k) != before[k])
        if changed:
            problems.append(f"inputs changed or removed: {changed}")
        left = [p.name for p in d.rglob("*") if re.search(r"\.cycj-(tmp|old|lock)", p.name)]
        if left:
            problems.append(f"left over: {left}")
        if LOG:  # every outcome, one line each, for reading the messages
            with open(LOG, "a", encoding="utf-8") as fh:
                fh.write(f"{command}\t{kind}\t{code}\t{lines[0] if lines else ''}\t{what}\n")
        if problems:
            self.failures.append(
                f"{what}\n  args: {[str(a) for a in args]}\n  problems: {problems}\n"
                f"  stderr: {err[-600:]!r}\n  kept in {d}"
            )
        return code

    def done(self, d: Path) -> None:
        """Remove a mutant's folder unless a failure names it."""
        if not any(str(d) in f for f in self.failures):
            shutil.rmtree(d, ignore_errors=True)

    def assert_clean(self):
        assert not self.failures, f"{len(self.failures)} failures:\n" + "\n".join(self.failures[:6])


def _names_something(line: str, d: Path) -> bool:
    """The first line of an error names a file of ``d`` (or ``d``), a key or a line."""
    if str(d) in line or any(p.name in line for p in d.rglob("*") if p.is_file()):
        return True
    return bool(re.search(r"\[[\w.\-\]\[ ]+\]|\bline \d+|--\w+|\bkey\b", line))


@pytest.fixture
def fuzz(capsys, tmp_path):
    return Fuzz(capsys, tmp_path)


# ----------------------------------------------------------------------------- the tests
def _case_files(case: str) -> dict[str, bytes]:
    rel = f"examples/{case}"
    return {r: _base_bytes(r) for r in [rel, *_referred(rel)]}


@pytest.mark.parametrize("case", CASES)
def test_case_mutants(fuzz, case):
    """``check`` on every mutant of the case file, ``run`` (and ``plan``) on the first that
    pass."""
    rel = f"examples/{case}"
    files = _case_files(case)
    runs = plans = 0
    for i, data, what in mutants(rel, files[rel], "toml"):
        d = fuzz.folder(f"m{i}", {**files, rel: data})
        what = f"{rel} mutant {i}: {what}"
        code = fuzz.run(d, ["check", d / rel], "check", "case", what)
        if code == 0 and runs < RUN_SUBSET:
            capped = _capped(data, "run", "max_cycles", CYCLE_CAP)
            if capped is not None:
                runs += 1
                (d / rel).write_bytes(capped)
                args = ["run", d / rel, "--no-plots", "--out", d / "out"]
                fuzz.run(d, args, "run", "case", what)
                shutil.rmtree(d / "out", ignore_errors=True)
                (d / rel).write_bytes(data)
        if code == 0 and case == INSPECTION_CASE and plans < PLAN_SUBSET:
            capped = _capped(data, "inspection", "samples", SAMPLE_CAP)
            if capped is not None:
                plans += 1
                (d / rel).write_bytes(capped)
                args = ["plan", d / rel, "--no-plots", "--out", d / "plan-out"]
                fuzz.run(d, args, "plan", "case", what)
        fuzz.done(d)
    assert runs >= 3 or MUTANTS < 100, f"only {runs} mutants of {case} ran"
    # an output folder holding the inputs is refused, even with --force
    d = fuzz.folder("refusal", files)
    for out in sorted({(d / r).parent for r in files}):
        args = ["run", d / rel, "--no-plots", "--force", "--out", out]
        fuzz.run(d, args, "run", "case", f"{rel}: --out {out}", refusal=True)
        if case == INSPECTION_CASE:
            args = ["plan", d / rel, "--no-plots", "--force", "--out", out]
            fuzz.run(d, args, "plan", "case", f"{rel}: --out {out}", refusal=True)
    fuzz.assert_clean()


def test_table_mutants(fuzz):
    """``check`` on the tabulated-geometry example with every mutant of its table."""
    case = "lug_tabulated.toml"
    files = _case_files(case)
    table = "examples/lug_table.csv"
    assert table in files
    for i, data, what in mutants(table, files[table], "csv"):
        d = fuzz.folder(f"m{i}", {**files, table: data})
        fuzz.run(d, ["check", d / "examples" / case], "check", "table", f"{table} {i}: {what}")
        fuzz.done(d)
    fuzz.assert_clean()


@pytest.mark.parametrize("history", HISTORIES)
def test_history_mutants(fuzz, history):
    """``count`` on every mutant of the history; ``run`` of a case reading it, on the
    first few."""
    base = _base_bytes(history)
    readers = _readers(history)
    for i, data, what in mutants(history, base, "csv"):
        files = {history: data}
        reader = readers[i % len(readers)] if readers and i < HISTORY_RUNS else None
        if reader:
            rel = f"examples/{reader}"
            case = _capped(_base_bytes(rel), "run", "max_cycles", CYCLE_CAP)
            files = {**_case_files(reader), rel: case, history: data}
        d = fuzz.folder(f"m{i}", files)
        what = f"{history} mutant {i}: {what}"
        out = ["--no-plots", "--out", d / "out"] if i % OUT_EVERY == 0 else []
        args = ["count", d / history, *out]
        fuzz.run(d, args, "count", "history", what)
        if reader:
            args = ["run", d / rel, "--no-plots", "--out", d / "run-out"]
            fuzz.run(d, args, "run", "history", what)
        fuzz.done(d)
    d = fuzz.folder("refusal", {history: base})
    out = (d / history).parent
    args = ["count", d / history, "--no-plots", "--force", "--out", out]
    fuzz.run(d, args, "count", "history", f"{history}: --out {out}", refusal=True)
    fuzz.assert_clean()


def _fit(d: Path, log: str, out: Path | None = None, force=()):
    return [
        "fit",
        d / log,
        "--specimen",
        d / SPECIMEN,
        "--no-plots",
        *force,
        "--out",
        out or d / "out",
    ]


@pytest.mark.parametrize("log", LOGS)
def test_log_mutants(fuzz, log):
    """``fit`` on every mutant of the (shortened) test log, with the example specimen."""
    base, specimen = _base_bytes(f"examples/{log}"), _base_bytes(f"examples/{SPECIMEN}")
    for i, data, what in mutants(log, base, "csv"):
        d = fuzz.folder(f"m{i}", {log: data, SPECIMEN: specimen})
        fuzz.run(d, _fit(d, log), "fit", "log", f"{log} mutant {i}: {what}")
        fuzz.done(d)
    d = fuzz.folder("refusal", {log: base, SPECIMEN: specimen})
    args = _fit(d, log, d, ["--force"])
    fuzz.run(d, args, "fit", "log", f"{log}: --out on its folder", refusal=True)
    fuzz.assert_clean()


def test_specimen_mutants(fuzz):
    """``fit`` of each test log in turn with every mutant of the specimen file."""
    base = _base_bytes(f"examples/{SPECIMEN}")
    logs = {log: _base_bytes(f"examples/{log}") for log in LOGS}
    for i, data, what in mutants(SPECIMEN, base, "toml"):
        log = LOGS[i % len(LOGS)]
        d = fuzz.folder(f"m{i}", {log: logs[log], SPECIMEN: data})
        fuzz.run(d, _fit(d, log), "fit", "specimen", f"{SPECIMEN} mutant {i}: {what}")
        fuzz.done(d)
    d = fuzz.folder("refusal", {LOGS[0]: logs[LOGS[0]], SPECIMEN: base})
    args = _fit(d, LOGS[0], d, ["--force"])
    fuzz.run(d, args, "fit", "specimen", "specimen: --out on its folder", refusal=True)
    fuzz.assert_clean()


@pytest.mark.parametrize("pod", PODS)
def test_pod_mutants(fuzz, pod):
    """``pod`` on every mutant of the POD data."""
    base = _base_bytes(f"examples/{pod}")
    for i, data, what in mutants(pod, base, "csv"):
        d = fuzz.folder(f"m{i}", {pod: data})
        out = ["--no-plots", "--out", d / "out"] if i % OUT_EVERY == 0 else []
        args = ["pod", d / pod, *out]
        fuzz.run(d, args, "pod", "pod data", f"{pod} mutant {i}: {what}")
        fuzz.done(d)
    d = fuzz.folder("refusal", {pod: base})
    args = ["pod", d / pod, "--no-plots", "--force", "--out", d]
    fuzz.run(d, args, "pod", "pod data", f"{pod}: --out on its folder", refusal=True)
    fuzz.assert_clean()


FUZZ_TESTS = {
    "test_case_mutants",
    "test_table_mutants",
    "test_history_mutants",
    "test_log_mutants",
    "test_specimen_mutants",
    "test_pod_mutants",
}


def test_summary(request, tmp_path_factory, capsys):
    """The counts per command and input type (exit 0 / exit 2), printed and kept as JSON; with
    every fuzz test of this file selected, each input type had at least 100 mutants."""
    ran = {item.originalname for item in request.session.items if item.module.__name__ == __name__}
    partial = not FUZZ_TESTS <= ran
    if partial and not COUNTS:
        pytest.skip("no fuzz test of this file was selected")
    summary = {
        f"{cmd} / {kind}": {
            "mutants": sum(c.values()),
            **{f"exit {k}": v for k, v in sorted(c.items())},
            "seconds": round(SECONDS[(cmd, kind)], 1),
        }
        for (cmd, kind), c in sorted(COUNTS.items())
    }
    path = tmp_path_factory.mktemp("fuzz") / "fuzz_counts.json"
    path.write_text(json.dumps(summary, indent=1), encoding="utf-8")
    with capsys.disabled():
        print(f"\nfuzz corpus counts ({path}):")
        for name, c in summary.items():
            print(f"  {name:28s} " + "  ".join(f"{k}: {v}" for k, v in c.items()))
        print("slowest:")
        for took, what in SLOWEST:
            print(f"  {took:6.2f} s  {what[:110]}")
    if partial:
        pytest.skip("only some fuzz tests of this file were selected (counts printed)")
    per_type = Counter()
    for (cmd, kind), c in COUNTS.items():
        if "refusal" not in cmd:
            per_type[kind] += sum(c.values())
    expected = {
        "case": len(CASES) * MUTANTS,
        "table": MUTANTS,
        "history": len(HISTORIES) * MUTANTS,
        "log": len(LOGS) * MUTANTS,
        "specimen": MUTANTS,
        "pod data": len(PODS) * MUTANTS,
    }
    for kind, n in expected.items():
        assert per_type[kind] >= n >= 100, (kind, per_type[kind])
    for cmd in ("check", "run", "plan", "count", "fit", "pod"):
        assert any(c == cmd for c, _ in COUNTS), cmd
        assert sum(COUNTS[(c, k)][0] for c, k in COUNTS if c == cmd) > 0, f"{cmd}: no exit 0"
    for (cmd, _), c in COUNTS.items():
        if "refusal" in cmd:
            assert set(c) == {2}, (cmd, c)
