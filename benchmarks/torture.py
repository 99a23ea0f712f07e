"""Torture run: the tool used as a hostile or unlucky user would, with the figures printed.

1. fuzz: N mutated inputs per reader (CSV, TSV, whitespace text, JSON pairs and arrays, .xlsx), per TOML
   record and per manifest (CSV and .xlsx), each run through the tool in a worker process
   (``tests/mutations.py``; one case in five with the distance and remedy studies). A case must end in a
   result that reads back or in one input error of one line, without a Python warning; a case still running
   after ``--hang-s`` seconds is a hang (the worker is killed and restarted).
2. cli: M runs of the real command on mutated files (``assess``, ``check``, ``batch``): exit 1 is a defect,
   exit 2 must come with one line on stderr.
3. kills: a batch killed (SIGKILL) at random moments, then continued with ``--resume``: the outputs must equal
   an uninterrupted run's byte for byte, with no temporary file left behind; one run also on a file system
   that fills up, and one on a read-only file system (when this machine lets the script mount a tmpfs).
4. memory: a batch of P products (``--jobs 2``) under an address-space cap, killed half-way and resumed
   under the same cap: both must finish; the peak resident memory of the largest process is printed.

Run: ``python benchmarks/torture.py`` (the full campaign: 10⁴ cases per reader, 10⁵ products; about an
hour on 2 cores) or with smaller counts, e.g. ``--per-reader 500 --cli 40 --kills 3 --products 5000``. The
spectra are the invented demo line-up (Corvel Lightworks, a made-up company).
"""

from __future__ import annotations

import argparse
import json
import multiprocessing
import os
import random
import resource
import shutil
import signal
import subprocess
import sys
import tempfile
import time
from pathlib import Path

REPO = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(REPO / "tests"))

from mutations import exercise, mutate, mutate_workbook  # noqa: E402 - importable only once tests/ is on the path

DATA = REPO / "tests" / "data"
LINEUP = REPO / "examples" / "lineup"
SEEDS = {
    "csv": [
        DATA / "comma.csv",
        DATA / "semicolon_decimal_comma.csv",
        DATA / "several_columns.csv",
        DATA / "micrometre_header_descending.csv",
    ],
    "tsv": [DATA / "tab_latin1.tsv"],
    "txt": [DATA / "whitespace.txt", DATA / "reference.txt"],
    "json": [DATA / "pairs.json", DATA / "arrays.json"],
    "xlsx": [DATA / "workbook.xlsx"],
    "record": [LINEUP / "cl-desk-30.toml", LINEUP / "cl-spot-65.toml", LINEUP / "cl-cure-365.toml"],
    "manifest-csv": [],
    "manifest-xlsx": [],
}
STUDIES_SHARE = 0.2
"""Share of fuzz cases that also run hazard distances and remedies (where overflows once happened)."""
KIND = {"record": "record", "manifest-csv": "manifest", "manifest-xlsx": "manifest"}
MANIFEST_ROWS = [
    ["id", "spectrum", "distance_mm", "source_diameter_mm", "lamp_type", "no_emission_outside", "column", "unit"],
    ["A", "cl-desk-30.csv", "500", "30", "gls", "true", "", "W/m2/nm"],
    ["B", "cl-spot-65.csv", "200", "5", "other", "false", "1", ""],
    ["C", "cl-cure-365.csv", "1000", "60", "other", "true", "", ""],
]


def _workspace(folder: Path) -> None:
    """The line-up's records and spectra, and the two seed manifests, in ``folder``."""
    import openpyxl

    for path in LINEUP.glob("cl-*"):
        shutil.copy(path, folder / path.name)
    (folder / "seed.csv").write_text("\n".join(",".join(row) for row in MANIFEST_ROWS) + "\n")
    book = openpyxl.Workbook()
    for row in MANIFEST_ROWS:
        book.active.append([cell or None for cell in row])
    book.save(folder / "seed.xlsx")
    SEEDS["manifest-csv"] = [folder / "seed.csv"]
    SEEDS["manifest-xlsx"] = [folder / "seed.xlsx"]


def _make_case(target: str, folder: Path, rng: random.Random) -> Path:
    seed = rng.choice(SEEDS[target])
    data = seed.read_bytes()
    new = mutate_workbook(data, rng) if seed.suffix == ".xlsx" else mutate(data, rng)
    path = folder / f"case-{target}{seed.suffix}"
    path.write_bytes(new)
    return path


def _fuzz_worker(connection, folder: str, target: str, start: int, count: int, seed: int) -> None:
    """Child process: cases start..count of one target, one report per case."""
    import hazard.method.photometry

    hazard.method.photometry.import_colour()
    for index in range(start, count):
        rng = random.Random(f"{seed}-{target}-{index}")
        path = _make_case(target, Path(folder), rng)
        connection.send(("start", index))
        began = time.perf_counter()
        outcome, detail = exercise(path, KIND.get(target, "spectrum"), studies=rng.random() < STUDIES_SHARE)
        connection.send(("done", index, outcome, detail[-600:], time.perf_counter() - began))


def part_fuzz(per_reader: int, hang_s: float, seed: int) -> dict:
    """Part 1: per target, counts of outcomes, the slowest case, and any failure."""
    report = {}
    with tempfile.TemporaryDirectory() as tmp:
        root = Path(tmp)
        _workspace(root)
        for target in SEEDS:
            counts = {"ok": 0, "input error": 0, "crash": 0, "not one line": 0, "warning": 0, "hang": 0}
            slowest, failures, index = 0.0, [], 0
            started = time.perf_counter()
            while index < per_reader:
                parent, child = multiprocessing.Pipe()
                worker = multiprocessing.Process(
                    target=_fuzz_worker, args=(child, str(root), target, index, per_reader, seed)
                )
                worker.start()
                current = None
                while True:
                    if not parent.poll(hang_s if current is not None else 120):
                        if current is None:  # the worker did not start: count nothing, try again
                            break
                        counts["hang"] += 1
                        failures.append(("hang", current, f"still running after {hang_s} s"))
                        index = current + 1
                        break
                    try:
                        message = parent.recv()
                    except EOFError:  # the worker died (e.g. a signal): the case it was on is a crash
                        if current is not None:
                            counts["crash"] += 1
                            failures.append(("crash", current, f"worker died, exit {worker.exitcode}"))
                            index = current + 1
                        break
                    if message[0] == "start":
                        current = message[1]
                        continue
                    _, number, outcome, detail, seconds = message
                    counts[outcome] += 1
                    slowest = max(slowest, seconds)
                    if outcome not in ("ok", "input error"):
                        failures.append((outcome, number, detail))
                    index, current = number + 1, None
                    if index >= per_reader:
                        break
                worker.kill()
                worker.join()
            report[target] = {
                **counts,
                "cases": sum(counts.values()),
                "slowest_s": slowest,
                "seconds": time.perf_counter() - started,
                "failures": failures[:5],
            }
    return report


def _hazard(*args: str, cwd: Path, timeout: float = 120, limit_bytes: int | None = None):
    def cap():
        if limit_bytes is not None:
            resource.setrlimit(resource.RLIMIT_AS, (limit_bytes, limit_bytes))

    env = {**os.environ, "PYTHONPATH": str(REPO), "OPENBLAS_NUM_THREADS": "1"}
    return subprocess.run(
        [sys.executable, "-m", "hazard.cli", *args],
        cwd=cwd,
        capture_output=True,
        text=True,
        timeout=timeout,
        env=env,
        preexec_fn=cap,
    )


def part_cli(runs: int, seed: int) -> dict:
    """Part 2: the real command on mutated files; exit codes counted, exit 1 and multi-line exit 2 kept."""
    counts: dict[str, int] = {}
    failures = []
    started = time.perf_counter()
    with tempfile.TemporaryDirectory() as tmp:
        root = Path(tmp)
        _workspace(root)
        for index in range(runs):
            rng = random.Random(f"{seed}-cli-{index}")
            target = rng.choice(list(SEEDS))
            path = _make_case(target, root, rng)
            if target.startswith("manifest"):
                command = rng.choice([["batch", path.name, "--output", f"out{index}"], ["check", path.name]])
            elif target == "record":
                command = rng.choice([["assess", path.name], ["check", path.name]])
            else:
                command = [
                    "assess",
                    path.name,
                    "--distance-mm",
                    "500",
                    "--source-diameter-mm",
                    "30",
                    "--no-emission-outside",
                ]
            try:
                result = _hazard(*command, cwd=root, timeout=60)
            except subprocess.TimeoutExpired:
                counts["hang"] = counts.get("hang", 0) + 1
                failures.append((command, "hang"))
                continue
            code = result.returncode
            counts[f"exit {code}"] = counts.get(f"exit {code}", 0) + 1
            lines = result.stderr.splitlines()
            if code == 1 or code < 0 or (code == 2 and len(lines) != 1):
                failures.append((command, result.stderr[-600:]))
    return {"runs": runs, "counts": counts, "failures": failures[:5], "seconds": time.perf_counter() - started}


def _manifest(folder: Path, products: int) -> Path:
    """A manifest of ``products`` rows over the line-up's spectra, with varied geometry."""
    for path in LINEUP.glob("cl-*.csv"):
        shutil.copy(path, folder / path.name)
    spectra = sorted(p.name for p in folder.glob("cl-*.csv"))
    path = folder / "manifest.csv"
    with open(path, "w") as out:
        out.write("id,spectrum,distance_mm,source_diameter_mm,lamp_type,no_emission_outside\n")
        for i in range(products):
            out.write(
                f"P{i:06d},{spectra[i % len(spectra)]},{300 + i % 97},{2 + i % 11},"
                f"{'gls' if i % 5 == 0 else 'other'},true\n"
            )
    return path


def _leftovers(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir() if p.name.endswith(".tmp") or p.name.endswith(".partial"))


def _kill_at(args: list[str], cwd: Path, after_s: float) -> int:
    env = {**os.environ, "PYTHONPATH": str(REPO)}
    process = subprocess.Popen(
        [sys.executable, "-m", "hazard.cli", *args],
        cwd=cwd,
        env=env,
        stdout=subprocess.DEVNULL,
        stderr=subprocess.DEVNULL,
        start_new_session=True,
    )
    try:
        process.wait(timeout=after_s)
    except subprocess.TimeoutExpired:
        os.killpg(process.pid, signal.SIGKILL)  # the command and its workers
        process.wait()
    return process.returncode


def part_kills(kills: int, products: int, seed: int) -> dict:
    """Part 3: kill at random moments, resume, compare with an uninterrupted run; then a full disk."""
    rng = random.Random(f"{seed}-kills")
    results = {"kills": kills, "identical": 0, "different": 0, "leftovers": 0, "finished_before_kill": 0}
    with tempfile.TemporaryDirectory() as tmp:
        root = Path(tmp)
        manifest = _manifest(root, products)
        began = time.perf_counter()
        clean = _hazard("batch", manifest.name, "--output", "clean", "--jobs", "2", cwd=root, timeout=3600)
        duration = time.perf_counter() - began
        assert clean.returncode == 0, clean.stderr
        expected = [(root / "clean" / name).read_bytes() for name in ("results.jsonl", "summary.csv")]
        for k in range(kills):
            out = f"cut{k}"
            jobs = rng.choice(["1", "2"])
            code = _kill_at(
                ["batch", manifest.name, "--output", out, "--jobs", jobs],
                root,  # one job: ~1.6× longer
                rng.uniform(0.3, duration * (0.95 if jobs == "2" else 1.5)),
            )
            results["finished_before_kill"] += code == 0
            resumed = _hazard(
                "batch", manifest.name, "--output", out, "--resume", "--jobs", jobs, cwd=root, timeout=3600
            )
            got = [
                (root / out / name).read_bytes() if (root / out / name).exists() else b""
                for name in ("results.jsonl", "summary.csv")
            ]
            results["identical" if resumed.returncode == 0 and got == expected else "different"] += 1
            results["leftovers"] += bool(_leftovers(root / out))
        results["full_disk"] = _full_disk(root, manifest, expected)
    return results


def _full_disk(root: Path, manifest: Path, expected: list[bytes]) -> str:
    """A batch onto a small tmpfs that fills up: one line and exit 2; after growing it, --resume equals the
    uninterrupted run. Skipped where mounting is not allowed."""
    mount = root / "small-disk"
    mount.mkdir()
    size = max(1, sum(len(e) for e in expected) // 2 // 2**20)
    if (
        subprocess.run(
            ["mount", "-t", "tmpfs", "-o", f"size={size}m", "tmpfs", str(mount)], capture_output=True
        ).returncode
        != 0
    ):
        return "skipped (cannot mount a tmpfs here)"
    try:
        full = _hazard("batch", str(manifest), "--output", str(mount / "out"), cwd=root, timeout=3600)
        one_line = full.returncode == 2 and len(full.stderr.splitlines()) == 1 and "No space" in full.stderr
        subprocess.run(["mount", "-o", f"remount,size={size * 16}m", str(mount)], check=True)
        resumed = _hazard("batch", str(manifest), "--output", str(mount / "out"), "--resume", cwd=root, timeout=3600)
        same = (
            resumed.returncode == 0
            and [(mount / "out" / n).read_bytes() for n in ("results.jsonl", "summary.csv")] == expected
        )
        subprocess.run(["mount", "-o", "remount,ro", str(mount)], check=True)
        frozen = _hazard("batch", str(manifest), "--output", str(mount / "new"), cwd=root, timeout=600)
        read_only = frozen.returncode == 2 and len(frozen.stderr.splitlines()) == 1
        return (
            f"{'one line, exit 2' if one_line else 'FAILED: ' + full.stderr[-200:]}; resumed "
            f"{'identical' if same else 'DIFFERENT'}; leftovers {_leftovers(mount / 'out') or 'none'}; "
            f"read-only file system: {'one line, exit 2' if read_only else 'FAILED: ' + frozen.stderr[-200:]}"
        )
    finally:
        subprocess.run(["umount", str(mount)], capture_output=True)


def part_memory(products: int, cap_mib: int, seed: int) -> dict:
    """Part 4: a large batch under an address-space cap, then killed half-way and resumed under the cap."""
    limit = cap_mib * 2**20
    with tempfile.TemporaryDirectory() as tmp:
        root = Path(tmp)
        manifest = _manifest(root, products)
        before = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
        began = time.perf_counter()
        whole = _hazard(
            "batch", manifest.name, "--output", "whole", "--jobs", "2", cwd=root, timeout=7200, limit_bytes=limit
        )
        seconds = time.perf_counter() - began
        peak = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
        lines = sum(1 for _ in open(root / "whole" / "results.jsonl", "rb")) if whole.returncode == 0 else 0
        _kill_at(["batch", manifest.name, "--output", "half", "--jobs", "2"], root, seconds / 2)
        began = time.perf_counter()
        resumed = _hazard(
            "batch",
            manifest.name,
            "--output",
            "half",
            "--jobs",
            "2",
            "--resume",
            cwd=root,
            timeout=7200,
            limit_bytes=limit,
        )
        resume_s = time.perf_counter() - began
        same = resumed.returncode == 0 and all(
            (root / "whole" / n).read_bytes() == (root / "half" / n).read_bytes()
            for n in ("results.jsonl", "summary.csv")
        )
    return {
        "products": products,
        "cap_mib": cap_mib,
        "exit": whole.returncode,
        "seconds": seconds,
        "results": lines,
        "peak_rss_mib": max(peak, before) / 1024,
        "resume_exit": resumed.returncode,
        "resume_s": resume_s,
        "resume_identical": same,
        "stderr": whole.stderr[-300:] + resumed.stderr[-300:],
    }


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--per-reader", type=int, default=10_000, help="fuzz cases per reader, record, manifest")
    parser.add_argument("--cli", type=int, default=400, help="runs of the real command on mutated files")
    parser.add_argument("--kills", type=int, default=20, help="batches killed at random moments and resumed")
    parser.add_argument("--kill-products", type=int, default=3000, help="products in each killed batch")
    parser.add_argument("--products", type=int, default=100_000, help="products of the memory part")
    parser.add_argument("--cap-mib", type=int, default=1024, help="address-space cap of the memory part [MiB]")
    parser.add_argument("--hang-s", type=float, default=10.0, help="a fuzz case running longer is a hang [s]")
    parser.add_argument("--seed", type=int, default=1)
    parser.add_argument("--parts", default="fuzz,cli,kills,memory")
    args = parser.parse_args()
    parts = args.parts.split(",")
    if "fuzz" in parts:
        print("1. fuzz: cases per target; outcomes; slowest case")
        for target, r in part_fuzz(args.per_reader, args.hang_s, args.seed).items():
            print(
                f"   {target:<14} {r['cases']:>6} cases  ok {r['ok']:>6}  input error {r['input error']:>6}  "
                f"crash {r['crash']}  not one line {r['not one line']}  warning {r['warning']}  hang {r['hang']}  "
                f"slowest {r['slowest_s']:.2f} s  ({r['seconds']:.0f} s)"
            )
            for failure in r["failures"]:
                print(f"      {failure}")
    if "cli" in parts:
        r = part_cli(args.cli, args.seed)
        print(f"2. cli: {r['runs']} runs, {json.dumps(r['counts'], sort_keys=True)} ({r['seconds']:.0f} s)")
        for failure in r["failures"]:
            print(f"      {failure}")
    if "kills" in parts:
        r = part_kills(args.kills, args.kill_products, args.seed)
        print(
            f"3. kills: {r['kills']} killed runs of {args.kill_products} products, resumed: identical "
            f"{r['identical']}, different {r['different']}, with leftovers {r['leftovers']} "
            f"(finished before the kill: {r['finished_before_kill']})"
        )
        print(f"   full disk: {r['full_disk']}")
    if "memory" in parts:
        r = part_memory(args.products, args.cap_mib, args.seed)
        print(
            f"4. memory: {r['products']} products under a {r['cap_mib']} MiB address-space cap, --jobs 2: "
            f"exit {r['exit']}, {r['results']} results in {r['seconds']:.0f} s "
            f"({r['products'] / r['seconds']:.0f}/s), peak RSS of the largest process {r['peak_rss_mib']:.0f} MiB;"
            f" killed half-way and resumed under the cap: exit {r['resume_exit']} in {r['resume_s']:.0f} s, "
            f"outputs {'identical' if r['resume_identical'] else 'DIFFERENT'}"
        )
        if r["exit"] or r["resume_exit"]:
            print(f"      {r['stderr']}")


if __name__ == "__main__":
    main()
