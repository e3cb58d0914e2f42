"""The tapered-feature tables against the radiosity solver they were computed with.

The solver is checked against the straight-wall results and Monte Carlo in
test_transmission.py; here only the interpolation is in question.
"""

from __future__ import annotations

import hashlib
from importlib import resources

import numpy as np
import pytest

from chamberchk.physics import taper_table as tt, transmission

rng = np.random.default_rng(7)
# off-grid points; aspect ratios kept below 60 so the solver reference stays fast in CI
POINTS = [(shape, float(np.exp(rng.uniform(np.log(0.07), np.log(60)))),
           float(rng.uniform(0.27, 0.98)), float(np.exp(rng.uniform(np.log(2e-6), 0.0))))
          for shape in ("via", "trench") for _ in range(8)]


@pytest.mark.parametrize("shape, aspect, taper, sticking", POINTS)
def test_interpolation_off_grid(shape, aspect, taper, sticking):
    # W: 1e-4 absolute, the accuracy target of the solver itself;
    # bottom flux: 2e-3 relative, far inside the models' own disagreement (several per cent)
    w = transmission.transmission_probability(shape, aspect, 1.0, taper)
    assert tt.transmission_probability(shape, aspect, 1.0, taper) == pytest.approx(w, abs=1e-4)
    exact = transmission.bottom_flux_ratio(shape, aspect, 1.0, taper, sticking)
    fast = tt.bottom_flux_ratio(shape, aspect, 1.0, taper, sticking)
    assert fast == pytest.approx(exact, rel=2e-3)


def test_outside_the_table_the_solver_answers():
    assert tt.transmission_probability("via", 2.0, 1.0, 0.2) == \
        transmission.transmission_probability("via", 2.0, 1.0, 0.2)
    assert tt.bottom_flux_ratio("via", 2.0, 1.0, 0.5, 0.0) == 1.0


def test_table_shape_and_checksum():
    """Regression guard on the shipped table; rebuild with `python -m
    chamberchk.physics.taper_table` and update the digest deliberately."""
    raw = resources.files("chamberchk").joinpath(tt.TABLE_FILE).read_bytes()
    with resources.files("chamberchk").joinpath(tt.TABLE_FILE).open("rb") as fh:
        d = dict(np.load(fh))
    assert d["via_bottom"].shape == (len(tt.B_ASPECT), len(tt.B_TAPER), len(tt.B_STICKING))
    assert d["trench_transmission"].shape == (len(tt.W_ASPECT), len(tt.W_TAPER))
    assert np.all((d["via_bottom"] > 0) & (d["via_bottom"] <= 1 + 1e-12))
    assert hashlib.sha256(raw).hexdigest() == "26bd7fdcedc4bc18be6ac7a19cffd7a1ee5ee543ffd4106e3a791d332e215812"
