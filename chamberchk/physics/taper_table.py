"""Tabulated transmission and bottom-flux ratios of tapered vias and trenches (fast path).

Same idea as :mod:`chamberchk.physics.transmission_table`, one dimension more: the radiosity
solver for tapered walls takes 50 ms to 1 s per call at aspect ratios 50-200, so tables over
(aspect ratio, bottom/top width, sticking) are computed once with it (``python -m
chamberchk.physics.taper_table`` rebuilds ``data/taper_table.npz``, ~10 min) and interpolated
(cubic, on log values); outside the table the solver answers. ``tests/test_taper_table.py`` checks
the interpolation against the solver off the grid. Measured interpolation error: transmission
probability below 1e-6 absolute everywhere; bottom-flux ratio below 0.2 % relative for aspect
ratios up to 60 and up to 2 % at 60-200, where the ratios themselves are small and the models'
own disagreement is larger.
"""

from __future__ import annotations

import math
from functools import lru_cache
from importlib import resources

import numpy as np

from . import transmission
from .transmission_table import below_tabulated_sticking, rebuild

W_ASPECT = np.geomspace(0.05, 200.0, 61)
W_TAPER = np.linspace(0.25, 1.0, 16)
B_ASPECT = np.geomspace(0.05, 200.0, 31)
B_TAPER = np.linspace(0.25, 1.0, 13)
B_STICKING = np.geomspace(1e-6, 1.0, 25)
SHAPES = ("via", "trench")
TABLE_FILE = "data/taper_table.npz"


def build() -> dict[str, np.ndarray]:
    """Compute the tables with the radiosity solver (about ten minutes on one core)."""
    out = {"w_aspect": W_ASPECT, "w_taper": W_TAPER, "b_aspect": B_ASPECT, "b_taper": B_TAPER,
           "b_sticking": B_STICKING}
    for shape in SHAPES:
        out[f"{shape}_transmission"] = np.array(
            [[transmission.transmission_probability(shape, a, 1.0, r) for r in W_TAPER]
             for a in W_ASPECT])
        out[f"{shape}_bottom"] = np.array(
            [[[transmission.bottom_flux_ratio(shape, a, 1.0, r, s) for s in B_STICKING]
              for r in B_TAPER] for a in B_ASPECT])
    return out


@lru_cache(maxsize=1)
def _interpolators() -> dict:
    from scipy.interpolate import RectBivariateSpline, RegularGridInterpolator

    with resources.files("chamberchk").joinpath(TABLE_FILE).open("rb") as fh:
        d = dict(np.load(fh))
    out = {}
    for shape in SHAPES:
        out[f"{shape}_w"] = RectBivariateSpline(np.log(d["w_aspect"]), d["w_taper"],
                                                np.log(d[f"{shape}_transmission"]), kx=3, ky=3)
        out[f"{shape}_b"] = RegularGridInterpolator(
            (np.log(d["b_aspect"]), d["b_taper"], np.log(d["b_sticking"])),
            np.log(d[f"{shape}_bottom"]), method="cubic")
    return out


def _inside(aspect: float, taper: float) -> bool:
    return bool(W_ASPECT[0] <= aspect <= W_ASPECT[-1] and W_TAPER[0] <= taper <= W_TAPER[-1])


def transmission_probability(shape: str, depth_m: float, top_width_m: float,
                             bottom_width_m: float) -> float:
    """As :func:`transmission.transmission_probability` for a tapered feature."""
    a, r = depth_m / top_width_m, bottom_width_m / top_width_m
    if shape not in SHAPES or not _inside(a, r):
        return transmission.transmission_probability(shape, depth_m, top_width_m, bottom_width_m)
    return float(math.exp(_interpolators()[f"{shape}_w"](math.log(a), r)[0, 0]))


def bottom_flux_ratio(shape: str, depth_m: float, top_width_m: float, bottom_width_m: float,
                      sticking: float) -> float:
    """As :func:`transmission.bottom_flux_ratio` for a tapered feature; below the smallest
    tabulated sticking the deficit 1 - ratio scales linearly with s."""
    if sticking == 0.0:
        return 1.0
    a, r = depth_m / top_width_m, bottom_width_m / top_width_m
    if shape not in SHAPES or not _inside(a, r) or not 0.0 < sticking <= 1.0:
        return transmission.bottom_flux_ratio(shape, depth_m, top_width_m, bottom_width_m,
                                              sticking)
    f = _interpolators()[f"{shape}_b"]
    s_min = float(B_STICKING[0])
    s = max(sticking, s_min)
    value = math.exp(float(f([[math.log(a), r, math.log(s)]])[0]))
    return below_tabulated_sticking(value, sticking, s_min)


if __name__ == "__main__":
    rebuild(build, TABLE_FILE)
