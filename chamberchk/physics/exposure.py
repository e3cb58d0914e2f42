"""ALD exposure: wall impingement flux, the exposure needed to saturate a feature (Gordon et al.
2003) and the dose margin of a pulse.

All functions take SI floats or numpy arrays. Exposures are partial pressure x time [Pa s].

References
----------
.. [GHKS2003] R. G. Gordon, D. Hausmann, E. Kim, J. Shepard, "A kinetic model for step coverage
   by atomic layer deposition in narrow holes or trenches", Chem. Vap. Deposition 9, 73-78
   (2003), doi:10.1002/cvde.200390005.
.. [CPD2019] V. Cremers, R. L. Puurunen, J. Dendooven, "Conformality in atomic layer deposition:
   current status overview of analysis and modelling", Appl. Phys. Rev. 6, 021302 (2019)
   (equivalent aspect ratio; trench L/(2w)).
.. [Dushman1949] S. Dushman, *Scientific Foundations of Vacuum Technique*, Wiley (1949):
   tube transmission W = 1/(1 + 3L/(4d)) (from memory).
.. [Knudsen1909] M. Knudsen, Ann. Phys. 333, 75 (1909): wall impingement rate n v/4.
.. [YVetal2022] J. Yim, E. Verkama et al., "Conformality of atomic layer deposition in
   microchannels: impact of process parameters on the simulated thickness profile",
   Phys. Chem. Chem. Phys. 24, 8645-8660 (2022); baseline data set Zenodo record 6997243.

Provenance of the Gordon formula (what was checked): the exposure formula with coefficients 19/4
and 3/2 was seen in a secondary document quoting [GHKS2003] (the paper itself was not opened);
the paper's abstract (seen) states the theory covers holes of arbitrary cross section and gives a
minimum product of pressure and time. The coefficients follow exactly from the derivation
sketched in ``gordon_exposure`` with Dushman's transmission approximation, which the tests
re-integrate numerically. The cross-section rule a = L p / (4 A) and the trench value L/(2w)
(a hole needing 4x a trench's exposure at high aspect ratio) are recalled (from memory) and
agree with the secondary document citing [CPD2019]; no worked example of the paper was found.
"""

from __future__ import annotations

import numpy as np
from scipy import constants

from .diffusion import perimeter_per_area

K_B = constants.k
N_A = constants.N_A


def _arr(x):
    """Float array view of a scalar or array_like input."""
    return np.asarray(x, dtype=float)

#: Saturated areal density of chemisorbed precursor (metal) atoms used when a recipe gives none:
#: 4 per nm2, the baseline "areal number density of metal atoms" of [YVetal2022] (value read in
#: the data set record). A TMA/H2O growth of ~1.1 A per cycle at ~3 g/cm3 corresponds to
#: ~4e18 Al/m2 (from memory), so the value is typical of the prototypical process.
DEFAULT_SITE_DENSITY_M2 = 4.0e18

#: Pressure of one Langmuir exposure unit: 1 L = 1e-6 Torr s (common practice) [Pa s].
LANGMUIR_PA_S = 1.0e-6 * constants.torr

#: The Gordon model assumes molecular flow in the feature (Kn = lambda/width above about 1;
#: [GHKS2003] treats Knudsen flow), sticking of every molecule that meets a bare site (a lower
#: bound on the exposure for reaction probabilities below 1) and an undepleted pressure at the
#: opening.
GORDON_MIN_KNUDSEN = 1.0
#: Relative spread of the closed form within its own model: fed with the exact Clausing
#: transmission of the coated tube instead of Dushman's approximation, the same front model needs
#: up to 11.2 % more exposure (near a = 3.5; 2.6 % at a = 100), computed with our tube solver,
#: which reproduces Berman (1965) / Cole (1977). A dose margin below ``1 + EXPOSURE_MODEL_SPREAD``
#: is therefore inside the model's own approximation.
EXPOSURE_MODEL_SPREAD = 0.12

GORDON_ASSUMPTIONS = (
    "molecular (Knudsen) flow in the feature",
    "every collision with an unreacted site reacts: a minimum exposure for sticking < 1",
    "constant precursor partial pressure at the opening during the pulse",
)


def impingement_flux(pressure_Pa, temperature_K, molar_mass_kg_mol):
    """Wall impingement rate of a gas, ``J = p / sqrt(2 pi m k T)`` [1/(m2 s)].

    Hertz-Knudsen flux, equal to ``n v / 4`` for a Maxwellian gas ([Knudsen1909]).

    Parameters
    ----------
    pressure_Pa : float or array_like
        (Partial) pressure [Pa].
    temperature_K : float or array_like
        Gas temperature [K].
    molar_mass_kg_mol : float or array_like
        Molar mass [kg/mol].

    Examples
    --------
    >>> round(float(impingement_flux(1.0, 300.0, 28.0134e-3)) / 1e22, 4)   # N2
    2.8741
    """
    m = _arr(molar_mass_kg_mol) / N_A
    return (_arr(pressure_Pa)
            / np.sqrt(2.0 * np.pi * m * K_B * _arr(temperature_K)))[()]


def effective_aspect_ratio(shape, depth_m, width_m):
    """Gordon's aspect ratio of a feature of any cross section, ``a = L p / (4 A)`` [-].

    ``p`` is the cross-section perimeter and ``A`` its area ([GHKS2003]; from memory): a round via
    gives ``L/d``, a long trench ``L/(2w)``, which is the equivalent aspect ratio of [CPD2019].

    Parameters
    ----------
    shape : {"via", "trench"}
    depth_m, width_m : float or array_like
        Depth and via diameter or trench width [m].
    """
    return (_arr(depth_m) * perimeter_per_area(shape, width_m) / 4.0)[()]


def gordon_exposure(aspect_ratio, site_density_m2, temperature_K, molar_mass_kg_mol):
    """Minimum precursor exposure to coat a hole of aspect ratio a conformally [Pa s].

    ``P t = S sqrt(2 pi m k T) [1 + (19/4) a + (3/2) a^2]`` ([GHKS2003]). ``S sqrt(2 pi m k T)``
    is the exposure that saturates a flat surface (``S`` molecules per area at the impingement
    rate ``P/sqrt(2 pi m k T)``). Derivation that reproduces the coefficients: the saturated
    front at depth z is fed through a coated tube of transmission ``1/(1 + 3z/(4d))``
    ([Dushman1949]), so ``S p dz (1 + 3z/(4d)) = J A dt``, giving ``4a + (3/2) a^2``; the bottom
    needs ``S A`` through the whole tube, ``1 + (3/4) a``. Use ``effective_aspect_ratio`` for
    trenches. Validity: ``GORDON_MIN_KNUDSEN``, ``GORDON_ASSUMPTIONS``; the closed form is
    up to ``EXPOSURE_MODEL_SPREAD`` below the same front model with exact Clausing transmission.

    Parameters
    ----------
    aspect_ratio : float or array_like
        Gordon aspect ratio a (0 for a flat surface) [-].
    site_density_m2 : float or array_like
        Saturated areal density of adsorbed precursor molecules S [1/m2]
        (``DEFAULT_SITE_DENSITY_M2`` when unknown).
    temperature_K : float or array_like
        Gas temperature [K].
    molar_mass_kg_mol : float or array_like
        Precursor molar mass [kg/mol].

    Returns
    -------
    float or ndarray
        Required exposure P t [Pa s].

    Examples
    --------
    >>> round(float(gordon_exposure(0.0, 4e18, 423.15, 72.09e-3)) * 1e4, 3)   # flat, TMA monomer
    2.652
    """
    a = _arr(aspect_ratio)
    flat = _arr(site_density_m2) / impingement_flux(1.0, temperature_K,
                                                                        molar_mass_kg_mol)
    return (flat * (1.0 + 4.75 * a + 1.5 * a**2))[()]


def dose_margin(partial_pressure_Pa, duration_s, required_exposure_Pa_s):
    """Ratio of the delivered exposure to the required one, ``p t / (P t)_required`` [-].

    Above 1 the pulse delivers at least the modelled minimum exposure.

    Parameters
    ----------
    partial_pressure_Pa : float or array_like
        Precursor partial pressure at the feature opening [Pa].
    duration_s : float or array_like
        Pulse duration [s].
    required_exposure_Pa_s : float or array_like
        Required exposure, e.g. from ``gordon_exposure`` [Pa s].
    """
    return (_arr(partial_pressure_Pa) * _arr(duration_s)
            / _arr(required_exposure_Pa_s))[()]


def langmuir_exposure(pressure_Pa, duration_s):
    """Exposure in Langmuir (1 L = 1e-6 Torr s, common practice) [L].

    Parameters
    ----------
    pressure_Pa : float or array_like
        (Partial) pressure [Pa].
    duration_s : float or array_like
        Exposure time [s].

    Examples
    --------
    >>> round(float(langmuir_exposure(133.322368, 1e-6)), 6)
    1.0
    """
    return (_arr(pressure_Pa) * _arr(duration_s)
            / LANGMUIR_PA_S)[()]
