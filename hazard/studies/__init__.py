"""Studies of one product by re-assessment: hazard distances, measurement uncertainty, remedies."""
