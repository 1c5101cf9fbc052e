"""The modular-graph engine: pure computation, no I/O, no UI."""
