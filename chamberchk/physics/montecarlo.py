"""Test-particle Monte Carlo of free-molecular flow into vias and trenches.

Independent check of :mod:`chamberchk.physics.transmission`: molecules enter the opening at a
uniformly random point with a cosine-law direction, fly straight (no gas-phase collisions), and
at each wall or bottom collision react with probability ``sticking`` or are re-emitted with a
cosine-law direction about the local surface normal. Particles are traced in vectorised
batches (numpy arrays, a pool that is refilled as particles leave), reproducibly from
``numpy.random.default_rng(seed)``.

Geometry (lengths scaled by the top radius or half-width, z down from the opening at z = 0):
a via is a truncated cone of radius 1 + k z, a trench the region |x| <= 1 + k z (infinitely
long in y), with k = (bottom/top - 1) / L; the bottom plane is at z = L.

References
----------
.. [Dav1960] D. H. Davis, "Monte Carlo calculation of molecular flow rates through a
   cylindrical elbow and pipes of other shapes", J. Appl. Phys. 31, 1169 (1960): the
   test-particle method for free-molecular transmission.
.. [DBC2017] T. Duff et al., "Building an orthonormal basis, revisited", J. Comput. Graph.
   Tech. 6(1), 1-8 (2017): branch-free tangent frame used for re-emission.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

#: Smallest flight length accepted after a re-emission [top radius units]: rejects the
#: spurious root at the emission point itself.
_EPS = 1e-9


@dataclass(frozen=True)
class MCResult:
    """Outcome of :func:`simulate`.

    ``estimate`` is the transmission probability (``open_bottom=True``) or the bottom flux
    ratio (closed bottom: bottom collisions per unit bottom area over entering molecules per
    unit opening area); ``standard_error`` its one-sigma statistical error.
    """
    quantity: str
    estimate: float
    standard_error: float
    n_particles: int
    wall_collisions: int
    bottom_collisions: int


def _cosine_directions(n, rng):
    """Cosine-law unit vectors about the local normals n (shape (3, m))."""
    u1, u2 = rng.random((2, n.shape[1]))
    ct, st, phi = np.sqrt(u1), np.sqrt(1.0 - u1), 2.0 * math.pi * u2
    sign = np.where(n[2] >= 0.0, 1.0, -1.0)
    a = -1.0 / (sign + n[2])
    b = n[0] * n[1] * a
    t1 = np.array([1.0 + sign * n[0] ** 2 * a, sign * b, -sign * n[0]])
    t2 = np.array([b, sign + n[1] ** 2 * a, -n[1]])
    return t1 * (st * np.cos(phi)) + t2 * (st * np.sin(phi)) + n * ct


class _Via:
    def __init__(self, L, ab):
        self.L, self.k = L, (ab - 1.0) / L
        self.c = 1.0 / math.hypot(1.0, self.k)
        self.area_ratio = 1.0 / (ab * ab)               # opening area / bottom area

    def entry(self, n, rng):
        r, phi = np.sqrt(rng.random(n)), 2.0 * math.pi * rng.random(n)
        return np.array([r * np.cos(phi), r * np.sin(phi), np.zeros(n)])

    def wall_distance(self, P, D):
        k, R = self.k, 1.0 + self.k * P[2]
        a = D[0] ** 2 + D[1] ** 2 - (k * D[2]) ** 2
        b = 2.0 * (P[0] * D[0] + P[1] * D[1] - k * R * D[2])
        c = P[0] ** 2 + P[1] ** 2 - R * R
        disc = b * b - 4.0 * a * c
        sq = np.sqrt(np.maximum(disc, 0.0))
        q = -0.5 * (b + np.where(b >= 0.0, sq, -sq))
        with np.errstate(divide="ignore", invalid="ignore"):
            roots = np.array([q / a, c / q])
        roots[~(roots > _EPS)] = np.inf
        t = roots.min(axis=0)
        t[disc < 0.0] = np.inf
        return t

    def wall_normal(self, P):
        r = np.hypot(P[0], P[1])
        return np.array([-P[0] / r * self.c, -P[1] / r * self.c, self.k * self.c + 0.0 * r])


class _Trench:
    def __init__(self, L, ab):
        self.L, self.k = L, (ab - 1.0) / L
        self.c = 1.0 / math.hypot(1.0, self.k)
        self.area_ratio = 1.0 / ab

    def entry(self, n, rng):
        return np.array([2.0 * rng.random(n) - 1.0, np.zeros(n), np.zeros(n)])

    def wall_distance(self, P, D):
        h = 1.0 + self.k * P[2]
        with np.errstate(divide="ignore", invalid="ignore"):
            t = np.array([(h - P[0]) / (D[0] - self.k * D[2]),
                          (-h - P[0]) / (D[0] + self.k * D[2])])
        t[~(t > _EPS)] = np.inf
        return t.min(axis=0)

    def wall_normal(self, P):
        side = np.where(P[0] > 0.0, -1.0, 1.0)
        return np.array([side * self.c, 0.0 * side, self.k * self.c + 0.0 * side])


_GEOMETRIES = {"via": _Via, "trench": _Trench}


def simulate(shape: str, depth_m: float, top_width_m: float,
             bottom_width_m: float | None = None, sticking: float = 0.0,
             open_bottom: bool = False, n_particles: int = 100_000, seed: int = 0,
             batch_size: int = 65_536) -> MCResult:
    """Trace ``n_particles`` molecules into a via or trench and count where they go.

    Parameters
    ----------
    shape : {"via", "trench"}
        Round hole (truncated cone) or long trench with plane, symmetric walls.
    depth_m, top_width_m : float
        Depth and opening diameter/width [m]; > 0.
    bottom_width_m : float or None
        Bottom diameter/width [m] (None: straight walls).
    sticking : float
        Reaction probability per wall or bottom collision, 0 <= s <= 1.
    open_bottom : bool
        True: the bottom plane is an exit (transmission probability, an open tube or slot
        when straight). False: a dead-end feature (bottom flux ratio).
    n_particles : int
        Number of molecules entering the opening.
    seed : int
        Seed of ``numpy.random.default_rng``; the result is reproducible for the same seed
        and batch size.
    batch_size : int
        Number of molecules traced together.

    Returns
    -------
    MCResult
        Estimate, one-sigma standard error and collision counts.

    References
    ----------
    Davis (1960) [Dav1960].
    """
    if shape not in _GEOMETRIES:
        raise ValueError(f"shape must be one of {sorted(_GEOMETRIES)}, got {shape!r}")
    bottom = top_width_m if bottom_width_m is None else bottom_width_m
    if not (depth_m > 0.0 and top_width_m > 0.0 and bottom > 0.0):
        raise ValueError("depth_m, top_width_m and bottom_width_m must be > 0")
    if not 0.0 <= sticking <= 1.0:
        raise ValueError(f"sticking must be within [0, 1], got {sticking!r}")
    geo = _GEOMETRIES[shape](depth_m / (0.5 * top_width_m), bottom / top_width_m)
    L, rng = geo.L, np.random.default_rng(seed)
    hits = np.zeros(n_particles)                # bottom arrivals per molecule
    P, D, ids = np.empty((3, 0)), np.empty((3, 0)), np.empty(0, dtype=np.int64)
    injected = wall = 0
    while injected < n_particles or ids.size:
        if ids.size < batch_size // 2 and injected < n_particles:
            m = min(batch_size - ids.size, n_particles - injected)
            up = np.zeros((3, m))
            up[2] = 1.0
            P = np.concatenate([P, geo.entry(m, rng)], axis=1)
            D = np.concatenate([D, _cosine_directions(up, rng)], axis=1)
            ids = np.concatenate([ids, np.arange(injected, injected + m)])
            injected += m
        with np.errstate(divide="ignore", invalid="ignore"):
            t_plane = np.where(D[2] > 0.0, (L - P[2]) / D[2],
                               np.where(D[2] < 0.0, -P[2] / D[2], np.inf))
        t_wall = geo.wall_distance(P, D)
        to_wall = t_wall < t_plane
        t = np.where(to_wall, t_wall, t_plane)
        P = P + D * t
        down = ~to_wall & (D[2] > 0.0)          # reached the bottom plane
        hits[ids[down]] += 1.0
        wall += int(to_wall.sum())
        bounce = to_wall | (down & (not open_bottom))
        if sticking > 0.0:
            bounce &= rng.random(ids.size) >= sticking
        P, D, ids, to_wall = P[:, bounce], D[:, bounce], ids[bounce], to_wall[bounce]
        n = np.empty_like(P)
        n[:, to_wall] = geo.wall_normal(P[:, to_wall])
        n[:, ~to_wall] = np.array([[0.0], [0.0], [-1.0]])
        P[2, ~to_wall] = L
        D = _cosine_directions(n, rng)
    if open_bottom:
        p = hits.mean()
        return MCResult("transmission_probability", float(p),
                        math.sqrt(p * (1.0 - p) / n_particles), n_particles, wall,
                        int(hits.sum()))
    scale = geo.area_ratio
    return MCResult("bottom_flux_ratio", float(hits.mean() * scale),
                    float(hits.std(ddof=1) * scale / math.sqrt(n_particles)), n_particles,
                    wall, int(hits.sum()))
