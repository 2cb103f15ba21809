"""Side-by-side speed comparison of the same batch work done three ways:

(a) flatray through the Python binding, numpy arrays in and out (one library call
    per batch, on every core);
(b) a NumPy vectorised implementation of the same formulas (numpy_baseline.py,
    what a survey script would otherwise contain);
(c) a plain C loop calling the C ABI one point at a time on one thread
    (scalar_loop.c, compiled here with gcc -O2 against target/release).

Workloads (invented scenes, deterministic inputs): batch trace through one layer
(a camera port), sagittal true positions (drone over a lake), apparent positions
(sagittal and tangential), lines of sight through three layers (a camera behind
a port looking through an air gap and an aquarium wall). Prints throughput,
ratios, the agreement of the three, and where the time of (a) goes.

Run from the repository root with the project venv, after
`cargo build --release --lib`:

    .venv/bin/python bindings/python/bench/compare.py            # 1e6 points
    .venv/bin/python bindings/python/bench/compare.py --points 100000 --repeats 5

Timings are wall clock, the best of --repeats runs (the best is the most
repeatable figure on a shared machine; still expect 10-20 % noise).
"""

from __future__ import annotations

import argparse
import ctypes
import gc
import json
import os
import platform
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

HERE = Path(__file__).resolve().parent
REPO = HERE.parent.parent.parent
sys.path.insert(0, str(HERE.parent))  # the flatray package (bindings/python)
sys.path.insert(0, str(HERE))

import flatray  # noqa: E402
import numpy_baseline as base  # noqa: E402

#: Agreement tolerances: positions and lengths within 1e-9 m (the accuracy
#: flatray promises for lines of sight, 1e-14 of the geometry's size, is 1e-12 m
#: here; the closed-form paths agree to a few ulps), unit directions and
#: transmittances within 1e-12.
TOL_LENGTH_M = 1e-9
TOL_UNITLESS = 1e-12


# --- workloads -------------------------------------------------------------------

def lake():
    """A drone survey over a lake: air above, water below (normal down).
    Indices: air 1.00028, fresh water 1.339 at 532 nm, common-practice values."""
    return flatray.Stack.single_interface((0, 0, 0), (0, 0, -1), 1.00028, 1.339)


def port():
    """An underwater camera's flat port: air, 10 mm glass (1.52), water (1.339)."""
    return flatray.Stack((0, 0, 0.04), (0, 0, 1), 1.00028, [(0.010, 1.52)], 1.339)


def tank():
    """A camera behind an 8 mm glass port, a 4 mm air gap, then a 120 mm acrylic
    aquarium wall (1.49) and water (1.333): three layers."""
    return flatray.Stack((0, 0, 0.05), (0, 0, 1), 1.00028,
                         [(0.008, 1.52), (0.004, 1.00028), (0.120, 1.49)], 1.333)


def survey_points(n, rng):
    """Sensors on 40 m flight lines and sea-floor points up to 35 m across track
    (view angles up to about 41 degrees), 0.2 to 8 m deep."""
    sensors = np.column_stack([rng.uniform(0, 500, n), 25.0 * rng.integers(0, 20, n),
                               np.full(n, 40.0)])
    floor = sensors + np.column_stack([rng.uniform(-5, 5, n), rng.uniform(-35, 35, n),
                                       np.zeros(n)])
    floor[:, 2] = -rng.uniform(0.2, 8.0, n)
    return np.ascontiguousarray(sensors), np.ascontiguousarray(floor)


def make_workloads(n, seed=2024):
    rng = np.random.default_rng(seed)
    sensors, floor = survey_points(n, rng)
    water = lake()
    seen, st = flatray.apparent_positions(water, sensors, floor, "sagittal")
    assert (st == 0).all()

    side = int(np.ceil(np.sqrt(n)))
    grid = np.linspace(-1.0, 1.0, side)  # tan of up to 45 degrees on each axis
    gx, gy = np.meshgrid(grid, grid)
    directions = np.column_stack([gx.ravel()[:n], gy.ravel()[:n], np.ones(n)])
    camera = np.zeros(3)

    cams = np.column_stack([rng.uniform(-0.5, 0.5, n), rng.uniform(-0.5, 0.5, n), np.zeros(n)])
    fish = np.column_stack([rng.uniform(-1.5, 1.5, n), rng.uniform(-1.5, 1.5, n),
                            rng.uniform(0.25, 3.0, n)])
    glass = port()
    wall = tank()
    return [
        dict(name="trace_1_layer", label="batch trace, 1 layer", closed=True,
             target=5.0, unit="rays",
             flatray=lambda: flatray.trace_rays(glass, camera, directions),
             numpy=lambda: base.trace(glass, camera[None, :], directions),
             c=("trace", glass, _rays(camera, directions), None),
             raw=("flatray_trace_rays", glass, directions),
             compare=_compare_trace),
        dict(name="true_sagittal", label="true positions, sagittal", closed=True,
             target=5.0, unit="points",
             flatray=lambda: flatray.true_positions(water, sensors, seen, "sagittal"),
             numpy=lambda: base.true_positions_sagittal(water, sensors, seen),
             c=("true_sagittal", water, sensors, seen),
             raw=("flatray_true_positions", water, sensors, seen, 0),
             compare=_compare_points),
        dict(name="apparent_sagittal", label="apparent positions, sagittal", closed=False,
             target=10.0, unit="points",
             flatray=lambda: flatray.apparent_positions(water, sensors, floor, "sagittal"),
             numpy=lambda: base.apparent_positions(water, sensors, floor, "sagittal"),
             c=("apparent_sagittal", water, sensors, floor),
             raw=("flatray_apparent_positions", water, sensors, floor, 0),
             compare=_compare_points),
        dict(name="apparent_tangential", label="apparent positions, tangential",
             closed=False, target=10.0, unit="points",
             flatray=lambda: flatray.apparent_positions(water, sensors, floor, "tangential"),
             numpy=lambda: base.apparent_positions(water, sensors, floor, "tangential"),
             c=("apparent_tangential", water, sensors, floor),
             raw=("flatray_apparent_positions", water, sensors, floor, 1),
             compare=_compare_points),
        dict(name="los_3_layers", label="lines of sight, 3 layers", closed=False,
             target=10.0, unit="paths",
             flatray=lambda: flatray.lines_of_sight(wall, cams, fish),
             numpy=lambda: base.lines_of_sight(wall, cams, fish),
             c=("los", wall, cams, fish),
             raw=("flatray_lines_of_sight", wall, cams, fish),
             compare=_compare_paths),
    ]


def _rays(origin, directions):
    rays = np.empty((len(directions), 2, 3))
    rays[:, 0, :] = origin
    rays[:, 1, :] = directions
    return rays


# --- agreement -------------------------------------------------------------------

def _max_diff(a, b):
    """Largest |a - b| where both are finite; inf when their NaN patterns differ."""
    a = np.asarray(a, dtype=np.float64)
    b = np.asarray(b, dtype=np.float64)
    if not np.array_equal(np.isnan(a), np.isnan(b)):
        return float("inf")
    finite = ~np.isnan(a)
    return float(np.max(np.abs(a[finite] - b[finite]), initial=0.0))


def _compare_trace(ours, other):
    """Fields of a trace: (origins m, directions, transmittance)."""
    return [("origin (m)", _max_diff(ours[0], other[0]), TOL_LENGTH_M),
            ("direction", _max_diff(ours[1], other[1]), TOL_UNITLESS),
            ("transmittance", _max_diff(ours[2], other[2]), TOL_UNITLESS)]


def _compare_points(ours, other):
    return [("position (m)", _max_diff(ours, other), TOL_LENGTH_M)]


def _compare_paths(ours, other):
    names = [("direction", TOL_UNITLESS), ("entry (m)", TOL_LENGTH_M),
             ("exit (m)", TOL_LENGTH_M), ("geometric length (m)", TOL_LENGTH_M),
             ("optical length (m)", TOL_LENGTH_M), ("transmittance", TOL_UNITLESS)]
    return [(name, _max_diff(a, b), tol) for (name, tol), a, b in zip(names, ours, other)]


def flatray_fields(work, result):
    """The comparable fields of a flatray result, and its status array."""
    if work["name"] == "trace_1_layer":
        return (result.origins, result.directions, result.transmittance), result.status
    if work["name"] == "los_3_layers":
        return tuple(result[:6]), result.status
    return result.points, result.status


# --- the C loop ------------------------------------------------------------------

def build_scalar_loop(library: Path, workdir: Path) -> Path:
    cc = os.environ.get("CC", "gcc")
    if shutil.which(cc) is None:
        raise SystemExit(f"compare.py: C compiler {cc!r} not found (set CC)")
    exe = workdir / "scalar_loop"
    subprocess.run([cc, "-O2", "-std=c99", "-Wall", "-Wextra", "-I", str(REPO / "include"),
                    "-o", str(exe), str(HERE / "scalar_loop.c"), "-L", str(library.parent),
                    "-lflatray", f"-Wl,-rpath,{library.parent}", "-lm"], check=True)
    return exe


def run_scalar_loop(exe, workdir, work, n, repeats):
    kind, stack, a, b = work["c"]
    (workdir / "stack.bin").write_bytes(bytes(stack.to_c()))
    np.ascontiguousarray(a, dtype=np.float64).tofile(workdir / "a.bin")
    if b is not None:
        np.ascontiguousarray(b, dtype=np.float64).tofile(workdir / "b.bin")
    done = subprocess.run([str(exe), kind, str(workdir), str(n), str(repeats)],
                          check=True, capture_output=True, text=True)
    seconds = float(done.stdout.split()[1])
    status = np.fromfile(workdir / "status.bin", dtype=np.int32)
    out = np.fromfile(workdir / "out.bin", dtype=np.float64)
    if kind == "trace":
        rays = out.reshape(n, 2, 3)
        t = np.fromfile(workdir / "transmittance.bin", dtype=np.float64)
        fields = (rays[:, 0, :], rays[:, 1, :], t)
    elif kind == "los":
        p = out.reshape(n, 12)
        fields = (p[:, 0:3], p[:, 3:6], p[:, 6:9], p[:, 9], p[:, 10], p[:, 11])
    else:
        fields = out.reshape(n, 3)
    return seconds, fields, status


# --- timing ----------------------------------------------------------------------

def best_of(fn, repeats):
    """The best wall-clock time of ``repeats`` calls, and the last result."""
    best, result = float("inf"), None
    for _ in range(repeats):
        result = None
        gc.collect()
        start = time.perf_counter()
        result = fn()
        best = min(best, time.perf_counter() - start)
    return best, result


_VEC_P = ctypes.POINTER(flatray.FlatrayVec3)
_INT_P = ctypes.POINTER(ctypes.c_int32)


def raw_call(spec, n):
    """A closure making only the library call of a workload through ctypes, with
    every buffer prepared beforehand: the binding's own cost is the difference."""
    name, stack, *args = spec
    c_stack = ctypes.byref(stack.to_c())
    fn = getattr(flatray.lib, name)
    status = np.empty(n, dtype=np.int32)
    st = status.ctypes.data_as(_INT_P)
    if name == "flatray_trace_rays":
        rays = _rays(np.zeros(3), args[0])
        out = np.empty((n, 2, 3))
        t = np.empty(n)
        r_p = ctypes.POINTER(flatray.FlatrayRay)
        rp, op, tp = rays.ctypes.data_as(r_p), out.ctypes.data_as(r_p), t.ctypes.data_as(
            ctypes.POINTER(ctypes.c_double))
        return lambda: fn(c_stack, rp, n, op, tp, st)
    obs, pts = (np.ascontiguousarray(a) for a in args[:2])
    op_, pp = obs.ctypes.data_as(_VEC_P), pts.ctypes.data_as(_VEC_P)
    if name == "flatray_lines_of_sight":
        out = np.empty((n, 12))
        outp = out.ctypes.data_as(ctypes.POINTER(flatray.FlatrayPath))
        return lambda: fn(c_stack, op_, len(obs), pp, n, outp, st)
    image = args[2]
    out = np.empty((n, 3))
    outp = out.ctypes.data_as(_VEC_P)
    return lambda: fn(c_stack, op_, len(obs), pp, n, image, outp, st)


def call_overhead(lake_stack, calls=20000):
    """Seconds per call of an empty batch: through the wrapper, and raw ctypes."""
    empty = np.empty((0, 3))
    eye = np.zeros(3)
    start = time.perf_counter()
    for _ in range(calls):
        flatray.true_positions(lake_stack, eye, empty)
    wrapper = (time.perf_counter() - start) / calls
    c_stack = ctypes.byref(lake_stack.to_c())
    fn = flatray.lib.flatray_true_positions
    start = time.perf_counter()
    for _ in range(calls):
        fn(c_stack, None, 0, None, 0, 0, None, None)
    raw = (time.perf_counter() - start) / calls
    return wrapper, raw


# --- the report ------------------------------------------------------------------

def machine():
    cpu = "unknown"
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                cpu = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    return {
        "nproc": os.cpu_count(),
        "cpu": cpu,
        "python": platform.python_version(),
        "numpy": np.__version__,
        "rayon_threads": os.environ.get("RAYON_NUM_THREADS", "default (one per core)"),
    }


def rate(n, seconds):
    return n / seconds / 1e6


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--points", type=int, default=1_000_000)
    parser.add_argument("--repeats", type=int, default=3)
    parser.add_argument("--only", nargs="*", help="workload names to run")
    parser.add_argument("--no-one-thread", action="store_true",
                        help="skip the flatray one-thread column (a child process)")
    parser.add_argument("--flatray-only", action="store_true", help=argparse.SUPPRESS)
    args = parser.parse_args(argv)
    n = args.points

    library = Path(flatray.library_path)
    works = make_workloads(n)
    if args.only:
        works = [w for w in works if w["name"] in args.only]

    if args.flatray_only:  # the child of the one-thread column: print JSON times
        print(json.dumps({w["name"]: best_of(w["flatray"], args.repeats)[0] for w in works}))
        return 0

    if "release" not in library.parts:
        print(f"warning: timing {library}, not a release build", file=sys.stderr)
    info = machine()
    print(f"flatray speed comparison: {n} points, best of {args.repeats} runs")
    print(f"machine: {info['nproc']} cores ({info['cpu']}), Python {info['python']}, "
          f"numpy {info['numpy']}, rayon threads: {info['rayon_threads']}")
    print(f"library: {library}")

    one_thread = {}
    if not args.no_one_thread:
        env = dict(os.environ, RAYON_NUM_THREADS="1")
        child = [sys.executable, str(Path(__file__).resolve()), "--flatray-only",
                 "--points", str(n), "--repeats", str(args.repeats)]
        if args.only:
            child += ["--only", *args.only]
        done = subprocess.run(child, env=env, check=True, capture_output=True, text=True)
        one_thread = json.loads(done.stdout.strip().splitlines()[-1])

    rows, agreement, breakdown = [], [], []
    ok = True
    with tempfile.TemporaryDirectory(prefix="flatray-compare-") as tmp:
        workdir = Path(tmp)
        exe = build_scalar_loop(library, workdir)
        for w in works:
            t_flat, result = best_of(w["flatray"], args.repeats)
            ours, status = flatray_fields(w, result)
            t_raw, _ = best_of(raw_call(w["raw"], n), args.repeats)
            with np.errstate(invalid="ignore", divide="ignore"):
                t_np, theirs = best_of(w["numpy"], args.repeats)
            t_c, c_fields, c_status = run_scalar_loop(exe, workdir, w, n, args.repeats)
            failed = int(np.count_nonzero(status))
            same_as_c = (np.array_equal(status, c_status) and
                         all(d == 0.0 for _, d, _ in w["compare"](ours, c_fields)))
            vs_numpy = w["compare"](ours, theirs)
            within = all(d <= tol for _, d, tol in vs_numpy)
            ok &= same_as_c and within and failed == 0
            ratio = t_np / t_flat
            rows.append((w, t_flat, t_np, t_c, one_thread.get(w["name"]), ratio))
            agreement.append((w, failed, same_as_c, vs_numpy, within))
            breakdown.append((w, t_flat, t_raw))

    print()
    print("| workload | flatray, Python (all cores) | NumPy baseline | C loop (1 core) "
          "| flatray, Python (1 thread) | flatray / NumPy | target | flatray / C loop |")
    print("|---|---:|---:|---:|---:|---:|---:|---:|")
    for w, t_flat, t_np, t_c, t_one, ratio in rows:
        one = f"{rate(n, t_one):.1f} M/s" if t_one else "-"
        met = "met" if ratio >= w["target"] else "missed"
        print(f"| {w['label']} | {rate(n, t_flat):.1f} M/s | {rate(n, t_np):.2f} M/s | "
              f"{rate(n, t_c):.2f} M/s | {one} | {ratio:.1f}x | >= {w['target']:.0f}x "
              f"({met}) | {t_c / t_flat:.1f}x |")
    print()
    print(f"Agreement (|difference| where finite; tolerances: {TOL_LENGTH_M:g} m for "
          f"positions and lengths, {TOL_UNITLESS:g} for directions and transmittances):")
    for w, failed, same_as_c, vs_numpy, within in agreement:
        fields = ", ".join(f"{name} {d:.1e}" for name, d, _ in vs_numpy)
        print(f"  {w['label']}: {failed} failed points; flatray batch == C loop bit for bit: "
              f"{'yes' if same_as_c else 'NO'}; vs NumPy: {fields} "
              f"({'within' if within else 'OUTSIDE'} tolerance)")
    print()
    wrapper, raw = call_overhead(lake())
    print(f"Where the time of flatray through Python goes (ctypes call of an empty batch: "
          f"{wrapper * 1e6:.1f} us through the wrapper, {raw * 1e6:.1f} us raw):")
    for w, t_flat, t_raw in breakdown:
        print(f"  {w['label']}: {t_flat * 1e3:.1f} ms in all, {t_raw * 1e3:.1f} ms in the "
              f"library call alone, {max(t_flat - t_raw, 0.0) * 1e3:.1f} ms in the binding "
              f"(input conversion, output allocation, status checks)")
    print()
    print("all three agree" if ok else "DISAGREEMENT: see above")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
