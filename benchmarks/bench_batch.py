"""Batch benchmarks: CLI import time, marginal cost per recipe of a JSON-only batch, peak memory,
and HTML + PDF time for the largest demo recipe.

Targets (issues 5 and 7): JSON-only batch of 400 recipes of 4 steps x 5 features under 25 ms per
recipe marginal cost on one core; peak memory under 300 MB; HTML + PDF of the largest demo recipe
under 3 s. Run: ``.venv/bin/python benchmarks/bench_batch.py``. Prints figures and PASS/MISS.
"""

from __future__ import annotations

import random
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
GASES = [("SiH4", "N2"), ("TMA", "N2"), ("WF6", "H2"), ("NH3", "Ar"), ("TEOS", "He"),
         ("Cl2", "Ar"), ("SF6", "O2")]


def recipe_text(seed: int) -> str:
    """A synthetic recipe of 4 steps x 5 features, varied so caches do not make it trivial."""
    rng = random.Random(seed)
    parts = ["format = 1", "[recipe]", f'name = "bench {seed}"']
    for k in range(5):
        w = rng.uniform(30, 3000)
        ar = rng.uniform(1, 60)
        shape = rng.choice(["trench", "via"])
        parts += ["[[feature]]", f'id = "f{k}"', f'shape = "{shape}"', f'width = "{w:.2f} nm"',
                  f'depth = "{w * ar:.1f} nm"']
    for k in range(4):
        a, b = rng.choice(GASES)
        parts += ["[[step]]", f'name = "s{k}"', 'process = "deposition"', 'duration = "5 s"',
                  f'pressure = "{10 ** rng.uniform(-2, 2.5):.4g} Torr"',
                  f'temperature = "{rng.uniform(20, 600):.1f} degC"',
                  f'gases = {{ {a} = "{rng.uniform(5, 200):.1f} sccm", '
                  f'{b} = "{rng.uniform(100, 2000):.0f} sccm" }}',
                  f"sticking = {rng.uniform(0, 0.05):.4f}", 'film = "0.5 nm"']
    return "\n".join(parts) + "\n"


def run(cmd: list[str]) -> float:
    t0 = time.perf_counter()
    subprocess.run(cmd, check=False, capture_output=True)
    return time.perf_counter() - t0


def main() -> None:
    exe = [sys.executable, "-m", "chamberchk"]
    t_import = min(run([sys.executable, "-c", "import chamberchk.cli"]) for _ in range(3))
    t_python = min(run([sys.executable, "-c", "pass"]) for _ in range(3))
    print(f"CLI import: {1e3 * (t_import - t_python):.0f} ms beyond a bare Python start")

    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        files = []
        for i in range(400):
            path = tmp / f"r{i:03d}.toml"
            path.write_text(recipe_text(i))
            files.append(str(path))
        small = files[:20]
        t_small = run(exe + ["check", *small, "--format", "json", "--out", str(tmp / "o1"),
                             "-q", "--fail-on", "never"])
        t_big = run(exe + ["check", *files, "--format", "json", "--out", str(tmp / "o2"),
                           "-q", "--fail-on", "never"])
        marginal = (t_big - t_small) / (len(files) - len(small))
        ok = "PASS" if marginal < 0.025 else "MISS"
        print(f"JSON batch: 20 recipes {t_small:.2f} s, 400 recipes {t_big:.2f} s -> "
              f"{1e3 * marginal:.1f} ms per recipe marginal (target < 25 ms) {ok}")
        usage = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss / 1024
        ok = "PASS" if usage < 300 else "MISS"
        print(f"peak memory of the largest child process: {usage:.0f} MB (target < 300 MB) {ok}")

        demos = sorted((ROOT / "recipes").glob("*.toml"), key=lambda p: p.stat().st_size)
        largest = demos[-1]
        t_json = run(exe + ["check", str(largest), "--format", "json", "--out",
                            str(tmp / "o3"), "-q", "--fail-on", "never"])
        t_both = run(exe + ["check", str(largest), "--format", "html,pdf", "--out",
                            str(tmp / "o3"), "-q", "--fail-on", "never"])
        ok = "PASS" if t_both < 3.0 else "MISS"
        print(f"HTML + PDF of {largest.name}: {t_both:.2f} s whole process "
              f"(JSON alone {t_json:.2f} s; target < 3 s) {ok}")
        t_pdf4 = run(exe + ["check", *map(str, demos), "--format", "pdf", "--out",
                            str(tmp / "o4"), "-q", "--fail-on", "never"])
        print(f"PDF for all {len(demos)} demo recipes in one process: {t_pdf4:.2f} s "
              f"({t_pdf4 / len(demos):.2f} s per recipe including start-up)")


if __name__ == "__main__":
    main()
