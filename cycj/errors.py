"""Errors that the command line turns into one clear line and exit status 2."""

from __future__ import annotations


class CycjInputError(ValueError):
    """Bad input: names where (file, key path or line), what was expected and what was found."""

    def __init__(
        self,
        message: str,
        *,
        source: str | None = None,
        key: str | None = None,
        line: int | None = None,
        expected: str | None = None,
        found: object | None = None,
    ):
        self.source, self.key, self.line = source, key, line
        self.expected, self.found = expected, found
        parts = []
        where = ""
        if source:
            where = str(source)
            if line is not None:
                where += f":{line}"
        if key:
            where = f"{where}: [{key}]" if where else f"[{key}]"
        if where:
            parts.append(where)
        parts.append(message)
        if expected is not None:
            parts.append(f"expected {expected}")
        if found is not None:
            parts.append(f"found {short_repr(found)}")
        text = ": ".join(parts[:2]) + ("; " + "; ".join(parts[2:]) if parts[2:] else "")
        super().__init__(one_line(text))


#: longest quotation of a bad value in an error [characters]
MAX_QUOTE = 80


def short_repr(value, n: int = MAX_QUOTE) -> str:
    """``repr(value)``, cut to at most ``n`` characters (ending in "…") so that an error quoting
    a huge value stays one short line."""
    r = repr(value)
    return r if len(r) <= n else r[: n - 1] + "…"


def one_line(text: str) -> str:
    """``text`` with control characters (line breaks, form feeds …) shown as escapes, so an
    error stays on one line whatever a file's keys or values hold."""
    return "".join(c if c.isprintable() or c == " " else repr(c)[1:-1] for c in text)


class ValidityRangeError(ValueError):
    """A physics function was called outside the validity range of its published source."""
