"""Correlated colour temperature by Robertson's (1968) isotemperature lines, and the chromaticities it starts from.

The published method (A. R. Robertson, J. Opt. Soc. Am. 58, 1528-1535, 1968; the table as in Wyszecki & Stiles,
Color Science, 2nd ed., Table 1(3.11), with B. Lindbloom's correction of u at 325 MK⁻¹): find the two isotemperature
lines the chromaticity (u, v) lies between and interpolate the reciprocal temperature by its distances to them. The
arithmetic follows colour-science's ``uv_to_CCT_Robertson1968`` step for step, with its safe division (0 where a
quotient is not finite), so both give the same numbers to the last bit (``tests/test_photometry.py`` checks this on
random chromaticities); importing colour-science only for this would cost more than the whole assessment.
"""

from __future__ import annotations

import numpy as np

__all__ = ["ISOTEMPERATURE_LINES", "cct_duv_robertson", "xyz_to_uv", "xyz_to_xy"]

ISOTEMPERATURE_LINES = np.array(
    [
        # reciprocal temperature [MK⁻¹], u, v (CIE 1960 UCS), slope of the isotemperature line
        (0, 0.18006, 0.26352, -0.24341),
        (10, 0.18066, 0.26589, -0.25479),
        (20, 0.18133, 0.26846, -0.26876),
        (30, 0.18208, 0.27119, -0.28539),
        (40, 0.18293, 0.27407, -0.30470),
        (50, 0.18388, 0.27709, -0.32675),
        (60, 0.18494, 0.28021, -0.35156),
        (70, 0.18611, 0.28342, -0.37915),
        (80, 0.18740, 0.28668, -0.40955),
        (90, 0.18880, 0.28997, -0.44278),
        (100, 0.19032, 0.29326, -0.47888),
        (125, 0.19462, 0.30141, -0.58204),
        (150, 0.19962, 0.30921, -0.70471),
        (175, 0.20525, 0.31647, -0.84901),
        (200, 0.21142, 0.32312, -1.0182),
        (225, 0.21807, 0.32909, -1.2168),
        (250, 0.22511, 0.33439, -1.4512),
        (275, 0.23247, 0.33904, -1.7298),
        (300, 0.24010, 0.34308, -2.0637),
        (325, 0.24792, 0.34655, -2.4681),  # u 0.24702 in the 1968 table, corrected by Lindbloom
        (350, 0.25591, 0.34951, -2.9641),
        (375, 0.26400, 0.35200, -3.5814),
        (400, 0.27218, 0.35407, -4.3633),
        (425, 0.28039, 0.35577, -5.3762),
        (450, 0.28863, 0.35714, -6.7262),
        (475, 0.29685, 0.35823, -8.5955),
        (500, 0.30505, 0.35907, -11.324),
        (525, 0.31320, 0.35968, -15.628),
        (550, 0.32129, 0.36011, -23.325),
        (575, 0.32931, 0.36038, -40.770),
        (600, 0.33724, 0.36051, -116.45),
    ],
    dtype=float,
)
"""Robertson's 31 isotemperature lines: reciprocal megakelvin, u, v, slope."""


def _safe_divide(a: np.ndarray | float, b: np.ndarray) -> np.ndarray:
    """The quotient a / b, with 0 where it is NaN or infinite."""
    with np.errstate(divide="ignore", invalid="ignore"):
        return np.nan_to_num(a / b, nan=0, posinf=0, neginf=0)


def xyz_to_xy(xyz: np.ndarray) -> np.ndarray:
    """CIE 1931 chromaticity (x, y) of tristimulus rows (n, 3) [1]; 0 where X + Y + Z is 0."""
    xyz = np.asarray(xyz, dtype=float)
    total = xyz[..., 0] + xyz[..., 1] + xyz[..., 2]
    return np.stack([_safe_divide(xyz[..., 0], total), _safe_divide(xyz[..., 1], total)], axis=-1)


def xyz_to_uv(xy: np.ndarray) -> np.ndarray:
    """CIE 1960 UCS (u, v) of chromaticities (x, y): u = 4x/(12y − 2x + 3), v = 6y/(12y − 2x + 3) [1]."""
    x, y = xy[..., 0], xy[..., 1]
    d = 12 * y - 2 * x + 3
    return np.stack([_safe_divide(4 * x, d), _safe_divide(6 * y, d)], axis=-1)


def cct_duv_robertson(uv: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """CCT [K] and Duv [1] of CIE 1960 (u, v) chromaticities, shape (n, 2), by Robertson's method.

    Beyond the table's ends the first or last pair of lines is used (the result clamps towards 1667 K and infinity);
    Duv is positive above the Planckian locus.

    Examples
    --------
    >>> cct, duv = cct_duv_robertson(np.array([[0.193741375998230, 0.315221043940594]]))
    >>> round(float(cct[0]), 1), round(float(duv[0]), 6)
    (6500.0, 0.008333)
    """
    uv = np.asarray(uv, dtype=float).reshape(-1, 2)
    r_itl, u_itl, v_itl, t_itl = ISOTEMPERATURE_LINES.T
    length = np.hypot(1.0, t_itl)
    du_itl = 1.0 / length
    dv_itl = t_itl / length
    u, v = uv[:, 0][:, np.newaxis], uv[:, 1][:, np.newaxis]
    uu = u - u_itl[1:]
    vv = v - v_itl[1:]
    dt = -uu * dv_itl[1:] + vv * du_itl[1:]  # signed distance to each line
    mask = dt <= 0
    last = len(r_itl) - 1
    i = np.where(np.any(mask, axis=1), np.argmax(mask, axis=1) + 1, last)
    idx = np.arange(len(i))
    dt_current = -np.minimum(dt[idx, i - 1], 0.0)
    dt_previous = dt[idx, i - 2]
    f = np.where(i == 1, 0.0, np.where(i > 1, dt_current / (dt_previous + dt_current), 0.0))
    cct = _safe_divide(np.float64(1.0e6), r_itl[i - 1] * f + r_itl[i] * (1 - f))
    u_i = u_itl[i - 1] * f + u_itl[i] * (1 - f)
    v_i = v_itl[i - 1] * f + v_itl[i] * (1 - f)
    du_i = du_itl[i] * (1 - f) + du_itl[i - 1] * f
    dv_i = dv_itl[i] * (1 - f) + dv_itl[i - 1] * f
    length_i = np.hypot(du_i, dv_i)
    du_i /= length_i
    dv_i /= length_i
    duv = (u.ravel() - u_i) * du_i + (v.ravel() - v_i) * dv_i
    return cct, -duv
