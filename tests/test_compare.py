"""Comparison of recipe revisions, process windows and sweeps (issue: change requests)."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest

from chamberchk.compare import compare, match_steps
from chamberchk.evaluate import evaluate
from chamberchk.recipe import load_bytes
from chamberchk.sweep import parse_spec, run_sweep

BASE = '''format = 1
[recipe]
name = "probe"
revision = "{rev}"
[[feature]]
id = "t"
name = "trench"
shape = "trench"
width = "150 nm"
depth = "600 nm"
'''


def step(name, pressure="1 Torr", duration="10 s", film="0 nm"):
    return (f'[[step]]\nname = "{name}"\nduration = "{duration}"\npressure = "{pressure}"\n'
            f'temperature = "400 degC"\ngases = {{ SiH4 = "50 sccm", N2 = "2 slm" }}\n'
            f'sticking = 0.01\nfilm = "{film}"\n')


def recipe(text, name="r.toml"):
    r = load_bytes(text.encode(), name)
    return r, evaluate(r)


def run(old_text, new_text):
    a, ea = recipe(old_text, "old.toml")
    b, eb = recipe(new_text, "new.toml")
    return compare(a, ea, b, eb)


def test_pressure_change_across_a_bound_is_named():
    # 1 Torr -> 300 Torr moves a 150 nm trench from free-molecular (Kn ~ 400) into transition
    c = run(BASE.format(rev="A") + step("dep"), BASE.format(rev="B") + step("dep", "300 Torr"))
    assert len(c.crossings) == 1
    x = c.crossings[0]
    assert (x["step"], x["feature"], x["old_regime"]) == ("dep", "t", "free-molecular")
    assert x["new_regime"] in ("transition", "slip")
    assert any(f.code == "regime-crossing" and f.severity == "warning" for f in c.flags)
    change = c.steps[0].input_changes
    assert [ch.field for ch in change] == ["pressure_Pa"]


def test_duration_only_change_crosses_nothing():
    c = run(BASE.format(rev="A") + step("dep"), BASE.format(rev="B") + step("dep", duration="20 s"))
    assert c.crossings == []
    assert not any(f.code == "regime-crossing" for f in c.flags)
    assert [ch.field for ch in c.steps[0].input_changes] == ["duration_s"]


def test_match_steps_by_name_then_position():
    # reordered names match by name; a renamed step in the same slot matches by position
    pairs = match_steps(["a", "b", "c", "d"], ["b", "a", "c2", "d", "e"])
    how = {(i, j): m for i, j, m in pairs}
    assert how[(1, 0)] == "name" and how[(0, 1)] == "name" and how[(3, 3)] == "name"
    assert how[(2, 2)] == "position"
    assert (None, 4, "added") in pairs
    pairs = match_steps(["a", "b", "c"], ["a", "c"])
    assert (1, None, "removed") in pairs


def test_renamed_and_added_steps_through_cli(tmp_path, cli):
    old = tmp_path / "rev-a.toml"
    new = tmp_path / "rev-b.toml"
    old.write_text(BASE.format(rev="A") + step("dep one") + step("dep two"), encoding="utf-8")
    new.write_text(BASE.format(rev="B") + step("dep two") + step("first dep") + step("extra"),
                   encoding="utf-8")
    out = tmp_path / "out"
    r = cli("compare", old, new, "--out", out, "--format", "json,html")
    assert r.returncode == 0, r.stderr
    doc = json.loads((out / "rev-a__rev-b.json").read_text())
    matches = {(s["old_name"], s["new_name"]): s["match"] for s in doc["steps"]}
    assert matches[("dep two", "dep two")] == "name"
    assert matches[("dep one", "first dep")] == "position"
    assert matches[(None, "extra")] == "added"
    assert "rev-a__rev-b.html" in {p.name for p in out.iterdir()}
    # --fail-on warning turns a crossing into exit 1
    new.write_text(BASE.format(rev="B") + step("dep one", "300 Torr") + step("dep two"),
                   encoding="utf-8")
    r = cli("compare", old, new, "--out", out, "--fail-on", "warning")
    assert r.returncode == 1 and "1 regime crossing" in r.stderr


def test_flags_matched_by_code_step_and_feature(tmp_path, cli):
    """A flag is the same concern in both revisions when code, (matched) step and feature agree,
    even if its numbers moved: a renamed step keeps its flag, a fixed step clears it, an added
    step introduces one. Fill time of this trench at 1 Torr is about 18 ns, so 10 ns and 5 ns
    steps raise fill-slower-than-step and a 10 s step does not."""
    old = BASE.format(rev="A") + step("a", duration="10 ns") + step("b", duration="10 ns")
    new = (BASE.format(rev="B") + step("a renamed", duration="5 ns") + step("b", duration="10 s")
           + step("c", duration="10 ns"))
    c = run(old, new)
    where = lambda flags: [(f.code, f.step) for f in flags]  # noqa: E731
    assert where(c.remaining_flags) == [("fill-slower-than-step", "a renamed")]
    assert where(c.resolved_flags) == [("fill-slower-than-step", "b")]
    assert where(c.flags) == [("fill-slower-than-step", "c")]
    # through the CLI: the summary names both, and the HTML lists the three groups
    (tmp_path / "old.toml").write_text(old, encoding="utf-8")
    (tmp_path / "new.toml").write_text(new, encoding="utf-8")
    r = cli("compare", tmp_path / "old.toml", tmp_path / "new.toml", "--out", tmp_path,
            "--format", "json,html", "--fail-on", "never")
    assert r.returncode == 0, r.stderr
    assert "worst new flag warning, worst flag kept from the old revision warning, 1 flag(s) " \
        "cleared" in r.stderr
    html = (tmp_path / "old__new.html").read_text(encoding="utf-8")
    for title in ("New flags in the new revision", "Flags the change clears",
                  "Flags present in both revisions"):
        assert title in html
    doc = json.loads((tmp_path / "old__new.json").read_text(encoding="utf-8"))
    assert [f["step"] for f in doc["resolved_flags"]] == ["b"]


def test_window_pressures_closed_form():
    """Kn p is constant (mean free path inversely proportional to pressure at fixed T and
    composition): the crossing pressure of a bound Kn_b is p Kn / Kn_b exactly."""
    wide = BASE.format(rev="A").replace('"150 nm"', '"2 um"')  # slip bound below 10 bar
    _, ev = recipe(wide + step("dep", "2 Torr"))
    f = ev.steps[0].features[0]
    p = ev.steps[0].pressure_Pa
    for p_b, kn_b in zip(f.window_pressures_Pa, ev.regime_bounds):
        assert p_b == pytest.approx(p * f.knudsen_number / kn_b, rel=1e-12)
    # and re-evaluating at a crossing pressure puts Kn on the bound to 1e-9
    for p_b, kn_b in zip(f.window_pressures_Pa[1:], ev.regime_bounds[1:]):  # below 10 bar
        torr = p_b / (101325 / 760)
        _, ev2 = recipe(wide + step("dep", f"{torr!r} Torr"))
        assert ev2.steps[0].features[0].knudsen_number == pytest.approx(kn_b, rel=1e-9)
    factors = [max(p / q, q / p) for q in f.window_pressures_Pa]
    assert f.nearest_bound_factor == pytest.approx(min(factors), rel=1e-12)


def test_sweep_is_monotonic_where_physics_says():
    r, _ = recipe(BASE.format(rev="A") + step("dep"))
    sw = run_sweep(r, parse_spec("dep:pressure=10 mTorr..700 Torr", 15))
    f = sw["features"][0]
    kn, fill, flux = (np.array(f[k], dtype=float) for k in ("knudsen_number", "fill_time_99_s",
                                                              "bottom_flux_ratio"))
    # Kn = lambda/w with lambda ~ 1/p: strictly decreasing with pressure
    assert np.all(np.diff(kn) < 0)
    # Bosanquet: 1/D = 1/D_K + 1/D_m with D_m ~ 1/p and D_K independent of p, so D and the fill
    # time's inverse fall monotonically as pressure rises
    assert np.all(np.diff(fill) > 0)
    # reaction-diffusion: a smaller D at the same wall loss gives less at the bottom; in the
    # free-molecular range the ballistic value is pressure-independent (non-increasing overall)
    assert np.all(np.diff(flux) <= 1e-12)
    assert sw["values_Pa"][0] == pytest.approx(10e-3 * 101325 / 760, rel=1e-9)


def test_temperature_sweep_and_bad_specs():
    r, _ = recipe(BASE.format(rev="A") + step("dep"))
    sw = run_sweep(r, parse_spec("1:temperature=100 degC..600 degC", 6))
    kn = sw["features"][0]["knudsen_number"]
    # at fixed pressure lambda grows with T (n falls as 1/T, the viscosity rises): Kn rises
    assert all(b > a for a, b in zip(kn, kn[1:]))
    for bad in ("dep:pressure=1 Torr", "dep:speed=1..2", "dep:pressure=5 Torr..1 Torr",
                "dep:pressure=1 m..2 m"):
        with pytest.raises(ValueError):
            parse_spec(bad, 10)


def test_sweep_through_cli_writes_charts(tmp_path, cli):
    path = tmp_path / "s.toml"
    path.write_text(BASE.format(rev="A") + step("dep"), encoding="utf-8")
    r = cli("check", path, "--sweep", "dep:pressure=0.1 Torr..100 Torr", "--sweep-points", "5",
            "--out", tmp_path / "o")
    assert r.returncode == 0, r.stderr
    doc = json.loads((tmp_path / "o" / "s.json").read_text())
    assert len(doc["sweep"]["values_Pa"]) == 5
    html = (tmp_path / "o" / "s.html").read_text()
    assert "Sweep of step 1: Knudsen number" in html
    r = cli("check", path, "--sweep", "nope:pressure=0.1 Torr..1 Torr", "--out", tmp_path / "o")
    assert r.returncode == 2 and "no step named or numbered 'nope'" in r.stderr


def test_feature_history_names_largest_change():
    _, ev = recipe(BASE.format(rev="A") + step("a", film="20 nm") + step("b", film="20 nm")
                   + step("c", "200 Torr"))
    hist = ev.feature_history[0]
    assert [row["step"] for row in hist["rows"]] == ["a", "b", "c"]
    assert hist["rows"][2]["width_m"] == pytest.approx(70e-9, rel=1e-9)
    assert hist["largest_change"]["regime"] == ["c"]
    assert hist["largest_change"]["aspect_ratio"]["step"] == "c"
    assert math.isclose(hist["largest_change"]["aspect_ratio"]["factor"], 110 / 70, rel_tol=1e-9)


def test_jobs_give_identical_output(tmp_path, demo_recipes):
    """--jobs 2 evaluates in a process pool; every report must be byte-identical to a serial run."""
    from conftest import run_cli

    a, b = tmp_path / "serial", tmp_path / "pool"
    files = [str(p) for p in demo_recipes]
    r1 = run_cli("check", *files, "--out", a, "--format", "json,toml,html", "-q",
                 "--fail-on", "never")
    r2 = run_cli("check", *files, "--out", b, "--format", "json,toml,html", "-q",
                 "--fail-on", "never", "--jobs", "2")
    assert r1.returncode == r2.returncode == 0, r1.stderr + r2.stderr
    names = sorted(p.name for p in a.iterdir())
    assert names == sorted(p.name for p in b.iterdir()) and len(names) == 3 * len(files)
    for name in names:
        assert (a / name).read_bytes() == (b / name).read_bytes(), name


def test_compare_report_has_window_chart(tmp_path, cli):
    old, new = tmp_path / "a.toml", tmp_path / "b.toml"
    old.write_text(BASE.format(rev="A") + step("dep"), encoding="utf-8")
    new.write_text(BASE.format(rev="B") + step("dep", "300 Torr"), encoding="utf-8")
    r = cli("compare", old, new, "--out", tmp_path / "o", "--format", "html")
    assert r.returncode == 0
    assert "Process window, old and new" in (tmp_path / "o" / "a__b.html").read_text()
