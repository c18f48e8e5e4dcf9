"""Synthetic load histories: constant amplitude, block programmes, stationary Gaussian
processes, sequences from an exceedance table, and inserted overloads/underloads.

Every random generator takes ``seed`` and draws from ``numpy.random.default_rng(seed)``, so the
same seed gives the same history.
"""

from __future__ import annotations

import numpy as np

from cycj.spectrum.statistics import spectral_moments


def constant_amplitude(
    maximum: float, minimum: float, n_cycles: int, points_per_cycle: int = 2
) -> np.ndarray:
    """Constant-amplitude history starting and ending at the minimum.

    Parameters
    ----------
    maximum, minimum : float
        Peak and valley load [any unit], ``maximum > minimum``.
    n_cycles : int
        Number of cycles (≥ 1).
    points_per_cycle : int, optional
        2 gives the reversals only (valley, peak, valley, …); more gives a sampled cosine
        wave with that many samples a cycle.

    Returns
    -------
    numpy.ndarray of float64, shape (n_cycles·points_per_cycle + 1,)
    """
    if not maximum > minimum:
        raise ValueError(f"maximum ({maximum}) must exceed minimum ({minimum})")
    if int(n_cycles) < 1 or int(points_per_cycle) < 2:
        raise ValueError("n_cycles must be >= 1 and points_per_cycle >= 2")
    n = int(n_cycles) * int(points_per_cycle)
    phase = 2.0 * np.pi * np.arange(n + 1) / int(points_per_cycle)
    mean, amp = 0.5 * (maximum + minimum), 0.5 * (maximum - minimum)
    out = mean - amp * np.cos(phase)
    if int(points_per_cycle) == 2:  # exact reversals, no rounding of cos(π)
        out[0::2], out[1::2] = minimum, maximum
    return out


def block_programme(blocks, repeats: int = 1, points_per_cycle: int = 2) -> np.ndarray:
    """A block programme: blocks of constant-amplitude cycles, the programme repeated.

    Parameters
    ----------
    blocks : iterable of (float, float, int)
        ``(maximum, minimum, cycles)`` of each block [any unit], applied in order.
    repeats : int, optional
        How many times the whole programme is applied.
    points_per_cycle : int, optional
        As in :func:`constant_amplitude`.

    Returns
    -------
    numpy.ndarray of float64
        The history; consecutive blocks share no sample (each block starts at its valley).
    """
    parts = [constant_amplitude(mx, mn, int(n), points_per_cycle) for mx, mn, n in blocks]
    if not parts:
        raise ValueError("a block programme needs at least one block")
    one = np.concatenate(parts)
    return np.tile(one, int(repeats))


def gaussian_from_psd(
    frequency, psd, n_samples: int, dt: float, mean: float = 0.0, seed=None
) -> np.ndarray:
    """Stationary Gaussian load process from a one-sided PSD by spectral synthesis.

    x(t) = mean + Σ_k √(2·S(f_k)·Δf) · cos(2π f_k t + φ_k), φ_k uniform on [0, 2π), summed on
    the FFT grid f_k = k/(n·dt) with S interpolated linearly (0 outside the given band).

    Parameters
    ----------
    frequency : array_like of float
        Frequencies of the PSD table [Hz], increasing.
    psd : array_like of float
        One-sided PSD [unit²/Hz], ≥ 0.
    n_samples : int
        Length of the history.
    dt : float
        Sampling interval [s]; the PSD must lie below the Nyquist frequency 1/(2·dt).
    mean : float, optional
        Mean load [unit].
    seed : int or numpy.random.SeedSequence, optional
        Seed for ``numpy.random.default_rng``.

    Returns
    -------
    numpy.ndarray of float64, shape (n_samples,)

    References
    ----------
    .. [1] Shinozuka, M. and Jan, C.-M. (1972), "Digital simulation of random processes and its
       applications", *J. Sound Vib.* 25(1), 111–128.
    .. [2] Rice, S. O. (1944, 1945), "Mathematical analysis of random noise", *Bell System
       Technical Journal* 23, 282–332 and 24, 46–156.
    """
    n = int(n_samples)
    if n < 2 or not dt > 0:
        raise ValueError("n_samples must be >= 2 and dt > 0")
    rng = np.random.default_rng(seed)
    fk = np.fft.rfftfreq(n, dt)
    df = 1.0 / (n * dt)
    s = np.interp(fk, np.asarray(frequency, float), np.asarray(psd, float), left=0.0, right=0.0)
    s[0] = 0.0  # the mean is given separately
    if np.any(s < 0):
        raise ValueError("the PSD must be >= 0")
    amp = np.sqrt(2.0 * s * df)
    phase = rng.uniform(0.0, 2.0 * np.pi, size=fk.shape[0])
    spec = 0.5 * n * amp * np.exp(1j * phase)
    if n % 2 == 0:  # the Nyquist bin is real in irfft
        spec[-1] = 0.0
    return mean + np.fft.irfft(spec, n)


def _two_band_psd(f_low, ratio, weight, width=0.1):
    """A PSD of two flat bands (relative half-width ``width``) at f_low and ratio·f_low, with a
    share ``weight`` of the variance in the upper band; integrates to 1."""
    f = np.linspace(0.0, f_low * ratio * (1 + 2 * width), 4001)
    lo = (np.abs(f - f_low) <= width * f_low) / (2 * width * f_low)
    hi = (np.abs(f - ratio * f_low) <= width * ratio * f_low) / (2 * width * ratio * f_low)
    return f, (1.0 - weight) * lo + weight * hi


def gaussian_from_irregularity(
    n_samples: int, irregularity: float, rms: float, mean: float = 0.0, dt: float = 1.0, seed=None
):
    """Stationary Gaussian load process with a given irregularity factor and RMS.

    The PSD is two flat bands an octave-ratio of 8 apart (lower band at 1/(80·dt), upper at
    1/(10·dt)); the share of variance in the upper band is solved so that
    m₂/√(m₀m₄) = ``irregularity``, then scaled so that m₀ = rms².  Values from about 0.25
    (broad band) to 0.99 (narrow band) are reachable.

    Parameters
    ----------
    n_samples : int
        Length of the history.
    irregularity : float
        Target irregularity factor (expected mean up-crossings / peaks), in [0.25, 0.99].
    rms : float
        Standard deviation of the load about its mean [unit].
    mean : float, optional
        Mean load [unit].
    dt : float, optional
        Sampling interval [s].
    seed : int, optional
        Seed for ``numpy.random.default_rng``.

    Returns
    -------
    values : numpy.ndarray of float64, shape (n_samples,)
    frequency, psd : numpy.ndarray of float64
        The PSD used [Hz, unit²/Hz] (its moments give the target irregularity).

    References
    ----------
    .. [1] Rice, S. O. (1944, 1945), "Mathematical analysis of random noise", *Bell System
       Technical Journal* 23, 282–332 and 24, 46–156.
    """
    from scipy.optimize import brentq

    if not 0.25 <= irregularity <= 0.99:
        raise ValueError(f"irregularity must lie in [0.25, 0.99], got {irregularity}")
    f_low, ratio = 1.0 / (80.0 * dt), 8.0

    def alpha(w):
        m0, m2, m4 = spectral_moments(*_two_band_psd(f_low, ratio, w))
        return m2 / np.sqrt(m0 * m4)

    w_grid = np.linspace(0.0, 0.2, 401)
    a_grid = np.array([alpha(w) for w in w_grid])
    k_min = int(np.argmin(a_grid))
    if irregularity >= a_grid[0]:
        w = 0.0
    else:
        w = brentq(lambda w: alpha(w) - irregularity, 0.0, w_grid[k_min], xtol=1e-12)
    f, s = _two_band_psd(f_low, ratio, w)
    s = s * rms**2 / spectral_moments(f, s, (0,))[0]
    return gaussian_from_psd(f, s, n_samples, dt, mean, seed), f, s


def exceedance_sequence(
    amplitudes, cumulative_counts, mean: float = 0.0, n_subblocks: int = 10, seed=None
) -> np.ndarray:
    """Reversal sequence built from a cumulative exceedance table, in randomised blocks.

    Level i holds ``H_i − H_(i−1)`` cycles of amplitude ``amplitudes[i]`` (the upper edge of
    its class, a conservative choice) about ``mean``.  The cycles of every level are shared as
    evenly as possible among ``n_subblocks`` sub-blocks; inside each sub-block the levels come
    as steps of constant amplitude in a random order, so the big cycles are spread through the
    history rather than grouped at one place.

    Parameters
    ----------
    amplitudes : array_like of float
        Load amplitudes of the table, largest first [unit].
    cumulative_counts : array_like of float
        Cycles with amplitude ≥ each level (non-decreasing; rounded to whole cycles).
    mean : float, optional
        Mean load [unit].
    n_subblocks : int, optional
        Number of randomised sub-blocks.
    seed : int, optional
        Seed for ``numpy.random.default_rng``.

    Returns
    -------
    numpy.ndarray of float64
        Reversals: peak and valley of each cycle in turn (peak first).  Counted as a
        repeating block, the rainflow cycles reproduce the table exactly, since all cycles
        share one mean.
    """
    amp = np.asarray(amplitudes, dtype=np.float64)
    cum = np.rint(np.asarray(cumulative_counts, dtype=np.float64)).astype(np.int64)
    if amp.shape != cum.shape or amp.size == 0:
        raise ValueError("amplitudes and cumulative_counts must be equal, non-empty lists")
    if np.any(np.diff(amp) >= 0) or np.any(np.diff(cum) < 0) or cum[0] < 1:
        raise ValueError(
            "the table must list decreasing amplitudes with non-decreasing "
            "cumulative counts starting at >= 1"
        )
    per_level = np.diff(np.concatenate(([0], cum)))
    rng = np.random.default_rng(seed)
    nb = int(n_subblocks)
    # cycles of level i in sub-block b: spread by integer division plus a rotating remainder
    share = per_level[:, None] // nb + (
        (np.arange(nb)[None, :] + np.arange(amp.size)[:, None]) % nb < (per_level % nb)[:, None]
    )
    peaks = []
    for b in range(nb):
        for i in rng.permutation(amp.size):
            peaks.append(np.full(int(share[i, b]), amp[i]))
    a = np.concatenate(peaks)
    out = np.empty(2 * a.size)
    out[0::2] = mean + a
    out[1::2] = mean - a
    return out


def insert_excursions(values, interval: int, level: float, offset: int | None = None) -> np.ndarray:
    """Insert an overload (``level`` above the history) or underload (below) every
    ``interval`` samples.

    One sample of value ``level`` is inserted after samples ``offset``, ``offset + interval``,
    … (default ``offset = interval − 1``).  On a reversal history (valley, peak, …) insert
    after valleys for an overload and after peaks for an underload so the excursion forms its
    own cycle.

    Parameters
    ----------
    values : array_like of float
        Base history [unit].
    interval : int
        Samples between insertions (≥ 1).
    level : float
        Value of the inserted samples [unit].
    offset : int, optional
        Sample after which the first excursion is inserted.

    Returns
    -------
    numpy.ndarray of float64
        The history with the excursions inserted.
    """
    x = np.asarray(values, dtype=np.float64)
    interval = int(interval)
    if interval < 1:
        raise ValueError("interval must be >= 1")
    first = interval - 1 if offset is None else int(offset)
    after = np.arange(first, x.shape[0], interval)
    return np.insert(x, after + 1, float(level))
