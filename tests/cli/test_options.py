"""Record fields as command-line options (hazard.cli_options): repeated tables and human durations."""

import json

import numpy as np
import pytest
from click.testing import CliRunner
from conftest import triangle_line, write_spectrum

from hazard.cli import main

GRID = np.concatenate([np.arange(200.0, 400.0, 0.01), np.arange(400.0, 3000.5, 0.5)])


# S_UV(270 nm) = 1.0 (IEC 62471:2006 Table 4.1): a 270 nm line of 0.001 W/m² gives E_S = 0.001 W/m².
UV_LINE = triangle_line(GRID, 270.0, 0.001 / 0.05, 0.05)


def test_cli_reads_repeated_exposures_and_human_durations(tmp_path):
    spectrum = write_spectrum(tmp_path / "uv.csv", GRID, UV_LINE)
    args = ["assess", str(spectrum), "--distance-mm", "1000", "--source-diameter-mm", "5", "--no-emission-outside"]
    args += ["--exposure", "distance_mm=1000,duration_s=2h,label=bench", "--exposure", "distance_mm=500,duration_s=600"]
    result = CliRunner().invoke(main, [*args, "--format", "json"])
    assert result.exit_code == 0, result.output
    data = json.loads(result.output)
    assert [e["label"] for e in data["exposure"]["exposures"]] == ["bench", "exposure 2"]
    assert data["exposure"]["day"]["E_S"]["fraction"] == pytest.approx(0.32, rel=1e-3)
    text = CliRunner().invoke(main, args)
    assert "Daily exposure (Directive 2006/25/EC Annex I): within the limit values" in text.output
