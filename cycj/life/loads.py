"""Loads of job 1: the case's repeated block of cycles as arrays for the stepper.

One channel: nominal stresses (S_max, S_min) of each cycle, from a constant amplitude or a
counted history.  Load channels: each channel's value at every cycle's peak and valley sample
and the channels' K tables (per unit value, from weight functions; :mod:`cycj.fields`).

References
----------
.. [1] ASTM E1049-85 (2017): rainflow counting (cycles in the order they close).
.. [2] Glinka, G., Shen, G., Eng. Fract. Mech. 40 (1991) 1135 (weight functions; K of an
   arbitrary profile), via :mod:`cycj.fields.weight_functions`.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from cycj.case import Case
from cycj.errors import CycjInputError
from cycj.fields.channels import plate_reference_stress

# ------------------------------------------------------------------ building the tables
N_GRID = 400
N_GRID_2D = 60


@dataclass
class BlockLoads:
    """One block of the repeated history as cycles in stepper order.

    ``lmax``, ``lmin``: arrays (cycles × channels): nominal stresses [MPa] for one channel, or
    the channels' values at each cycle's peak and valley; ``ct``: the channels' K tables (a
    dummy for one channel); ``i_peak``: the cycle carrying the history's peak load.
    """

    lmax: np.ndarray
    lmin: np.ndarray
    order: str
    hours_per_block: float | None = None
    samples: int = 0
    ct: np.ndarray = field(default_factory=lambda: np.zeros((1, 2, 1)))
    i_peak: int = 0
    channel_slots: dict = field(default_factory=dict)
    peak_equivalent: float | None = None  # with load channels: combined peak as membrane MPa

    @property
    def n(self) -> int:
        return int(self.lmax.shape[0])

    @property
    def smax(self) -> np.ndarray:
        return self.lmax[:, 0]

    @property
    def smin(self) -> np.ndarray:
        return self.lmin[:, 0]

    @property
    def peak(self) -> float:
        """Peak nominal stress [MPa] (first channel's value at the peak cycle)."""
        return float(self.lmax[self.i_peak, 0])


def block_loads(case: Case, load_scale: float = 1.0) -> BlockLoads:
    """The case's repeated block as (S_max, S_min) nominal-stress arrays [MPa].

    Without a sequence model the cycles come in the order they close in a rainflow count of the
    repeated history (ASTM E1049-85); with one, each rising reversal is a cycle in time order,
    so overloads stay where they happened.
    """
    ld = case.loading
    per_force = {
        "force": case.geometry.nominal_stress_per_force,
        "pressure": case.geometry.nominal_stress_per_pressure,
    }.get(ld.quantity, lambda: 1.0)()
    order = "closing" if ld.sequence == "none" else "reversal"
    if case.fields is not None:
        lmax, lmin, ct, i_peak, slots, samples, peak = channel_block(case, load_scale, order)
        return BlockLoads(lmax, lmin, order, ld.duration_h, samples, ct, i_peak, slots, peak)
    if ld.constant is not None:
        smax = np.array([ld.constant[0] * per_force])
        smin = np.array([ld.constant[1] * per_force])
        samples = 2
    else:
        from cycj.spectrum import cycles_in_sequence, read_history
        from cycj.spectrum.cycle_order import closing_cycles
        from cycj.spectrum.reversals import block_reversal_values
        from cycj.units import unit_factor as _unit_factor

        kind = "force" if ld.quantity == "force" else "stress"
        unit_factor = 1.0 if ld.unit is None else _unit_factor(ld.unit, kind)
        values = read_history(
            ld.history, column=ld.column, unit_factor=unit_factor, scale=ld.scale, sheet=ld.sheet
        )
        samples = int(values.size)
        if order == "closing":  # in two steps: the history is freed before the count
            reversals = block_reversal_values(values, ld.gate)
            del values
            peaks, valleys = closing_cycles(reversals)
            del reversals
        else:
            peaks, valleys = cycles_in_sequence(values, gate=ld.gate, order=order)
        if peaks.size == 0:
            raise CycjInputError(
                "the history has no cycles above the gate",
                source=str(ld.history),
                key="loading.gate",
                found=ld.gate,
            )
        peaks *= per_force  # in place: the block is as long as the history's cycles
        valleys *= per_force
        smax, smin = peaks, valleys
    smax *= load_scale
    smin *= load_scale
    if not np.any(smax > 0):
        raise CycjInputError(
            "no cycle reaches a tensile load: the crack cannot grow",
            source=str(case.path),
            key="loading",
        )
    return BlockLoads(
        np.ascontiguousarray(smax[:, None], float),
        np.ascontiguousarray(smin[:, None], float),
        order,
        ld.duration_h,
        samples,
        i_peak=int(np.argmax(smax)),
    )


def block_info(case: Case) -> tuple[int, float | None]:
    """Cycles per block and hours per cycle (None when the case gives no duration)."""
    loads = block_loads(case)
    hpc = None if loads.hours_per_block is None else loads.hours_per_block / loads.n
    return loads.n, hpc


def channel_block(case, load_scale: float, order: str):
    """Cycles of the block for a case with stress fields: (lmax, lmin, ct, i_peak, slots,
    samples, combined peak [MPa]).

    Each channel's K per unit value is tabulated once on a crack-size grid by the weight
    function (the residual stress in the last row); cycles are identified on the combined
    driving force at the initial crack size (as an equivalent membrane stress), and each
    channel's values are taken at every cycle's peak and valley samples.
    """
    import numpy as np

    from cycj import kernel_slots as M
    from cycj.fields.inputs import UNIFORM, Channel
    from cycj.fields.profiles import StressProfile

    ld, spec = case.loading, case.fields
    channels = spec.channels or (
        Channel("load", ld.column, 1.0, 1.0, spec.profile or StressProfile(**UNIFORM)),
    )
    _, ct, slots, k_of = _tables(case, channels)
    k_unit = k_of(StressProfile(**UNIFORM))[0]
    values, samples = _channel_values(case, channels)
    values = values * load_scale
    k0 = np.array([k_of(ch.profile)[0] for ch in channels])
    combined = values @ k0 / k_unit  # equivalent membrane stress at a0 [MPa]
    if ld.constant is not None:
        peak_idx, valley_idx = np.array([0]), np.array([1])
    else:
        from cycj.spectrum import cycle_indices_in_sequence

        peak_idx, valley_idx = cycle_indices_in_sequence(combined, gate=ld.gate, order=order)
        if peak_idx.size == 0:
            from cycj.errors import CycjInputError

            raise CycjInputError(
                "the combined load history has no cycles above the gate",
                source=str(ld.history),
                key="loading.gate",
                found=ld.gate,
            )
    lmax = np.ascontiguousarray(values[peak_idx])
    lmin = np.ascontiguousarray(values[valley_idx])
    i_peak = int(np.argmax(combined[peak_idx]))
    for j, ch in enumerate(channels):
        pm, pb = ch.profile.linearise()
        slots[M.CH_PM + j], slots[M.CH_PB + j] = pm, pb
        slots[M.CH_SECONDARY + j] = 1.0 if ch.secondary else 0.0
    return lmax, lmin, ct, i_peak, slots, samples, float(combined[peak_idx[i_peak]])


def _tables(case, channels):
    """K per unit channel value (and the residual K) on the crack-size grid: rows × a × c
    (c only for the surface crack, deepest point rows first, then surface point rows)."""
    import numpy as np

    from cycj import kernel_slots as M
    from cycj.fields.residual import residual_stress_k
    from cycj.fields.shape_weight_functions import edge_crack_plate_k, surface_crack_k

    geo, spec = case.geometry, case.fields
    nch = len(channels)
    a0 = geo.crack_length
    if geo.two_d:
        t, w, c0 = geo.dims["thickness"], geo.dims["width"], geo.dims["half_length"]
        ga = np.linspace(a0, 0.8 * t, N_GRID_2D)
        gc = np.linspace(min(c0, a0), 0.25 * w - 1e-9, N_GRID_2D)
        aa, cc = np.meshgrid(ga, gc, indexing="ij")
        cc = np.maximum(cc, aa)  # a/c ≤ 1: the weight functions' range
        ct = np.zeros((2 * (nch + 1), ga.size, gc.size))
        for p, point in enumerate(("deepest", "surface")):
            base = p * (nch + 1)
            for j, ch in enumerate(channels):
                ct[base + j] = surface_crack_k(aa, cc, t, ch.profile, width=w, point=point)
            if spec.residual is not None:
                ct[base + nch] = residual_stress_k(
                    aa,
                    spec.residual,
                    "surface-crack-plate",
                    _relaxation(case),
                    c=cc,
                    thickness=t,
                    width=w,
                    point=point,
                )
        slots = {
            M.CH_C_LO: gc[0],
            M.CH_C_HI: gc[-1],
            M.CH_SURFACE: 1.0,
            M.CH_WIDTH: w,
            M.CH_THICKNESS: t,
        }

        def k_of(profile):
            return surface_crack_k(np.array([a0]), np.array([c0]), t, profile, width=w)
    else:
        w = geo.dims["width"]
        ga = np.linspace(a0, geo.size_limits[1], N_GRID)
        ct = np.zeros((nch + 1, ga.size, 1))
        for j, ch in enumerate(channels):
            ct[j, :, 0] = edge_crack_plate_k(ga, w, ch.profile)
        if spec.residual is not None:
            ct[nch, :, 0] = residual_stress_k(
                ga, spec.residual, "edge-crack-plate", _relaxation(case), width=w
            )
        slots = {M.CH_THICKNESS: w, M.CH_SURFACE: 0.0}

        def k_of(profile):
            return edge_crack_plate_k(np.array([a0]), w, profile)

    slots.update({M.CH_MODE: 1.0, M.CH_N: float(nch), M.CH_A_LO: ga[0], M.CH_A_HI: ga[-1]})
    return ga, np.ascontiguousarray(ct), slots, k_of


def _relaxation(case):
    """Residual-stress relaxation factor: the case's number, or BS 7910's
    min[1, 1.4 − σ_ref/σ_flow] at the initial crack under the first channel's peak."""
    spec = case.fields
    if spec.relaxation != "bs7910":
        return spec.relaxation
    from cycj.fields.residual import bs7910_residual_relaxation

    peak = case.loading.constant[0] if case.loading.constant is not None else None
    if peak is None:
        return 1.0
    geo = case.geometry
    alpha = geo.crack_length / (geo.dims["thickness"] if geo.two_d else geo.dims["width"])
    pm, pb = spec.profile.linearise() if spec.profile is not None else (1.0, 0.0)
    s_ref = plate_reference_stress(peak * pm, peak * pb, alpha)
    return float(bs7910_residual_relaxation(s_ref, case.material.flow_stress))


def _channel_values(case, channels):
    """Samples × channels array of channel values [MPa] (constant amplitude: 2 samples)."""
    import numpy as np

    ld = case.loading
    if ld.constant is not None:
        return np.array([[ld.constant[0]], [ld.constant[1]]]), 2
    from cycj.spectrum import read_history
    from cycj.units import unit_factor

    cols = []
    for ch in channels:
        if case.fields.channels:
            factor, scale = ch.unit_factor, ch.scale
        else:
            factor = 1.0 if ld.unit is None else unit_factor(ld.unit, "stress")
            scale = ld.scale
        cols.append(
            read_history(
                ld.history, column=ch.column, unit_factor=factor, scale=scale, sheet=ld.sheet
            )
        )
    n = min(c.size for c in cols)
    return np.column_stack([c[:n] for c in cols]), n


def cite_loads(case: Case, cited) -> None:
    """Cite the methods that build the case's block: rainflow counting of a history;
    weight-function K tables, the plate reference stress and residual stresses of load
    channels (a case with stress fields always runs on load channels)."""
    ld = case.loading
    channels = case.fields is not None
    if ld.history is not None or (channels and ld.constant is None):
        cited.cite("rainflow")
    if channels:
        cited.cite("weight-functions")
        cited.cite("plate-reference-stress")
        if case.fields.residual is not None:
            cited.cite("residual-stress")
