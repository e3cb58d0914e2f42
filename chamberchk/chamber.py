"""The chamber and its pumping path in one step: flow, conductance, residence, reachable pressure.

Glue between a recipe's ``[chamber]`` and :mod:`chamberchk.physics.conductance`. The gas in the
chamber and the pumping path is taken at the chamber's ``wall_temperature`` (the step's
temperature when the recipe gives none) and the step's composition (mole-fraction mean molar
mass, Wilke mixture viscosity, mixture mean free path scaled as 1/p along the path). The
residence time uses the speed a throttle valve leaves at the step's pressure, ``Q/p``, at most
the full-open effective speed.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from .physics import conductance as cond
from .physics.regimes import RegimeBounds, knudsen_number, regime


@dataclass
class ElementResult:
    label: str
    shape: str
    size: str
    characteristic_length_m: float
    knudsen_number: float
    regime: str
    conductance_m3_s: float
    molecular_transmission: float


@dataclass
class ChamberResult:
    total_flow_mol_s: float
    total_flow_Pa_m3_s: float
    gap_knudsen_number: float | None
    gap_regime: str | None
    gap_diffusion_time_s: float | None
    path_conductance_m3_s: float | None
    series_method: str | None
    effective_pump_speed_m3_s: float | None
    throttled_pump_speed_m3_s: float | None
    residence_time_s: float | None
    lowest_pressure_Pa: float | None
    peclet_number: float | None
    reynolds_number: float | None
    elements: list[ElementResult] = field(default_factory=list)
    cautions: list[str] = field(default_factory=list)
    gas_temperature_K: float | None = None      # of the gas in the chamber and pumping path


def _size(e: cond.PathElement) -> str:
    mm = lambda x: f"{x * 1e3:.4g} mm"  # noqa: E731
    parts = {"tube": lambda: f"d {mm(e.diameter_m)}, L {mm(e.length_m)}",
             "aperture": lambda: (f"d {mm(e.diameter_m)}" if e.diameter_m is not None
                                  else f"{mm(e.width_m)} x {mm(e.height_m)}"),
             "duct": lambda: f"{mm(e.width_m)} x {mm(e.height_m)}, L {mm(e.length_m)}",
             "annulus": lambda: (f"d {mm(e.outer_diameter_m)} / {mm(e.inner_diameter_m)}, "
                                 f"L {mm(e.length_m)}")}
    return parts[e.shape]()


def evaluate_chamber(chamber, pressure_Pa: float, temperature_K: float, molar_flow_mol_s: float,
                     molar_mass_kg_mol: float, viscosity_Pa_s: float, mean_free_path_m: float,
                     gap_mean_free_path_m: float, reactant_diffusivity_m2_s: float,
                     bounds: RegimeBounds) -> ChamberResult:
    """Chamber figures of one step (``chamber`` is a :class:`chamberchk.recipe.Chamber`).

    ``temperature_K``, ``viscosity_Pa_s`` and ``mean_free_path_m`` describe the gas in the
    chamber and pumping path (at the wall temperature when the recipe gives one); the wafer gap
    uses the step's own mean free path and reactant diffusivity.
    """
    q = float(cond.throughput_from_molar_flow(molar_flow_mol_s, temperature_K))
    out = ChamberResult(molar_flow_mol_s, q, None, None, None, None, None, None, None, None,
                        None, None, None, gas_temperature_K=temperature_K)
    if chamber.gap_m is not None:
        out.gap_knudsen_number = float(knudsen_number(gap_mean_free_path_m, chamber.gap_m))
        out.gap_regime = regime(out.gap_knudsen_number, bounds)
        out.gap_diffusion_time_s = chamber.gap_m ** 2 / reactant_diffusivity_m2_s
    args = (temperature_K, molar_mass_kg_mol, viscosity_Pa_s)
    for i, e in enumerate(chamber.path, start=1):
        d, kn = cond.element_regime_inputs(e, mean_free_path_m)
        c = float(cond.element_conductance(e, pressure_Pa, *args, mean_free_path_m))
        out.elements.append(ElementResult(f"{i}. {e.shape}", e.shape, _size(e), d, kn,
                                          regime(kn, bounds), c, cond.molecular_transmission(e)))
        if e.shape == "tube" and 0.01 < kn < 10 and \
                e.length_m / e.diameter_m < cond.KNUDSEN_FORMULA_MIN_LENGTH_OVER_DIAMETER:
            out.cautions.append(f"pumping path element {i} (tube, L/d = "
                                f"{e.length_m / e.diameter_m:.3g}, Kn {kn:.3g}) is between "
                                "viscous and molecular flow, where Knudsen's formula is meant "
                                "for long tubes (L/d >= "
                                f"{cond.KNUDSEN_FORMULA_MIN_LENGTH_OVER_DIAMETER:g})")
        if not cond.molecular_transmission_tested(e):
            out.cautions.append(f"pumping path element {i} ({e.shape}) is outside the shapes "
                                "the molecular-flow solver was checked for")
    if chamber.path:
        out.path_conductance_m3_s, out.series_method = cond.path_conductance(
            chamber.path, pressure_Pa, *args, mean_free_path_m)
        re_ = cond.path_reynolds_number(q, chamber.path, temperature_K, molar_mass_kg_mol,
                                        viscosity_Pa_s)
        out.reynolds_number = float(re_)
        if re_ > cond.LAMINAR_REYNOLDS_MAX:
            out.cautions.append(f"Reynolds number {re_:.3g} in the pumping path is above "
                                f"{cond.LAMINAR_REYNOLDS_MAX:g}: the laminar (Poiseuille) "
                                "conductance overestimates a turbulent path")
    if chamber.pump_speed_m3_s is not None:
        s = chamber.pump_speed_m3_s
        c_path = out.path_conductance_m3_s
        out.effective_pump_speed_m3_s = s if c_path is None else \
            float(cond.effective_pump_speed(s, c_path))
        out.throttled_pump_speed_m3_s = float(cond.throttled_pump_speed(
            q, pressure_Pa, out.effective_pump_speed_m3_s))
        out.residence_time_s = float(cond.residence_time(chamber.volume_m3,
                                                         out.throttled_pump_speed_m3_s))
        if chamber.path:
            c_of_p = cond.path_conductance_function(chamber.path, *args, mean_free_path_m,
                                                    pressure_Pa)
            out.lowest_pressure_Pa = float(cond.lowest_pressure(q, s, c_of_p))
        else:
            out.lowest_pressure_Pa = q / s
        if out.gap_diffusion_time_s is not None:
            out.peclet_number = out.gap_diffusion_time_s / out.residence_time_s
    return out


def mixture_molar_mass(fractions: dict[str, float], gases) -> float:
    return sum(x * gases.get(g).molar_mass_kg_mol for g, x in fractions.items())

