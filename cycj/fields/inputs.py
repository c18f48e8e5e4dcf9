"""Case-file input for stress fields: a primary stress profile, a residual stress and several
load channels (validated, one-line errors naming the key).

Keys (all optional)::

    [geometry]
    stress_profile = { kind = "polynomial", coefficients = [1.0, -0.6] }   # σ(x)/load, x/t
    #              or { kind = "table", x_over_t = [...], stress = [...] } or { file = "p.csv" }
    residual_stress = { uniform = "250 MPa", relaxation = 0.7 }
    #              or { profile = { kind = "polynomial", coefficients = [300, -600] },
    #                   relaxation = "bs7910" }   # coefficients in MPa

    [[loading.channels]]        # superposed cycle by cycle; counted on the combined K
    name = "pressure"
    column = "p"                # column of the loading.history file
    unit = "MPa"
    scale = 1.0
    stress_profile = { kind = "polynomial", coefficients = [1.0] }   # per unit channel value
    secondary = false           # true: a secondary (e.g. thermal) stress, in K but not in L_r
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path

from cycj.errors import CycjInputError
from cycj.tables import Table

UNIFORM = {"kind": "polynomial", "coefficients": (1.0,)}


@dataclass(frozen=True)
class Channel:
    """One load channel: a history column whose value multiplies a stress profile."""

    name: str
    column: str | None
    unit_factor: float
    scale: float
    profile: object  # cycj.fields.profiles.StressProfile
    secondary: bool = False  # thermal-type stress: in K (and R6 ρ), never in L_r


@dataclass(frozen=True)
class FieldSpec:
    """Stress-field inputs of a case (None when the case has none)."""

    profile: object | None = None  # primary profile for the single load channel
    residual: object | None = None  # float [MPa] or StressProfile [MPa]
    relaxation: float | str = 1.0  # factor in [0, 1] or "bs7910"
    channels: tuple = field(default_factory=tuple)


def read_profile(raw, key: str, source, base: Path, unit_scale: bool = False):
    """A StressProfile from its table (polynomial, inline table or CSV file)."""
    from cycj.errors import ValidityRangeError
    from cycj.fields.profiles import StressProfile

    t = Table(raw, key, source)
    path = t.string("file")
    if path is not None:
        import numpy as np

        from cycj.inputs_read import note_input

        p = base / path
        note_input(p, "profile")
        try:
            arr = np.loadtxt(p, delimiter=",", comments="#", skiprows=1, ndmin=2)
        except (OSError, ValueError) as exc:
            raise t.error("file", f"cannot read the profile table ({exc})", found=str(p)) from None
        t.finish()
        xs, ss = tuple(arr[:, 0]), tuple(arr[:, 1])
        kind = "table"
        coeffs = ()
    else:
        kind = t.choice("kind", ("polynomial", "table"), required=True)
        coeffs = tuple(_numbers(t, "coefficients")) if kind == "polynomial" else ()
        xs = tuple(_numbers(t, "x_over_t")) if kind == "table" else ()
        ss = tuple(_numbers(t, "stress")) if kind == "table" else ()
        t.finish()
    try:
        return StressProfile(kind, coeffs, xs, ss)
    except (ValueError, ValidityRangeError) as exc:
        raise CycjInputError(str(exc), source=source, key=key) from None


def _numbers(t: Table, name: str):
    raw = t.get(name, required=True)
    if (
        not isinstance(raw, list)
        or not raw
        or not all(isinstance(v, (int, float)) and not isinstance(v, bool) for v in raw)
    ):
        raise t.error(name, "must be a non-empty list of numbers", found=raw)
    return [float(v) for v in raw]


def read_fields(
    geo_raw: dict, channels_raw, source, base: Path, geo_key="geometry", ch_key="loading.channels"
) -> FieldSpec | None:
    """Parse ``stress_profile``/``residual_stress`` of [geometry] and [[loading.channels]]."""
    from cycj.fields.profiles import StressProfile
    from cycj.units import unit_factor

    prof_raw = geo_raw.get("stress_profile")
    res_raw = geo_raw.get("residual_stress")
    if prof_raw is None and res_raw is None and not channels_raw:
        return None
    profile = (
        None
        if prof_raw is None
        else read_profile(prof_raw, f"{geo_key}.stress_profile", source, base)
    )
    residual, relaxation = None, 1.0
    if res_raw is not None:
        t = Table(res_raw, f"{geo_key}.residual_stress", source)
        uni = t.get("uniform")
        prof = t.get("profile")
        if (uni is None) == (prof is None):
            raise t.error("uniform", 'give either uniform = "... MPa" or profile = {...}')
        residual = (
            t.quantity("uniform", "stress")
            if uni is not None
            else read_profile(prof, t.key("profile"), source, base)
        )
        rel = t.get("relaxation", 1.0)
        if rel != "bs7910" and (
            isinstance(rel, bool) or not isinstance(rel, (int, float)) or not 0 <= rel <= 1
        ):
            raise t.error(
                "relaxation", "out of range", expected='a factor in [0, 1] or "bs7910"', found=rel
            )
        relaxation = rel if rel == "bs7910" else float(rel)
        t.finish()
    channels = []
    if channels_raw:
        if not isinstance(channels_raw, list):
            raise CycjInputError(
                "must be an array of tables [[loading.channels]]", source=source, key=ch_key
            )
        if profile is not None:
            raise CycjInputError(
                "with load channels give each channel its own stress_profile",
                source=source,
                key=f"{geo_key}.stress_profile",
            )
        from cycj.kernel_slots import MAX_CHANNELS

        if len(channels_raw) > MAX_CHANNELS:
            raise CycjInputError(
                "too many load channels",
                source=source,
                key=ch_key,
                expected=f"at most {MAX_CHANNELS}",
                found=len(channels_raw),
            )
        for i, raw in enumerate(channels_raw):
            t = Table(raw, f"{ch_key}[{i}]", source)
            name = t.string("name", default=f"channel {i + 1}")
            column = t.string("column", required=True)
            unit = t.string("unit")
            factor = (
                1.0
                if unit is None
                else unit_factor(unit, "stress", key=t.key("unit"), source=source)
            )
            scale = t.number("scale", default=1.0)
            secondary = t.get("secondary", False)
            if not isinstance(secondary, bool):
                raise t.error("secondary", "must be true or false", found=secondary)
            praw = t.get("stress_profile")
            prof = (
                StressProfile(**UNIFORM)
                if praw is None
                else read_profile(praw, t.key("stress_profile"), source, base)
            )
            t.finish()
            channels.append(Channel(name, column, factor, scale, prof, secondary))
    return FieldSpec(profile, residual, relaxation, tuple(channels))
