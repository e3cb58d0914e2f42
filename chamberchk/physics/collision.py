"""Lennard-Jones 12-6 reduced collision integrals (Neufeld, Janzen & Aziz 1972 fits).

Shared by the viscosity (Omega(2,2)) and diffusion (Omega(1,1)) kernels.

References
----------
.. [NJA1972] P. D. Neufeld, A. R. Janzen, R. A. Aziz, "Empirical equations to calculate 16 of
   the transport collision integrals Omega(l,s)* for the Lennard-Jones (12-6) potential",
   J. Chem. Phys. 57, 1100-1102 (1972).
.. [PPO2001] B. E. Poling, J. M. Prausnitz, J. P. O'Connell, *The Properties of Gases and
   Liquids*, 5th ed., McGraw-Hill (2001), eq. 9-4.3 (Omega_v) and eq. 11-3.6 (Omega_D).
"""

from __future__ import annotations

import numpy as np

#: Reduced-temperature range over which the Neufeld et al. fits were made [NJA1972].
T_STAR_RANGE = (0.3, 100.0)


def omega11(t_star):
    """Reduced diffusion collision integral Omega(1,1)* of the LJ 12-6 potential.

    ``Omega = A/T*^B + C exp(-D T*) + E exp(-F T*) + G exp(-H T*)`` with the Neufeld et al.
    (1972) coefficients, as printed in Poling et al. (2001) eq. 11-3.6.

    Parameters
    ----------
    t_star : float or array_like
        Reduced temperature ``k T / epsilon`` [-].

    Returns
    -------
    float or ndarray
        Omega(1,1)* [-]. Fit error about 0.1 % for 0.3 <= T* <= 100 (``T_STAR_RANGE``);
        outside that range the value is an extrapolation and callers should record a caution.

    Examples
    --------
    >>> round(float(omega11(1.0)), 5)
    1.44047
    """
    t = np.asarray(t_star, dtype=float)
    out = (1.06036 / t**0.15610 + 0.19300 * np.exp(-0.47635 * t)
           + 1.03587 * np.exp(-1.52996 * t) + 1.76474 * np.exp(-3.89411 * t))
    return out if out.ndim else float(out)


def omega22(t_star):
    """Reduced viscosity collision integral Omega(2,2)* of the LJ 12-6 potential.

    Neufeld et al. (1972) fit including its small sine term:
    ``1.16145 T*^-0.14874 + 0.52487 exp(-0.77320 T*) + 2.16178 exp(-2.43787 T*)
    - 6.435e-4 T*^0.14874 sin(18.0323 T*^-0.76830 - 7.27371)``.
    Poling et al. (2001) eq. 9-4.3 prints the same fit without the sine term.

    Parameters
    ----------
    t_star : float or array_like
        Reduced temperature ``k T / epsilon`` [-].

    Returns
    -------
    float or ndarray
        Omega(2,2)* [-]; valid for 0.3 <= T* <= 100 (``T_STAR_RANGE``).

    Examples
    --------
    >>> round(float(omega22(1.0)), 5)
    1.59315
    """
    t = np.asarray(t_star, dtype=float)
    out = (1.16145 * t**-0.14874 + 0.52487 * np.exp(-0.77320 * t)
           + 2.16178 * np.exp(-2.43787 * t)
           - 6.435e-4 * t**0.14874 * np.sin(18.0323 * t**-0.76830 - 7.27371))
    return out if out.ndim else float(out)


def in_range(t_star) -> bool:
    """True when every reduced temperature lies inside the fits' range ``T_STAR_RANGE``."""
    t = np.asarray(t_star, dtype=float)
    return bool(np.all((t >= T_STAR_RANGE[0]) & (t <= T_STAR_RANGE[1])))
