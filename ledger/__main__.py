"""Allow ``python -m ledger``."""

from ledger.cli import main

raise SystemExit(main())
