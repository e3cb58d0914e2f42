"""Kinetic theory against published tables, a reference library and textbook formulas."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import constants

from chamberchk.physics import kinetics
from chamberchk.physics.collision import omega11, omega22

# Lennard-Jones parameters of Poling, Prausnitz & O'Connell (2001), App. B Table B-1 (Svehla 1962),
# as listed in shared/reference-values.md section 2 (G2-01, G2-03, G2-04).
LJ = {"N2": (28.0134e-3, 3.798e-10, 71.4), "Ar": (39.948e-3, 3.542e-10, 93.3),
      "He": (4.002602e-3, 2.551e-10, 10.22)}
AIR_M = 28.9586e-3  # kg/mol, the CoolProp/Lemmon pseudo-pure air molar mass


def test_mean_speed_argon_at_0C():
    """v = sqrt(8RT/(pi M)) for Ar at 273.15 K is 380.5 m/s with CODATA R (issue 2)."""
    expected = math.sqrt(8 * 8.314462618 * 273.15 / (math.pi * 39.948e-3))  # CODATA 2018 R
    assert round(expected, 1) == 380.5
    assert kinetics.mean_speed(273.15, 39.948e-3) == pytest.approx(380.5, abs=0.05)


@pytest.mark.parametrize("temperature, molar_mass, expected", [
    (293.15, 28.9586e-3, 462.96),   # air, reference-values G1-10 (library-computed)
    (300.0, 28.0134e-3, 476.2),     # N2, G1-10
    (573.15, 297.83e-3, 201.9),     # WF6, G1-10
])
def test_mean_speed_reference_values(temperature, molar_mass, expected):
    # tolerance: the reference values are printed to 4-5 digits; 0.05 % covers the rounding
    assert kinetics.mean_speed(temperature, molar_mass) == pytest.approx(expected, rel=5e-4)


def test_mean_speed_vectorised():
    v = kinetics.mean_speed(np.array([300.0, 600.0]), 28.0134e-3)
    assert v.shape == (2,)
    assert v[1] / v[0] == pytest.approx(math.sqrt(2.0), rel=1e-12)


# Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed. (2002), Table E.2 (interpolated from
# Monchick & Mason 1961), the same collision integrals Hirschfelder, Curtiss & Bird (1954) tabulate.
BSL_E2 = [  # T*, Omega(2,2)* (viscosity), Omega(1,1)* (diffusivity)
    (0.30, 2.840, 2.649), (0.50, 2.284, 2.066), (1.00, 1.593, 1.440), (2.50, 1.0933, 1.0006),
    (3.00, 1.0388, 0.9500), (5.00, 0.9268, 0.8428), (10.0, 0.8244, 0.7422),
]


@pytest.mark.parametrize("t_star, om22, om11", BSL_E2)
def test_neufeld_collision_integrals_against_table(t_star, om22, om11):
    # Neufeld et al. (1972) state their fit reproduces the tables to about 0.1 %; the issue asks
    # for 0.2 %. The tables print 4 significant digits (rounding <= 0.03 %).
    assert omega22(t_star) == pytest.approx(om22, rel=2e-3)
    assert omega11(t_star) == pytest.approx(om11, rel=2e-3)


def test_neufeld_at_top_of_range():
    # BSL Table E.2 at T* = 100: 0.5887 / 0.5180. The fit is poorer at the edge of its range:
    # 0.45 % for Omega(2,2); this test pins that the error stays within 0.5 %.
    assert omega22(100.0) == pytest.approx(0.5887, rel=5e-3)
    assert omega11(100.0) == pytest.approx(0.5180, rel=3e-3)


@pytest.mark.parametrize("gas, coolprop_name", [("N2", "Nitrogen"), ("Ar", "Argon"),
                                                ("He", "Helium")])
def test_viscosity_against_coolprop(gas, coolprop_name):
    """Chapman-Enskog viscosity at 300 K within 2 % of CoolProp's reference correlations."""
    cp = pytest.importorskip("CoolProp.CoolProp")
    reference = cp.PropsSI("V", "T", 300.0, "P", 1000.0, coolprop_name)  # dilute limit
    m, sigma, eps = LJ[gas]
    # 2 %: the first Chapman-Enskog approximation with Svehla's LJ set is good to 1-2 % for
    # nonpolar gases (Poling et al. 2001, sec. 9-3); the issue asks for 2 %.
    assert kinetics.viscosity(300.0, m, sigma, eps) == pytest.approx(reference, rel=0.02)


def test_mean_free_path_air_jennings():
    """Air at 1 atm and 23 degC: 67.3 nm (ISO 15900 value quoted with Jennings 1988; from memory).

    Jennings (1988) defines lambda = sqrt(pi/8) mu / (0.4987445 sqrt(rho p)) = 1.00252 lambda_v.
    With CoolProp's air viscosity and density that gives 66.34 nm at 23 degC (reference-values
    G1-02, library-computed). Our viscosity-based form times 1.00252 must match within 1 %.
    """
    cp = pytest.importorskip("CoolProp.CoolProp")
    t, p = 296.15, 101325.0
    mu = cp.PropsSI("V", "T", t, "P", p, "Air")
    rho = cp.PropsSI("D", "T", t, "P", p, "Air")
    jennings = math.sqrt(math.pi / 8) * mu / (0.4987445 * math.sqrt(rho * p))
    ours = 1.00252 * kinetics.mean_free_path_viscosity(mu, p, t, AIR_M)
    assert ours == pytest.approx(jennings, rel=1e-3)  # same definition; density ideal-gas vs real
    assert ours == pytest.approx(66.34e-9, rel=0.01)   # G1-02
    # 67.3 nm (ISO 15900 / Kim et al. 2005, from memory) uses an older viscosity; 2 % covers it
    assert ours == pytest.approx(67.3e-9, rel=0.02)


def test_mean_free_path_rule_of_thumb_air():
    """lambda * p ~ 6.6e-3 Pa m for air at room temperature (vacuum handbooks; common practice)."""
    cp = pytest.importorskip("CoolProp.CoolProp")
    mu = cp.PropsSI("V", "T", 293.15, "P", 100.0, "Air")
    lp = kinetics.mean_free_path_viscosity(mu, 1.0, 293.15, AIR_M)
    # the handbook constant 6.65 mm Pa at 20 degC (G1-05) is a rounded rule: accept 5 %
    assert lp == pytest.approx(6.65e-3, rel=0.05)


def test_mean_free_path_n2_crc_hard_sphere():
    """CRC Handbook 'Mean free path' table: N2 at 25 degC and 100 kPa, 67.6 nm, with the hard-sphere
    diameter derived from viscosity (reference-values G1-03); that diameter's mean free path is
    16/(5 pi) times the viscosity-based one (G1-01, exact algebra)."""
    m, sigma, eps = LJ["N2"]
    mu = kinetics.viscosity(298.15, m, sigma, eps)
    lam = kinetics.mean_free_path_viscosity(mu, 1.0e5, 298.15, m) * 16 / (5 * math.pi)
    # 1.5 %: our Chapman-Enskog mu differs from the CRC's 17.8 uPa s by < 1 % (G1-03 tolerance)
    assert lam == pytest.approx(67.6e-9, rel=0.015)


def test_hard_sphere_from_viscosity_ratio():
    """With d from mu via the Chapman-Enskog hard-sphere viscosity, lambda_HS / lambda_v = 16/(5 pi)
    = 1.018592 (reference-values G1-01, exact algebra)."""
    m, t, p, mu = 39.948e-3, 300.0, 133.322, 2.27e-5
    mass = m / constants.N_A
    d = math.sqrt(5 / 16 * math.sqrt(math.pi * mass * constants.k * t) / (math.pi * mu))
    ratio = (kinetics.mean_free_path_hard_sphere(t, p, d)
             / kinetics.mean_free_path_viscosity(mu, p, t, m))
    assert ratio == pytest.approx(16 / (5 * math.pi), rel=1e-12)


def test_argon_1_torr_trench_knudsen():
    """Ar at 300 K and 1 Torr: lambda_v = 53.38 um with CoolProp mu; Kn = 534 in a 100 nm trench
    (reference-values G1-06, library-computed)."""
    lam = kinetics.mean_free_path_viscosity(2.2724e-5, 133.322, 300.0, 39.948e-3)
    assert lam == pytest.approx(53.38e-6, rel=1e-3)
    assert lam / 100e-9 == pytest.approx(534, rel=2e-3)


def test_species_mean_free_paths_pure_limit_and_mixture():
    m = np.array([28.0134e-3, 4.002602e-3])
    mu = np.array([1.78e-5, 1.99e-5])
    pure = kinetics.species_mean_free_paths([1.0, 0.0], 1e3, 300.0, m, mu)
    expected = kinetics.mean_free_path_viscosity(mu[0], 1e3, 300.0, m[0])
    assert pure[0] == pytest.approx(expected, rel=1e-12)  # exact by construction of d
    # trace He in N2: Bird (1994) eq. 1.34 reduces to 1/(n pi d_12^2 sqrt(1 + m_He/m_N2)),
    # written out by hand here with the same viscosity-equivalent diameters
    trace = kinetics.species_mean_free_paths([1.0, 0.0], 1e3, 300.0, m, mu)[1]
    d = kinetics.equivalent_diameter(mu, 300.0, m)
    n = 1e3 / (constants.k * 300.0)
    by_hand = 1.0 / (n * math.pi * (0.5 * (d[0] + d[1])) ** 2 * math.sqrt(1 + m[1] / m[0]))
    assert trace == pytest.approx(by_hand, rel=1e-12)


def test_wilke_mixture_viscosity_against_cantera():
    """Wilke's rule for N2-He against Cantera's mixture-averaged viscosity (test-only reference
    library, which also uses Wilke's rule with its own species viscosities)."""
    ct = pytest.importorskip("cantera")
    gas = ct.Solution("gri30.yaml")  # no He in GRI 3.0: use N2-Ar
    gas.TPX = 300.0, ct.one_atm, {"N2": 0.5, "AR": 0.5}
    mu_sp = gas.species_viscosities
    idx = [gas.species_index("N2"), gas.species_index("AR")]
    ours = kinetics.mixture_viscosity([0.5, 0.5], gas.molecular_weights[idx] / 1e3, mu_sp[idx])
    # Cantera's mixture-averaged viscosity is Wilke's formula; 0.5 % covers its slightly different
    # phi expression for unequal masses
    assert ours == pytest.approx(gas.viscosity, rel=5e-3)


def test_sccm_definition():
    """1 sccm: 1 cm3/min of ideal gas at 0 degC and 101.325 kPa, n = pV/(RT) per 60 s
    (definition; CODATA R from scipy)."""
    from chamberchk.units import SCCM_MOL_S, parse_quantity

    assert SCCM_MOL_S == pytest.approx(101325 * 1e-6 / (constants.R * 273.15) / 60, rel=1e-12)
    assert parse_quantity("1 sccm", "flow") == pytest.approx(7.4358e-7, rel=1e-4)
    assert parse_quantity("2 slm", "flow") == pytest.approx(2000 * SCCM_MOL_S, rel=1e-12)
