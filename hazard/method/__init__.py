"""The method on arrays: quadrature, integrals, geometry, photometry, groups, t_max and the searches."""
