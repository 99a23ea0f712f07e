"""Margins as the text and the PDF print them (hazard.output.formatting)."""


def test_margins_name_the_boundary_below_and_above(tmp_path):
    # method §3 "margins": a grow light 1.8× over its RG1 limit reads so, not only as a small share of RG2
    from hazard.output.formatting import format_margin

    assert format_margin("RG2", {"Exempt": 180.0, "RG1": 1.8, "RG2": 0.0045}) == "1.8× RG1 limit; 0.45 % of RG2 limit"
    assert "e+" not in format_margin("Exempt", {"Exempt": 0.99996, "RG1": 0.3, "RG2": 0.01})
