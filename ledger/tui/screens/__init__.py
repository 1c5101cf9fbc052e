"""Full screens, one per file: overview, entry, compute, plot, diff, export, conventions, help."""
