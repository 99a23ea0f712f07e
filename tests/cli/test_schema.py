"""``hazard schema``: the JSON schema of a result describes its parts."""

import json

from click.testing import CliRunner

from hazard.cli import main


def test_schema_describes_the_exposure_and_the_pulses():
    result = CliRunner().invoke(main, ["schema", "result"])
    schema = json.loads(result.output)
    assert "exposure" in schema["properties"] and "emission" in schema["properties"]
    assert {"ExposureStudy", "PulseCheck", "Emission"} <= set(schema["$defs"])
