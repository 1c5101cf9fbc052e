r"""A complete LaTeX document with a booktabs (longtable) table of a project's entries.

It compiles as is with pdflatex and the packages of a basic TeX installation
(geometry, amsmath, booktabs, longtable, array).  Every piece of free text
(title, description, background names, notes, sources) is escaped, and
non-ASCII characters are written as LaTeX commands so the file is pure ASCII.

>>> print(escape_latex("50% of R^4 & {x_1} ~ \\ #"))
50\% of R\^{}4 \& \{x\_1\} \~{} $\backslash$ \#
>>> print(escape_latex("Øresund δ-function, café"))
\O{}resund $\delta$-function, caf\'{e}
"""

from __future__ import annotations

import unicodedata

from ledger.book.conventions import convention_key
from ledger.export.rows import Row, laurent_line
from ledger.expr import to_latex

# Only commands of the default OT1 text and CM math fonts (the TS1 symbols such as
# \textasciitilde would make pdflatex generate bitmap fonts with METAFONT).
_SPECIAL = {"\\": r"$\backslash$", "{": r"\{", "}": r"\}", "$": r"$\$$", "&": r"\&", "#": r"\#",
            "_": r"\_", "%": r"\%", "~": r"\~{}", "^": r"\^{}", "<": r"$<$", ">": r"$>$",
            "|": r"$|$"}
_GREEK = ("alpha beta gamma delta epsilon zeta eta theta iota kappa lambda mu nu xi omicron pi rho "
          "varsigma sigma tau upsilon phi chi psi omega").split()
_LETTERS = {chr(0x3B1 + i): f"${'o' if name == 'omicron' else chr(92) + name}$"
            for i, name in enumerate(_GREEK)}
_LETTERS.update({c: f"$\\{name}$" for c, name in zip("ΓΔΘΛΞΠΣΦΨΩ", (
    "Gamma Delta Theta Lambda Xi Pi Sigma Phi Psi Omega").split())})
_LETTERS.update({
    "ß": r"\ss{}", "æ": r"\ae{}", "Æ": r"\AE{}", "ø": r"\o{}", "Ø": r"\O{}", "œ": r"\oe{}",
    "Œ": r"\OE{}", "ł": r"\l{}", "Ł": r"\L{}", "ı": r"\i{}", "–": "--", "—": "---", "‘": "`",
    "’": "'", "“": "``", "”": "''", "…": r"\ldots{}", "×": r"$\times$", "±": r"$\pm$",
    "≤": r"$\leq$", "≥": r"$\geq$", "≠": r"$\neq$", "≈": r"$\approx$", "∞": r"$\infty$",
    "∂": r"$\partial$", "→": r"$\to$", "·": r"$\cdot$", "′": "'", "\u00a0": "~", "°": r"$^\circ$",
    "ζ": r"$\zeta$", "−": "-", "²": r"$^2$", "³": r"$^3$", "¹": r"$^1$",
})
_ACCENTS = {"\u0301": "'", "\u0300": "`", "\u0302": "^", "\u0308": '"', "\u0303": "~",
            "\u0327": "c", "\u030c": "v", "\u0306": "u", "\u0304": "=", "\u030b": "H", "\u030a": "r",
            "\u0307": "."}


def escape_latex(text: str) -> str:
    """Plain text as LaTeX text: specials escaped, non-ASCII as commands ('?' if unknown)."""
    out = []
    for char in str(text):
        if char in _SPECIAL:
            out.append(_SPECIAL[char])
        elif char in ("\n", "\t", "\r"):
            out.append(" ")
        elif ord(char) < 128:
            out.append(char)
        elif char in _LETTERS:
            out.append(_LETTERS[char])
        else:
            out.append(_accented(char))
    return "".join(out)


def _accented(char: str) -> str:
    base, *marks = unicodedata.normalize("NFD", char)
    if ord(base) >= 128 or not marks or any(m not in _ACCENTS for m in marks):
        return "?"
    result = {"i": r"\i", "j": r"\j"}.get(base, base)
    for mark in marks:
        result = f"\\{_ACCENTS[mark]}{{{result}}}"
    return result


def _operator_cell(entry) -> str:
    weight = entry.weight
    operator = "R^4" if weight == 0 else f"D^{{{2 * weight}}}R^4"
    p, q = entry.exponents
    sigma = " ".join(f"\\sigma_{k}" + (f"^{{{n}}}" if n > 1 else "") for k, n in ((2, p), (3, q)) if n)
    return f"${operator}$" + (f", ${sigma}$" if sigma else "")


def _number_cell(value) -> str:
    if value is None:
        return "---"
    if isinstance(value, str):
        return f"${value}\\ldots$" if "e" not in value else f"${_scientific(value)}$"
    return f"${to_latex(value)}$"


def _scientific(text: str) -> str:
    mantissa, _, exponent = text.partition("e")
    return f"{mantissa}\\ldots\\times 10^{{{int(exponent)}}}"


def _laurent_cell(row: Row, variable: str) -> str:
    if row.laurent is None:
        return "---"
    symbol = "y" if variable == "pi*tau2" else r"\tau_2"
    line = laurent_line(
        [(k, c if not isinstance(c, str) else _number_cell(c).strip("$")) for k, c in row.laurent],
        symbol, to_latex, r"\,", lambda k: f"^{{{k}}}")
    return f"${line}$"


def _integral_cell(row: Row) -> str:
    text = _number_cell(row.integral)
    if row.log_coefficient is not None:
        text += f"; $\\log L$: {_number_cell(row.log_coefficient)}"
    return text


HEADER = (r"Operator & Genus & $\alpha'$ order & Coefficient & Laurent polynomial & "
          r"Integrated value & Source \\")


def render_latex(project, rows: list[Row]) -> str:
    """The whole document as text (ASCII)."""
    conventions = project.conventions
    variable = conventions["laurent_variable"]
    lines = [
        r"\documentclass[10pt]{article}",
        r"\usepackage[landscape,margin=1.5cm]{geometry}",
        r"\usepackage{amsmath,amssymb,booktabs,longtable,array}",
        r"\begin{document}",
        r"\section*{" + escape_latex(project.title) + "}",
    ]
    if project.description:
        lines.append(escape_latex(project.description) + r"\par\medskip")
    lines.append(r"\noindent Conventions of this table:\begin{itemize}")
    for name, value in conventions.items():
        meaning = convention_key(name).values.get(value) or convention_key(name).free_form
        lines.append(rf"\item {escape_latex(name)} = \texttt{{{escape_latex(value)}}}: {escape_latex(meaning)}")
    lines += [
        r"\end{itemize}",
        r"Each coefficient multiplies $\sigma_2^p\sigma_3^q/(p!\,q!)$ in the expansion of the "
        r"amplitude; Laurent polynomials are in $" + ("y=\\pi\\tau_2" if variable == "pi*tau2" else "\\tau_2")
        + r"$; integrals are renormalised (cut off at $\tau_2=L$); --- means not computed; "
        r"decimals are shown to at most 12 digits. The source column says whether an entry was "
        r"computed here or cited from a paper.",
        r"\begin{center}\small",
        r"\begin{longtable}{@{}l c c >{\raggedright\arraybackslash}p{5.2cm} "
        r">{\raggedright\arraybackslash}p{5.2cm} >{\raggedright\arraybackslash}p{3.6cm} "
        r">{\raggedright\arraybackslash}p{3.6cm}@{}}",
        r"\toprule", HEADER, r"\midrule", r"\endhead", r"\bottomrule", r"\endfoot",
    ]
    for index, row in enumerate(rows):
        entry = row.entry
        if index == 0 or entry.background != rows[index - 1].entry.background:
            record = project.background(entry.background)
            name = record.name if record is not None else entry.background
            if index:
                lines.append(r"\midrule")
            lines.append(r"\multicolumn{7}{@{}l}{\textit{" + escape_latex(name) + r"}} \\")
        cells = [_operator_cell(entry), str(entry.genus), str(entry.alpha_order),
                 f"${to_latex(row.coefficient)}$", _laurent_cell(row, variable), _integral_cell(row),
                 escape_latex(f"{entry.id}: {row.source}")]
        lines.append(" & ".join(cells) + r" \\")
    lines.append(r"\end{longtable}")
    lines.append(r"\end{center}")
    notes = [row for row in rows if row.entry.notes]
    if notes:
        lines.append(r"\paragraph{Notes}\begin{itemize}")
        lines += [rf"\item {escape_latex(r.entry.id)}: {escape_latex(r.entry.notes)}" for r in notes]
        lines.append(r"\end{itemize}")
    lines.append(r"\end{document}")
    return "\n".join(lines) + "\n"

