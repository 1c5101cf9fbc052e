"""The project model: backgrounds and entries, validated from and written to plain dicts.

Every record keeps the fields it does not know in ``extra`` so that a file
written by a newer tool loses nothing when saved by this one.  Validation
errors name the entry id and the field.

>>> entry = Entry.from_dict({"id": "e1", "background": "flat-iib", "genus": 1,
...     "operator": "D^4R^4", "structure": "sigma2", "alpha_order": 5,
...     "coefficient": "E(2)", "status": "unverified",
...     "provenance": {"kind": "computed", "engine": "0.1.0"}})
>>> entry.to_dict()["coefficient"]
'E(2)'
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field

from ledger.amplitudes.operators import Structure, format_structure, parse_operator, parse_structure
from ledger.errors import LedgerError, ProjectError

STATUSES = ("verified", "unverified", "conflict")
PROVENANCE_KINDS = ("computed", "reference")
_ARXIV = re.compile(r"^(\d{4}\.\d{4,5}|[a-z\-]+(\.[A-Z]{2})?/\d{7})(v\d+)?$")
def operator_weight(label: str) -> int:
    """The weight w of an operator label D^{2w}R^4 (R^4 has w = 0).

    >>> operator_weight("D^8R^4"), operator_weight("R^4")
    (4, 0)
    """
    return parse_operator(label).weight


def structure_exponents(label: str) -> tuple[int, int]:
    """(p, q) of a sigma structure label such as 'sigma2^2 sigma3' ('1' for R^4).

    >>> structure_exponents("sigma2 sigma3"), structure_exponents("1")
    ((1, 1), (0, 0))
    """
    structure = parse_structure(label)
    return structure.p, structure.q


def structure_label(p: int, q: int) -> str:
    """The canonical label of sigma2^p sigma3^q.

    >>> structure_label(2, 0), structure_label(1, 1), structure_label(0, 0)
    ('sigma2^2', 'sigma2 sigma3', '1')
    """
    return format_structure(Structure(p, q))


def _take(data: dict, key: str, kind, where: str, required: bool = True, default=None):
    if key not in data:
        if required:
            raise ProjectError(f"{where}: missing field '{key}'")
        return default
    value = data[key]
    if kind is int and isinstance(value, bool):
        raise ProjectError(f"{where}: field '{key}' must be an integer, got {value!r}")
    if not isinstance(value, kind):
        expected = {str: "text", int: "an integer", dict: "a table", list: "an array"}.get(kind, str(kind))
        raise ProjectError(f"{where}: field '{key}' must be {expected}, got {value!r}")
    return value


@dataclass
class Background:
    id: str
    name: str
    theory: str
    dimension: int
    compactification: str
    extra: dict = field(default_factory=dict)

    KNOWN = ("id", "name", "theory", "dimension", "compactification")

    @classmethod
    def from_dict(cls, data) -> "Background":
        if not isinstance(data, dict):
            raise ProjectError("backgrounds: each background must be a table")
        ident = _take(data, "id", str, "background")
        where = f"background {ident!r}"
        if not ident.strip():
            raise ProjectError("background: field 'id' must not be empty")
        return cls(
            id=ident,
            name=_take(data, "name", str, where),
            theory=_take(data, "theory", str, where),
            dimension=_take(data, "dimension", int, where),
            compactification=_take(data, "compactification", str, where),
            extra={k: v for k, v in data.items() if k not in cls.KNOWN},
        )

    def to_dict(self) -> dict:
        return {"id": self.id, "name": self.name, "theory": self.theory,
                "dimension": self.dimension, "compactification": self.compactification,
                **self.extra}


@dataclass
class Provenance:
    kind: str = "computed"
    engine: str = ""
    arxiv: str = ""
    equation: str = ""
    extra: dict = field(default_factory=dict)

    KNOWN = ("kind", "engine", "arxiv", "equation")

    @classmethod
    def from_dict(cls, data, where: str) -> "Provenance":
        if not isinstance(data, dict):
            raise ProjectError(f"{where}: field 'provenance' must be a table")
        kind = _take(data, "kind", str, f"{where} provenance")
        arxiv = _take(data, "arxiv", str, f"{where} provenance", required=False, default="")
        equation = _take(data, "equation", str, f"{where} provenance", required=False, default="")
        provenance = cls(kind=kind,
                         engine=_take(data, "engine", str, f"{where} provenance",
                                      required=False, default=""),
                         arxiv=arxiv, equation=equation,
                         extra={k: v for k, v in data.items() if k not in cls.KNOWN})
        provenance.validate(where)
        return provenance

    def validate(self, where: str) -> None:
        if self.kind not in PROVENANCE_KINDS:
            raise ProjectError(f"{where}: provenance kind must be 'computed' or 'reference', "
                               f"got {self.kind!r}")
        if self.kind == "reference" and not _ARXIV.match(self.arxiv):
            raise ProjectError(f"{where}: a reference needs an arXiv id like 1502.06698 "
                               f"in provenance.arxiv, got {self.arxiv!r}")

    def to_dict(self) -> dict:
        result = {"kind": self.kind}
        for name in ("engine", "arxiv", "equation"):
            if getattr(self, name):
                result[name] = getattr(self, name)
        return {**result, **self.extra}

    def describe(self) -> str:
        """A one-line, human description ('computed (engine 0.1.0)', 'arXiv:... eq. ...')."""
        if self.kind == "reference":
            eq = f" eq. {self.equation}" if self.equation else ""
            return f"cited arXiv:{self.arxiv}{eq}"
        return f"computed (engine {self.engine})" if self.engine else "computed"


@dataclass
class Entry:
    id: str
    background: str
    genus: int
    operator: str
    structure: str
    alpha_order: int
    coefficient: str
    status: str = "unverified"
    notes: str = ""
    provenance: Provenance = field(default_factory=Provenance)
    derived: dict = field(default_factory=dict)
    history: list = field(default_factory=list)
    extra: dict = field(default_factory=dict)

    KNOWN = ("id", "background", "genus", "operator", "structure", "alpha_order", "coefficient",
             "status", "notes", "provenance", "derived", "history")

    @classmethod
    def from_dict(cls, data) -> "Entry":
        if not isinstance(data, dict):
            raise ProjectError("entries: each entry must be a table")
        ident = _take(data, "id", str, "entry")
        if not ident.strip():
            raise ProjectError("entry: field 'id' must not be empty")
        where = f"entry {ident!r}"
        entry = cls(
            id=ident,
            background=_take(data, "background", str, where),
            genus=_take(data, "genus", int, where),
            operator=_take(data, "operator", str, where),
            structure=_take(data, "structure", str, where),
            alpha_order=_take(data, "alpha_order", int, where),
            coefficient=_take(data, "coefficient", str, where),
            status=_take(data, "status", str, where, required=False, default="unverified"),
            notes=_take(data, "notes", str, where, required=False, default=""),
            provenance=Provenance.from_dict(_take(data, "provenance", dict, where), where),
            derived=_take(data, "derived", dict, where, required=False, default={}),
            history=_take(data, "history", list, where, required=False, default=[]),
            extra={k: v for k, v in data.items() if k not in cls.KNOWN},
        )
        entry.validate()
        return entry

    def validate(self) -> None:
        where = f"entry {self.id!r}"
        if self.genus < 0:
            raise ProjectError(f"{where}: field 'genus' must be >= 0, got {self.genus}")
        if self.status not in STATUSES:
            raise ProjectError(f"{where}: field 'status' must be one of {', '.join(STATUSES)}, "
                               f"got {self.status!r}")
        try:
            weight = operator_weight(self.operator)
            p, q = structure_exponents(self.structure)
        except LedgerError as error:
            raise ProjectError(f"{where}: {error}") from None
        if 2 * p + 3 * q != weight:
            raise ProjectError(f"{where}: field 'structure' {self.structure!r} has weight {2 * p + 3 * q} "
                               f"but operator {self.operator} has weight {weight}")
        if self.alpha_order != 3 + weight:
            raise ProjectError(f"{where}: field 'alpha_order' must be {3 + weight} for {self.operator}, "
                               f"got {self.alpha_order}")
        from ledger.expr import parse

        try:
            parse(self.coefficient)
        except LedgerError as error:
            raise ProjectError(f"{where}: field 'coefficient' {self.coefficient!r}: {error}") from None
        self.provenance.validate(where)
        for item in self.history:
            if not isinstance(item, dict):
                raise ProjectError(f"{where}: field 'history' must be an array of tables")

    @property
    def weight(self) -> int:
        return operator_weight(self.operator)

    @property
    def exponents(self) -> tuple[int, int]:
        return structure_exponents(self.structure)

    def key(self) -> tuple:
        """What identifies the physics of an entry across projects."""
        return (self.background, self.genus, self.operator, self.exponents)

    def to_dict(self) -> dict:
        result = {
            "id": self.id, "background": self.background, "genus": self.genus,
            "operator": self.operator, "structure": self.structure,
            "alpha_order": self.alpha_order, "coefficient": self.coefficient,
            "status": self.status,
        }
        if self.notes:
            result["notes"] = self.notes
        result["provenance"] = self.provenance.to_dict()
        if self.derived:
            result["derived"] = self.derived
        if self.history:
            result["history"] = self.history
        return {**result, **self.extra}
