"""The HTML report in a real browser: headless Chromium draws it without console errors.

Skipped when Chromium is not installed (CI installs it with apt; see .ci/run). The command line
is the one measured in /work/shared/ECOSYSTEM.md section 6, plus logging to stderr.

Console criterion. Chromium 156 logs every message a page writes to its console (console.log,
console.error, uncaught exceptions alike) as a line tagged ``INFO:CONSOLE`` (older builds print
``CONSOLE(n)``), for example::

    [..:INFO:CONSOLE:1] "Uncaught ReferenceError: undefinedFn is not defined", source: file:///..

so "ERROR:CONSOLE" never matches. The report has no scripts, so any ``CONSOLE`` line, or any
"Uncaught", is a failure. The rest of stderr is browser noise on a headless server (dbus, vaapi,
sandbox warnings) and is ignored. A control test checks the criterion on a page that errs.
"""

from __future__ import annotations

import os
import shutil
import signal
import subprocess
from pathlib import Path

import pytest

RECIPE = """\
format = 1

[recipe]
name = "Brackenfold Works BW-3: nitride spacer"
revision = "A"
description = "LPCVD-style nitride spacer into gate trenches (fictional line)."

[[feature]]
id = "gt"
name = "gate trench"
shape = "trench"
width = "60 nm"
depth = "240 nm"

[[feature]]
id = "sv"
name = "strap via"
shape = "via"
width = "45 nm"
depth = "300 nm"

[[step]]
name = "nitride deposition"
process = "deposition"
duration = "30 s"
pressure = "250 mTorr"
temperature = "700 degC"
gases = { SiH2Cl2 = "30 sccm", NH3 = "300 sccm" }
reactant = "SiH2Cl2"
sticking = 0.001
film = "5 nm"

[[step]]
name = "nitrogen purge"
process = "purge"
duration = "10 s"
pressure = "250 mTorr"
temperature = "700 degC"
gases = { N2 = "1000 sccm" }
"""

FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-dev-shm-usage",
         "--disable-background-networking", "--disable-component-update", "--disable-sync",
         "--disable-quic", "--no-first-run", "--no-default-browser-check", "--hide-scrollbars",
         "--window-size=1200,1600", "--enable-logging=stderr", "--v=0"]
TIMEOUT_S = 60


def chromium_path() -> str:
    found = shutil.which("chromium") or ("/usr/bin/chromium" if os.access(
        "/usr/bin/chromium", os.X_OK) else None)
    if not found:
        pytest.skip("chromium not installed: the browser check needs it "
                    "(apt-get install -y --no-install-recommends chromium)")
    return found


def screenshot(html: Path, png: Path, tmp_path: Path) -> str:
    """Draw ``html`` into ``png`` with headless Chromium; return its stderr."""
    profile = tmp_path / "chromium-profile"
    profile.mkdir()
    cmd = [chromium_path(), *FLAGS, f"--user-data-dir={profile}", f"--screenshot={png}",
           html.resolve().as_uri()]
    # Own process group, so a hung browser and its helper processes can be ended together.
    proc = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                            start_new_session=True)
    try:
        _, err = proc.communicate(timeout=TIMEOUT_S)
    except subprocess.TimeoutExpired:
        os.killpg(proc.pid, signal.SIGKILL)
        proc.communicate()
        pytest.fail(f"chromium did not finish within {TIMEOUT_S} s")
    assert proc.returncode == 0, err[-2000:]
    return err


def console_problems(stderr: str) -> list[str]:
    return [line for line in stderr.splitlines() if "CONSOLE" in line or "Uncaught" in line]


def colour_counts(png: Path):
    """Image size and (count, RGB colour) pairs of the PNG; Pillow comes with WeasyPrint, a
    dependency of chamberchk."""
    image_module = pytest.importorskip("PIL.Image")
    with image_module.open(png) as image:
        rgb = image.convert("RGB")
        return rgb.size, rgb.getcolors(maxcolors=rgb.width * rgb.height)


def test_html_report_draws_in_chromium_without_console_errors(tmp_path):
    """The report renders to a non-blank screenshot and writes nothing to the console."""
    from chamberchk.evaluate import evaluate
    from chamberchk.recipe import load_recipe
    from chamberchk.report.html import to_html

    chromium_path()
    recipe = tmp_path / "spacer.toml"
    recipe.write_text(RECIPE, encoding="utf-8")
    html = tmp_path / "spacer.html"
    html.write_bytes(to_html(evaluate(load_recipe(recipe))))
    png = tmp_path / "spacer.png"

    stderr = screenshot(html, png, tmp_path)

    assert console_problems(stderr) == []
    # A blank 1200 x 1600 page compresses to a few KB; the report page measured ~200 KB.
    assert png.exists() and png.stat().st_size > 20_000
    size, counts = colour_counts(png)
    assert size == (1200, 1600)
    # Text, table rules, shaded headers and charts: many colours, and a real share of ink.
    assert len(counts) > 16
    ink = sum(n for n, c in counts if sum(c) < 3 * 200) / (size[0] * size[1])
    assert ink > 0.01, f"only {ink:.2%} of the screenshot is darker than light grey"


def test_console_criterion_catches_a_page_error(tmp_path):
    """Control: a page that logs an error and throws is caught by the same criterion."""
    chromium_path()
    html = tmp_path / "bad.html"
    html.write_text("<!DOCTYPE html><html><body><p>bad page</p><script>"
                    "console.error('boom'); undefinedFn();</script></body></html>",
                    encoding="utf-8")
    problems = console_problems(screenshot(html, tmp_path / "bad.png", tmp_path))
    assert any("boom" in line for line in problems)
    assert any("Uncaught" in line for line in problems)
