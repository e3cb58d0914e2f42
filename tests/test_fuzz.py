"""Property tests: the loader and the evaluator on generated recipes (hypothesis).

(a) ``load_bytes`` returns a :class:`Recipe` or raises :class:`InputError`, nothing else: for
    valid recipes (which it must accept), for valid recipes with random damage, and for bytes.
(b) A valid recipe evaluates without raising, and every float in the evaluation is finite (None
    is allowed). ``report.data.to_plain`` turns NaN and inf into None, so a walk over its output
    could not see them: the walk runs over the Evaluation object itself, the tree to_plain reads.

Recipes are built as Python dicts and written with tomli_w. "Valid" means inside the ranges an
engineer uses (the task's envelope, not the loader's wider plausibility limits): gases from the
shipped table, 1 mTorr to 760 Torr in assorted units, 0-900 degC, trenches and vias 10 nm-50 um
wide with aspect ratios 0.5-100, films, sticking 0-1, optional plasma, chamber, gas row, settings.

Runs are reproducible (derandomize, no example database) and sized for about a minute on 2 cores.
Shrinking is off by default because a known failure would be shrunk again on every CI run; set
CHAMBERCHK_FUZZ_SHRINK=1 to get a minimal example, CHAMBERCHK_FUZZ_SCALE=10 for a longer search.
"""

from __future__ import annotations

import dataclasses
import json
import math
import os

import numpy as np
import pytest
import tomli_w
from hypothesis import HealthCheck, Phase, given, settings
from hypothesis import strategies as st
from scipy import constants

from chamberchk.errors import InputError
from chamberchk.evaluate import evaluate
from chamberchk.gases import HAZARD_CLASSES, shipped_table
from chamberchk.recipe import PROCESSES, Recipe, load_bytes
from chamberchk.report.data import to_plain

_PHASES = (Phase.explicit, Phase.generate) + \
    ((Phase.shrink,) if os.environ.get("CHAMBERCHK_FUZZ_SHRINK") else ())
settings.register_profile(
    "chamberchk-fuzz", deadline=None, derandomize=True, database=None, phases=_PHASES,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
_SCALE = float(os.environ.get("CHAMBERCHK_FUZZ_SCALE", "1"))


def fuzz(max_examples: int) -> settings:
    return settings(settings.get_profile("chamberchk-fuzz"),
                    max_examples=max(1, round(max_examples * _SCALE)))


# --------------------------------------------------------------------------------------------
# valid recipes

GAS_KEYS = sorted(shipped_table().gases)
#: unit -> its size in SI; Torr from scipy.constants, the rest are SI prefixes
PRESSURE = {"Pa": 1.0, "kPa": 1e3, "mbar": 100.0, "Torr": constants.torr,
            "mTorr": 1e-3 * constants.torr}
LENGTH = {"nm": 1e-9, "um": 1e-6, "A": 1e-10, "mm": 1e-3}
TIME = {"s": 1.0, "ms": 1e-3, "min": 60.0}
FLOW_SCCM = {"sccm": 1.0, "slm": 1e3}


def log_uniform(lo: float, hi: float) -> st.SearchStrategy[float]:
    return st.floats(math.log10(lo), math.log10(hi)).map(lambda e: 10.0 ** e)


def quantity(lo: float, hi: float, units: dict[str, float]) -> st.SearchStrategy[str]:
    """A value between lo and hi (in the units' base), written in one of ``units``."""
    return st.builds(lambda v, u: f"{v / units[u]:.6g} {u}", log_uniform(lo, hi),
                     st.sampled_from(sorted(units)))


def temperature() -> st.SearchStrategy[str]:
    return st.floats(0.0, 900.0).flatmap(lambda c: st.sampled_from(
        [f"{c:.6g} degC", f"{c + constants.zero_Celsius:.6g} K"]))


def _si(text: str) -> float:
    """A length written by these strategies, back in metres."""
    number, unit = text.split()
    return float(number) * LENGTH[unit]


def maybe(strategy) -> st.SearchStrategy:
    return st.one_of(st.none(), strategy)


@st.composite
def features(draw, count: int) -> list[dict]:
    out = []
    for i in range(count):
        width = draw(log_uniform(10e-9, 50e-6))
        unit = draw(st.sampled_from(sorted(LENGTH)))
        f = {"id": f"f{i + 1}", "shape": draw(st.sampled_from(["trench", "via"])),
             "width": f"{width / LENGTH[unit]:.6g} {unit}",
             "depth": f"{width * draw(log_uniform(0.5, 100.0)) / LENGTH[unit]:.6g} {unit}"}
        taper = draw(maybe(st.floats(0.2, 0.99)))
        if taper is not None:
            f["bottom_width"] = f"{width * taper / LENGTH[unit]:.6g} {unit}"
        if draw(st.booleans()):
            f["name"] = draw(st.text(max_size=20))
        out.append(f)
    return out


@st.composite
def step(draw, feature_ids: list[str], extra_gas: str | None, liner_m: float) -> dict:
    """One step; ``liner_m`` is half the narrowest feature width, for films that nearly close
    a feature (the liner-then-dose sequence the tool exists to check)."""
    gases = draw(st.lists(st.sampled_from(GAS_KEYS), min_size=1, max_size=3, unique=True))
    if extra_gas is not None:
        gases.insert(0, extra_gas)
    flows = {}
    for i, gas in enumerate(gases):
        zero_ok = i > 0                       # the first gas flows, so the total is never zero
        sccm = draw(log_uniform(0.1, 5000.0) if not zero_ok else
                    st.one_of(st.just(0.0), log_uniform(0.1, 5000.0)))
        unit = draw(st.sampled_from(sorted(FLOW_SCCM)))
        flows[gas] = f"{sccm / FLOW_SCCM[unit]:.6g} {unit}"
    process = draw(st.sampled_from(PROCESSES))
    s = {"name": draw(st.text(min_size=1, max_size=20)), "process": process,
         "duration": draw(quantity(0.01, 600.0, TIME)),
         "pressure": draw(quantity(1e-3 * constants.torr, 760 * constants.torr, PRESSURE)),
         "temperature": draw(temperature()), "gases": flows}
    optional = {
        "reactant": st.sampled_from(gases),
        "sticking": st.floats(0.0, 1.0),
        "film": st.one_of(quantity(1e-11, 10e-9, LENGTH), st.floats(0.9, 0.9999).map(
            lambda f: f"{min(f * liner_m, 9.9e-6) / 1e-9:.6g} nm")),   # 10 um: loader's limit
        "etch_depth": quantity(1e-9, 1e-6, LENGTH),
        "features": st.lists(st.sampled_from(feature_ids), unique=True),
    }
    for key, strategy in optional.items():
        if draw(st.booleans()):
            s[key] = draw(strategy)
    if process == "etch" and draw(st.booleans()):
        s["plasma"] = {"electron_density": draw(quantity(1e14, 1e18, {"m^-3": 1.0,
                                                                      "cm^-3": 1e6})),
                       "electron_temperature": f"{draw(st.floats(1.0, 8.0)):.4g} eV",
                       "sheath_voltage": f"{draw(st.floats(10.0, 800.0)):.4g} V"}
        if draw(st.booleans()):
            s["plasma"]["ion"] = draw(st.sampled_from(gases))
    return s


@st.composite
def chamber(draw) -> dict:
    mm = {"mm": 1e-3}
    c = {"volume": draw(quantity(1.0, 100.0, {"L": 1.0})),
         "gap": draw(quantity(5e-3, 50e-3, mm)),
         "pump_speed": draw(quantity(10.0, 5000.0, {"L/s": 1.0}))}
    elements = {
        "tube": st.fixed_dictionaries({"diameter": quantity(0.02, 0.3, mm),
                                       "length": quantity(0.01, 1.0, mm)}),
        "aperture": st.fixed_dictionaries({"diameter": quantity(0.02, 0.3, mm)}),
        "duct": st.fixed_dictionaries({"width": quantity(0.02, 0.3, mm),
                                       "height": quantity(0.005, 0.05, mm),
                                       "length": quantity(0.01, 1.0, mm)}),
    }
    path = []
    for shape in draw(st.lists(st.sampled_from(sorted(elements)), max_size=3)):
        path.append({"shape": shape, **draw(elements[shape])})
    if path:
        c["path"] = path
    return c


GAS_ROW = st.fixed_dictionaries({
    "name": st.text(max_size=20),
    "molar_mass_g_mol": st.floats(2.0, 400.0),
    "lj_sigma_A": st.floats(2.0, 10.0),
    "lj_epsilon_K": st.floats(10.0, 1000.0),
    "source": st.text(max_size=20),
}, optional={"lj_estimated": st.booleans(), "inert": st.booleans(),
             "hazards": st.lists(st.sampled_from(HAZARD_CLASSES), unique=True)})


@st.composite
def regime_settings(draw) -> dict:
    low = draw(log_uniform(1e-4, 0.1))
    bounds = [low, low * draw(log_uniform(1.5, 50.0))]
    bounds.append(bounds[1] * draw(log_uniform(1.5, 50.0)))
    warning = draw(st.floats(0.0, 1.0))
    return {"continuum_max": bounds[0], "slip_max": bounds[1], "transition_max": bounds[2],
            "coverage_warning": warning, "coverage_critical": draw(st.floats(0.0, warning))}


@st.composite
def valid_recipes(draw, max_features: int = 3, max_steps: int = 3) -> dict:
    feats = draw(features(draw(st.integers(1, max_features))))
    ids = [f["id"] for f in feats]
    doc = {"format": 1,
           "recipe": {"name": draw(st.text(max_size=30)), "revision": draw(st.text(max_size=3))},
           "feature": feats}
    extra = None
    if draw(st.booleans()):
        extra = "FUZZGAS"
        doc["gases"] = {extra: draw(GAS_ROW)}
    liner = 0.5 * min(_si(f.get("bottom_width", f["width"])) for f in feats)
    doc["step"] = [draw(step(ids, extra if i == 0 else None, liner))
                   for i in range(draw(st.integers(1, max_steps)))]
    seen = set()
    for i, s in enumerate(doc["step"], start=1):      # step names must be unique
        while s["name"] in seen:
            s["name"] += f" #{i}"
        seen.add(s["name"])
    if draw(st.booleans()):
        doc["chamber"] = draw(chamber())
    if draw(st.booleans()):
        doc["settings"] = draw(regime_settings())
    return doc


# --------------------------------------------------------------------------------------------
# damaged recipes: a valid one with one to three random edits

JUNK = st.one_of(
    st.integers(-2 ** 63, 2 ** 63 - 1), st.floats(), st.booleans(), st.text(max_size=30),
    st.lists(st.integers(-5, 5), max_size=3), st.dictionaries(st.text(max_size=5),
                                                              st.integers(), max_size=2),
    st.dates(), st.sampled_from(["nan Torr", "-1 Torr", "1e999 Pa", "Torr", "", "5", "2 Torr Torr",
                                 "1 m**99", "0x10 sccm", "inf K", "1e-320 nm", "300 C", "-0 sccm"]))


def _locations(node, where=()):
    """Every (container path, key) in a nested dict/list document."""
    items = node.items() if isinstance(node, dict) else enumerate(node) \
        if isinstance(node, list) else ()
    for key, value in items:
        yield where, key
        yield from _locations(value, where + (key,))


def _negated(value):
    if isinstance(value, str) and value[:1].isdigit():
        return "-" + value
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        return -value if value else -1
    return value


@st.composite
def damaged_recipes(draw) -> dict:
    doc = draw(valid_recipes())
    for _ in range(draw(st.integers(1, 3))):
        where, key = draw(st.sampled_from(list(_locations(doc))))
        parent = doc
        for k in where:
            parent = parent[k]
        edit = draw(st.sampled_from(["drop", "swap", "negate", "insert"]))
        if edit == "drop":
            del parent[key]
        elif edit == "swap":
            parent[key] = draw(JUNK)
        elif edit == "negate":
            parent[key] = _negated(parent[key])
        elif isinstance(parent, dict):
            parent[draw(st.text(max_size=12))] = draw(JUNK)
        else:
            parent.insert(key, draw(JUNK))
    return doc


# --------------------------------------------------------------------------------------------
# checks

def load_or_input_error(data: bytes) -> Recipe | None:
    """The recipe, or None after an InputError with usable problems; anything else propagates."""
    try:
        recipe = load_bytes(data, "fuzz.toml")
    except InputError as exc:
        assert exc.problems, "InputError without problems"
        for p in exc.problems:
            assert isinstance(p.path, str) and isinstance(p.message, str) and p.message
        return None
    assert isinstance(recipe, Recipe)
    return recipe


def nonfinite(obj, where: str = "evaluation"):
    """Paths of every NaN or infinite float inside dataclasses, dicts, lists and arrays."""
    if dataclasses.is_dataclass(obj) and not isinstance(obj, type):
        for f in dataclasses.fields(obj):
            yield from nonfinite(getattr(obj, f.name), f"{where}.{f.name}")
    elif isinstance(obj, dict):
        for k, v in obj.items():
            yield from nonfinite(v, f"{where}[{k!r}]")
    elif isinstance(obj, (list, tuple)):
        for i, v in enumerate(obj):
            yield from nonfinite(v, f"{where}[{i}]")
    elif isinstance(obj, np.ndarray):
        for i, v in enumerate(obj.tolist() if obj.ndim else [obj.item()]):
            yield from nonfinite(v, f"{where}[{i}]")
    elif isinstance(obj, (float, np.floating)) and not math.isfinite(obj):
        yield f"{where} = {float(obj)!r}"


def test_nonfinite_walk_sees_what_to_plain_hides():
    """The walk itself: NaN and inf in a nested dataclass are found; to_plain shows None."""
    @dataclasses.dataclass
    class Inner:
        ok: float
        bad: list

    tree = {"a": Inner(1.0, [2.0, np.float64("inf"), np.array([0.5, np.nan])]), "b": None}
    assert list(nonfinite(tree)) == ["evaluation['a'].bad[1] = inf",
                                     "evaluation['a'].bad[2][1] = nan"]
    assert to_plain(tree)["a"]["bad"][1] is None      # why the walk cannot use to_plain's output


def _toml(doc: dict) -> bytes:
    return tomli_w.dumps(doc).encode("utf-8")


@fuzz(300)
@given(valid_recipes())
def test_valid_recipes_are_accepted(doc):
    data = _toml(doc)
    try:
        load_bytes(data, "fuzz.toml")
    except InputError as exc:
        raise AssertionError(f"a valid recipe was refused: {exc}\n{data.decode()}") from None


def assert_evaluates_to_finite_numbers(recipe: Recipe) -> None:
    evaluation = evaluate(recipe)
    bad = list(nonfinite(evaluation))
    assert not bad, "non-finite results:\n" + "\n".join(bad[:20])
    json.dumps(to_plain(evaluation), allow_nan=False)


@pytest.mark.filterwarnings("ignore::RuntimeWarning")   # the finiteness walk is the check
@fuzz(300)
@given(valid_recipes())
def test_valid_recipes_evaluate_to_finite_numbers(doc):
    assert_evaluates_to_finite_numbers(load_bytes(_toml(doc), "fuzz.toml"))


@pytest.mark.filterwarnings("ignore::RuntimeWarning")
@fuzz(400)
@given(damaged_recipes())
def test_damaged_recipes_are_refused_cleanly_or_evaluate(doc):
    """(a) on damaged recipes; a damage the loader accepts (a dropped optional key, a new name)
    leaves a recipe that must evaluate like any valid one."""
    recipe = load_or_input_error(_toml(doc))
    if recipe is not None:
        assert_evaluates_to_finite_numbers(recipe)


def test_gas_row_hazards_not_an_array_is_an_input_error():
    """Regression: found by test_damaged_recipes_are_refused_cleanly_or_evaluate (hazards = 0
    raised TypeError in recipe._load_gases); fixed in the loader, kept as an explicit case."""
    doc = {"format": 1,
           "feature": [{"id": "f1", "shape": "trench", "width": "100000 A", "depth": "100000 A"}],
           "gases": {"FUZZGAS": {"name": "", "molar_mass_g_mol": 2.0, "lj_sigma_A": 2.0,
                                 "lj_epsilon_K": 10.0, "source": "", "hazards": 0}},
           "step": [{"name": "0", "duration": "1 s", "pressure": "1 Pa",
                     "temperature": "0 degC", "gases": {"FUZZGAS": "1 sccm"}}]}
    assert load_or_input_error(_toml(doc)) is None


@pytest.mark.filterwarnings("ignore::RuntimeWarning")
def test_found_nearly_closed_trench_then_sticking_step():
    doc = {"format": 1,
           "recipe": {"name": "", "revision": ""},
           "feature": [{"id": "f1", "shape": "trench", "width": "100000 A", "depth": "100000 A"},
                       {"id": "f2", "shape": "trench", "width": "100 A", "depth": "100 A"}],
           "gases": {"FUZZGAS": {"name": "", "molar_mass_g_mol": 2.0, "lj_sigma_A": 2.0,
                                 "lj_epsilon_K": 10.0, "source": ""}},
           "step": [{"name": "0", "process": "etch", "duration": "0.0166667 min",
                     "pressure": "1 Pa", "temperature": "0 degC",
                     "gases": {"FUZZGAS": "1 sccm", "Ar": "0 sccm"},
                     "film": "4.6875 nm", "etch_depth": "10000 A"},
                    {"name": "1", "process": "deposition", "duration": "0.0166667 min",
                     "pressure": "1 Pa", "temperature": "0 degC", "gases": {"Ar": "1 sccm"},
                     "sticking": 1.0}]}
    recipe = load_bytes(_toml(doc), "fuzz.toml")
    assert_evaluates_to_finite_numbers(recipe)
    # found by the random search: a film leaves f2 0.625 nm wide and 1.01 um deep (AR 1616),
    # past the radiosity solver's limit; the evaluator must caution and fall back, not crash
    from chamberchk.evaluate import evaluate
    flags = evaluate(recipe).flags
    assert any(f.code == "model-range" and "beyond the 1000" in f.message for f in flags)


TOML_BITS = st.sampled_from([
    b"format = 1\n", b"[[step]]\n", b"[[feature]]\n", b'gases = { N2 = "1 sccm" }\n', b"[chamber]\n",
    b'pressure = "1 Torr"\n', b"[", b"]", b"{", b"}", b'"', b"=", b"\n", b"\x00", b"\xff", b"nan",
    b"[[chamber.path]]\n", b"[step.plasma]\n", b"[gases.X]\n", b"[settings]\n", b"x = [[[1]]]\n"])


@fuzz(300)
@given(st.one_of(st.binary(max_size=300), st.text(max_size=300).map(str.encode),
                 st.lists(TOML_BITS, max_size=30).map(b"".join)))
def test_arbitrary_bytes_load_or_raise_input_error(data):
    load_or_input_error(data)
