"""The chamber section of the evaluation, checked by hand against textbook relations."""

from __future__ import annotations

import math

import pytest
from scipy import constants

from chamberchk.evaluate import evaluate
from chamberchk.recipe import load_bytes
from chamberchk.units import SCCM_MOL_S

HEAD = '''format = 1
[recipe]
name = "chamber probe"
[chamber]
volume = "10 L"
gap = "10 mm"
pump_speed = "{speed}"
{path}
[[feature]]
id = "t"
shape = "trench"
width = "1 um"
depth = "2 um"
[[step]]
name = "s"
duration = "{duration}"
pressure = "{pressure}"
temperature = "20 degC"
gases = {{ Ar = "{flow}" }}
'''


def run(pressure="1 mTorr", flow="100 sccm", speed="500 L/s", duration="60 s", path=""):
    text = HEAD.format(pressure=pressure, flow=flow, speed=speed, duration=duration, path=path)
    return evaluate(load_bytes(text.encode(), "c.toml"))


def test_sccm_to_throughput_from_the_definition():
    """1 sccm = 1 cm3/min at 0 degC and 101.325 kPa: Q = 101325 Pa x 1e-6 m3 / 60 s at 273.15 K
    = 1.68875e-3 Pa m3/s; at 293.15 K the same molar flow carries Q x 293.15/273.15."""
    ev = run(flow="100 sccm")
    c = ev.steps[0].chamber
    assert c.total_flow_mol_s == pytest.approx(100 * SCCM_MOL_S, rel=1e-12)
    q_std = 100 * 101325 * 1e-6 / 60
    assert c.total_flow_Pa_m3_s == pytest.approx(q_std * 293.15 / 273.15, rel=1e-9)


def test_no_path_residence_and_lowest_pressure_by_hand():
    """Without a path the pump works on the chamber directly: S_eff = S, tau = V/S, and the
    lowest pressure is Q/S (textbook relations; reference-values G5-06)."""
    c = run(speed="500 L/s").steps[0].chamber
    assert c.effective_pump_speed_m3_s == pytest.approx(0.5, rel=1e-12)
    assert c.residence_time_s == pytest.approx(0.010 / 0.5, rel=1e-12)
    assert c.lowest_pressure_Pa == pytest.approx(c.total_flow_Pa_m3_s / 0.5, rel=1e-12)


APERTURE = '[[chamber.path]]\nshape = "aperture"\ndiameter = "50 mm"\n'


def test_molecular_aperture_path_by_hand():
    """A thin aperture in molecular flow: C = A v/4 (Ar at 20 degC); 1/S_eff = 1/S + 1/C
    (reference-values G5-01, G5-06). At 0.01 mTorr the 50 mm orifice has Kn ~ 100."""
    ev = run(pressure="0.01 mTorr", flow="0.1 sccm", path=APERTURE)
    c = ev.steps[0].chamber
    v = math.sqrt(8 * constants.R * 293.15 / (math.pi * 39.948e-3))
    c_hand = math.pi / 4 * 0.05**2 * v / 4
    # 0.5 %: the element sits near the molecular limit (Kn >> 10), where the transition blend
    # departs from pure molecular flow by well under 0.5 %
    assert c.path_conductance_m3_s == pytest.approx(c_hand, rel=5e-3)
    assert c.effective_pump_speed_m3_s == pytest.approx(1 / (1 / 0.5 + 1 / c_hand), rel=5e-3)
    assert c.elements[0].regime == "free-molecular"
    # lowest pressure: p_pump = Q/S, p_ch = p_pump + Q/C (molecular C does not depend on p)
    q = c.total_flow_Pa_m3_s
    assert c.lowest_pressure_Pa == pytest.approx(q / 0.5 + q / c_hand, rel=5e-3)


def test_high_vacuum_at_process_flow_is_flagged_with_the_lowest_pressure():
    """A new user's request: 0.05 mTorr with 500 sccm through a 40 mm tube of 1 m."""
    path = '[[chamber.path]]\nshape = "tube"\ndiameter = "40 mm"\nlength = "1 m"\n'
    ev = run(pressure="0.05 mTorr", flow="500 sccm", path=path)
    c = ev.steps[0].chamber
    flag = next(f for f in ev.flags if f.code == "pressure-unreachable")
    assert flag.severity == "critical"
    assert c.lowest_pressure_Pa > ev.steps[0].pressure_Pa
    assert f"{c.lowest_pressure_Pa:.3g} Pa" in flag.message
    # consistency: at the lowest pressure the path carries Q with the pump at full speed,
    # p_ch - Q/S = Q / C(p_mean); check the balance with the conductance the kernel reports
    from chamberchk.physics import conductance as cond
    step = ev.steps[0]
    q, s = c.total_flow_Pa_m3_s, 0.5
    p_ch = c.lowest_pressure_Pa
    p_pump = q / s
    lam_p = step.mean_free_path_m * step.pressure_Pa
    p_mean = 0.5 * (p_ch + p_pump)
    elem = cond.PathElement("tube", diameter_m=0.04, length_m=1.0)
    c_mean, _ = cond.path_conductance([elem], p_mean, 293.15, 39.948e-3, step.viscosity_Pa_s,
                                      lam_p / p_mean)
    assert p_ch - p_pump == pytest.approx(q / c_mean, rel=1e-6)


def test_throttled_residence_time_is_p_v_over_q():
    """A throttle valve holding a pressure above the lowest holdable one leaves the chamber the
    speed S = Q/p (Q = p S, definition of pumping speed; O'Hanlon 2003 ch. 3, from memory), so
    tau = V/S = p V/Q. By hand: 100 sccm of Ar at 20 degC is Q = 0.18133 Pa m3/s; at 1 Torr in
    10 L, tau = 133.322 x 0.010 / 0.18133 = 7.352 s, independent of the 500 L/s pump. At 1 mTorr
    the same flow needs more than the pump has (Q/p = 1.36 m3/s), so tau = V/S_eff (test
    above). Tolerance 1e-9 (closed forms)."""
    q = 100 * SCCM_MOL_S * constants.R * 293.15
    for pressure_torr, speed in ((1.0, "500 L/s"), (1.0, "2000 L/s"), (5.0, "500 L/s")):
        c = run(pressure=f"{pressure_torr} Torr", speed=speed).steps[0].chamber
        p = pressure_torr * constants.torr
        assert c.throttled_pump_speed_m3_s == pytest.approx(q / p, rel=1e-9)
        assert c.residence_time_s == pytest.approx(p * 0.010 / q, rel=1e-9)
    assert run(pressure="1 Torr").steps[0].chamber.residence_time_s == pytest.approx(7.352,
                                                                                     rel=1e-3)
    # unreachable pressure: the chamber is pumped at the full-open speed
    c = run(pressure="1 mTorr").steps[0].chamber
    assert c.throttled_pump_speed_m3_s == pytest.approx(c.effective_pump_speed_m3_s, rel=1e-12)


def test_wall_temperature_sets_the_gas_in_chamber_and_path():
    """A cold-wall chamber: the gas the pump sees is at the wall temperature, not the wafer's.
    With the step at 20 degC and the wall at 20 degC the figures equal a run without the field;
    a 400 degC step with a 20 degC wall gives the same throughput Q = n R T_wall (ideal gas) and
    the same molecular aperture conductance (A v/4, v at T_wall) as the 20 degC step, while the
    wafer gap keeps the step's own mean free path (Kn scales with T at fixed p, to first order
    in the viscosity's temperature dependence: only checked to grow)."""
    base = run(pressure="0.01 mTorr", flow="0.1 sccm", path=APERTURE).steps[0].chamber
    same = run(pressure="0.01 mTorr", flow="0.1 sccm",
               path='wall_temperature = "20 degC"\n' + APERTURE).steps[0].chamber
    assert same.total_flow_Pa_m3_s == pytest.approx(base.total_flow_Pa_m3_s, rel=1e-12)
    assert same.path_conductance_m3_s == pytest.approx(base.path_conductance_m3_s, rel=1e-12)
    hot_text = HEAD.format(pressure="0.01 mTorr", flow="0.1 sccm", speed="500 L/s",
                           duration="60 s", path='wall_temperature = "20 degC"\n' + APERTURE)
    hot = evaluate(load_bytes(hot_text.replace('temperature = "20 degC"\ngases',
                                               'temperature = "400 degC"\ngases')
                              .encode(), "c.toml")).steps[0]
    assert hot.temperature_K == pytest.approx(673.15)
    c = hot.chamber
    assert c.gas_temperature_K == pytest.approx(293.15)
    assert c.total_flow_Pa_m3_s == pytest.approx(base.total_flow_Pa_m3_s, rel=1e-12)
    assert c.path_conductance_m3_s == pytest.approx(base.path_conductance_m3_s, rel=1e-9)
    assert c.gap_knudsen_number > 2 * base.gap_knudsen_number
    # without the field the 400 degC step pumps 673/293 times the pV throughput
    no_wall = evaluate(load_bytes(hot_text.replace('wall_temperature = "20 degC"\n', '')
                                  .replace('temperature = "20 degC"\ngases',
                                           'temperature = "400 degC"\ngases').encode(),
                                  "c.toml")).steps[0].chamber
    assert no_wall.total_flow_Pa_m3_s == pytest.approx(
        base.total_flow_Pa_m3_s * 673.15 / 293.15, rel=1e-9)


def test_short_step_against_residence_time():
    ev = run(duration="10 ms")
    assert any(f.code == "short-residence" for f in ev.flags)
    ev = run(duration="10 s")
    assert not any(f.code == "short-residence" for f in ev.flags)


def test_gap_knudsen_number():
    ev = run(pressure="1 Torr")
    step = ev.steps[0]
    assert step.chamber.gap_knudsen_number == pytest.approx(step.mean_free_path_m / 0.01,
                                                            rel=1e-12)


def test_short_tube_in_transition_flow_gets_a_model_range_caution():
    """Knudsen's formula was fitted to long tubes; a short one in transition flow is cautioned."""
    short = '[[chamber.path]]\nshape = "tube"\ndiameter = "100 mm"\nlength = "120 mm"\n'
    ev = run(pressure="20 mTorr", path=short)
    assert any(f.code == "model-range" and "Knudsen's formula" in f.message for f in ev.flags)
    long_ = '[[chamber.path]]\nshape = "tube"\ndiameter = "100 mm"\nlength = "2 m"\n'
    ev = run(pressure="20 mTorr", path=long_)
    assert not any("Knudsen's formula" in f.message for f in ev.flags)
