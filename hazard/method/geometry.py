"""Source geometry at a distance (method §4): angular subtense, solid angles, distance rules.

All lengths here are metres, angles radians, solid angles steradians. Functions accept numpy arrays so the
batch path evaluates many products at once.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

__all__ = ["SourceShape", "FieldGeometry", "cone_solid_angle_sr", "inverse_square_factor", "disc_rectangle_area",
           "GLS_ILLUMINANCE_LX", "MIN_ASSESSMENT_DISTANCE_M", "FIVE_TIMES_RULE"]

GLS_ILLUMINANCE_LX = 500.0
"""GLS lamps are assessed where they give this illuminance (IEC 62471:2006, 5.1.2) [lx]."""
MIN_ASSESSMENT_DISTANCE_M = 0.2
"""Assessment distance for all other lamps, and the least for GLS lamps (IEC 62471:2006, 5.1.2) [m]."""
FIVE_TIMES_RULE = 5.0
"""Inverse-square scaling is trusted beyond this many source dimensions (common practice, no published
source beyond photometric habit) [1]."""


def cone_solid_angle_sr(full_angle_rad: np.ndarray | float) -> np.ndarray:
    """Solid angle of a cone of full plane angle γ: Ω = 2π(1 − cos(γ/2)) [sr].

    Examples
    --------
    >>> f"{float(cone_solid_angle_sr(0.01)):.4e}"
    '7.8540e-05'
    """
    return 2 * np.pi * (1 - np.cos(np.asarray(full_angle_rad, dtype=float) / 2))


def disc_rectangle_area(radius: np.ndarray, half_width: np.ndarray, half_height: np.ndarray) -> np.ndarray:
    """Area of a disc of ``radius`` clipped by a rectangle of the given half-sides, both centred at the origin
    [unit²].

    Exact: four times the quarter ∫₀^min(p, r) min(q, √(r² − x²)) dx, with
    ∫₀^x √(r² − t²) dt = (x·√(r² − x²) + r²·asin(x/r))/2.

    Examples
    --------
    >>> float(disc_rectangle_area(1.0, 2.0, 2.0)) / np.pi  # the disc inside the rectangle
    1.0
    >>> float(disc_rectangle_area(2.0, 0.5, 1.0))  # the rectangle inside the disc
    2.0
    >>> round(float(disc_rectangle_area(1.0, 0.01, 5.0)), 5)  # a thin strip across: width × chord
    0.04
    """
    r = np.asarray(radius, dtype=float)
    p = np.asarray(half_width, dtype=float)
    q = np.asarray(half_height, dtype=float)

    def under_circle(x):
        x = np.minimum(x, r)
        with np.errstate(invalid="ignore", divide="ignore"):
            return 0.5 * (x * np.sqrt(np.maximum(r ** 2 - x ** 2, 0.0)) + r ** 2 * np.arcsin(np.clip(x / r, 0, 1)))

    x_end = np.minimum(p, r)
    x_cap = np.sqrt(np.maximum(r ** 2 - q ** 2, 0.0))  # for x below this the circle is above the rectangle's top
    flat = np.where(q < r, q * np.minimum(x_end, x_cap), 0.0)
    curved = under_circle(x_end) - under_circle(np.where(q < r, np.minimum(x_end, x_cap), 0.0))
    return 4 * (flat + curved)


def inverse_square_factor(from_m: np.ndarray | float, to_m: np.ndarray | float) -> np.ndarray:
    """Irradiance multiplier from distance ``from_m`` to ``to_m`` by the point-source law [1]."""
    return (np.asarray(from_m, dtype=float) / np.asarray(to_m, dtype=float)) ** 2


@dataclass(frozen=True)
class SourceShape:
    """Uniform discs and rectangles by their linear size [m], one entry per product.

    Attributes
    ----------
    width_m : numpy.ndarray
        Diameter of a disc, or width of a rectangle [m].
    height_m : numpy.ndarray
        Height of a rectangle [m]; NaN for a disc.
    """

    width_m: np.ndarray
    height_m: np.ndarray

    def take(self, index: np.ndarray) -> "SourceShape":
        """The shapes at ``index`` (positions or a boolean mask)."""
        return SourceShape(self.width_m[index], self.height_m[index])

    @property
    def is_disc(self) -> np.ndarray:
        """True where the source is a disc."""
        return np.isnan(self.height_m)

    def alpha_rad(self, distance_m: np.ndarray | float, bounds_rad: tuple[float, float] | None = None
                  ) -> np.ndarray:
        """Angular subtense α at ``distance_m`` [rad].

        Disc: α = D/d. Rectangle: mean of w/d and h/d, each bounded to ``bounds_rad`` first when given
        (method §4). A disc's α is bounded as a whole.

        Examples
        --------
        >>> s = SourceShape(np.array([0.002, 0.002]), np.array([np.nan, 0.05]))
        >>> s.alpha_rad(0.2).round(4).tolist(), s.alpha_rad(0.2, (0.02, 0.1)).round(4).tolist()
        ([0.01, 0.13], [0.02, 0.06])
        """
        d = np.asarray(distance_m, dtype=float)
        a = self.width_m / d
        b = np.where(self.is_disc, a, self.height_m / d)
        if bounds_rad is not None:
            a, b = np.clip(a, *bounds_rad), np.clip(b, *bounds_rad)
        return (a + b) / 2

    def solid_angle_sr(self, distance_m: np.ndarray | float) -> np.ndarray:
        """Solid angle Ω_s the source subtends at ``distance_m``, on axis [sr].

        Disc: 2π(1 − cos θ), θ = atan(D/2d). Rectangle: 4·asin(sin a · sin b), a = atan(w/2d),
        b = atan(h/2d).

        Examples
        --------
        >>> s = SourceShape(np.array(0.01), np.array(0.01))
        >>> round(float(s.solid_angle_sr(1.0)) / 1e-4, 4)  # ≈ area / d² for a small square
        1.0
        """
        d = np.asarray(distance_m, dtype=float)
        disc = 2 * np.pi * (1 - np.cos(np.arctan(self.width_m / (2 * d))))
        a = np.arctan(self.width_m / (2 * d))
        b = np.arctan(np.where(self.is_disc, self.width_m, self.height_m) / (2 * d))
        return np.where(self.is_disc, disc, 4 * np.arcsin(np.sin(a) * np.sin(b)))

    def seen_from(self, distance_m: np.ndarray | float) -> "FieldGeometry":
        """The sources as seen from ``distance_m``, ready for field-of-view fractions (:class:`FieldGeometry`)."""
        d = np.asarray(distance_m, dtype=float)
        omega_s = self.solid_angle_sr(d)
        a = np.arctan(self.width_m / (2 * d))
        b = np.arctan(np.where(self.is_disc, self.width_m, self.height_m) / (2 * d))
        with np.errstate(divide="ignore", invalid="ignore"):
            stretch = np.sqrt(omega_s / (4 * a * b))  # rectangle of area Ω_s with the source's aspect
        return FieldGeometry(omega_s=np.broadcast_to(omega_s, self.width_m.shape), half_width=a * stretch,
                             half_height=b * stretch, is_disc=self.is_disc)

    def field_fraction(self, distance_m: np.ndarray | float, fov_rad: np.ndarray | float) -> np.ndarray:
        """Fraction of a field of view γ that the source fills (:meth:`FieldGeometry.fraction`) [1].

        Examples
        --------
        >>> strip = SourceShape(np.array([0.0001]), np.array([0.04]))  # 0.1 mm × 40 mm
        >>> f = strip.field_fraction(0.2, 0.01)[0]
        >>> round(float(f / (0.0005 * 0.01 / cone_solid_angle_sr(0.01))), 2)  # width·chord / Ω_γ
        1.0
        """
        return self.seen_from(distance_m).fraction(fov_rad)

    def distance_for_solid_angle_m(self, solid_angle_sr: np.ndarray) -> np.ndarray:
        """Distance at which the source subtends ``solid_angle_sr`` [m] (inverse of :meth:`solid_angle_sr`).

        The solid angle falls monotonically with distance: :func:`hazard.method.search.log_search` between 1 nm and
        10⁶ km, to a relative precision of 1e-12. A solid angle of 2π or more is never reached and gives 0.
        """
        from hazard.method.search import log_search

        omega = np.broadcast_to(np.asarray(solid_angle_sr, dtype=float), np.shape(self.width_m))

        def small_enough(d: np.ndarray, jobs: np.ndarray) -> np.ndarray:
            shape = self.take(np.repeat(jobs, d.shape[1]))
            return (shape.solid_angle_sr(d.ravel()) <= np.repeat(omega[jobs], d.shape[1])).reshape(d.shape)

        _, found = log_search(small_enough, np.full(omega.shape, 1e-9), np.full(omega.shape, 1e9))
        return np.where(omega >= 2 * np.pi, 0.0, found)


@dataclass(frozen=True)
class FieldGeometry:
    """Sources as seen from one distance each, drawn in a plane of angles with their exact solid angles: a disc
    of area Ω_s, or a rectangle of the source's aspect with area Ω_s.

    Attributes
    ----------
    omega_s : numpy.ndarray
        Source solid angle Ω_s [sr].
    half_width, half_height : numpy.ndarray
        Half-sides of the equal-solid-angle rectangle [rad] (unused for discs).
    is_disc : numpy.ndarray
        True where the source is a disc.
    """

    omega_s: np.ndarray
    half_width: np.ndarray
    half_height: np.ndarray
    is_disc: np.ndarray

    def take(self, index: np.ndarray) -> "FieldGeometry":
        """The sources at ``index``."""
        return FieldGeometry(self.omega_s[index], self.half_width[index], self.half_height[index],
                             self.is_disc[index])

    def fraction(self, fov_rad: np.ndarray | float) -> np.ndarray:
        """Fraction of a field of view γ (a cone, Ω_γ = 2π(1 − cos(γ/2))) that the source fills, the cone
        centred on the source (where it catches most of a centrally symmetric source) [1].

        area(cone ∩ source)/Ω_γ with the cone drawn as a disc of area Ω_γ (method §4): exactly Ω_s/Ω_γ when
        the cone holds the whole source and 1 when the source fills the cone, so a uniform source's field
        average is L·fraction and a disc source's reduces to E/max(Ω_s, Ω_γ). A long thin source (a filament,
        an LED strip) fills a cone only along its length: its fraction is about width × chord / Ω_γ.
        """
        omega_g = np.broadcast_to(cone_solid_angle_sr(fov_rad), self.omega_s.shape)
        overlap = np.minimum(self.omega_s, omega_g)  # discs: the smaller of two concentric discs
        rect = ~self.is_disc
        if rect.any():
            overlap = overlap.copy()
            overlap[rect] = disc_rectangle_area(np.sqrt(omega_g[rect] / np.pi), self.half_width[rect],
                                                self.half_height[rect])
        return np.minimum(overlap / omega_g, 1.0)
