"""Benchmark: speed and accuracy of the transmission solvers and the Monte Carlo.

Run: .venv/bin/python benchmarks/bench_transmission.py

Prints, with the targets from the design brief:
* ms per uncached call of tube/slot_transmission, transmission_probability (straight and
  tapered) and bottom_flux_ratio, aspect ratio up to 200 (target < 20 ms at 1e-4 accuracy);
* the accuracy behind those timings (against the G4-01 table and against a refined mesh);
* Monte Carlo wall collisions per second on one core (target >= 2e6 /s);
* how many Monte Carlo molecules, and how long, a 1e-4 standard error would need at AR 10,
  against one integral-equation solve.

The matrices are small (a few hundred unknowns), so BLAS is limited to one thread: on a busy
2-core machine multi-threaded OpenBLAS can spin for hundreds of ms on a 200 x 200 solve.
"""

import os

os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")

import time  # noqa: E402

from chamberchk.physics import transmission as tr  # noqa: E402
from chamberchk.physics.montecarlo import simulate  # noqa: E402

# G4-01 (reference-values.md): tube W(L/R), library-computed Clausing solution
TUBE_TABLE = {0.5: 0.80127, 1: 0.67198, 2: 0.51423, 5: 0.31053, 10: 0.19094, 20: 0.10932,
              50: 0.04848, 100: 0.02528, 200: 0.01294, 500: 0.005263, 1000: 0.002648}


def _clear():
    for f in (tr._clausing, tr._profile_cached):
        f.cache_clear()


def ms_per_call(fn, repeat=3):
    """Median CPU time of an uncached call [ms] (CPU time: robust to other load on the
    machine; with BLAS on one thread it equals the wall time of an idle core)."""
    times = []
    for _ in range(repeat):
        _clear()
        t = time.process_time()
        fn()
        times.append(time.process_time() - t)
    return 1e3 * sorted(times)[len(times) // 2]


def refined(fn):
    """Evaluate fn with a 2-3x finer mesh of the radiosity solver (accuracy estimate)."""
    saved = dict(tr._MESH)
    tr._MESH.update(h_first=0.02, ratio=1.1, cap=0.5, sub=0.25, near=4.0)
    _clear()
    try:
        return fn()
    finally:
        tr._MESH.update(saved)
        _clear()


def main():
    print(f"OPENBLAS_NUM_THREADS={os.environ['OPENBLAS_NUM_THREADS']}; times are CPU time "
          f"per uncached call")
    print("\n1. Clausing tube and slot (target: < 20 ms, <= 2 ms typical, error < 1e-4)")
    worst = max(abs(tr.tube_transmission(x) - w) for x, w in TUBE_TABLE.items())
    print(f"   tube: largest |W - G4-01| over L/R 0.5-1000: {worst:.1e}")
    for x in (2, 10, 40, 100, 200, 400, 1000):
        print(f"   L/R or L/h = {x:5d}: tube {ms_per_call(lambda: tr.tube_transmission(x)):6.2f} ms"
              f"   slot {ms_per_call(lambda: tr.slot_transmission(x)):6.2f} ms")

    print("\n2. transmission_probability / bottom_flux_ratio, depth/width up to 200 "
          "(target < 20 ms at 1e-4)")
    print("   shape   AR  straight W [ms]  tapered 0.7 W [ms]  err vs fine   "
          "bottom s=0.01 [ms]  err vs fine")
    for shape in ("via", "trench"):
        for ar in (1, 5, 20, 50, 100, 200):
            t_straight = ms_per_call(lambda: tr.transmission_probability(shape, ar, 1.0))
            taper = lambda: tr.transmission_probability(shape, ar, 1.0, 0.7)  # noqa: E731
            bottom = lambda: tr.bottom_flux_ratio(shape, ar, 1.0, None, 0.01)  # noqa: E731
            t_taper, t_bottom = ms_per_call(taper, 1), ms_per_call(bottom, 1)
            e_taper = abs(taper() - refined(taper)) if ar <= 50 else float("nan")
            e_bottom = abs(bottom() - refined(bottom)) if ar <= 50 else float("nan")
            print(f"   {shape:7s}{ar:4d}  {t_straight:12.2f}  {t_taper:14.1f}  {e_taper:12.1e}"
                  f"  {t_bottom:14.1f}  {e_bottom:14.1e}")
    print("   (err vs fine: difference to a 2-3x refined mesh, computed for AR <= 50)")

    print("\n3. Monte Carlo, one core (target >= 2e6 wall collisions/s)")
    for args in (("via", 10.0, 1.0, None, 0.0, True), ("trench", 10.0, 1.0, None, 0.0, True),
                 ("via", 5.0, 1.0, 0.6, 0.01, False)):
        t, c = time.perf_counter(), time.process_time()
        r = simulate(*args, n_particles=100_000, seed=0)
        t, c = time.perf_counter() - t, time.process_time() - c
        print(f"   {args[0]:6s} AR {args[1]:4.0f} bottom {args[2] if args[3] is None else args[3]}"
              f" s={args[4]} open={args[5]}: {r.wall_collisions / t:.2e} /s wall clock, "
              f"{r.wall_collisions / c:.2e} /s CPU ({r.wall_collisions} collisions, {t:.2f} s)")

    print("\n4. Monte Carlo vs integral equation for a 1e-4 standard error, via AR 10 (L/R 20)")
    n = 100_000
    t = time.perf_counter()
    r = simulate("via", 10.0, 1.0, None, 0.0, True, n, seed=1)
    t = time.perf_counter() - t
    w = tr.tube_transmission(20.0)
    need = w * (1 - w) / 1e-4 ** 2
    t_mc = t / n * need
    t_ie = ms_per_call(lambda: tr.tube_transmission(20.0)) / 1e3
    print(f"   W = {w:.5f}; MC with {n} molecules: {r.estimate:.4f} +- {r.standard_error:.4f}, "
          f"{r.wall_collisions / n:.1f} wall collisions per molecule")
    print(f"   1e-4 standard error needs {need:.2e} molecules, about {t_mc:.0f} s of Monte Carlo;"
          f" the integral equation takes {1e3 * t_ie:.2f} ms: ratio {t_mc / t_ie:.1e}")


if __name__ == "__main__":
    main()
