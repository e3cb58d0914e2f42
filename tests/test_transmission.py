"""Tests of chamberchk.physics.transmission against published and independent values.

Sources (ids refer to /work/shared/reference-values.md):
* G4-01: tube W(L/R) from Clausing's equation (library-computed by the compiler of that file,
  stated there to reproduce the Berman (1965) / Cole (1977) table, which was recalled from
  memory, not read: "from memory").
* G4-02: Knudsen/Smoluchowski long-tube limit W -> 8R/(3L) (from memory) and the ratios
  W/(8R/3L) (library-computed).
* G4-03: Dushman short-tube formula 1/(1 + 3L/8R) (from memory).
* G4-04: Santeler (1986), J. Vac. Sci. Technol. A 4, 338 (formula from memory).
* G4-05: slot W(L/h) (library-computed, no published table found) and a 3-D Monte Carlo
  cross-check made by the same compiler.
* G6-04: Thiele modulus of a via with wall reaction probability s (textbook, from memory).
* Siegel & Howell (2002), Thermal Radiation Heat Transfer, 4th ed., Appendix C: view factor
  between parallel coaxial discs, and Hottel's crossed-strings rule for parallel strips.
No published Clausing table could be found with the search tool, so none is cited here.
"""

import math

import pytest

from chamberchk.physics import transmission as tr
from chamberchk.physics.montecarlo import simulate

# G4-01 (values to 5 decimals, or 4 significant digits beyond L/R = 200).
TUBE_TABLE = {0.1: 0.95240, 0.2: 0.90922, 0.5: 0.80127, 1: 0.67198, 1.5: 0.58148, 2: 0.51423,
              3: 0.42006, 4: 0.35658, 5: 0.31053, 6: 0.27545, 8: 0.22527, 10: 0.19094,
              15: 0.13883, 20: 0.10932, 30: 0.07697, 40: 0.05949, 50: 0.04848, 100: 0.02528,
              200: 0.01294, 500: 0.005263, 1000: 0.002648}
# G4-05
SLOT_TABLE = {0.1: 0.95245, 0.5: 0.80472, 1: 0.68438, 2: 0.54206, 3: 0.45715, 5: 0.35641,
              10: 0.24056, 20: 0.15389, 50: 0.08003, 100: 0.04709, 200: 0.02709}


@pytest.mark.parametrize("l_over_r, expected", sorted(TUBE_TABLE.items()))
def test_tube_matches_clausing_table(l_over_r, expected):
    """G4-01 (which itself accepts +-2e-4). Tolerance 5e-5: the table is a numerical solution
    printed to 5 decimals; at L/R = 15, 30 and 40 its entries lie 2-4e-5 above our
    mesh-converged solution (converged to 1e-6 under refinement and confirmed to 1e-6 by the
    independent ring-kernel quadrature solver), elsewhere within 5e-6."""
    assert tr.tube_transmission(l_over_r) == pytest.approx(expected, abs=5e-5)


@pytest.mark.parametrize("l_over_r, ratio, tol", [(100, 0.948, 5e-4), (200, 0.970, 1e-3),
                                                  (500, 0.9868, 5e-4), (1000, 0.9929, 6e-4)])
def test_tube_long_limit(l_over_r, ratio, tol):
    """G4-02: W / (8R/3L). Tolerance: half a unit of the printed last digit plus the solver's
    relative error at these lengths (3e-4 at L/R = 500, 5e-4 at 1000, i.e. about 1e-6
    absolute, measured against a 4x finer mesh; the brief asks for 1e-4 absolute). At
    L/R = 200 the printed 0.970 matches the rounded G4-01 entry (0.01294 * 75 = 0.9705),
    whose rounding is worth 4e-4 in the ratio, hence 1e-3 there."""
    assert tr.tube_transmission(l_over_r) * 3 * l_over_r / 8 == pytest.approx(ratio, abs=tol)


def test_long_tube_formula_overestimates_below_100():
    """G4-02: 8R/3L overestimates W by more than 5 % for L/R < 100."""
    for l_over_r in (5, 20, 50, 99):
        assert 8 / (3 * l_over_r) > 1.05 * tr.tube_transmission(l_over_r)


def test_tube_short_limit():
    """W -> 1 as L/R -> 0 (nothing can be turned back by a wall of zero length)."""
    assert tr.tube_transmission(0.0) == 1.0
    values = [tr.tube_transmission(x) for x in (1e-6, 1e-4, 1e-2)]
    assert values[0] > 0.999999 and values[1] > 0.9999 and values[2] > 0.99
    assert values == sorted(values, reverse=True)


@pytest.mark.parametrize("l_over_r", [0.05, 0.5, 1, 2, 5, 6, 8, 10, 20, 50, 100, 400, 1000])
def test_santeler_within_one_percent(l_over_r):
    """G4-04: Santeler's approximation is within 1 % of the exact W at every L/R (its
    largest error, about 0.64 %, is near L/R = 6)."""
    x = l_over_r
    santeler = 1 / (1 + 3 * x / 8 * (1 + 1 / (3 + 3 * x / 7)))
    assert abs(santeler / tr.tube_transmission(x) - 1) < 0.01


@pytest.mark.parametrize("l_over_r", [0.5, 1, 2, 5, 10])
def test_dushman_overestimates(l_over_r):
    """G4-03: the Dushman formula lies 5-12 % above the exact W at intermediate L/R."""
    x = l_over_r
    excess = 1 / (1 + 3 * x / 8) / tr.tube_transmission(x) - 1
    assert 0.04 < excess < 0.13


@pytest.mark.parametrize("l_over_h, expected", sorted(SLOT_TABLE.items()))
def test_slot_matches_table(l_over_h, expected):
    """G4-05 (library-computed, not published): accept +-0.002 as written there."""
    assert tr.slot_transmission(l_over_h) == pytest.approx(expected, abs=0.002)


@pytest.mark.parametrize("l_over_h, mc, sigma", [(1, 0.6848, 3e-4), (5, 0.3561, 3e-4),
                                                 (20, 0.1545, 3e-4)])
def test_slot_matches_reference_monte_carlo(l_over_h, mc, sigma):
    """G4-05: independent 3-D Monte Carlo (2e6 molecules); within 3 standard errors."""
    assert abs(tr.slot_transmission(l_over_h) - mc) < 3 * sigma


@pytest.mark.parametrize("l_over_h", [10, 20, 50, 100, 200])
def test_long_slot_logarithm(l_over_h):
    """G4-05: W (L/h) - ln(L/h) stays between 0.08 and 0.12 for 10 <= L/h <= 200."""
    assert 0.08 <= tr.slot_transmission(l_over_h) * l_over_h - math.log(l_over_h) <= 0.12


def _mc_check(result, value):
    """Monte Carlo agreement within 3 standard errors (a 0.3 % chance of a false alarm for
    a given seed; the seeds are fixed, so the test is deterministic)."""
    assert abs(result.estimate - value) < 3 * result.standard_error, (result, value)


@pytest.mark.parametrize("shape, depth, bottom", [("via", 1.0, None), ("trench", 1.0, None),
                                                  ("via", 1.0, 0.6), ("trench", 1.5, 0.5),
                                                  ("via", 0.8, 1.3)])
def test_open_features_match_monte_carlo(shape, depth, bottom):
    """Integral equation vs the independent Monte Carlo of chamberchk.physics.montecarlo
    (20 000 molecules, standard error about 0.003)."""
    w = tr.transmission_probability(shape, depth, 1.0, bottom)
    _mc_check(simulate(shape, depth, 1.0, bottom, 0.0, True, 20_000, seed=11), w)


@pytest.mark.parametrize("shape", ["via", "trench"])
@pytest.mark.parametrize("sticking", [0.01, 0.1, 1.0])
def test_bottom_flux_matches_monte_carlo(shape, sticking):
    """Dead-end features of aspect ratio 2, bottom flux ratio vs Monte Carlo (20 000)."""
    value = tr.bottom_flux_ratio(shape, 2.0, 1.0, None, sticking)
    _mc_check(simulate(shape, 2.0, 1.0, None, sticking, False, 20_000, seed=5), value)


def test_tapered_bottom_flux_matches_monte_carlo():
    value = tr.bottom_flux_ratio("trench", 2.0, 1.0, 0.6, 0.1)
    _mc_check(simulate("trench", 2.0, 1.0, 0.6, 0.1, False, 20_000, seed=2), value)


@pytest.mark.parametrize("shape", ["via", "trench"])
@pytest.mark.parametrize("bottom", [None, 0.5, 1.4])
def test_no_sticking_gives_uniform_flux(shape, bottom):
    """s = 0: a closed cavity in steady state has the same flux on every surface as enters
    (Knudsen's cosine law / detailed balance), so the ratio is exactly 1."""
    assert tr.bottom_flux_ratio(shape, 5.0, 1.0, bottom, 0.0) == 1.0
    assert tr.bottom_flux_ratio(shape, 5.0, 1.0, bottom, 1e-12) == pytest.approx(1, abs=1e-9)


def _coaxial_discs(r1, r2, h):
    """Siegel & Howell App. C: parallel coaxial discs, F(1 -> 2) = (X - sqrt(X^2 - 4
    (R2/R1)^2))/2 with X = 1 + (1 + R2^2)/R1^2, R = r/h."""
    R1, R2 = r1 / h, r2 / h
    X = 1 + (1 + R2 ** 2) / R1 ** 2
    return (X - math.sqrt(X * X - 4 * (R2 / R1) ** 2)) / 2


def _parallel_strips(w1, w2, h):
    """Crossed-strings rule for two centred parallel strips of widths w1, w2 at distance h:
    F(1 -> 2) = (sum of crossed - sum of uncrossed strings) / (2 w1)."""
    return (2 * math.hypot((w1 + w2) / 2, h) - 2 * math.hypot((w1 - w2) / 2, h)) / (2 * w1)


@pytest.mark.parametrize("depth", [0.5, 2.0, 10.0])
@pytest.mark.parametrize("bottom", [None, 0.5])
def test_full_sticking_is_line_of_sight(depth, bottom):
    """s = 1: nothing is re-emitted, so the bottom only receives molecules that fly straight
    from the opening. The bottom flux ratio is then the view factor bottom -> opening (by
    reciprocity A_o F(o->b) / A_b): the transmission of an open feature with fully
    absorbing walls, not its Clausing W. Tolerance 1e-12 (closed-form in both)."""
    b = 1.0 if bottom is None else bottom
    via = tr.bottom_flux_ratio("via", depth, 1.0, bottom, 1.0)
    assert via == pytest.approx(_coaxial_discs(b / 2, 0.5, depth), rel=1e-12)
    trench = tr.bottom_flux_ratio("trench", depth, 1.0, bottom, 1.0)
    assert trench == pytest.approx(_parallel_strips(b, 1.0, depth), rel=1e-12)


@pytest.mark.parametrize("shape", ["via", "trench"])
def test_bottom_flux_decreases_with_aspect_ratio_and_sticking(shape):
    grid = [[tr.bottom_flux_ratio(shape, ar, 1.0, None, s) for ar in (0.5, 2, 8, 30)]
            for s in (0.001, 0.01, 0.1, 0.5, 1.0)]
    for row in grid:
        assert all(a > b for a, b in zip(row, row[1:]))
    for col in zip(*grid):
        assert all(a > b for a, b in zip(col, col[1:]))


@pytest.mark.parametrize("ar, s", [(10, 1e-4), (10, 1e-3), (20, 1e-3), (50, 1e-4),
                                   (50, 1e-3)])
def test_thiele_limit_of_long_vias(ar, s):
    """G6-04: for small s and long vias the kinetic result approaches the continuum
    1/cosh(phi), phi = (L/d) sqrt(3 s). The continuum model has no entrance resistance, so
    the kinetic value lies below it, by up to ~6 % here (end effect of order d/L plus terms
    of order s). Adding the Dushman entrance resistance (G4-03: 1/W = 1 + 3L/(8R), i.e. an
    extra length 4d/3) to L brings the two within 1.5 %."""
    kinetic = tr.bottom_flux_ratio("via", ar * 1e-6, 1e-6, None, s)
    thiele = 1 / math.cosh(ar * math.sqrt(3 * s))
    assert 0.93 * thiele < kinetic < thiele
    corrected = 1 / math.cosh((ar + 4 / 3) * math.sqrt(3 * s))
    assert kinetic == pytest.approx(corrected, rel=0.015)


@pytest.mark.parametrize("shape", ["via", "trench"])
@pytest.mark.parametrize("ar", [0.5, 2.0, 10.0])
def test_narrowing_bottom_lowers_transmission(shape, ar):
    values = [tr.transmission_probability(shape, ar, 1.0, b) for b in (1.2, 1.0, 0.8, 0.6, 0.4)]
    assert all(a > b for a, b in zip(values, values[1:]))


@pytest.mark.parametrize("shape, straight", [("via", lambda ar: tr.tube_transmission(2 * ar)),
                                             ("trench", tr.slot_transmission)])
@pytest.mark.parametrize("ar", [0.3, 2.0, 10.0, 50.0])
def test_taper_solver_reproduces_straight(shape, straight, ar):
    """The tapered-wall solver with an almost straight wall (bottom 1 +- 1e-7 of the top)
    reproduces the straight Clausing results: tolerance 1e-4, the brief's accuracy target
    (observed differences are below 2e-5)."""
    for bottom in (1 - 1e-7, 1 + 1e-7):
        assert tr.transmission_probability(shape, ar, 1.0, bottom) == pytest.approx(
            straight(ar), abs=1e-4)
    assert tr.transmission_probability(shape, ar, 1.0, 1.0) == straight(ar)


def test_feature_widths_are_scale_free():
    """Only the ratios depth/width and bottom/top matter (free-molecular flow)."""
    a = tr.transmission_probability("via", 3e-6, 1e-6, 0.7e-6)
    assert tr.transmission_probability("via", 3.0, 1.0, 0.7) == pytest.approx(a, rel=1e-12)
    assert tr.transmission_probability("via", 0.0, 1e-6, 0.5e-6) == 1.0


@pytest.mark.parametrize("call", [
    lambda: tr.tube_transmission(-1.0),
    lambda: tr.slot_transmission(float("nan")),
    lambda: tr.transmission_probability("slit", 1.0, 1.0),
    lambda: tr.transmission_probability("via", -1.0, 1.0),
    lambda: tr.transmission_probability("via", 1.0, 0.0),
    lambda: tr.transmission_probability("trench", 1.0, 1.0, -0.5),
    lambda: tr.bottom_flux_ratio("via", 1.0, 1.0, None, 1.5),
    lambda: tr.bottom_flux_ratio("via", 1.0, 1.0, None, -0.1),
    lambda: tr.bottom_flux_ratio("via", 3.2e-6, 1e-30, None, 0.01),   # beyond the solver
    lambda: tr.transmission_probability("trench", 2e4, 1.0, 0.5),
])
def test_out_of_domain_raises(call):
    with pytest.raises(ValueError):
        call()


def test_very_long_straight_channels_follow_the_long_limits():
    """Beyond L/R = 1000 the tube is extrapolated with 1/W = 3L/8R + C, which must tend to
    the Knudsen limit 8R/3L (G4-02; tolerance 1e-6: C/(3L/8) at L/R = 1e8 is 1e-8) and keep
    W decreasing across the switch."""
    assert tr.tube_transmission(1e8) * 3e8 / 8 == pytest.approx(1.0, abs=1e-6)
    values = [tr.tube_transmission(x) for x in (999.0, 1000.0, 1001.0, 2000.0)]
    assert values == sorted(values, reverse=True)
    # slot: the extrapolation keeps W (L/h) - ln(L/h) in the band G4-05 gives for
    # 10 <= L/h <= 200 (a sanity check of the extrapolated form, not a published value)
    assert 0.08 <= tr.slot_transmission(1e6) * 1e6 - math.log(1e6) <= 0.12


def test_validity_ranges_are_data():
    for rng in (tr.TUBE_LENGTH_OVER_RADIUS_RANGE, tr.SLOT_LENGTH_OVER_GAP_RANGE,
                tr.ASPECT_RATIO_RANGE, tr.TAPER_RATIO_RANGE, tr.STICKING_RANGE):
        lo, hi = rng
        assert 0.0 <= lo < hi
    assert tr.ASPECT_RATIO_RANGE[1] >= 200.0
    assert tr.SOLVER_ASPECT_RATIO_LIMIT > tr.ASPECT_RATIO_RANGE[1]
