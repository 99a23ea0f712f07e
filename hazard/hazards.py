"""The hazard registry: one frozen record per hazard quantity, grouped into a limit set.

Everything the engine knows about a hazard is here as data: band, weighting table, exposure limit (as pieces
over exposure duration), the viewing rule (the averaging field of view and the α bounds that belong to each
exposure duration), risk-group limits and their time bases. The field of view and α bounds of a group
boundary are those of the viewing rule at the boundary's time base, so t_max and the groups use one rule.

The default and only set is :data:`IEC_62471_2006` (IEC 62471:2006 = CIE S 009:2002, which follows the
ICNIRP 1997/2004 limits). A later set (e.g. ICNIRP 2013 visible/IR limits) is a new record, never an edit of
this one.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

__all__ = ["GROUPS", "BOUNDARIES", "FieldOfView", "Viewing", "LimitPiece", "ExposureLimit", "Hazard", "LimitSet",
           "IEC_62471_2006", "DEFAULT_LIMIT_SET"]

GROUPS = ("Exempt", "RG1", "RG2", "RG3")
"""Risk groups in rising order; a value above the RG2 limit is RG3 (IEC 62471:2006, 6.1)."""
BOUNDARIES = GROUPS[:3]
"""The group boundaries a limit set tabulates: the upper limits of Exempt, RG1 and RG2."""

Applies = Literal["always", "large_source", "small_source", "visual_stimulus", "weak_visual_stimulus"]


@dataclass(frozen=True)
class FieldOfView:
    """Averaging field of view γ (full cone angle) for an exposure duration: fixed, or ``growth·√t`` bounded to
    ``cap_rad``.

    Attributes
    ----------
    fixed_rad : float or None
        A fixed field of view [rad].
    growth_rad_per_sqrt_s : float or None
        γ = growth·√t [rad s^-1/2] (eye movements spread the image over longer exposures).
    cap_rad : float
        Upper bound of a growing field [rad].
    """

    fixed_rad: float | None = None
    growth_rad_per_sqrt_s: float | None = None
    cap_rad: float = math.inf

    def at(self, t_s):
        """γ at exposure duration ``t_s`` [rad] (numpy arrays welcome)."""
        import numpy as np

        if self.fixed_rad is not None:
            return np.full(np.shape(t_s), self.fixed_rad) if np.ndim(t_s) else self.fixed_rad
        return np.minimum(self.growth_rad_per_sqrt_s * np.sqrt(t_s), self.cap_rad)

    @property
    def grows(self) -> bool:
        """The field changes with the duration."""
        return self.fixed_rad is None


@dataclass(frozen=True)
class Viewing:
    """How a radiance hazard is viewed for exposures up to ``up_to_s``: the averaging field of view and the
    bounds on α in limits written as c/α.

    Attributes
    ----------
    up_to_s : float
        Durations up to (and including) this [s]; the next rule takes over beyond it.
    fov : FieldOfView
    alpha_bounds_rad : tuple of float or None
        (α_min, α_max) [rad], for limits divided by α.
    """

    up_to_s: float
    fov: FieldOfView
    alpha_bounds_rad: tuple[float, float] | None = None


@dataclass(frozen=True)
class LimitPiece:
    """One piece of an exposure limit: value ≤ coefficient·t^exponent for ``after_s`` < t ≤ ``up_to_s``
    (a dose limit D is ``coefficient = D, exponent = −1``), divided by the bounded α when ``over_alpha``.

    Attributes
    ----------
    after_s, up_to_s : float
        Durations the piece covers [s].
    coefficient : float
        C [unit of the quantity · s^-exponent], or C·α when ``over_alpha``.
    exponent : float
        k [1].
    over_alpha : bool
        The limit is C/(α·…), α bounded by the viewing rule.
    quantity : str or None
        Compare another hazard's weighted integral of the same set (e.g. the weak-stimulus hazard L_IR is
        bounded for t ≤ 10 s by the retinal-thermal limit on L_R); None for the hazard's own.
    """

    after_s: float
    up_to_s: float
    coefficient: float
    exponent: float
    over_alpha: bool = False
    quantity: str | None = None


@dataclass(frozen=True)
class ExposureLimit:
    """An exposure limit as pieces over exposure duration; t_max is where it is first reached.

    Attributes
    ----------
    pieces : tuple of LimitPiece
        In rising duration.
    text : str
        The limit as formulas, for reports.
    valid_from_s : float
        Below this duration the formula is an extrapolation (the retinal thermal limit starts at 10 µs) [s].
    """

    pieces: tuple[LimitPiece, ...]
    text: str
    valid_from_s: float = 0.0


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
    exposure_limit : ExposureLimit
        The exposure limit that gives t_max.
    limits : tuple of float or None
        Exempt, RG1 and RG2 limits [unit], or the coefficient c of c/α when ``limits_over_alpha``;
        None when the hazard has an exposure limit but no risk group.
    time_bases_s : tuple of float or None
        Exposure duration behind each group limit [s].
    viewing : tuple of Viewing
        Radiance hazards: field of view and α bounds by exposure duration, in rising ``up_to_s``; empty for
        irradiance hazards.
    limits_over_alpha : bool
        Group limits are c/α.
    """

    symbol: str
    title: str
    band_nm: tuple[float, float]
    table: str | None
    kind: Literal["irradiance", "radiance"]
    applies: Applies
    exposure_limit: ExposureLimit
    limits: tuple[float, float, float] | None = None
    time_bases_s: tuple[float, float, float] | None = None
    viewing: tuple[Viewing, ...] = ()
    limits_over_alpha: bool = False

    @property
    def unit(self) -> str:
        """SI unit of the value."""
        return "W/m2/sr" if self.kind == "radiance" else "W/m2"

    def viewing_at(self, t_s: float) -> Viewing | None:
        """The viewing rule for exposure duration ``t_s``; None for an irradiance hazard."""
        return next((v for v in self.viewing if t_s <= v.up_to_s), self.viewing[-1] if self.viewing else None)

    @property
    def fov_rad(self) -> tuple[float, ...] | None:
        """Field of view at each group boundary (the viewing rule at its time base) [rad]."""
        if not self.viewing or self.time_bases_s is None:
            return None
        return tuple(float(self.viewing_at(t).fov.at(t)) for t in self.time_bases_s)

    @property
    def alpha_bounds_rad(self) -> tuple[tuple[float, float], ...] | None:
        """α bounds at each group boundary (the viewing rule at its time base) [rad]."""
        if not self.limits_over_alpha or self.time_bases_s is None:
            return None
        return tuple(self.viewing_at(t).alpha_bounds_rad for t in self.time_bases_s)


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
    table_rounding : float
        Relative rounding of the tabulated group limits against the exposure limits at their time bases: a
        group and t_max agree within it [1].
    families : tuple of (str, tuple of str)
        Hazards that stand in for one another (blue light: L_B or E_B by α; retinal thermal: L_R or L_IR by
        luminance), so that studies across distance or dimming follow whichever applies.
    """

    name: str
    hazards: tuple[Hazard, ...]
    small_source_alpha_rad: float
    weak_stimulus_luminance_cd_m2: float
    table_rounding: float
    families: tuple[tuple[str, tuple[str, ...]], ...] = ()

    def __getitem__(self, symbol: str) -> Hazard:
        for hazard in self.hazards:
            if hazard.symbol == symbol:
                return hazard
        raise KeyError(symbol)


_INF = math.inf
_MRAD = 1e-3

# Blue light (IEC 62471:2006 4.3.3 and Table 6.1; ICNIRP): 11 mrad up to 100 s, 1.1·√t mrad from 100 s to
# 10^4 s, held at the 0.1 rad of the Exempt boundary beyond (the rule gives 0.11 rad at 10^4 s; capping at 0.1 rad
# errs on the safe side between 8300 s and 10^4 s). Up to 0.25 s the 1.7 mrad field of the RG2 boundary (time
# base 0.25 s) applies, as for the retinal thermal hazard, so that t_max and the RG2 test use the same field.
_BLUE_VIEWING = (Viewing(0.25, FieldOfView(1.7 * _MRAD)), Viewing(100.0, FieldOfView(11 * _MRAD)),
                 Viewing(_INF, FieldOfView(growth_rad_per_sqrt_s=1.1 * _MRAD, cap_rad=0.1)))
# Retinal thermal (IEC 62471:2006 4.3.5, Table 6.1): 1.7 mrad and α ≥ 1.7 mrad up to 0.25 s, 11 mrad and
# α ≥ 11 mrad beyond; α ≤ 0.1 rad throughout.
_THERMAL_VIEWING = (Viewing(0.25, FieldOfView(1.7 * _MRAD), (0.0017, 0.1)),
                    Viewing(_INF, FieldOfView(11 * _MRAD), (0.011, 0.1)))
_THERMAL_PIECE = dict(coefficient=50000.0, exponent=-0.25, over_alpha=True)  # L_R ≤ 50000/(α·t^0.25), 4.3.5

IEC_62471_2006 = LimitSet(
    name="IEC 62471:2006",
    small_source_alpha_rad=0.011,
    weak_stimulus_luminance_cd_m2=10.0,
    table_rounding=0.03,
    families=(("E_S", ("E_S",)), ("E_UVA", ("E_UVA",)), ("blue light", ("L_B", "E_B")),
              ("retinal thermal", ("L_R", "L_IR")), ("E_IR", ("E_IR",))),
    hazards=(
        Hazard(symbol="E_S", title="actinic UV, skin and eye", band_nm=(200, 400), table="s_uv", kind="irradiance",
               applies="always", limits=(0.001, 0.003, 0.03), time_bases_s=(30000, 10000, 1000),
               exposure_limit=ExposureLimit((LimitPiece(0.0, 30000.0, 30.0, -1.0),),
                                            "E_S·t ≤ 30 J/m² within 8 h")),
        Hazard(symbol="E_UVA", title="near-UV, eye (lens)", band_nm=(315, 400), table=None, kind="irradiance",
               applies="always", limits=(10.0, 33.0, 100.0), time_bases_s=(1000, 300, 100),
               exposure_limit=ExposureLimit((LimitPiece(0.0, 1000.0, 1e4, -1.0), LimitPiece(1000.0, _INF, 10.0, 0.0)),
                                            "E_UVA·t ≤ 10⁴ J/m² (t ≤ 1000 s); 10 W/m² beyond")),
        Hazard(symbol="L_B", title="blue light, retina", band_nm=(300, 700), table="blue_light", kind="radiance",
               applies="large_source", limits=(100.0, 1e4, 4e6), time_bases_s=(10000, 100, 0.25),
               viewing=_BLUE_VIEWING,
               exposure_limit=ExposureLimit((LimitPiece(0.0, 1e4, 1e6, -1.0), LimitPiece(1e4, _INF, 100.0, 0.0)),
                                            "L_B·t ≤ 10⁶ J/(m²·sr) (t ≤ 10⁴ s); 100 W/(m²·sr) beyond")),
        Hazard(symbol="E_B", title="blue light, retina, small source", band_nm=(300, 700), table="blue_light",
               kind="irradiance", applies="small_source", limits=(1.0, 1.0, 400.0), time_bases_s=(10000, 100, 0.25),
               exposure_limit=ExposureLimit((LimitPiece(0.0, 100.0, 100.0, -1.0), LimitPiece(100.0, _INF, 1.0, 0.0)),
                                            "E_B·t ≤ 100 J/m² (t ≤ 100 s); 1 W/m² beyond")),
        Hazard(symbol="L_R", title="retinal thermal", band_nm=(380, 1400), table="retinal_thermal", kind="radiance",
               applies="visual_stimulus", limits=(28000.0, 28000.0, 71000.0), time_bases_s=(10, 10, 0.25),
               viewing=_THERMAL_VIEWING, limits_over_alpha=True,
               exposure_limit=ExposureLimit((LimitPiece(0.0, 10.0, **_THERMAL_PIECE),),
                                            "L_R ≤ 50000/(α·t^0.25), 10 µs ≤ t ≤ 10 s", valid_from_s=1e-5)),
        # Weak visual stimulus (4.3.6): L_IR ≤ 6000/α for t > 10 s, every group boundary with γ = 11 mrad and
        # α ≥ 11 mrad (its time bases, 1000/100/10 s, all lie in that range). Up to 10 s the retinal thermal
        # limit of 4.3.5 still bounds the R-weighted radiance, L_R (380-1400 nm), so t_max includes it.
        Hazard(symbol="L_IR", title="retinal thermal, weak visual stimulus", band_nm=(780, 1400),
               table="retinal_thermal", kind="radiance", applies="weak_visual_stimulus",
               limits=(6000.0, 6000.0, 6000.0), time_bases_s=(1000, 100, 10), limits_over_alpha=True,
               viewing=(Viewing(0.25, FieldOfView(1.7 * _MRAD), (0.0017, 0.1)),
                        Viewing(_INF, FieldOfView(11 * _MRAD), (0.011, 0.1))),
               exposure_limit=ExposureLimit((LimitPiece(0.0, 10.0, quantity="L_R", **_THERMAL_PIECE),
                                             LimitPiece(10.0, _INF, 6000.0, 0.0, over_alpha=True)),
                                            "L_R ≤ 50000/(α·t^0.25) (10 µs ≤ t ≤ 10 s); L_IR ≤ 6000/α (t > 10 s)",
                                            valid_from_s=1e-5)),
        Hazard(symbol="E_IR", title="infrared, eye (cornea and lens)", band_nm=(780, 3000), table=None,
               kind="irradiance", applies="always", limits=(100.0, 570.0, 3200.0), time_bases_s=(1000, 100, 10),
               exposure_limit=ExposureLimit((LimitPiece(0.0, 1000.0, 18000.0, -0.75),
                                             LimitPiece(1000.0, _INF, 100.0, 0.0)),
                                            "E_IR ≤ 18000·t^−0.75 W/m² (t ≤ 1000 s); 100 W/m² beyond")),
        Hazard(symbol="E_H", title="thermal, skin", band_nm=(380, 3000), table=None, kind="irradiance",
               applies="always",
               exposure_limit=ExposureLimit((LimitPiece(0.0, 10.0, 20000.0, -0.75),),
                                            "E_H·t ≤ 20000·t^0.25 J/m², t < 10 s")),
    ),
)

DEFAULT_LIMIT_SET = IEC_62471_2006
