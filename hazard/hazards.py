"""The hazard registry: one frozen record per hazard quantity, grouped into a limit set.

Everything the engine knows about a hazard is here as data: band, weighting table, exposure limit,
risk-group limits, fields of view, α bounds and time bases. Adding a hazard or a limit set is adding a
record. The default and only set is :data:`IEC_62471_2006` (IEC 62471:2006 = CIE S 009:2002, which follows
the ICNIRP 1997/2004 limits). A later set (e.g. ICNIRP 2013 visible/IR limits) is a new record, never an
edit of this one.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

__all__ = ["GROUPS", "ExposureLimit", "Hazard", "LimitSet", "IEC_62471_2006", "DEFAULT_LIMIT_SET"]

GROUPS = ("Exempt", "RG1", "RG2", "RG3")
"""Risk groups in rising order; a value above the RG2 limit is RG3 (IEC 62471:2006, 6.1)."""

Applies = Literal["always", "large_source", "small_source", "visual_stimulus", "weak_visual_stimulus"]


@dataclass(frozen=True)
class ExposureLimit:
    """An exposure limit of the form value ≤ C·t^k for t up to ``t_range_s[1]``.

    For the retinal thermal limit C is ``coefficient / α`` (``over_alpha``), with α bounded to
    ``alpha_bounds_rad``. The time at which the limit is reached is t = (value / C)^(1/k).

    Attributes
    ----------
    coefficient : float
        C [unit of the quantity · s^-k], or C·α when ``over_alpha``.
    exponent : float
        k [1].
    t_range_s : tuple of float
        Exposure durations the formula covers [s].
    text : str
        The limit as a formula, for reports.
    over_alpha : bool
        C is divided by the bounded angular subtense.
    alpha_bounds_rad : tuple of float
        Bounds on α when ``over_alpha`` [rad].
    """

    coefficient: float
    exponent: float
    t_range_s: tuple[float, float]
    text: str
    over_alpha: bool = False
    alpha_bounds_rad: tuple[float, float] = (0.0017, 0.1)


@dataclass(frozen=True)
class Hazard:
    """One hazard quantity of a limit set.

    Attributes
    ----------
    symbol : str
        The standard's symbol, e.g. ``"E_S"``.
    title : str
        What it protects, in a few words.
    band_nm : tuple of float
        Integration band [nm].
    table : str or None
        Weighting table name in :mod:`weighting_tables`; None for an unweighted band.
    kind : str
        ``"irradiance"`` [W m⁻²] or ``"radiance"`` [W m⁻² sr⁻¹].
    applies : str
        When the hazard is assessed: ``always``; ``large_source`` / ``small_source`` (α against
        :attr:`LimitSet.small_source_alpha_rad`); ``visual_stimulus`` / ``weak_visual_stimulus``
        (luminance against :attr:`LimitSet.weak_stimulus_luminance_cd_m2`).
    limits : tuple of float or None
        Exempt, RG1 and RG2 limits [unit], or the coefficient c of c/α when ``limits_over_alpha``;
        None when the hazard has an exposure limit but no risk group.
    time_bases_s : tuple of float or None
        Exposure duration behind each group limit [s].
    fov_rad : tuple of float or None
        Field of view over which radiance is averaged at each group boundary [rad].
    alpha_bounds_rad : tuple of tuple or None
        α bounds applied at each group boundary when ``limits_over_alpha`` [rad].
    exposure_limit : ExposureLimit or None
        The exposure limit that gives t_max; None when t_max is not defined.
    limits_over_alpha : bool
        Group limits are c/α.
    """

    symbol: str
    title: str
    band_nm: tuple[float, float]
    table: str | None
    kind: Literal["irradiance", "radiance"]
    applies: Applies
    limits: tuple[float, float, float] | None
    time_bases_s: tuple[float, float, float] | None
    fov_rad: tuple[float, float, float] | None
    alpha_bounds_rad: tuple[tuple[float, float], ...] | None
    exposure_limit: ExposureLimit | None
    limits_over_alpha: bool = False

    @property
    def unit(self) -> str:
        """SI unit of the value."""
        return "W/m2/sr" if self.kind == "radiance" else "W/m2"


@dataclass(frozen=True)
class LimitSet:
    """A named, versioned set of hazards and the switches between them.

    Attributes
    ----------
    name : str
        E.g. ``"IEC 62471:2006"``.
    hazards : tuple of Hazard
        In report order.
    small_source_alpha_rad : float
        Below this α the blue-light hazard is assessed as irradiance E_B [rad].
    weak_stimulus_luminance_cd_m2 : float
        Below this luminance the source is a weak visual stimulus [cd m⁻²].
    families : tuple of (str, tuple of str)
        Hazards that stand in for one another (blue light: L_B or E_B by α; retinal thermal: L_R or L_IR by
        luminance), so that studies across distance or dimming follow whichever applies.
    """

    name: str
    hazards: tuple[Hazard, ...]
    small_source_alpha_rad: float
    weak_stimulus_luminance_cd_m2: float
    families: tuple[tuple[str, tuple[str, ...]], ...] = ()

    def __getitem__(self, symbol: str) -> Hazard:
        for hazard in self.hazards:
            if hazard.symbol == symbol:
                return hazard
        raise KeyError(symbol)


_THERMAL_ALPHA = ((0.011, 0.1), (0.011, 0.1), (0.0017, 0.1))  # IEC 62471:2006 Table 6.1
_THERMAL_FOV = (0.011, 0.011, 0.0017)                          # IEC 62471:2006 Table 6.1
_RETINAL_THERMAL_EL = ExposureLimit(50000.0, -0.25, (1e-5, 10.0), "L_R ≤ 50000/(α·t^0.25), 10 µs ≤ t ≤ 10 s",
                                    over_alpha=True)

IEC_62471_2006 = LimitSet(
    name="IEC 62471:2006",
    small_source_alpha_rad=0.011,
    weak_stimulus_luminance_cd_m2=10.0,
    families=(("E_S", ("E_S",)), ("E_UVA", ("E_UVA",)), ("blue light", ("L_B", "E_B")),
              ("retinal thermal", ("L_R", "L_IR")), ("E_IR", ("E_IR",))),
    hazards=(
        Hazard("E_S", "actinic UV, skin and eye", (200, 400), "s_uv", "irradiance", "always",
               (0.001, 0.003, 0.03), (30000, 10000, 1000), None, None,
               ExposureLimit(30.0, -1.0, (0.0, 30000.0), "E_S·t ≤ 30 J/m2 within 8 h")),
        Hazard("E_UVA", "near-UV, eye (lens)", (315, 400), None, "irradiance", "always",
               (10.0, 33.0, 100.0), (1000, 300, 100), None, None,
               ExposureLimit(1e4, -1.0, (0.0, 1000.0), "E_UVA·t ≤ 10^4 J/m2 (t ≤ 1000 s); 10 W/m2 beyond")),
        Hazard("L_B", "blue light, retina", (300, 700), "blue_light", "radiance", "large_source",
               (100.0, 1e4, 4e6), (10000, 100, 0.25), (0.1, 0.011, 0.0017), None,
               ExposureLimit(1e6, -1.0, (0.0, 1e4), "L_B·t ≤ 10^6 J/m2/sr (t ≤ 10^4 s); 100 W/m2/sr beyond")),
        Hazard("E_B", "blue light, retina, small source", (300, 700), "blue_light", "irradiance",
               "small_source", (1.0, 1.0, 400.0), (10000, 100, 0.25), None, None,
               ExposureLimit(100.0, -1.0, (0.0, 100.0), "E_B·t ≤ 100 J/m2 (t ≤ 100 s); 1 W/m2 beyond")),
        Hazard("L_R", "retinal thermal", (380, 1400), "retinal_thermal", "radiance", "visual_stimulus",
               (28000.0, 28000.0, 71000.0), (10, 10, 0.25), _THERMAL_FOV, _THERMAL_ALPHA,
               _RETINAL_THERMAL_EL, limits_over_alpha=True),
        Hazard("L_IR", "retinal thermal, weak visual stimulus", (780, 1400), "retinal_thermal", "radiance",
               "weak_visual_stimulus", (6000.0, 6000.0, 6000.0), (1000, 100, 10), _THERMAL_FOV,
               _THERMAL_ALPHA, None, limits_over_alpha=True),
        Hazard("E_IR", "infrared, eye (cornea and lens)", (780, 3000), None, "irradiance", "always",
               (100.0, 570.0, 3200.0), (1000, 100, 10), None, None,
               ExposureLimit(18000.0, -0.75, (0.0, 1000.0), "E_IR ≤ 18000·t^-0.75 W/m2 (t ≤ 1000 s); "
                                                             "100 W/m2 beyond")),
        Hazard("E_H", "thermal, skin", (380, 3000), None, "irradiance", "always", None, None, None, None,
               ExposureLimit(20000.0, -0.75, (0.0, 10.0), "E_H·t ≤ 20000·t^0.25 J/m2, t < 10 s")),
    ),
)

DEFAULT_LIMIT_SET = IEC_62471_2006
