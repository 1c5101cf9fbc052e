"""Dihedral graphs C(a1..ar) of weight <= 6: seconds at 30 digits, true digits, and
time to 12 true digits against the plain lattice sum (peer.py).

True digits are measured against the engine's own 45-digit value, which the
tests check against published identities (C(1,1,1) = E3 + zeta(3), ...); the
peer's time is the time its extrapolated box sums need to agree to 12 digits
(it stalls near 13 digits in float64, so 15 digits are out of its reach).
Times are CPU seconds of this process (time.process_time), so that other jobs
on a shared machine do not inflate them; both sides are single-threaded.
"""

from __future__ import annotations

import time

import mpmath

from accuracy import true_digits

GRAPHS = [
    (1, 1, 1), (2, 1, 1), (1, 1, 1, 1), (3, 1, 1), (2, 2, 1), (2, 1, 1, 1), (1, 1, 1, 1, 1),
    (4, 1, 1), (3, 2, 1), (2, 2, 2), (3, 1, 1, 1), (2, 2, 1, 1), (2, 1, 1, 1, 1),
    (1, 1, 1, 1, 1, 1),
]
TAUS = {"i": mpmath.mpc(0, 1), "0.27+1.31i": mpmath.mpc("0.27", "1.31"),
        "rho+0.01i": mpmath.mpc(-0.5, 0.8760254037844386)}
PEER_GRAPHS = [(1, 1, 1), (2, 1, 1), (2, 2, 1), (1, 1, 1, 1), (1, 1, 1, 1, 1)]


def run(report) -> None:
    from peer import peer_dihedral

    from ledger.mgf.dihedral import dihedral_value

    for weights in GRAPHS:
        for label, tau in TAUS.items():
            start = time.process_time()
            value = dihedral_value(weights, tau, digits=30)
            seconds = time.process_time() - start
            reference = dihedral_value(weights, tau, digits=45)
            name = f"C{weights} at {label}, 30 digits"
            report(name, seconds, true_digits(value.value, reference.value),
                   note=f"claimed error {mpmath.nstr(value.error, 2)}")
    for weights in PEER_GRAPHS:
        tau = TAUS["0.27+1.31i"]
        reference = dihedral_value(weights, tau, digits=45).value
        start = time.process_time()
        value = dihedral_value(weights, tau, digits=12)
        engine_seconds = time.process_time() - start
        peer_value, _, peer_seconds = peer_dihedral(weights, complex(tau), target_digits=12)
        peer_digits = true_digits(mpmath.mpf(peer_value), reference)
        report(f"C{weights} at 0.27+1.31i, 12 digits (peer {peer_seconds:.1f} s)",
               engine_seconds, true_digits(value.value, reference), peer_seconds / engine_seconds,
               note=f"peer reached {peer_digits:.1f} true digits (its best if below 12); "
                    "15 digits: out of the peer's reach (float64)")


if __name__ == "__main__":
    import sys
    from pathlib import Path

    sys.path.insert(0, str(Path(__file__).resolve().parent))
    run(lambda name, seconds, digits, ratio_vs_peer=None, note="":
        print(f"{name:<48} {seconds:8.3f} s {digits if digits is None else round(digits, 1)!s:>6} "
              f"{'' if ratio_vs_peer is None else f'{ratio_vs_peer:.0f}x':>6}  {note}"))
