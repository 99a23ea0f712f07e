"""From records and spectra to results.

The pipeline, claims, cautions, checks of saved results, many products at once and batch runs.
"""
