"""Conductance of the pumping path from chamber to pump, in every flow regime.

A path is a list of :class:`PathElement` (tube, aperture, rectangular duct, annulus) in series.
Each element has a free-molecular conductance ``C_mol = W A v/4`` (transmission probability W),
a laminar viscous conductance, and in between Knudsen's semi-empirical blend. Elements combine
by Oatley's rule in molecular flow and by the reciprocal sum in viscous flow (continuously, see
:func:`path_conductance`). Around that: effective pump speed, residence time, sccm and
throughput, the Reynolds number of the path flow, and the lowest chamber pressure the path can
hold at a given flow.

Conductance here is the pV form, ``C = Q / (p_in - p_out)`` with ``Q`` in Pa m3/s, so C is in
m3/s. All functions take SI floats; validity limits are module constants so that the caller can
raise cautions.

Molecular transmission of ducts and annuli
------------------------------------------
No published table covers rectangular ducts or annuli of every length, so W is computed from
Clausing's integral equation [Cla1932] written for a channel of any cross-section: the wall
re-emission rate is taken uniform around each wall family (the two pairs of walls of a
rectangle; the inner and outer cylinder of an annulus) and solved along the axis. The kernels
follow from the cross-section's chord lengths (the projected flights between walls). This is
exact for the tube, the slot and the annulus (by symmetry) and for any cross-section when the
channel is long (the emission rate is then linear along the axis [Smo1910]); for rectangles of
finite length it neglects the variation of the emission rate across a wall. Checks (tests): the
tube table of Clausing/Berman (1e-5 measured), the slot table, Monte Carlo for ducts and annuli
(0.2 %), Smoluchowski's long-duct factors (0.8 %). Tubes themselves use
:func:`chamberchk.physics.transmission.tube_transmission`.

References
----------
.. [Cla1932] P. Clausing, Ann. Phys. (Leipzig) 404, 961 (1932); transl. J. Vac. Sci. Technol. 8,
   636 (1971): the integral equation for the wall emission of a tube.
.. [Smo1910] M. v. Smoluchowski, Ann. Phys. (Leipzig) 338, 1559 (1910): molecular flow through
   long channels of any cross-section (chord-length integral). From memory.
.. [Kn1909] M. Knudsen, Ann. Phys. (Leipzig) 333, 75 (1909): molecular and viscous flow through
   tubes, and the semi-empirical formula between them.
.. [DL1962] S. Dushman, J. M. Lafferty, *Scientific Foundations of Vacuum Technique*, 2nd ed.,
   Wiley (1962), ch. 2: Knudsen's formula with Z = (1 + 2.507 a/lambda)/(1 + 3.095 a/lambda);
   orifice-in-a-duct conductance. Equation forms from memory, not checked in a copy.
.. [Oat1957] C. W. Oatley, Br. J. Appl. Phys. 8, 15 (1957): series combination of transmission
   probabilities, (1-W)/W = sum (1-W_i)/W_i for equal cross-sections. From memory.
.. [Whi2006] F. M. White, *Viscous Fluid Flow*, 3rd ed., McGraw-Hill (2006), sec. 3-3: laminar
   flow in rectangular ducts (series solution) and concentric annuli (Lamb's solution).
.. [Lam1932] H. Lamb, *Hydrodynamics*, 6th ed., Cambridge (1932), sec. 331-332. From memory.
.. [Sha1953] A. H. Shapiro, *The Dynamics and Thermodynamics of Compressible Fluid Flow*,
   Ronald (1953), ch. 4: choked isentropic flow through a nozzle. From memory.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Callable, Sequence

import numpy as np
from numpy.polynomial.legendre import leggauss
from scipy import constants, optimize

from .kinetics import mean_speed
from .transmission import TUBE_LENGTH_OVER_RADIUS_RANGE, slot_transmission, tube_transmission

R = constants.R

SHAPES = ("tube", "aperture", "duct", "annulus")

#: Standard conditions that define the sccm: 0 degC and 101.325 kPa (DESIGN.md).
STANDARD_TEMPERATURE_K = constants.zero_Celsius
STANDARD_PRESSURE_Pa = constants.atm
#: One sccm as a molar flow: p0 * 1 cm3 / (R T0) per minute = 7.4359e-7 mol/s.
MOL_S_PER_SCCM = STANDARD_PRESSURE_Pa * 1e-6 / (R * STANDARD_TEMPERATURE_K) / 60.0
#: One sccm as a pV throughput at 0 degC: 101325 Pa * 1e-6 m3 / 60 s = 1.68875e-3 Pa m3/s.
PA_M3_S_PER_SCCM_AT_0C = STANDARD_PRESSURE_Pa * 1e-6 / 60.0

#: Knudsen's Z = (1 + c1 a/lambda)/(1 + c2 a/lambda), a radius (hydraulic radius here), lambda the
#: viscosity-based mean free path (mu/p) sqrt(pi k T / 2m) [DL1962]; c1 = 2 sqrt(pi/2).
KNUDSEN_Z_COEFFICIENTS = (2.507, 3.095)
#: Knudsen fitted long capillaries; below this L/D_h the formula is used outside its basis
#: (our threshold for "long"; common practice, not from a publication).
KNUDSEN_FORMULA_MIN_LENGTH_OVER_DIAMETER = 10.0
#: Laminar (Poiseuille-type) formulas: Reynolds number on the hydraulic diameter, common practice.
LAMINAR_REYNOLDS_MAX = 2000.0
#: Ratio of an aperture's choked-flow conductance to its molecular one, isentropic nozzle with
#: discharge coefficient 1 and heat-capacity ratio g = 1.4 [Sha1953]:
#: sqrt(2 pi g) (2/(g+1))^((g+1)/(2(g-1))) = 1.716. It is 1.57 for g = 1.1 and 1.82 for g = 5/3;
#: sharp-edged plates pass less (an upper bound).
CHOKED_APERTURE_RATIO = math.sqrt(2 * math.pi * 1.4) * (2 / 2.4) ** (2.4 / 0.8)
#: Knudsen number (on the hydraulic diameter) at which an aperture's conductance is half-way
#: between its molecular and choked values. Our assumption, not fitted to data.
APERTURE_TRANSITION_KNUDSEN = 0.1
#: Weight of Oatley's correction at every junction above which a path is labelled "oatley",
#: below which "reciprocal-sum" (see path_conductance).
PATH_METHOD_WEIGHT_BOUNDS = (0.01, 0.98)
#: Ducts and annuli whose longest chord exceeds this many narrowest gaps and whose length exceeds
#: the direct-solve limit are extrapolated outside the tested range (molecular W less certain).
MOLECULAR_SOLVER_TESTED_CHORD_RATIO = 25.0


# ---------------------------------------------------------------------------------------------
# geometry

_REQUIRED = {"tube": ("diameter_m", "length_m"), "aperture": (),
             "duct": ("width_m", "height_m", "length_m"),
             "annulus": ("outer_diameter_m", "inner_diameter_m", "length_m")}


@dataclass(frozen=True)
class PathElement:
    """One element of the pumping path, SI lengths; fields that do not apply are None.

    ``shape`` is "tube" (diameter, length), "aperture" (thin plate: diameter, or width and
    height; length 0), "duct" (rectangular: width, height, length) or "annulus" (gap between
    concentric cylinders: outer and inner diameter, length).
    """

    shape: str
    diameter_m: float | None = None
    length_m: float | None = None
    width_m: float | None = None
    height_m: float | None = None
    outer_diameter_m: float | None = None
    inner_diameter_m: float | None = None

    def __post_init__(self):
        if self.shape not in SHAPES:
            raise ValueError(f"shape must be one of {SHAPES}, got {self.shape!r}")
        need = _REQUIRED[self.shape]
        if self.shape == "aperture":
            round_, rect = self.diameter_m is not None, None not in (self.width_m, self.height_m)
            if round_ == rect:
                raise ValueError("an aperture needs either diameter_m, or width_m and height_m")
            need = ("diameter_m",) if round_ else ("width_m", "height_m")
            if self.length_m not in (None, 0.0):
                raise ValueError("an aperture is a thin plate: length_m must be None or 0")
        for name in need:
            v = getattr(self, name)
            if v is None or not math.isfinite(v) or v <= 0.0:
                raise ValueError(f"{self.shape}: {name} must be a positive length, got {v!r}")
        if self.shape == "annulus" and self.inner_diameter_m >= self.outer_diameter_m:
            raise ValueError("annulus: inner_diameter_m must be less than outer_diameter_m")

    @property
    def axial_length_m(self) -> float:
        """Length along the flow [m] (0 for an aperture)."""
        return self.length_m or 0.0

    @property
    def _rectangular(self) -> bool:
        return self.shape == "duct" or (self.shape == "aperture" and self.diameter_m is None)

    @property
    def area_m2(self) -> float:
        """Cross-section (entrance) area [m2]."""
        if self._rectangular:
            return self.width_m * self.height_m
        if self.shape == "annulus":
            return math.pi / 4 * (self.outer_diameter_m ** 2 - self.inner_diameter_m ** 2)
        return math.pi / 4 * self.diameter_m ** 2

    @property
    def perimeter_m(self) -> float:
        """Wetted perimeter of the cross-section [m]."""
        if self._rectangular:
            return 2 * (self.width_m + self.height_m)
        if self.shape == "annulus":
            return math.pi * (self.outer_diameter_m + self.inner_diameter_m)
        return math.pi * self.diameter_m

    @property
    def hydraulic_diameter_m(self) -> float:
        """``D_h = 4 A / P`` [m]: the diameter of a round element, 2wh/(w+h) of a rectangle,
        Do - Di of an annulus."""
        return 4 * self.area_m2 / self.perimeter_m

    @property
    def characteristic_length_m(self) -> float:
        """Length for the element's Knudsen number: the hydraulic diameter (so the diameter for
        tubes and round apertures) [m]."""
        return self.hydraulic_diameter_m


# ---------------------------------------------------------------------------------------------
# molecular flow: chord sets of the cross-sections and the generalized Clausing equation

@lru_cache(maxsize=None)
def _legendre(n):
    return leggauss(n)


def _composite(edges, n):
    """Composite n-point Gauss-Legendre rule on consecutive intervals of ``edges``."""
    x, w = _legendre(n)
    edges = np.asarray(edges, dtype=float)
    a, b = edges[:-1, None], edges[1:, None]
    return (0.5 * (b - a) * x + 0.5 * (a + b)).ravel(), (0.5 * (b - a) * w).ravel()


@dataclass(frozen=True)
class _Walls:
    """Wall families of a cross-section: perimeter of each, and for emission from family j the
    chord lengths rho, weights (cos(theta) dtheta/2 averaged over the family, summing to 1) and
    the family each chord ends on."""

    area: float
    perimeters: tuple
    chords: tuple        # per family j: (rho, weight, destination)
    min_gap: float
    max_chord: float


def _circle_walls(d):
    th, w = _composite(np.linspace(0, np.pi / 2, 5), 8)
    return _Walls(np.pi * d * d / 4, (np.pi * d,),
                  ((d * np.cos(th), w * np.cos(th), np.zeros(th.size, int)),), d, d)


def _annulus_walls(do, di):
    b, a = do / 2, di / 2
    phi, wp = _composite(np.linspace(0, np.pi / 2, 5), 8)     # outer wall -> inner cylinder
    s = a / b * np.sin(phi)
    rho_oi, w_oi = b * np.sqrt(1 - s * s) - a * np.cos(phi), a / b * np.cos(phi) * wp
    th, wt = _composite(np.linspace(np.arcsin(a / b), np.pi / 2, 5), 8)  # outer -> outer
    outer = (np.r_[rho_oi, 2 * b * np.cos(th)], np.r_[w_oi, np.cos(th) * wt],
             np.r_[np.ones(phi.size, int), np.zeros(th.size, int)])
    th, wt = _composite(np.linspace(0, np.pi / 2, 5), 8)      # inner -> outer
    inner = (np.sqrt(b * b - (a * np.sin(th)) ** 2) - a * np.cos(th), np.cos(th) * wt,
             np.zeros(th.size, int))
    return _Walls(np.pi * (b * b - a * a), (2 * np.pi * b, 2 * np.pi * a), (outer, inner),
                  b - a, 2 * math.sqrt(b * b - a * a))


def _rect_family(a, b, me, other):
    """Family of two walls of length a facing each other at distance b. Along a wall, d is the
    distance to a side wall; with tan(theta) = sinh(u) the flight ends on the opposite wall for
    u < asinh(d/b), else on a side wall (there with d/tan(theta) = sinh(u')). The fine
    quadrature is then merged into bins of 3 % in rho, per destination."""
    d, wd = _composite(a * np.r_[0.0, np.geomspace(1e-6, 1.0, 19)], 5)
    rho, wt, dest = [], [], []
    for di, wi in zip(d, wd / a):
        for top, scale, to in ((di / b, b, me), (b / di, di, other)):
            umax = np.arcsinh(top)
            u, wu = _composite(np.linspace(0, umax, 2 + int(umax / 0.25)), 4)
            rho += [scale * np.cosh(u)]
            wt += [wi * wu / np.cosh(u) ** 2 * (np.tanh(u) * np.cosh(u) if to == other else 1.0)]
            dest += [np.full(u.size, to)]
    rho, wt, dest = np.concatenate(rho), np.concatenate(wt), np.concatenate(dest)
    out = []
    for to in (me, other):
        r, w = rho[dest == to], wt[dest == to]
        key = np.floor(np.log(r) / 0.03).astype(int)
        keys, inv = np.unique(key, return_inverse=True)
        wsum = np.bincount(inv, w)
        out.append((np.bincount(inv, w * r) / wsum, wsum, np.full(keys.size, to)))
    return tuple(np.concatenate(x) for x in zip(*out))


def _rectangle_walls(w, h):
    return _Walls(w * h, (2 * w, 2 * h), (_rect_family(w, h, 0, 1), _rect_family(h, w, 1, 0)),
                  min(w, h), math.hypot(w, h))


def _escape(rho, wt, z):
    """Fraction of a family's emission whose flight advances beyond axial distance z (one way):
    E[(1/pi)(atan(rho/z) - rho z/(rho^2 + z^2))] (1/2 at z = 0)."""
    z = np.asarray(z, dtype=float)[..., None]
    return (wt * (np.arctan2(rho, z) - rho * z / (rho * rho + z * z))).sum(-1) / np.pi


def _arrival_density(rho, wt, u):
    """Density of next wall hits at axial distance u (one way): E[(2/pi) rho^3/(rho^2+u^2)^2]."""
    u = np.asarray(u, dtype=float)[..., None]
    return (wt * 2 / np.pi * rho ** 3 / (rho * rho + u * u) ** 2).sum(-1)


def _solve(walls: _Walls, L: float) -> float:
    """Nystrom solution on uniform Gauss panels of half the narrowest gap, with the kernel's
    cusp at u = 0 removed by singularity subtraction. Returns W for length L."""
    npan = max(4, math.ceil(L / (0.5 * walls.min_gap)))
    z, q = _composite(np.linspace(0.0, L, npan + 1), 6)
    n, m = z.size, len(walls.perimeters)
    dist, inv = np.unique(np.round(np.abs(z[:, None] - z[None, :]), 12 + int(-math.log10(L))),
                          return_inverse=True)
    M = np.eye(m * n)
    rhs = np.empty(m * n)
    for j, (rho, wt, dest) in enumerate(walls.chords):
        rhs[j * n:(j + 1) * n] = walls.perimeters[j] * _escape(rho, wt, z) / walls.area
        for i in range(m):
            r, w = rho[dest == i], wt[dest == i]
            if r.size == 0:
                continue
            Kq = _arrival_density(r, w, dist)[inv].reshape(n, n) * q[None, :]
            hit = w.sum() - _escape(r, w, z) - _escape(r, w, L - z)   # hits on i inside [0, L]
            block = -Kq
            block[np.diag_indices(n)] += Kq.sum(1) - hit
            M[i * n:(i + 1) * n, j * n:(j + 1) * n] += block
    nu = np.linalg.solve(M, rhs)
    wall_hits = sum(P * (wt * L * np.arctan2(rho, L)).sum()         # entrance -> walls
                    for P, (rho, wt, _) in zip(walls.perimeters, walls.chords))
    direct = 1 - wall_hits / (np.pi * walls.area)
    return float(direct + sum(q @ (nu[j * n:(j + 1) * n] * _escape(rho, wt, L - z))
                              for j, (rho, wt, _) in enumerate(walls.chords)))


def _long_slope(walls: _Walls) -> float:
    """sigma with W -> 1/(sigma L) for long channels: sigma = 4 A / I, I = sum_j P_j 2 E_j[rho^2]
    (Smoluchowski's chord integral; C_long = v I / (16 L))."""
    chord_integral = sum(P * 2 * (wt * rho ** 2).sum()
                         for P, (rho, wt, _) in zip(walls.perimeters, walls.chords))
    return 4 * walls.area / chord_integral


def _direct_limit(walls: _Walls) -> float:
    return min(max(32 * walls.min_gap, 4 * walls.max_chord), 100 * walls.min_gap)


def _transmission_of(walls: _Walls, L: float) -> float:
    """W of a channel: direct solution up to _direct_limit, else the long-channel law
    ``1/W - 1 = sigma L + c0 + c1 ln L`` with c0, c1 from direct solutions at L_max/2, L_max."""
    L_max = _direct_limit(walls)
    if L <= L_max:
        return _solve(walls, L)
    sigma = _long_slope(walls)
    ends = [1 / _solve(walls, x) - 1 - sigma * x for x in (L_max / 2, L_max)]
    c1 = (ends[1] - ends[0]) / math.log(2.0)
    return 1.0 / (1.0 + sigma * L + ends[1] + c1 * math.log(L / L_max))


@lru_cache(maxsize=256)
def _channel_transmission(kind: str, dims: tuple, L: float) -> float:
    if kind == "annulus":
        return _transmission_of(_annulus_walls(*dims), L)
    # Side walls only add resistance: a duct passes at most what the slot of its gap passes
    # (binds for wide ducts not yet in the long-channel regime at the direct-solve limit).
    return min(_transmission_of(_rectangle_walls(*dims), L), slot_transmission(L / min(dims)))


def molecular_transmission(element: PathElement) -> float:
    """Free-molecular transmission probability W of a path element [-].

    Model: aperture W = 1; tube: Clausing's integral equation
    (:func:`~chamberchk.physics.transmission.tube_transmission`); duct and annulus: Clausing's
    equation for the channel's cross-section (module notes), solved directly up to a length of
    32 narrowest gaps or 4 longest chords (at most 100 gaps) and beyond that extended with the
    long-channel law ``1/W - 1 = sigma L + c0 + c1 ln L`` fitted to two direct solutions.

    Parameters
    ----------
    element : PathElement

    Returns
    -------
    float
        W referred to the entrance area, for molecules entering from a large volume with a
        cosine distribution and diffuse walls.

    Notes
    -----
    Validity: free-molecular flow (Kn >> 1), diffuse walls. Ducts: the emission rate is taken
    uniform across each wall (0.2 % from Monte Carlo for w/h <= 5, tests); for a duct whose
    longest chord exceeds ``MOLECULAR_SOLVER_TESTED_CHORD_RATIO`` narrowest gaps and which is
    longer than 100 gaps, the long-channel extension is untested.

    References
    ----------
    [Cla1932], [Smo1910]; module notes.

    Examples
    --------
    >>> round(molecular_transmission(PathElement("aperture", diameter_m=0.05)), 3)
    1.0
    """
    if element.shape == "aperture" or element.axial_length_m == 0.0:
        return 1.0
    if element.shape == "tube":
        return float(tube_transmission(2 * element.axial_length_m / element.diameter_m))
    dims, gap = _channel_dims(element)
    return float(_channel_transmission(element.shape, tuple(x / gap for x in dims),
                                       element.axial_length_m / gap))


def _channel_dims(element):
    """(cross-section dimensions, narrowest gap) of a duct or annulus [m]."""
    if element.shape == "duct":
        return (element.width_m, element.height_m), min(element.width_m, element.height_m)
    return ((element.outer_diameter_m, element.inner_diameter_m),
            (element.outer_diameter_m - element.inner_diameter_m) / 2)


def molecular_transmission_tested(element: PathElement) -> bool:
    """Whether :func:`molecular_transmission` is inside its tested range: tubes up to
    ``TUBE_LENGTH_OVER_RADIUS_RANGE`` of the transmission module; ducts and annuli whose longest
    chord is at most ``MOLECULAR_SOLVER_TESTED_CHORD_RATIO`` narrowest gaps, or which are short
    enough to be solved directly (100 gaps). Apertures always."""
    if element.shape == "aperture":
        return True
    if element.shape == "tube":
        return 2 * element.axial_length_m / element.diameter_m <= TUBE_LENGTH_OVER_RADIUS_RANGE[1]
    dims, gap = _channel_dims(element)
    if element.shape == "duct":
        chord = math.hypot(*dims)
    else:
        chord = 2 * math.sqrt((dims[0] / 2) ** 2 - (dims[1] / 2) ** 2)
    return chord <= MOLECULAR_SOLVER_TESTED_CHORD_RATIO * gap or element.axial_length_m <= 100 * gap


def molecular_conductance(element: PathElement, temperature_K, molar_mass_kg_mol) -> float:
    """Free-molecular conductance ``C = W A v / 4`` [m3/s], ``v = sqrt(8RT/(pi M))``.

    Parameters
    ----------
    element : PathElement
    temperature_K : float
        Gas temperature [K].
    molar_mass_kg_mol : float
        Molar mass [kg/mol].

    Notes
    -----
    Independent of pressure; valid for Kn >> 1 (Kn on the hydraulic diameter). ``v A / 4`` is
    the aperture conductance (11.57 L/(s cm2) for air at 20 degC).

    References
    ----------
    [DL1962] ch. 2; [Cla1932].

    Examples
    --------
    >>> c = molecular_conductance(PathElement("aperture", diameter_m=0.1), 293.15, 28.9586e-3)
    >>> round(c * 1e3, 1)   # L/s
    909.0
    """
    v = mean_speed(temperature_K, molar_mass_kg_mol)
    return float(molecular_transmission(element) * element.area_m2 * v / 4.0)


# ---------------------------------------------------------------------------------------------
# viscous (laminar) flow

def _rect_series(aspect):
    """1 - (192/pi^5)(h/w) sum_{n odd} tanh(n pi w/(2h))/n^5, h/w = aspect <= 1 [Whi2006]."""
    n = np.arange(1, 202, 2, dtype=float)
    return 1.0 - 192.0 / np.pi ** 5 * aspect * np.sum(np.tanh(n * np.pi / (2 * aspect)) / n ** 5)


def viscous_conductance(element: PathElement, mean_pressure_Pa, viscosity_Pa_s,
                        temperature_K=None, molar_mass_kg_mol=None) -> float:
    """Continuum conductance of an element [m3/s]: fully developed laminar flow, or the choked
    limit of an aperture.

    Models (``p`` the mean pressure, ``mu`` the viscosity, ``L`` the length):

    * tube (Poiseuille): ``C = pi d^4 p / (128 mu L)``;
    * duct, sides ``h <= w``: ``C = (w h^3 p / (12 mu L)) [1 - (192 h/(pi^5 w))
      sum_{n odd} tanh(n pi w/(2h))/n^5]`` [Whi2006];
    * annulus, radii ``a < b``: ``C = (pi p/(8 mu L)) [b^4 - a^4 - (b^2-a^2)^2/ln(b/a)]``
      [Lam1932, Whi2006];
    * aperture: the choked (sonic) conductance, ``CHOKED_APERTURE_RATIO`` (1.716) times the
      molecular one: an isentropic nozzle, heat-capacity ratio 1.4, discharge coefficient 1
      [Sha1953]. It needs ``temperature_K`` and ``molar_mass_kg_mol``; it is independent of
      pressure and applies when the downstream pressure is below about half the upstream one.

    Parameters
    ----------
    element : PathElement
    mean_pressure_Pa : float
        Mean of the inlet and outlet pressures [Pa].
    viscosity_Pa_s : float
        Dynamic viscosity [Pa s].
    temperature_K, molar_mass_kg_mol : float, optional
        Needed for apertures only [K], [kg/mol].

    Notes
    -----
    Validity: laminar flow (Reynolds number below ``LAMINAR_REYNOLDS_MAX``, see
    :func:`reynolds_number`), L >> D_h (entrance and exit losses are not included), Kn < 0.01.
    Gas flow: p L-averaged, isothermal, so ``Q = C (p1 - p2)`` holds with C at the mean p.

    References
    ----------
    [Whi2006] sec. 3-3; [Lam1932]; [Sha1953].

    Examples
    --------
    >>> t = PathElement("tube", diameter_m=0.01, length_m=1.0)
    >>> round(viscous_conductance(t, 100.0, 1.8206e-5) * 1e3, 3)   # L/s; 1.348 d^4 p/L, cm and Pa
    1.348
    """
    if element.shape == "aperture":
        if temperature_K is None or molar_mass_kg_mol is None:
            raise ValueError("an aperture's viscous (choked) conductance needs T and M")
        return CHOKED_APERTURE_RATIO * molecular_conductance(element, temperature_K,
                                                             molar_mass_kg_mol)
    return float(_VISCOUS[element.shape](element) * mean_pressure_Pa / viscosity_Pa_s)


def _viscous_tube(e):
    return math.pi * e.diameter_m ** 4 / (128.0 * e.axial_length_m)


def _viscous_duct(e):
    h, w = sorted((e.width_m, e.height_m))
    return w * h ** 3 / (12.0 * e.axial_length_m) * _rect_series(h / w)


def _viscous_annulus(e):
    b, a = e.outer_diameter_m / 2, e.inner_diameter_m / 2
    bracket = b ** 4 - a ** 4 - (b * b - a * a) ** 2 / math.log(b / a)
    return math.pi * bracket / (8.0 * e.axial_length_m)


#: Laminar conductance divided by p/mu for each shape [m3].
_VISCOUS = {"tube": _viscous_tube, "duct": _viscous_duct, "annulus": _viscous_annulus}


# ---------------------------------------------------------------------------------------------
# transition: Knudsen's formula

def knudsen_factor(radius_over_mean_free_path):
    """Knudsen's factor ``Z = (1 + 2.507 x)/(1 + 3.095 x)``, ``x = a / lambda`` [-].

    Z falls from 1 (molecular, x -> 0) to 0.810 (x -> infinity). ``lambda`` must be the
    viscosity-based mean free path ``(mu/p) sqrt(pi k T/(2 m))``, for which the first coefficient
    is ``2 sqrt(pi/2)`` [DL1962] (``KNUDSEN_Z_COEFFICIENTS``).

    Parameters
    ----------
    radius_over_mean_free_path : float or array_like
        ``a / lambda``, with ``a`` the tube radius (half the hydraulic diameter otherwise) [-].

    References
    ----------
    [Kn1909]; [DL1962] ch. 2 (form from memory).

    Examples
    --------
    >>> round(float(knudsen_factor(1.0)), 4)
    0.8564
    """
    c1, c2 = KNUDSEN_Z_COEFFICIENTS
    x = np.asarray(radius_over_mean_free_path, dtype=float)
    return ((1.0 + c1 * x) / (1.0 + c2 * x))[()]


def element_regime_inputs(element: PathElement, mean_free_path_m) -> tuple[float, float]:
    """``(characteristic_length_m, knudsen_number)`` of an element: the hydraulic diameter and
    ``Kn = lambda / D_h``, for the caller's regime classification and cautions."""
    d = element.characteristic_length_m
    return d, float(mean_free_path_m) / d


def _conductance_parts(element, pressure_Pa, temperature_K, molar_mass_kg_mol, viscosity_Pa_s,
                       mean_free_path_m):
    """(conductance, molecular share): the share is Z C_mol / C, and for an aperture the weight
    1/(1 + b) of its molecular end; both go from 1 (molecular) to 0 (continuum)."""
    c_mol = molecular_conductance(element, temperature_K, molar_mass_kg_mol)
    if element.shape == "aperture":
        b = APERTURE_TRANSITION_KNUDSEN / element_regime_inputs(element, mean_free_path_m)[1]
        return c_mol * (1.0 + (CHOKED_APERTURE_RATIO - 1.0) * b / (1.0 + b)), 1.0 / (1.0 + b)
    z = float(knudsen_factor(element.hydraulic_diameter_m / 2 / mean_free_path_m))
    total = viscous_conductance(element, pressure_Pa, viscosity_Pa_s) + z * c_mol
    return total, z * c_mol / total


def element_conductance(element: PathElement, pressure_Pa, temperature_K, molar_mass_kg_mol,
                        viscosity_Pa_s, mean_free_path_m) -> float:
    """Conductance of one element in any regime [m3/s].

    Tube, duct, annulus: Knudsen's semi-empirical formula [Kn1909, DL1962]
    ``C = C_visc(p) + Z(a/lambda) C_mol`` with :func:`viscous_conductance`,
    :func:`knudsen_factor` and :func:`molecular_conductance`; ``a`` is the radius of a tube and,
    by our extension to other shapes, half the hydraulic diameter. Aperture: our documented
    interpolation ``C = C_mol [1 + (r - 1) b/(1 + b)]``, ``b = Kn_half / Kn``,
    ``r = CHOKED_APERTURE_RATIO``, ``Kn_half = APERTURE_TRANSITION_KNUDSEN`` (molecular for
    Kn >> 0.1, choked for Kn << 0.1). Both are continuous in pressure.

    Parameters
    ----------
    element : PathElement
    pressure_Pa : float
        Mean pressure in the element [Pa].
    temperature_K : float
        Gas temperature [K].
    molar_mass_kg_mol : float
        Molar mass [kg/mol].
    viscosity_Pa_s : float
        Dynamic viscosity [Pa s].
    mean_free_path_m : float
        Viscosity-based mean free path at ``pressure_Pa`` [m].

    Notes
    -----
    Validity: Knudsen's formula was obtained on long round capillaries; for L/D_h below
    ``KNUDSEN_FORMULA_MIN_LENGTH_OVER_DIAMETER`` and for non-round shapes it is an extension.
    The viscous part needs laminar flow (:func:`reynolds_number`). The formula has a shallow
    minimum (about 5 % below C_mol at a/lambda = 0.32 for a long tube), Knudsen's minimum.

    References
    ----------
    [Kn1909]; [DL1962] ch. 2.
    """
    return _conductance_parts(element, pressure_Pa, temperature_K, molar_mass_kg_mol,
                              viscosity_Pa_s, mean_free_path_m)[0]


# ---------------------------------------------------------------------------------------------
# series paths

def path_conductance(elements: Sequence[PathElement], pressure_Pa, temperature_K,
                     molar_mass_kg_mol, viscosity_Pa_s, mean_free_path_m) -> tuple[float, str]:
    """Conductance of elements in series, chamber first [m3/s], and the method used.

    Model: ``1/C = sum_i 1/C_i - sum_{i>=2} s_i^2 / C_A(max(A_{i-1}, A_i))`` with ``C_i`` from
    :func:`element_conductance`, ``C_A(A) = A v/4`` the aperture conductance of an area and
    ``s_i`` the smaller molecular share of the two elements at the junction (``Z C_mol / C``;
    for an aperture the weight of its molecular end).

    * Molecular flow (shares -> 1): this is Oatley's rule [Oat1957]
      ``(1-W)/W = sum (1-W_i)/W_i`` for equal areas (the reciprocal sum counts the entrance
      resistance ``1/C_A`` of every element; a molecule leaving one element enters the next
      without it). For unequal areas each element adds its resistance beyond its own entrance,
      ``1/C_i - 1/C_A,i``, and a contraction adds the orifice-in-a-duct resistance
      ``1/C_A,small - 1/C_A,large`` [DL1962]; an expansion adds nothing (exit beaming neglected).
      This extension is commonly attributed to Haefer (1980); from memory.
    * Viscous flow (shares -> 0): the reciprocal sum ``1/C = sum 1/C_i``.
    * In between, the entrance correction is weighted by the squared share (our interpolation,
      not from a publication): C is continuous in pressure, and the correction stays below
      ``s Z W`` of an element's own resistance, so it vanishes in viscous flow (a weight
      linear in s would leave a pressure-independent fraction ``Z W``).

    Parameters
    ----------
    elements : sequence of PathElement
        In flow order, chamber to pump.
    pressure_Pa, temperature_K, molar_mass_kg_mol, viscosity_Pa_s, mean_free_path_m : float
        As in :func:`element_conductance`; every element is evaluated at the same mean pressure.

    Returns
    -------
    (float, str)
        The conductance [m3/s] and the method: "oatley" (every junction weight >= 0.98: Oatley's
        rule to 2 % of its correction; Kn >~ 10), "reciprocal-sum" (every weight <= 0.01;
        Kn <~ 0.01), "oatley-blend" in between, "single-element" for a one-element path
        (bounds in ``PATH_METHOD_WEIGHT_BOUNDS``).

    Notes
    -----
    Oatley's rule itself is approximate: two tubes of L/R = 1 give W = 0.5060 against 0.5142
    for one tube of L/R = 2 (-1.6 %) because the exit of a tube is not cosine-distributed.

    References
    ----------
    [Oat1957]; [DL1962].
    """
    if not elements:
        raise ValueError("a path needs at least one element")
    v4 = mean_speed(temperature_K, molar_mass_kg_mol) / 4.0
    parts = [_conductance_parts(e, pressure_Pa, temperature_K, molar_mass_kg_mol,
                                viscosity_Pa_s, mean_free_path_m) for e in elements]
    resistance = sum(1.0 / c for c, _ in parts)
    weights = [min(parts[i - 1][1], parts[i][1]) ** 2 for i in range(1, len(elements))]
    for i, weight in enumerate(weights, start=1):
        big = max(elements[i - 1].area_m2, elements[i].area_m2)
        resistance -= weight / (big * v4)
    lo, hi = PATH_METHOD_WEIGHT_BOUNDS
    method = ("single-element" if not weights else "oatley" if min(weights) >= hi else
              "reciprocal-sum" if max(weights) <= lo else "oatley-blend")
    return float(1.0 / resistance), method


def path_conductance_function(elements: Sequence[PathElement], temperature_K, molar_mass_kg_mol,
                              viscosity_Pa_s, mean_free_path_m, pressure_Pa
                              ) -> Callable[[float], float]:
    """``C(p)`` [m3/s] of a path for :func:`lowest_pressure`: :func:`path_conductance` with the
    mean free path scaled as ``lambda(p) = lambda(pressure_Pa) pressure_Pa / p`` (ideal gas,
    fixed temperature; viscosity independent of pressure)."""
    lam_p = float(mean_free_path_m) * float(pressure_Pa)

    def conductance(p):
        return path_conductance(elements, p, temperature_K, molar_mass_kg_mol, viscosity_Pa_s,
                                lam_p / p)[0]
    return conductance


# ---------------------------------------------------------------------------------------------
# pump, chamber, flow

def effective_pump_speed(pump_speed_m3_s, conductance_m3_s):
    """Speed at the chamber, ``1/S_eff = 1/S + 1/C`` [m3/s] (pump behind a conductance).

    Exact for a steady throughput through the path; S at the pump inlet, C of the whole path.
    Example (textbook): S = 1000 L/s behind C = 500 L/s gives 333.3 L/s.

    References
    ----------
    [DL1962] ch. 2 (from memory; the relation follows from Q = S p_pump = C (p_ch - p_pump)).
    """
    s, c = np.asarray(pump_speed_m3_s, dtype=float), np.asarray(conductance_m3_s, dtype=float)
    return (s * c / (s + c))[()]


def throttled_pump_speed(throughput_Pa_m3_s, pressure_Pa, effective_speed_m3_s):
    """Pumping speed at the chamber when a throttle valve holds ``pressure_Pa`` [m3/s].

    At steady state the chamber's throughput equals its pressure times the speed it sees,
    ``Q = p S`` (definition of pumping speed; O'Hanlon, *A User's Guide to Vacuum Technology*,
    3rd ed. 2003, ch. 3, from memory). A throttle can only lower the full-open effective speed, so
    ``S = min(Q/p, S_eff)``; when ``Q/p > S_eff`` the pressure cannot be held and the chamber
    sits higher, pumped at ``S_eff``.

    Examples
    --------
    >>> round(float(throttled_pump_speed(0.2, 100.0, 0.5)), 6)   # throttled: Q/p
    0.002
    >>> float(throttled_pump_speed(0.2, 0.1, 0.5))               # unreachable: full open
    0.5
    """
    q, p = np.asarray(throughput_Pa_m3_s, dtype=float), np.asarray(pressure_Pa, dtype=float)
    return np.minimum(q / p, np.asarray(effective_speed_m3_s, dtype=float))[()]


def residence_time(volume_m3, effective_speed_m3_s):
    """Gas residence time ``tau = V / S`` [s] of a well-mixed chamber (the 1/e time of a
    pressure or composition change at constant throughput), with ``S`` the speed the chamber
    actually sees (``throttled_pump_speed``); for a throttled chamber ``tau = p V / Q``."""
    return (np.asarray(volume_m3, dtype=float) / np.asarray(effective_speed_m3_s, dtype=float))[()]


def sccm_to_molar_flow(flow_sccm):
    """Molar flow of a flow in sccm [mol/s]: ``1 sccm = 101325 Pa * 1e-6 m3 / (R * 273.15 K)``
    per minute (standard conditions 0 degC and 101.325 kPa, ``MOL_S_PER_SCCM``)."""
    return (np.asarray(flow_sccm, dtype=float) * MOL_S_PER_SCCM)[()]


def throughput_from_molar_flow(molar_flow_mol_s, temperature_K):
    """pV throughput ``Q = n_dot R T`` [Pa m3/s] of a molar flow at gas temperature T (ideal
    gas). At 273.15 K, 1 sccm gives 1.68875e-3 Pa m3/s."""
    return (np.asarray(molar_flow_mol_s, dtype=float) * R * np.asarray(temperature_K))[()]


def reynolds_number(throughput_Pa_m3_s, element: PathElement, temperature_K, molar_mass_kg_mol,
                    viscosity_Pa_s) -> float:
    """Reynolds number of the flow through an element, on its hydraulic diameter [-].

    ``Re = rho u D_h / mu = m_dot D_h / (mu A)`` with the mass flow ``m_dot = Q M / (R T)``;
    independent of pressure. Laminar-flow formulas need ``Re < LAMINAR_REYNOLDS_MAX`` (2000,
    common practice); above it the viscous conductance is overestimated.
    """
    mass_flow = throughput_Pa_m3_s * molar_mass_kg_mol / (R * temperature_K)
    return float(mass_flow * element.hydraulic_diameter_m / (viscosity_Pa_s * element.area_m2))


def path_reynolds_number(throughput_Pa_m3_s, elements: Sequence[PathElement], temperature_K,
                         molar_mass_kg_mol, viscosity_Pa_s) -> float:
    """Largest :func:`reynolds_number` along the path [-] (caution if > LAMINAR_REYNOLDS_MAX)."""
    return max(reynolds_number(throughput_Pa_m3_s, e, temperature_K, molar_mass_kg_mol,
                               viscosity_Pa_s) for e in elements)


def lowest_pressure(throughput_Pa_m3_s, pump_speed_m3_s,
                    conductance_of_pressure: Callable[[float], float]) -> float:
    """Lowest chamber pressure at which the path carries the flow with the pump at full speed [Pa].

    With the pump taking ``Q`` at speed ``S``, ``p_pump = Q / S``; the path then needs
    ``p_ch - p_pump = Q / C(p_mean)``, ``p_mean = (p_ch + p_pump)/2``, C the pressure-dependent
    path conductance. The root ``p_ch > p_pump`` of
    ``f(p) = p - p_pump - Q / C((p + p_pump)/2)`` is bracketed from ``p_pump`` upward (the step
    doubles until f > 0, the lower end follows the last f < 0) and found with
    ``scipy.optimize.brentq`` to a relative 1e-10. A chamber pressure set below this value
    cannot be held at this flow (the throttle valve would have to open beyond fully open).

    Parameters
    ----------
    throughput_Pa_m3_s : float
        Total pV throughput [Pa m3/s], >= 0.
    pump_speed_m3_s : float
        Pump speed at its inlet [m3/s], > 0; taken independent of pressure.
    conductance_of_pressure : callable
        ``C(p_mean)`` of the whole path [m3/s], e.g. :func:`path_conductance_function`.

    Notes
    -----
    Molecular-only path (C constant): ``p_ch = Q (1/S + 1/C)`` = Q / S_eff. Poiseuille-only
    path (``C = K p``): ``p_ch = sqrt(p_pump^2 + 2 Q / K)``. If C dips with pressure (Knudsen's
    minimum, about 5 %) there may be more than one root in rare cases; the bracket starts at
    p_pump so the lowest one found is returned.
    """
    q, s = float(throughput_Pa_m3_s), float(pump_speed_m3_s)
    if q < 0 or not s > 0:
        raise ValueError("need throughput >= 0 and pump speed > 0")
    if q == 0.0:
        return 0.0
    p_pump = q / s

    def f(p):
        return p - p_pump - q / conductance_of_pressure(0.5 * (p + p_pump))

    lo, step = p_pump, q / conductance_of_pressure(p_pump)
    hi = lo + step
    for _ in range(200):
        if f(hi) > 0:
            break
        lo, step = hi, 2 * step
        hi = lo + step
    else:
        raise RuntimeError("lowest_pressure: no bracket found (conductance decreasing?)")
    return float(optimize.brentq(f, lo, hi, rtol=1e-10, xtol=1e-300))
