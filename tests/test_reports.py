"""Report writers end to end: PDF content and paper size, escaping of recipe text, byte-for-byte
reproducibility, the JSON/TOML key contract, no outside fetches from the PDF engine, and atomic
writes with clean failures.

The recipes here are set in the fictional Brackenfold Works fab; their numbers are plausible,
not from any real process. Expected text is read from the data the program ships or records
(gas table, the evaluation's ``models`` and ``notice``), never typed from the program's output.
"""

from __future__ import annotations

import http.server
import io
import json
import logging
import os
import re
import stat
import threading
import tomllib
from contextlib import contextmanager
from html.parser import HTMLParser
from pathlib import Path

import pytest

pypdf = pytest.importorskip("pypdf")

from conftest import run_cli  # noqa: E402

from chamberchk.report import write_atomic  # noqa: E402

# -----------------------------------------------------------------------------------------------
# recipes

# Two features, a silane soak, a WF6 nucleation with film, and a chlorine plasma etch, so the
# report carries flammable/pyrophoric/toxic/corrosive/oxidizer cautions, estimated gas data,
# transport figures and a plasma sheath. No [chamber] section (kept independent of it).
PLAIN_RECIPE = """\
format = 1

[recipe]
name = "Brackenfold Works BW-3: tungsten contact plug"
revision = "D"
description = "Silane soak, WF6 nucleation and a chlorine recess etch on the BW-3 line."

[[feature]]
id = "cv"
name = "contact via"
shape = "via"
width = "70 nm"
depth = "700 nm"

[[feature]]
id = "lt"
name = "local interconnect trench"
shape = "trench"
width = "120 nm"
depth = "480 nm"
bottom_width = "100 nm"

[[step]]
name = "silane soak"
process = "soak"
duration = "2 s"
pressure = "5 Torr"
temperature = "300 degC"
gases = { SiH4 = "40 sccm", Ar = "500 sccm" }

[[step]]
name = "WF6 nucleation"
process = "deposition"
duration = "4 s"
pressure = "30 Torr"
temperature = "300 degC"
gases = { WF6 = "30 sccm", SiH4 = "15 sccm", Ar = "1000 sccm" }
reactant = "WF6"
sticking = 0.01
film = "3 nm"

[[step]]
name = "chlorine recess etch"
process = "etch"
duration = "6 s"
pressure = "15 mTorr"
temperature = "40 degC"
gases = { Cl2 = "80 sccm", Ar = "20 sccm" }
reactant = "Cl2"
sticking = 0.05
etch_depth = "40 nm"
[step.plasma]
electron_density = "1e10 cm^-3"
electron_temperature = "3 eV"
sheath_voltage = "120 V"
"""

SCRIPT = "<script>alert(1)</script>"
TEMPLATE_TEXT = "{{ 7*7 }}"
# Every field the report shows as text carries markup, an ampersand, quotes and template syntax.
HOSTILE = {
    "name": f"{SCRIPT} & co",
    "description": (f'<b>bold</b> & "double" \'single\' {TEMPLATE_TEXT} '
                    '<img src="file:///etc/passwd"> <link rel="stylesheet" '
                    'href="http://127.0.0.1:9/x.css">'),
    "step": f'etch <b>1</b> & "q" {TEMPLATE_TEXT}',
    "feature": f"via <i>A</i> & {TEMPLATE_TEXT}",
}
# TOML literal strings (''' ... ''') take every character above as is.
HOSTILE_RECIPE = f"""\
format = 1

[recipe]
name = '''{HOSTILE["name"]}'''
revision = '''<u>R</u>'''
description = '''{HOSTILE["description"]}'''

[[feature]]
id = "v1"
name = '''{HOSTILE["feature"]}'''
shape = "via"
width = "90 nm"
depth = "900 nm"

[[step]]
name = '''{HOSTILE["step"]}'''
process = "deposition"
duration = "3 s"
pressure = "2 Torr"
temperature = "350 degC"
gases = {{ NH3 = "50 sccm", N2 = "500 sccm" }}
sticking = 0.01
"""


def evaluate_text(tmp_path: Path, text: str, name: str = "recipe.toml"):
    """Write a recipe and evaluate it in-process."""
    from chamberchk.evaluate import evaluate
    from chamberchk.recipe import load_recipe

    path = tmp_path / name
    path.write_text(text, encoding="utf-8")
    return evaluate(load_recipe(path))


# -----------------------------------------------------------------------------------------------
# helpers

@contextmanager
def weasyprint_warnings_visible():
    """Let WARNING records of the ``weasyprint`` logger through during a render.

    ``html_to_pdf`` sets that logger to ERROR on every call, which would hide the warnings this
    suite must fail on (missing glyphs, unsupported CSS). The instance attribute shadows
    ``Logger.setLevel`` for the duration only.
    """
    logger = logging.getLogger("weasyprint")
    old = logger.level
    logger.setLevel(logging.WARNING)
    logger.setLevel = lambda level: None
    try:
        yield
    finally:
        del logger.setLevel
        logger.setLevel(old)


def weasyprint_problems(records) -> list[str]:
    """WARNING and worse records of the ``weasyprint`` loggers, as text."""
    return [f"{r.levelname}: {r.getMessage()}" for r in records
            if r.name.startswith("weasyprint") and r.levelno >= logging.WARNING]


def render_pdf(evaluation, caplog, paper: str = "a4") -> bytes:
    """Render in-process and fail on any WeasyPrint warning or error (caught with caplog)."""
    from chamberchk.report.pdf import to_pdf

    caplog.set_level(logging.WARNING, logger="weasyprint")
    caplog.clear()
    with weasyprint_warnings_visible():
        pdf = to_pdf(evaluation, paper=paper)
    assert weasyprint_problems(caplog.records) == []
    return pdf


class _ListHandler(logging.Handler):
    def __init__(self):
        super().__init__(logging.WARNING)
        self.records: list[logging.LogRecord] = []

    def emit(self, record):
        self.records.append(record)


@pytest.fixture(scope="module")
def plain(tmp_path_factory):
    """The plain recipe's evaluation, its JSON document, and its A4 PDF with the WeasyPrint
    warnings raised while rendering it (rendered once per module: a render takes seconds)."""
    from chamberchk.report.data import to_json
    from chamberchk.report.pdf import to_pdf

    evaluation = evaluate_text(tmp_path_factory.mktemp("plain"), PLAIN_RECIPE)
    handler = _ListHandler()
    logger = logging.getLogger("weasyprint")
    logger.addHandler(handler)
    try:
        with weasyprint_warnings_visible():
            pdf = to_pdf(evaluation)
    finally:
        logger.removeHandler(handler)
    return {"evaluation": evaluation, "doc": json.loads(to_json(evaluation)), "pdf": pdf,
            "problems": weasyprint_problems(handler.records)}


def pdf_pages(pdf: bytes) -> list[str]:
    """Text of each page, whitespace-normalised."""
    reader = pypdf.PdfReader(io.BytesIO(pdf))
    return [" ".join((page.extract_text() or "").split()) for page in reader.pages]


def compact(text: str) -> str:
    """Text with all whitespace removed: robust to where a line or cell wraps."""
    return "".join(text.split())


class Tags(HTMLParser):
    """Start tags of an HTML document, and the text inside each tag name of interest."""

    def __init__(self, collect=("h1", "h3", "header", "title", "td", "th")):
        super().__init__(convert_charrefs=True)
        self.tags: list[str] = []
        self.collect = collect
        self.open: list[str] = []
        self.text: dict[str, list[str]] = {t: [] for t in collect}

    def handle_starttag(self, tag, attrs):
        self.tags.append(tag)
        if tag in self.collect:
            self.open.append(tag)
            self.text[tag].append("")

    def handle_endtag(self, tag):
        if tag in self.open:
            self.open.remove(tag)

    def handle_data(self, data):
        for tag in self.open:
            self.text[tag][-1] += data


def parse_html(html: bytes) -> Tags:
    parser = Tags()
    parser.feed(html.decode("utf-8"))
    parser.close()
    return parser


# -----------------------------------------------------------------------------------------------
# PDF content and paper size

def test_pdf_carries_steps_cautions_models_notice_and_page_footer(plain):
    """Step names, gas cautions, recorded references, the notice and "page N of M" are in the
    PDF."""
    from chamberchk.gases import shipped_table

    doc = plain["doc"]
    assert plain["problems"] == [], "WeasyPrint warned while rendering"
    pages = pdf_pages(plain["pdf"])
    whole = compact(" ".join(pages))

    for step in doc["steps"]:
        assert compact(step["name"]) in whole, step["name"]

    # The caution of every hazard class of every gas used, looked up in the shipped table.
    table = shipped_table()
    used = {g for s in doc["steps"] for g in (sp["gas"] for sp in s["species"])}
    assert any(table.get(g).hazards for g in used), "the recipe should use hazardous gases"
    cautions = {table.hazards[h].caution for g in used for h in table.get(g).hazards}
    cautions |= {table.get(g).caution for g in used if table.get(g).caution}
    for text in cautions:
        assert compact(text) in whole, text

    assert "Models and references" in " ".join(pages)
    assert doc["models"], "the evaluation recorded no models"
    for model in doc["models"]:
        assert compact(model["reference"]) in whole, model["reference"]

    assert compact(doc["notice"]) in whole

    n = len(pages)
    assert n >= 2, "expected a multi-page report, so the page counter is exercised"
    for i, text in enumerate(pages, start=1):
        assert f"page {i} of {n}" in text, f"footer missing on page {i}"


def test_weasyprint_warnings_are_caught(caplog):
    """Control for the checks above: an unknown CSS property does raise a WARNING that the
    capture sees, although the writer sets the WeasyPrint logger to ERROR."""
    from chamberchk.report.pdf import html_to_pdf

    caplog.set_level(logging.WARNING, logger="weasyprint")
    with weasyprint_warnings_visible():
        html_to_pdf('<p style="frobnicate: 1">x</p>')
    assert any("frobnicate" in m for m in weasyprint_problems(caplog.records))


# ISO 216 A4 is 210 x 297 mm = 595.28 x 841.89 pt; ANSI Letter is 8.5 x 11 in = 612 x 792 pt
# (1 pt = 1/72 in). 1 pt tolerance: WeasyPrint writes the page box to 6 decimals of a point.
A4_PT, LETTER_PT = (595.28, 841.89), (612.0, 792.0)


def page_sizes(pdf) -> list[tuple[float, float]]:
    reader = pypdf.PdfReader(io.BytesIO(pdf) if isinstance(pdf, bytes) else pdf)
    return [(float(p.mediabox.width), float(p.mediabox.height)) for p in reader.pages]


def test_pdf_a4_by_default(plain):
    """Every page of the default PDF is A4."""
    sizes = page_sizes(plain["pdf"])
    assert sizes and all(s == pytest.approx(A4_PT, abs=1.0) for s in sizes)


def test_cli_pdf_letter_paper(cli, write_recipe, tmp_path, caplog):
    """--paper letter gives Letter pages."""
    path = write_recipe(PLAIN_RECIPE, "bw3.toml")
    out = tmp_path / "out"
    caplog.set_level(logging.WARNING, logger="weasyprint")
    with weasyprint_warnings_visible():
        result = cli("check", path, "--format", "pdf", "--paper", "letter", "--fail-on",
                     "never", "--out", out, "-q")
    assert result.returncode == 0, result.stderr
    assert weasyprint_problems(caplog.records) == []
    sizes = page_sizes(out / "bw3.pdf")
    assert sizes and all(s == pytest.approx(LETTER_PT, abs=1.0) for s in sizes)


def test_demo_recipes_render_to_pdf(cli, demo_recipes, tmp_path, caplog):
    """Every shipped demo recipe renders to a PDF without WeasyPrint warnings."""
    out = tmp_path / "demo"
    caplog.set_level(logging.WARNING, logger="weasyprint")
    with weasyprint_warnings_visible():
        result = cli("check", *demo_recipes, "--format", "pdf", "--fail-on", "never",
                     "--out", out, "-q")
    assert result.returncode == 0, result.stderr
    assert weasyprint_problems(caplog.records) == []
    for recipe in demo_recipes:
        name = tomllib.loads(recipe.read_text("utf-8"))["recipe"]["name"]
        pages = pdf_pages((out / f"{recipe.stem}.pdf").read_bytes())
        assert compact(name) in compact(pages[0]), recipe.name
        assert f"page 1 of {len(pages)}" in pages[0]


# -----------------------------------------------------------------------------------------------
# escaping of recipe text

def test_pressure_axes_in_torr_and_window_within_the_accepted_pressures(plain):
    """Charts put pressure in Torr like the tables, and the process window stops at the decade
    around the largest pressure a recipe may ask for (10 bar = 7500 Torr -> 1e4 Torr), even where
    a narrow feature's continuum bound lies far above it."""
    from chamberchk.report.charts import PRESSURE_LABEL, process_window, regime_map

    doc = plain["doc"]
    window = process_window(doc)
    assert PRESSURE_LABEL == "pressure (Torr)" and PRESSURE_LABEL in window["svg"]
    assert "(Pa)" not in window["svg"]
    assert PRESSURE_LABEL in regime_map(doc, (0.01, 0.1, 10.0))["svg"]
    highest = max(p for s in doc["steps"] for f in s["features"]
                  for p in f["window_pressures_Pa"])
    assert highest > 1e6            # the recipe has a bound above 10 bar...
    ticks = [float(t) for t in re.findall(r'text-anchor="middle">([-0-9.e]+)<', window["svg"])]
    assert ticks and max(ticks) <= 1e4      # ...which the axis does not reach


def test_number_formatting_carries_units():
    """Every figure prints with a unit; zero film or etch reads at feature scale."""
    from chamberchk.report import fmt

    assert fmt.length(0.0) == "0 nm"
    assert fmt.length(2.5e-9) == "2.50 nm"
    assert fmt.time(0.0) == "0 s" and fmt.time(1.5e-3) == "1.50 ms"
    assert fmt.pressure(101325 / 760) == "1.00 Torr (133 Pa)"
    assert fmt.length(None) == "n/a"


def test_recipe_text_is_escaped_in_html_and_literal_in_pdf(tmp_path, caplog):
    """Markup and template syntax in recipe text is escaped in HTML and literal in the PDF."""
    from chamberchk.report.html import to_html

    evaluation = evaluate_text(tmp_path, HOSTILE_RECIPE)
    html = to_html(evaluation)
    text = html.decode("utf-8")
    assert SCRIPT not in text
    assert "&lt;script&gt;alert(1)&lt;/script&gt;" in text
    assert "<b>" not in text and "<i>" not in text and "<u>" not in text
    assert '<img src="file:' not in text and '<link rel="stylesheet"' not in text
    assert TEMPLATE_TEXT in text

    # Parsed as a browser would: the template itself uses none of these tags, so any of them
    # would have come from the recipe; and the heading reads back exactly as the recipe's name.
    tags = parse_html(html)
    assert not {"script", "b", "i", "u", "img", "link", "iframe", "object"} & set(tags.tags)
    assert tags.text["h1"] == [HOSTILE["name"]]
    assert HOSTILE["description"] in tags.text["header"][0]
    assert any(HOSTILE["step"] in h for h in tags.text["h3"])
    assert any(t.strip() == HOSTILE["feature"] for t in tags.text["td"] + tags.text["th"])

    whole = compact(" ".join(pdf_pages(render_pdf(evaluation, caplog))))
    for value in HOSTILE.values():
        assert compact(value) in whole, value


# -----------------------------------------------------------------------------------------------
# reproducibility

def test_two_processes_write_identical_json_toml_html(tmp_path):
    """Two separate processes write byte-identical JSON, TOML and HTML."""
    path = tmp_path / "bw3.toml"
    path.write_text(PLAIN_RECIPE, encoding="utf-8")
    outs = [tmp_path / "run1", tmp_path / "run2"]
    for out in outs:
        result = run_cli("check", path, "--format", "json,toml,html", "--fail-on", "never",
                         "--out", out, "-q")
        assert result.returncode == 0, result.stderr
    for ext in ("json", "toml", "html"):
        first, second = ((o / f"bw3.{ext}").read_bytes() for o in outs)
        assert first and first == second, ext


def test_in_process_renders_are_identical(plain, tmp_path, caplog):
    """Two evaluations in one process render to identical bytes in every format."""
    from chamberchk.report import renderer

    again = evaluate_text(tmp_path, PLAIN_RECIPE)
    for fmt in ("json", "toml", "html"):
        first, second = (renderer(fmt)(e) for e in (plain["evaluation"], again))
        assert first == second, fmt
    pdf = render_pdf(again, caplog)
    assert pdf[:5] == b"%PDF-" and pdf == plain["pdf"]
    # No clock in the PDF either: without a date there is no creation or modification date.
    metadata = pypdf.PdfReader(io.BytesIO(pdf)).metadata or {}
    assert "/CreationDate" not in metadata and "/ModDate" not in metadata


def test_date_option_goes_to_the_html_header_only_when_given(cli, write_recipe, tmp_path):
    """--date appears in the HTML header; without it the report holds no date."""
    path = write_recipe(PLAIN_RECIPE, "bw3.toml")
    dated, undated = tmp_path / "dated", tmp_path / "undated"
    for out, extra in ((dated, ["--date", "2026-01-02"]), (undated, [])):
        result = cli("check", path, "--format", "html", "--fail-on", "never", "--out", out,
                     "-q", *extra)
        assert result.returncode == 0, result.stderr
    with_date = (dated / "bw3.html").read_bytes()
    assert "2026-01-02" in parse_html(with_date).text["header"][0]
    without = (undated / "bw3.html").read_bytes().decode("utf-8")
    assert not re.search(r"\d{4}-\d{2}-\d{2}", without), "a date in an undated report"


# -----------------------------------------------------------------------------------------------
# JSON / TOML contract

# Unit suffixes: README "Outputs" and DESIGN.md "Outputs" list _m _Pa _K _s _m_s _m2_s _m3_s
# _Pa_m3_s; the README step fields add _Pa_s (viscosity_Pa_s). The rest are the SI units of the
# remaining quantities a report can carry (mass, area, volume, energy in eV, voltage, angle in
# degrees, molar flow, exposure in Pa s).
UNIT_SUFFIXES = ("Pa_m3_s", "m2_s", "m3_s", "m_s", "Pa_s", "mol_s", "m2", "m3", "m", "Pa", "K",
                 "s", "kg", "eV", "V", "deg")
# Dimensionless float fields named in README "Outputs" / DESIGN.md "Outputs".
DOCUMENTED_DIMENSIONLESS = {"knudsen_number", "reactant_knudsen_number", "aspect_ratio",
                            "transmission_probability", "mole_fraction", "sticking",
                            "bottom_flux_ratio"}
# Dimensionless by construction in evaluate.py / plasma.py but NOT named in README or DESIGN.md
# (listed in the helper's report so the docs can catch up): ratios and factors.
UNDOCUMENTED_DIMENSIONLESS = {
    "regime_bounds",                    # Knudsen-number bounds
    "nearest_bound_factor",             # pressure ratio to the nearest regime bound
    "dose_margin",                      # exposure over required exposure
    "collisionality",                   # sheath thickness over ion mean free path
    "ion_bottom_fraction",              # fraction of ions reaching the bottom
    "ion_to_neutral_bottom_over_top",   # ratio of ratios
    "factor",                           # feature_history largest_change factor
}
KEY_RE = re.compile(r"^[a-z][a-z0-9]*(?:_[a-z0-9]+)*?(?:_(?:%s))?$"
                    % "|".join(re.escape(s) for s in UNIT_SUFFIXES))


def walk_keys(obj, path="$"):
    """(path, key, value) for every key of every object in a JSON document."""
    if isinstance(obj, dict):
        for k, v in obj.items():
            yield path, k, v
            yield from walk_keys(v, f"{path}.{k}")
    elif isinstance(obj, list):
        for i, v in enumerate(obj):
            yield from walk_keys(v, f"{path}[{i}]")


def is_float_field(value) -> bool:
    if isinstance(value, list):
        return any(isinstance(v, float) for v in value)
    return isinstance(value, float)


def test_json_keys_follow_the_naming_rule(plain):
    """JSON keys are snake_case and every float field carries an SI suffix or is dimensionless."""
    doc = plain["doc"]
    bad_case = sorted({k for _, k, _ in walk_keys(doc) if not KEY_RE.match(k)})
    assert bad_case == [], "keys that are not snake_case with a unit suffix"
    allowed = DOCUMENTED_DIMENSIONLESS | UNDOCUMENTED_DIMENSIONLESS
    unitless = sorted({f"{p}.{k}" for p, k, v in walk_keys(doc) if is_float_field(v)
                       and k not in allowed and not k.endswith(tuple("_" + s
                                                                     for s in UNIT_SUFFIXES))})
    assert unitless == [], "float fields without an SI unit suffix"
    # The recipe exercises the fields the rule is about (not an empty walk).
    keys = {k for _, k, _ in walk_keys(doc)}
    assert {"pressure_Pa", "mean_free_path_m", "knudsen_number", "viscosity_Pa_s"} <= keys


def test_no_flux_key_reuses_the_diffusivity_suffix(plain):
    """No flux key uses _m2_s, the suffix of m^2/s."""
    doc = plain["doc"]
    fluxes = sorted({k for _, k, _ in walk_keys(doc) if "flux" in k and k.endswith("_m2_s")})
    assert fluxes == []


def drop_nulls(obj):
    if isinstance(obj, dict):
        return {k: drop_nulls(v) for k, v in obj.items() if v is not None}
    if isinstance(obj, list):
        return [drop_nulls(v) for v in obj if v is not None]
    return obj


def test_toml_mirrors_json(plain):
    """The TOML output parses and equals the JSON with nulls left out."""
    from chamberchk.report.data import to_json, to_toml

    evaluation = plain["evaluation"]
    doc = json.loads(to_json(evaluation))
    mirrored = tomllib.loads(to_toml(evaluation).decode("utf-8"))
    assert mirrored == drop_nulls(doc)
    assert mirrored["steps"] and mirrored["notice"] == doc["notice"]


# -----------------------------------------------------------------------------------------------
# no network or file access from the PDF engine

class _Hits(http.server.BaseHTTPRequestHandler):
    hits: list[str] = []

    def do_GET(self):  # noqa: N802 (http.server API)
        self.hits.append(self.path)
        body = b"body::after { content: 'LEAKED-OVER-HTTP'; }"
        self.send_response(200)
        self.send_header("Content-Type", "text/css")
        self.send_header("Content-Length", str(len(body)))
        self.end_headers()
        self.wfile.write(body)

    def log_message(self, *args):
        pass


@pytest.fixture
def local_server():
    server = http.server.ThreadingHTTPServer(("127.0.0.1", 0), _Hits)
    _Hits.hits = []
    thread = threading.Thread(target=server.serve_forever,
                              kwargs={"poll_interval": 0.05}, daemon=True)
    thread.start()
    try:
        yield f"http://127.0.0.1:{server.server_address[1]}", _Hits.hits
    finally:
        server.shutdown()
        server.server_close()


def leaky_html(tmp_path: Path, http_base: str) -> str:
    css = tmp_path / "leak.css"
    css.write_text("body::after { content: 'LEAKED-FROM-FILE'; }", encoding="utf-8")
    return f"""<!DOCTYPE html><html><head><meta charset="utf-8">
<link rel="stylesheet" href="{css.as_uri()}">
<link rel="stylesheet" href="{http_base}/leak.css">
<style>@import url("{http_base}/imported.css");</style></head>
<body><p>marker paragraph</p>
<img src="file:///etc/hostname"><img src="http://127.0.0.1:9/x.png">
<img src="{http_base}/x.png"></body></html>"""


def test_html_to_pdf_fetches_nothing(tmp_path, local_server, caplog):
    """html_to_pdf reads no file and makes no HTTP request, renders anyway and logs the refusals."""
    from chamberchk.report.pdf import html_to_pdf

    base, hits = local_server
    caplog.set_level(logging.WARNING, logger="weasyprint")
    pdf = html_to_pdf(leaky_html(tmp_path, base))
    assert isinstance(pdf, bytes) and pdf.startswith(b"%PDF-")
    text = " ".join(pdf_pages(pdf))
    assert "marker paragraph" in text
    assert "LEAKED" not in text
    assert hits == [], "the PDF engine made HTTP requests"
    hostname = Path("/etc/hostname").read_text().strip() if Path("/etc/hostname").exists() else ""
    if hostname:
        assert hostname not in text
    refused = "\n".join(r.getMessage() for r in caplog.records if r.name.startswith("weasyprint")
                        and r.levelno >= logging.ERROR)
    for url in ("file:///etc/hostname", "http://127.0.0.1:9/x.png", f"{base}/leak.css"):
        assert url in refused, f"no refusal logged for {url}"


def test_leak_probe_detects_a_fetching_engine(tmp_path, local_server):
    """Control for the test above: WeasyPrint's default fetcher does read the same document's
    file and HTTP resources, so the probes in ``leaky_html`` are able to fail."""
    from weasyprint import HTML

    base, hits = local_server
    pdf = HTML(string=leaky_html(tmp_path, base), base_url=str(tmp_path)).write_pdf()
    text = " ".join(pdf_pages(pdf))
    assert "LEAKED-FROM-FILE" in text or "LEAKED-OVER-HTTP" in text
    assert hits, "the control render made no HTTP request"


# -----------------------------------------------------------------------------------------------
# atomic writes and write failures

def test_no_temporary_files_remain(cli, write_recipe, tmp_path):
    """After a run the out folder holds the reports and no *.part files."""
    path = write_recipe(PLAIN_RECIPE, "bw3.toml")
    out = tmp_path / "out"
    result = cli("check", path, "--format", "json,toml,html", "--fail-on", "never",
                 "--out", out, "-q")
    assert result.returncode == 0, result.stderr
    assert sorted(os.listdir(out)) == ["bw3.html", "bw3.json", "bw3.toml"]


@pytest.mark.skipif(not hasattr(os, "fchmod"), reason="POSIX file modes only")
def test_reports_get_ordinary_file_permissions(tmp_path):
    """Reports are made to be shared: mode 0666 less the umask, not a temporary file's 0600."""
    target = tmp_path / "r.json"
    old = os.umask(0o027)
    try:
        write_atomic(target, b"{}")
    finally:
        os.umask(old)
    assert stat.S_IMODE(target.stat().st_mode) == 0o640
    write_atomic(target, b"{}")          # under the test run's own umask
    assert stat.S_IMODE(target.stat().st_mode) == 0o666 & ~old


def test_out_folder_under_a_file_is_a_usage_error(cli, write_recipe, tmp_path):
    """An --out folder that cannot be created gives exit 2 and one line, no traceback."""
    # Tests run as root, so a chmod 0o500 folder would still be writable; a path under a
    # regular file cannot be created by anyone.
    path = write_recipe(PLAIN_RECIPE, "bw3.toml")
    (tmp_path / "afile").write_text("not a folder")
    result = cli("check", path, "--out", tmp_path / "afile" / "sub")
    assert result.returncode == 2
    lines = result.stderr.strip().splitlines()
    assert len(lines) == 1 and "--out" in lines[0], result.stderr
    assert "Traceback" not in result.stderr and result.stdout == ""


def test_failed_write_leaves_no_partial_file(cli, write_recipe, tmp_path):
    """A failed rename gives exit 2, one line, and removes the temporary file."""
    # The HTML target is occupied by a folder, so its final rename fails after the temporary
    # file was written: exit 2, one line naming the file, and the temporary file removed.
    path = write_recipe(PLAIN_RECIPE, "bw3.toml")
    out = tmp_path / "out"
    (out / "bw3.html").mkdir(parents=True)
    result = cli("check", path, "--format", "json,html", "--fail-on", "never", "--out", out)
    assert result.returncode == 2
    lines = result.stderr.strip().splitlines()
    assert len(lines) == 1 and "bw3.html" in lines[0], result.stderr
    assert "Traceback" not in result.stderr
    assert not [n for n in os.listdir(out) if n.endswith(".part")]
