"""Plasma sheath kernels for etch steps: Debye length, Bohm flux, sheath thickness, ion
collisionality in the sheath, ion angular spread and the share of ions reaching a feature bottom.

Conventions: electron temperature ``Te`` and ion temperature ``Ti`` are given in volts (eV per
unit charge), the sheath voltage ``V0`` is the potential drop from the sheath edge to the wafer
[V], densities are number densities [m^-3]. Constants come from ``scipy.constants`` (CODATA).

Section and equation numbers of Lieberman & Lichtenberg (2005) are quoted **from memory** (no
copy of the book was found with the search tool); the formulas themselves were re-derived and
are checked numerically in the tests (both Child laws by integrating Poisson's equation).

References
----------
.. [LL2005] M. A. Lieberman, A. J. Lichtenberg, *Principles of Plasma Discharges and Materials
   Processing*, 2nd ed., Wiley (2005): Debye length ch. 2; Bohm criterion and presheath
   density drop ch. 6 (sec. 6.2); Child law sheath ch. 6 (sec. 6.3, eqs. about 6.3.12-6.3.14);
   collisional (mobility-limited) Child law ch. 6; argon ion mean free path
   ``lambda_i[cm] = 1/(330 p[Torr])``. All locations from memory, not verified.
.. [DV1963] W. D. Davis, T. A. Vanderslice, "Ion energies at the cathode of a glow discharge",
   Phys. Rev. 131, 219-228 (1963) (charge-exchange energy distribution; from memory).
.. [GJV1992] R. A. Gottscho, C. W. Jurgensen, D. J. Vitkavage, "Microscopic uniformity in plasma
   etching", J. Vac. Sci. Technol. B 10, 2133-2147 (1992) (ion shadowing; from memory).
"""

from __future__ import annotations

import math

import numpy as np
from scipy import constants as _c
from scipy import special as _sp

_E = _c.e
_EPS0 = _c.epsilon_0

#: Sheath-edge to bulk density ratio from a Boltzmann presheath drop of Te/2: exp(-1/2) ~ 0.61
#: [LL2005 sec. 6.2]. Pass it as ``presheath_density_ratio`` when you know the *bulk* density.
PRESHEATH_DENSITY_RATIO = math.exp(-0.5)

#: Upper s/lambda_i bounds of the "collisionless" and "transitional" sheath regimes (common
#: practice): below 0.1 more than 90 % of ions cross without a collision (exp(-0.1) = 0.905); at
#: s/lambda_i >= 1 most ions collide and the mobility-limited law becomes the better model.
COLLISIONALITY_BOUNDS = (0.1, 1.0)
COLLISIONALITY_REGIMES = ("collisionless", "transitional", "collisional")
#: s/lambda_i at which the evaluator should flag a collisional sheath (reference-values G7-04).
COLLISIONAL_FLAG_RATIO = 1.0

#: Ion temperature assumed when none is given: ions and neutrals near room temperature, 300 K
#: (common practice for low-pressure processing plasmas) [V].
DEFAULT_ION_TEMPERATURE_EV = _c.k * 300.0 / _E

#: Validity ranges per kernel, as data: quantity name -> (low, high), inclusive. The quantities
#: are dimensionless groups that the caller computes (see ``validity_cautions``).
#: - voltage_ratio V0/Te >= 10: Child-law sheaths need V0 >> Te (common practice).
#: - ion_to_electron_temperature Ti/Te <= 0.1: Bohm speed for cold ions (common practice).
#: - collisionality s/lambda_i: see COLLISIONALITY_BOUNDS; the angular-spread estimate is kept to
#:   s/lambda_i <= 30 where its quadrature is checked (tests).
#: - angular_spread_rad <= pi/4: the equivalent-Gaussian slope model is only meant for beams.
VALIDITY = {
    "bohm_speed": {"ion_to_electron_temperature": (0.0, 0.1)},
    "child_law_sheath_thickness": {"voltage_ratio": (10.0, math.inf),
                                   "collisionality": (0.0, COLLISIONAL_FLAG_RATIO)},
    "collisional_sheath_thickness": {"voltage_ratio": (10.0, math.inf),
                                     "collisionality": (COLLISIONAL_FLAG_RATIO, math.inf)},
    "ion_angular_spread": {"collisionality": (0.0, 30.0), "voltage_ratio": (10.0, math.inf)},
    "ion_bottom_fraction": {"angular_spread_rad": (0.0, math.pi / 4),
                            "aspect_ratio": (0.0, math.inf)},
}


def _out(x):
    """0-d arrays become floats; arrays stay arrays."""
    x = np.asarray(x, dtype=float)
    return x if x.ndim else float(x)


def validity_cautions(model: str, **quantities) -> list[str]:
    """Messages for each quantity outside ``VALIDITY[model]``; empty when all are inside.

    >>> validity_cautions("child_law_sheath_thickness", voltage_ratio=5.0)
    ['child_law_sheath_thickness: voltage_ratio = 5 is outside [10, inf]']
    """
    out = []
    for name, value in quantities.items():
        lo, hi = VALIDITY[model][name]
        v = np.asarray(value, dtype=float)
        bad = v[(v < lo) | (v > hi)]
        if bad.size:
            out.append(f"{model}: {name} = {bad.flat[0]:g} is outside [{lo:g}, {hi:g}]")
    return out


def debye_length(electron_density_m3, electron_temperature_eV):
    """Electron Debye length ``lambda_De = sqrt(eps0 Te / (e n))`` [m].

    Parameters
    ----------
    electron_density_m3 : float or array_like
        Electron density [m^-3] (use the sheath-edge density for sheath formulas).
    electron_temperature_eV : float or array_like
        Electron temperature [V].

    Returns
    -------
    float or ndarray
        Debye length [m]. Valid for Maxwellian electrons; no range limit of its own.

    References
    ----------
    [LL2005] ch. 2 (location from memory).

    Examples
    --------
    >>> round(debye_length(1e16, 3.0) * 1e3, 4)
    0.1288
    """
    n = np.asarray(electron_density_m3, dtype=float)
    te = np.asarray(electron_temperature_eV, dtype=float)
    return _out(np.sqrt(_EPS0 * te / (_E * n)))


def bohm_speed(electron_temperature_eV, ion_mass_kg):
    """Bohm speed ``u_B = sqrt(e Te / M)`` [m/s], the ion speed at the sheath edge.

    Parameters
    ----------
    electron_temperature_eV : float or array_like
        Electron temperature [V].
    ion_mass_kg : float or array_like
        Ion mass [kg].

    Returns
    -------
    float or ndarray
        Bohm speed [m/s]. Valid for cold ions, Ti/Te <= 0.1 (``VALIDITY``); singly charged ions,
        no negative ions.

    References
    ----------
    [LL2005] sec. 6.2, Bohm sheath criterion (equation number from memory).

    Examples
    --------
    >>> round(bohm_speed(3.0, 39.948 * 1.66053906892e-27), 1)
    2691.8
    """
    te = np.asarray(electron_temperature_eV, dtype=float)
    return _out(np.sqrt(_E * te / np.asarray(ion_mass_kg, dtype=float)))


def ion_flux(edge_density_m3, electron_temperature_eV, ion_mass_kg, presheath_density_ratio=1.0):
    """Ion flux into the sheath ``Gamma = h n u_B`` [m^-2 s^-1].

    ``h`` is ``presheath_density_ratio``: leave it at 1 when ``edge_density_m3`` is the density at
    the sheath edge; pass ``PRESHEATH_DENSITY_RATIO`` (exp(-1/2) ~ 0.61) when you give the bulk
    density just outside the presheath of a low-pressure plasma.

    Parameters
    ----------
    edge_density_m3 : float or array_like
        Ion density at the sheath edge, or bulk density with ``presheath_density_ratio`` [m^-3].
    electron_temperature_eV : float or array_like
        Electron temperature [V].
    ion_mass_kg : float or array_like
        Ion mass [kg].
    presheath_density_ratio : float, optional
        n_s / n_given [-], default 1.

    Returns
    -------
    float or ndarray
        Ion flux [m^-2 s^-1]; validity as ``bohm_speed``.

    References
    ----------
    [LL2005] sec. 6.2, flux ``n_s u_B`` and ``n_s/n_0 ~ 0.61`` (from memory).
    """
    n = np.asarray(edge_density_m3, dtype=float) * presheath_density_ratio
    return _out(n * bohm_speed(electron_temperature_eV, ion_mass_kg))


def child_law_sheath_thickness(edge_density_m3, electron_temperature_eV, sheath_voltage_V):
    """Collisionless Child-law sheath thickness ``s = (sqrt(2)/3) lambda_De (2 V0/Te)^(3/4)`` [m].

    Follows from the Child law ``J = (4/9) eps0 sqrt(2e/M) V0^(3/2) / s^2`` with the Bohm current
    ``J = e n_s u_B``; the ion mass cancels.

    Parameters
    ----------
    edge_density_m3 : float or array_like
        Ion density at the sheath edge n_s [m^-3].
    electron_temperature_eV : float or array_like
        Electron temperature [V].
    sheath_voltage_V : float or array_like
        Sheath voltage V0 (time-averaged for an RF sheath) [V].

    Returns
    -------
    float or ndarray
        Sheath thickness [m]. Valid for V0/Te >= 10 and s/lambda_i < 1 (``VALIDITY``).

    References
    ----------
    [LL2005] sec. 6.3, Child law and sheath thickness (equation numbers about 6.3.12 and 6.3.14,
    from memory).

    Examples
    --------
    >>> round(child_law_sheath_thickness(1e16, 3.0, 100.0) * 1e3, 3)
    1.416
    """
    te = np.asarray(electron_temperature_eV, dtype=float)
    v0 = np.asarray(sheath_voltage_V, dtype=float)
    lam = debye_length(edge_density_m3, te)
    return _out(math.sqrt(2.0) / 3.0 * lam * (2.0 * v0 / te) ** 0.75)


def collisional_sheath_thickness(edge_density_m3, electron_temperature_eV, sheath_voltage_V,
                                 ion_mfp_m):
    """Mobility-limited (collisional) Child-law sheath thickness [m].

    The collisional Child law ``J = (2/3)(5/3)^(3/2) eps0 (2 e lambda_i/(pi M))^(1/2)
    V0^(3/2) / s^(5/2)`` (ion drift ``u = sqrt(2 e lambda_i E / (pi M))``, constant ion mean free
    path) set equal to ``J = e n_s u_B`` gives, with the ion mass cancelling,
    ``s^(5/2) = (2/3)(5/3)^(3/2) lambda_De^2 (2 lambda_i/(pi Te))^(1/2) V0^(3/2) / Te``,
    so ``s ~ V0^(3/5)``.

    Parameters
    ----------
    edge_density_m3 : float or array_like
        Ion density at the sheath edge n_s [m^-3].
    electron_temperature_eV : float or array_like
        Electron temperature [V].
    sheath_voltage_V : float or array_like
        Sheath voltage V0 [V].
    ion_mfp_m : float or array_like
        Ion-neutral mean free path lambda_i [m] (``ion_neutral_mean_free_path``).

    Returns
    -------
    float or ndarray
        Sheath thickness [m]. Valid for s/lambda_i >= 1 (better >> 1) and V0/Te >= 10.

    References
    ----------
    [LL2005] ch. 6, collisional sheath, variable-mobility Child law (location from memory);
    reference-values G7-04.
    """
    te = np.asarray(electron_temperature_eV, dtype=float)
    v0 = np.asarray(sheath_voltage_V, dtype=float)
    lam_de = debye_length(edge_density_m3, te)
    coef = (2.0 / 3.0) * (5.0 / 3.0) ** 1.5
    s52 = coef * lam_de**2 * np.sqrt(2.0 * np.asarray(ion_mfp_m, dtype=float) / (np.pi * te)) \
        * v0**1.5 / te
    return _out(s52**0.4)


def ion_neutral_mean_free_path(cross_section_m2, gas_density_m3=None, *, pressure_Pa=None,
                               temperature_K=None):
    """Ion-neutral mean free path ``lambda_i = 1 / (n_g sigma)`` [m].

    Give either ``gas_density_m3`` or ``pressure_Pa`` with ``temperature_K`` (ideal gas,
    ``n_g = p / (k T)``). Neutrals are taken at rest (ions much faster than neutrals).

    Parameters
    ----------
    cross_section_m2 : float or array_like
        Total ion-neutral cross section [m^2] (``data/ion_cross_sections.toml``).
    gas_density_m3 : float or array_like, optional
        Neutral gas density [m^-3].
    pressure_Pa, temperature_K : float or array_like, optional
        Gas pressure [Pa] and temperature [K], used when no density is given.

    Returns
    -------
    float or ndarray
        Mean free path [m].

    References
    ----------
    [LL2005] ch. 3 (definition ``lambda = 1/(n sigma)``; location from memory).

    Examples
    --------
    >>> round(ion_neutral_mean_free_path(1e-18, pressure_Pa=0.133322, temperature_K=300) * 1e3, 1)
    31.1
    """
    if (gas_density_m3 is None) == (pressure_Pa is None or temperature_K is None):
        raise ValueError("give gas_density_m3, or pressure_Pa together with temperature_K")
    if gas_density_m3 is None:
        gas_density_m3 = np.asarray(pressure_Pa, dtype=float) / (
            _c.k * np.asarray(temperature_K, dtype=float))
    n = np.asarray(gas_density_m3, dtype=float)
    return _out(1.0 / (n * np.asarray(cross_section_m2, dtype=float)))


def argon_ion_mfp_rule(pressure_Pa):
    """Lieberman & Lichtenberg's argon rule ``lambda_i[cm] = 1/(330 p[Torr])``, in SI [m].

    A room-temperature rule of thumb; it corresponds to sigma = 1.025e-18 m^2 at 300 K.

    References
    ----------
    [LL2005] argon ion mean free path rule (location and constant from memory); reference-values
    G7-03.

    Examples
    --------
    >>> round(argon_ion_mfp_rule(0.133322368) * 1e3, 1)
    30.3
    """
    p_torr = np.asarray(pressure_Pa, dtype=float) / _c.torr
    return _out(1e-2 / (330.0 * p_torr))


def collisionality(sheath_thickness_m, ion_mfp_m):
    """Sheath collisionality ``s / lambda_i`` [-]; ``exp(-s/lambda_i)`` of ions cross unscattered.

    >>> collisionality(1.416e-3, 3.03e-3) < COLLISIONAL_FLAG_RATIO
    True
    """
    return _out(np.asarray(sheath_thickness_m, dtype=float) / np.asarray(ion_mfp_m, dtype=float))


def collisionality_regime(collisionality_ratio, bounds=COLLISIONALITY_BOUNDS):
    """Regime name(s) from ``COLLISIONALITY_REGIMES`` for s/lambda_i; a bound belongs to the
    more collisional regime. Bounds are common practice (see ``COLLISIONALITY_BOUNDS``).

    >>> collisionality_regime(0.05), collisionality_regime(0.1), collisionality_regime(4.4)
    ('collisionless', 'transitional', 'collisional')
    """
    idx = np.searchsorted(np.asarray(bounds, dtype=float),
                          np.asarray(collisionality_ratio, dtype=float), side="right")
    if np.ndim(idx) == 0:
        return COLLISIONALITY_REGIMES[int(idx)]
    return [COLLISIONALITY_REGIMES[int(i)] for i in np.ravel(idx)]


# Gauss-Legendre nodes on [0, 1] for the charge-exchange average (smooth integrands, see below).
_GL_X, _GL_W = np.polynomial.legendre.leggauss(64)
_GL_X, _GL_W = 0.5 * (_GL_X + 1.0), 0.5 * _GL_W


def _cx_mean_tan2(r, v0, ti):
    """Mean tan^2 of ions whose last charge exchange was inside the sheath (weight 1 - e^-r).

    Last-collision position y = x/s has density ``r exp(-r (1 - y))``; an ion born there at rest
    falls through ``V0 (1 - y^(4/3))`` (Child profile) and keeps the neutral's thermal velocity:
    ``tan^2 = Ti / (V0 eps + Ti/2)`` with ``eps = 1 - y^(4/3)``. The range eps in [0, 1/2] is
    integrated in ``u = ln(1 + eps/delta)``, delta = Ti/(2 V0), which flattens the near-wall peak;
    eps in [1/2, 1] in y, which removes the (1 - eps)^(-1/4) end singularity.
    """
    r, v0, ti = (np.asarray(a, dtype=float)[..., None] for a in (r, v0, ti))
    delta = ti / (2.0 * v0)
    u = _GL_X * np.log1p(0.5 / delta)                       # eps from 0 to 1/2
    eps = delta * np.expm1(u)
    dens = 0.75 * r * (1.0 - eps) ** -0.25 * np.exp(-r * (1.0 - (1.0 - eps) ** 0.75))
    near = np.sum(_GL_W * (ti / v0) * np.log1p(0.5 / delta) * dens, axis=-1)
    y_hi = 0.5**0.75                                        # eps = 1/2
    y = _GL_X * y_hi                                        # eps from 1 to 1/2
    far_int = r * np.exp(-r * (1.0 - y)) * ti / (v0 * (1.0 - y ** (4.0 / 3.0)) + ti / 2.0)
    far = y_hi * np.sum(_GL_W * far_int, axis=-1)
    return near + far


def ion_angular_spread(collisionality_ratio, sheath_voltage_V, electron_temperature_eV,
                       ion_temperature_eV=DEFAULT_ION_TEMPERATURE_EV):
    """Estimated rms-slope angle of ions at the wafer, ``atan(sqrt(<tan^2 theta>))`` [rad].

    **An estimate, labelled as such.** Two populations:

    * ions crossing without collision (share ``exp(-s/lambda_i)``): transverse Maxwellian at
      ``Ti``, normal energy ``e (V0 + Te/2)`` (Bohm entry energy), so ``tan^2 = Ti/(V0 + Te/2)``;
      for ``Ti << V0`` this is the familiar collisionless estimate ``atan(sqrt(kTi/(e V0)))``;
    * ions made by symmetric charge exchange inside the sheath, born at rest with the neutral's
      thermal velocity (temperature taken equal to ``Ti``) at a place distributed as in Davis &
      Vanderslice (1963) (constant mean free path, Child potential profile ``~ x^(4/3)``); they
      reach the wafer with the remaining potential only, hence at wider angles.

    Elastic (non-charge-exchange) scattering is ignored, so the spread is underestimated where
    it matters (Ar+/Ar: isotropic elastic is 36, 21 and 2.5 % of the total at 1, 10 and
    100 eV, Phelps 1994 fits in ``data/ion_cross_sections.toml``).

    Parameters
    ----------
    collisionality_ratio : float or array_like
        s / lambda_i [-] (``collisionality``).
    sheath_voltage_V : float or array_like
        Sheath voltage V0 [V].
    electron_temperature_eV : float or array_like
        Electron temperature [V].
    ion_temperature_eV : float or array_like, optional
        Ion (and neutral) temperature [V]; default 300 K (``DEFAULT_ION_TEMPERATURE_EV``).

    Returns
    -------
    float or ndarray
        Angular spread [rad]. Valid for s/lambda_i <= 30 and V0/Te >= 10 (``VALIDITY``).

    References
    ----------
    [DV1963] energy distribution of charge-exchange ions; [LL2005] sec. 6.3 Child profile.
    The combination with thermal transverse velocities is this module's own estimate.

    Examples
    --------
    >>> round(math.degrees(ion_angular_spread(0.0, 100.0, 3.0, 0.0258)), 2)
    0.91
    """
    r = np.asarray(collisionality_ratio, dtype=float)
    v0 = np.asarray(sheath_voltage_V, dtype=float)
    te = np.asarray(electron_temperature_eV, dtype=float)
    ti = np.asarray(ion_temperature_eV, dtype=float)
    tan2 = np.exp(-r) * ti / (v0 + 0.5 * te) + _cx_mean_tan2(r, v0, ti)
    return _out(np.arctan(np.sqrt(tan2)))


def _trench_bottom_fraction(c):
    """E[(1 - q)+] for q = |t_x| AR half-normal with scale c: erf(1/k) - k/sqrt(pi) (1 - e^-1/k^2),
    k = c sqrt(2)."""
    k = np.sqrt(2.0) * c
    with np.errstate(divide="ignore"):
        z = np.where(k > 0, 1.0 / np.where(k > 0, k, 1.0), np.inf)
    tail = np.where(k > 0, k / np.sqrt(np.pi) * -np.expm1(-(z**2)), 0.0)
    return _sp.erf(z) - tail


def _via_bottom_fraction(c):
    """E[lens(q)] for q = |t| AR Rayleigh with scale c, lens = overlap of two unit discs at
    distance 2q over pi: 1 - e^-x (I0(x) + I1(x)), x = 1/(4 c^2)."""
    with np.errstate(divide="ignore"):
        x = np.where(c > 0, 1.0 / (4.0 * np.where(c > 0, c, 1.0) ** 2), np.inf)
    big = np.isinf(x)
    xs = np.where(big, 1.0, x)
    return np.where(big, 1.0, 1.0 - _sp.i0e(xs) - _sp.i1e(xs))


#: Feature shapes and their bottom-fraction kernels (aspect ratio = depth / width or diameter).
_BOTTOM_FRACTION = {"trench": _trench_bottom_fraction, "via": _via_bottom_fraction}


def ion_bottom_fraction(aspect_ratio, angular_spread_rad, shape="trench"):
    """Share of the ion flux entering a feature that reaches its bottom without touching a wall.

    Model (line-of-sight ion shadowing, [GJV1992]; closed forms derived here): ions travel in
    straight lines (no field inside the feature, no charging, no wall reflection); they enter
    uniformly over the opening; transverse velocity components are Gaussian and the normal
    velocity is one value, so each transverse slope ``t_x = v_x / v_z`` is normal with standard
    deviation ``a = tan(theta_s)/sqrt(2)`` where ``theta_s`` is the rms-slope angle returned by
    ``ion_angular_spread`` (``<tan^2 theta> = 2 a^2``). An ion reaches the bottom when its landing
    point lies inside the bottom outline (straight walls, convex opening). With ``c = a AR``:

    * trench (infinitely long slot, AR = depth/width): ``F = erf(1/k) - (k/sqrt(pi))
      (1 - exp(-1/k^2))``, ``k = c sqrt(2)``;
    * via (round hole, AR = depth/diameter): ``F = 1 - exp(-x) (I0(x) + I1(x))``, ``x = 1/(4c^2)``.

    Limits: F -> 1 for zero spread or zero depth; F -> 0 as AR -> infinity; for small c,
    ``F ~ 1 - c sqrt(2/pi)`` (trench) and ``1 - c sqrt(8/pi)`` (via).

    Parameters
    ----------
    aspect_ratio : float or array_like
        Depth / width (trench) or depth / diameter (via) [-].
    angular_spread_rad : float or array_like
        rms-slope angle of the ions [rad].
    shape : {"trench", "via"}
        Feature shape.

    Returns
    -------
    float or ndarray
        Fraction of the entering ion flux that reaches the bottom directly [-]. Valid for
        spreads up to pi/4 (``VALIDITY``).

    References
    ----------
    [GJV1992] ion shadowing as a cause of aspect-ratio-dependent etching (from memory).

    Examples
    --------
    >>> round(ion_bottom_fraction(10.0, 0.0), 6), round(ion_bottom_fraction(10.0, 0.02, "via"), 3)
    (1.0, 0.777)
    """
    try:
        kernel = _BOTTOM_FRACTION[shape]
    except KeyError:
        raise ValueError(f"shape must be one of {sorted(_BOTTOM_FRACTION)}, got {shape!r}") from None
    a = np.tan(np.asarray(angular_spread_rad, dtype=float)) / math.sqrt(2.0)
    c = a * np.asarray(aspect_ratio, dtype=float)
    return _out(kernel(c))
