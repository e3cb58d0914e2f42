"""Reactant transport into one feature in one step: the glue between the recipe and the kernels.

Free-molecular transport comes from the transmission probability W of the feature (Clausing-type
integral equations); the Knudsen diffusivity is derived from W (``D_K = W v L / 4``) so vias,
trenches and tapers share one model; molecular diffusion is Chapman-Enskog with Blanc's law; the
two combine by Bosanquet. Bottom coverage is the ballistic (radiosity) solution in free-molecular
features and steady reaction-diffusion with the Bosanquet diffusivity otherwise.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .gases import Gas
from .physics import diffusion, exposure, taper_table, transmission, transmission_table
from .physics.regimes import RegimeBounds

BALLISTIC = "ballistic"            # integral equations, free-molecular
REACTION_DIFFUSION = "reaction-diffusion"   # Thiele modulus with the Bosanquet D


@dataclass(frozen=True)
class StepGas:
    """What the transport model needs of a step, in SI units."""

    pressure_Pa: float
    temperature_K: float
    duration_s: float
    process: str
    sticking: float
    reactant: Gas
    reactant_fraction: float
    reactant_speed_m_s: float
    molecular_diffusivity_m2_s: float


def molecular_diffusivity(reactant: Gas, partners: list[tuple[Gas, float]], pressure_Pa: float,
                          temperature_K: float) -> float:
    """Reactant diffusivity in the step's mixture (Chapman-Enskog pairs, Blanc's law).

    ``partners`` are the other species with their mole fractions; a pure reactant (no partner
    with a positive fraction) uses its self-diffusion coefficient.
    """
    others = [(g, x) for g, x in partners if x > 0.0]
    if not others:
        others = [(reactant, 1.0)]
    gases = [g for g, _ in others]
    d_ij = diffusion.binary_diffusivity(
        temperature_K, pressure_Pa, reactant.molar_mass_kg_mol,
        np.array([g.molar_mass_kg_mol for g in gases]), reactant.sigma_m,
        np.array([g.sigma_m for g in gases]), reactant.epsilon_K,
        np.array([g.epsilon_K for g in gases]))
    return float(diffusion.mixture_diffusivity_blanc(np.array([x for _, x in others]), d_ij))


@dataclass
class FeatureTransport:
    transmission_probability: float
    knudsen_diffusivity_m2_s: float
    molecular_diffusivity_m2_s: float
    effective_diffusivity_m2_s: float
    fill_time_s: float
    fill_time_99_s: float
    bottom_flux_ratio: float
    bottom_flux_model: str
    required_exposure_Pa_s: float | None
    dose_margin: float | None
    models: tuple[str, ...]
    cautions: tuple[str, ...]


def feature_transport(shape: str, width_m: float, depth_m: float, bottom_width_m: float | None,
                      knudsen: float, step: StepGas, bounds: RegimeBounds,
                      site_density_m2: float | None) -> FeatureTransport:
    """All transport figures of one feature in one step."""
    cautions: list[str] = []
    models = ["transmission", "knudsen-diffusion", "diffusion-ce", "blanc", "bosanquet",
              "fill-time"]
    aspect = depth_m / width_m
    lo, hi = transmission.ASPECT_RATIO_RANGE
    if not lo <= aspect <= hi:
        cautions.append(f"aspect ratio {aspect:.3g} is outside the {lo:g}-{hi:g} range the "
                        "transmission solver is verified for")
    too_long = aspect > transmission.SOLVER_ASPECT_RATIO_LIMIT
    if too_long:
        cautions.append(f"aspect ratio {aspect:.3g} is beyond the "
                        f"{transmission.SOLVER_ASPECT_RATIO_LIMIT:g} the integral equations are "
                        "solved for: transmission from the long-channel limit, bottom coverage "
                        "from reaction-diffusion" + (", taper ignored (mean width)"
                                                     if bottom_width_m is not None else ""))
        if bottom_width_m is not None:
            width_m, bottom_width_m = 0.5 * (width_m + bottom_width_m), None
    if bottom_width_m is not None:
        t_lo, t_hi = transmission.TAPER_RATIO_RANGE
        ratio = bottom_width_m / width_m
        if ratio < t_lo:
            cautions.append(f"bottom/top width {ratio:.3g} is below the {t_lo:g} the taper model "
                            f"covers; transport uses a bottom width of {t_lo:g} x the top")
            bottom_width_m = t_lo * width_m
    if bottom_width_m is None:   # straight: tables computed with the same solvers (fast path)
        w = transmission_table.transmission_probability(shape, depth_m, width_m)
    else:
        w = taper_table.transmission_probability(shape, depth_m, width_m, bottom_width_m)
    d_k = float(diffusion.knudsen_diffusivity(w, step.reactant_speed_m_s, depth_m))
    d_m = step.molecular_diffusivity_m2_s
    d_eff = float(diffusion.bosanquet(d_k, d_m))
    t_fill = float(diffusion.fill_time(depth_m, d_eff))
    t_99 = float(diffusion.fill_time_to_fraction(depth_m, d_eff, 0.99))

    if knudsen >= bounds.transition_max and not too_long:
        ratio = (transmission_table.bottom_flux_ratio(shape, depth_m, width_m, step.sticking)
                 if bottom_width_m is None else
                 taper_table.bottom_flux_ratio(shape, depth_m, width_m, bottom_width_m,
                                               step.sticking))
        model = BALLISTIC
        models.append("ballistic-coverage")
    else:
        ratio = diffusion.reaction_diffusion_bottom_ratio(
            depth_m, width_m if bottom_width_m is None else 0.5 * (width_m + bottom_width_m),
            shape, d_eff, step.reactant_speed_m_s, step.sticking)
        model = REACTION_DIFFUSION
        models.append("reaction-diffusion")
        if step.sticking > diffusion.REACTION_DIFFUSION_MAX_STICKING:
            cautions.append(f"sticking {step.sticking:g} is above the "
                            f"{diffusion.REACTION_DIFFUSION_MAX_STICKING:g} the continuum "
                            "wall-loss model is meant for")
        if aspect < diffusion.REACTION_DIFFUSION_MIN_ASPECT_RATIO:
            cautions.append(f"aspect ratio {aspect:.3g} is short for a 1-D reaction-diffusion "
                            "model")

    required = margin = None
    if step.process == "ald-pulse":
        models.append("ald-exposure")
        a = exposure.effective_aspect_ratio(shape, depth_m, width_m)
        s = exposure.DEFAULT_SITE_DENSITY_M2 if site_density_m2 is None else site_density_m2
        required = float(exposure.gordon_exposure(a, s, step.temperature_K,
                                                  step.reactant.molar_mass_kg_mol))
        margin = float(exposure.dose_margin(step.reactant_fraction * step.pressure_Pa,
                                            step.duration_s, required))
        if knudsen < exposure.GORDON_MIN_KNUDSEN:
            cautions.append(f"Kn {knudsen:.3g} < {exposure.GORDON_MIN_KNUDSEN:g}: the exposure "
                            "model assumes molecular flow in the feature")
    return FeatureTransport(w, d_k, d_m, d_eff, t_fill, t_99, float(ratio), model, required,
                            margin, tuple(models), tuple(cautions))
