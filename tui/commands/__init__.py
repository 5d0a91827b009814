"""One module per `ladle` subcommand: HELP, add_arguments(parser), run(args) -> int."""
