"""Directive 2006/25/EC, Annex I, Table 1.1: the exposure limit values for incoherent optical radiation at work.

The workplace limits against which a day of exposures is judged (:mod:`hazard.studies.exposure`). They follow
ICNIRP like IEC 62471:2006 but differ in three places, so they are a set of their own and never an edit of the
IEC record:

- UV-A to the eye (row b) is a daily dose of 10⁴ J/m² with no 10 W/m² relief beyond 1000 s;
- blue light from a small source (rows e, f) is 100/t W/m² up to 10⁴ s and 0.01 W/m² beyond (IEC 62471: 1 W/m²
  beyond 100 s);
- retinal thermal has a limit beyond 10 s (row g, 2.8·10⁷/C_α) and one below 10 µs (row i, held at its 10 µs
  value).

The set has exposure limit values only, no risk groups. C_α is α in mrad bounded to 1.7-100 mrad (rows g-i) and
11-100 mrad with an 11 mrad field of view (rows j-l); as radiance limits in W/(m²·sr) with α in rad, X/C_α
becomes (X/1000)/α. The table gives no field of view for rows c-i; this record uses the IEC 62471 blue-light
fields and, for rows g-i, the 1.7 mrad field that belongs to the 1.7 mrad bound on α (our reading: it cannot
give a lower fraction of the limit than a wider field would). Rows m-o are from memory; rows a-l were read in a
public reproduction of the table. The Directive's UV band starts at 180 nm; this tool's S(λ) table starts at
200 nm (IEC 62471:2006 Table 4.1), so emission below 200 nm is not weighted.
"""

from __future__ import annotations

import math

from hazard.standards.model import ExposureLimit, FieldOfView, Hazard, LimitPiece, LimitSet, Viewing

__all__ = ["DIRECTIVE_2006_25"]

_INF = math.inf
_MRAD = 1e-3
_BLUE_VIEWING = (
    Viewing(up_to_s=0.25, fov=FieldOfView(fixed_rad=1.7 * _MRAD)),
    Viewing(up_to_s=100.0, fov=FieldOfView(fixed_rad=11 * _MRAD)),
    Viewing(up_to_s=_INF, fov=FieldOfView(growth_rad_per_sqrt_s=1.1 * _MRAD, cap_rad=0.1)),
)
_VISIBLE_THERMAL = (Viewing(up_to_s=_INF, fov=FieldOfView(fixed_rad=1.7 * _MRAD), alpha_bounds_rad=(0.0017, 0.1)),)
_WEAK_THERMAL = (Viewing(up_to_s=_INF, fov=FieldOfView(fixed_rad=11 * _MRAD), alpha_bounds_rad=(0.011, 0.1)),)
_HELD = 8.89e5  # rows i and l: 8.89·10⁸/C_α, i.e. 50000/(α·(10 µs)^0.25), held below 10 µs [W m⁻² sr⁻¹ · rad]


def _thermal(after_t10: float, quantity: str | None = None) -> tuple[LimitPiece, ...]:
    """Rows g-i (or j-l): held below 10 µs, 50000/(α·t^0.25) to 10 s, ``after_t10``/α beyond."""
    return (
        LimitPiece(after_s=0.0, up_to_s=1e-5, coefficient=_HELD, exponent=0.0, over_alpha=True, quantity=quantity),
        LimitPiece(after_s=1e-5, up_to_s=10.0, coefficient=50000.0, exponent=-0.25, over_alpha=True, quantity=quantity),
        LimitPiece(after_s=10.0, up_to_s=_INF, coefficient=after_t10, exponent=0.0, over_alpha=True),
    )


DIRECTIVE_2006_25 = LimitSet(
    name="Directive 2006/25/EC Annex I",
    small_source_alpha_rad=0.011,  # rows c-f: L_B for α ≥ 11 mrad, E_B below
    weak_stimulus_luminance_cd_m2=10.0,  # rows j-l apply to weak visual stimuli (IEC 62471:2006 4.3.6)
    table_rounding=0.0,  # no tabulated group limits to round
    hazards=(
        Hazard(
            symbol="E_S",
            title="actinic UV, skin and eye",
            clause="2006/25/EC Annex I Table 1.1 a",
            family="E_S",
            band_nm=(200, 400),
            table="s_uv",
            kind="irradiance",
            applies="always",
            effect="photochemical",
            exposure_limit=ExposureLimit(
                pieces=(LimitPiece(after_s=0.0, up_to_s=_INF, coefficient=30.0, exponent=-1.0),),
                text="H_eff ≤ 30 J/m², daily value (8 h)",
            ),
        ),
        Hazard(
            symbol="E_UVA",
            title="near-UV, eye (lens)",
            clause="2006/25/EC Annex I Table 1.1 b",
            family="E_UVA",
            band_nm=(315, 400),
            table=None,
            kind="irradiance",
            applies="always",
            effect="photochemical",
            exposure_limit=ExposureLimit(
                pieces=(LimitPiece(after_s=0.0, up_to_s=_INF, coefficient=1e4, exponent=-1.0),),
                text="H_UVA ≤ 10⁴ J/m², daily value (8 h)",
            ),
        ),
        Hazard(
            symbol="L_B",
            title="blue light, retina",
            clause="2006/25/EC Annex I Table 1.1 c, d",
            family="blue light",
            band_nm=(300, 700),
            table="blue_light",
            kind="radiance",
            applies="large_source",
            effect="photochemical",
            viewing=_BLUE_VIEWING,
            exposure_limit=ExposureLimit(
                pieces=(
                    LimitPiece(after_s=0.0, up_to_s=1e4, coefficient=1e6, exponent=-1.0),
                    LimitPiece(after_s=1e4, up_to_s=_INF, coefficient=100.0, exponent=0.0),
                ),
                text="L_B ≤ 10⁶/t W/(m²·sr) (t ≤ 10⁴ s); 100 W/(m²·sr) beyond",
            ),
        ),
        Hazard(
            symbol="E_B",
            title="blue light, retina, small source",
            clause="2006/25/EC Annex I Table 1.1 e, f",
            family="blue light",
            band_nm=(300, 700),
            table="blue_light",
            kind="irradiance",
            applies="small_source",
            effect="photochemical",
            exposure_limit=ExposureLimit(
                pieces=(
                    LimitPiece(after_s=0.0, up_to_s=1e4, coefficient=100.0, exponent=-1.0),
                    LimitPiece(after_s=1e4, up_to_s=_INF, coefficient=0.01, exponent=0.0),
                ),
                text="E_B ≤ 100/t W/m² (t ≤ 10⁴ s); 0.01 W/m² beyond",
            ),
        ),
        Hazard(
            symbol="L_R",
            title="retinal thermal",
            clause="2006/25/EC Annex I Table 1.1 g-i",
            family="retinal thermal",
            band_nm=(380, 1400),
            table="retinal_thermal",
            kind="radiance",
            applies="visual_stimulus",
            effect="thermal",
            viewing=_VISIBLE_THERMAL,
            exposure_limit=ExposureLimit(
                pieces=_thermal(28000.0),
                text="L_R ≤ 8.89·10⁸/C_α (t < 10 µs); 5·10⁷/(C_α·t^0.25) "
                "(10 µs ≤ t ≤ 10 s); 2.8·10⁷/C_α beyond (C_α in mrad)",
            ),
        ),
        Hazard(
            symbol="L_IR",
            title="retinal thermal, weak visual stimulus",
            clause="2006/25/EC Annex I Table 1.1 j-l",
            family="retinal thermal",
            band_nm=(780, 1400),
            table="retinal_thermal",
            kind="radiance",
            applies="weak_visual_stimulus",
            effect="thermal",
            viewing=_WEAK_THERMAL,
            exposure_limit=ExposureLimit(
                pieces=_thermal(6000.0),
                text="L_R ≤ 8.89·10⁸/C_α (t < 10 µs); 5·10⁷/(C_α·t^0.25) "
                "(10 µs ≤ t ≤ 10 s); 6·10⁶/C_α beyond (C_α in mrad)",
            ),
        ),
        Hazard(
            symbol="E_IR",
            title="infrared, eye (cornea and lens)",
            clause="2006/25/EC Annex I Table 1.1 m, n",
            family="E_IR",
            band_nm=(780, 3000),
            table=None,
            kind="irradiance",
            applies="always",
            effect="thermal",
            exposure_limit=ExposureLimit(
                pieces=(
                    LimitPiece(after_s=0.0, up_to_s=1000.0, coefficient=18000.0, exponent=-0.75),
                    LimitPiece(after_s=1000.0, up_to_s=_INF, coefficient=100.0, exponent=0.0),
                ),
                text="E_IR ≤ 18000·t^−0.75 W/m² (t ≤ 1000 s); 100 W/m² beyond",
            ),
        ),
        Hazard(
            symbol="E_H",
            title="thermal, skin",
            clause="2006/25/EC Annex I Table 1.1 o",
            family="E_H",
            band_nm=(380, 3000),
            table=None,
            kind="irradiance",
            applies="always",
            effect="thermal",
            exposure_limit=ExposureLimit(
                pieces=(LimitPiece(after_s=0.0, up_to_s=10.0, coefficient=20000.0, exponent=-0.75),),
                text="H_skin ≤ 20000·t^0.25 J/m², t < 10 s",
            ),
        ),
    ),
)
