"""One reader per file format; each returns ``(Spectrum, metadata)``.

:func:`read_spectrum` picks the reader from the file name and hands the raw numbers to
:func:`hazard.spectrum.validate_spectrum`.
"""

from __future__ import annotations

from hazard.readers.delimited import read_delimited

__all__ = ["read_spectrum"]


def read_spectrum(path: str, *, display_path: str, quantity: str, factor_to_si: float,
                  column: str | int | None = None):
    """Read and validate one spectrum file.

    Parameters
    ----------
    path : str
        File to open.
    display_path : str
        How to name the file in messages and provenance.
    quantity : str
        ``"irradiance"``, ``"radiance"`` or ``"relative"``.
    factor_to_si : float
        Multiplier from the record's unit to SI [1].
    column : str or int, optional
        Which value column to use when the file has several (header name or 1-based index of the value
        columns).

    Returns
    -------
    tuple of (Spectrum, dict)
    """
    return read_delimited(path, display_path=display_path, quantity=quantity, factor_to_si=factor_to_si,
                          column=column)
