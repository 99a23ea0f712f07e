"""Invented demo line-up of Corvel Lightworks (a made-up company): records and spectra for `hazard demo`."""
