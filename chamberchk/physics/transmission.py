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
from scipy import sparse

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
#: Largest depth/top width the radiosity solver (tapered features, bottom flux ratio) accepts;
#: beyond it a ValueError is raised (straight open features have no such limit).
SOLVER_ASPECT_RATIO_LIMIT = 1000.0
#: Sticking (reaction) probability per wall or bottom collision.
STICKING_RANGE = (0.0, 1.0)

_GAUSS = {n: np.polynomial.legendre.leggauss(n) for n in (1, 2, 4)}


# --------------------------------------------------------------------------------------------
# Clausing tube and slot: closed-form kernel moments for product integration.
# --------------------------------------------------------------------------------------------

@dataclass(frozen=True)
class _Kernel1D:
    """Translation-invariant wall problem (all lengths in units of ``scale``-sized radius).

    ``p0(u) = int_0^u K(|t|) dt`` and ``p1(u) = int_0^u t K(|t|) dt`` (wall-to-wall kernel),
    ``q0(y), q1(y)`` the same moments of the wall-to-exit view factor ``f(y)``, ``source(x)``
    the opening-to-wall density, ``direct(L)`` the opening-to-exit view factor and
    ``walls`` the number of walls that carry the same density. Lengths in units of the tube
    radius or the slot gap.
    """
    p0: Callable
    p1: Callable
    source: Callable
    q0: Callable
    q1: Callable
    direct: Callable
    walls: int
    h_first: float          # mesh: first spacing at both ends,
    ratio: float            # growth ratio,
    h_cap: Callable         # and largest spacing as a function of L (chosen by convergence scans)
    beyond: Callable        # (L, L0, W0) -> W for L > L0 from the solution W0 at L0


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
    walls=1, h_first=0.2, ratio=1.05, h_cap=lambda L: 4.0,
    beyond=lambda L, L0, W0: 1.0 / (1.0 / W0 + 0.375 * (L - L0)))     # 1/W = 3L/8R + C

_SLOT = _Kernel1D(
    p0=lambda u: 0.5 * u / np.sqrt(1.0 + u * u),
    p1=lambda u: 0.5 * (1.0 - 1.0 / np.sqrt(1.0 + u * u)),
    source=_strip_to_exit,
    q0=lambda y: 0.5 * (1.0 - 1.0 / (y + np.sqrt(1.0 + y * y))),
    q1=lambda y: 0.25 * (np.arcsinh(y) - y / (y + np.sqrt(1.0 + y * y))),
    direct=lambda L: 1.0 / (math.sqrt(1.0 + L * L) + L),
    walls=2, h_first=0.2, ratio=1.05, h_cap=lambda L: 1.0 + L / 300.0,
    beyond=lambda L, L0, W0: (math.log(L / L0) + W0 * L0) / L)       # W = (ln L + c) / L


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


#: Beyond this length (tube L/R, slot L/h) W is extrapolated with the long-channel form
#: ``beyond`` from the solution at this length, which keeps the cost bounded.
_LONGEST_SOLVED = 1000.0


@lru_cache(maxsize=8192)
def _clausing(kern: _Kernel1D, L: float) -> float:
    if L == 0.0:
        return 1.0
    if L > _LONGEST_SOLVED:
        return kern.beyond(L, _LONGEST_SOLVED, _clausing(kern, _LONGEST_SOLVED))
    x = _graded_nodes(L, kern.h_first, kern.ratio, kern.h_cap(L))
    fine = _solve_1d(kern, L, _bisect(x))
    coarse = _solve_1d(kern, L, x)
    return (4.0 * fine - coarse) / 3.0          # Richardson: the element error is O(h^2)


def _check_length(name, value):
    value = float(value)
    if not math.isfinite(value) or value < 0.0:
        raise ValueError(f"{name} must be a finite number >= 0, got {value!r}")
    return value


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
    Accuracy (``TUBE_LENGTH_OVER_RADIUS_RANGE``, 0 <= L/R <= 1000): within 2e-6 absolute of
    a 4x finer mesh (relative 1e-4 at L/R = 200, 5e-4 at 1000), and within 5e-6 of the
    Clausing table of reference-values G4-01 except at L/R = 15, 30, 40 where that table lies
    2-4e-5 higher. One core, uncached: about 0.2 ms at L/R = 2, 0.4 ms at 10, 2 ms at 40,
    10-15 ms at 400. Results are cached per float input. Beyond L/R = 1000 the value is
    extrapolated as ``1/W = 3L/(8R) + C`` with C taken from the solution at 1000 (relative
    error about 2e-4 at L/R = 1e4 from the slow growth of C; it tends to 0 as L grows).

    References
    ----------
    Clausing (1932) [Cla1932], eq. for the tube; Berman (1965) [Ber1965], Table I.

    Examples
    --------
    >>> round(tube_transmission(2.0), 4)
    0.5142
    """
    return _clausing(_TUBE, _check_length("length_over_radius", length_over_radius))


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
    Accuracy (``SLOT_LENGTH_OVER_GAP_RANGE``, 0 <= L/h <= 1000): within 1e-5 absolute of a
    4x finer mesh up to L/h = 400 (relative 6e-4 there), 3e-5 at 1000. Within 5e-6 of the
    table of reference-values G4-05. About 0.2 ms at L/h = 2, 2 ms at 100, 10-20 ms at 400.
    Beyond L/h = 1000 extrapolated as ``W = (ln(L/h) + c) h/L`` with c from the solution at
    1000 (c drifts slowly, 0.08-0.12 over 10 <= L/h <= 200: about 1 % error at 1e4).

    References
    ----------
    Clausing (1932) [Cla1932]; crossed-strings view factors [SH2002].

    Examples
    --------
    >>> round(slot_transmission(1.0), 3)
    0.684
    """
    return _clausing(_SLOT, _check_length("length_over_gap", length_over_gap))



# --------------------------------------------------------------------------------------------
# General profile (tapered walls, closed bottom with sticking): radiosity equation.
# Meridian coordinates (rho, z): opening at z = 0 with radius/half-width 1, bottom at z = L.
# --------------------------------------------------------------------------------------------

def _ring_kernel(r1, z1, n1r, n1z, r2, z2, n2r, n2z):
    """View factor from a point (r1, z1), normal (n1r, n1z), to a coaxial ring, per unit
    meridian length of the ring at (r2, z2) with normal (n2r, n2z); azimuth integrated in
    closed form: (r2/pi) int_0^2pi (A + B c)(C + D c)/(E - F c)^2 dphi, c = cos(phi)."""
    dz = z2 - z1
    A, B = -n1r * r1 + n1z * dz, n1r * r2
    C, D = -n2r * r2 - n2z * dz, n2r * r1
    E, F = r1 * r1 + r2 * r2 + dz * dz, 2.0 * r1 * r2
    S = np.sqrt((dz * dz + (r1 - r2) ** 2) * (dz * dz + (r1 + r2) ** 2))   # sqrt(E^2 - F^2)
    return 2.0 * r2 / S**3 * (A * C * E + (A * D + B * C) * F + B * D * (E * S + F * F) / (E + S))


def _strip_kernel(x1, z1, n1x, n1z, x2, z2, n2x, n2z):
    """Two-dimensional cosine law, point to strip per unit length, for the strip at (x2, z2)
    and its mirror image at (-x2, z2) (symmetric trench)."""
    out = 0.0
    for sx in (1.0, -1.0):
        dx, dz = sx * x2 - x1, z2 - z1
        d2 = dx * dx + dz * dz
        out = out + (n1x * dx + n1z * dz) * -(sx * n2x * dx + n2z * dz) / (2.0 * d2 * np.sqrt(d2))
    return out


def _disc_view(rho, h, nr, nz, a):
    """View factor from a point at radius rho and distance h >= 0 from a disc of radius a,
    normal components nr (radial) and nz (towards the disc); element-to-disc formulas for
    the parallel and the perpendicular orientation [SH2002], combined linearly."""
    X = h * h + rho * rho + a * a
    S = np.sqrt((h * h + (rho - a) ** 2) * (h * h + (rho + a) ** 2))     # sqrt(X^2 - 4 rho^2 a^2)
    Y = X - 2.0 * a * a
    s_minus_y = np.where(Y > 0.0, 4.0 * a * a * h * h / (S + np.abs(Y)), S - Y)
    f_par = s_minus_y / (2.0 * S)
    f_perp = 2.0 * h * rho * a * a / (S * (X + S))      # element facing the axis
    return nz * f_par - nr * f_perp


def _strip_view(x, h, nx, nz, a):
    """2-D view factor from a point (x, distance h) to the segment [-a, a] of a parallel line
    [SH2002, crossed strings]: (t . (e_B - e_A))/2 with t the unit tangent."""
    tx, tz = nz, -nx                                    # tangent (normal rotated by -90 deg)
    out = 0.0
    for sgn, end in ((1.0, a), (-1.0, -a)):
        ex, ez = end - x, h
        out = out + sgn * (tx * ex + tz * ez) / np.sqrt(ex * ex + ez * ez)
    return 0.5 * np.abs(out)


@dataclass(frozen=True)
class _Geometry:
    kernel: Callable            # point -> element of a surface, per unit meridian length
    view: Callable              # point -> disc / segment of radius or half-width a
    area: Callable              # area of that disc / segment (per unit length for a trench)
    element_area: Callable      # wall area per unit meridian length at radius r
    direct: Callable            # view factor opening (a = 1) -> bottom (a = ab) at depth L
    straight_moments: Callable  # u -> (int_0^u k, int_0^u t k) for straight walls, radius 1


def _disc_to_disc(L, ab):
    X = 1.0 + L * L + ab * ab
    return 2.0 * ab * ab / (X + math.sqrt(X * X - 4.0 * ab * ab))


def _strip_to_strip(L, ab):
    return 2.0 * ab / (math.hypot(1.0 + ab, L) + math.hypot(1.0 - ab, L))


_AXISYMMETRIC = _Geometry(_ring_kernel, _disc_view, lambda a: math.pi * a * a,
                          lambda r: 2.0 * math.pi * r, _disc_to_disc,
                          lambda u: (_TUBE.p0(u), _TUBE.p1(u)))
_PLANE = _Geometry(_strip_kernel, _strip_view, lambda a: 2.0 * a, lambda r: 2.0 + 0.0 * r,
                   _strip_to_strip,     # half-width 1 is a slot of gap 2
                   lambda u: (_SLOT.p0(0.5 * u), 2.0 * _SLOT.p1(0.5 * u)))


def _hat_matrix(nodes, t, col0, ncols):
    """Sparse values of the piecewise-linear basis functions of ``nodes`` at points t
    (columns col0 onwards of a matrix with ncols columns)."""
    j = np.clip(np.searchsorted(nodes, t) - 1, 0, len(nodes) - 2)
    u = (t - nodes[j]) / (nodes[j + 1] - nodes[j])
    i = np.arange(len(t))
    return sparse.csr_matrix((np.concatenate([1.0 - u, u]), (np.concatenate([i, i]),
                              col0 + np.concatenate([j, j + 1]))), shape=(len(t), ncols))


def _one_sided(length, h_first, ratio, h_max):
    """Nodes on [0, length] graded from 0 (spacing h_first, growth ratio, cap h_max)."""
    x = [0.0]
    h = h_first
    while x[-1] + h < length:
        x.append(x[-1] + h)
        h = min(h * ratio, h_max)
    if len(x) > 1 and length - x[-1] < 0.5 * (x[-1] - x[-2]):
        x.pop()
    return np.array(x + [length])


def _wall_nodes(L, k, h_first, ratio, cap, max_nodes=600):
    """Nodes along a wall of radius r(z) = 1 + k z, spacing h_first r at both ends growing by
    ``ratio`` and never above cap r(z), so a strongly tapered wall is graded geometrically.
    The cap is relaxed so that at most about ``max_nodes`` nodes are made (very long walls)."""
    r = lambda z: 1.0 + k * z                  # noqa: E731
    n_est = L / (cap * min(1.0, r(L))) if k == 0.0 else math.log(r(L)) / (cap * k)
    cap *= max(1.0, abs(n_est) / max_nodes)
    fronts = []
    for start, sign in ((0.0, 1.0), (L, -1.0)):
        z, h, pts = start, h_first * r(start), [start]
        while sign * (0.5 * L - z) > h:
            z += sign * h
            pts.append(z)
            h = min(h * ratio, cap * r(z))
        fronts.append(pts)
    top, bottom = fronts
    if len(top) > 1 and len(bottom) > 1:        # drop the front node closest to the middle
        mid_gap = bottom[-1] - top[-1]
        if mid_gap < 0.5 * min(top[-1] - top[-2], bottom[-2] - bottom[-1]):
            bottom.pop()
    return np.array(top + bottom[::-1])


def _gauss_on(a, b, m, n=4):
    """n-point Gauss rule on m equal sub-intervals of each [a_i, b_i]: points, weights, u."""
    g, gw = _GAUSS[n]
    k = (np.arange(m)[:, None] + 0.5 * (g + 1.0)).ravel() / m          # local coordinate u
    u = np.broadcast_to(k, (len(a), n * m))
    w = np.broadcast_to(np.tile(gw, m) / (2.0 * m), (len(a), n * m)) * (b - a)[:, None]
    return a[:, None] + (b - a)[:, None] * u, w, u


#: Mesh of the radiosity solver, in units of the local radius (chosen by convergence scans):
#: first spacing at rim, foot and corner, growth ratio, largest element, quadrature sub-interval
#: near a target, and the distance (in element lengths) inside which that finer rule is used.
_MESH = dict(h_first=0.05, ratio=1.2, cap=1.0, sub=0.5, near=2.0)


def _profile_flux(geo: _Geometry, L: float, ab: float, sticking: float | None) -> float:
    """Molecules per unit time reaching the bottom plane, per unit opening flux density.

    ``sticking=None``: open feature, the bottom plane is a perfect sink and walls re-emit all.
    Otherwise a closed feature whose walls and bottom stick with that probability. Lengths are
    scaled by the opening radius (via) or half-width (trench): the opening is [0, 1] at z = 0.
    Hat-function collocation; the kernel moments over each element use 4 Gauss points, or
    sub-intervals of ``sub`` local radii for elements near the target; row sums are corrected
    to their exact values (1 minus the view of the opening and exit); one Richardson step.
    """
    k = (ab - 1.0) / L
    cw = 1.0 / math.hypot(1.0, k)
    rmin = min(1.0, ab)
    m = _MESH
    wall = _wall_nodes(L, k, m["h_first"], m["ratio"], m["cap"])
    surf = [(_bisect(wall), lambda z: (1.0 + k * z, z, -cw + 0.0 * z, k * cw + 0.0 * z), 1 / cw)]
    if sticking is not None:
        bottom = ab - _one_sided(ab, m["h_first"] * rmin, m["ratio"], 0.25 * ab)[::-1]
        surf.append((_bisect(bottom), lambda r: (r, L + 0.0 * r, 0.0 * r, -1.0 + 0.0 * r), 1.0))
    tg = [np.concatenate(c) for c in zip(*(pt(f) for f, pt, _ in surf))]
    # elements of the fine level, over all surfaces
    ea = np.concatenate([f[:-1] for f, _, _ in surf])
    eb = np.concatenate([f[1:] for f, _, _ in surf])
    sid = np.concatenate([np.full(len(f) - 1, i) for i, (f, _, _) in enumerate(surf)])
    jac = np.array([j for _, _, j in surf])[sid]

    def points(par, i_surf):
        out = [np.empty_like(par) for _ in range(4)]
        for i, (_, pt, _) in enumerate(surf):
            sel = i_surf == i
            for o, v in zip(out, pt(par[sel])):
                o[sel] = v
        return out

    def moments(t_idx, e_idx, nsub, npts):
        """int k dl and int k u dl over elements e_idx seen from targets t_idx (paired)."""
        q, w, u = _gauss_on(ea[e_idx], eb[e_idx], nsub, npts)
        qp = points(q.ravel(), np.repeat(sid[e_idx], q.shape[1]))
        kv = geo.kernel(*(v[t_idx][:, None] for v in tg),
                        *(v.reshape(q.shape) for v in qp)) * w * jac[e_idx, None]
        return kv.sum(axis=1), (kv * u).sum(axis=1)

    nt, ne = len(tg[0]), len(ea)
    nwt, nw = len(surf[0][0]), len(surf[0][0]) - 1
    M0, M1 = np.zeros((nt, ne)), np.zeros((nt, ne))
    pa, pb = points(ea, sid), points(eb, sid)
    length = np.hypot(pb[0] - pa[0], pb[1] - pa[1])
    dist = np.minimum(np.hypot(tg[0][:, None] - pa[0], tg[1][:, None] - pa[1]),
                      np.hypot(tg[0][:, None] - pb[0], tg[1][:, None] - pb[1])) / length
    todo = np.ones((nt, ne), bool)
    if k == 0.0:                                # straight wall: wall-wall moments in closed form
        zt = tg[1][:nwt, None]
        P0a, P1a = geo.straight_moments(ea[:nw] - zt)
        P0b, P1b = geo.straight_moments(eb[:nw] - zt)
        M0[:nwt, :nw] = P0b - P0a
        M1[:nwt, :nw] = (P1b - P1a + (zt - ea[:nw]) * M0[:nwt, :nw]) / (eb[:nw] - ea[:nw])
        todo[:nwt, :nw] = False
    # quadrature: midpoint beyond 20 element lengths, 2 Gauss points beyond 6, 4 closer, and
    # sub-intervals of `sub` local radii within `near` element lengths (the kernel varies on
    # the scale of the radius there)
    nsub = np.maximum(1, np.ceil(length / (m["sub"] * np.minimum(pa[0], pb[0]).clip(rmin))))
    for sel, npts in ((todo & (dist >= 20.0), 1), (todo & (dist < 20.0) & (dist >= 6.0), 2),
                      (todo & (dist < 6.0) & (dist >= m["near"]), 4)):
        ti, ei = np.nonzero(sel)
        M0[ti, ei], M1[ti, ei] = moments(ti, ei, 1, npts)
    ti, ei = np.nonzero(todo & (dist < m["near"]))
    for n in np.unique(nsub[ei]):               # a handful of distinct sub-interval counts
        sel = nsub[ei] == n
        M0[ti[sel], ei[sel]], M1[ti[sel], ei[sel]] = moments(ti[sel], ei[sel], int(n), 4)
    r_t, z_t, nr_t, nz_t = tg
    source = geo.view(r_t, np.maximum(z_t, 1e-9), nr_t, -nz_t, 1.0)
    exact = 1.0 - source
    if sticking is None:
        exact -= geo.view(r_t, np.maximum(L - z_t, 1e-9), nr_t, nz_t, ab)
    defect = exact - M0.sum(axis=1)
    # wall elements -> bottom plane
    q, w, u = _gauss_on(ea[:nw], eb[:nw], 1)
    qr, qz, qnr, qnz = (v.reshape(q.shape) for v in points(q.ravel(), np.zeros(q.size, int)))
    f = geo.view(qr, np.maximum(L - qz, 1e-9), qnr, qnz, ab) * geo.element_area(qr) * w / cw
    B0, B1 = f.sum(axis=1), (f * u).sum(axis=1)
    keep = 1.0 - (sticking or 0.0)
    results = []
    for step in (2, 1):                         # coarse level (every other node), then fine
        rows = np.concatenate([o + np.arange(0, len(fn), step) for o, fn in zip(
            np.cumsum([0] + [len(fn) for fn, _, _ in surf[:-1]]), (fn for fn, _, _ in surf))])
        cols = [fn[::step] for fn, _, _ in surf]
        c0 = np.cumsum([0] + [len(c) for c in cols])
        Ha, Hb = (sparse.vstack([_hat_matrix(c, x[sid == i], c0[i], c0[-1])
                                 for i, c in enumerate(cols)]).tocsc() for x in (ea, eb))
        A = np.asarray((Ha.T @ (M0[rows] - M1[rows]).T + Hb.T @ M1[rows].T).T)
        A[np.arange(len(rows)), np.arange(len(rows))] += defect[rows]
        J = np.linalg.solve(np.eye(len(rows)) - keep * A, keep * source[rows])
        to_bottom = Ha[:nw].T @ (B0 - B1) + Hb[:nw].T @ B1
        results.append(geo.area(1.0) * geo.direct(L, ab) + to_bottom @ J)
    return (4.0 * results[1] - results[0]) / 3.0


@lru_cache(maxsize=1024)
def _profile_cached(shape: str, L: float, ab: float, sticking: float | None) -> float:
    return _profile_flux(_SHAPES[shape].geometry, L, ab, sticking)


@dataclass(frozen=True)
class _Shape:
    geometry: _Geometry
    straight: Callable[[float], float]   # W of the straight open feature from depth/top width


_SHAPES = {
    "via": _Shape(_AXISYMMETRIC, lambda ar: tube_transmission(2.0 * ar)),
    "trench": _Shape(_PLANE, slot_transmission),
}


def _feature(shape, depth_m, top_width_m, bottom_width_m):
    """Validate a feature; return (shape record, depth/top half-width, bottom/top width)."""
    if shape not in _SHAPES:
        raise ValueError(f"shape must be one of {sorted(_SHAPES)}, got {shape!r}")
    depth = _check_length("depth_m", depth_m)
    top = _check_length("top_width_m", top_width_m)
    bottom = top if bottom_width_m is None else _check_length("bottom_width_m", bottom_width_m)
    if top == 0.0 or bottom == 0.0:
        raise ValueError(f"feature widths must be > 0, got top {top!r} m, bottom {bottom!r} m")
    if not math.isfinite(depth / top):
        raise ValueError(f"depth/width {depth!r}/{top!r} is not a finite aspect ratio")
    return _SHAPES[shape], depth / (0.5 * top), bottom / top


def _solver_limit(depth_over_width):
    if depth_over_width > SOLVER_ASPECT_RATIO_LIMIT:
        raise ValueError(f"aspect ratio {depth_over_width:.3g} is above "
                         f"{SOLVER_ASPECT_RATIO_LIMIT:g}, the longest feature the radiosity "
                         "solver handles (tapered walls or a closed bottom)")


def transmission_probability(shape: str, depth_m: float, top_width_m: float,
                             bottom_width_m: float | None = None) -> float:
    """Probability that a molecule entering a feature's opening reaches its bottom plane.

    Free-molecular flow, cosine-law entry and diffuse re-emission from the walls, the bottom
    plane treated as a perfect sink (Clausing's W of the open feature). A straight via is a
    tube of L/R = 2 depth/width (``tube_transmission``), a straight trench a slot of
    L/h = depth/width (``slot_transmission``). A tapered feature (truncated cone, or a
    symmetric trench with plane sloped walls) is solved from its radiosity equation with exact
    ring-to-ring (via) or strip-to-strip (trench) view-factor kernels.

    Parameters
    ----------
    shape : {"via", "trench"}
        Round hole or long trench.
    depth_m : float
        Feature depth [m], >= 0 (0 gives 1).
    top_width_m : float
        Opening diameter (via) or width (trench) [m], > 0.
    bottom_width_m : float or None
        Bottom diameter or width [m], > 0; None means straight walls.

    Returns
    -------
    float
        Transmission probability W [-].

    Notes
    -----
    Validity: depth/top width in ``ASPECT_RATIO_RANGE``; tapers in ``TAPER_RATIO_RANGE``.
    Straight features: as ``tube_transmission`` / ``slot_transmission``. Tapered features:
    within 4e-5 of a 2-3x finer mesh, the tapered solver reproduces the straight results to
    2e-6 as the taper vanishes, and agrees with the Monte Carlo of
    ``chamberchk.physics.montecarlo`` within 3 standard errors. Tapered cost grows with the
    aspect ratio: about 3 ms (AR 5), 8 ms (AR 20), 50 ms (AR 50), 0.1 s (AR 100) and
    0.5-1 s (AR 200); results are cached.

    References
    ----------
    Clausing (1932) [Cla1932]; view factors [SH2002].

    Examples
    --------
    >>> round(transmission_probability("via", 2e-6, 1e-6), 4)
    0.3566
    """
    rec, L, ab = _feature(shape, depth_m, top_width_m, bottom_width_m)
    if L == 0.0:
        return 1.0
    if ab == 1.0:
        return rec.straight(0.5 * L)
    _solver_limit(0.5 * L)
    return _profile_cached(shape, L, ab, None) / rec.geometry.area(1.0)


def bottom_flux_ratio(shape: str, depth_m: float, top_width_m: float,
                      bottom_width_m: float | None, sticking: float) -> float:
    """Flux striking the bottom of a dead-end feature relative to the flux entering it.

    Ballistic transport and reaction model: cosine-law entry, straight flights, and at every
    wall or bottom collision the molecule reacts with probability ``sticking`` or is
    re-emitted diffusely. The radiosity J over walls and bottom solves
    ``J(P) = (1 - s) [F(P -> opening) + int J(Q) dF(P -> dQ)]``; the result is the
    **area-averaged** incident flux over the bottom divided by the incident flux per unit area
    of the opening, ``[A_o F(o -> b) + int_wall J F(Q -> b) dA] / A_b``.

    Parameters
    ----------
    shape : {"via", "trench"}
        Round hole or long trench.
    depth_m : float
        Feature depth [m], >= 0 (0 gives 1).
    top_width_m : float
        Opening diameter or width [m], > 0.
    bottom_width_m : float or None
        Bottom diameter or width [m], > 0; None means straight walls.
    sticking : float
        Reaction probability per collision, 0 <= s <= 1 (``STICKING_RANGE``).

    Returns
    -------
    float
        Bottom flux ratio [-]: 1 for s = 0 (a closed cavity in equilibrium), and for s = 1 the
        line-of-sight view factor bottom -> opening (nothing is re-emitted).

    Notes
    -----
    Validity as ``transmission_probability``. Within 1e-4 of a 2-3x finer mesh; agrees with
    the Monte Carlo within 3 standard errors, equals the view factor for s = 1, and for small
    s and long vias lies within 1.5 % of the continuum (Thiele) value 1/cosh(L'/d sqrt(3 s))
    with the length L' = L + 4d/3 that includes the entrance resistance. Straight features
    take 3-20 ms up to AR 50 and about 0.1 s at AR 200; tapered ones as
    ``transmission_probability``; results are cached.

    References
    ----------
    Cale & Raupp (1990) [CR1990]; view factors [SH2002].

    Examples
    --------
    >>> bottom_flux_ratio("via", 5e-6, 1e-6, None, 0.0)
    1.0
    """
    s = float(sticking)
    if not STICKING_RANGE[0] <= s <= STICKING_RANGE[1]:
        raise ValueError(f"sticking must be within {STICKING_RANGE}, got {sticking!r}")
    rec, L, ab = _feature(shape, depth_m, top_width_m, bottom_width_m)
    if L == 0.0 or s == 0.0:
        return 1.0
    _solver_limit(0.5 * L)
    return _profile_cached(shape, L, ab, s) / rec.geometry.area(ab)
