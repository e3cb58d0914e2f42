"""Batch driver behind ``chamberchk check``: load, evaluate, render and write, one file at a time.

One bad file never stops the batch. A file's reports are all rendered in memory first and then
written atomically, so a failure leaves no half-written report.
"""

from __future__ import annotations

import traceback
from dataclasses import dataclass
from pathlib import Path
from typing import Callable

from .errors import InputError
from .flags import SEVERITIES, severity_rank

EXIT_OK, EXIT_FLAGGED, EXIT_INPUT, EXIT_INTERNAL = 0, 1, 2, 3


@dataclass
class Outcome:
    """What happened to one input file."""

    path: Path
    code: int
    messages: list[str]
    outputs: dict[str, bytes]
    worst: str | None = None


def output_stems(paths: list[Path]) -> dict[Path, str]:
    """A unique output stem per input: the file stem, with ``-2``, ``-3``... on clashes."""
    stems: dict[Path, str] = {}
    used: set[str] = set()
    for p in paths:
        stem = _safe(p.stem) or "recipe"
        candidate, n = stem, 1
        while candidate in used:
            n += 1
            candidate = f"{stem}-{n}"
        used.add(candidate)
        stems[p] = candidate
    return stems


def _safe(stem: str) -> str:
    """Keep output names to plain characters: no separators, no leading dots."""
    cleaned = "".join(c if c.isalnum() or c in "-_.+" else "_" for c in stem)
    return cleaned.lstrip(".")


def _flag_code(flags, fail_on: str) -> tuple[int, str | None]:
    severities = [f.severity for f in flags]
    worst = max(severities, key=severity_rank) if severities else None
    flagged = fail_on in SEVERITIES and worst is not None and \
        severity_rank(worst) >= severity_rank(fail_on)
    return (EXIT_FLAGGED if flagged else EXIT_OK), worst


def process_file(path: Path, formats: tuple[str, ...], fail_on: str, options: dict,
                 debug: bool = False) -> Outcome:
    """Load, evaluate and render one recipe (no file output here)."""
    from .evaluate import evaluate
    from .recipe import load_recipe
    from .report import renderer

    try:
        recipe = load_recipe(path)
        evaluation = evaluate(recipe)
        if options.get("sweep") is not None:
            from .sweep import run_sweep

            evaluation.sweep = run_sweep(recipe, options["sweep"])
        outputs = {fmt: renderer(fmt)(evaluation, **options) for fmt in formats}
    except InputError as exc:
        return Outcome(path, EXIT_INPUT, [p.format(exc.source) for p in exc.problems], {})
    except Exception as exc:  # a bug in chamberchk, not the user's input
        detail = traceback.format_exc() if debug else \
            f"{type(exc).__name__}: {exc} (rerun with --debug for the traceback)"
        return Outcome(path, EXIT_INTERNAL, [f"{path}: internal error: {detail}"], {})
    code, worst = _flag_code(evaluation.flags, fail_on)
    return Outcome(path, code, [], outputs, worst)


def _outcomes(paths, formats, fail_on, options, debug, jobs):
    """Outcomes in input order; with ``jobs > 1`` files are evaluated in a process pool (same
    results, since each file is evaluated independently and written by this process)."""
    if jobs <= 1 or len(paths) < 2:
        for path in paths:
            yield process_file(path, formats, fail_on, options, debug)
        return
    from concurrent.futures import ProcessPoolExecutor
    from functools import partial

    work = partial(process_file, formats=formats, fail_on=fail_on, options=options, debug=debug)
    with ProcessPoolExecutor(max_workers=jobs) as pool:
        # map keeps the input order; a small chunk keeps memory flat on big batches
        yield from pool.map(work, paths, chunksize=4)


def run_check(paths: list[Path], formats: tuple[str, ...], out_dir: Path, fail_on: str,
              options: dict, quiet: bool, progress, echo: Callable[[str], None],
              debug: bool = False, jobs: int = 1) -> int:
    """Process every file, write reports, and return the batch's exit code."""
    from .report import write_atomic

    stems = output_stems(paths)
    inputs = {p.resolve() for p in paths}
    codes = []
    with progress:
        for outcome in _outcomes(paths, formats, fail_on, options, debug, jobs):
            path = outcome.path
            for line in outcome.messages:
                echo(line)
            if outcome.outputs:
                outcome.code = max(outcome.code, _write(outcome, out_dir / stems[path], inputs,
                                                        write_atomic, echo))
            if not quiet and outcome.code in (EXIT_OK, EXIT_FLAGGED):
                worst = f"worst flag {outcome.worst}" if outcome.worst else "no flags"
                echo(f"{path}: {worst}; wrote "
                     f"{', '.join(f'{stems[path]}.{f}' for f in formats)} in {out_dir}")
            codes.append(outcome.code)
            progress.advance()
    return max(codes, default=EXIT_OK)


def _write(outcome: Outcome, base: Path, inputs: set[Path], write_atomic, echo) -> int:
    targets = {fmt: base.with_name(f"{base.name}.{fmt}") for fmt in outcome.outputs}
    clash = [t for t in targets.values() if t.resolve() in inputs]
    if clash:
        echo(f"{outcome.path}: refusing to overwrite the input file {clash[0]}")
        return EXIT_INPUT
    try:
        for fmt, target in targets.items():
            write_atomic(target, outcome.outputs[fmt])
    except OSError as exc:
        echo(f"{outcome.path}: cannot write {target}: {exc.strerror or exc}")
        return EXIT_INPUT
    return EXIT_OK


def run_compare(old: Path, new: Path, formats: tuple[str, ...], out_dir: Path, fail_on: str,
                options: dict, quiet: bool, echo: Callable[[str], None],
                debug: bool = False) -> int:
    """Evaluate two revisions, compare them and write one comparison report per format."""
    from .compare import compare
    from .evaluate import evaluate
    from .recipe import load_recipe
    from .report import write_atomic
    from .report.comparison import RENDERERS

    recipes, problems = [], []
    for path in (old, new):
        try:
            recipes.append(load_recipe(path))
        except InputError as exc:
            problems += [p.format(exc.source) for p in exc.problems]
    if problems:
        for line in problems:
            echo(line)
        return EXIT_INPUT
    try:
        comparison = compare(recipes[0], evaluate(recipes[0]), recipes[1], evaluate(recipes[1]))
        outputs = {fmt: RENDERERS[fmt](comparison, **options) for fmt in formats}
    except Exception as exc:  # a bug
        echo(traceback.format_exc() if debug else
             f"chamberchk: internal error: {type(exc).__name__}: {exc} "
             "(rerun with --debug for the traceback)")
        return EXIT_INTERNAL
    stem = f"{_safe(old.stem) or 'old'}__{_safe(new.stem) or 'new'}"
    outcome = Outcome(new, EXIT_OK, [], outputs)
    if _write(outcome, out_dir / stem, {old.resolve(), new.resolve()}, write_atomic, echo):
        return EXIT_INPUT
    code, worst = _flag_code(comparison.flags, fail_on)
    _, worst_kept = _flag_code(comparison.remaining_flags, fail_on)
    if not quiet:
        echo(f"{old} -> {new}: {len(comparison.crossings)} regime crossing(s), worst new flag "
             f"{worst or 'none'}, worst flag kept from the old revision {worst_kept or 'none'}, "
             f"{len(comparison.resolved_flags)} flag(s) cleared; wrote "
             f"{', '.join(f'{stem}.{f}' for f in formats)} in {out_dir}")
    return code
