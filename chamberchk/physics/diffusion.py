"""Gas diffusion: Chapman-Enskog binary and mixture diffusivity, Knudsen diffusion, Bosanquet,
fill times of dead-end features and steady reaction-diffusion with wall loss.

All functions take SI floats or numpy arrays. Molar masses are in kg/mol, Lennard-Jones diameters
in metres, well depths as epsilon/k in kelvin, diffusivities in m2/s. Feature shapes are
``"via"`` (round hole, width = diameter) and ``"trench"`` (long slot, width = gap).

References
----------
.. [PPO2001] B. E. Poling, J. M. Prausnitz, J. P. O'Connell, *The Properties of Gases and
   Liquids*, 5th ed., McGraw-Hill (2001): eq. 11-3.1/11-3.2 (Chapman-Enskog D_AB), eq. 11-3.6
   (Neufeld Omega_D), sec. 11-7 (Blanc's law; the equation number was not verified).
.. [CC1970] S. Chapman, T. G. Cowling, *The Mathematical Theory of Non-Uniform Gases*, 3rd ed.,
   Cambridge University Press (1970), ch. 10 (first approximation to D12).
.. [Blanc1908] A. Blanc, "Recherches sur les mobilites des ions dans les gaz", J. Phys. Theor.
   Appl. 7, 825-839 (1908) (from memory).
.. [Wilke1950] C. R. Wilke, "Diffusional properties of multicomponent gases", Chem. Eng. Prog.
   46, 95-104 (1950) (from memory).
.. [Knudsen1909] M. Knudsen, "Die Gesetze der Molekularstromung ...", Ann. Phys. 333, 75 (1909);
   [Smol1910] M. v. Smoluchowski, Ann. Phys. 338, 1559 (1910): long-tube limit W = 4d/(3L).
.. [Clausing1932] P. Clausing, "Uber die Stromung sehr verdunnter Gase durch Rohren von
   beliebiger Lange", Ann. Phys. 404, 961-989 (1932): transmission probability W.
.. [PP1948] W. G. Pollard, R. D. Present, "On gaseous self-diffusion in long capillary tubes",
   Phys. Rev. 73, 762-774 (1948) (Bosanquet's interpolation 1/D = 1/D_K + 1/D_m).
.. [Crank1975] J. Crank, *The Mathematics of Diffusion*, 2nd ed., Oxford (1975), sec. 4.3.1:
   plane sheet with constant surface concentration, trigonometric series eq. 4.17 and the
   error-function series beside it (equation numbers from memory).
.. [Thiele1939] E. W. Thiele, "Relation between catalytic activity and size of particle",
   Ind. Eng. Chem. 31, 916-920 (1939).
.. [MW1960] H. Motz, H. Wise, "Diffusion and heterogeneous reaction. III. Atom recombination at a
   catalytic boundary", J. Chem. Phys. 32, 1893-1894 (1960): wall loss s/(1 - s/2) (from memory).
.. [CR1990] T. S. Cale, G. B. Raupp, "A unified line-of-sight model of deposition in
   rectangular trenches", J. Vac. Sci. Technol. B 8, 1242-1248 (1990).
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np
from scipy import constants
from scipy.optimize import brentq
from scipy.special import erfc

from .collision import T_STAR_RANGE, omega11

K_B = constants.k
N_A = constants.N_A


def _arr(x):
    """Float array view of a scalar or array_like input."""
    return np.asarray(x, dtype=float)


# ---- validity data (read by the evaluator to raise cautions) --------------------------------
#: Reduced temperatures k T / eps12 over which Omega_D is fitted [PPO2001 eq. 11-3.6].
CHAPMAN_ENSKOG_T_STAR_RANGE = T_STAR_RANGE
#: Dilute-gas limit: D p constant holds to within a few per cent up to about 1 MPa for
#: permanent gases (common practice, from memory); above it a dense-gas correction is needed.
CHAPMAN_ENSKOG_MAX_PRESSURE_PA = 1.0e6
#: Assumptions of the Chapman-Enskog first approximation as used here [PPO2001 sec. 11-3].
CHAPMAN_ENSKOG_ASSUMPTIONS = (
    "dilute gas (binary collisions only)",
    "nonpolar, near-spherical molecules with a Lennard-Jones 12-6 potential; polar gases "
    "(NH3, H2O, HBr, HCl) typically 5-10 % off",
    "first approximation: a few per cent against experiment with good LJ parameters",
)
#: Knudsen diffusion describes free-molecular flow in the feature: Kn = lambda/width above this
#: (the free-molecular bound of DESIGN.md; conventional). Use `bosanquet` below it.
KNUDSEN_DIFFUSION_MIN_KNUDSEN = 10.0
#: Reaction-diffusion in a feature is a 1-D continuum description: reasonable for slender
#: features (depth/width above about 5) and wall sticking below about 0.1 (common practice,
#: from memory); at higher sticking use the ballistic transmission model [CR1990].
REACTION_DIFFUSION_MIN_ASPECT_RATIO = 5.0
REACTION_DIFFUSION_MAX_STICKING = 0.1

#: Wall perimeter per cross-section area is FACTOR / width: 4/d for a round via, 2/w for a
#: long trench (both side walls, per unit length).
PERIMETER_FACTOR = {"via": 4.0, "trench": 2.0}


def perimeter_per_area(shape, width_m):
    """Wall perimeter over cross-section area of a feature, ``P/A`` [1/m].

    ``4/d`` for a round via of diameter ``d`` and ``2/w`` for a long trench of width ``w``
    (end walls neglected).

    Parameters
    ----------
    shape : {"via", "trench"}
    width_m : float or array_like
        Via diameter or trench width [m].
    """
    try:
        factor = PERIMETER_FACTOR[shape]
    except KeyError:
        raise ValueError(f"unknown feature shape {shape!r}; expected one of "
                         f"{sorted(PERIMETER_FACTOR)}") from None
    return (factor / _arr(width_m))[()]


def binary_reduced_temperature(temperature_K, epsilon1_K, epsilon2_K):
    """Reduced temperature of a pair, ``T* = T / sqrt(eps1 eps2)`` [-] (check it against
    ``CHAPMAN_ENSKOG_T_STAR_RANGE``)."""
    return (_arr(temperature_K)
            / np.sqrt(_arr(epsilon1_K) * _arr(epsilon2_K)))[()]


def binary_diffusivity(temperature_K, pressure_Pa, molar_mass1_kg_mol, molar_mass2_kg_mol,
                       sigma1_m, sigma2_m, epsilon1_K, epsilon2_K):
    """Binary diffusion coefficient of a dilute gas pair, Chapman-Enskog first approximation.

    ``D12 = (3/16) sqrt(2 pi (k T)^3 / m12) / (p pi sigma12^2 Omega_D(T*))`` with the reduced
    mass ``m12 = m1 m2/(m1 + m2)``, ``sigma12 = (sigma1 + sigma2)/2``, ``eps12 = sqrt(eps1 eps2)``,
    ``T* = k T/eps12`` and Omega_D the Neufeld et al. (1972) fit ([PPO2001] eq. 11-3.6). This is
    the SI form of [PPO2001] eq. 11-3.2, ``D = 0.00266 T^1.5 / (P M_AB^0.5 sigma^2 Omega_D)``
    (cm2/s, bar, g/mol, Angstrom; ``M_AB = 2/(1/M_A + 1/M_B)``); the exact constant is 0.0026635.

    Validity: dilute gas (``CHAPMAN_ENSKOG_MAX_PRESSURE_PA``), ``T*`` in
    ``CHAPMAN_ENSKOG_T_STAR_RANGE``, nonpolar gases (``CHAPMAN_ENSKOG_ASSUMPTIONS``). Typical
    error against measurement a few per cent with published LJ parameters. Exactly 1/p.
    Self-diffusion: pass the same species twice.

    Parameters
    ----------
    temperature_K : float or array_like
        Temperature [K].
    pressure_Pa : float or array_like
        Total pressure [Pa].
    molar_mass1_kg_mol, molar_mass2_kg_mol : float or array_like
        Molar masses [kg/mol].
    sigma1_m, sigma2_m : float or array_like
        Lennard-Jones collision diameters [m].
    epsilon1_K, epsilon2_K : float or array_like
        Lennard-Jones well depths epsilon/k [K].

    Returns
    -------
    float or ndarray
        D12 [m2/s].

    Examples
    --------
    >>> d = binary_diffusivity(293.15, 101325.0, 39.948e-3, 28.0134e-3,
    ...                        3.542e-10, 3.798e-10, 93.3, 71.4)   # Ar-N2, Svehla parameters
    >>> round(float(d) * 1e4, 4)   # cm2/s; measured 0.190 (Marrero & Mason 1972)
    0.1881
    """
    t = _arr(temperature_K)
    m1 = _arr(molar_mass1_kg_mol) / N_A
    m2 = _arr(molar_mass2_kg_mol) / N_A
    m12 = m1 * m2 / (m1 + m2)
    sigma12 = 0.5 * (_arr(sigma1_m) + _arr(sigma2_m))
    om = omega11(binary_reduced_temperature(t, epsilon1_K, epsilon2_K))
    kt = K_B * t
    d = (3.0 / 16.0) * np.sqrt(2.0 * np.pi * kt**3 / m12) / (
        _arr(pressure_Pa) * np.pi * sigma12**2 * om)
    return d[()]


def mixture_diffusivity_blanc(mole_fractions_others, binary_diffusivities):
    """Diffusivity of species i in a gas mixture by Blanc's law.

    ``D_im = (sum_j x_j) / (sum_j x_j / D_ij)`` over the other species j, i.e.
    ``1/D_im = sum_j x'_j / D_ij`` with the partner fractions renormalised on an i-free basis,
    ``x'_j = x_j / (1 - x_i)`` ([Blanc1908]; [Wilke1950]; [PPO2001] sec. 11-7). Exact for a trace
    species i; for a non-dilute i it is Wilke's stagnant-mixture approximation.

    If species i is the only gas there are no partners: the caller must then pass the species
    itself as its only partner with its self-diffusion coefficient (``binary_diffusivity`` with
    the same parameters twice), which this function returns unchanged. An all-zero partner list
    raises ``ValueError``.

    Parameters
    ----------
    mole_fractions_others : array_like, shape (..., n)
        Mole fractions x_j of the other species (need not sum to 1) [-].
    binary_diffusivities : array_like, shape (..., n)
        Binary diffusivities D_ij of species i with each of them, same pressure [m2/s].

    Returns
    -------
    float or ndarray
        D_im [m2/s].

    Examples
    --------
    >>> float(mixture_diffusivity_blanc([0.5, 0.5], [1.0e-5, 1.0e-5]))
    1e-05
    """
    x = _arr(mole_fractions_others)
    d = _arr(binary_diffusivities)
    total = np.sum(x, axis=-1)
    if np.any(total <= 0.0):
        raise ValueError("no partner species with a positive mole fraction; for a pure gas pass "
                         "the species itself with its self-diffusion coefficient")
    return (total / np.sum(x / d, axis=-1))[()]


def knudsen_diffusivity(transmission_probability, mean_speed_m_s, depth_m):
    """Knudsen diffusivity of a feature from its transmission probability, ``D_K = W v L / 4``.

    Molecular flow through an element of length L joining two reservoirs carries the net flux
    ``W (v/4) (n_1 - n_2)`` per unit opening area; equating it to ``D_K (n_1 - n_2) / L`` defines
    ``D_K``. For a long round tube Clausing's ``W -> 4 d / (3 L)`` (Knudsen/Smoluchowski
    long-tube limit [Knudsen1909], [Smol1910], [Clausing1932]) and this gives ``d v / 3``.
    Valid in free-molecular flow (``KNUDSEN_DIFFUSION_MIN_KNUDSEN``).

    Parameters
    ----------
    transmission_probability : float or array_like
        Clausing transmission probability W of the feature [-].
    mean_speed_m_s : float or array_like
        Mean molecular speed ``sqrt(8 k T / (pi m))`` [m/s].
    depth_m : float or array_like
        Feature depth (length along the transport direction) [m].

    Returns
    -------
    float or ndarray
        D_K [m2/s].
    """
    return (_arr(transmission_probability) * _arr(mean_speed_m_s)
            * _arr(depth_m) / 4.0)[()]


def knudsen_diffusivity_tube(diameter_m, mean_speed_m_s):
    """Knudsen diffusivity of a long round tube, ``D_K = d v / 3`` [m2/s].

    The long-tube limit of ``knudsen_diffusivity`` ([Knudsen1909], [Smol1910]); it overestimates
    the transport of a finite tube (by more than 5 % for L/R < 100, see Clausing's W).

    Parameters
    ----------
    diameter_m : float or array_like
        Tube diameter [m].
    mean_speed_m_s : float or array_like
        Mean molecular speed [m/s].
    """
    return (_arr(diameter_m) * _arr(mean_speed_m_s) / 3.0)[()]


def bosanquet(d_knudsen, d_molecular):
    """Transition-regime diffusivity by Bosanquet's interpolation, ``1/D = 1/D_K + 1/D_m``.

    Resistances of wall collisions and intermolecular collisions in series (attributed to
    Bosanquet by [PP1948]). Tends to D_K when D_m >> D_K (molecular flow) and to D_m when
    D_K >> D_m (continuum). An approximation in the transition regime (about 10 % there).

    Parameters
    ----------
    d_knudsen : float or array_like
        Knudsen diffusivity [m2/s].
    d_molecular : float or array_like
        Molecular (binary or mixture) diffusivity at the step pressure [m2/s].

    Examples
    --------
    >>> float(bosanquet(2.0e-5, 2.0e-5))
    1e-05
    """
    dk = _arr(d_knudsen)
    dm = _arr(d_molecular)
    return (dk * dm / (dk + dm))[()]


def fill_time(depth_m, diffusivity_m2_s):
    """Time constant of the slowest diffusion mode into a dead-end feature, ``4 L^2 / (pi^2 D)``.

    1-D diffusion along a feature of depth L, fixed concentration at the mouth, no flux through
    the closed bottom, initially empty: the same problem as a plane sheet of thickness 2L with
    both faces held at c0 ([Crank1975] sec. 4.3.1, eq. 4.17). The slowest term of the series
    decays as ``exp(-t / tau)`` with this ``tau``. Assumes constant D, a slender feature and a
    mouth concentration held by the chamber (no depletion).

    Parameters
    ----------
    depth_m : float or array_like
        Feature depth L [m].
    diffusivity_m2_s : float or array_like
        Effective diffusivity in the feature [m2/s].

    Returns
    -------
    float or ndarray
        tau [s].
    """
    length = _arr(depth_m)
    return (4.0 * length**2 / (np.pi**2 * _arr(diffusivity_m2_s)))[()]


def _closed_end_fraction(u):
    """c(bottom)/c0 as a function of ``u = D t / L^2`` (scalar); [Crank1975] sec. 4.3.1."""
    if u <= 0.0:
        return 0.0
    n = np.arange(12)
    if u < 0.25:   # error-function series, converges fast at short times
        return float(2.0 * np.sum((-1.0) ** n * erfc((2 * n + 1) / (2.0 * np.sqrt(u)))))
    k = 2 * n + 1  # trigonometric series, converges fast at long times
    return float(1.0 - 4.0 / np.pi * np.sum((-1.0) ** n / k * np.exp(-(k**2) * np.pi**2 * u / 4.0)))


def closed_end_concentration_ratio(depth_m, diffusivity_m2_s, time_s):
    """Concentration at the closed bottom of a dead-end feature over the mouth value [-].

    ``c(L,t)/c0 = 1 - (4/pi) sum_n (-1)^n/(2n+1) exp(-(2n+1)^2 pi^2 D t / (4 L^2))``
    ([Crank1975] sec. 4.3.1, eq. 4.17, at the mid-plane of the equivalent sheet); at short times
    the equivalent error-function series ``2 sum_n (-1)^n erfc((2n+1) L / (2 sqrt(D t)))`` is used.
    Same assumptions as ``fill_time``.

    Parameters
    ----------
    depth_m, diffusivity_m2_s, time_s : float or array_like
        Depth L [m], diffusivity D [m2/s], time since the mouth was filled t [s].
    """
    u = _arr(diffusivity_m2_s) * _arr(time_s) / _arr(
        depth_m) ** 2
    return np.vectorize(_closed_end_fraction, otypes=[float])(u)[()]


@lru_cache(maxsize=64)
def _dimensionless_time_to_fraction(fraction):
    """u = D t / L^2 at which the closed end reaches ``fraction`` of the mouth value."""
    if not 0.0 < fraction < 1.0:
        raise ValueError(f"fraction must lie strictly between 0 and 1, got {fraction!r}")
    lo, hi = 1.0e-3, 1.0
    while _closed_end_fraction(lo) > fraction:
        lo /= 2.0
    while _closed_end_fraction(hi) < fraction:
        hi *= 2.0
    return brentq(lambda u: _closed_end_fraction(u) - fraction, lo, hi, xtol=1e-14, rtol=1e-12)


def fill_time_to_fraction(depth_m, diffusivity_m2_s, fraction=0.99):
    """Time for the closed bottom of a dead-end feature to reach ``fraction`` of the mouth value.

    Inverts ``closed_end_concentration_ratio`` with Brent's method on the dimensionless time
    ``D t / L^2`` (one root per distinct fraction, then scaled), so arrays of depths and
    diffusivities cost one root solve. For 0.99 the result is ``4.85 tau`` with ``tau`` from
    ``fill_time``. Same assumptions as ``fill_time``.

    Parameters
    ----------
    depth_m : float or array_like
        Feature depth L [m].
    diffusivity_m2_s : float or array_like
        Effective diffusivity D [m2/s].
    fraction : float or array_like, optional
        Target c(L)/c0, strictly between 0 and 1 [-]. Default 0.99.

    Returns
    -------
    float or ndarray
        Time [s].
    """
    frac = _arr(fraction)
    uniq, inverse = np.unique(frac, return_inverse=True)
    u = np.array([_dimensionless_time_to_fraction(f) for f in uniq])[inverse].reshape(frac.shape)
    length = _arr(depth_m)
    return (u * length**2 / _arr(diffusivity_m2_s))[()]


def effective_sticking(sticking, sticking_correction=True):
    """Wall loss probability used in the continuum wall-loss rate [-].

    With ``sticking_correction`` the Motz-Wise form ``2 s / (2 - s)`` [MW1960], which accounts
    for the depleted one-way flux towards an absorbing wall; otherwise plain ``s``. The two agree
    to 0.5 % below s = 0.01.
    """
    s = _arr(sticking)
    return (2.0 * s / (2.0 - s) if sticking_correction else s)[()]


def thiele_modulus(depth_m, width_m, shape, diffusivity_m2_s, mean_speed_m_s, sticking,
                   sticking_correction=True):
    """Thiele modulus of wall loss along a feature, ``phi = L sqrt(k_v / D)`` [-].

    Wall consumption per unit wall area ``s_eff n v / 4`` (``effective_sticking``) turns into a
    volumetric first-order rate ``k_v = s_eff (v/4) (P/A)`` with ``P/A`` from
    ``perimeter_per_area`` ([Thiele1939]). For a via with ``D = d v / 3`` and plain s this is
    ``phi = (L/d) sqrt(3 s)``.

    Parameters
    ----------
    depth_m, width_m : float or array_like
        Feature depth L and width (via diameter or trench width) [m].
    shape : {"via", "trench"}
    diffusivity_m2_s : float or array_like
        Effective diffusivity in the feature [m2/s].
    mean_speed_m_s : float or array_like
        Mean molecular speed of the reactant [m/s].
    sticking : float or array_like
        Reaction (sticking) probability on the walls [-].
    sticking_correction : bool, optional
        Use the Motz-Wise correction (default) or plain s.
    """
    k_v = (effective_sticking(sticking, sticking_correction) * _arr(mean_speed_m_s)
           / 4.0 * perimeter_per_area(shape, width_m))
    return (_arr(depth_m) * np.sqrt(k_v / _arr(diffusivity_m2_s)))[()]


def dead_end_density_ratio(thiele, bottom_biot=0.0):
    """Bottom-to-mouth density ratio of steady 1-D reaction-diffusion in a dead-end feature.

    Solves ``D n'' = k_v n`` on ``0 <= x <= L`` with ``n(0) = n0`` and the bottom condition
    ``-D n'(L) = h n(L)``: ``n(L)/n0 = 1 / (cosh phi + (Bi/phi) sinh phi)`` with the bottom Biot
    number ``Bi = h L / D`` (``Bi = 0``: inert bottom, ``1/cosh phi``). Evaluated in an
    overflow-free form; ``phi -> 0`` gives ``1/(1 + Bi)``.

    Parameters
    ----------
    thiele : float or array_like
        Thiele modulus phi [-].
    bottom_biot : float or array_like, optional
        Bottom Biot number h L / D [-]. Default 0 (non-reactive bottom).
    """
    phi = _arr(thiele)
    bi = _arr(bottom_biot)
    e2 = np.exp(-2.0 * phi)
    with np.errstate(invalid="ignore", divide="ignore"):
        sinh_over = np.where(phi > 0.0, -np.expm1(-2.0 * phi) / np.where(phi > 0.0, phi, 1.0), 2.0)
    return (2.0 * np.exp(-phi) / (1.0 + e2 + bi * sinh_over))[()]


def reaction_diffusion_bottom_ratio(depth_m, width_m, shape, diffusivity_m2_s, mean_speed_m_s,
                                    sticking, sticking_correction=True, reactive_bottom=True):
    """Reactant density (and impingement flux) at the bottom of a feature over the mouth value.

    Steady 1-D reaction-diffusion along the feature (``dead_end_density_ratio``) with the
    Thiele modulus of ``thiele_modulus``; a reactive bottom takes ``h = s_eff v / 4`` as a Robin
    condition. In molecular flow the flux striking a surface is ``n v / 4``, so this density
    ratio is also the flux striking the bottom relative to the flux entering the opening, the
    quantity the ballistic model reports as the bottom flux ratio ([CR1990]); with uniform s it
    is the expected step coverage. Limits: s -> 0 gives 1. Validity:
    ``REACTION_DIFFUSION_MIN_ASPECT_RATIO``, ``REACTION_DIFFUSION_MAX_STICKING``.

    Parameters
    ----------
    depth_m, width_m, shape, diffusivity_m2_s, mean_speed_m_s, sticking, sticking_correction
        As for ``thiele_modulus``.
    reactive_bottom : bool, optional
        Whether the bottom consumes reactant with the same sticking (default) or is inert.

    Returns
    -------
    float or ndarray
        n(bottom)/n(mouth) = bottom impingement flux / opening flux [-].

    Examples
    --------
    >>> v = 400.0; d = 100e-9   # AR 10 via, s = 0.01, D = d v/3, plain s, inert bottom
    >>> round(float(reaction_diffusion_bottom_ratio(10 * d, d, "via", d * v / 3, v, 0.01,
    ...       sticking_correction=False, reactive_bottom=False)), 4)
    0.3431
    """
    phi = thiele_modulus(depth_m, width_m, shape, diffusivity_m2_s, mean_speed_m_s, sticking,
                         sticking_correction)
    h = effective_sticking(sticking, sticking_correction) * _arr(mean_speed_m_s) / 4.0
    biot = h * _arr(depth_m) / _arr(diffusivity_m2_s)
    return dead_end_density_ratio(phi, biot if reactive_bottom else 0.0)
