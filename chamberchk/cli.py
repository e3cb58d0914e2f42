"""Command line: ``chamberchk check``, ``chamberchk compare``, ``chamberchk gases``.

Exit codes: 0 evaluated and nothing at or above ``--fail-on``; 1 flags at or above it; 2 bad input
or usage; 3 an internal error (a bug). Errors go to stderr as ``file: field.path: message``;
progress goes to stderr; stdout stays clean for piping.
"""

from __future__ import annotations

import glob
import os
import sys
import traceback
from pathlib import Path

import click

from . import __version__

# The kernels solve many small linear systems; multi-threaded BLAS only adds overhead there (and
# with --jobs it oversubscribes the cores). Set before numpy is first imported.
for _var in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(_var, "1")

EXIT_OK, EXIT_FLAGGED, EXIT_INPUT, EXIT_INTERNAL = 0, 1, 2, 3
SEVERITY_CHOICES = ("info", "warning", "critical", "never")


class UsageProblem(click.ClickException):
    """Bad usage or input that stops the whole command: exit 2, one line."""

    exit_code = EXIT_INPUT


def _formats(value: str) -> tuple[str, ...]:
    from .report import FORMATS

    chosen = tuple(dict.fromkeys(v.strip().lower() for v in value.split(",") if v.strip()))
    unknown = [v for v in chosen if v not in FORMATS]
    if unknown or not chosen:
        raise UsageProblem(f"--format: expected a comma-separated list of {', '.join(FORMATS)}, "
                           f"got {value!r}")
    return chosen


def expand_inputs(patterns: tuple[str, ...]) -> list[Path]:
    """Expand quoted globs, de-duplicate and sort for deterministic batches."""
    paths: list[Path] = []
    for p in patterns:
        if glob.has_magic(p):
            matches = sorted(glob.glob(p, recursive=True))
            if not matches:
                raise UsageProblem(f"{p}: no files match")
            paths.extend(Path(m) for m in matches)
        else:
            paths.append(Path(p))
    return list(dict.fromkeys(paths))


def _out_dir(out: str) -> Path:
    path = Path(out)
    try:
        path.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise UsageProblem(f"--out {out}: cannot create the output folder ({exc.strerror})")
    if not path.is_dir():
        raise UsageProblem(f"--out {out}: not a folder")
    return path


def _err(message: str) -> None:
    click.echo(message, err=True)


class Progress:
    """A progress bar on stderr when it is a terminal and the batch has more than one file."""

    def __init__(self, total: int, quiet: bool):
        self.bar = None
        if not quiet and total > 1 and sys.stderr.isatty():
            from rich.console import Console
            from rich.progress import Progress as RichProgress

            self.bar = RichProgress(console=Console(stderr=True), transient=True)
            self.task = self.bar.add_task("checking recipes", total=total)

    def __enter__(self):
        if self.bar:
            self.bar.start()
        return self

    def advance(self) -> None:
        if self.bar:
            self.bar.advance(self.task)

    def __exit__(self, *exc):
        if self.bar:
            self.bar.stop()


@click.group(context_settings={"help_option_names": ["-h", "--help"]})
@click.version_option(__version__, prog_name="chamberchk")
@click.option("--debug", is_flag=True, help="Show the traceback of an internal error.")
@click.pass_context
def cli(ctx: click.Context, debug: bool) -> None:
    """Pre-check gas transport in deposition and etch recipes (TOML)."""
    ctx.obj = {"debug": debug}


@cli.command()
@click.argument("files", nargs=-1, required=True)
@click.option("--format", "formats", default="json,html", show_default=True,
              help="Comma-separated report formats: json, toml, html, pdf.")
@click.option("--out", "out", default="reports", show_default=True,
              help="Folder for the reports, one <file stem>.<ext> per recipe and format.")
@click.option("--fail-on", type=click.Choice(SEVERITY_CHOICES), default="critical",
              show_default=True, help="Exit 1 when a flag of this severity or higher is raised.")
@click.option("--date", default=None, help="A date to print in the report header (none by "
              "default, so reports are reproducible).")
@click.option("--paper", type=click.Choice(["a4", "letter"]), default="a4", show_default=True,
              help="Paper size of PDF reports.")
@click.option("--sweep", default=None, metavar='"STEP:pressure=LOW..HIGH"',
              help="Also evaluate one step (name or number) over a pressure or temperature "
                   'range, e.g. "2:pressure=10 mTorr..10 Torr", and chart the key figures.')
@click.option("--sweep-points", default=25, show_default=True, type=int,
              help="Number of points of --sweep (log-spaced for pressure).")
@click.option("--jobs", "-j", default=1, show_default=True, type=click.IntRange(1, 64),
              help="Evaluate files in this many processes (output is identical to one).")
@click.option("--quiet", "-q", is_flag=True, help="No progress or summary lines on stderr.")
def check(files, formats, out, fail_on, date, paper, sweep, sweep_points, jobs, quiet):
    """Evaluate recipe FILES and write their reports."""
    from .batch import run_check

    paths = expand_inputs(files)
    debug = click.get_current_context().find_root().obj["debug"]
    spec = None
    if sweep is not None:
        from .sweep import parse_spec

        try:
            spec = parse_spec(sweep, sweep_points)
        except ValueError as exc:
            raise UsageProblem(f"--sweep: {exc}")
    code = run_check(paths, _formats(formats), _out_dir(out), fail_on,
                     {"date": date, "paper": paper, "sweep": spec}, quiet,
                     progress=Progress(len(paths), quiet), echo=_err, debug=debug, jobs=jobs)
    sys.exit(code)


@cli.command()
@click.argument("old")
@click.argument("new")
@click.option("--format", "formats", default="json,html", show_default=True,
              help="Comma-separated report formats: json, toml, html, pdf.")
@click.option("--out", "out", default="reports", show_default=True,
              help="Folder for the comparison, <old stem>__<new stem>.<ext>.")
@click.option("--fail-on", type=click.Choice(SEVERITY_CHOICES), default="critical",
              show_default=True, help="Exit 1 when a flag of this severity or higher is raised "
              "(a regime crossing is a warning).")
@click.option("--date", default=None, help="A date to print in the report header.")
@click.option("--paper", type=click.Choice(["a4", "letter"]), default="a4", show_default=True)
@click.option("--quiet", "-q", is_flag=True, help="No summary line on stderr.")
def compare(old, new, formats, out, fail_on, date, paper, quiet):
    """Compare two revisions OLD and NEW of a recipe: changed inputs, regime crossings."""
    from .batch import run_compare

    code = run_compare(Path(old), Path(new), _formats(formats), _out_dir(out), fail_on,
                       {"date": date, "paper": paper}, quiet, echo=_err)
    sys.exit(code)


@cli.command()
def gases():
    """List the gases chamberchk knows, with their hazard classes."""
    from .gases import shipped_table

    table = shipped_table()
    for key, gas in table.gases.items():
        aliases = [a for a, k in table.aliases.items() if k == key]
        extra = f" (also {', '.join(aliases)})" if aliases else ""
        est = "  [LJ estimated]" if gas.lj_estimated else ""
        hazards = ", ".join(gas.hazards) or "-"
        click.echo(f"{key:10s} {gas.name}{extra}; M = {gas.molar_mass_kg_mol * 1e3:.4g} g/mol; "
                   f"hazards: {hazards}{est}")


def main(argv: list[str] | None = None) -> None:
    """Entry point: run the CLI and map every outcome onto the documented exit codes."""
    debug = "--debug" in (argv if argv is not None else sys.argv[1:])
    try:
        cli.main(args=argv, prog_name="chamberchk", standalone_mode=False)
    except click.exceptions.Exit as exc:
        sys.exit(exc.exit_code)
    except click.ClickException as exc:
        exc.show()
        sys.exit(EXIT_INPUT)
    except click.exceptions.Abort:
        _err("aborted")
        sys.exit(EXIT_INPUT)
    except SystemExit:
        raise
    except KeyboardInterrupt:
        _err("interrupted")
        sys.exit(130)
    except Exception as exc:  # a bug: one line, traceback only on request
        if debug:
            traceback.print_exc()
        else:
            _err(f"chamberchk: internal error: {type(exc).__name__}: {exc} "
                 "(rerun with --debug for the traceback)")
        sys.exit(EXIT_INTERNAL)
    sys.exit(EXIT_OK)
