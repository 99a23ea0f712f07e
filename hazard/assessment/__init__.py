"""From records and spectra to results: the pipeline, claims, cautions, checks of saved results, many products
at once and batch runs."""
