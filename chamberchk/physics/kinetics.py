"""Kinetic theory of dilute gases: mean speed, viscosity, mean free paths.

All functions take SI floats or numpy arrays. Molar masses are in kg/mol, Lennard-Jones diameters
in metres, well depths as epsilon/k in kelvin.

References
----------
.. [CC1970] S. Chapman, T. G. Cowling, *The Mathematical Theory of Non-Uniform Gases*, 3rd ed.,
   Cambridge University Press (1970).
.. [PPO2001] B. E. Poling, J. M. Prausnitz, J. P. O'Connell, *The Properties of Gases and Liquids*,
   5th ed., McGraw-Hill (2001): eq. 9-3.9 (Chapman-Enskog viscosity), eq. 9-5.13/9-5.14 (Wilke).
.. [Bird1994] G. A. Bird, *Molecular Gas Dynamics and the Direct Simulation of Gas Flows*, Oxford
   (1994), sec. 1.5 and eq. 4.76 (mean free path of a species in a gas mixture).
.. [Jennings1988] S. G. Jennings, "The mean free path in air", J. Aerosol Sci. 19, 159-166 (1988).
"""

from __future__ import annotations

import numpy as np
from scipy import constants

from .collision import omega22

K_B = constants.k
R = constants.R
N_A = constants.N_A


def mean_speed(temperature_K, molar_mass_kg_mol):
    """Mean molecular speed of a Maxwellian gas, ``v = sqrt(8 R T / (pi M))`` [m/s].

    Valid for any dilute gas in equilibrium (Maxwell-Boltzmann distribution) [CC1970, sec. 3.3].

    Parameters
    ----------
    temperature_K : float or array_like
        Gas temperature [K].
    molar_mass_kg_mol : float or array_like
        Molar mass [kg/mol].

    Examples
    --------
    >>> round(float(mean_speed(273.15, 39.948e-3)), 1)
    380.5
    """
    return np.sqrt(8.0 * R * np.asarray(temperature_K) / (np.pi * np.asarray(molar_mass_kg_mol)))[()]


def viscosity(temperature_K, molar_mass_kg_mol, sigma_m, epsilon_K):
    """Chapman-Enskog viscosity of a pure dilute gas with a Lennard-Jones 12-6 potential [Pa s].

    ``mu = (5/16) sqrt(pi m k T) / (pi sigma^2 Omega22*(T*))``, ``T* = T / (epsilon/k)``, with the
    Neufeld et al. (1972) fit for Omega22* (first approximation; [PPO2001] eq. 9-3.9). Typical
    error 0.5-1.5 % for nonpolar gases; larger for strongly polar gases (NH3, H2O) and for gases
    whose LJ parameters are estimates. Valid for dilute gas (pressure well below the critical
    pressure) and 0.3 <= T* <= 100.

    Parameters
    ----------
    temperature_K : float or array_like
        Temperature [K].
    molar_mass_kg_mol : float or array_like
        Molar mass [kg/mol].
    sigma_m : float or array_like
        Lennard-Jones collision diameter [m].
    epsilon_K : float or array_like
        Lennard-Jones well depth epsilon/k [K].

    Examples
    --------
    >>> round(float(viscosity(300.0, 28.0134e-3, 3.798e-10, 71.4)) * 1e6, 2)  # N2, Svehla LJ
    17.68
    """
    t = np.asarray(temperature_K, dtype=float)
    m = np.asarray(molar_mass_kg_mol, dtype=float) / N_A
    sigma = np.asarray(sigma_m, dtype=float)
    om = omega22(t / np.asarray(epsilon_K, dtype=float))
    return (5.0 / 16.0 * np.sqrt(np.pi * m * K_B * t) / (np.pi * sigma**2 * om))[()]


def mean_free_path_viscosity(viscosity_Pa_s, pressure_Pa, temperature_K, molar_mass_kg_mol):
    """Viscosity-based mean free path ``lambda = (mu/p) sqrt(pi k T / (2 m))`` [m].

    The convention used for gas-kinetic Knudsen numbers in vacuum and rarefied-flow work; Jennings
    (1988) uses the same form with a prefactor 1.00252 for air. The hard-sphere form computed with
    the diameter that reproduces ``mu`` is larger by exactly 16/(5 pi) = 1.01859. Valid for a dilute
    gas; the pressure dependence (1/p) is exact at low density.

    Parameters
    ----------
    viscosity_Pa_s, pressure_Pa, temperature_K, molar_mass_kg_mol : float or array_like
        Dynamic viscosity [Pa s], pressure [Pa], temperature [K], molar mass [kg/mol].
    """
    m = np.asarray(molar_mass_kg_mol, dtype=float) / N_A
    return (np.asarray(viscosity_Pa_s) / np.asarray(pressure_Pa)
            * np.sqrt(np.pi * K_B * np.asarray(temperature_K) / (2.0 * m)))[()]


def mean_free_path_hard_sphere(temperature_K, pressure_Pa, diameter_m):
    """Hard-sphere mean free path ``lambda = k T / (sqrt(2) pi d^2 p)`` [m].

    Maxwell's result for a single gas of rigid spheres of diameter ``d`` [CC1970, sec. 5.21];
    with an LJ sigma it is only an order-of-magnitude figure, since sigma is not a hard-sphere
    diameter.
    """
    return (K_B * np.asarray(temperature_K)
            / (np.sqrt(2.0) * np.pi * np.asarray(diameter_m) ** 2 * np.asarray(pressure_Pa)))[()]


def equivalent_diameter(viscosity_Pa_s, temperature_K, molar_mass_kg_mol, pressure_Pa=1.0):
    """Collision diameter that makes the hard-sphere mean free path equal the viscosity-based one.

    From ``k T / (sqrt(2) pi d^2 p) = (mu/p) sqrt(pi k T/(2 m))``:
    ``d^2 = sqrt(k T m) / (pi^1.5 mu)``; independent of pressure. Used to build the mixture form of
    :func:`species_mean_free_paths` so that a pure gas reproduces :func:`mean_free_path_viscosity`.
    """
    del pressure_Pa  # the diameter does not depend on it; kept for call-site symmetry
    m = np.asarray(molar_mass_kg_mol, dtype=float) / N_A
    return np.sqrt(np.sqrt(K_B * np.asarray(temperature_K) * m)
                   / (np.pi**1.5 * np.asarray(viscosity_Pa_s)))[()]


def species_mean_free_paths(mole_fractions, pressure_Pa, temperature_K, molar_masses_kg_mol,
                            viscosities_Pa_s):
    """Mean free path of each species in a gas mixture [m].

    Bird's (1994, eq. 1.34 / 4.76) hard-sphere mixture form
    ``lambda_i = 1 / sum_j (n_j pi d_ij^2 sqrt(1 + m_i/m_j))`` with ``d_ij = (d_i + d_j)/2`` and
    ``n_j = x_j p / (k T)``. The diameters are the viscosity-equivalent ones of
    :func:`equivalent_diameter`, so a pure gas returns exactly its viscosity-based mean free path.
    Valid for a dilute mixture; the hard-sphere cross-section ignores the temperature dependence
    beyond what the viscosity carries.

    Parameters
    ----------
    mole_fractions : array_like, shape (n,)
        Mole fractions, summing to 1 [-].
    pressure_Pa, temperature_K : float
        Total pressure [Pa] and temperature [K].
    molar_masses_kg_mol, viscosities_Pa_s : array_like, shape (n,)
        Molar mass [kg/mol] and pure-gas viscosity at ``temperature_K`` [Pa s] of each species.

    Returns
    -------
    ndarray, shape (n,)
        Mean free path of each species [m].
    """
    x = np.atleast_1d(np.asarray(mole_fractions, dtype=float))
    m = np.atleast_1d(np.asarray(molar_masses_kg_mol, dtype=float))
    d = np.atleast_1d(equivalent_diameter(viscosities_Pa_s, temperature_K, m))
    n = x * pressure_Pa / (K_B * temperature_K)
    d_ij = 0.5 * (d[:, None] + d[None, :])
    rate = (n[None, :] * np.pi * d_ij**2 * np.sqrt(1.0 + m[:, None] / m[None, :])).sum(axis=1)
    return 1.0 / rate


def mixture_viscosity(mole_fractions, molar_masses_kg_mol, viscosities_Pa_s):
    """Viscosity of a dilute gas mixture by Wilke's (1950) mixing rule [Pa s].

    ``mu = sum_i x_i mu_i / sum_j x_j phi_ij`` with
    ``phi_ij = [1 + (mu_i/mu_j)^0.5 (M_j/M_i)^0.25]^2 / [8 (1 + M_i/M_j)]^0.5``
    ([PPO2001] eq. 9-5.13 and 9-5.14). Typical error about 1-2 % for nonpolar mixtures; poorer with
    H2 or He in heavy gases.
    """
    x = np.atleast_1d(np.asarray(mole_fractions, dtype=float))
    m = np.atleast_1d(np.asarray(molar_masses_kg_mol, dtype=float))
    mu = np.atleast_1d(np.asarray(viscosities_Pa_s, dtype=float))
    phi = ((1.0 + np.sqrt(mu[:, None] / mu[None, :]) * (m[None, :] / m[:, None]) ** 0.25) ** 2
           / np.sqrt(8.0 * (1.0 + m[:, None] / m[None, :])))
    return float(np.sum(x * mu / (phi @ x)))
