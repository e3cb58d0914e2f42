"""Reference tests for chamberchk.physics.exposure (sources and tolerances beside each check).

Reference-value ids (G6-05, ...) point to /work/shared/reference-values.md.
"""

import numpy as np
import pytest
from numpy.testing import assert_allclose
from scipy import constants
from scipy.integrate import solve_ivp

from chamberchk.physics import exposure as exp

TMA_KG_MOL = 72.09e-3   # Al(CH3)3 monomer, as in G6-05


def gordon_factor(a):
    """Required exposure over the flat-surface exposure (S, T and m cancel)."""
    return exp.gordon_exposure(a, 4e18, 400.0, 0.1) / exp.gordon_exposure(0.0, 4e18, 400.0, 0.1)


def test_impingement_flux_reference_values():
    """G6-06 (library-computed): J per Pa = 2.8741e22 (N2, 300 K), 2.4068e22 (Ar, 300 K),
    6.377e21 (WF6, 573.15 K) m^-2 s^-1. Tolerance 1e-4 (5 and 4 printed digits)."""
    cases = [(28.0134e-3, 300.0, 2.8741e22), (39.948e-3, 300.0, 2.4068e22),
             (297.830e-3, 573.15, 6.377e21)]
    for molar_mass, temperature, expected in cases:
        got = exp.impingement_flux(1.0, temperature, molar_mass)
        assert got == pytest.approx(expected, rel=1e-4)


def test_impingement_flux_equals_n_v_over_4():
    """Kinetic theory identity J = n v/4 with n = p/(kT), v = sqrt(8kT/(pi m)) (Knudsen 1909),
    written independently here; exact to rounding. Vectorised and linear in p."""
    p = np.array([0.1, 1.0, 133.0])
    t, m = 450.0, 0.1 / constants.N_A
    n_v_4 = p / (constants.k * t) * np.sqrt(8 * constants.k * t / (np.pi * m)) / 4
    assert_allclose(exp.impingement_flux(p, t, 0.1), n_v_4, rtol=1e-13)


def test_gordon_factor_check_values():
    """[1 + 19a/4 + 3a^2/2] = 7.25 (a = 1), 198.5 (10), 3988.5 (50), 15476 (100): G6-05 exact
    arithmetic of the recalled formula (coefficients: secondary copy of Gordon et al. 2003)."""
    a = np.array([0.0, 1.0, 10.0, 50.0, 100.0])
    ratio = gordon_factor(a)
    assert_allclose(ratio, [1.0, 7.25, 198.5, 3988.5, 15476.0], rtol=1e-12)


def test_gordon_worked_example_g6_05():
    """G6-05 worked example (library-computed by the reference author): TMA, 423.15 K,
    S = 4e18 m^-2: flat surface P t = 2.652e-4 Pa s (= 1.99 L); at P = 13.33 Pa the pulse times
    are 1.989e-5 s (flat), 7.93e-2 s (a = 50) and 0.308 s (a = 100). Tolerance 0.1 % for 4 printed
    digits, 0.3 % for the 3-digit values (rounding of the last digit)."""
    flat = exp.gordon_exposure(0.0, 4e18, 423.15, TMA_KG_MOL)
    assert flat == pytest.approx(2.652e-4, rel=1e-3)
    assert exp.langmuir_exposure(flat, 1.0) == pytest.approx(1.99, rel=3e-3)
    times = exp.gordon_exposure(np.array([0.0, 50.0, 100.0]), 4e18, 423.15, TMA_KG_MOL) / 13.33
    assert times[0] == pytest.approx(1.989e-5, rel=1e-3)
    assert_allclose(times[1:], [7.93e-2, 0.308], rtol=3e-3)


def test_gordon_coefficients_follow_from_front_model():
    """Derivation check (our own, not an outside value): integrate the saturation front of a
    hole of diameter d numerically, S pi d dz/dt = J (pi d^2/4) / (1 + 3z/(4d)) (coated part
    fed with Dushman's transmission 1/(1 + 3L/(8R)), from memory), then fill the bottom,
    S (pi d^2/4) = J (pi d^2/4) t_b / (1 + 3L/(4d)). The total J t / S must equal
    1 + 19a/4 + 3a^2/2, which confirms the recalled coefficients are self-consistent with the
    physics the paper describes. Tolerance 1e-6 (integrator rtol 1e-10)."""
    s, j, d = 1.0, 1.0, 1.0
    for a in (0.5, 3.0, 40.0):
        depth = a * d
        front = solve_ivp(lambda t, z: [j * d / (4 * s * (1 + 0.75 * z[0] / d))], (0.0, 1e9), [0.0],
                          events=lambda t, z: z[0] - depth, rtol=1e-10, atol=1e-12)
        t_walls = front.t_events[0][0]
        t_bottom = s * (1 + 0.75 * depth / d) / j
        ratio = gordon_factor(a)
        assert j * (t_walls + t_bottom) / s == pytest.approx(ratio, rel=1e-6)


def test_gordon_against_front_model_with_clausing_transmission():
    """The same front model fed with the exact Clausing transmission of the coated tube instead of
    Dushman's approximation. Our tube solver reproduces Berman (1965) / Cole (1977) tables to
    their printed precision (tests/test_transmission.py), so this ties Gordon's coefficients to
    the published tables: J t/S = 4 int_0^a dx/W(2x) + 1/W(2a) with W(L/R).

    - Quadratic coefficient: long tubes have W -> 8R/(3L) (Knudsen 1909; Clausing 1932), so the
      ratio must tend to 1 as a grows: below 3 % at a = 100 (computed 2.6 %).
    - Everywhere else Dushman's 1/(1 + 3L/(8R)) is below the exact W (it is known to err by up
      to about 12 % near L/R = 1.5, from memory), so Gordon's closed form must be the smaller
      one, by less than 12 % (computed peak 11.2 % near a = 3.5).
    This bounds what the dose margin means: a margin under about 1.12 is inside the model's own
    approximation (EXPOSURE_MODEL_SPREAD)."""
    from scipy.integrate import quad

    from chamberchk.physics.transmission import tube_transmission

    def exact(a):
        walls = quad(lambda x: 1.0 / tube_transmission(2 * x) if x > 0 else 1.0, 0.0, a,
                     limit=200)[0]
        return 4 * walls + 1.0 / tube_transmission(2 * a)

    ratios = np.array([exact(a) / gordon_factor(a) for a in (0.5, 1, 2, 4, 10, 40, 100)])
    assert np.all(ratios > 1.0)
    assert ratios.max() < 1.0 + exp.EXPOSURE_MODEL_SPREAD
    assert ratios[-1] < 1.03
    assert np.all(np.diff(ratios[3:]) < 0)       # converging once past the short-tube hump


def test_effective_aspect_ratio():
    """a = L p/(4A): L/d for a round hole, L/(2w) for a long trench (from memory; the same trench
    value is the equivalent aspect ratio of Cremers et al. 2019, seen in a secondary copy), so at
    high aspect ratio a hole needs 4x the exposure of a trench of the same depth/width (secondary
    copy citing Gordon et al. 2003 and Cremers et al. 2019). 1 % at L/w = 1000 (the linear term
    contributes 0.3 %)."""
    assert exp.effective_aspect_ratio("via", 2e-6, 50e-9) == pytest.approx(40.0)
    assert exp.effective_aspect_ratio("trench", 2e-6, 50e-9) == pytest.approx(20.0)
    assert_allclose(exp.effective_aspect_ratio("via", [1e-6, 2e-6], 1e-7), [10.0, 20.0])
    a_via = exp.effective_aspect_ratio("via", 1e-4, 1e-7)
    a_trench = exp.effective_aspect_ratio("trench", 1e-4, 1e-7)
    assert gordon_factor(a_via) / gordon_factor(a_trench) == pytest.approx(4.0, rel=0.01)
    with pytest.raises(ValueError):
        exp.effective_aspect_ratio("pillar", 1e-6, 1e-7)


def test_gordon_scaling():
    """Exposure is linear in S and grows as sqrt(m T) (formula structure of Gordon et al. 2003)."""
    base = exp.gordon_exposure(10.0, 4e18, 400.0, 0.1)
    assert exp.gordon_exposure(10.0, 8e18, 400.0, 0.1) == pytest.approx(2 * base)
    assert exp.gordon_exposure(10.0, 4e18, 1600.0, 0.1) == pytest.approx(2 * base)
    assert exp.gordon_exposure(10.0, 4e18, 400.0, 0.4) == pytest.approx(2 * base)


def test_langmuir_and_dose_margin():
    """1 L = 1e-6 Torr s = 1.33322e-4 Pa s (common practice; G6-06). Dose margin = p t/required."""
    assert exp.LANGMUIR_PA_S == pytest.approx(1.33322e-4, rel=1e-5)
    assert exp.langmuir_exposure(1.33322e-4, 1.0) == pytest.approx(1.0, rel=1e-5)
    assert exp.langmuir_exposure(constants.torr * 1e-3, 2.0) == pytest.approx(2000.0)
    required = exp.gordon_exposure(50.0, exp.DEFAULT_SITE_DENSITY_M2, 423.15, TMA_KG_MOL)
    assert exp.dose_margin(13.33, 7.93e-2, required) == pytest.approx(1.0, rel=3e-3)
    assert_allclose(exp.dose_margin([10.0, 20.0], 0.1, 0.5), [2.0, 4.0])


def test_default_site_density():
    """4 nm^-2 (Yim, Verkama et al. 2022 baseline). Plausibility (from memory): TMA/H2O grows
    about 1.1 A of Al2O3 per cycle at about 3.0 g/cm3, i.e. 2 Al per Al2O3 unit; accept 20 %."""
    assert exp.DEFAULT_SITE_DENSITY_M2 == 4.0e18
    al_per_m2 = 1.1e-10 * 3.0e3 / 0.10196 * constants.N_A * 2
    assert al_per_m2 == pytest.approx(exp.DEFAULT_SITE_DENSITY_M2, rel=0.2)
