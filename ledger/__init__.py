"""alpha-ledger: a ledger of alpha' expansion coefficients of closed-string amplitudes."""

__version__ = "0.2.0"
ENGINE_VERSION = __version__
