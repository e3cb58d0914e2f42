"""The evaluator: features followed through steps, regimes, flags, and a hand calculation."""

from __future__ import annotations

import math

import pytest
from scipy import constants

from chamberchk.evaluate import evaluate
from chamberchk.physics.collision import omega22
from chamberchk.recipe import load_bytes

HEADER = 'format = 1\n[recipe]\nname = "t"\n'


def _eval(text: str):
    return evaluate(load_bytes(text.encode(), "test.toml"))


def _step(name, pressure, film="0 nm", etch="0 nm", gases='{ N2 = "100 sccm" }', extra=""):
    return (f'[[step]]\nname = "{name}"\nduration = "1 s"\npressure = "{pressure}"\n'
            f'temperature = "25 degC"\ngases = {gases}\nfilm = "{film}"\n'
            f'etch_depth = "{etch}"\n{extra}')


TRENCH = '[[feature]]\nid = "a"\nshape = "trench"\nwidth = "100 nm"\ndepth = "1 um"\n'


def test_film_narrows_and_etch_deepens():
    ev = _eval(HEADER + TRENCH + _step("dep", "1 Torr", film="10 nm")
               + _step("etch", "1 Torr", etch="500 nm") + _step("look", "1 Torr"))
    widths = [s.features[0].width_m for s in ev.steps]
    depths = [s.features[0].depth_m for s in ev.steps]
    # a step sees the geometry at its start; 10 nm on both walls removes 20 nm of width
    assert widths == pytest.approx([100e-9, 80e-9, 80e-9], rel=1e-12)
    assert depths == pytest.approx([1e-6, 1e-6, 1.5e-6], rel=1e-12)
    assert ev.steps[2].features[0].aspect_ratio == pytest.approx(1.5e-6 / 80e-9, rel=1e-12)


def test_closure_flagged_and_feature_leaves_later_steps():
    ev = _eval(HEADER + TRENCH + _step("dep1", "1 Torr", film="30 nm")
               + _step("dep2", "1 Torr", film="30 nm") + _step("after", "1 Torr"))
    codes = [(f.code, f.step, f.severity) for f in ev.flags]
    assert ("feature-closes", "dep2", "critical") in codes
    assert ev.steps[1].features[0].closed
    assert ev.steps[2].features == []


def test_tapered_feature_closes_at_bottom_first():
    text = HEADER + TRENCH.replace('depth = "1 um"', 'depth = "1 um"\nbottom_width = "40 nm"')
    ev = _eval(text + _step("dep", "1 Torr", film="25 nm") + _step("dep2", "1 Torr", film="10 nm")
               + _step("dep3", "1 Torr", film="20 nm") + _step("after", "1 Torr"))
    closes = [f for f in ev.flags if f.code == "feature-closes"]
    # a V-shaped trench fills from the bottom up: no void, so information rather than critical
    assert [(f.step, f.severity) for f in closes] == [("dep", "info"), ("dep3", "info")]
    assert "V-groove" in closes[0].message and "filled" in closes[1].message
    # By hand: the width falls by (100 - 40) nm over 1 um, 0.06 per unit depth, and a film keeps
    # that slope. After 25 nm the top is 50 nm and the walls meet 50/0.06 = 833 nm down; after
    # 10 nm more, 30 nm and 500 nm. The V-groove stays in the steps until its opening shuts.
    dep2, dep3 = ev.steps[1].features[0], ev.steps[2].features[0]
    assert not ev.steps[0].features[0].closed
    assert (dep2.width_m, dep2.bottom_width_m) == pytest.approx((50e-9, 0.0), abs=1e-18)
    assert dep2.depth_m == pytest.approx(50e-9 / 0.06, rel=1e-12)
    assert dep3.depth_m == pytest.approx(30e-9 / 0.06, rel=1e-12) and dep3.closed
    assert ev.steps[3].features == []
    # transport on the V-groove is cautioned (the taper model stops at bottom/top 0.25)
    assert any(f.code == "model-range" and f.step == "dep2" and "bottom/top width 0" in f.message
               for f in ev.flags)


def test_regime_shift_between_steps():
    # N2 at 25 degC: lambda p ~ 6.6e-3 Pa m, so at 100 Torr lambda ~ 0.5 um and Kn in a 100 nm
    # trench ~ 5 (transition); at 1 Torr Kn ~ 500 (free-molecular)
    ev = _eval(HEADER + TRENCH + _step("low", "1 Torr") + _step("high", "100 Torr")
               + _step("high again", "100 Torr"))
    regimes = [s.features[0].regime for s in ev.steps]
    assert regimes == ["free-molecular", "transition", "transition"]
    shifts = [f for f in ev.flags if f.code == "regime-shift"]
    assert len(shifts) == 1 and shifts[0].step == "high" and shifts[0].feature == "a"


def test_regime_bounds_from_settings():
    ev = _eval(HEADER + "[settings]\ntransition_max = 1000.0\n" + TRENCH + _step("s", "1 Torr"))
    assert ev.steps[0].features[0].regime == "transition"


def test_hazard_and_estimated_data_flags():
    ev = _eval(HEADER + TRENCH + _step("s", "1 Torr", gases='{ WF6 = "10 sccm", H2 = "1 slm" }'))
    codes = {(f.code, f.message.split(" ")[0]) for f in ev.flags}
    assert ("gas-hazard", "WF6") in codes and ("gas-hazard", "H2") in codes
    assert ("estimated-gas-data", "WF6") in codes
    cautions = {c["gas"]: c for c in ev.gas_cautions}
    assert "flammable" in cautions["H2"]["hazards"]


def test_default_reactant_is_smallest_non_inert_flow():
    ev = _eval(HEADER + TRENCH + _step(
        "s", "1 Torr", gases='{ NH3 = "300 sccm", SiH4 = "60 sccm", N2 = "2 slm" }'))
    assert ev.steps[0].reactant == "SiH4"
    ev = _eval(HEADER + TRENCH + _step("s", "1 Torr", gases='{ Ar = "30 sccm", N2 = "1 slm" }'))
    assert ev.steps[0].reactant == "N2"


def test_new_user_recipe_against_hand_calculation():
    """A recipe written as a new user would: Ar/He at 500 mTorr and 200 degC into a 250 nm via.

    Hand calculation from the published formulas (Chapman-Enskog viscosity, Poling et al. 2001
    eq. 9-3.9 with the Neufeld Omega(2,2); viscosity-based mean free path; Bird's mixture form),
    with LJ parameters from Poling et al. 2001 Table B-1 (Ar 3.542 A / 93.3 K, He 2.551 A /
    10.22 K; reference-values G2-03, G2-04). Written out here step by step, independent of the
    kernels' code paths.
    """
    text = '''format = 1
[recipe]
name = "my via check"
[[feature]]
id = "v"
shape = "via"
width = "250 nm"
depth = "2.5 um"
[[step]]
name = "dep"
duration = "30 s"
pressure = "500 mTorr"
temperature = "200 degC"
gases = { Ar = "75 sccm", He = "25 sccm" }
'''
    ev = _eval(text)
    step = ev.steps[0]
    t, p = 473.15, 0.5 * 101325 / 760
    k, na = constants.k, constants.N_A
    params = {"Ar": (39.948e-3, 3.542e-10, 93.3), "He": (4.002602e-3, 2.551e-10, 10.22)}
    mu, lam_pure, d = {}, {}, {}
    for gas, (m, sigma, eps) in params.items():
        mass = m / na
        mu[gas] = 5 / 16 * math.sqrt(math.pi * mass * k * t) / (math.pi * sigma**2
                                                                 * omega22(t / eps))
        lam_pure[gas] = mu[gas] / p * math.sqrt(math.pi * k * t / (2 * mass))
        d[gas] = math.sqrt(k * t / (math.sqrt(2) * math.pi * p * lam_pure[gas]))
    x = {"Ar": 0.75, "He": 0.25}
    n = p / (k * t)
    lam = {}
    for i in x:
        rate = sum(x[j] * n * math.pi * ((d[i] + d[j]) / 2) ** 2
                   * math.sqrt(1 + params[i][0] / params[j][0]) for j in x)
        lam[i] = 1 / rate
    lam_mix = sum(x[i] * lam[i] for i in x)
    species = {s.gas: s for s in step.species}
    # 1e-5: the gas table keeps molar masses to 6 significant digits (He 4.00260 against
    # 4.002602 here); any modelling difference would show at 1e-3 or more
    for gas in x:
        assert species[gas].viscosity_Pa_s == pytest.approx(mu[gas], rel=1e-5)
        assert species[gas].mean_free_path_m == pytest.approx(lam[gas], rel=1e-5)
        assert species[gas].mole_fraction == pytest.approx(x[gas], rel=1e-12)
    assert step.mean_free_path_m == pytest.approx(lam_mix, rel=1e-5)
    feat = step.features[0]
    assert feat.knudsen_number == pytest.approx(lam_mix / 250e-9, rel=1e-5)
    assert feat.aspect_ratio == pytest.approx(10.0, rel=1e-12)
    # sanity against the rule of thumb: Ar lambda ~ 5e-3 cm Torr at room temperature scaled by
    # T^(~1.7)/p (common practice): hundreds of um at 0.5 Torr and 200 degC
    assert 50e-6 < lam_mix < 500e-6
    assert feat.regime == "free-molecular"


def test_collision_integral_range_caution():
    """Neufeld et al. (1972) fitted 0.3 <= T* <= 100; He (epsilon/k = 10.22 K) at 1500 K has
    T* ~ 147, so the evaluator must say the viscosity is an extrapolation."""
    ev = _eval(HEADER + TRENCH + _step("hot", "1 Torr", gases='{ He = "100 sccm" }').replace(
        '"25 degC"', '"1227 degC"'))
    assert any(f.code == "model-range" and "He" in f.message and "T*" in f.message
               for f in ev.flags)
    ev = _eval(HEADER + TRENCH + _step("room", "1 Torr", gases='{ He = "100 sccm" }'))
    assert not any(f.code == "model-range" and "T*" in f.message for f in ev.flags)
