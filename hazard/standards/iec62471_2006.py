"""IEC 62471:2006 (identical to CIE S 009:2002): continuous-wave exposure limits and risk groups.

The exposure limits of clause 4.3 and the risk groups of Table 6.1, which follow the ICNIRP 1997 (visible/IR) and 2004
(UV) limits.

Numbers, symbols and formulas only; the wording is ours. This record is never edited to make another set: a
later set (e.g. the ICNIRP 2013 visible/IR limits) is a record of its own.

Two readings the standard leaves open, taken on the safe side (method §1, §3):

- blue light: the 1.7 mrad field of the RG2 boundary (time base 0.25 s) is used for every exposure up to
  0.25 s, so t_max and the RG2 test see the same field; beyond 100 s the field grows as 1.1·√t mrad and is
  held at the 0.1 rad of the Exempt boundary (the rule gives 0.11 rad at 10⁴ s);
- weak visual stimulus: L_IR ≤ 6000/α holds for t > 10 s, so every boundary uses γ = 11 mrad and
  α ≥ 11 mrad; for t ≤ 10 s the retinal thermal limit of 4.3.5 on L_R (380-1400 nm) still applies, so t_max
  includes it.
"""

from __future__ import annotations

import dataclasses
import math

from hazard.standards.model import (
    BandShare,
    CautionTrigger,
    ExposureLimit,
    FieldOfView,
    Hazard,
    LimitPiece,
    LimitSet,
    Viewing,
)

__all__ = ["IEC_62471_2006"]

_INF = math.inf
_MRAD = 1e-3

_BLUE_VIEWING = (
    Viewing(up_to_s=0.25, fov=FieldOfView(fixed_rad=1.7 * _MRAD)),
    Viewing(up_to_s=100.0, fov=FieldOfView(fixed_rad=11 * _MRAD)),
    Viewing(up_to_s=_INF, fov=FieldOfView(growth_rad_per_sqrt_s=1.1 * _MRAD, cap_rad=0.1)),
)
# Retinal thermal (4.3.5, Table 6.1): 1.7 mrad and α ≥ 1.7 mrad up to 0.25 s, 11 mrad and α ≥ 11 mrad beyond;
# α ≤ 0.1 rad throughout.
_THERMAL_VIEWING = (
    Viewing(up_to_s=0.25, fov=FieldOfView(fixed_rad=1.7 * _MRAD), alpha_bounds_rad=(0.0017, 0.1)),
    Viewing(up_to_s=_INF, fov=FieldOfView(fixed_rad=11 * _MRAD), alpha_bounds_rad=(0.011, 0.1)),
)
_THERMAL_PIECE = LimitPiece(
    after_s=1e-5, up_to_s=10.0, coefficient=50000.0, exponent=-0.25, over_alpha=True
)  # 4.3.5: 50000/(α·t^0.25), 10 µs ≤ t ≤ 10 s
# Below 10 µs, where 4.3.5 stops, the limit is held at its 10 µs value, 50000/(α·(10⁻⁵)^0.25) = 8.89·10⁵/α (as
# ICNIRP and 2006/25/EC Annex I row i do); extrapolating the formula would allow more, not less.
_HELD_BELOW_10_US = LimitPiece(
    after_s=0.0, up_to_s=1e-5, coefficient=50000.0 / 1e-5**0.25, exponent=0.0, over_alpha=True
)
_UV = CautionTrigger(caution="uv", from_group="RG1")
_BRIGHT = CautionTrigger(caution="bright", from_group="RG2")
_HEAT = CautionTrigger(caution="infrared", from_group="RG1")

IEC_62471_2006 = LimitSet(
    name="IEC 62471:2006",
    small_source_alpha_rad=0.011,  # Table 6.1: E_B for α < 0.011 rad
    weak_stimulus_luminance_cd_m2=10.0,  # 4.3.6
    table_rounding=0.03,  # Table 6.1 prints two digits: 50000·10^-0.25 = 28117 → 28000
    transfer_threshold_w_m2=1.0,  # E_B at the RG1 boundary (t = 100 s), as IEC TR 62778:2014 uses it
    hazards=(
        Hazard(
            symbol="E_S",
            effect="photochemical",
            title="actinic UV, skin and eye",
            clause="IEC 62471:2006 4.3.1",
            family="E_S",
            band_nm=(200, 400),
            table="s_uv",
            kind="irradiance",
            applies="always",
            limits=(0.001, 0.003, 0.03),
            time_bases_s=(30000, 10000, 1000),
            exposure_limit=ExposureLimit(
                pieces=(LimitPiece(after_s=0.0, up_to_s=30000.0, coefficient=30.0, exponent=-1.0),),
                text="E_S·t ≤ 30 J/m² within 8 h",
            ),
            shares=(
                BandShare(name="UV-C", band_nm=(200.0, 280.0)),
                BandShare(name="5 nm bands", band_nm=(200.0, 400.0), step_nm=5.0),
            ),
            cautions=(_UV, CautionTrigger(caution="uvc", from_group="RG1", share="UV-C", share_above=0.5)),
        ),
        Hazard(
            symbol="E_UVA",
            effect="photochemical",
            title="near-UV, eye (lens)",
            clause="IEC 62471:2006 4.3.2",
            family="E_UVA",
            band_nm=(315, 400),
            table=None,
            kind="irradiance",
            applies="always",
            limits=(10.0, 33.0, 100.0),
            time_bases_s=(1000, 300, 100),
            exposure_limit=ExposureLimit(
                pieces=(
                    LimitPiece(after_s=0.0, up_to_s=1000.0, coefficient=1e4, exponent=-1.0),
                    LimitPiece(after_s=1000.0, up_to_s=_INF, coefficient=10.0, exponent=0.0),
                ),
                text="E_UVA·t ≤ 10⁴ J/m² (t ≤ 1000 s); 10 W/m² beyond",
            ),
            shares=(BandShare(name="5 nm bands", band_nm=(315.0, 400.0), step_nm=5.0),),
            cautions=(_UV,),
        ),
        Hazard(
            symbol="L_B",
            effect="photochemical",
            title="blue light, retina",
            clause="IEC 62471:2006 4.3.3",
            family="blue light",
            band_nm=(300, 700),
            table="blue_light",
            kind="radiance",
            applies="large_source",
            limits=(100.0, 1e4, 4e6),
            time_bases_s=(10000, 100, 0.25),
            viewing=_BLUE_VIEWING,
            feeds_transfer=True,
            cautions=(_BRIGHT,),
            exposure_limit=ExposureLimit(
                pieces=(
                    LimitPiece(after_s=0.0, up_to_s=1e4, coefficient=1e6, exponent=-1.0),
                    LimitPiece(after_s=1e4, up_to_s=_INF, coefficient=100.0, exponent=0.0),
                ),
                text="L_B·t ≤ 10⁶ J/(m²·sr) (t ≤ 10⁴ s); 100 W/(m²·sr) beyond",
            ),
        ),
        Hazard(
            symbol="E_B",
            effect="photochemical",
            title="blue light, retina, small source",
            clause="IEC 62471:2006 4.3.4",
            family="blue light",
            band_nm=(300, 700),
            table="blue_light",
            kind="irradiance",
            applies="small_source",
            limits=(1.0, 1.0, 400.0),
            time_bases_s=(10000, 100, 0.25),
            feeds_transfer=True,
            cautions=(_BRIGHT,),
            exposure_limit=ExposureLimit(
                pieces=(
                    LimitPiece(after_s=0.0, up_to_s=100.0, coefficient=100.0, exponent=-1.0),
                    LimitPiece(after_s=100.0, up_to_s=_INF, coefficient=1.0, exponent=0.0),
                ),
                text="E_B·t ≤ 100 J/m² (t ≤ 100 s); 1 W/m² beyond",
            ),
        ),
        Hazard(
            symbol="L_R",
            effect="thermal",
            title="retinal thermal",
            clause="IEC 62471:2006 4.3.5",
            family="retinal thermal",
            band_nm=(380, 1400),
            table="retinal_thermal",
            kind="radiance",
            applies="visual_stimulus",
            limits=(28000.0, 28000.0, 71000.0),
            time_bases_s=(10, 10, 0.25),
            viewing=_THERMAL_VIEWING,
            limits_over_alpha=True,
            cautions=(_BRIGHT,),
            exposure_limit=ExposureLimit(
                pieces=(_HELD_BELOW_10_US, _THERMAL_PIECE),
                text="L_R ≤ 50000/(α·t^0.25), 10 µs ≤ t ≤ 10 s (held at its 10 µs value for shorter times)",
            ),
        ),
        Hazard(
            symbol="L_IR",
            effect="thermal",
            title="retinal thermal, weak visual stimulus",
            clause="IEC 62471:2006 4.3.6",
            family="retinal thermal",
            band_nm=(780, 1400),
            table="retinal_thermal",
            kind="radiance",
            applies="weak_visual_stimulus",
            limits=(6000.0, 6000.0, 6000.0),
            time_bases_s=(1000, 100, 10),
            viewing=_THERMAL_VIEWING,
            limits_over_alpha=True,
            cautions=(_HEAT,),
            exposure_limit=ExposureLimit(
                pieces=(
                    dataclasses.replace(_HELD_BELOW_10_US, quantity="L_R"),
                    dataclasses.replace(_THERMAL_PIECE, quantity="L_R"),
                    LimitPiece(after_s=10.0, up_to_s=_INF, coefficient=6000.0, exponent=0.0, over_alpha=True),
                ),
                text="L_R ≤ 50000/(α·t^0.25) (10 µs ≤ t ≤ 10 s, held below); L_IR ≤ 6000/α (t > 10 s)",
            ),
        ),
        Hazard(
            symbol="E_IR",
            effect="thermal",
            title="infrared, eye (cornea and lens)",
            clause="IEC 62471:2006 4.3.7",
            family="E_IR",
            band_nm=(780, 3000),
            table=None,
            kind="irradiance",
            applies="always",
            limits=(100.0, 570.0, 3200.0),
            time_bases_s=(1000, 100, 10),
            cautions=(_HEAT,),
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
            effect="thermal",
            title="thermal, skin",
            clause="IEC 62471:2006 4.3.8",
            family="E_H",
            band_nm=(380, 3000),
            table=None,
            kind="irradiance",
            applies="always",
            exposure_limit=ExposureLimit(
                pieces=(LimitPiece(after_s=0.0, up_to_s=10.0, coefficient=20000.0, exponent=-0.75),),
                text="E_H·t ≤ 20000·t^0.25 J/m², t < 10 s",
            ),
        ),
    ),
)
