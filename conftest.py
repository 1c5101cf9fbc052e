"""Repository-level pytest configuration."""

collect_ignore = ["ledger/__main__.py"]
