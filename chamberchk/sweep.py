"""Evaluate one step of a recipe over a range of pressure or temperature (``check --sweep``)."""

from __future__ import annotations

import dataclasses
import re
from dataclasses import dataclass

import numpy as np

from .errors import InputError, Problem
from .recipe import Recipe
from .units import UnitProblem, parse_quantity

PARAMETERS = {"pressure": ("pressure_Pa", "pressure", True),        # field, unit kind, log
              "temperature": ("temperature_K", "temperature", False)}
SWEPT = ("knudsen_number", "regime", "fill_time_99_s", "bottom_flux_ratio", "dose_margin",
         "effective_diffusivity_m2_s")


@dataclass(frozen=True)
class SweepSpec:
    step: str
    parameter: str
    low: float
    high: float
    points: int = 25


def parse_spec(text: str, points: int) -> SweepSpec:
    """``"STEP:pressure=10 mTorr..10 Torr"`` -> :class:`SweepSpec`; ValueError with a message."""
    m = re.match(r"^(?P<step>.+):(?P<param>\w+)=(?P<range>.+)$", text.strip())
    if not m or ".." not in m.group("range"):
        raise ValueError('expected "STEP:pressure=LOW..HIGH" or "STEP:temperature=LOW..HIGH", '
                         f'e.g. "2:pressure=10 mTorr..10 Torr"; got {text!r}')
    param = m.group("param")
    if param not in PARAMETERS:
        raise ValueError(f"can sweep {', '.join(PARAMETERS)}; got {param!r}")
    lo_text, hi_text = m.group("range").split("..", 1)
    kind = PARAMETERS[param][1]
    try:
        lo, hi = parse_quantity(lo_text.strip(), kind), parse_quantity(hi_text.strip(), kind)
    except UnitProblem as exc:
        raise ValueError(str(exc)) from None
    if not 0 < lo < hi:
        raise ValueError(f"expected 0 < LOW < HIGH, got {lo_text.strip()!r}..{hi_text.strip()!r}")
    if not 2 <= points <= 500:
        raise ValueError(f"--sweep-points must be 2 to 500, got {points}")
    return SweepSpec(m.group("step").strip(), param, lo, hi, points)


def find_step(recipe: Recipe, ref: str) -> int:
    """Index of the step named ``ref``, or numbered ``ref`` (from 1)."""
    names = [s.name for s in recipe.steps]
    if ref in names:
        return names.index(ref)
    if ref.isdigit() and 1 <= int(ref) <= len(names):
        return int(ref) - 1
    raise InputError(recipe.source_file, [Problem(
        "--sweep", f"no step named or numbered {ref!r}; steps: "
                   + ", ".join(f"{i} {n!r}" for i, n in enumerate(names, start=1)))])


def run_sweep(recipe: Recipe, spec: SweepSpec) -> dict:
    """Evaluate the recipe up to the swept step at each value; returns plain data."""
    from .evaluate import evaluate

    k = find_step(recipe, spec.step)
    field, _, log = PARAMETERS[spec.parameter]
    values = (np.geomspace if log else np.linspace)(spec.low, spec.high, spec.points)
    features: dict[str, dict] = {}
    for v in values:
        steps = list(recipe.steps[: k + 1])
        steps[k] = dataclasses.replace(steps[k], **{field: float(v)})
        result = evaluate(dataclasses.replace(recipe, steps=tuple(steps))).steps[k]
        for f in result.features:
            entry = features.setdefault(f.id, {"id": f.id, "name": f.name,
                                               **{key: [] for key in SWEPT}})
            for key in SWEPT:
                entry[key].append(getattr(f, key))
    return {"step": recipe.steps[k].name, "step_index": k + 1, "parameter": spec.parameter,
            "values_" + ("Pa" if spec.parameter == "pressure" else "K"): [float(v)
                                                                          for v in values],
            "step_value": getattr(recipe.steps[k], field), "features": list(features.values())}
