"""Source geometry at a distance (method §4): angular subtense, solid angles, distance rules.

All lengths here are metres, angles radians, solid angles steradians. Functions accept numpy arrays so the
batch path evaluates many products at once.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

__all__ = ["SourceShape", "cone_solid_angle_sr", "inverse_square_factor", "GLS_ILLUMINANCE_LX",
           "MIN_ASSESSMENT_DISTANCE_M", "FIVE_TIMES_RULE"]

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
    >>> f"{float(cone_solid_angle_sr(0.011)):.4e}"
    '9.5033e-05'
    """
    return 2 * np.pi * (1 - np.cos(np.asarray(full_angle_rad, dtype=float) / 2))


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
        >>> s.alpha_rad(0.2).round(4).tolist(), s.alpha_rad(0.2, (0.011, 0.1)).round(4).tolist()
        ([0.01, 0.13], [0.011, 0.0555])
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

    def distance_for_solid_angle_m(self, solid_angle_sr: np.ndarray) -> np.ndarray:
        """Distance at which the source subtends ``solid_angle_sr`` [m] (inverse of :meth:`solid_angle_sr`).

        Bisection on a log scale (the solid angle falls monotonically with distance), to a relative
        precision far below 1e-12. A solid angle of 2π or more is never reached and gives 0.
        """
        omega = np.broadcast_to(np.asarray(solid_angle_sr, dtype=float), np.shape(self.width_m))
        lo = np.full(omega.shape, 1e-9)
        hi = np.full(omega.shape, 1e9)
        for _ in range(100):
            mid = np.sqrt(lo * hi)
            too_close = self.solid_angle_sr(mid) > omega
            lo, hi = np.where(too_close, mid, lo), np.where(too_close, hi, mid)
        return np.where(omega >= 2 * np.pi, 0.0, np.sqrt(lo * hi))
