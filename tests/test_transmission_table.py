"""The tabulated fast path against the integral-equation solvers it was built from.

The solvers themselves are checked against published and reference values in
test_transmission.py; here the question is only whether interpolation keeps their accuracy.
"""

from __future__ import annotations

import hashlib
from importlib import resources

import numpy as np
import pytest

from chamberchk.physics import transmission, transmission_table as tt

rng = np.random.default_rng(20261201)
POINTS = [(shape, float(np.exp(rng.uniform(np.log(0.06), np.log(190)))),
           float(np.exp(rng.uniform(np.log(2e-6), 0.0))))
          for shape in ("via", "trench") for _ in range(12)]


@pytest.mark.parametrize("shape, aspect, sticking", POINTS)
def test_interpolation_off_grid(shape, aspect, sticking):
    # transmission: 1e-5 absolute keeps the solvers' 1e-4 accuracy target with margin;
    # bottom flux: 1e-3 relative, well inside the models' own disagreement (several per cent)
    w = transmission.transmission_probability(shape, aspect, 1.0)
    assert tt.transmission_probability(shape, aspect, 1.0) == pytest.approx(w, abs=1e-5)
    exact = transmission.bottom_flux_ratio(shape, aspect, 1.0, None, sticking)
    assert tt.bottom_flux_ratio(shape, aspect, 1.0, sticking) == pytest.approx(exact, rel=1e-3)


def test_limits_and_fallbacks():
    assert tt.bottom_flux_ratio("via", 10.0, 1.0, 0.0) == 1.0
    # below the smallest tabulated sticking the deficit scales linearly with s
    tiny = tt.bottom_flux_ratio("via", 10.0, 1.0, 1e-8)
    exact = transmission.bottom_flux_ratio("via", 10.0, 1.0, None, 1e-8)
    assert 1.0 - tiny == pytest.approx(1.0 - exact, rel=1e-2)
    # outside the tabulated aspect ratios the solver answers
    assert tt.transmission_probability("trench", 300.0, 1.0) == \
        transmission.transmission_probability("trench", 300.0, 1.0)


def test_table_shape_and_checksum():
    """Regression guard: the shipped table is the one these tests were run against. Rebuild with
    `python -m chamberchk.physics.transmission_table` and update the digest deliberately."""
    raw = resources.files("chamberchk").joinpath(tt.TABLE_FILE).read_bytes()
    with resources.files("chamberchk").joinpath(tt.TABLE_FILE).open("rb") as fh:
        data = dict(np.load(fh))
    assert data["via_bottom"].shape == (len(tt.ASPECT), len(tt.STICKING))
    assert np.allclose(data["aspect"], tt.ASPECT) and np.allclose(data["sticking"], tt.STICKING)
    assert np.all((data["via_bottom"] > 0) & (data["via_bottom"] <= 1 + 1e-12))
    assert hashlib.sha256(raw).hexdigest() == "928bc10b841f6bf8fb3510d326e3e8cb7b8032f3ade97e2c13dcd5e0ffadc3bc"
