"""Impact solver: pure numpy, vectorised over drop points, SI units inside."""
