"""The command line: ``alpha-ledger [PROJECT]`` opens the UI, subcommands compute.

Each subcommand lives in ``ledger/commands/<name>_cmd.py`` with ``register``
and ``run``; this module only builds the parser, dispatches and turns bad
input into one line on stderr with exit code 2.

>>> main(["eval", "C(1,1"])  # doctest: +SKIP
alpha-ledger: error: column 6: expected ',' or ')' but the expression ended
2
"""

from __future__ import annotations

import argparse
import importlib
import os
import sys

from ledger import __version__
from ledger.errors import LedgerError, NotAvailableError

COMMANDS = (
    "new", "add", "show", "check", "eval", "laurent", "identify", "integrate",
    "expand", "conventions", "diff", "export",
)

EXIT_OK, EXIT_DIFFERENT, EXIT_BAD_INPUT = 0, 1, 2


class _OneLineParser(argparse.ArgumentParser):
    """argparse, but usage errors are one line and exit code 2."""

    def error(self, message):  # noqa: D102 - argparse hook
        raise LedgerError(f"{self.prog}: {message}")


def _placeholder(name: str):
    def register(subparsers):
        parser = subparsers.add_parser(name, help=f"{name} (not available yet)")
        parser.add_argument("arguments", nargs="*")
        parser.add_argument("--json", action="store_true")

        def run(args):
            raise NotAvailableError(f"'{name}' is not available yet in this build")

        parser.set_defaults(run=run)
    return register


def build_parser() -> argparse.ArgumentParser:
    parser = _OneLineParser(
        prog="alpha-ledger",
        description="Keep, compute and compare alpha' expansion coefficients of string amplitudes. "
                    "Without a subcommand, opens the terminal UI on PROJECT (or a scratch project).",
    )
    parser.add_argument("--version", action="version", version=f"alpha-ledger {__version__}")
    subparsers = parser.add_subparsers(title="subcommands", metavar="COMMAND",
                                       parser_class=_OneLineParser)
    for name in COMMANDS:
        try:
            module = importlib.import_module(f"ledger.commands.{name}_cmd")
            register = module.register
        except ModuleNotFoundError as missing:
            if missing.name != f"ledger.commands.{name}_cmd":
                raise
            register = _placeholder(name)
        register(subparsers)
    return parser


def _open_ui(argv: list[str]) -> int:
    if len(argv) > 1:
        raise LedgerError("usage: alpha-ledger [PROJECT] or alpha-ledger COMMAND ... (see --help)")
    from ledger.tui.app import run_app

    return run_app(argv[0] if argv else None)


def main(argv: list[str] | None = None) -> int:
    argv = list(sys.argv[1:] if argv is None else argv)
    try:
        if not argv or (argv[0] not in COMMANDS and not argv[0].startswith("-")):
            return _open_ui(argv)
        args = build_parser().parse_args(argv)
        return int(args.run(args) or 0)
    except LedgerError as error:
        _fail(str(error))
        return EXIT_BAD_INPUT
    except KeyboardInterrupt:
        _fail("interrupted")
        return 130
    except BrokenPipeError:  # the reader (e.g. head) went away: not an error of ours
        os.dup2(os.open(os.devnull, os.O_WRONLY), sys.stdout.fileno())
        return EXIT_OK
    except Exception as error:  # a bug: still one line unless debugging
        if os.environ.get("ALPHA_LEDGER_DEBUG"):
            raise
        _fail(f"unexpected failure ({type(error).__name__}: {error}); "
              "set ALPHA_LEDGER_DEBUG=1 for a traceback")
        return EXIT_BAD_INPUT


def _fail(message: str) -> None:
    one_line = " ".join(message.split())
    print(f"alpha-ledger: error: {one_line}", file=sys.stderr)


if __name__ == "__main__":
    raise SystemExit(main())
