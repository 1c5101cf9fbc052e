"""The terminal application: ``alpha-ledger [PROJECT]``.

Entry points: :func:`ledger.tui.app.create_app` (used by the tests) and
:func:`ledger.tui.app.run_app` (used by the command line).  Screens, dialogs
and widgets live one per file in ``screens/``, ``dialogs/`` and ``widgets/``;
styles in ``*.tcss`` beside this file.  The non-UI helpers
(:mod:`ledger.tui.display`, :mod:`ledger.tui.engine`) never import textual.
"""
