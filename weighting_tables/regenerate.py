"""Regenerate the weighting-table CSV files and their metadata from the published definitions.

Run ``python -m weighting_tables.regenerate`` from the project root after changing a definition here;
the loader refuses a CSV whose SHA-256 does not match its metadata file, so an edit by hand is caught.

Sources
-------
- S_UV(λ): IEC 62471:2006 (= CIE S 009:2002) Table 4.1, which reproduces ICNIRP (2004).
- B(λ), R(λ): IEC 62471:2006 Table 4.2 (ICNIRP 1997 values, kept by ICNIRP 2013). The tabulated
  5 nm points are written as published; the formula segments (10^((450-λ)/50), 10^((700-λ)/500),
  0.2·10^(0.02·(1150-λ))) are exponentials, so writing their end points and interpolating
  log-linearly reproduces them exactly between the points.
- V(λ): CIE 1924 photopic luminous efficiency (CIE S 010 / ISO 23539), 360-830 nm at 1 nm, taken
  from the colour-science package's copy of the CIE data set.
"""

from __future__ import annotations

import hashlib
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import TypedDict

HERE = Path(__file__).resolve().parent

S_UV_POINTS = [
    (200, 0.030),
    (205, 0.051),
    (210, 0.075),
    (215, 0.095),
    (220, 0.120),
    (225, 0.150),
    (230, 0.190),
    (235, 0.240),
    (240, 0.300),
    (245, 0.360),
    (250, 0.430),
    (254, 0.500),
    (255, 0.520),
    (260, 0.650),
    (265, 0.810),
    (270, 1.000),
    (275, 0.960),
    (280, 0.880),
    (285, 0.770),
    (290, 0.640),
    (295, 0.540),
    (297, 0.460),
    (300, 0.300),
    (303, 0.120),
    (305, 0.060),
    (308, 0.026),
    (310, 0.015),
    (313, 0.006),
    (315, 0.003),
    (316, 0.0024),
    (317, 0.0020),
    (318, 0.0016),
    (319, 0.0012),
    (320, 0.0010),
    (322, 0.00067),
    (323, 0.00054),
    (325, 0.00050),
    (328, 0.00044),
    (330, 0.00041),
    (333, 0.00037),
    (335, 0.00034),
    (340, 0.00028),
    (345, 0.00024),
    (350, 0.00020),
    (355, 0.00016),
    (360, 0.00013),
    (365, 0.00011),
    (370, 0.000093),
    (375, 0.000077),
    (380, 0.000064),
    (385, 0.000053),
    (390, 0.000044),
    (395, 0.000036),
    (400, 0.000030),
]

# B(λ) tabulated at 5 nm from 380 to 495 nm (IEC 62471:2006 Table 4.2).
B_TABULATED = [
    (380, 0.01),
    (385, 0.013),
    (390, 0.025),
    (395, 0.05),
    (400, 0.10),
    (405, 0.20),
    (410, 0.40),
    (415, 0.80),
    (420, 0.90),
    (425, 0.95),
    (430, 0.98),
    (435, 1.00),
    (440, 1.00),
    (445, 0.97),
    (450, 0.94),
    (455, 0.90),
    (460, 0.80),
    (465, 0.70),
    (470, 0.62),
    (475, 0.55),
    (480, 0.45),
    (485, 0.40),
    (490, 0.22),
    (495, 0.16),
]


def blue_light_points() -> list[tuple[float, float]]:
    """B(λ): 0.01 over 300-380 nm, table 380-495 nm, 10^((450-λ)/50) over 500-600 nm, 0.001 to 700 nm."""
    return [(300, 0.01), *B_TABULATED, (500, 10 ** ((450 - 500) / 50)), (600, 10 ** ((450 - 600) / 50)), (700, 0.001)]


def retinal_thermal_points() -> list[tuple[float, float]]:
    """R(λ), the retinal thermal hazard function.

    10·B(λ) over 380-500 nm, 1.0 to 700 nm, 10^((700-λ)/500) to 1050 nm, 0.2 to 1150 nm,
    0.2·10^(0.02·(1150-λ)) to 1200 nm, 0.02 to 1400 nm.

    The published function steps from 10^(-0.7) = 0.1995 to 0.2 at 1050 nm; the row at 1049 nm keeps
    the exponential exact up to 1049 nm and confines the step to the last nanometre.
    """
    blue = [(w, round(10 * v, 6)) for w, v in B_TABULATED]
    return [
        *blue,
        (500, 1.0),
        (700, 1.0),
        (1049, 10 ** ((700 - 1049) / 500)),
        (1050, 0.2),
        (1150, 0.2),
        (1200, 0.2 * 10 ** (0.02 * (1150 - 1200))),
        (1400, 0.02),
    ]


def photopic_points() -> list[tuple[float, float]]:
    """CIE 1924 V(λ), 360-830 nm at 1 nm, from colour-science's CIE data set."""
    import colour

    sd = colour.colorimetry.SDS_LEFS_PHOTOPIC["CIE 1924 Photopic Standard Observer"]
    return [(float(w), float(v)) for w, v in zip(sd.wavelengths, sd.values, strict=True)]


class _TableSpec(TypedDict):
    """How one table is made and described (its ``NAME.toml``)."""

    symbol: str
    title: str
    source: str
    edition: str
    interpolation: str
    points: Callable[[], Sequence[tuple[float, float]]]
    note: str


TABLES: dict[str, _TableSpec] = {
    "s_uv": _TableSpec(
        symbol="S_UV",
        title="Actinic ultraviolet hazard weighting function S_UV(λ)",
        source="IEC 62471:2006 / CIE S 009:2002, Table 4.1 (reproducing ICNIRP 2004)",
        edition="IEC 62471:2006",
        interpolation="log-linear",
        points=lambda: S_UV_POINTS,
        note="Tabulated points as published; between them the logarithm of the weight is interpolated "
        "linearly (the function spans five decades). Directive 2006/25/EC Annex I lists 1 nm values "
        "that agree with this interpolation to within about 0.5 %.",
    ),
    "blue_light": _TableSpec(
        symbol="B",
        title="Blue-light hazard weighting function B(λ)",
        source="IEC 62471:2006 / CIE S 009:2002, Table 4.2 (ICNIRP 1997, unchanged in ICNIRP 2013)",
        edition="IEC 62471:2006",
        interpolation="log-linear",
        points=blue_light_points,
        note="5 nm table 380-495 nm; formula segments written at their end points, exact under log-linear "
        "interpolation.",
    ),
    "retinal_thermal": _TableSpec(
        symbol="R",
        title="Retinal thermal hazard weighting function R(λ)",
        source="IEC 62471:2006 / CIE S 009:2002, Table 4.2 (ICNIRP 1997)",
        edition="IEC 62471:2006",
        interpolation="log-linear",
        points=retinal_thermal_points,
        note="10·B(λ) at 5 nm over 380-495 nm; formula segments written at their end points, exact under "
        "log-linear interpolation; the 1050 nm step is confined to 1049-1050 nm.",
    ),
    "v_photopic": _TableSpec(
        symbol="V",
        title="CIE 1924 photopic luminous efficiency function V(λ)",
        source="CIE 1924 photopic standard observer (CIE S 010:2004 / ISO 23539:2005), via colour-science "
        "SDS_LEFS_PHOTOPIC",
        edition="CIE 1924",
        interpolation="linear",
        points=photopic_points,
        note="1 nm data; K_m = 683 lm/W is applied by the photometry module, not stored here.",
    ),
}


def _format_value(value: float) -> str:
    """Twelve significant digits: exact for the published values, tidy for the formula end points."""
    return repr(float(f"{float(value):.12g}"))


def write_all() -> None:
    """Write every ``NAME.csv`` and ``NAME.toml`` beside this module."""
    for name, spec in TABLES.items():
        points = spec["points"]()
        csv_text = "wavelength_nm,value\n" + "".join(f"{_format_value(w)},{_format_value(v)}\n" for w, v in points)
        csv_path = HERE / f"{name}.csv"
        csv_path.write_text(csv_text, encoding="utf-8", newline="\n")
        digest = hashlib.sha256(csv_text.encode("utf-8")).hexdigest()
        meta = "\n".join(
            [
                f'symbol = "{spec["symbol"]}"',
                f'title = "{spec["title"]}"',
                f'source = "{spec["source"]}"',
                f'edition = "{spec["edition"]}"',
                'unit = "1 (relative weight)"',
                f"wavelength_min_nm = {points[0][0]}",
                f"wavelength_max_nm = {points[-1][0]}",
                f"rows = {len(points)}",
                f'interpolation = "{spec["interpolation"]}"',
                'outside_range = "zero"',
                f'note = "{spec["note"]}"',
                f'sha256 = "{digest}"',
                "",
            ]
        )
        (HERE / f"{name}.toml").write_text(meta, encoding="utf-8", newline="\n")


CMF_FILE = "cie1931_2deg"
"""Stem of the colour-matching functions' CSV and TOML files."""


def colour_matching_rows() -> list[tuple[float, ...]]:
    """CIE 1931 2° x̄, ȳ, z̄, 360-830 nm at 1 nm, from colour-science's CIE data set."""
    import colour

    cmfs = colour.MSDS_CMFS["CIE 1931 2 Degree Standard Observer"]
    return [(float(w), *map(float, v)) for w, v in zip(cmfs.wavelengths, cmfs.values, strict=True)]


def write_colour_matching() -> None:
    """Write ``cie1931_2deg.csv`` and its metadata; values as ``repr`` (exact) [1]."""
    rows = colour_matching_rows()
    csv_text = "wavelength_nm,x_bar,y_bar,z_bar\n" + "".join(",".join(map(repr, row)) + "\n" for row in rows)
    (HERE / f"{CMF_FILE}.csv").write_text(csv_text, encoding="utf-8", newline="\n")
    digest = hashlib.sha256(csv_text.encode("utf-8")).hexdigest()
    meta = "\n".join(
        [
            'title = "CIE 1931 2° standard observer colour-matching functions"',
            'source = "CIE 1931 2° standard observer (CIE 015:2018, ISO/CIE 11664-1), via colour-science MSDS_CMFS"',
            'edition = "CIE 1931"',
            'unit = "1 (relative weight)"',
            f"wavelength_min_nm = {rows[0][0]}",
            f"wavelength_max_nm = {rows[-1][0]}",
            f"rows = {len(rows)}",
            'interpolation = "linear"',
            'outside_range = "zero"',
            'note = "1 nm data, values exactly as colour-science holds them (zeros included)."',
            f'sha256 = "{digest}"',
            "",
        ]
    )
    (HERE / f"{CMF_FILE}.toml").write_text(meta, encoding="utf-8", newline="\n")


if __name__ == "__main__":
    write_all()
    write_colour_matching()
