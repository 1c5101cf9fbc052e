"""Modal dialogs, one per file; each returns its answer through ``dismiss``."""
