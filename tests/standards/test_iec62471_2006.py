"""The IEC 62471:2006 limit set: the limits of Table 6.1 follow from the exposure-limit formulas of §4.3."""

import pytest

from hazard.standards import IEC_62471_2006


# --- Table 6.1 limits reproduced from the exposure limits at the time bases ---------------------------
# Exposure-limit formulas of IEC 62471:2006 §4.3 (constants written here, independent of the registry).
def _el_e_s(t):  # 4.3.1: E_S·t ≤ 30 J/m2
    return 30 / t


def _el_e_uva(t):  # 4.3.2: E_UVA·t ≤ 10^4 J/m2 for t ≤ 1000 s, 10 W/m2 beyond
    return 1e4 / t if t <= 1000 else 10.0


def _el_l_b(t):  # 4.3.3: L_B·t ≤ 10^6 J/(m2 sr) for t ≤ 10^4 s, 100 W/(m2 sr) beyond
    return 1e6 / t if t <= 1e4 else 100.0


def _el_e_b(t):  # 4.3.4: E_B·t ≤ 100 J/m2 for t ≤ 100 s, 1 W/m2 beyond
    return 100 / t if t <= 100 else 1.0


def _el_l_r_alpha(t):  # 4.3.5: L_R ≤ 50000/(α t^0.25); returns the coefficient over α
    return 50000 / t**0.25


def _el_e_ir(t):  # 4.3.7: E_IR ≤ 18000 t^-0.75 for t ≤ 1000 s, 100 W/m2 beyond
    return 18000 * t**-0.75 if t <= 1000 else 100.0


@pytest.mark.parametrize(
    ("symbol", "formula"),
    [
        ("E_S", _el_e_s),
        ("E_UVA", _el_e_uva),
        ("L_B", _el_l_b),
        ("E_B", _el_e_b),
        ("L_R", _el_l_r_alpha),
        ("E_IR", _el_e_ir),
    ],
)
def test_table_6_1_limits_follow_from_exposure_limits(symbol, formula):
    # IEC 62471:2006 Table 6.1 prints the limits to two significant digits: 30/30000 s = 0.001 W/m2,
    # 50000·10^-0.25 ≈ 28000, 18000·100^-0.75 ≈ 570; the rounding is at most 1.5 % (10^4/300 = 33.3 → 33).
    hazard = IEC_62471_2006[symbol]
    for limit, t in zip(hazard.limits, hazard.time_bases_s, strict=True):
        assert limit == pytest.approx(formula(t), rel=0.015)


def test_table_6_1_named_values():
    # IEC 62471:2006 Table 6.1, as printed
    h = IEC_62471_2006
    assert h["E_S"].limits == (0.001, 0.003, 0.03)
    assert h["E_UVA"].limits == (10, 33, 100)
    assert h["L_B"].limits == (100, 10000, 4e6)
    assert h["E_B"].limits == (1.0, 1.0, 400)
    assert h["L_R"].limits == (28000, 28000, 71000)
    assert h["E_IR"].limits == (100, 570, 3200)
    assert 30 / 30000 == pytest.approx(0.001) and 50000 * 10**-0.25 == pytest.approx(28000, rel=0.005)
    assert 18000 * 100**-0.75 == pytest.approx(570, rel=0.002)
