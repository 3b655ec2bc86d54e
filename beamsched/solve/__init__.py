"""Generic solvers: strain compatibility for flexure; shear resistance."""
