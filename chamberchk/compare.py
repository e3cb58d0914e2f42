"""Evaluation x Evaluation -> Comparison: what a recipe change does to transport.

Steps are matched by name first, then the remaining ones by position (a position match with a
different name is a rename); what is left is added or removed. Features are matched by id.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from . import __version__
from .evaluate import Evaluation, StepResult
from .flags import Flag, raise_flag
from .recipe import Recipe, Step

#: step inputs compared, with the display kind of each
STEP_INPUTS = (("process", "text"), ("duration_s", "time"), ("pressure_Pa", "pressure"),
               ("temperature_K", "temperature"), ("reactant", "text"), ("sticking", "number"),
               ("film_m", "length"), ("etch_depth_m", "length"), ("feature_ids", "text"))
FEATURE_INPUTS = (("shape", "text"), ("width_m", "length"), ("depth_m", "length"),
                  ("bottom_width_m", "length"))
CHAMBER_INPUTS = (("volume_m3", "volume"), ("gap_m", "length"), ("pump_speed_m3_s", "speed"),
                  ("path", "text"), ("wall_temperature_K", "temperature"))
#: per-feature results compared
FEATURE_RESULTS = ("knudsen_number", "regime", "fill_time_99_s", "bottom_flux_ratio",
                   "dose_margin", "ion_to_neutral_bottom_over_top", "window_pressures_Pa",
                   "nearest_bound_factor", "nearest_bound")
STEP_RESULTS = ("pressure_Pa", "mean_free_path_m", "lowest_pressure_Pa", "residence_time_s")


@dataclass
class Change:
    field: str
    kind: str
    old: object
    new: object


@dataclass
class FeatureDelta:
    id: str
    name: str
    old: dict | None
    new: dict | None
    regime_crossing: bool


@dataclass
class StepPair:
    match: str                  # name | position | added | removed
    old_index: int | None
    new_index: int | None
    old_name: str | None
    new_name: str | None
    input_changes: list[Change]
    results: dict               # step-level figures {name: {"old":, "new":}}
    features: list[FeatureDelta]


@dataclass
class Comparison:
    chamberchk_version: str
    old: dict
    new: dict
    crossings: list[dict]
    steps: list[StepPair]
    feature_changes: list[dict]
    chamber_changes: list[Change]
    flags: list[Flag]           # regime crossings and flags the new revision introduces
    resolved_flags: list[Flag] = field(default_factory=list)    # old flags the change cleared
    remaining_flags: list[Flag] = field(default_factory=list)   # new-revision flags also in old
    gas_cautions: list[dict] = field(default_factory=list)
    regime_bounds: dict = field(default_factory=dict)


def match_steps(old: list[str], new: list[str]) -> list[tuple[int | None, int | None, str]]:
    """Pairs of indexes (0-based) into ``old`` and ``new``: by name, then by position."""
    pairs: dict[int, tuple[int, str]] = {}
    free_old = list(range(len(old)))
    for j, name in enumerate(new):
        i = next((i for i in free_old if old[i] == name), None)
        if i is not None:
            pairs[j] = (i, "name")
            free_old.remove(i)
    free_new = [j for j in range(len(new)) if j not in pairs]
    for i, j in zip(list(free_old), list(free_new)):
        pairs[j] = (i, "position")
        free_old.remove(i)
        free_new.remove(j)
    out = [(pairs[j][0], j, pairs[j][1]) for j in sorted(pairs)]
    out += [(None, j, "added") for j in free_new]
    out += [(i, None, "removed") for i in free_old]
    return sorted(out, key=lambda t: (t[1] if t[1] is not None else t[0] + 0.5, t[2]))


def _changes(old, new, fields) -> list[Change]:
    out = []
    for name, kind in fields:
        a, b = getattr(old, name), getattr(new, name)
        if a != b:
            out.append(Change(name, kind, _plain(a), _plain(b)))
    return out


def _plain(value):
    if isinstance(value, tuple):
        return [_plain(v) for v in value]
    if hasattr(value, "__dataclass_fields__"):
        return {k: v for k, v in vars(value).items() if v is not None}
    return value


def _flow_changes(old: Step, new: Step) -> list[Change]:
    a, b = dict(old.flows_mol_s), dict(new.flows_mol_s)
    return [Change(f"gases.{g}", "flow", a.get(g), b.get(g))
            for g in list(dict.fromkeys([*a, *b])) if a.get(g) != b.get(g)]


def _feature_figures(step: StepResult | None) -> dict[str, dict]:
    if step is None:
        return {}
    return {f.id: {"name": f.name, **{k: getattr(f, k) for k in FEATURE_RESULTS}}
            for f in step.features}


def _step_figure(step: StepResult | None, key: str):
    if step is None:
        return None
    if key in ("lowest_pressure_Pa", "residence_time_s"):
        chamber = getattr(step, "chamber", None)
        return None if chamber is None else getattr(chamber, key, None)
    return getattr(step, key)


def compare(old_recipe: Recipe, old: Evaluation, new_recipe: Recipe, new: Evaluation
            ) -> Comparison:
    """Everything that changed between two revisions, regime crossings first."""
    pairs, crossings, flags = [], [], []
    new_to_old_step = {}
    for i, j, how in match_steps([s.name for s in old_recipe.steps],
                                 [s.name for s in new_recipe.steps]):
        os_ = old.steps[i] if i is not None else None
        ns_ = new.steps[j] if j is not None else None
        if os_ is not None and ns_ is not None:
            new_to_old_step[ns_.name] = os_.name
        changes = []
        if i is not None and j is not None:
            a, b = old_recipe.steps[i], new_recipe.steps[j]
            changes = _changes(a, b, STEP_INPUTS) + _flow_changes(a, b)
            if a.plasma != b.plasma:
                changes.append(Change("plasma", "text", _plain(a.plasma), _plain(b.plasma)))
        fo, fn = _feature_figures(os_), _feature_figures(ns_)
        deltas = []
        for fid in dict.fromkeys([*fo, *fn]):
            a, b = fo.get(fid), fn.get(fid)
            crossing = bool(a and b and a["regime"] != b["regime"])
            name = (b or a)["name"]
            deltas.append(FeatureDelta(fid, name, a, b, crossing))
            if crossing:
                step_name = ns_.name
                crossings.append({"step": step_name, "feature": fid, "feature_name": name,
                                  "old_regime": a["regime"], "new_regime": b["regime"],
                                  "old_knudsen_number": a["knudsen_number"],
                                  "new_knudsen_number": b["knudsen_number"]})
                flags.append(raise_flag(
                    "regime-crossing", f"{name}: {a['regime']} (Kn {a['knudsen_number']:.3g}) "
                    f"-> {b['regime']} (Kn {b['knudsen_number']:.3g})", step=step_name,
                    feature=fid))
        results = {k: {"old": _step_figure(os_, k), "new": _step_figure(ns_, k)}
                   for k in STEP_RESULTS}
        pairs.append(StepPair(how, i + 1 if i is not None else None,
                              j + 1 if j is not None else None, os_.name if os_ else None,
                              ns_.name if ns_ else None, changes, results, deltas))
    feature_changes = []
    old_f = {f.id: f for f in old_recipe.features}
    for f in new_recipe.features:
        if f.id not in old_f:
            feature_changes.append({"id": f.id, "change": "added", "fields": []})
        else:
            ch = _changes(old_f[f.id], f, FEATURE_INPUTS)
            if ch:
                feature_changes.append({"id": f.id, "change": "changed", "fields": ch})
    feature_changes += [{"id": fid, "change": "removed", "fields": []}
                        for fid in old_f if fid not in {f.id for f in new_recipe.features}]
    chamber = []
    if old_recipe.chamber != new_recipe.chamber:
        if old_recipe.chamber is None or new_recipe.chamber is None:
            chamber = [Change("chamber", "text", _plain(old_recipe.chamber),
                              _plain(new_recipe.chamber))]
        else:
            chamber = _changes(old_recipe.chamber, new_recipe.chamber, CHAMBER_INPUTS)
    introduced, resolved, remaining = match_flags(old.flags, new.flags, new_to_old_step)
    return Comparison(
        chamberchk_version=__version__,
        old=_side(old), new=_side(new), crossings=crossings, steps=pairs,
        feature_changes=feature_changes, chamber_changes=chamber, flags=flags + introduced,
        resolved_flags=resolved, remaining_flags=remaining,
        gas_cautions=list({c["gas"]: c for c in old.gas_cautions + new.gas_cautions}.values()),
        regime_bounds={"old": old.regime_bounds, "new": new.regime_bounds})


def match_flags(old: list[Flag], new: list[Flag], new_to_old_step: dict[str, str]
                ) -> tuple[list[Flag], list[Flag], list[Flag]]:
    """Split flags into (introduced, resolved, remaining) by what they are about.

    A flag is the same concern in both revisions when its code, its step (through the step
    matching, so a renamed step keeps its flags) and its feature agree; the message may differ
    because the numbers moved. Gas hazards are not changes and are left out.
    """
    old_key = lambda f: (f.code, f.step, f.feature)  # noqa: E731
    new_key = lambda f: (f.code, new_to_old_step.get(f.step, f.step), f.feature)  # noqa: E731
    old, new = ([f for f in flags if f.code != "gas-hazard"] for flags in (old, new))
    old_keys, new_keys = {old_key(f) for f in old}, {new_key(f) for f in new}
    introduced = [f for f in new if new_key(f) not in old_keys]
    remaining = [f for f in new if new_key(f) in old_keys]
    resolved = [f for f in old if old_key(f) not in new_keys]
    return introduced, resolved, remaining


def _side(ev: Evaluation) -> dict:
    return {"source_file": ev.source_file, "source_sha256": ev.source_sha256, **ev.recipe}
