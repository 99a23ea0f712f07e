"""Source geometry at a distance (method §4): angular subtense, solid angles, distance rules.

All lengths here are metres, angles radians, solid angles steradians. Functions accept numpy arrays so the
batch path evaluates many products at once.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

__all__ = [
    "FIVE_TIMES_RULE",
    "GLS_ILLUMINANCE_LX",
    "MIN_ASSESSMENT_DISTANCE_M",
    "FieldGeometry",
    "SourceShape",
    "cone_rectangle_solid_angle",
    "cone_solid_angle_sr",
    "inverse_square_factor",
]

GLS_ILLUMINANCE_LX = 500.0
"""GLS lamps are assessed where they give this illuminance (IEC 62471:2006, 5.1.2) [lx]."""
MIN_ASSESSMENT_DISTANCE_M = 0.2
"""Assessment distance for all other lamps, and the least for GLS lamps (IEC 62471:2006, 5.1.2) [m]."""
FIVE_TIMES_RULE = 5.0
"""Inverse-square scaling is trusted beyond this many source dimensions (common practice, no published
source beyond photometric habit) [1]."""


def cone_solid_angle_sr(full_angle_rad: np.ndarray | float) -> np.ndarray:
    """Solid angle of a cone of full plane angle γ [sr].

    Ω = 2π(1 − cos(γ/2)) = 4π·sin²(γ/4); the second form keeps its precision for the smallest angles.

    Examples
    --------
    >>> f"{float(cone_solid_angle_sr(0.01)):.4e}"
    '7.8540e-05'
    """
    return 4 * np.pi * np.sin(np.asarray(full_angle_rad, dtype=float) / 4) ** 2


def _edge(a: np.ndarray, half: np.ndarray) -> np.ndarray:
    """The difference a − asin(sin a/√(1 + half²)) without cancellation: atan2 of its sine and cosine [rad]."""
    root = np.sqrt(np.cos(a) ** 2 + half**2)
    return np.arctan2(np.sin(a) * half**2 / (root + np.cos(a)), np.cos(a) * root + np.sin(a) ** 2)


def cone_rectangle_solid_angle(
    cone_half_angle_rad: np.ndarray, half_width: np.ndarray, half_height: np.ndarray
) -> np.ndarray:
    """Solid angle of a flat rectangle seen on axis, clipped by a cone about the same axis [sr].

    The rectangle's half-sides are given relative to its distance (p/d, q/d) [1].

    Exact on the sphere: in polar angle φ about the axis the region reaches out to the nearer of the cone
    (tan θ at unit distance) and the rectangle's edge, and ∫₀^R r dr/(1 + r²)^{3/2} = 1 − 1/√(1 + R²). Along the
    cone that gives 1 − cos θ per radian of φ; along the edge x = p it integrates in closed form to
    φ − asin(sin φ/√(1 + p²)) (and likewise along y = q), so no numerical integration is needed.

    Examples
    --------
    >>> p, q = np.array(0.05), np.array(0.02)
    >>> whole = 4 * np.arcsin(np.sin(np.arctan(p)) * np.sin(np.arctan(q)))  # the rectangle alone
    >>> bool(np.isclose(cone_rectangle_solid_angle(np.array(0.5), p, q), whole, rtol=1e-12))
    True
    >>> bool(np.isclose(cone_rectangle_solid_angle(np.array(0.001), p, q), cone_solid_angle_sr(0.002), rtol=1e-12))
    True
    """
    theta = np.asarray(cone_half_angle_rad, dtype=float)
    p = np.asarray(half_width, dtype=float)
    q = np.asarray(half_height, dtype=float)
    reach = np.tan(theta)
    corner = np.arctan2(q, p)  # φ of the rectangle's corner
    right = np.arccos(np.minimum(p / reach, 1.0))  # the edge x = p lies inside the cone for φ below this
    top = np.arcsin(np.minimum(q / reach, 1.0))  # the edge y = q lies inside the cone for φ above this
    cap = 2 * np.sin(theta / 2) ** 2  # 1 − cos θ
    a1 = np.minimum(corner, right)
    a2 = np.maximum(corner, top)
    quarter = _edge(a1, p) + (corner - a1) * cap + (a2 - corner) * cap + _edge(np.pi / 2 - a2, q)
    return 4 * quarter


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

    def take(self, index: np.ndarray) -> SourceShape:
        """The shapes at ``index`` (positions or a boolean mask)."""
        return SourceShape(self.width_m[index], self.height_m[index])

    @property
    def is_disc(self) -> np.ndarray:
        """True where the source is a disc."""
        return np.isnan(self.height_m)

    def alpha_rad(self, distance_m: np.ndarray | float, bounds_rad: tuple[float, float] | None = None) -> np.ndarray:
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

        Disc: 2π(1 − cos θ) = 4π·sin²(θ/2), θ = atan(D/2d). Rectangle: 4·asin(sin a · sin b), a = atan(w/2d),
        b = atan(h/2d).

        Examples
        --------
        >>> s = SourceShape(np.array(0.01), np.array(0.01))
        >>> round(float(s.solid_angle_sr(1.0)) / 1e-4, 4)  # ≈ area / d² for a small square
        1.0
        """
        d = np.asarray(distance_m, dtype=float)
        disc = 4 * np.pi * np.sin(np.arctan(self.width_m / (2 * d)) / 2) ** 2
        a = np.arctan(self.width_m / (2 * d))
        b = np.arctan(np.where(self.is_disc, self.width_m, self.height_m) / (2 * d))
        return np.where(self.is_disc, disc, 4 * np.arcsin(np.sin(a) * np.sin(b)))

    def projected_solid_angle_sr(self, distance_m: np.ndarray | float) -> np.ndarray:
        """On-axis irradiance of a uniform Lambertian source per unit radiance, E/L, at ``distance_m`` [sr].

        Disc of radius r: π·r²/(r² + d²). Rectangle of half-sides a, b (X = a/d, Y = b/d):
        2·[X/√(1+X²)·atan(Y/√(1+X²)) + Y/√(1+Y²)·atan(X/√(1+Y²))], four times the view factor of a corner
        rectangle (Modest, Radiative Heat Transfer, configuration factor of a parallel rectangle, from memory).
        Both tend to area/d² far away.

        Examples
        --------
        >>> s = SourceShape(np.array([0.01, 0.01]), np.array([np.nan, 0.01]))
        >>> (s.projected_solid_angle_sr(10.0) * 1e6 / np.array([np.pi / 4, 1.0])).round(6).tolist()  # area / d²
        [1.0, 1.0]
        """
        d = np.asarray(distance_m, dtype=float)
        r2 = (self.width_m / 2) ** 2
        disc = np.pi * r2 / (r2 + d**2)
        x = self.width_m / (2 * d)
        y = np.where(self.is_disc, x, self.height_m / (2 * d))
        sx, sy = np.sqrt(1 + x**2), np.sqrt(1 + y**2)
        rectangle = 2 * (x / sx * np.arctan(y / sx) + y / sy * np.arctan(x / sy))
        return np.where(self.is_disc, disc, rectangle)

    def irradiance_scaling(self, from_m: np.ndarray | float, to_m: np.ndarray | float) -> np.ndarray:
        """Irradiance multiplier from the measurement distance ``from_m`` to ``to_m``, on the safe side [1].

        The point-source law (d_m/d)², as the method has it, for a measurement at least five source sizes away
        (:data:`FIVE_TIMES_RULE`). Nearer, the larger of that and the law of a uniform Lambertian source,
        E(d)/E(d_m) = :meth:`projected_solid_angle_sr` ratio: measured close to a large source and carried
        outward, the point-source law understates (a 50 mm disc measured at 20 mm and assessed at 200 mm: by
        2.5×); carried inward it overstates. Taking the larger never understates a source that radiates like a
        uniform Lambertian surface or like a point (method §4 asks only for a warning there; this bounds the
        error on the safe side). Whether the law changes depends on the measurement alone, so a product's
        studies see one law at every distance.

        Examples
        --------
        >>> s = SourceShape(np.array([0.05]), np.array([np.nan]))
        >>> float((s.irradiance_scaling(0.02, 0.2) / inverse_square_factor(0.02, 0.2))[0]).__round__(3)
        2.523
        """
        point = np.broadcast_to(inverse_square_factor(from_m, to_m), np.broadcast(from_m, to_m, self.width_m).shape)
        largest = np.where(self.is_disc, self.width_m, np.fmax(self.width_m, self.height_m))
        near = np.asarray(from_m) < FIVE_TIMES_RULE * largest
        if not near.any():
            return point
        with np.errstate(invalid="ignore", divide="ignore"):
            lambertian = self.projected_solid_angle_sr(to_m) / self.projected_solid_angle_sr(from_m)
        return np.where(near, np.fmax(point, lambertian), point)

    def seen_from(self, distance_m: np.ndarray | float) -> FieldGeometry:
        """The sources as seen from ``distance_m``, ready for field-of-view fractions (:class:`FieldGeometry`)."""
        d = np.asarray(distance_m, dtype=float)
        omega_s = self.solid_angle_sr(d)
        half_width = np.broadcast_to(self.width_m / (2 * d), self.width_m.shape)
        half_height = np.broadcast_to(np.where(self.is_disc, self.width_m, self.height_m) / (2 * d), self.width_m.shape)
        return FieldGeometry(
            omega_s=np.broadcast_to(omega_s, self.width_m.shape),
            half_width=half_width,
            half_height=half_height,
            is_disc=self.is_disc,
        )

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
    """Sources as seen from one distance each.

    Attributes
    ----------
    omega_s : numpy.ndarray
        Source solid angle Ω_s [sr].
    half_width, half_height : numpy.ndarray
        Half-sides of a rectangle over its distance, w/2d and h/2d [1] (unused for discs).
    is_disc : numpy.ndarray
        True where the source is a disc.
    """

    omega_s: np.ndarray
    half_width: np.ndarray
    half_height: np.ndarray
    is_disc: np.ndarray

    def take(self, index: np.ndarray) -> FieldGeometry:
        """The sources at ``index``."""
        return FieldGeometry(self.omega_s[index], self.half_width[index], self.half_height[index], self.is_disc[index])

    def fraction(self, fov_rad: np.ndarray | float) -> np.ndarray:
        """Fraction of a field of view γ that the source fills [1].

        The field is a cone, Ω_γ = 2π(1 − cos(γ/2)), centred on the source (where it catches most of a centrally
        symmetric source).

        Ω(cone ∩ source)/Ω_γ, exact on the sphere (method §4; :func:`cone_rectangle_solid_angle`): Ω_s/Ω_γ when
        the cone holds the whole source and 1 when the source fills the cone, so a uniform source's field
        average is L·fraction and a disc source's is E/max(Ω_s, Ω_γ). A long thin source (a filament, an LED
        strip) fills a cone only along its length: its fraction is about width × chord / Ω_γ.
        """
        return self.fraction_and_cone(fov_rad)[0]

    def fraction_and_cone(self, fov_rad: np.ndarray | float) -> tuple[np.ndarray, np.ndarray]:
        """:meth:`fraction`, and the field's own solid angle Ω_γ it was divided by [1, sr]."""
        fov = np.broadcast_to(np.asarray(fov_rad, dtype=float), self.omega_s.shape)
        omega_g = cone_solid_angle_sr(fov)
        overlap = np.minimum(self.omega_s, omega_g)  # discs: the smaller of two concentric cones
        rect = ~self.is_disc
        if rect.any():
            overlap = overlap.copy()
            overlap[rect] = cone_rectangle_solid_angle(fov[rect] / 2, self.half_width[rect], self.half_height[rect])
        return np.minimum(overlap / omega_g, 1.0), omega_g
