"""From what the user gives to validated records and spectra.

Readers, units, spectrum rules, records, manifests, file statements and the loading that joins them.
"""
