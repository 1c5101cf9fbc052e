r"""Exact maps between conventions, acting on coefficients, Laurent polynomials,
integrated values and numbers.

Physics (derivations; the engine's conventions are the reference, see
:mod:`ledger.book.conventions` for the scales c, lambda, m, g, f):

* Mandelstam.  A project with s_P = c s (s the engine's) writes the same
  amplitude as sum B^P_(p,q) sigma_2P^p sigma_3P^q/(p! q!); since
  sigma_kP = c^k sigma_k, the monomial of weight w = 2p + 3q picks up c^w, so
  B^P_(p,q) = c^-(2p+3q) B_(p,q).  The prefactor (R^4 and couplings) is held
  fixed; a paper that divides by the supergravity pole 3/sigma_3 differs in
  ``amplitude_factor`` as well.
* Amplitude factor.  B^P = f B for every structure, hence every stored number.
  Both together: B^P = f c^-w B, so from project S to project T the function
  multiplies by (f_T/f_S) (c_T/c_S)^-w (:func:`scale_factor`).
* Graph normalisation.  This changes how the same function is *written*, not
  the function: with tau2^a per edge a graph function of weight w is pi^w
  times the engine's (each edge's (tau2/pi)^a gains pi^a), so E_s -> pi^s E_s;
  the coprime-pair form of E_s is pi^s/(2 zeta(2s)) times the engine's, since
  sum'_(m,n) = sum_(k>=1) k^(-2s) sum_(coprime, both signs) gives
  sum' tau2^s/|m tau + n|^(2s) = 2 zeta(2s) E_s^coprime.  A coefficient is
  rewritten atom by atom, each atom by the factor of its own weight
  (:func:`rewrite_atoms`); zeta values and numbers are untouched.  The twisted
  sums Etw(s, alpha, beta), normalised like E_s, count as weight s.
* Green's function.  G_P = g G is an atom like the graph functions (Green
  atoms are rewritten by 1/g).  It does not rescale B_(p,q): the Koba-Nielsen
  exponent is fixed by physics (|z_ij|^(alpha' k_i.k_j) = exp(s_ij G_ij) with the
  engine's s and G ~ -log|z|^2), so a paper that writes exp(sum s_P G_P) has
  c g = 1, and B^P as a function of its own s_P is already covered by c.
* Laurent variable.  With x = lambda tau2, a_k x_S^k = a_k (lambda_S/lambda_T)^k
  x_T^k: from y = pi tau2 to tau2 the coefficient of the k-th power gains pi^k.
  The function, and so its integral, is unchanged.  A Laurent record that
  names its variable is read in that variable, whatever the project declares.
* Measure.  d mu_P = m d^2tau/tau2^2 multiplies the renormalised integral, its
  log L coefficient and its divergent L^k terms by m (the cut-off stays at
  tau2 = L in every project, so no log(pi) shift arises).

>>> from ledger.expr import parse, to_text
>>> ours = {"graph_normalisation": "tau2/pi", "mandelstam": "alpha'/4"}
>>> theirs = {"graph_normalisation": "tau2", "mandelstam": "alpha'/2"}
>>> to_text(convert_coefficient(parse("5/3*E(3) + 1/3*zeta(3)"), ours, theirs, 3))
'5/24*pi^(-3)*E(3) + 1/24*zeta(3)'
"""

from __future__ import annotations

import copy

import sympy

from ledger.book.conventions import (
    amplitude_scale, green_scale, laurent_variable_scale, mandelstam_scale, measure_scale,
    validate_conventions,
)
from ledger.book.quantities import (
    exact_text, looks_exact, parse_exact, record_digits, scale_number, working_context,
)
from ledger.errors import ConventionError, LedgerError
from ledger.expr import atoms

def graph_scale(normalisation: str, atom):
    """The factor k with atom (project normalisation) = k * atom (engine normalisation).

    >>> from ledger.expr import parse
    >>> graph_scale("tau2", parse("C(2,1,1)")), graph_scale("coprime/2", parse("E(2)"))
    (pi**4, 45/pi**2)
    """
    if isinstance(atom, (atoms.E, atoms.Etw)):
        weight = int(atom.args[0])
    else:
        weight = atoms.graph_of(atom).weight
    if normalisation == "tau2/pi":
        return sympy.Integer(1)
    if normalisation == "tau2":
        return sympy.pi**weight
    if normalisation == "coprime/2":
        if isinstance(atom, atoms.E):
            return sympy.pi**weight / (2 * sympy.zeta(2 * weight))
        return sympy.pi**weight
    raise ConventionError(f"unknown graph normalisation {normalisation!r}")


def atom_scale(conventions: dict, atom):
    """Factor of one atom in ``conventions`` relative to the engine (1 for theta-family atoms)."""
    if isinstance(atom, (atoms.E, atoms.C, atoms.GraphFunction, atoms.Etw)):
        return graph_scale(conventions["graph_normalisation"], atom)
    if isinstance(atom, atoms.Green):
        return green_scale(conventions["green_function"])
    return sympy.Integer(1)


_REWRITTEN = (atoms.E, atoms.C, atoms.GraphFunction, atoms.Etw, atoms.Green)


def rewrite_atoms(expr, source: dict, target: dict):
    """The same function of tau, written with the target's atoms instead of the source's.

    An atom A_S = k_S A and A_T = k_T A (A the engine's), so A_S = (k_S/k_T) A_T.

    >>> from ledger.expr import parse
    >>> rewrite_atoms(parse("E(2)"), {"graph_normalisation": "tau2/pi"},
    ...               {"graph_normalisation": "coprime/2"})
    pi**2*E(2)/45
    """
    source, target = _complete(source), _complete(target)
    found = expr.atoms(*_REWRITTEN) if isinstance(expr, sympy.Basic) else set()
    mapping = {a: atom_scale(source, a) / atom_scale(target, a) * a for a in found}
    mapping = {a: v for a, v in mapping.items() if v != a}
    return sympy.expand(expr.xreplace(mapping)) if mapping else expr


def scale_factor(source: dict, target: dict, weight: int):
    """(f_T/f_S) (c_T/c_S)^-w: how the function of a weight-w coefficient rescales.

    >>> scale_factor({"mandelstam": "alpha'/4"}, {"mandelstam": "alpha'/2"}, 3)
    1/8
    """
    source, target = _complete(source), _complete(target)
    amplitude = amplitude_scale(target["amplitude_factor"]) / amplitude_scale(source["amplitude_factor"])
    mandelstam = mandelstam_scale(target["mandelstam"]) / mandelstam_scale(source["mandelstam"])
    return amplitude * mandelstam ** (-weight)


def convert_coefficient(expr, source: dict, target: dict, weight: int):
    """A coefficient expression from one project's conventions to another's."""
    return sympy.expand(scale_factor(source, target, weight) * rewrite_atoms(expr, source, target))


def engine_form(expr, conventions: dict):
    """The project's coefficient function written in the engine's atoms (no rescaling).

    Evaluating this with the engine gives the project's own numbers.

    >>> from ledger.expr import parse
    >>> engine_form(parse("E(2)"), {"graph_normalisation": "tau2"})
    pi**2*E(2)
    """
    return rewrite_atoms(expr, conventions, {})


def _complete(conventions: dict) -> dict:
    return validate_conventions(conventions)


def _scale_text(text, factor, exact: bool, digits: int, what: str) -> str:
    """Multiply a stored constant: exactly if it is exact, else as a decimal."""
    if exact:
        return exact_text(sympy.expand(parse_exact(text, what) * factor))
    ctx = working_context(digits)
    value, _ = scale_number(text, "0", digits, factor, ctx)
    return value


def convert_laurent(laurent: dict, source: dict, target: dict, factor=1) -> dict:
    """A Laurent record {"variable", "terms": [{"power", "coefficient"}], "exact", "digits", ...}
    in the target's variable, every term multiplied by ``factor``."""
    if not isinstance(laurent, dict) or not isinstance(laurent.get("terms"), list):
        raise LedgerError("laurent: expected a table with a list of terms")
    target = _complete(target)
    source_variable = variable_of(laurent, source)
    ratio = laurent_variable_scale(source_variable) / laurent_variable_scale(target["laurent_variable"])
    exact = bool(laurent.get("exact", False))
    digits = record_digits(laurent)
    terms = []
    for term in laurent["terms"]:
        power = _integer(term.get("power"), "laurent: power")
        coefficient = _scale_text(term.get("coefficient"), factor * ratio**power,
                                  exact or looks_exact(term.get("coefficient")), digits,
                                  "laurent: coefficient")
        terms.append({**term, "power": power, "coefficient": coefficient})
    return {**laurent, "variable": target["laurent_variable"], "terms": terms}


_VARIABLE_SPELLINGS = {"y": "pi*tau2", "y=pi*tau2": "pi*tau2", "pi*tau2": "pi*tau2",
                       "tau2": "tau2", "tau_2": "tau2"}


def variable_of(laurent: dict, conventions: dict) -> str:
    """The Laurent variable a record is written in (its own field, else the project's)."""
    stated = laurent.get("variable")
    if stated is None:
        return _complete(conventions)["laurent_variable"]
    compact = "".join(str(stated).split())
    if compact not in _VARIABLE_SPELLINGS:
        raise ConventionError(f"laurent: unknown variable {stated!r}; known: y (= pi*tau2), tau2")
    return _VARIABLE_SPELLINGS[compact]


def _integer(value, what: str) -> int:
    if isinstance(value, bool) or not isinstance(value, int):
        raise LedgerError(f"{what} must be an integer, got {value!r}")
    return value


def convert_integral(integral: dict, source: dict, target: dict, factor=1) -> dict:
    """An integral record multiplied by ``factor`` and by the ratio of the measures."""
    if not isinstance(integral, dict):
        raise LedgerError("integral: expected a table")
    source, target = _complete(source), _complete(target)
    total = factor * measure_scale(target["measure"]) / measure_scale(source["measure"])
    digits = record_digits(integral)
    result = dict(integral)
    if integral.get("value") not in (None, ""):
        ctx = working_context(digits)
        result["value"], result["error"] = scale_number(
            integral["value"], integral.get("error", "0"), digits, total, ctx)
    if integral.get("exact"):
        result["exact"] = _scale_text(integral["exact"], total, True, digits, "integral: exact")
    if integral.get("log_coefficient") not in (None, ""):
        text = str(integral["log_coefficient"])
        result["log_coefficient"] = _scale_text(text, total, looks_exact(text), digits,
                                                "integral: log_coefficient")
    if integral.get("divergent_terms"):
        result["divergent_terms"] = [_scale_term(term, total, digits)
                                     for term in integral["divergent_terms"]]
    return result


def _scale_term(term, factor, digits: int):
    """One divergent term, {power, coefficient} or [power, coefficient], times ``factor``."""
    if isinstance(term, dict) and "coefficient" in term:
        text = str(term["coefficient"])
        return {**term, "coefficient": _scale_text(text, factor, looks_exact(text), digits,
                                                   "integral: divergent term")}
    if isinstance(term, (list, tuple)) and len(term) == 2:
        return [term[0], _scale_term({"coefficient": term[1]}, factor, digits)["coefficient"]]
    raise LedgerError("integral: divergent_terms must be a list of {power, coefficient} tables")


def convert_values(values: list, factor) -> list:
    """Values at reference points, each multiplied by ``factor`` (errors scaled honestly)."""
    if not isinstance(values, list):
        raise LedgerError("values: expected a list of tables")
    result = []
    for item in values:
        if not isinstance(item, dict) or "value" not in item:
            raise LedgerError("values: each item needs a 'value'")
        digits = record_digits(item)
        ctx = working_context(digits)
        value, error = scale_number(item["value"], item.get("error", "0"), digits, factor, ctx)
        result.append({**item, "value": value, "error": error})
    return result


def convert_derived(derived: dict, source: dict, target: dict, weight: int) -> dict:
    """Every derived record of an entry of weight ``weight`` in the target's conventions."""
    factor = scale_factor(source, target, weight)
    result = copy.deepcopy(derived)
    if "values" in derived:
        result["values"] = convert_values(derived["values"], factor)
    if "laurent" in derived:
        result["laurent"] = convert_laurent(derived["laurent"], source, target, factor)
    if "integral" in derived:
        result["integral"] = convert_integral(derived["integral"], source, target, factor)
    if "computed_from" in derived:  # the coefficient's reduced form: converted like it
        from ledger.expr import parse, to_text

        result["computed_from"] = to_text(convert_coefficient(parse(str(derived["computed_from"])),
                                                              source, target, weight))
    return result


def convert_entry(entry, source: dict, target: dict):
    """A copy of an entry with coefficient and derived data in the target's conventions."""
    from ledger.expr import parse, to_text

    converted = copy.deepcopy(entry)
    weight = entry.weight
    try:
        converted.coefficient = to_text(convert_coefficient(parse(entry.coefficient), source, target, weight))
        converted.derived = convert_derived(entry.derived, source, target, weight)
    except ConventionError:
        raise
    except LedgerError as error:
        raise LedgerError(f"entry {entry.id}: {error}") from None
    return converted


def convert_project(project, target: dict):
    """A copy of a project with every entry converted and the target conventions declared."""
    from ledger.book.project import Project

    target = _complete(target)
    result = Project(project.title, target, project.description)
    result.backgrounds = copy.deepcopy(project.backgrounds)
    result.extra = copy.deepcopy(project.extra)
    result.entries = [convert_entry(e, project.conventions, target) for e in project.entries]
    return result


def describe_change(key: str, source_value: str, target_value: str) -> str:
    """What moving one convention from ``source_value`` to ``target_value`` does to stored data.

    >>> describe_change("mandelstam", "alpha'/2", "alpha'/4")
    'coefficient of sigma2^p sigma3^q x 2^(2p+3q)'
    >>> describe_change("laurent_variable", "pi*tau2", "tau2")
    'Laurent coefficient of the k-th power x pi^k'
    """
    source, target = _complete({key: source_value}), _complete({key: target_value})
    if key == "mandelstam":
        base = mandelstam_scale(source_value) / mandelstam_scale(target_value)
        return f"coefficient of sigma2^p sigma3^q x {_power_base(base)}^(2p+3q)"
    if key == "graph_normalisation":
        w = sympy.Symbol("w", positive=True, integer=True)
        ratios = [sympy.simplify(_symbolic_graph_scale(source_value, w, e_series)
                                 / _symbolic_graph_scale(target_value, w, e_series))
                  for e_series in (True, False)]
        text = f"coefficients rewritten atom by atom: E_w -> ({_factor_text(ratios[0])}) E_w"
        if ratios[1] != ratios[0]:
            text += f", other graph functions G_w -> ({_factor_text(ratios[1])}) G_w"
        return text
    if key == "laurent_variable":
        ratio = laurent_variable_scale(source[key]) / laurent_variable_scale(target[key])
        return f"Laurent coefficient of the k-th power x {_power_base(ratio)}^k"
    if key == "measure":
        return f"integrals x {_factor_text(measure_scale(target[key]) / measure_scale(source[key]))}"
    if key == "green_function":
        ratio = green_scale(source[key]) / green_scale(target[key])
        return f"Green's function atoms G -> ({_factor_text(ratio)}) G"
    if key == "amplitude_factor":
        ratio = amplitude_scale(target[key]) / amplitude_scale(source[key])
        return f"every coefficient, value and integral x {_factor_text(ratio)}"
    raise ConventionError(f"unknown convention key {key!r}")


def _symbolic_graph_scale(normalisation: str, w, e_series: bool):
    if normalisation == "tau2/pi":
        return sympy.Integer(1)
    if normalisation == "coprime/2" and e_series:
        return sympy.pi**w / (2 * sympy.zeta(2 * w))
    return sympy.pi**w


def _factor_text(value) -> str:
    return sympy.sstr(value).replace("**", "^")


def _power_base(base) -> str:
    text = _factor_text(base)
    return text if base.is_Integer or base.is_Symbol or base == sympy.pi else f"({text})"


def derived_from_engine(derived: dict, conventions: dict) -> dict:
    """Derived data the engine computed for :func:`engine_form` of a coefficient, in the
    project's conventions: Laurent polynomials move to the project's variable and integrals
    to its measure; values are already the project's (no Mandelstam or amplitude factor,
    since the engine form is the project's own function).

    >>> record = {"laurent": {"variable": "y", "exact": True, "terms": [{"power": 2, "coefficient": "1/45"}]}}
    >>> derived_from_engine(record, {"laurent_variable": "tau2"})["laurent"]["terms"]
    [{'power': 2, 'coefficient': 'pi**2/45'}]
    """
    engine, result = _complete({}), copy.deepcopy(derived)
    if "laurent" in derived:
        result["laurent"] = convert_laurent(derived["laurent"], engine, conventions)
    if "integral" in derived:
        result["integral"] = convert_integral(derived["integral"], engine, conventions)
    return result
