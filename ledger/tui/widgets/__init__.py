"""Widgets, one per file, grouped by the screen area that uses them."""
