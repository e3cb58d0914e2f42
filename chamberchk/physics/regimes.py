"""Knudsen number and flow-regime classification.

The default bounds are the conventional ones of rarefied-gas dynamics (e.g. Karniadakis, Beskok &
Aluru, *Microflows and Nanoflows*, Springer 2005, sec. 1.2; common practice):
continuum Kn < 0.01 <= slip < 0.1 <= transition < 10 <= free-molecular. Vacuum handbooks draw the
molecular bound lower (Kn > 0.5 or 1); a recipe's ``[settings]`` may override the bounds.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

REGIMES = ("continuum", "slip", "transition", "free-molecular")


@dataclass(frozen=True)
class RegimeBounds:
    """Upper Knudsen-number bounds of the continuum, slip and transition regimes [-]."""

    continuum_max: float = 0.01
    slip_max: float = 0.1
    transition_max: float = 10.0

    def as_array(self) -> np.ndarray:
        return np.array([self.continuum_max, self.slip_max, self.transition_max])


DEFAULT_BOUNDS = RegimeBounds()


def knudsen_number(mean_free_path_m, length_m):
    """Knudsen number ``Kn = lambda / L`` [-]; ``L`` is the trench width, via or tube diameter."""
    return (np.asarray(mean_free_path_m, dtype=float) / np.asarray(length_m, dtype=float))[()]


def regime(knudsen, bounds: RegimeBounds = DEFAULT_BOUNDS):
    """Regime name(s) for Knudsen number(s); a bound itself belongs to the more rarefied regime.

    >>> regime(0.01), regime(5.0), regime(10.0)
    ('slip', 'transition', 'free-molecular')
    """
    idx = np.searchsorted(bounds.as_array(), np.asarray(knudsen, dtype=float), side="right")
    if np.ndim(idx) == 0:
        return REGIMES[int(idx)]
    return [REGIMES[int(i)] for i in np.ravel(idx)]


def crossing_pressures(pressure_Pa, knudsen, bounds: RegimeBounds = DEFAULT_BOUNDS):
    """Pressures at which a feature's Knudsen number would equal each regime bound [Pa].

    Because the mean free path of a dilute gas is inversely proportional to pressure at fixed
    temperature and composition, ``Kn p`` is constant and ``p_bound = p Kn / Kn_bound``.
    Returned in the order of ``bounds`` (continuum/slip, slip/transition, transition/molecular).
    """
    return float(pressure_Pa) * float(knudsen) / bounds.as_array()
