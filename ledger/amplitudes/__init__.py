"""Physics on top of the engine: expansions, operators, backgrounds."""
