"""The bundled colour-matching functions and the CCT method give colour-science's numbers to the last bit.

The tool does not import colour-science at run time (it would cost more than an assessment); these checks hold the
bundled copy of the CIE data and :mod:`hazard.method.robertson` to it.
"""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays

from hazard.method.photometry import cct_from_xyz
from hazard.method.robertson import cct_duv_robertson, xyz_to_uv, xyz_to_xy
from hazard.weighting_tables import load_colour_matching


def test_bundled_cmfs_are_colour_sciences(colour):
    # colour-science MSDS_CMFS "CIE 1931 2 Degree Standard Observer" (CIE data set)
    reference = colour.MSDS_CMFS["CIE 1931 2 Degree Standard Observer"]
    tables = load_colour_matching()
    assert np.array_equal(tables[0].wavelength_nm, reference.wavelengths)
    for k, table in enumerate(tables):
        assert np.array_equal(table.value, reference.values[:, k])


def _reference(colour, xyz):
    xy = colour.XYZ_to_xy(xyz)
    uv = colour.xy_to_UCS_uv(xy)
    with np.errstate(all="ignore"):
        cct_duv = np.atleast_2d(colour.temperature.uv_to_CCT(uv, method="Robertson 1968"))
    return xy, uv, cct_duv


@pytest.mark.parametrize("seed", range(3))
def test_robertson_matches_colour_science_on_random_chromaticities(colour, seed):
    # colour-science uv_to_CCT(method="Robertson 1968"), XYZ_to_xy and xy_to_UCS_uv: equal to the last bit
    rng = np.random.default_rng(seed)
    xyz = np.vstack([rng.uniform(0, 1, (20000, 3)) ** 3, rng.uniform(0.2, 1.2, (20000, 3))])
    xy, uv, cct_duv = _reference(colour, xyz)
    assert np.array_equal(xyz_to_xy(xyz), xy)
    assert np.array_equal(xyz_to_uv(xy), uv)
    cct, duv = cct_duv_robertson(uv)
    assert np.array_equal(cct, cct_duv[:, 0], equal_nan=True)
    assert np.array_equal(duv, cct_duv[:, 1], equal_nan=True)


@settings(max_examples=200, deadline=None)
@given(arrays(np.float64, (4, 3), elements=st.floats(0, 1e6, allow_subnormal=False)))
def test_robertson_matches_colour_science_anywhere(colour, xyz):
    # colour-science as above, including zeros (its safe division gives 0 there)
    xy, uv, cct_duv = _reference(colour, xyz)
    assert np.array_equal(xyz_to_xy(xyz), xy)
    assert np.array_equal(xyz_to_uv(xy), uv)
    with np.errstate(all="ignore"):
        cct, duv = cct_duv_robertson(uv)
    assert np.array_equal(cct, cct_duv[:, 0], equal_nan=True)
    assert np.array_equal(duv, cct_duv[:, 1], equal_nan=True)


def test_cct_of_illuminant_d65(colour):
    # CIE 015:2018 Table 5: D65 x = 0.31272, y = 0.32903; CCT about 6504 K (from memory), Duv about +0.0032
    xyz = colour.xy_to_XYZ(np.array([0.31272, 0.32903]))[None, :]
    x, y, cct, duv = cct_from_xyz(xyz)
    assert x[0] == pytest.approx(0.31272) and y[0] == pytest.approx(0.32903)
    assert cct[0] == pytest.approx(6504, abs=5)
    assert duv[0] == pytest.approx(0.0032, abs=3e-4)
