"""PDF rendering of assessment results. Reads results; never computes a hazard quantity."""
