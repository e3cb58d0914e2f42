"""Tabulated transmission and bottom-flux ratios of straight vias and trenches (fast path).

The integral-equation solvers of :mod:`chamberchk.physics.transmission` take milliseconds to a
tenth of a second per call; a batch of hundreds of recipes calls them thousands of times. This
module interpolates tables computed once with those same solvers (``python -m
chamberchk.physics.transmission_table`` rebuilds ``data/transmission_table.npz``) and falls back to
the solvers outside the tabulated range. Interpolation is bicubic in (log aspect ratio, log
sticking) on log(ratio); ``tests/test_transmission_table.py`` checks it against the solvers at
points off the grid.
"""

from __future__ import annotations

import math
from functools import lru_cache
from importlib import resources

import numpy as np

from . import transmission

ASPECT = np.geomspace(0.05, 200.0, 81)          # depth / width
STICKING = np.geomspace(1e-6, 1.0, 49)
SHAPES = ("via", "trench")
TABLE_FILE = "data/transmission_table.npz"


def build() -> dict[str, np.ndarray]:
    """Compute the tables with the integral-equation solvers (minutes)."""
    out: dict[str, np.ndarray] = {"aspect": ASPECT, "sticking": STICKING}
    for shape in SHAPES:
        out[f"{shape}_transmission"] = np.array(
            [transmission.transmission_probability(shape, a, 1.0) for a in ASPECT])
        out[f"{shape}_bottom"] = np.array(
            [[transmission.bottom_flux_ratio(shape, a, 1.0, None, s) for s in STICKING]
             for a in ASPECT])
    return out


@lru_cache(maxsize=1)
def _interpolators() -> dict:
    from scipy.interpolate import CubicSpline, RectBivariateSpline

    with resources.files("chamberchk").joinpath(TABLE_FILE).open("rb") as fh:
        data = dict(np.load(fh))
    la, ls = np.log(data["aspect"]), np.log(data["sticking"])
    out = {"range": (float(data["aspect"][0]), float(data["aspect"][-1]),
                     float(data["sticking"][0]))}
    for shape in SHAPES:
        out[f"{shape}_w"] = CubicSpline(la, np.log(data[f"{shape}_transmission"]))
        out[f"{shape}_b"] = RectBivariateSpline(la, ls, np.log(data[f"{shape}_bottom"]),
                                                kx=3, ky=3)
    return out


def transmission_probability(shape: str, depth_m: float, width_m: float) -> float:
    """Transmission probability of a straight feature (see transmission.transmission_probability)."""
    a = depth_m / width_m
    f = _interpolators()
    lo, hi, _ = f["range"]
    if not lo <= a <= hi or shape not in SHAPES:
        return transmission.transmission_probability(shape, depth_m, width_m)
    return float(math.exp(f[f"{shape}_w"](math.log(a))))


def bottom_flux_ratio(shape: str, depth_m: float, width_m: float, sticking: float) -> float:
    """Bottom flux ratio of a straight dead-end feature (see transmission.bottom_flux_ratio);
    below the smallest tabulated sticking the deficit 1 - ratio is scaled linearly with s."""
    if sticking == 0.0:
        return 1.0
    a = depth_m / width_m
    f = _interpolators()
    lo, hi, s_min = f["range"]
    if not lo <= a <= hi or shape not in SHAPES or not 0.0 < sticking <= 1.0:
        return transmission.bottom_flux_ratio(shape, depth_m, width_m, None, sticking)
    spline = f[f"{shape}_b"]
    value = math.exp(float(spline(math.log(a), math.log(max(sticking, s_min)))[0, 0]))
    return below_tabulated_sticking(value, sticking, s_min)


def below_tabulated_sticking(value_at_s: float, sticking: float, s_min: float) -> float:
    """Below the smallest tabulated sticking ``s_min`` the deficit 1 - ratio is linear in s
    (first order in the wall loss); ``value_at_s`` is the table's value at max(s, s_min)."""
    if sticking < s_min:
        return 1.0 - (1.0 - value_at_s) * sticking / s_min
    return value_at_s


def rebuild(build_tables, table_file: str) -> None:
    """Recompute a shipped table with ``build_tables()`` and write it into the package."""
    import time
    from pathlib import Path

    t0 = time.perf_counter()
    target = Path(__file__).resolve().parents[1] / table_file
    np.savez_compressed(target, **build_tables())
    print(f"wrote {target} in {time.perf_counter() - t0:.0f} s")


if __name__ == "__main__":
    rebuild(build, TABLE_FILE)
