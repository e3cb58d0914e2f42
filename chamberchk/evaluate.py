"""Recipe -> Evaluation: gas kinetics per step, features followed through the steps, flags.

The evaluator is the only place that knows both recipes and physics. It converts nothing: the
recipe is already in SI floats, and the results are plain data for the writers.
"""

from __future__ import annotations

import tomllib
from dataclasses import dataclass, field
from functools import lru_cache
from importlib import resources

import numpy as np

from . import __version__
from .flags import Flag, raise_flag
from .physics import collision, kinetics
from .physics.regimes import crossing_pressures, knudsen_number, regime
from .recipe import Feature, Recipe, Step
from .chamber import ChamberResult, evaluate_chamber, mixture_molar_mass
from .plasma import SheathResult, evaluate_sheath, ion_bottom_fraction
from .transport import StepGas, feature_transport, molecular_diffusivity


@dataclass
class SpeciesResult:
    gas: str
    mole_fraction: float
    mean_speed_m_s: float
    viscosity_Pa_s: float
    mean_free_path_m: float


@dataclass
class FeatureResult:
    id: str
    name: str
    shape: str
    width_m: float
    depth_m: float
    bottom_width_m: float | None
    aspect_ratio: float
    knudsen_number: float
    regime: str
    closed: bool = False
    reactant_knudsen_number: float | None = None   # the reactant's own mean free path / width
    reactant_regime: str | None = None
    window_pressures_Pa: list[float] = field(default_factory=list)
    nearest_bound_factor: float | None = None
    nearest_bound: str | None = None
    transmission_probability: float | None = None
    knudsen_diffusivity_m2_s: float | None = None
    molecular_diffusivity_m2_s: float | None = None
    effective_diffusivity_m2_s: float | None = None
    fill_time_s: float | None = None
    fill_time_99_s: float | None = None
    bottom_flux_ratio: float | None = None
    bottom_flux_model: str | None = None
    required_exposure_Pa_s: float | None = None
    dose_margin: float | None = None
    ion_bottom_fraction: float | None = None
    ion_to_neutral_bottom_over_top: float | None = None


@dataclass
class StepResult:
    index: int
    name: str
    process: str
    duration_s: float
    pressure_Pa: float
    temperature_K: float
    reactant: str
    sticking: float
    film_m: float
    etch_depth_m: float
    species: list[SpeciesResult]
    mean_free_path_m: float
    viscosity_Pa_s: float
    features: list[FeatureResult]
    flags: list[Flag] = field(default_factory=list)
    plasma: SheathResult | None = None
    chamber: ChamberResult | None = None


@dataclass
class Evaluation:
    chamberchk_version: str
    source_file: str
    source_sha256: str
    recipe: dict
    steps: list[StepResult]
    flags: list[Flag]
    regime_bounds: list[float]
    feature_history: list[dict]
    models: list[dict]
    gas_cautions: list[dict]
    sweep: dict | None = None


CLOSED_BELOW_M = 1e-12


@dataclass
class _Geometry:
    """A feature's current shape; film narrows it, etching deepens it."""

    width_m: float
    depth_m: float
    bottom_width_m: float | None
    closed: bool = False            # the opening is shut: the feature leaves later steps
    v_groove: bool = False          # a tapered bottom has closed; the walls meet in a V

    @classmethod
    def of(cls, f: Feature) -> "_Geometry":
        return cls(f.width_m, f.depth_m, f.bottom_width_m)

    def grow(self, film_m: float, etch_depth_m: float) -> str | None:
        """Apply a step's conformal film (every wall) and etch; name what closed, if anything.

        A conformal film of thickness t narrows every width by 2t; the field and the bottom grow
        by the same t, so the depth measured from the field is unchanged. In a tapered feature
        narrowing towards the bottom the width falls linearly with depth, by
        ``(top - bottom) / depth`` per unit depth, and a film does not change that slope; once
        the bottom width reaches zero the walls meet where the width does, so the feature goes on
        as a V-groove that deep (``"bottom"``). A V-groove whose opening then shuts is full
        (``"filled"``); any other feature whose opening shuts traps a void (``"opening"``).
        Widths and depths are those of the model: a film on a sloped wall narrows the
        horizontal width by slightly more than 2t (1/cos of the wall angle), neglected here.
        """
        if self.closed:
            return None
        event = None
        slope = None
        if self.bottom_width_m is not None and self.bottom_width_m < self.width_m:
            slope = (self.width_m - self.bottom_width_m) / self.depth_m
        self.width_m -= 2.0 * film_m
        if self.bottom_width_m is not None:
            self.bottom_width_m -= 2.0 * film_m
        # below a hundredth of an angstrom a gap is shut (and float round-off of repeated
        # film subtraction would otherwise leave a 1e-24 m sliver)
        if self.width_m <= CLOSED_BELOW_M:
            self.closed = True
            event = "filled" if self.v_groove else "opening"
        elif self.bottom_width_m is not None and self.bottom_width_m <= CLOSED_BELOW_M:
            self.bottom_width_m = 0.0
            self.depth_m = self.width_m / slope
            event = None if self.v_groove else "bottom"
            self.v_groove = True
        self.depth_m += etch_depth_m
        return event


class _Recorder:
    """Collects the ids of the models the evaluation used, in first-use order."""

    def __init__(self) -> None:
        self.ids: dict[str, None] = {}

    def use(self, *ids: str) -> None:
        for i in ids:
            self.ids.setdefault(i, None)


def _species(step: Step, recipe: Recipe, rec: _Recorder, flags: list[Flag],
             temperature_K: float | None = None) -> tuple[list[SpeciesResult], float, float]:
    """Each gas's figures in the step's mixture, the mixture mean free path and viscosity, at
    the step's temperature or at ``temperature_K`` (the chamber wall)."""
    t = step.temperature_K if temperature_K is None else temperature_K
    fractions = step.mole_fractions
    gases = [recipe.gases.get(g) for g in fractions]
    x = np.array(list(fractions.values()))
    m = np.array([g.molar_mass_kg_mol for g in gases])
    t_star = t / np.array([g.epsilon_K for g in gases])
    mu = np.atleast_1d(kinetics.viscosity(t, m, [g.sigma_m for g in gases],
                                          [g.epsilon_K for g in gases]))
    lam = kinetics.species_mean_free_paths(x, step.pressure_Pa, t, m, mu)
    v = np.atleast_1d(kinetics.mean_speed(t, m))
    rec.use("mean-speed", "viscosity-ce", "mfp-viscosity", "mfp-mixture")
    for g, ts in zip(gases, t_star):
        if not collision.in_range(ts):
            lo, hi = collision.T_STAR_RANGE
            flags.append(raise_flag(
                "model-range", f"{g.key}: reduced temperature T* = {ts:.3g} at {t:.4g} K is "
                f"outside the {lo:g}-{hi:g} range of the collision-integral fit", step=step.name))
    species = [SpeciesResult(g.key, float(xi), float(vi), float(mi), float(li))
               for g, xi, vi, mi, li in zip(gases, x, v, mu, lam)]
    mixture_mu = kinetics.mixture_viscosity(x, m, mu)
    if len(gases) > 1:
        rec.use("viscosity-wilke")
    return species, float(np.dot(x, lam)), mixture_mu


def evaluate(recipe: Recipe) -> Evaluation:
    """Evaluate every step of a validated recipe."""
    rec = _Recorder()
    rec.use("knudsen-regimes")
    geometry = {f.id: _Geometry.of(f) for f in recipe.features}
    last_regime: dict[str, tuple[str, str]] = {}
    all_flags: list[Flag] = []
    steps: list[StepResult] = []
    gases_used: dict[str, None] = {}
    bounds = recipe.settings.bounds
    for index, step in enumerate(recipe.steps, start=1):
        flags: list[Flag] = []
        species, lam, mu = _species(step, recipe, rec, flags)
        for g, _ in step.flows_mol_s:
            gases_used.setdefault(g, None)
        gas = _step_gas(step, recipe, species)
        sheath = _sheath(step, recipe, species, rec, flags) if step.plasma else None
        chamber = _chamber(step, recipe, lam, mu, gas, rec, flags) if recipe.chamber else None
        features = []
        for fid in step.feature_ids:
            feat, geo = recipe.feature(fid), geometry[fid]
            if geo.closed:
                continue
            kn = float(knudsen_number(lam, geo.width_m))
            fr = FeatureResult(fid, feat.name, feat.shape, geo.width_m, geo.depth_m,
                               geo.bottom_width_m, geo.depth_m / geo.width_m, kn,
                               regime(kn, bounds))
            _window(fr, step.pressure_Pa, bounds)
            _reactant_regime(fr, feat, step, species, bounds, flags)
            _transport(fr, feat, step, gas, recipe, rec, flags)
            if sheath is not None:
                _ions(fr, feat, step, sheath, recipe, flags)
            features.append(fr)
            prev = last_regime.get(fid)
            if prev is not None and prev[1] != fr.regime:
                flags.append(raise_flag(
                    "regime-shift", f"{feat.name}: {prev[1]} in step '{prev[0]}' -> {fr.regime} "
                    f"here (Kn = {kn:.3g})", step=step.name, feature=fid))
            last_regime[fid] = (step.name, fr.regime)
            event = geo.grow(step.film_m, step.etch_depth_m)
            if event is not None:
                fr.closed = event != "bottom"
                flags.append(_closure_flag(feat, geo, step, event))
        result = StepResult(index, step.name, step.process, step.duration_s, step.pressure_Pa,
                            step.temperature_K, step.reactant, step.sticking, step.film_m,
                            step.etch_depth_m, species, lam, mu, features, flags,
                            plasma=sheath, chamber=chamber)
        steps.append(result)
        all_flags.extend(flags)
    all_flags = _gas_flags(recipe, list(gases_used), rec) + all_flags
    return Evaluation(
        chamberchk_version=__version__, source_file=recipe.source_file,
        source_sha256=recipe.source_sha256,
        recipe={"name": recipe.name, "revision": recipe.revision,
                "description": recipe.description},
        steps=steps, flags=all_flags, regime_bounds=list(bounds.as_array()),
        feature_history=feature_history(recipe, steps),
        models=model_references(rec.ids),
        gas_cautions=_gas_cautions(recipe, list(gases_used)))


HISTORY_KEYS = ("width_m", "depth_m", "aspect_ratio", "knudsen_number", "regime",
                "fill_time_99_s", "bottom_flux_ratio")


def feature_history(recipe: Recipe, steps: list[StepResult]) -> list[dict]:
    """Each feature through the steps, and the steps where its transport changes most."""
    out = []
    for feat in recipe.features:
        rows = [{"step": s.name, "index": s.index, **{k: getattr(f, k) for k in HISTORY_KEYS}}
                for s in steps for f in s.features if f.id == feat.id]
        changes = {"regime": [b["step"] for a, b in zip(rows, rows[1:])
                              if a["regime"] != b["regime"]]}
        for key, label in (("fill_time_99_s", "fill_time"), ("bottom_flux_ratio", "coverage"),
                           ("aspect_ratio", "aspect_ratio")):
            pairs = [(abs(np.log(b[key] / a[key])), b["step"]) for a, b in zip(rows, rows[1:])
                     if a[key] and b[key] and a[key] > 0 and b[key] > 0]
            best = max(pairs, default=None, key=lambda t: t[0])
            changes[label] = None if best is None or best[0] < 1e-12 else {
                "step": best[1], "factor": float(np.exp(best[0]))}
        out.append({"id": feat.id, "name": feat.name, "shape": feat.shape, "rows": rows,
                    "largest_change": changes})
    return out


def model_references(ids) -> list[dict]:
    """The id, title and published reference of each model used, from data/references.toml."""
    table = _references()
    return [{"id": i, **table[i]} for i in ids]


@lru_cache(maxsize=1)
def _references() -> dict:
    text = resources.files("chamberchk").joinpath("data/references.toml").read_text("utf-8")
    return tomllib.loads(text)["model"]


def _gas_cautions(recipe: Recipe, gases_used: list[str]) -> list[dict]:
    out = []
    for key in gases_used:
        gas = recipe.gases.get(key)
        cautions = [recipe.gases.hazards[h].caution for h in gas.hazards
                    if h in recipe.gases.hazards]
        if gas.caution:
            cautions.append(gas.caution)
        out.append({"gas": key, "name": gas.name, "hazards": list(gas.hazards),
                    "cautions": cautions, "data_source": gas.source})
    return out


def _closure_flag(feat: Feature, geo: _Geometry, step: Step, event: str) -> Flag:
    """A feature that pinches off at its opening traps a void (critical); a tapered bottom that
    closes first leaves a V-groove that fills from the bottom up (info), and that V-groove's
    opening shutting is the end of the fill (info)."""
    film = f"the {step.film_m * 1e9:.3g} nm film of this step"
    where = dict(step=step.name, feature=feat.id)
    if event == "bottom":
        return raise_flag("feature-closes", f"{feat.name}: {film} closes the tapered feature at "
                          "its bottom while the opening stays open: it goes on as a V-groove "
                          f"{geo.depth_m * 1e9:.3g} nm deep and fills from the bottom up, no void "
                          "from this closure", severity="info", **where)
    if event == "filled":
        return raise_flag("feature-closes", f"{feat.name}: {film} closes the V-groove's opening: "
                          "filled from the bottom up, no void", severity="info", **where)
    return raise_flag("feature-closes", f"{feat.name}: {film} closes the feature at its "
                      "opening", **where)


BOUND_NAMES = ("continuum/slip", "slip/transition", "transition/free-molecular")


def _window(fr: FeatureResult, pressure_Pa: float, bounds) -> None:
    """Pressures where the feature's Kn meets each regime bound, and the nearest one as a factor
    (Kn p is constant for a fixed gas, temperature and width)."""
    pressures = crossing_pressures(pressure_Pa, fr.knudsen_number, bounds)
    factors = np.maximum(pressure_Pa / pressures, pressures / pressure_Pa)
    k = int(np.argmin(factors))
    fr.window_pressures_Pa = [float(p) for p in pressures]
    fr.nearest_bound_factor = float(factors[k])
    fr.nearest_bound = BOUND_NAMES[k]


def _reactant_regime(fr: FeatureResult, feat: Feature, step: Step,
                     species: list[SpeciesResult], bounds, flags: list[Flag]) -> None:
    """The reactant's own Knudsen number (its mean free path in the mixture over the width).

    Regime labels follow the mixture's mean free path (the mole-fraction mean of the species
    values); a heavy precursor diluted in a light carrier has a much shorter mean free path of
    its own, so its regime can differ. That is said with an info flag; diffusivities and fill
    times already use the reactant's own figures.
    """
    lam = next(g.mean_free_path_m for g in species if g.gas == step.reactant)
    fr.reactant_knudsen_number = float(knudsen_number(lam, fr.width_m))
    fr.reactant_regime = regime(fr.reactant_knudsen_number, bounds)
    if fr.reactant_regime != fr.regime:
        flags.append(raise_flag(
            "reactant-regime", f"{feat.name}: {step.reactant} alone has Kn "
            f"{fr.reactant_knudsen_number:.3g} ({fr.reactant_regime}), the mixture Kn "
            f"{fr.knudsen_number:.3g} ({fr.regime})", step=step.name, feature=feat.id))


def _step_gas(step: Step, recipe: Recipe, species: list[SpeciesResult]) -> StepGas:
    reactant = recipe.gases.get(step.reactant)
    fractions = step.mole_fractions
    partners = [(recipe.gases.get(g), x) for g, x in fractions.items() if g != step.reactant]
    speed = next(s.mean_speed_m_s for s in species if s.gas == step.reactant)
    d_m = molecular_diffusivity(reactant, partners, step.pressure_Pa, step.temperature_K)
    return StepGas(step.pressure_Pa, step.temperature_K, step.duration_s, step.process,
                   step.sticking, reactant, fractions[step.reactant], speed, d_m)


def _transport(fr: FeatureResult, feat: Feature, step: Step, gas: StepGas, recipe: Recipe,
               rec: _Recorder, flags: list[Flag]) -> None:
    """Fill the feature's transport fields and raise the transport flags."""
    settings = recipe.settings
    t = feature_transport(feat.shape, fr.width_m, fr.depth_m, fr.bottom_width_m,
                          fr.knudsen_number, gas, settings.bounds, settings.site_density_m2)
    rec.use(*t.models)
    for name in ("transmission_probability", "knudsen_diffusivity_m2_s",
                 "molecular_diffusivity_m2_s", "effective_diffusivity_m2_s", "fill_time_s",
                 "fill_time_99_s", "bottom_flux_ratio", "bottom_flux_model",
                 "required_exposure_Pa_s", "dose_margin"):
        setattr(fr, name, getattr(t, name))
    where = dict(step=step.name, feature=feat.id)
    for caution in t.cautions:
        flags.append(raise_flag("model-range", f"{feat.name}: {caution}", **where))
    if t.fill_time_99_s > step.duration_s:
        flags.append(raise_flag(
            "fill-slower-than-step", f"{feat.name}: {step.reactant} needs "
            f"{t.fill_time_99_s:.3g} s to reach 99 % at the bottom; the step lasts "
            f"{step.duration_s:.3g} s", **where))
    # An ALD pulse is self-limiting: the bottom flux ratio describes the bare surface at the
    # start of the pulse, and the walls saturate and pass the flux on; such a step is judged by
    # its dose margin (dose-short) instead.
    if step.process != "ald-pulse" and step.sticking > 0 and \
            t.bottom_flux_ratio < settings.coverage_warning:
        severity = "critical" if t.bottom_flux_ratio < settings.coverage_critical else "warning"
        flags.append(raise_flag(
            "poor-bottom-coverage", f"{feat.name}: bottom flux {100 * t.bottom_flux_ratio:.3g} % "
            f"of the opening's (sticking {step.sticking:g}, AR {fr.aspect_ratio:.3g}; thresholds "
            f"{100 * settings.coverage_warning:g} % warning, {100 * settings.coverage_critical:g}"
            " % critical)", severity=severity, **where))
    if t.dose_margin is not None and t.dose_margin < 1.0:
        flags.append(raise_flag(
            "dose-short", f"{feat.name}: {step.reactant} exposure is {t.dose_margin:.3g} times "
            f"the {t.required_exposure_Pa_s:.3g} Pa s needed to saturate it", **where))


def _chamber(step: Step, recipe: Recipe, lam: float, mu: float, gas: StepGas, rec: _Recorder,
             flags: list[Flag]) -> ChamberResult:
    settings = recipe.settings
    t_wall = recipe.chamber.wall_temperature_K
    lam_wall, mu_wall = (lam, mu) if t_wall is None else \
        _species(step, recipe, rec, flags, t_wall)[1:]
    c = evaluate_chamber(recipe.chamber, step.pressure_Pa,
                         step.temperature_K if t_wall is None else t_wall,
                         step.total_flow_mol_s, mixture_molar_mass(step.mole_fractions,
                                                                   recipe.gases),
                         mu_wall, lam_wall, lam, gas.molecular_diffusivity_m2_s, settings.bounds)
    rec.use("throughput")
    if c.path_conductance_m3_s is not None:
        rec.use("conductance-molecular", "conductance-viscous", "conductance-transition",
                "conductance-series")
    if c.effective_pump_speed_m3_s is not None:
        rec.use("pump-speed")
    where = dict(step=step.name)
    for caution in c.cautions:
        flags.append(raise_flag("model-range", f"chamber: {caution}", **where))
    if c.lowest_pressure_Pa is not None and step.pressure_Pa < c.lowest_pressure_Pa:
        flags.append(raise_flag(
            "pressure-unreachable", f"the step asks for {step.pressure_Pa:.3g} Pa but at "
            f"{c.total_flow_Pa_m3_s:.3g} Pa m3/s the pumping path cannot go below "
            f"{c.lowest_pressure_Pa:.3g} Pa", **where))
    n = settings.residence_times
    if c.residence_time_s is not None and step.duration_s < n * c.residence_time_s:
        flags.append(raise_flag(
            "short-residence", f"the step lasts {step.duration_s:.3g} s, less than {n:g} "
            f"residence times ({n:g} x {c.residence_time_s:.3g} s): after n residence times "
            f"a well-mixed chamber has exchanged all but exp(-n) of its gas (exp(-{n:g}) = "
            f"{100 * np.exp(-n):.2g} %)", **where))
    if c.peclet_number is not None and c.peclet_number > 1.0:
        flags.append(raise_flag(
            "gap-mixing", f"diffusion across the {recipe.chamber.gap_m * 1e3:.3g} mm gap takes "
            f"{c.gap_diffusion_time_s:.3g} s, {c.peclet_number:.3g} residence times", **where))
    return c


def _sheath(step: Step, recipe: Recipe, species: list[SpeciesResult], rec: _Recorder,
            flags: list[Flag]) -> SheathResult:
    plasma = step.plasma
    fractions = step.mole_fractions
    ion = plasma.ion
    if ion is None:
        inert = [g for g in fractions if recipe.gases.get(g).inert]
        ion = max(inert, key=lambda g: recipe.gases.get(g).molar_mass_kg_mol) if inert else \
            max(fractions, key=lambda g: (fractions[g], g))
    gas = recipe.gases.get(ion)
    mu = next(s.viscosity_Pa_s for s in species if s.gas == ion)
    d = float(kinetics.equivalent_diameter(mu, step.temperature_K, gas.molar_mass_kg_mol))
    result = evaluate_sheath(plasma, ion, gas.molar_mass_kg_mol, d, step.pressure_Pa,
                             step.temperature_K)
    rec.use("sheath-child", "ion-cross-sections", "ion-angles")
    for caution in result.cautions:
        flags.append(raise_flag("model-range", f"plasma: {caution}", step=step.name))
    if result.sheath_regime == "collisional":
        flags.append(raise_flag(
            "sheath-collisional", f"sheath {result.sheath_thickness_m * 1e3:.3g} mm is "
            f"{result.collisionality:.3g} ion mean free paths thick; ion spread about "
            f"{result.ion_angular_spread_deg:.2g} degrees", step=step.name))
    return result


def _ions(fr: FeatureResult, feat: Feature, step: Step, sheath: SheathResult, recipe: Recipe,
          flags: list[Flag]) -> None:
    """Ion flux at the bottom (line-of-sight shadowing) against the neutral flux there."""
    fr.ion_bottom_fraction = ion_bottom_fraction(fr.aspect_ratio, sheath.ion_angular_spread_deg,
                                                 feat.shape)
    if fr.bottom_flux_ratio is None or fr.bottom_flux_ratio <= 0:
        return
    fr.ion_to_neutral_bottom_over_top = fr.ion_bottom_fraction / fr.bottom_flux_ratio
    limit = recipe.settings.neutral_starved_ratio
    if step.process == "etch" and fr.ion_to_neutral_bottom_over_top > limit:
        flags.append(raise_flag(
            "neutral-starved", f"{feat.name}: at the bottom the ion-to-neutral flux ratio is "
            f"{fr.ion_to_neutral_bottom_over_top:.3g} times its value at the top (ions reach "
            f"{100 * fr.ion_bottom_fraction:.3g} %, {step.reactant} "
            f"{100 * fr.bottom_flux_ratio:.3g} %; threshold {limit:g})",
            step=step.name, feature=feat.id))


def _gas_flags(recipe: Recipe, gases_used: list[str], rec: _Recorder) -> list[Flag]:
    flags = []
    for key in gases_used:
        gas = recipe.gases.get(key)
        if gas.hazards:
            flags.append(raise_flag("gas-hazard", f"{key} ({gas.name}): "
                                    f"{', '.join(gas.hazards)}", feature=None))
        if gas.lj_estimated:
            rec.use("lj-estimate")
            flags.append(raise_flag("estimated-gas-data", f"{key} ({gas.name}): Lennard-Jones "
                                    "parameters are estimates"))
    return flags
