"""Tests of the test-particle Monte Carlo (chamberchk.physics.montecarlo).

Sources (ids refer to /work/shared/reference-values.md): G4-01 tube W (library-computed,
stated to reproduce the Berman 1965 / Cole 1977 table recalled from memory); G4-05 slot
Monte Carlo of the reference compiler; Siegel & Howell (2002), Appendix C, coaxial discs.
Agreement is asked within 3 standard errors (fixed seeds, so deterministic).
"""

import math

import pytest

from chamberchk.physics.montecarlo import MCResult, simulate


def test_reproducible_with_seed():
    a = simulate("via", 2.0, 1.0, None, 0.0, True, 5_000, seed=7)
    b = simulate("via", 2.0, 1.0, None, 0.0, True, 5_000, seed=7)
    c = simulate("via", 2.0, 1.0, None, 0.0, True, 5_000, seed=8)
    assert a == b and isinstance(a, MCResult)
    assert a.estimate != c.estimate


@pytest.mark.parametrize("l_over_r, w", [(1, 0.67198), (4, 0.35658), (10, 0.19094)])
def test_open_tube_matches_clausing(l_over_r, w):
    """G4-01: an open straight via of depth/diameter L/(2R) is a Clausing tube."""
    r = simulate("via", l_over_r / 2, 1.0, None, 0.0, True, 20_000, seed=1)
    assert abs(r.estimate - w) < 3 * r.standard_error
    assert r.wall_collisions > 0


def test_open_slot_matches_reference_monte_carlo():
    """G4-05: slot of L/h = 1, 0.6848 +- 0.0003 from an independent 3-D Monte Carlo."""
    r = simulate("trench", 1.0, 1.0, None, 0.0, True, 20_000, seed=4)
    assert abs(r.estimate - 0.6848) < 3 * math.hypot(r.standard_error, 3e-4)


@pytest.mark.parametrize("shape, bottom", [("via", None), ("trench", 0.6)])
def test_closed_cavity_without_sticking_has_uniform_flux(shape, bottom):
    """s = 0: equilibrium in a closed cavity, bottom flux ratio 1."""
    r = simulate(shape, 1.5, 1.0, bottom, 0.0, False, 10_000, seed=3)
    assert r.quantity == "bottom_flux_ratio"
    assert abs(r.estimate - 1.0) < 3 * r.standard_error


def test_full_sticking_is_line_of_sight():
    """s = 1: only direct flights reach the bottom; coaxial-disc view factor (Siegel &
    Howell App. C): equal discs of radius R at distance h, X = 2 + (h/R)^2."""
    h = 3.0                                      # depth over radius
    X = 2 + h * h
    view = (X - math.sqrt(X * X - 4)) / 2
    r = simulate("via", 1.5, 1.0, None, 1.0, False, 20_000, seed=9)
    assert abs(r.estimate - view) < 3 * r.standard_error
    # every molecule collides at most once when everything sticks
    assert r.wall_collisions + r.bottom_collisions <= r.n_particles


@pytest.mark.parametrize("kwargs", [dict(shape="hole"), dict(depth_m=-1.0),
                                    dict(sticking=2.0), dict(bottom_width_m=0.0)])
def test_invalid_input_raises(kwargs):
    args = dict(shape="via", depth_m=1.0, top_width_m=1.0, n_particles=10) | kwargs
    with pytest.raises(ValueError):
        simulate(**args)
