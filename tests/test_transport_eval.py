"""Feature transport through the evaluator: hand checks against the cited formulas."""

from __future__ import annotations

import math

import pytest
from scipy import constants

from chamberchk.evaluate import evaluate
from chamberchk.physics import sheath, transmission
from chamberchk.physics.collision import omega11
from chamberchk.recipe import load_bytes

ALD = '''format = 1
[recipe]
name = "my 40:1 via"
[[feature]]
id = "v"
shape = "via"
width = "100 nm"
depth = "4 um"
[[step]]
name = "TMA pulse"
process = "ald-pulse"
duration = "0.5 s"
pressure = "1 Torr"
temperature = "250 degC"
gases = { TMA = "20 sccm", N2 = "180 sccm" }
reactant = "TMA"
sticking = 0.001
'''


def _eval(text):
    return evaluate(load_bytes(text.encode(), "t.toml"))


def test_new_user_40_to_1_via_ald_pulse_by_hand():
    """Dose margin: p_TMA t / [S sqrt(2 pi m k T) (1 + 19/4 a + 3/2 a^2)] with a = 40 and the
    default S = 4e18 m^-2 (Gordon, Hausmann, Kim & Shepard 2003). Bottom coverage: in free-molecular
    flow (Kn ~ 1e3) the ballistic solution; checked here against the Thiele estimate with the
    Dushman entrance length, phi = ((L + 4d/3)/d) sqrt(3 s) (reference-values G6-04)."""
    ev = _eval(ALD)
    f = ev.steps[0].features[0]
    t, p = 523.15, 101325 / 760
    m = ev.steps[0].species[0]
    assert m.gas == "TMA"
    tma = load_bytes(ALD.encode(), "t.toml").gases.get("TMA")
    mass = tma.molar_mass_kg_mol / constants.N_A
    flat = 4e18 * math.sqrt(2 * math.pi * mass * constants.k * t)
    required = flat * (1 + 4.75 * 40 + 1.5 * 1600)
    assert f.required_exposure_Pa_s == pytest.approx(required, rel=1e-9)
    assert f.dose_margin == pytest.approx(0.1 * p * 0.5 / required, rel=1e-9)
    assert f.regime == "free-molecular" and f.bottom_flux_model == "ballistic"
    phi = (40 + 4 / 3) * math.sqrt(3 * 0.001)
    # 5 %: the 1-D Thiele estimate with an entrance correction agrees with the integral
    # equations to a few per cent at this aspect ratio (test_transmission.py pins 1.5 % at AR 10-50)
    assert f.bottom_flux_ratio == pytest.approx(1 / math.cosh(phi), rel=0.05)
    # D_K = W v L / 4 tends to d v / 3 for long tubes; at L/R = 80 the Clausing W is below the
    # 8R/3L limit by a factor between the tabulated 0.716 (L/R = 10) and 0.948 (L/R = 100)
    # (reference-values G4-02), so the ratio must lie between those
    v = m.mean_speed_m_s
    ratio = f.knudsen_diffusivity_m2_s / (100e-9 * v / 3)
    assert 0.716 < ratio < 0.948


def test_ald_pulse_is_judged_by_dose_not_by_bare_surface_coverage():
    """The same 40:1 via and sticking: as a deposition step the bare-surface bottom flux (about
    1 %) raises poor-bottom-coverage; as a self-limiting ALD pulse it raises dose-short only
    while the dose is short, and nothing once the pulse delivers the Gordon exposure."""
    codes = lambda ev: {f.code for f in ev.flags}  # noqa: E731
    dep = _eval(ALD.replace('process = "ald-pulse"', 'process = "deposition"'))
    assert "poor-bottom-coverage" in codes(dep)
    short = _eval(ALD.replace('duration = "0.5 s"', 'duration = "5 ms"'))
    assert short.steps[0].features[0].dose_margin < 1
    assert "dose-short" in codes(short) and "poor-bottom-coverage" not in codes(short)
    long_ = _eval(ALD)
    assert long_.steps[0].features[0].dose_margin > 1
    assert not codes(long_) & {"dose-short", "poor-bottom-coverage"}


HEAVY_IN_LIGHT = '''format = 1
[recipe]
name = "p"
[[feature]]
id = "t"
shape = "trench"
width = "100 nm"
depth = "1 um"
[[step]]
name = "s"
duration = "10 s"
pressure = "{p}"
temperature = "400 degC"
gases = {{ WF6 = "10 sccm", H2 = "1 slm" }}
reactant = "WF6"
'''


def test_reactant_regime_beside_the_mixture_regime():
    """WF6 diluted 1:100 in H2: the mixture mean free path (mole-fraction mean, DESIGN) is about
    twenty times WF6's own in that mixture (hard-sphere mixture form, Bird 1994, tested in
    test_kinetics.py), so at 40 Torr the 100 nm trench is free-molecular for the mixture and
    transition for WF6 alone. The reactant's Kn is its species mean free path over the width,
    and an info flag says when the two regimes differ (not at 10 Torr, where both are
    free-molecular)."""
    ev = _eval(HEAVY_IN_LIGHT.format(p="40 Torr"))
    step, f = ev.steps[0], ev.steps[0].features[0]
    lam = next(g.mean_free_path_m for g in step.species if g.gas == "WF6")
    assert f.reactant_knudsen_number == pytest.approx(lam / 100e-9, rel=1e-12)
    assert (f.regime, f.reactant_regime) == ("free-molecular", "transition")
    flag = next(x for x in ev.flags if x.code == "reactant-regime")
    assert flag.severity == "info" and "WF6 alone has Kn" in flag.message
    ev = _eval(HEAVY_IN_LIGHT.format(p="10 Torr"))
    assert ev.steps[0].features[0].reactant_regime == "free-molecular"
    assert not any(x.code == "reactant-regime" for x in ev.flags)


def test_molecular_diffusivity_in_the_step_by_hand():
    """TMA in N2 by Chapman-Enskog (Poling et al. 2001 eq. 11-3.2) with the table's LJ values;
    Blanc's law with a single partner is the binary value."""
    r = load_bytes(ALD.encode(), "t.toml")
    a, b = r.gases.get("TMA"), r.gases.get("N2")
    t, p = 523.15, 101325 / 760
    m12 = 2 / (1 / (a.molar_mass_kg_mol * 1e3) + 1 / (b.molar_mass_kg_mol * 1e3))
    s12 = (a.sigma_m + b.sigma_m) / 2 * 1e10
    om = omega11(t / math.sqrt(a.epsilon_K * b.epsilon_K))
    d_cm2 = 0.0026635 * t**1.5 / ((p / 1e5) * math.sqrt(m12) * s12**2 * om)
    f = evaluate(r).steps[0].features[0]
    # 0.1 %: the printed constant 0.00266 is 0.0026635 to five digits (PPO 2001 eq. 11-3.2)
    assert f.molecular_diffusivity_m2_s == pytest.approx(d_cm2 * 1e-4, rel=1e-3)


def test_bottom_coverage_continuous_across_the_transition_bound():
    """Below Kn = 10 the reaction-diffusion model takes over from the ballistic one. At the bound
    both describe the same feature; the jump must not exceed the two models' disagreement in the
    free-molecular limit itself (reaction-diffusion with D = D_K against the integral equations),
    which is the honest size of the model change."""
    base = ALD.replace('process = "ald-pulse"', 'process = "deposition"').replace(
        'width = "100 nm"\ndepth = "4 um"', 'width = "2 um"\ndepth = "30 um"')
    # find pressures just either side of Kn = 10 from the window pressures of one evaluation
    ev = _eval(base)
    p_bound = ev.steps[0].features[0].window_pressures_Pa[2]
    torr = p_bound / (101325 / 760)
    lo = _eval(base.replace('"1 Torr"', f'"{torr * 1.001!r} Torr"')).steps[0].features[0]
    hi = _eval(base.replace('"1 Torr"', f'"{torr * 0.999!r} Torr"')).steps[0].features[0]
    assert lo.bottom_flux_model == "reaction-diffusion" and hi.bottom_flux_model == "ballistic"
    jump = abs(lo.bottom_flux_ratio - hi.bottom_flux_ratio)
    from chamberchk.physics import diffusion
    far = _eval(base.replace('"1 Torr"', '"0.001 Torr"')).steps[0].features[0]
    rd_limit = diffusion.reaction_diffusion_bottom_ratio(
        far.depth_m, far.width_m, "via", far.knudsen_diffusivity_m2_s,
        far.knudsen_diffusivity_m2_s * 4 / (far.transmission_probability * far.depth_m), 0.001)
    disagreement = abs(rd_limit - far.bottom_flux_ratio)
    assert jump <= disagreement + 0.02  # plus the 1 % of Kn the two sides differ by, generously


PLASMA = '''format = 1
[recipe]
name = "etch"
[[feature]]
id = "h"
shape = "via"
width = "1 um"
depth = "10 um"
[[step]]
name = "etch"
process = "etch"
duration = "5 s"
pressure = "{p}"
temperature = "20 degC"
gases = {{ SF6 = "100 sccm", Ar = "20 sccm" }}
reactant = "SF6"
sticking = 0.1
[step.plasma]
electron_density = "1e10 cm^-3"
electron_temperature = "3 eV"
sheath_voltage = "{v}"
'''


def test_plasma_neutral_flux_is_the_feature_transport_value():
    ev = _eval(PLASMA.format(p="10 mTorr", v="100 V"))
    f = ev.steps[0].features[0]
    direct = transmission.bottom_flux_ratio("via", 10e-6, 1e-6, None, 0.1)
    # 1e-3: the evaluator uses the tabulated fast path of the same solver (checked off-grid)
    assert f.bottom_flux_ratio == pytest.approx(direct, rel=1e-3)
    assert f.ion_to_neutral_bottom_over_top == pytest.approx(f.ion_bottom_fraction / direct,
                                                             rel=1e-3)


def test_sheath_through_the_evaluator_by_hand():
    """Child law with the presheath edge density n_s = n0 exp(-1/2) (Lieberman & Lichtenberg
    2005, from memory for the section): s = (sqrt 2 / 3) lambda_De (2 V0/Te)^(3/4)."""
    ev = _eval(PLASMA.format(p="1 mTorr", v="100 V"))
    pl = ev.steps[0].plasma
    n_s = 1e16 * math.exp(-0.5)
    lam_de = math.sqrt(constants.epsilon_0 * 3.0 / (constants.e * n_s))
    assert pl.debye_length_m == pytest.approx(lam_de, rel=1e-9)
    assert pl.sheath_model == "collisionless Child law"
    assert pl.sheath_thickness_m == pytest.approx(math.sqrt(2) / 3 * lam_de * (200 / 3) ** 0.75,
                                                  rel=1e-9)
    assert pl.ion == "Ar"  # default: the heaviest inert gas of the step


def test_collisionality_rises_with_pressure_and_voltage():
    ratios_p = [_eval(PLASMA.format(p=p, v="100 V")).steps[0].plasma.collisionality
                for p in ("2 mTorr", "20 mTorr", "200 mTorr")]
    ratios_v = [_eval(PLASMA.format(p="20 mTorr", v=v)).steps[0].plasma.collisionality
                for v in ("30 V", "300 V", "1000 V")]
    assert ratios_p == sorted(ratios_p) and ratios_p[0] < ratios_p[-1]
    assert ratios_v == sorted(ratios_v) and ratios_v[0] < ratios_v[-1]
    ev = _eval(PLASMA.format(p="200 mTorr", v="300 V"))
    assert any(f.code == "sheath-collisional" for f in ev.flags)
    assert sheath.COLLISIONAL_FLAG_RATIO == 1.0
