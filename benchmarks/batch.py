"""Speed and memory figures, each printed beside its floor and target (run: python benchmarks/batch.py).

One run prints, with the machine's load average before and after (the figures are CPU times where they can be, so
that other work on the machine disturbs them less; wall times are marked):

1. Start-up: CPU of ``hazard --help`` against ``python -c "import numpy"`` (target: no more), and of ``hazard assess``
   of one product of the demo line-up (target: under 0.5 s). Median of interleaved runs, bytecode compiled once first.
2. Studies: CPU of assessing the demo line-up with the distance study and remedies against without (target ≤ 3×), and
   of a batch of records that state an uncertainty against the same records without one (target ≤ 1.3×).
3. ``assess_many`` on 10⁵ and 10⁶ in-memory spectra (200-3000 nm at 1 nm, float32) against the bare matrix product
   of the same array with the weight matrix, the floor (target ≤ 2×), and the peak memory against the input plus
   1 KiB per product. Each size runs in its own process, so its peak resident memory is its own.
4. PDF reports per second, two worker processes rendering the line-up's reports (wall time; target ≥ 20/s).
5. ``hazard batch`` on 2000 CSV files (300-830 nm and 300-3000 nm): CPU of the whole run against reading the same
   files with ``numpy.loadtxt`` (target ≤ 2×), and wall time with ``--jobs 2`` against ``--jobs 1`` (target ≥ 1.6×).

The spectra and records made here are invented (random mixtures of Gaussian bands), only for timing.
Sizes: ``--sizes 100000,1000000`` (the 10⁶ run needs about 12 GiB of memory), ``--repeats``, ``--skip``.
"""

from __future__ import annotations

import argparse
import json
import os
import resource
import shlex
import statistics
import subprocess
import sys
import tempfile
import time
from concurrent.futures import ProcessPoolExecutor
from pathlib import Path

import numpy as np

GRID_NM = np.arange(200.0, 3001.0, 1.0)
LINEUP = Path(__file__).resolve().parents[1] / "examples" / "lineup"
Row = tuple[str, str, str, str, str]
"""(figure, measured, floor, target, verdict)."""


def _verdict(ok: bool) -> str:
    return "met" if ok else "MISSED"


# ---------------------------------------------------------------- 1. start-up


def _child_cpu_s(command: list[str], env: dict[str, str]) -> float:
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    subprocess.run(command, env=env, check=True, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    return after.ru_utime - before.ru_utime + after.ru_stime - before.ru_stime


def startup_rows(repeats: int) -> list[Row]:
    """CPU of the command's start against importing numpy, median of ``repeats`` interleaved runs each."""
    env = {k: v for k, v in os.environ.items() if k != "PYTHONDONTWRITEBYTECODE"}  # as an installed tool runs
    hazard = [sys.executable, "-m", "hazard.cli"]
    product = str(LINEUP / "cl-desk-30.toml")
    commands = {
        "numpy": [sys.executable, "-c", "import numpy"],
        "help": [*hazard, "--help"],
        "assess": [*hazard, "assess", product],
    }
    for command in commands.values():  # writes the bytecode caches
        _child_cpu_s(command, env)
    times: dict[str, list[float]] = {name: [] for name in commands}
    for _ in range(repeats):
        for name, command in commands.items():
            times[name].append(_child_cpu_s(command, env))
    numpy_s, help_s, assess_s = (statistics.median(times[k]) for k in ("numpy", "help", "assess"))
    return [
        (
            "start-up: hazard --help (CPU)",
            f"{help_s:.3f} s",
            f"import numpy {numpy_s:.3f} s",
            "≤ import numpy",
            _verdict(help_s <= numpy_s),
        ),
        (
            f"start-up: hazard assess {Path(product).name} (CPU)",
            f"{assess_s:.3f} s",
            f"import numpy {numpy_s:.3f} s",
            "< 0.5 s",
            _verdict(assess_s < 0.5),
        ),
    ]


# ---------------------------------------------------------------- 2. studies


def _assess_cpu_s(loaded_products, studies: bool) -> float:
    from hazard.assessment.build import build_assessment
    from hazard.assessment.pipeline import evaluate_loaded

    start = time.process_time()
    for loaded in loaded_products:
        build_assessment(loaded, evaluate_loaded([loaded]), 0, studies=studies)
    return time.process_time() - start


def _uncertainty_corpus(folder: Path, n: int) -> tuple[list[Path], list[Path]]:
    """n invented products on one 1 nm grid, each as two records: without and with a stated uncertainty."""
    spectra, plain, stated = _spectra(n, seed=5), [], []
    rng = np.random.default_rng(13)
    for i, values in enumerate(spectra):
        csv = folder / f"u{i:04d}.csv"
        csv.write_text(
            "# invented\nwavelength_nm,value\n"
            + "".join(f"{w:.0f},{v:.6g}\n" for w, v in zip(GRID_NM, values, strict=True))
        )
        common = (
            f'spectrum = "{csv.name}"\ndistance_mm = {rng.uniform(100, 1000):.1f}\n'
            f"source_diameter_mm = {rng.uniform(0.5, 60):.2f}\nno_emission_outside = true\n"
        )
        for kind, extra, out in (
            ("p", "", plain),
            ("u", "uncertainty_pct = 8.0\nwavelength_uncertainty_nm = 1.0\n", stated),
        ):
            record = folder / f"{kind}{i:04d}.toml"
            record.write_text(f'id = "{kind.upper()}{i:04d}"\n' + common + extra)
            out.append(record)
    return plain, stated


def studies_rows(repeats: int, uncertainty_products: int) -> list[Row]:
    """Studies against the plain assessment over the line-up; records with an uncertainty against without."""
    from hazard.inputs.loading import load_product

    lineup = [load_product(path) for path in sorted(LINEUP.glob("*.toml"))]
    with tempfile.TemporaryDirectory() as tmp:
        plain_paths, stated_paths = _uncertainty_corpus(Path(tmp), uncertainty_products)
        plain, stated = [load_product(p) for p in plain_paths], [load_product(p) for p in stated_paths]
        _assess_cpu_s(lineup, True), _assess_cpu_s(plain[:2], False), _assess_cpu_s(stated[:2], False)  # warm-up
        runs: dict[str, list[float]] = {"plain": [], "studies": [], "without": [], "with": []}
        for _ in range(repeats):  # interleaved: a change in the machine's load falls on both sides of each ratio
            runs["plain"].append(_assess_cpu_s(lineup, False))
            runs["studies"].append(_assess_cpu_s(lineup, True))
            runs["without"].append(_assess_cpu_s(plain, False))
            runs["with"].append(_assess_cpu_s(stated, False))
    best = {k: min(v) for k, v in runs.items()}
    ratio, unc = best["studies"] / best["plain"], best["with"] / best["without"]
    n = len(lineup)
    return [
        (
            f"studies: line-up of {n}, distances + remedies (CPU)",
            f"{best['studies'] / n * 1e3:.1f} ms/product",
            f"plain {best['plain'] / n * 1e3:.1f} ms/product",
            "≤ 3× plain",
            f"{ratio:.2f}× {_verdict(ratio <= 3)}",
        ),
        (
            f"studies: {uncertainty_products} records with an uncertainty (CPU)",
            f"{best['with'] / uncertainty_products * 1e3:.1f} ms/product",
            f"without {best['without'] / uncertainty_products * 1e3:.1f} ms/product",
            "≤ 1.3× without",
            f"{unc:.2f}× {_verdict(unc <= 1.3)}",
        ),
    ]


# ---------------------------------------------------------------- 3. assess_many


def _spectra(n: int, seed: int = 7) -> np.ndarray:
    """n invented spectra: non-negative mixtures of 24 Gaussian bands across 200-3000 nm [W/m2/nm], float32."""
    rng = np.random.default_rng(seed)
    centres = np.linspace(220, 2900, 24)
    basis = np.exp(-0.5 * ((GRID_NM[None, :] - centres[:, None]) / 40.0) ** 2).astype(np.float32)
    out = np.empty((n, GRID_NM.size), dtype=np.float32)
    for start in range(0, n, 65536):  # in blocks: no float64 temporary of the whole array
        rows = min(65536, n - start)
        out[start : start + rows] = rng.exponential(0.02, (rows, centres.size)).astype(np.float32) @ basis
    return out


def _records(n: int, seed: int = 11, shared: bool = False):
    """Record fields: one measurement set-up for all (``shared``) or a geometry of its own per product."""
    import pandas as pd

    rng = np.random.default_rng(seed)
    ids = [f"P{i:07d}" for i in range(n)]
    if shared:
        return pd.DataFrame(
            {
                "id": ids,
                "distance_mm": 200.0,
                "source_diameter_mm": 5.0,
                "no_emission_outside": True,
                "lamp_type": "other",
            }
        )
    return pd.DataFrame(
        {
            "id": ids,
            "distance_mm": rng.uniform(100, 1000, n).round(1),
            "source_diameter_mm": rng.uniform(0.5, 60, n).round(2),
            "no_emission_outside": True,
            "lamp_type": np.where(rng.random(n) < 0.2, "gls", "other"),
        }
    )


def _peak_rss_bytes() -> int:
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss * 1024


def part_many(n: int, repeats: int) -> dict:
    """In this process: the floor and assess_many (shared set-up, then own geometry) on one float32 array."""
    from hazard import assess_many
    from hazard.method.integrals import integral_matrix
    from hazard.standards import DEFAULT_LIMIT_SET

    assess_many(_records(100), GRID_NM, _spectra(100))  # imports and tables before the baseline
    shared, own = _records(n, shared=True), _records(n)
    base = _peak_rss_bytes()
    spectra = _spectra(n)
    weights = np.ascontiguousarray(integral_matrix(GRID_NM, DEFAULT_LIMIT_SET), dtype=np.float32)
    runs: dict[str, list[float]] = {"floor": [], "shared": [], "own": []}
    for _ in range(repeats):  # interleaved; CPU time of the process (BLAS threads included)
        for label, run in (
            ("floor", lambda: spectra @ weights),
            ("shared", lambda: assess_many(shared, GRID_NM, spectra)),
            ("own", lambda: assess_many(own, GRID_NM, spectra)),
        ):
            start = time.process_time()
            result = run()
            runs[label].append(time.process_time() - start)
            if label != "floor" and not (result["status"] == "ok").all():
                raise RuntimeError(result.loc[result["status"] != "ok", "error"].iloc[0])
            del result
    return {
        "n": n,
        **{f"{k}_s": min(v) for k, v in runs.items()},
        "input_bytes": spectra.nbytes,
        "peak_over_base_bytes": _peak_rss_bytes() - base,
    }


def many_rows(sizes: list[int], repeats: int) -> list[Row]:
    rows: list[Row] = []
    for n in sizes:
        command = [sys.executable, __file__, "--part-many", str(n), "--repeats", str(repeats)]
        found = json.loads(subprocess.run(command, check=True, capture_output=True, text=True).stdout)
        floor = found["floor_s"]
        for label, what in (("shared", "one set-up for all"), ("own", "own geometry each")):
            ratio = found[f"{label}_s"] / floor
            rows.append(
                (
                    f"assess_many {n:.0e}, {what} (CPU)",
                    f"{found[f'{label}_s']:.2f} s",
                    f"matrix product {floor:.2f} s",
                    "≤ 2× floor",
                    f"{ratio:.2f}× {_verdict(ratio <= 2)}",
                )
            )
        allowed = found["input_bytes"] + 1024 * n
        peak = found["peak_over_base_bytes"]  # the input itself is part of the peak
        rows.append(
            (
                f"assess_many {n:.0e}, peak memory",
                f"{peak / 2**20:.0f} MiB",
                f"input {found['input_bytes'] / 2**20:.0f} MiB",
                f"≤ input + 1 KiB/product = {allowed / 2**20:.0f} MiB",
                _verdict(peak <= allowed),
            )
        )
    return rows


# ---------------------------------------------------------------- 4. PDFs


def _render(path: str) -> float:
    """Render one saved result's PDF; the CPU it took [s]."""
    from hazard.reports import render_assessment_pdf, report_time
    from hazard.result import Assessment

    start = time.process_time()
    render_assessment_pdf(Assessment.model_validate_json(Path(path).read_bytes()), report_time())
    return time.process_time() - start


def pdf_rows(rounds: int) -> list[Row]:
    """Two worker processes render the line-up's reports ``rounds`` times (wall time, as ``--jobs 2`` would)."""
    from hazard.assessment.build import assess

    with tempfile.TemporaryDirectory() as tmp:
        paths = []
        for record in sorted(LINEUP.glob("*.toml")):
            path = Path(tmp) / f"{record.stem}.json"
            path.write_text(assess(record).model_dump_json())
            paths.append(str(path))
        with ProcessPoolExecutor(2) as pool:
            list(pool.map(_render, paths))  # imports in both workers
            start = time.perf_counter()
            cpu = list(pool.map(_render, paths * rounds))
            wall = time.perf_counter() - start
    rate = len(cpu) / wall
    try:
        import _rl_accel  # noqa: F401

        accel = "C accelerator in use"
    except ImportError:
        accel = "no C accelerator"
    return [
        (
            f"PDF reports, 2 workers ({accel}; wall)",
            f"{rate:.1f} reports/s",
            f"{statistics.median(cpu) * 1e3:.0f} ms CPU/report",
            "≥ 20/s",
            _verdict(rate >= 20),
        )
    ]


# ---------------------------------------------------------------- 5. hazard batch (hook)


def _batch_corpus(folder: Path, n: int, grid_nm: np.ndarray) -> Path:
    """``n`` invented spectrum files on ``grid_nm`` and their manifest (200 mm, 5 mm sources)."""
    values = _spectra(n)[:, : grid_nm.size] if grid_nm.size <= GRID_NM.size else None
    assert values is not None
    lines = ["id,spectrum,distance_mm,source_diameter_mm,no_emission_outside"]
    for k in range(n):
        table = np.column_stack([grid_nm, values[k]])
        np.savetxt(folder / f"s{k}.csv", table, delimiter=",", fmt="%.6g", header="wavelength_nm,value", comments="")
        lines.append(f"P{k},s{k}.csv,200,5,true")
    manifest = folder / "manifest.csv"
    manifest.write_text("\n".join(lines) + "\n")
    return manifest


def _loadtxt_cpu_s(folder: Path, n: int) -> float:
    start = time.process_time()
    for k in range(n):
        np.loadtxt(folder / f"s{k}.csv", delimiter=",", skiprows=1)
    return time.process_time() - start


def _batch_run(manifest: Path, jobs: int) -> tuple[float, float]:
    """Wall and CPU time (all processes) of ``hazard batch`` on ``manifest`` with ``jobs`` workers [s]."""
    out = manifest.parent / f"out-{jobs}"
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    start = time.perf_counter()
    command = [sys.executable, "-m", "hazard.cli", "batch", str(manifest), "--output", str(out), "--jobs", str(jobs)]
    subprocess.run(command, check=False, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    wall = time.perf_counter() - start
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    subprocess.run(["rm", "-rf", str(out)], check=True)
    return wall, after.ru_utime - before.ru_utime + after.ru_stime - before.ru_stime


def batch_rows(n: int = 2000, repeats: int = 2) -> list[Row]:
    """``hazard batch`` on ``n`` CSV files of two grid lengths: CPU against reading the same files with
    ``numpy.loadtxt`` (target ≤ 2×), and wall time with ``--jobs 2`` against ``--jobs 1`` (target ≥ 1.6×)."""
    rows: list[Row] = []
    for label, grid in (("300-830 nm", np.arange(300.0, 831.0)), ("300-3000 nm", np.arange(300.0, 3001.0))):
        with tempfile.TemporaryDirectory() as tmp:
            manifest = _batch_corpus(Path(tmp), n, grid)
            floor = min(_loadtxt_cpu_s(Path(tmp), n) for _ in range(repeats))
            one = [_batch_run(manifest, 1) for _ in range(repeats)]
            two = [_batch_run(manifest, 2) for _ in range(repeats)]
        cpu = min(c for _, c in one)
        wall_one, wall_two = min(w for w, _ in one), min(w for w, _ in two)
        rows.append(
            (
                f"hazard batch, {n} files {label}, --jobs 1 (CPU)",
                f"{cpu:.2f} s ({n / cpu:.0f}/s)",
                f"numpy.loadtxt {floor:.2f} s",
                "≤ 2× loadtxt",
                f"{cpu / floor:.2f}× {_verdict(cpu <= 2 * floor)}",
            )
        )
        speedup = wall_one / wall_two
        rows.append(
            (
                f"hazard batch, {n} files {label}, --jobs 2 (wall)",
                f"{wall_two:.2f} s ({n / wall_two:.0f}/s)",
                f"--jobs 1 {wall_one:.2f} s",
                "≥ 1.6× --jobs 1",
                f"{speedup:.2f}× {_verdict(speedup >= 1.6)}",
            )
        )
    return rows


# ---------------------------------------------------------------- table


def _load() -> str:
    one, five, fifteen = os.getloadavg()
    return f"{one:.2f} {five:.2f} {fifteen:.2f}"


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--sizes", default="100000,1000000", help="assess_many sizes, comma-separated")
    parser.add_argument("--repeats", type=int, default=3, help="runs of each figure (interleaved)")
    parser.add_argument("--skip", default="", help="parts to leave out: startup,studies,many,pdf,batch")
    parser.add_argument("--part-many", type=int, help=argparse.SUPPRESS)
    args = parser.parse_args()
    if args.part_many:
        print(json.dumps(part_many(args.part_many, args.repeats)))
        return
    skip = set(filter(None, args.skip.split(",")))
    print(f"{shlex.join(['python', *sys.argv])}\nload average before: {_load()} ({os.cpu_count()} CPUs)")
    rows: list[Row] = []
    parts = {
        "startup": lambda: startup_rows(max(5, args.repeats)),
        "studies": lambda: studies_rows(args.repeats, 100),
        "many": lambda: many_rows([int(s) for s in args.sizes.split(",") if s], args.repeats),
        "pdf": lambda: pdf_rows(4),
        "batch": lambda: batch_rows(repeats=max(1, args.repeats - 1)),
    }
    for name, part in parts.items():
        if name not in skip:
            rows += part()
    header: Row = ("figure", "measured", "floor", "target", "verdict")
    widths = [max(len(r[i]) for r in [header, *rows]) for i in range(5)]
    for row in [header, *rows]:
        print("  ".join(c.ljust(w) for c, w in zip(row, widths, strict=True)).rstrip())
    print(f"load average after: {_load()}")


if __name__ == "__main__":
    main()
