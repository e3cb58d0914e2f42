"""Recipe files (TOML, format 1) -> validated :class:`Recipe` objects in SI units.

The loader walks the whole document and collects every problem before it gives up, so one run
lists everything wrong with a file. Problems are reported by field path: ``step[2].gases.SiH5``
(array indices count from 1, as an engineer counts steps in the file).
"""

from __future__ import annotations

import datetime
import difflib
import hashlib
import math
import re
import tomllib
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from .errors import Collector, InputError, Problem
from .plasma import Plasma
from .gases import GAS_FIELDS, HAZARD_CLASSES, Gas, GasTable, gas_from_row, shipped_table
from .physics.regimes import RegimeBounds
from .units import UnitProblem, parse_quantity

FORMAT_VERSION = 1
MAX_FILE_BYTES = 2_000_000
MAX_ASPECT_RATIO = 1000.0   # depth over width as drawn; deeper is not a wafer feature
PROCESSES = ("deposition", "etch", "ald-pulse", "purge", "soak", "other")
FEATURE_SHAPES = ("trench", "via")

#: Plausibility limits (SI, inclusive) that catch unit slips such as "2 m" for "2 um" and values no
#: chamber runs: name -> (lowest, highest, the range in words). Deliberately wide.
LIMITS: dict[str, tuple[float, float, str]] = {
    "pressure": (1e-7, 1.0e6, "1e-7 Pa to 10 bar"),
    "temperature": (10.0, 2500.0, "10 K to 2500 K"),
    "duration": (1e-9, 1.0e6, "1 ns to 1e6 s (11.6 days)"),
    "feature_length": (1e-10, 1.0e-2, "1 angstrom to 10 mm"),
    "film": (0.0, 1.0e-5, "0 to 10 um per step"),
    "etch_depth": (0.0, 1.0e-3, "0 to 1 mm per step"),
    "flow": (0.0, 1.0, "0 to 1 mol/s (about 1300 slm)"),
    "volume": (1e-6, 100.0, "1 mL to 100 m^3"),
    "chamber_length": (1e-5, 10.0, "10 um to 10 m"),
    "pump_speed": (1e-6, 1.0e3, "1 mL/s to 1000 m^3/s"),
    "electron_density": (1e6, 1e22, "1e6 to 1e22 m^-3 (1 to 1e16 cm^-3)"),
    "electron_temperature": (0.05, 100.0, "0.05 eV to 100 eV"),
    "sheath_voltage": (1.0, 1e5, "1 V to 100 kV"),
    "cross_section": (1e-22, 1e-16, "1e-22 to 1e-16 m^2"),
    "site_density": (1e15, 1e21, "1e15 to 1e21 m^-2"),
}

#: Plausible ranges of the numbers of a [gases.NAME] row: field -> (lowest, highest).
GAS_ROW_LIMITS = {"molar_mass_g_mol": (1.0, 2000.0), "lj_sigma_A": (1.0, 20.0),
                  "lj_epsilon_K": (1.0, 5000.0)}


@dataclass(frozen=True)
class Feature:
    """A trench or via on the wafer, as drawn before the first step [m]."""

    id: str
    name: str
    shape: str
    width_m: float
    depth_m: float
    bottom_width_m: float | None = None


@dataclass(frozen=True)
class Step:
    """One recipe step in SI units; ``flows_mol_s`` keeps the file's gas order."""

    name: str
    process: str
    duration_s: float
    pressure_Pa: float
    temperature_K: float
    flows_mol_s: tuple[tuple[str, float], ...]
    reactant: str
    sticking: float
    film_m: float
    etch_depth_m: float
    feature_ids: tuple[str, ...]
    plasma: Plasma | None = None

    @property
    def mole_fractions(self) -> dict[str, float]:
        total = sum(f for _, f in self.flows_mol_s)
        return {g: f / total for g, f in self.flows_mol_s}

    @property
    def total_flow_mol_s(self) -> float:
        return sum(f for _, f in self.flows_mol_s)


@dataclass(frozen=True)
class Chamber:
    volume_m3: float
    gap_m: float | None
    pump_speed_m3_s: float | None
    path: tuple = ()          # of physics.conductance.PathElement
    wall_temperature_K: float | None = None   # gas in the chamber and path; None: the step's


@dataclass(frozen=True)
class Settings:
    bounds: RegimeBounds = RegimeBounds()
    site_density_m2: float | None = None    # None: the exposure model's documented default
    coverage_warning: float = 0.5           # bottom_flux_ratio below this: warning
    coverage_critical: float = 0.1          # below this: critical
    residence_times: float = 3.0            # a step should last this many residence times
    neutral_starved_ratio: float = 2.0      # ion/neutral at the bottom over the top: warning


@dataclass(frozen=True)
class Recipe:
    source_file: str
    source_sha256: str
    name: str
    revision: str
    description: str
    features: tuple[Feature, ...]
    steps: tuple[Step, ...]
    gases: GasTable
    chamber: Chamber | None = None
    settings: Settings = field(default_factory=Settings)

    def feature(self, feature_id: str) -> Feature:
        return next(f for f in self.features if f.id == feature_id)


# --------------------------------------------------------------------------------------------
# the walk


class _Walker:
    """Reads one section with a shared error collector; every getter returns None on error."""

    def __init__(self, errors: Collector):
        self.errors = errors

    def keys(self, table: dict, path: str, allowed: tuple[str, ...]) -> None:
        for key in table:
            if key not in allowed:
                hint = difflib.get_close_matches(key, allowed, n=1)
                more = f"; did you mean {hint[0]!r}?" if hint else f"; allowed: {', '.join(allowed)}"
                self.errors.add(_join(path, key), "unknown key" + more)

    def table(self, doc: dict, key: str, path: str, required: bool = False) -> dict | None:
        value = doc.get(key)
        if value is None:
            if required:
                self.errors.add(_join(path, key), "missing section")
            return None
        if not isinstance(value, dict):
            self.errors.add(_join(path, key), f"expected a table, got {_kind(value)}")
            return None
        return value

    def text(self, doc: dict, key: str, path: str, required: bool = False,
             default: str | None = None, choices: tuple[str, ...] | None = None) -> str | None:
        value = doc.get(key)
        where = _join(path, key)
        if value is None:
            if required:
                self.errors.add(where, "missing (required text)")
            return default
        if not isinstance(value, str):
            self.errors.add(where, f"expected text in quotes, got {_kind(value)}")
            return None
        if choices is not None and value not in choices:
            hint = difflib.get_close_matches(value, choices, n=1)
            more = f"; did you mean {hint[0]!r}?" if hint else ""
            self.errors.add(where, f"expected one of {', '.join(choices)}, got {value!r}{more}")
            return None
        return value

    def number(self, doc: dict, key: str, path: str, default: float, lo: float, hi: float
               ) -> float | None:
        value = doc.get(key, default)
        where = _join(path, key)
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            self.errors.add(where, f"expected a plain number from {lo:g} to {hi:g}, "
                                   f"got {_kind(value)}")
            return None
        if not (math.isfinite(value) and lo <= value <= hi):
            self.errors.add(where, f"expected a number from {lo:g} to {hi:g}, got {value!r}")
            return None
        return float(value)

    def quantity(self, doc: dict, key: str, path: str, kind: str, *, required: bool = False,
                 default: float | None = None, allow_zero: bool = False,
                 limit: str | None = None) -> float | None:
        where = _join(path, key)
        if key not in doc:
            if required:
                self.errors.add(where, f"missing (required {kind})")
            return default
        return self.value(doc[key], where, kind, allow_zero=allow_zero, limit=limit)

    def value(self, raw: Any, where: str, kind: str, *, allow_zero: bool = False,
              limit: str | None = None) -> float | None:
        try:
            si = parse_quantity(raw, kind)
        except UnitProblem as exc:
            self.errors.add(where, str(exc))
            return None
        if si < 0 or (si == 0 and not allow_zero):
            bound = "zero or more" if allow_zero else "more than zero"
            what = "absolute zero or below" if kind == "temperature" else "not allowed"
            self.errors.add(where, f"expected {bound}, got {raw!r} ({what})")
            return None
        lo, hi, words = LIMITS.get(limit or kind, (0.0, math.inf, ""))
        if si > hi or 0 < si < lo:
            side = "beyond" if si > hi else "below"
            self.errors.add(where, f"{raw!r} is {side} the plausible range for this field "
                                   f"({words}); check the unit")
            return None
        return si


def _join(path: str, key: str) -> str:
    return f"{path}.{key}" if path else key


_TYPE_WORDS = {float: "number", str: "text", list: "array of text", bool: "true/false"}


def _kind(value: Any) -> str:
    names = {bool: "true/false", int: "the number", float: "the number", str: "text",
             list: "an array", dict: "a table"}
    if isinstance(value, (datetime.date, datetime.time)):
        return f"a TOML date/time {value.isoformat()}"
    if isinstance(value, (dict, list)) and not value:
        return "an empty " + ("table" if isinstance(value, dict) else "array")
    shown = repr(value)
    if len(shown) > 40:
        shown = shown[:37] + "..."
    return f"{names.get(type(value), type(value).__name__)} {shown}"


# --------------------------------------------------------------------------------------------
# sections

TOP_KEYS = ("format", "recipe", "chamber", "feature", "step", "gases", "settings")
RECIPE_KEYS = ("name", "revision", "description")
FEATURE_KEYS = ("id", "name", "shape", "width", "depth", "bottom_width")
STEP_KEYS = ("name", "process", "duration", "pressure", "temperature", "gases", "reactant",
             "sticking", "film", "etch_depth", "features", "plasma")
PLASMA_KEYS = ("electron_density", "electron_temperature", "sheath_voltage", "ion",
               "ion_cross_section")
CHAMBER_KEYS = ("volume", "gap", "pump_speed", "path", "wall_temperature")
SETTINGS_KEYS = ("continuum_max", "slip_max", "transition_max", "site_density",
                 "coverage_warning", "coverage_critical", "residence_times",
                 "neutral_starved_ratio")

#: element shape -> (required length fields, optional length fields)
PATH_SHAPES: dict[str, tuple[tuple[str, ...], tuple[str, ...]]] = {
    "tube": (("diameter", "length"), ()),
    "aperture": ((), ("diameter", "width", "height")),
    "duct": (("width", "height", "length"), ()),
    "annulus": (("outer_diameter", "inner_diameter", "length"), ()),
}


def _load_gases(w: _Walker, doc: dict, rejected: set[str]) -> dict[str, Gas]:
    """The recipe's own [gases.NAME] rows; names of rows with errors go into ``rejected``."""
    table = w.table(doc, "gases", "")
    if not table:
        return {}
    out = {}
    for key, row in table.items():
        path = f"gases.{key}"
        if not isinstance(row, dict):
            w.errors.add(path, f"expected a table of gas properties, got {_kind(row)}")
            continue
        w.keys(row, path, tuple(GAS_FIELDS))
        ok = True
        for name, (typ, required) in GAS_FIELDS.items():
            if name not in row:
                if required:
                    w.errors.add(_join(path, name), f"missing (required {_TYPE_WORDS[typ]})")
                    ok = False
                continue
            value = row[name]
            lo, hi = GAS_ROW_LIMITS.get(name, (0.0, math.inf))
            good = (isinstance(value, (int, float)) and not isinstance(value, bool)
                    and math.isfinite(value) and lo < value <= hi) if typ is float \
                else isinstance(value, typ)
            if typ is list and good:
                good = all(isinstance(v, str) for v in value)
            if not good:
                want = {float: f"a number from {lo:g} to {hi:g}", list: "an array of text",
                        bool: "true or false", str: "text"}[typ]
                w.errors.add(_join(path, name), f"expected {want}, got {_kind(value)}")
                ok = False
        hazards = row.get("hazards", [])
        bad = [h for h in hazards if h not in HAZARD_CLASSES] if isinstance(hazards, list) else []
        if bad:
            w.errors.add(_join(path, "hazards"),
                         f"unknown hazard class {bad[0]!r}; use {', '.join(HAZARD_CLASSES)}")
            ok = False
        if ok:
            out[key] = gas_from_row(key, row)
        else:
            rejected.add(key)
    return out


def _load_settings(w: _Walker, doc: dict) -> Settings:
    s = w.table(doc, "settings", "")
    if s is None:
        return Settings()
    w.keys(s, "settings", SETTINGS_KEYS)
    d = Settings()
    b = d.bounds
    c = w.number(s, "continuum_max", "settings", b.continuum_max, 1e-6, 1e3)
    sl = w.number(s, "slip_max", "settings", b.slip_max, 1e-6, 1e3)
    t = w.number(s, "transition_max", "settings", b.transition_max, 1e-6, 1e3)
    if None not in (c, sl, t) and not c < sl < t:
        w.errors.add("settings", "regime bounds must rise: continuum_max < slip_max < "
                                 "transition_max")
    cw = w.number(s, "coverage_warning", "settings", d.coverage_warning, 0.0, 1.0)
    cc = w.number(s, "coverage_critical", "settings", d.coverage_critical, 0.0, 1.0)
    if None not in (cw, cc) and cc > cw:
        w.errors.add("settings.coverage_critical", "must not exceed coverage_warning")
    rt = w.number(s, "residence_times", "settings", d.residence_times, 0.0, 100.0)
    ns = w.number(s, "neutral_starved_ratio", "settings", d.neutral_starved_ratio, 1.0, 1e3)
    sd = w.quantity(s, "site_density", "settings", "areal_density", limit="site_density")
    if None in (c, sl, t, cw, cc, rt, ns):
        return d
    return Settings(RegimeBounds(c, sl, t), sd, cw, cc, rt, ns)


def _entries(w: _Walker, raw: Any, name: str, keys: tuple[str, ...] | None = None):
    """Yield ``(path, table)`` for each entry of an array of tables ``[[name]]``, reporting a
    non-array and non-table entries (and, with ``keys``, unknown keys) as it goes."""
    if not isinstance(raw, list):
        w.errors.add(name, f"expected [[{name}]] entries (an array of tables)")
        return
    for i, entry in enumerate(raw, start=1):
        path = f"{name}[{i}]"
        if not isinstance(entry, dict):
            w.errors.add(path, f"expected a table, got {_kind(entry)}")
            continue
        if keys is not None:
            w.keys(entry, path, keys)
        yield path, entry


def _load_features(w: _Walker, doc: dict) -> list[Feature]:
    features, seen = [], set()
    for path, f in _entries(w, doc.get("feature", []), "feature", FEATURE_KEYS):
        fid = w.text(f, "id", path, required=True)
        if fid is not None:
            if fid in seen:
                w.errors.add(_join(path, "id"), f"duplicate feature id {fid!r}")
            seen.add(fid)
        name = w.text(f, "name", path, default=fid)
        shape = w.text(f, "shape", path, required=True, choices=FEATURE_SHAPES)
        width = w.quantity(f, "width", path, "length", required=True, limit="feature_length")
        depth = w.quantity(f, "depth", path, "length", required=True, limit="feature_length")
        bottom = w.quantity(f, "bottom_width", path, "length", limit="feature_length")
        if width is not None and depth is not None and depth / width > MAX_ASPECT_RATIO:
            w.errors.add(_join(path, "depth"), f"aspect ratio {depth / width:.3g} (depth over "
                         f"width) is beyond {MAX_ASPECT_RATIO:g}; check the units of width and "
                         "depth")
            depth = None
        if bottom is not None and width is not None and bottom > width:
            w.errors.add(_join(path, "bottom_width"), "expected at most the top width "
                         "(re-entrant profiles are not modelled)")
            bottom = None
        if None not in (fid, shape, width, depth):
            features.append(Feature(fid, name or fid, shape, width, depth, bottom))
    return features


def _default_reactant(flows: dict[str, float], table: GasTable) -> str:
    active = {g: f for g, f in flows.items() if f > 0 and not table.get(g).inert}
    if active:
        return min(active, key=lambda g: (active[g], g))
    return max(flows, key=lambda g: (flows[g], g))


def _load_flows(w: _Walker, s: dict, path: str, table: GasTable,
                rejected: set[str]) -> dict[str, float] | None:
    gases = s.get("gases")
    where = _join(path, "gases")
    if gases is None:
        w.errors.add(where, 'missing (required gas flows, e.g. gases = { N2 = "400 sccm" })')
        return None
    if not isinstance(gases, dict) or not gases:
        w.errors.add(where, f'expected a table of flows such as {{ N2 = "400 sccm" }}, '
                            f"got {_kind(gases)}")
        return None
    flows, ok = {}, True
    for gas, raw in gases.items():
        gpath = _join(where, gas)
        if not gas.strip():
            w.errors.add(where, "a gas with an empty name")
            ok = False
            continue
        if gas in rejected:      # its [gases] row already has an error message
            ok = False
            continue
        if gas not in table:
            hint = table.suggest(gas)
            more = f"; did you mean {' or '.join(hint)}?" if hint else (
                "; add it under [gases." + gas + "] or see `chamberchk gases`")
            w.errors.add(gpath, "unknown gas" + more)
            ok = False
            continue
        flow = w.value(raw, gpath, "flow", allow_zero=True)
        if flow is None:
            ok = False
            continue
        key = table.get(gas).key
        flows[key] = flows.get(key, 0.0) + flow
    if ok and sum(flows.values()) <= 0:
        w.errors.add(where, "the flows add up to zero; at least one gas must flow")
        ok = False
    return flows if ok else None


def _load_steps(w: _Walker, doc: dict, table: GasTable, feature_ids: list[str],
                rejected: set[str]) -> list[Step]:
    raw = doc.get("step")
    if raw is None:
        w.errors.add("step", "missing: a recipe needs at least one [[step]]")
        return []
    if isinstance(raw, list) and not raw:
        w.errors.add("step", "expected [[step]] entries (an array of tables)")
        return []
    steps, seen = [], set()
    for path, s in _entries(w, raw, "step", STEP_KEYS):
        name = w.text(s, "name", path, required=True)
        if name is not None:
            if name in seen:
                w.errors.add(_join(path, "name"), f"duplicate step name {name!r} (names identify "
                             "steps in reports, comparisons and --sweep)")
            seen.add(name)
        process = w.text(s, "process", path, default="other", choices=PROCESSES)
        duration = w.quantity(s, "duration", path, "time", required=True, limit="duration")
        pressure = w.quantity(s, "pressure", path, "pressure", required=True)
        temperature = w.quantity(s, "temperature", path, "temperature", required=True)
        sticking = w.number(s, "sticking", path, 0.0, 0.0, 1.0)
        film = w.quantity(s, "film", path, "length", default=0.0, allow_zero=True,
                          limit="film")
        etch = w.quantity(s, "etch_depth", path, "length", default=0.0, allow_zero=True,
                          limit="etch_depth")
        flows = _load_flows(w, s, path, table, rejected)
        reactant = w.text(s, "reactant", path)
        if reactant is not None and flows is not None:
            key = table.get(reactant).key if reactant in table else None
            if key not in flows:
                hint = difflib.get_close_matches(reactant, list(flows), n=1)
                more = f"; did you mean {hint[0]!r}?" if hint else ""
                w.errors.add(_join(path, "reactant"),
                             f"{reactant!r} is not among the step's gases ({', '.join(flows)})"
                             + more)
                reactant = None
            else:
                reactant = key
        elif flows is not None and "reactant" not in s:
            reactant = _default_reactant(flows, table)
        ids = _step_features(w, s, path, feature_ids)
        plasma = _load_plasma(w, s, path, table, flows)
        if None in (name, process, duration, pressure, temperature, sticking, film, etch, flows,
                    reactant, ids) or plasma is False:
            continue
        steps.append(Step(name, process, duration, pressure, temperature, tuple(flows.items()),
                          reactant, sticking, film, etch, ids, plasma))
    return steps


def _load_plasma(w: _Walker, s: dict, path: str, table: GasTable,
                 flows: dict[str, float] | None) -> Plasma | None | bool:
    """The optional ``[step.plasma]`` block; False when it has errors."""
    p = w.table(s, "plasma", path)
    if p is None:
        return False if "plasma" in s else None
    where = _join(path, "plasma")
    w.keys(p, where, PLASMA_KEYS)
    n = w.quantity(p, "electron_density", where, "density", required=True,
                   limit="electron_density")
    te = w.quantity(p, "electron_temperature", where, "energy_eV", required=True,
                    limit="electron_temperature")
    v0 = w.quantity(p, "sheath_voltage", where, "voltage", required=True,
                    limit="sheath_voltage")
    sigma = w.quantity(p, "ion_cross_section", where, "area", limit="cross_section")
    ion = w.text(p, "ion", where)
    ok = None not in (n, te, v0) and ("ion_cross_section" not in p or sigma is not None)
    if ion is not None:
        key = table.get(ion).key if ion in table else None
        if flows is not None and key not in flows:
            w.errors.add(_join(where, "ion"), f"{ion!r} is not among the step's gases")
            ok = False
        ion = key
    elif "ion" in p:
        ok = False
    return Plasma(n, te, v0, ion, sigma) if ok else False


def _step_features(w: _Walker, s: dict, path: str, feature_ids: list[str]
                   ) -> tuple[str, ...] | None:
    if "features" not in s:
        return tuple(feature_ids)
    ids = s["features"]
    where = _join(path, "features")
    if not isinstance(ids, list) or not all(isinstance(x, str) for x in ids):
        w.errors.add(where, f'expected an array of feature ids such as ["dt"], got {_kind(ids)}')
        return None
    missing = [x for x in ids if x not in feature_ids]
    for x in missing:
        hint = difflib.get_close_matches(x, feature_ids, n=1)
        more = f"; did you mean {hint[0]!r}?" if hint else (
            f"; defined: {', '.join(feature_ids) or 'none'}")
        w.errors.add(where, f"no feature with id {x!r}{more}")
    return None if missing else tuple(dict.fromkeys(ids))


def _load_chamber(w: _Walker, doc: dict) -> Chamber | None:
    c = w.table(doc, "chamber", "")
    if c is None:
        return None
    w.keys(c, "chamber", CHAMBER_KEYS)
    volume = w.quantity(c, "volume", "chamber", "volume", required=True)
    gap = w.quantity(c, "gap", "chamber", "length", limit="chamber_length")
    speed = w.quantity(c, "pump_speed", "chamber", "speed", limit="pump_speed")
    wall = w.quantity(c, "wall_temperature", "chamber", "temperature")
    raw_path = c.get("path", [])
    entries = list(_entries(w, raw_path, "chamber.path"))
    elements = [_load_element(w, e, path) for path, e in entries]
    ok = None not in elements and len(entries) == len(raw_path) if isinstance(raw_path, list) \
        else False
    if raw_path and speed is None and "pump_speed" not in c:
        w.errors.add("chamber.pump_speed", "missing: a pumping path needs the pump's speed")
        ok = False
    if volume is None or not ok:
        return None
    return Chamber(volume, gap, speed, tuple(elements), wall)


def _load_element(w: _Walker, e: dict, path: str):
    from .physics.conductance import PathElement

    shape = w.text(e, "shape", path, required=True, choices=tuple(PATH_SHAPES))
    if shape is None:
        return None
    required, optional = PATH_SHAPES[shape]
    w.keys(e, path, ("shape",) + required + optional)
    dims = {k: w.quantity(e, k, path, "length", required=True, limit="chamber_length")
            for k in required}
    dims.update({k: w.quantity(e, k, path, "length", limit="chamber_length")
                 for k in optional if k in e})
    if any(v is None for v in dims.values()):
        return None
    if shape == "aperture" and not ("diameter" in dims) ^ ({"width", "height"} <= set(dims)):
        w.errors.add(path, "an aperture needs either diameter, or width and height")
        return None
    if shape == "annulus" and dims["inner_diameter"] >= dims["outer_diameter"]:
        w.errors.add(_join(path, "inner_diameter"), "expected less than outer_diameter")
        return None
    return PathElement(shape=shape, **{f"{k}_m": v for k, v in dims.items()})


# --------------------------------------------------------------------------------------------
# entry points

_TOML_POS = re.compile(r"\s*\(at line (\d+), column (\d+)\)\s*$")


def parse_document(data: bytes, source: str) -> dict:
    """Bytes -> TOML document, or :class:`InputError` for empty, binary or malformed input."""
    errors = Collector(source)
    if len(data) > MAX_FILE_BYTES:
        errors.add("", f"file is {len(data):,} bytes; a recipe is at most {MAX_FILE_BYTES:,}")
        errors.raise_if_any()
    if not data.strip():
        errors.add("", "file is empty; expected a TOML recipe (format = 1)")
        errors.raise_if_any()
    if data[:2] in (b"\xff\xfe", b"\xfe\xff"):
        errors.add("", "the file is UTF-16 text; save it as UTF-8 (TOML files are UTF-8)")
        errors.raise_if_any()
    try:
        text = data.decode("utf-8-sig")   # a UTF-8 byte-order mark (some editors write one) is fine
        if "\x00" in text:
            raise UnicodeDecodeError("utf-8", data, 0, 1, "NUL byte")
    except UnicodeDecodeError:
        if b"\x00" in data:
            errors.add("", "not a text file (expected UTF-8 TOML)")
        else:
            errors.add("", "not UTF-8 text (perhaps Latin-1 or a Windows code page); save the "
                           "file as UTF-8")
        errors.raise_if_any()
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        message = str(exc)
        pos = _TOML_POS.search(message)
        where = f"line {pos.group(1)}, column {pos.group(2)}" if pos else ""
        hint = ""
        if "key part" in message or "inline table" in message:
            hint = (" (inline tables { ... } must stay on one line in TOML 1.0, with no "
                    "trailing comma)")
        errors.add(where, "TOML syntax error: " + _TOML_POS.sub("", message) + hint)
        errors.raise_if_any()
    except RecursionError:
        errors.add("", "TOML nesting is too deep")
        errors.raise_if_any()
    raise AssertionError("unreachable")


def load_bytes(data: bytes, source: str, base_table: GasTable | None = None) -> Recipe:
    """Validate a recipe given as bytes; ``source`` names it in messages and in reports."""
    doc = parse_document(data, source)
    errors = Collector(source)
    w = _Walker(errors)
    w.keys(doc, "", TOP_KEYS)
    fmt = doc.get("format")
    if fmt is None:
        errors.add("format", f"missing; write `format = {FORMAT_VERSION}` at the top")
    elif fmt != FORMAT_VERSION or isinstance(fmt, bool):
        errors.add("format", f"expected {FORMAT_VERSION}, got {_kind(fmt)}")
    header = w.table(doc, "recipe", "") or {}
    w.keys(header, "recipe", RECIPE_KEYS)
    name = w.text(header, "name", "recipe", default=Path(source).stem)
    revision = w.text(header, "revision", "recipe", default="")
    description = w.text(header, "description", "recipe", default="")
    rejected: set[str] = set()
    table = (base_table or shipped_table()).with_overrides(_load_gases(w, doc, rejected))
    settings = _load_settings(w, doc)
    features = _load_features(w, doc)
    declared = [f.get("id") for f in doc.get("feature", []) if isinstance(f, dict)] \
        if isinstance(doc.get("feature", []), list) else []
    steps = _load_steps(w, doc, table, [d for d in declared if isinstance(d, str)], rejected)
    chamber = _load_chamber(w, doc)
    errors.raise_if_any()
    return Recipe(
        source_file=Path(source).name,
        source_sha256=hashlib.sha256(data).hexdigest(),
        name=name or Path(source).stem, revision=revision or "", description=description or "",
        features=tuple(features), steps=tuple(steps), gases=table, chamber=chamber,
        settings=settings)


def load_recipe(path: str | Path) -> Recipe:
    """Read and validate a recipe file; raises :class:`InputError` naming the file."""
    path = Path(path)
    try:
        data = path.read_bytes()
    except FileNotFoundError:
        raise InputError(str(path), [Problem("", "file not found")]) from None
    except IsADirectoryError:
        raise InputError(str(path), [Problem("", "is a folder, not a recipe file")]) from None
    except OSError as exc:
        raise InputError(str(path), [Problem("", f"cannot read: {exc.strerror}")]) from None
    return load_bytes(data, str(path))
