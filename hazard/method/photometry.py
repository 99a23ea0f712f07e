"""Photometry and colour (method §6): illuminance, luminance, chromaticity and CCT.

Illuminance is E_v = K_m·∫E_λ V(λ) dλ with K_m = 683 lm·W⁻¹ (CIE 1924 V(λ), CIE S 010); it uses the same
quadrature as the hazard quantities. Chromaticity comes from the CIE 1931 2° colour-matching functions
(colour-science's copy of the CIE data, bundled as ``cie1931_2deg.csv``) on the spectrum's own grid, and CCT with
Duv from Robertson's (1968) isotherm method (:mod:`hazard.method.robertson`, the same numbers as colour-science's;
fast enough for batches of 10⁶ products). colour-science itself is not imported at run time: it would cost more
than the assessment; the tests check the bundled data and the method against it.
"""

from __future__ import annotations

import warnings

import numpy as np

from hazard.method.robertson import cct_duv_robertson, xyz_to_uv, xyz_to_xy
from hazard.method.weighting import quadrature_matrix
from hazard.weighting_tables import WeightingTable, load_colour_matching

__all__ = [
    "CCT_DUV_LIMIT",
    "K_M_LM_PER_W",
    "LUMINOUS_SHARE_FLOOR",
    "VISIBLE_BAND_NM",
    "cct_from_xyz",
    "cmf_quadrature",
    "import_colour",
]

K_M_LM_PER_W = 683.0
"""Maximum luminous efficacy for photopic vision (CIE S 010:2004) [lm W⁻¹]."""
VISIBLE_BAND_NM = (360.0, 830.0)
"""Band of V(λ) and of the CIE 1931 colour-matching functions [nm]."""
LUMINOUS_SHARE_FLOOR = 1e-6
"""Below this ratio of the V(λ)-weighted to the unweighted integral (200–3000 nm) the visible emission is a tail of
no meaning (an infrared LED's last nanometres under 780 nm): photometric values are flagged negligible and no colour is
computed [1]. Common practice, no published source."""
CCT_DUV_LIMIT = 0.05
"""Beyond this distance from the Planckian locus a CCT is not meaningful (CIE 15:2018, 9.5) [1]."""


_CCT_CHUNK = 16384  # rows per call: keeps the (rows × 30 isotherms) temporaries in cache
CCT_RANGE_K = (1670.0, 100000.0)
"""Range over which a CCT is reported: Robertson's isotherm table starts at 600 MK⁻¹ (1667 K) and clamps
chromaticities beyond it to that end [K]."""


def import_colour():
    """Import colour-science without its notices about optional plotting and SciPy features (for the tests)."""
    with warnings.catch_warnings():
        warnings.filterwarnings("ignore", message=".*related API features are not available.*")
        import colour
    return colour


def cmf_quadrature(grid_nm: np.ndarray) -> np.ndarray:
    """Quadrature matrix (grid, 3) giving CIE 1931 X, Y, Z of a spectrum on ``grid_nm`` [nm].

    The colour-matching functions are interpolated linearly (CIE 15 recommends linear interpolation of
    1 nm data) and are zero outside 360–830 nm.
    """
    return quadrature_matrix(grid_nm, [(VISIBLE_BAND_NM, table) for table in _cmf_tables()])


def _cmf_tables() -> tuple[WeightingTable, ...]:
    """x̄, ȳ, z̄ of the CIE 1931 2° observer (colour-science's CIE data, bundled) as linear weighting tables."""
    return load_colour_matching()


def cct_from_xyz(xyz: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Chromaticity, CCT and Duv from tristimulus values (rows of X, Y, Z).

    Parameters
    ----------
    xyz : numpy.ndarray
        Shape (n, 3) [any common scale].

    Returns
    -------
    x, y, cct_k, duv : numpy.ndarray
        CIE 1931 chromaticity [1], CCT [K] and Duv [1]; NaN where Y ≤ 0. CCT is NaN where
        |Duv| > :data:`CCT_DUV_LIMIT` or outside :data:`CCT_RANGE_K`.
    """
    xyz = np.atleast_2d(np.asarray(xyz, dtype=float))
    total = xyz.sum(axis=1)
    ok = (xyz[:, 1] > 0) & (total > 0)
    safe = np.where(ok[:, None], xyz, [[0.95, 1.0, 1.09]])
    xy = xyz_to_xy(safe)
    uv = xyz_to_uv(xy)
    cct, duv = np.empty(len(uv)), np.empty(len(uv))
    for k in range(0, len(uv), _CCT_CHUNK):
        cct[k : k + _CCT_CHUNK], duv[k : k + _CCT_CHUNK] = cct_duv_robertson(uv[k : k + _CCT_CHUNK])
    nan = np.full(len(xyz), np.nan)
    in_range = (cct > CCT_RANGE_K[0]) & (cct < CCT_RANGE_K[1])
    cct = np.where(ok & (np.abs(duv) <= CCT_DUV_LIMIT) & in_range, cct, nan)
    return (np.where(ok, xy[:, 0], nan), np.where(ok, xy[:, 1], nan), cct, np.where(ok, duv, nan))
