"""What a limit set is made of: hazards, their exposure limits and viewing rules, group boundaries, switches.

These records are the one source of the method's constants. Everything else in the tool reads them: the
evaluation, t_max, the groups, the studies, the claims the record may make, the cautions and the reports
(through the result). Adding a hazard or a limit set is adding records, not editing modules.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Literal

import numpy as np

__all__ = [
    "GROUPS",
    "Applies",
    "BandShare",
    "CautionTrigger",
    "ExposureLimit",
    "FieldOfView",
    "Hazard",
    "LimitPiece",
    "LimitSet",
    "RiskGroup",
    "Viewing",
]

GROUPS = ("Exempt", "RG1", "RG2", "RG3")
"""Risk groups in rising order, the same in every limit set of the IEC 62471 family."""
RiskGroup = Literal["Exempt", "RG1", "RG2", "RG3"]
"""The name of a risk group, as a type: one of :data:`GROUPS`."""

Applies = Literal["always", "large_source", "small_source", "visual_stimulus", "weak_visual_stimulus"]


@dataclass(frozen=True, kw_only=True)
class FieldOfView:
    """Averaging field of view γ (full cone angle) for an exposure duration.

    Fixed, or ``growth·√t`` bounded to ``cap_rad``.

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

    def at(self, t_s: np.ndarray | float) -> np.ndarray:
        """γ at exposure duration ``t_s`` [rad]."""
        if self.fixed_rad is not None:
            return np.full(np.shape(t_s), self.fixed_rad)
        assert self.growth_rad_per_sqrt_s is not None  # a FieldOfView is fixed or growing
        return np.minimum(self.growth_rad_per_sqrt_s * np.sqrt(t_s), self.cap_rad)

    @property
    def grows(self) -> bool:
        """The field changes with the duration."""
        return self.fixed_rad is None


@dataclass(frozen=True, kw_only=True)
class Viewing:
    """How a radiance hazard is viewed for exposures up to ``up_to_s``.

    The averaging field of view and the bounds on α in limits written as c/α.

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


@dataclass(frozen=True, kw_only=True)
class LimitPiece:
    """One piece of an exposure limit: value ≤ coefficient·t^exponent for ``after_s`` < t ≤ ``up_to_s``.

    A dose limit D is ``coefficient = D, exponent = −1``; the limit is divided by the bounded α when ``over_alpha``.

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
        Compare another hazard's weighted integral of the same set (e.g. the weak-stimulus hazard is bounded
        for t ≤ 10 s by the retinal-thermal limit on the wider band); None for the hazard's own.
    """

    after_s: float
    up_to_s: float
    coefficient: float
    exponent: float
    over_alpha: bool = False
    quantity: str | None = None


@dataclass(frozen=True, kw_only=True)
class ExposureLimit:
    """An exposure limit as pieces over exposure duration; t_max is where it is first reached.

    Attributes
    ----------
    pieces : tuple of LimitPiece
        In rising duration.
    text : str
        The limit as formulas, for reports.
    """

    pieces: tuple[LimitPiece, ...]
    text: str


@dataclass(frozen=True, kw_only=True)
class BandShare:
    """How a hazard's value is split for the reader.

    The share of a sub-band (e.g. UV-C within the actinic band, for a caution) or contributions by bands of a fixed
    width (to say what to filter).

    Attributes
    ----------
    name : str
        Key of the split, e.g. ``"UV-C"`` or ``"5 nm bands"``.
    band_nm : tuple of float
        The sub-band, or the range divided into steps [nm].
    step_nm : float or None
        Width of each band when the range is divided [nm]; None for one sub-band.
    """

    name: str
    band_nm: tuple[float, float]
    step_nm: float | None = None


@dataclass(frozen=True, kw_only=True)
class CautionTrigger:
    """A caution chosen when the hazard reaches a group (and, optionally, a sub-band share).

    Attributes
    ----------
    caution : str
        Key of the caution's wording (:mod:`hazard.assessment.cautions`).
    from_group : str
        The caution applies from this group on.
    share : str or None
        Name of a :class:`BandShare` of the hazard that must be over ``share_above``.
    share_above : float
        Least share of that sub-band [1].
    """

    caution: str
    from_group: str
    share: str | None = None
    share_above: float = 0.0


@dataclass(frozen=True, kw_only=True)
class Hazard:
    """One hazard quantity of a limit set.

    Attributes
    ----------
    symbol : str
        The standard's symbol.
    title : str
        What it protects, in a few words.
    clause : str
        Where the exposure limit is stated.
    family : str
        Hazards of one family stand in for one another (e.g. the radiance and small-source forms of blue
        light), so that studies across distance or dimming follow whichever applies.
    band_nm : tuple of float
        Integration band [nm].
    table : str or None
        Weighting table name in :mod:`hazard.weighting_tables`; None for an unweighted band.
    kind : str
        ``"irradiance"`` [W m⁻²] or ``"radiance"`` [W m⁻² sr⁻¹].
    effect : str
        ``"photochemical"``: the limit is a dose, exposures add up over a day; ``"thermal"``: tissue cools
        between exposures, and pulses add up only within the limit's own durations.
    applies : str
        When the hazard is assessed: ``always``; ``large_source`` / ``small_source`` (α against
        :attr:`LimitSet.small_source_alpha_rad`); ``visual_stimulus`` / ``weak_visual_stimulus`` (luminance
        against :attr:`LimitSet.weak_stimulus_luminance_cd_m2`).
    exposure_limit : ExposureLimit
        The exposure limit that gives t_max.
    limits : tuple of float or None
        Limits at the boundaries [unit], or the coefficient c of c/α when ``limits_over_alpha``; None when the
        hazard has an exposure limit but no risk group.
    time_bases_s : tuple of float or None
        Exposure duration behind each boundary's limit [s]; given exactly when ``limits`` is.
    viewing : tuple of Viewing
        Radiance hazards: field of view and α bounds by exposure duration, in rising ``up_to_s``.
    limits_over_alpha : bool
        Boundary limits are c/α.
    claimable : bool
        A record may claim its t_max (field ``claimed_t_max_s_<symbol>``).
    feeds_transfer : bool
        Its weighted integral is the blue-light quantity of the transfer values (IEC TR 62778).
    shares : tuple of BandShare
        Splits of its value shown to the reader.
    cautions : tuple of CautionTrigger
        Cautions it triggers.
    """

    symbol: str
    title: str
    clause: str
    family: str
    band_nm: tuple[float, float]
    table: str | None
    kind: Literal["irradiance", "radiance"]
    effect: Literal["photochemical", "thermal"]
    applies: Applies
    exposure_limit: ExposureLimit
    limits: tuple[float, float, float] | None = None
    time_bases_s: tuple[float, float, float] | None = None
    viewing: tuple[Viewing, ...] = ()
    limits_over_alpha: bool = False
    claimable: bool = True
    feeds_transfer: bool = False
    shares: tuple[BandShare, ...] = ()
    cautions: tuple[CautionTrigger, ...] = ()

    def __post_init__(self) -> None:
        if (self.limits is None) != (self.time_bases_s is None):
            raise ValueError(f"{self.symbol}: boundary limits and their time bases are given together or not at all")

    @property
    def unit(self) -> str:
        """SI unit code of the value."""
        return "W/m2/sr" if self.kind == "radiance" else "W/m2"

    @property
    def grouped(self) -> bool:
        """The hazard has risk groups."""
        return self.limits is not None

    def viewing_at(self, t_s: float) -> Viewing | None:
        """The viewing rule for exposure duration ``t_s``; None for an irradiance hazard."""
        return next((v for v in self.viewing if t_s <= v.up_to_s), self.viewing[-1] if self.viewing else None)

    @property
    def fov_rad(self) -> tuple[float, ...] | None:
        """Field of view at each boundary (the viewing rule at its time base) [rad]."""
        if not self.viewing or self.time_bases_s is None:
            return None
        return tuple(float(self._viewing(t).fov.at(t)) for t in self.time_bases_s)

    @property
    def alpha_bounds_rad(self) -> tuple[tuple[float, float], ...] | None:
        """α bounds at each boundary (the viewing rule at its time base) [rad]."""
        if not self.limits_over_alpha or self.time_bases_s is None:
            return None
        return tuple(self._alpha_bounds(t) for t in self.time_bases_s)

    def _viewing(self, t_s: float) -> Viewing:
        rule = self.viewing_at(t_s)
        if rule is None:
            raise ValueError(f"{self.symbol} has no viewing rule")
        return rule

    def _alpha_bounds(self, t_s: float) -> tuple[float, float]:
        bounds = self._viewing(t_s).alpha_bounds_rad
        if bounds is None:
            raise ValueError(f"{self.symbol}: limits over α need α bounds at {t_s:g} s")
        return bounds


@dataclass(frozen=True, kw_only=True)
class LimitSet:
    """A named, versioned set of hazards, its boundaries and the switches between hazards.

    Attributes
    ----------
    name : str
        The standard and edition.
    hazards : tuple of Hazard
        In report order.
    small_source_alpha_rad : float
        Below this α the small-source form of a family applies [rad].
    weak_stimulus_luminance_cd_m2 : float
        Below this luminance the source is a weak visual stimulus [cd m⁻²].
    table_rounding : float
        Relative rounding of the tabulated limits against the exposure limits at their time bases: a group and
        t_max agree within it [1].
    transfer_threshold_w_m2 : float or None
        Blue-light irradiance at which the transfer values put their threshold illuminance [W m⁻²]; None when
        the set has no transfer values.
    boundaries : tuple of str
        The groups whose upper limits the set tabulates, in rising order; above the last is the highest group.
    """

    name: str
    hazards: tuple[Hazard, ...]
    small_source_alpha_rad: float
    weak_stimulus_luminance_cd_m2: float
    table_rounding: float
    transfer_threshold_w_m2: float | None = None
    boundaries: tuple[str, str, str] = GROUPS[:3]
    groups: tuple[str, ...] = field(default=GROUPS)

    def __getitem__(self, symbol: str) -> Hazard:
        for hazard in self.hazards:
            if hazard.symbol == symbol:
                return hazard
        raise KeyError(symbol)

    @property
    def families(self) -> tuple[tuple[str, tuple[str, ...]], ...]:
        """(family, member symbols) in report order."""
        out: dict[str, list[str]] = {}
        for hazard in self.hazards:
            out.setdefault(hazard.family, []).append(hazard.symbol)
        return tuple((name, tuple(members)) for name, members in out.items())

    @property
    def grouped_families(self) -> tuple[tuple[str, tuple[str, ...]], ...]:
        """The families whose members have risk groups."""
        return tuple((name, members) for name, members in self.families if self[members[0]].grouped)

    @property
    def claimable(self) -> tuple[str, ...]:
        """Symbols a record may claim a t_max for."""
        return tuple(h.symbol for h in self.hazards if h.claimable)

    def transfer_quantity(self) -> str | None:
        """The hazard whose weighted integral feeds the blue-light transfer values, if any."""
        return next((h.symbol for h in self.hazards if h.feeds_transfer), None)
