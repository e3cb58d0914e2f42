"""Every validation rule of the recipe loader, through the CLI as a user meets it.

Each case: exit code 2, a message `file: field.path: ...`, no traceback, and no report written for
the bad file while the good file of the same batch is still evaluated.
"""

from __future__ import annotations

import pytest

GOOD = '''format = 1
[recipe]
name = "probe"
[[feature]]
id = "t1"
shape = "trench"
width = "100 nm"
depth = "1 um"
[[step]]
name = "s1"
duration = "1 s"
pressure = "1 Torr"
temperature = "300 degC"
gases = { SiH4 = "50 sccm", N2 = "500 sccm" }
'''

# (name, transformation of GOOD, expected "field.path: message fragment")
CASES = [
    ("missing-format", lambda s: s.replace("format = 1\n", ""), "format: missing"),
    ("wrong-format", lambda s: s.replace("format = 1", "format = 7"), "format: expected 1"),
    ("toml-syntax", lambda s: s.replace('name = "probe"', 'name = "probe'),
     "line 3, column 14: TOML syntax error"),
    ("missing-step-pressure", lambda s: s.replace('pressure = "1 Torr"\n', ""),
     "step[1].pressure: missing"),
    ("pressure-wrong-unit", lambda s: s.replace('"1 Torr"', '"1 um"'),
     "step[1].pressure: expected a pressure such as"),
    ("pressure-bare-number", lambda s: s.replace('"1 Torr"', "133"),
     "step[1].pressure: expected a pressure with its unit"),
    ("pressure-zero", lambda s: s.replace('"1 Torr"', '"0 Torr"'),
     "step[1].pressure: expected more than zero"),
    ("pressure-negative", lambda s: s.replace('"1 Torr"', '"-1 Torr"'),
     "step[1].pressure: expected more than zero"),
    ("temperature-below-zero-K", lambda s: s.replace('"300 degC"', '"-300 degC"'),
     "step[1].temperature: expected more than zero"),
    ("temperature-unknown-unit", lambda s: s.replace('"300 degC"', '"300 degQ"'),
     "step[1].temperature: unknown unit"),
    ("width-zero", lambda s: s.replace('"100 nm"', '"0 nm"'),
     "feature[1].width: expected more than zero"),
    ("depth-negative", lambda s: s.replace('"1 um"', '"-1 um"'),
     "feature[1].depth: expected more than zero"),
    ("depth-absurd", lambda s: s.replace('"1 um"', '"5 km"'),
     "feature[1].depth: '5 km' is beyond the plausible range"),
    ("sticking-above-one", lambda s: s + "sticking = 1.5\n",
     "step[1].sticking: expected a number from 0 to 1"),
    ("sticking-negative", lambda s: s + "sticking = -0.1\n",
     "step[1].sticking: expected a number from 0 to 1"),
    ("flow-negative", lambda s: s.replace('"50 sccm"', '"-50 sccm"'),
     "step[1].gases.SiH4: expected zero or more"),
    ("flow-wrong-dimension", lambda s: s.replace('"50 sccm"', '"50 W"'),
     "step[1].gases.SiH4: expected a gas flow"),
    ("flows-sum-zero", lambda s: s.replace('"50 sccm"', '"0 sccm"').replace('"500 sccm"',
                                                                            '"0 sccm"'),
     "step[1].gases: the flows add up to zero"),
    ("unknown-gas", lambda s: s.replace("SiH4 =", "SiH5 ="),
     "step[1].gases.SiH5: unknown gas; did you mean SiH4"),
    ("missing-feature-ref", lambda s: s + 'features = ["t2"]\n',
     "step[1].features: no feature with id 't2'"),
    ("duplicate-id", lambda s: s.replace("[[step]]", '[[feature]]\nid = "t1"\nshape = "via"\n'
                                         'width = "1 um"\ndepth = "1 um"\n[[step]]'),
     "feature[2].id: duplicate feature id 't1'"),
    ("reactant-not-in-mix", lambda s: s + 'reactant = "NH3"\n',
     "step[1].reactant: 'NH3' is not among the step's gases"),
    ("unknown-shape", lambda s: s.replace('shape = "trench"', 'shape = "trnch"'),
     "feature[1].shape: expected one of trench, via, got 'trnch'; did you mean 'trench'?"),
    ("unknown-key", lambda s: s.replace('duration = "1 s"', 'duraton = "1 s"'),
     "step[1].duraton: unknown key; did you mean 'duration'?"),
    ("no-steps", lambda s: s[:s.index("[[step]]")], "step: missing"),
    ("bottom-wider-than-top", lambda s: s.replace('depth = "1 um"',
                                                  'depth = "1 um"\nbottom_width = "200 nm"'),
     "feature[1].bottom_width: expected at most the top width"),
    ("chamber-bad-volume", lambda s: s + '[chamber]\nvolume = "9 Torr"\n',
     "chamber.volume: expected a volume"),
]


@pytest.mark.parametrize("name, mutate, expected", CASES, ids=[c[0] for c in CASES])
def test_rule_through_cli(tmp_path, cli, name, mutate, expected):
    good = tmp_path / "good.toml"
    good.write_text(GOOD, encoding="utf-8")
    bad = tmp_path / f"{name}.toml"
    bad.write_text(mutate(GOOD), encoding="utf-8")
    out = tmp_path / "out"
    result = cli("check", bad, good, "--out", out, "--format", "json,html")
    assert result.returncode == 2, result.stderr
    assert f"{bad}: {expected}" in result.stderr
    assert "Traceback" not in result.stderr and "Traceback" not in result.stdout
    assert not list(out.glob(f"{name}.*")), "a report was written for the bad file"
    assert (out / "good.json").exists() and (out / "good.html").exists()


def test_all_errors_of_a_file_reported_in_one_run(tmp_path, cli):
    text = GOOD.replace('"1 Torr"', '"1 um"').replace("SiH4 =", "SiH5 =").replace(
        '"100 nm"', '"0 nm"')
    bad = tmp_path / "many.toml"
    bad.write_text(text, encoding="utf-8")
    result = cli("check", bad, "--out", tmp_path / "out")
    assert result.returncode == 2
    for fragment in ("feature[1].width", "step[1].pressure", "step[1].gases.SiH5"):
        assert fragment in result.stderr


@pytest.mark.parametrize("content, expected", [
    (b"", "file is empty"),
    (b"\x00\x01\x02binary", "not a text file"),
    (b"\xff\xfe\xfa", "the file is UTF-16 text"),
])
def test_empty_and_binary_files(tmp_path, cli, content, expected):
    bad = tmp_path / "bad.toml"
    bad.write_bytes(content)
    result = cli("check", bad, "--out", tmp_path / "out")
    assert result.returncode == 2
    assert f"{bad}: {expected}" in result.stderr


def test_missing_file_and_unmatched_glob(tmp_path, cli):
    result = cli("check", tmp_path / "nope.toml", "--out", tmp_path / "out")
    assert result.returncode == 2 and "file not found" in result.stderr
    result = cli("check", str(tmp_path / "*.toml"), "--out", tmp_path / "out")
    assert result.returncode == 2 and "no files match" in result.stderr


def test_real_subprocess_reports_bad_input_without_traceback(tmp_path):
    """The installed entry point, not only the in-process call, maps bad input to exit 2."""
    from conftest import run_cli

    bad = tmp_path / "bad.toml"
    bad.write_text(GOOD.replace("SiH4 =", "SiH5 ="), encoding="utf-8")
    result = run_cli("check", bad, "--out", tmp_path / "out")
    assert result.returncode == 2
    assert f"{bad}: step[1].gases.SiH5: unknown gas" in result.stderr
    assert "Traceback" not in result.stderr


def test_usage_errors_exit_2(tmp_path, cli):
    assert cli().returncode in (0, 2)  # bare command prints help
    assert cli("check").returncode == 2
    r = cli("check", "x.toml", "--format", "docx")
    assert r.returncode == 2 and "--format" in r.stderr
    assert cli("frobnicate").returncode == 2


def test_utf8_byte_order_mark_is_accepted(tmp_path, cli):
    """Some editors save UTF-8 with a byte-order mark; the file is valid UTF-8 TOML otherwise."""
    from pathlib import Path

    src = Path(__file__).with_name("utf8-bom-recipe.toml")
    assert src.read_bytes().startswith(b"\xef\xbb\xbf")
    r = cli("check", src, "--out", tmp_path / "o", "--format", "json", "--fail-on", "never")
    assert r.returncode == 0, r.stderr
    assert (tmp_path / "o" / "utf8-bom-recipe.json").exists()


def test_friendlier_messages(tmp_path, cli):
    """Hints for the usual slips: a split inline table, a near-miss reactant, Te in kelvin."""
    split = GOOD.replace('gases = { SiH4 = "50 sccm", N2 = "500 sccm" }',
                         'gases = { SiH4 = "50 sccm",\n N2 = "500 sccm" }')
    bad = tmp_path / "split.toml"
    bad.write_text(split, encoding="utf-8")
    r = cli("check", bad, "--out", tmp_path / "o")
    assert r.returncode == 2 and "must stay on one line" in r.stderr
    bad.write_text(GOOD + 'reactant = "SiH3"\n', encoding="utf-8")
    r = cli("check", bad, "--out", tmp_path / "o")
    assert "did you mean 'SiH4'?" in r.stderr
    # 11604.5 K is 1 eV (k/e from CODATA): a plasma electron temperature in kelvin is accepted
    from chamberchk.units import parse_quantity
    assert parse_quantity("11604.518 K", "energy_eV") == pytest.approx(1.0, rel=1e-6)
