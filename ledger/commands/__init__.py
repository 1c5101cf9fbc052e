"""One module per subcommand: ``register(subparsers)`` adds its parser, ``run(args)`` executes."""
