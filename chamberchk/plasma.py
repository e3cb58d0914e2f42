"""The plasma sheath of an etch step and what it means for ions and neutrals in the features.

Glue between a step's ``[step.plasma]`` block and :mod:`chamberchk.physics.sheath`. The edge
density is the bulk electron density times the presheath ratio exp(-1/2) (Lieberman &
Lichtenberg 2005, sec. 6.2); the sheath is the collisionless Child law unless the ion mean free
path is shorter than it, then the mobility-limited (collisional) law. Ion-neutral cross sections
come from ``data/ion_cross_sections.toml`` (the row nearest the Bohm energy Te/2 of ions entering
the sheath, for an ion in its parent gas) or from the recipe; with neither, a gas-kinetic
estimate pi d^2 from the viscosity-equivalent diameter is used and flagged as a lower bound.
"""

from __future__ import annotations

import math
import tomllib
from dataclasses import dataclass
from functools import lru_cache
from importlib import resources

from scipy import constants

from .physics import sheath


@dataclass(frozen=True)
class Plasma:
    """A step's plasma, as given in the recipe (SI units; temperatures in eV)."""

    electron_density_m3: float
    electron_temperature_eV: float
    sheath_voltage_V: float
    ion: str | None = None                  # gas key; None: heaviest inert gas, else majority
    cross_section_m2: float | None = None   # ion-neutral override


@dataclass
class SheathResult:
    ion: str
    ion_mass_kg: float
    debye_length_m: float            # at the sheath edge (density 0.61 n), as the Child law uses
    bohm_speed_m_s: float
    ion_flux_per_m2_per_s: float
    sheath_thickness_m: float
    ion_cross_section_m2: float
    cross_section_source: str
    ion_mean_free_path_m: float
    collisionality: float
    sheath_regime: str
    sheath_model: str
    ion_angular_spread_deg: float
    cautions: list[str]


@lru_cache(maxsize=1)
def cross_section_table() -> list[dict]:
    text = resources.files("chamberchk").joinpath("data/ion_cross_sections.toml").read_text(
        "utf-8")
    return tomllib.loads(text)["pair"]


def cross_section(ion_gas: str, energy_eV: float) -> tuple[float, str] | None:
    """The tabulated total cross section of an ion in its parent gas nearest ``energy_eV``."""
    rows = [r for r in cross_section_table() if r["gas"] == ion_gas and r["ion"] == ion_gas + "+"]
    if not rows:
        return None
    row = min(rows, key=lambda r: (abs(math.log(r["ion_energy_lab_eV"] / energy_eV)),
                                   r["ion_energy_lab_eV"]))
    return row["cross_section_m2"], f"{row['ion']} in {row['gas']} at " \
        f"{row['ion_energy_lab_eV']:g} eV ({row['cross_section_kind']}): {row['source']}"


def evaluate_sheath(plasma: Plasma, ion: str, ion_molar_mass_kg_mol: float,
                    ion_equivalent_diameter_m: float, pressure_Pa: float,
                    temperature_K: float) -> SheathResult:
    """Sheath figures of one step."""
    te, v0 = plasma.electron_temperature_eV, plasma.sheath_voltage_V
    mass = ion_molar_mass_kg_mol / constants.N_A
    n_s = plasma.electron_density_m3 * sheath.PRESHEATH_DENSITY_RATIO
    cautions: list[str] = []
    if plasma.cross_section_m2 is not None:
        sigma, source = plasma.cross_section_m2, "given in the recipe"
    else:
        found = cross_section(ion, te / 2.0)
        if found is None:
            sigma = math.pi * ion_equivalent_diameter_m ** 2
            source = (f"gas-kinetic estimate pi d^2 for {ion} (no tabulated ion-neutral cross "
                      "section; charge exchange omitted, so a lower bound)")
            cautions.append(f"no ion-neutral cross section for {ion}+ in {ion}; the sheath "
                            "collisionality uses a gas-kinetic estimate and is a lower bound")
        else:
            sigma, source = found
    lam_i = float(sheath.ion_neutral_mean_free_path(sigma, pressure_Pa=pressure_Pa,
                                                    temperature_K=temperature_K))
    s = float(sheath.child_law_sheath_thickness(n_s, te, v0))
    model = "child_law_sheath_thickness"
    if sheath.collisionality(s, lam_i) >= sheath.COLLISIONAL_FLAG_RATIO:
        s = float(sheath.collisional_sheath_thickness(n_s, te, v0, lam_i))
        model = "collisional_sheath_thickness"
    ratio = float(sheath.collisionality(s, lam_i))
    cautions += sheath.validity_cautions(model, voltage_ratio=v0 / te, collisionality=ratio)
    cautions += sheath.validity_cautions("ion_angular_spread", collisionality=ratio,
                                         voltage_ratio=v0 / te)
    spread = float(sheath.ion_angular_spread(ratio, v0, te))
    return SheathResult(
        ion=ion, ion_mass_kg=mass,
        debye_length_m=float(sheath.debye_length(n_s, te)),
        bohm_speed_m_s=float(sheath.bohm_speed(te, mass)),
        ion_flux_per_m2_per_s=float(sheath.ion_flux(plasma.electron_density_m3, te, mass,
                                            sheath.PRESHEATH_DENSITY_RATIO)),
        sheath_thickness_m=s, ion_cross_section_m2=sigma, cross_section_source=source,
        ion_mean_free_path_m=lam_i, collisionality=ratio,
        sheath_regime=str(sheath.collisionality_regime(ratio)),
        sheath_model="collisional (mobility-limited) Child law" if model.startswith(
            "collisional") else "collisionless Child law",
        ion_angular_spread_deg=math.degrees(spread), cautions=cautions)


def ion_bottom_fraction(aspect_ratio: float, spread_deg: float, shape: str) -> float:
    return float(sheath.ion_bottom_fraction(aspect_ratio, math.radians(spread_deg), shape))
