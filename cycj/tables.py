"""Reading nested TOML tables with clear, one-line errors (file, key path, expected, found).

Shared by the case file, the specimen file and every other TOML input.  The keys a table may
hold are declared once in :mod:`cycj.schema`: an undeclared key is unknown, with a "did you
mean" from the declared ones, and a misspelt required key is named with its likely spelling.
"""

from __future__ import annotations

import difflib
import math
import sys
import tomllib
from pathlib import Path

from cycj.errors import CycjInputError
from cycj.units import to_internal


def read_toml(path, role: str = "input") -> dict:
    """Parse a TOML file (a UTF-8 byte-order mark is allowed); a missing file or bad syntax is
    one clear error.  The file is noted as an input of the command (``role``)."""
    from cycj.inputs_read import note_input

    path = Path(path)
    if not path.is_file():
        raise CycjInputError("file not found", source=str(path))
    note_input(path, role)
    try:
        text = path.read_bytes().decode("utf-8")
        raw = tomllib.loads(text.removeprefix("\ufeff"))
    except tomllib.TOMLDecodeError as exc:
        raise CycjInputError(f"not valid TOML ({exc})", source=str(path)) from None
    except UnicodeDecodeError:
        raise CycjInputError("not a UTF-8 text file", source=str(path)) from None
    except ValueError:  # an integer of more digits than Python converts
        raise CycjInputError(
            "not valid TOML (an integer of more digits than can be read)", source=str(path)
        ) from None
    huge = _huge_integer(raw)
    if huge is not None:
        raise CycjInputError(
            "integer beyond the range of a number",
            source=str(path),
            key=huge[0],
            expected=f"a magnitude below {sys.float_info.max:.3g}",
            found=huge[1],
        )
    return raw


def _huge_integer(obj, key: str = ""):
    """(key path, value) of the first integer of parsed TOML too large for a float, or None
    (TOML integers have no bound; every number read is used as a float)."""
    if isinstance(obj, dict):
        items = ((f"{key}.{k}" if key else str(k), v) for k, v in obj.items())
    elif isinstance(obj, list):
        items = ((f"{key}[{i}]", v) for i, v in enumerate(obj))
    elif isinstance(obj, int) and not isinstance(obj, bool) and abs(obj) > sys.float_info.max:
        return key, obj
    else:
        return None
    for k, v in items:
        found = _huge_integer(v, k)
        if found is not None:
            return found
    return None


class Table:
    """One TOML table being read: every key read is remembered, the rest are reported."""

    def __init__(self, raw, path: str, source: str | None, doc: str = "case"):
        if not isinstance(raw, dict):
            raise CycjInputError(
                "must be a table",
                source=source,
                key=path or None,
                expected="a TOML table { ... }",
                found=raw,
            )
        self.raw, self.path, self.source, self.doc = raw, path, source, doc
        self.known: set[str] = set()

    @property
    def declared(self):
        """This table's section in :mod:`cycj.schema` (None for an undeclared table)."""
        from cycj import schema

        return schema.section(self.doc, self.path)

    def missing(self, name: str, expected=None) -> CycjInputError:
        """The error for a missing required key, naming a likely misspelling of it."""
        sec = self.declared
        declared = set(sec.names) if sec is not None else self.known
        strays = [k for k in self.raw if k not in declared and k not in self.known]
        near = difflib.get_close_matches(name, strays, n=1, cutoff=0.6)
        if near:
            return self.error(
                name,
                f"missing required key '{name}'; did you mean '{name}' for '{near[0]}'?",
                expected=expected,
            )
        return self.error(name, "missing required key", expected=expected)

    def key(self, name: str) -> str:
        return f"{self.path}.{name}" if self.path else name

    def error(self, name: str, message: str, expected=None, found=None) -> CycjInputError:
        return CycjInputError(
            message, source=self.source, key=self.key(name), expected=expected, found=found
        )

    def has(self, name: str) -> bool:
        self.known.add(name)
        return name in self.raw

    def get(self, name: str, default=None, *, required: bool = False):
        self.known.add(name)
        if name not in self.raw:
            if required:
                raise self.missing(name)
            return default
        return self.raw[name]

    def quantity(
        self,
        name,
        kind,
        *,
        required=False,
        default=None,
        positive=False,
        nonnegative=False,
        lo=None,
        hi=None,
    ):
        """A quantity in internal units (unit strings allowed; bare numbers are internal)."""
        raw = self.get(name, required=required)
        if raw is None:
            return default
        val = to_internal(raw, kind, key=self.key(name), source=self.source)
        self._range(name, val, raw, positive, nonnegative, lo, hi)
        return val

    def number(
        self,
        name,
        *,
        required=False,
        default=None,
        positive=False,
        nonnegative=False,
        lo=None,
        hi=None,
        integer=False,
    ):
        raw = self.get(name, required=required)
        if raw is None:
            return default
        if isinstance(raw, bool) or not isinstance(raw, (int, float)):
            raise self.error(name, "not a number", expected="a number", found=raw)
        val = float(raw)
        if not math.isfinite(val):
            raise self.error(name, "not a finite number", expected="a finite number", found=raw)
        if integer and val != int(val):
            raise self.error(name, "not a whole number", expected="an integer", found=raw)
        self._range(name, val, raw, positive, nonnegative, lo, hi)
        return int(val) if integer else val

    def _range(self, name, val, raw, positive, nonnegative, lo, hi):
        if positive and not val > 0:
            raise self.error(name, "out of range", expected="a value > 0", found=raw)
        if nonnegative and not val >= 0:
            raise self.error(name, "out of range", expected="a value ≥ 0", found=raw)
        if lo is not None and hi is not None and not lo[0] <= val <= hi[0]:
            raise self.error(name, "out of range", expected=f"{lo[1]} to {hi[1]}", found=raw)

    def choice(self, name, options, *, default=None, required=False):
        if required and name not in self.raw:
            self.known.add(name)
            raise self.missing(name, expected="one of " + ", ".join(map(repr, options)))
        raw = self.get(name, default=default, required=required)
        if raw is None:
            return None
        if not isinstance(raw, str) or raw not in options:
            near = difflib.get_close_matches(str(raw), list(options), n=1)
            hint = f" (did you mean '{near[0]}'?)" if near else ""
            raise self.error(
                name,
                f"unknown value{hint}",
                expected="one of " + ", ".join(repr(o) for o in options),
                found=raw,
            )
        return raw

    def string(self, name, *, default=None, required=False):
        raw = self.get(name, default=default, required=required)
        if raw is not None and not isinstance(raw, str):
            raise self.error(name, "not a string", expected="a text value in quotes", found=raw)
        return raw

    def table(self, name, *, required=False):
        raw = self.get(name, required=required)
        if raw is None:
            return None
        return Table(raw, self.key(name), self.source, self.doc)

    def finish(self, extra_ok=()):
        """Report the first unknown key, with a 'did you mean' from the declared ones (or, for
        an undeclared table, from the keys read); a declared key that these settings do not
        read is reported too, never ignored."""
        known = self.known | set(extra_ok)
        sec = self.declared
        if sec is not None:
            from cycj import schema

            declared = set(sec.names)
            schema.UNDECLARED.update(
                (self.doc, schema.normal_path(self.path), k) for k in known - declared
            )
            for k in self.raw:
                if k not in declared:
                    near = difflib.get_close_matches(k, sorted(declared), n=1)
                    hint = f" (did you mean '{near[0]}'?)" if near else ""
                    raise self.error(
                        k, f"unknown key{hint}", expected="one of " + ", ".join(sec.names)
                    )
                if k not in known:
                    raise self.error(
                        k,
                        "not used with the other keys given here",
                        expected="one of " + ", ".join(sorted(known)),
                    )
            return
        for k in self.raw:
            if k not in known:
                near = difflib.get_close_matches(k, sorted(known), n=1)
                hint = f" (did you mean '{near[0]}'?)" if near else ""
                raise self.error(
                    k, f"unknown key{hint}", expected="one of " + ", ".join(sorted(known))
                )
