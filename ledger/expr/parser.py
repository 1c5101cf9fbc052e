"""Parser for the plain-text expression language.

Grammar (juxtaposition multiplies, ``^`` binds tightest and is right-associative)::

    sum     := product (('+' | '-') product)*
    product := unary (('*' | '/')? unary)*
    unary   := ('+' | '-') unary | power
    power   := atom ('^' unary)?
    atom    := NUMBER | NAME | NAME '(' arguments ')' | '(' sum ')'

Names: ``E(s)``, ``C(a,...)``, ``graph(u-v[:w], ...)``, ``zeta(n)``, ``pi``,
``laplace(expr)``, ``theta(nu,alpha,beta)``, ``eta``, ``spin(nu,alpha,beta)``,
``green(alpha,beta)``, ``Etw(s,alpha,beta)``, ``ellgenus(N,alpha,beta)``.

>>> parse("2/5 E(5) + zeta(5)/30") == parse("zeta(5)/30 + 2/5*E(5)")
True
>>> parse("graph(0-1, 0-1:2, 1-0)")
C(2, 1, 1)
>>> parse("C(1,1") # doctest: +IGNORE_EXCEPTION_DETAIL
Traceback (most recent call last):
ExpressionError: column 6: expected ',' or ')' but the expression ended
"""

from __future__ import annotations

import re
from dataclasses import dataclass

import sympy

from ledger.errors import ExpressionError, LedgerError
from ledger.expr import atoms
from ledger.mgf.graph import Graph

_TOKEN = re.compile(r"\s*(?:(?P<number>\d+(?:\.\d+)?)|(?P<name>[A-Za-z_][A-Za-z_0-9]*)"
                    r"|(?P<op>[-+*/^(),:]))")


@dataclass(frozen=True)
class Token:
    kind: str  # 'number', 'name', 'op', 'end'
    text: str
    column: int  # 1-based


def tokenize(text: str) -> list[Token]:
    tokens = []
    position = 0
    while position < len(text):
        if text[position:].strip() == "":
            break
        match = _TOKEN.match(text, position)
        if not match or match.end() == position:
            column = position + 1 + (len(text[position:]) - len(text[position:].lstrip()))
            raise ExpressionError(f"unexpected character {text[column - 1]!r}", column, text)
        kind = match.lastgroup
        start = match.start(kind)
        tokens.append(Token(kind, match.group(kind), start + 1))
        position = match.end()
    tokens.append(Token("end", "", len(text) + 1))
    return tokens


def _describe(token: Token) -> str:
    return "the expression ended" if token.kind == "end" else f"found {token.text!r}"


class _Parser:
    def __init__(self, text: str):
        self.text = text
        self.tokens = tokenize(text)
        self.index = 0

    @property
    def current(self) -> Token:
        return self.tokens[self.index]

    def advance(self) -> Token:
        token = self.current
        self.index += 1
        return token

    def fail(self, expected: str, token: Token | None = None):
        token = token or self.current
        raise ExpressionError(f"expected {expected} but {_describe(token)}", token.column, self.text)

    def expect(self, text: str, expected: str | None = None) -> Token:
        if self.current.kind == "op" and self.current.text == text:
            return self.advance()
        self.fail(expected or repr(text))

    def parse(self):
        if self.current.kind == "end":
            self.fail("an expression")
        result = self.sum()
        if self.current.kind != "end":
            self.fail("an operator or the end of the expression")
        return result

    def sum(self):
        result = self.product()
        while self.current.kind == "op" and self.current.text in "+-":
            sign = self.advance().text
            term = self.product()
            result = result + term if sign == "+" else result - term
        return result

    def _starts_atom(self) -> bool:
        token = self.current
        return token.kind in ("number", "name") or (token.kind == "op" and token.text == "(")

    def product(self):
        negative = False
        while self.current.kind == "op" and self.current.text in "+-":
            negative ^= self.advance().text == "-"
        result = self.unary()
        while True:
            token = self.current
            if token.kind == "op" and token.text in "*/":
                self.advance()
                operand_token = self.current
                operand = self.unary()
                if token.text == "*":
                    result = result * operand
                else:
                    if atoms.modular_atoms(operand):
                        raise ExpressionError(
                            "division by a function of tau is not supported; divide by numbers, "
                            "zeta values or pi", operand_token.column, self.text)
                    if operand == 0:
                        raise ExpressionError("division by zero", operand_token.column, self.text)
                    result = result / operand
            elif self._starts_atom():
                result = result * self.unary()
            else:
                return -result if negative else result

    def unary(self):
        if self.current.kind == "op" and self.current.text in "+-":
            sign = self.advance().text
            operand = self.unary()
            return operand if sign == "+" else -operand
        return self.power()

    def power(self):
        base = self.atom()
        if self.current.kind == "op" and self.current.text == "^":
            caret = self.advance()
            exponent_token = self.current
            exponent = self.unary()
            if not exponent.is_Integer:
                raise ExpressionError("an exponent must be an integer", exponent_token.column, self.text)
            if exponent < 0 and atoms.modular_atoms(base):
                raise ExpressionError(
                    "negative powers of functions of tau are not supported",
                    exponent_token.column, self.text)
            if exponent < 0 and base == 0:
                raise ExpressionError("division by zero", caret.column, self.text)
            return base ** exponent
        return base

    def atom(self):
        token = self.current
        if token.kind == "number":
            self.advance()
            return sympy.Rational(token.text)
        if token.kind == "op" and token.text == "(":
            self.advance()
            if self.current.kind == "op" and self.current.text == ")":
                self.fail("an expression")
            inner = self.sum()
            self.expect(")", "')'")
            return inner
        if token.kind == "name":
            return self.named(self.advance())
        self.fail("a number, a name or '('")

    def named(self, name: Token):
        if name.text == "pi":
            return sympy.pi
        if name.text == "eta":
            if self.current.kind == "op" and self.current.text == "(":
                self.advance()
                self.expect(")", "')' (eta takes no arguments)")
            return atoms.Eta()
        builders = {
            "E": (self._integer_arguments, lambda a: atoms.E(*a), 1),
            "C": (self._integer_arguments, lambda a: atoms.C(*a), None),
            "zeta": (self._integer_arguments, self._zeta, 1),
            "laplace": (self._expression_arguments, lambda a: atoms.Laplace(a[0]), 1),
            "theta": (self._rational_arguments, lambda a: self._theta_family(atoms.Theta, a, (1, 2, 3, 4)), 3),
            "spin": (self._rational_arguments, lambda a: self._theta_family(atoms.Spin, a, (2, 3, 4)), 3),
            "green": (self._rational_arguments, lambda a: atoms.Green(*a), 2),
            "Etw": (self._rational_arguments, lambda a: self._theta_family(atoms.Etw, a, None), 3),
            "ellgenus": (self._rational_arguments, lambda a: self._theta_family(atoms.EllGenus, a, (2, 3, 4, 6)), 3),
        }
        if name.text == "graph":
            return self._graph(name)
        if name.text not in builders:
            known = "E, C, graph, zeta, pi, laplace, theta, eta, spin, green, Etw, ellgenus"
            raise ExpressionError(f"unknown name {name.text!r}; expected one of {known}",
                                  name.column, self.text)
        read, build, count = builders[name.text]
        open_paren = self.current
        if not (open_paren.kind == "op" and open_paren.text == "("):
            self.fail(f"'(' after {name.text}")
        self.advance()
        arguments = read()
        self.expect(")", "',' or ')'")
        if count is not None and len(arguments) != count:
            raise ExpressionError(
                f"{name.text} takes {count} argument{'s' if count > 1 else ''}, got {len(arguments)}",
                name.column, self.text)
        try:
            return build(arguments)
        except ExpressionError as error:
            raise ExpressionError(error.reason, name.column, self.text) from None
        except LedgerError as error:
            raise type(error)(f"column {name.column}: {error}") from None

    def _argument_list(self, read_one):
        values = [read_one()]
        while self.current.kind == "op" and self.current.text == ",":
            self.advance()
            values.append(read_one())
        return values

    def _integer_arguments(self):
        def one():
            token = self.current
            value = self.sum()
            if not value.is_Integer:
                raise ExpressionError("expected an integer argument", token.column, self.text)
            return int(value)
        return self._argument_list(one)

    def _rational_arguments(self):
        def one():
            token = self.current
            value = self.sum()
            if not value.is_Rational:
                raise ExpressionError("expected a rational argument", token.column, self.text)
            return value
        return self._argument_list(one)

    def _expression_arguments(self):
        return self._argument_list(self.sum)

    @staticmethod
    def _zeta(arguments):
        (n,) = arguments
        if n < 2:
            raise ExpressionError(f"zeta(n) needs an integer n >= 2, got {n}")
        return sympy.zeta(n)

    @staticmethod
    def _theta_family(cls, arguments, allowed):
        first = arguments[0]
        if not first.is_Integer or (allowed is not None and int(first) not in allowed):
            choices = ", ".join(str(a) for a in allowed) if allowed else "a positive integer"
            raise ExpressionError(f"{cls.__name__.lower()}: first argument must be one of {choices}")
        if allowed is None and int(first) < 1:
            raise ExpressionError(f"{cls.__name__}: s must be a positive integer")
        return cls(*arguments)

    def _graph(self, name: Token):
        self.expect("(", "'(' after graph")
        edges = [self._edge()]
        while self.current.kind == "op" and self.current.text == ",":
            self.advance()
            edges.append(self._edge())
        self.expect(")", "',' or ')'")
        try:
            return atoms.from_graph(Graph.from_edges(edges))
        except LedgerError as error:
            raise type(error)(f"column {name.column}: {error}") from None

    def _vertex(self) -> int:
        token = self.current
        if token.kind != "number" or "." in token.text:
            self.fail("a vertex number")
        self.advance()
        return int(token.text)

    def _edge(self):
        u = self._vertex()
        self.expect("-", "'-' between the two vertices of an edge")
        v = self._vertex()
        weight = 1
        if self.current.kind == "op" and self.current.text == ":":
            self.advance()
            token = self.current
            if token.kind != "number" or "." in token.text or int(token.text) < 1:
                self.fail("a positive integer weight after ':'")
            self.advance()
            weight = int(token.text)
        return (u, v, weight)


def parse(text: str):
    """Parse expression text into a canonical sympy expression (expanded polynomial in atoms)."""
    if not isinstance(text, str):
        raise ExpressionError("an expression must be text")
    return sympy.expand(_Parser(text).parse())
