"""The bundled demo: `hazard demo` writes a report and a result per product, and a summary that agrees."""

import csv
import json

import pytest
from conftest import run_cli
from pypdf import PdfReader

from hazard.output.summary_table import hazard_headers


def test_demo_writes_consistent_outputs(tmp_path):
    # project contract (issue: demo line-up): one PDF and one JSON per product, summary.csv, summary.pdf,
    # and a one-screen table; every risk group appears in the invented line-up (examples/README.md)
    out = tmp_path / "demo"
    run = run_cli(["demo", "--output", str(out)], tmp_path)  # the command, in-process
    assert run.exit_code == 0, run.stderr
    assert "invented" in run.stdout and "Pre-screen only" in run.stdout
    results = {p.stem: json.loads(p.read_text()) for p in out.glob("CL-*.json")}
    assert len(results) >= 8 and len(list(out.glob("CL-*.pdf"))) == len(results)
    assert {r["risk_group"] for r in results.values()} == {"Exempt", "RG1", "RG2", "RG3"}
    with open(out / "summary.csv", newline="") as handle:
        rows = list(csv.DictReader(handle))
    assert len(rows) == len(results)
    for row in rows:
        result = results[row["id"]]
        assert row["status"] == "ok" and row["risk_group"] == result["risk_group"]
        for symbol, hazard in result["hazards"].items():
            # hazard/output/summary_table.py: the unit in the header, values to 3 significant digits
            shown = row[hazard_headers(symbol, hazard["unit"])[0]]
            assert shown == "" if hazard["value"] is None else float(shown) == pytest.approx(hazard["value"], rel=5e-3)
    assert len(PdfReader(out / "summary.pdf").pages) >= 1
    for product_id in results:
        assert product_id in run.stdout  # the on-screen table lists every product
    lines = {line.split()[0]: line for line in run.stdout.splitlines() if line.startswith("CL-")}
    for product_id, result in results.items():
        # the margin column reads from the group's boundaries (method §3); an Exempt product names its hazard
        # nearest the Exempt limit, so its headroom is never blank
        if result["risk_group"] == "Exempt" and result["emission"] is None:
            closest = max((h["margins"]["Exempt"], s) for s, h in result["hazards"].items() if h["margins"])
            assert f"{closest[1]}: " in lines[product_id] and "of Exempt limit" in lines[product_id]
    assert "1.8× RG1 limit; 0.45 % of RG2 limit" in lines["CL-GROW-30"]
