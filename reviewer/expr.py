"""Rule expressions: small arithmetic and logic over published quantities, never Python's eval.

Evaluation is done by simpleeval, a well-kept restricted evaluator (no attribute access to
objects, no imports, bounded powers and strings). It was chosen over the two Python packages of
the Common Expression Language (an open standard) on import cost and error messages: measured on
top of what a review already imports (``python -X importtime``, median of 7), simpleeval adds
about 1.5 ms, the pure-Python CEL package about 65 ms and the Rust-backed one about 210 ms; both
CEL packages refuse ``1 + 2.5`` (no integer/float mixing) with an overload message that names no
quantity, which rule authors writing ``2 * op.bus_max`` would meet constantly.

Before simpleeval sees a tree, this module

- reads numbers written with a unit (``48 V``, ``2.2k``, ``80 %``, ``125 °C``, ``100 nF``) into
  their SI value, remembering the unit for dimension checking;
- refuses anything but numbers, strings, names, arithmetic, comparisons, ``and``/``or``/``not``,
  ``x if c else y`` and calls of the functions listed in :data:`FUNCTIONS`; every integer
  becomes a float, so that no expression can build a huge integer;
- joins dotted names (``stress.high.vds_peak``) into single names, so that every quantity an
  expression reads is known before it runs (for "needs data" and for linting rule files);
- rewrites logic into element-wise numpy calls, so that one evaluation covers every tolerance
  corner at once.

:func:`infer` works out, without any design, what kind of value an expression yields (number,
flag or text) and, where the units of its names are known, its dimension; it refuses a flag in
arithmetic, a number compared with a text, a text compared with a value it can never take, and
adding or comparing quantities of different dimensions.
"""

from __future__ import annotations

import ast
import math
import operator
import re
from dataclasses import dataclass, field
from functools import lru_cache, reduce
from typing import Any, Callable

MAX_LENGTH = 2000
MAX_DEPTH = 40
MAX_NODES = 400
MAX_TEXT = 200


class ExprError(ValueError):
    """An expression that is not allowed or not well formed; the message says why."""


def _np():
    import numpy

    return numpy


def _min(*a: Any) -> Any:
    if not a:
        raise TypeError("min() needs at least one argument")
    return reduce(_np().minimum, a)


def _max(*a: Any) -> Any:
    if not a:
        raise TypeError("max() needs at least one argument")
    return reduce(_np().maximum, a)


def _one(fn: Callable[[Any], Any]) -> Callable[[Any], Any]:
    def call(x: Any) -> Any:
        return fn(_number(x))
    return call


FUNCTIONS: dict[str, Any] = {
    "min": _min,
    "max": _max,
    "abs": _one(lambda x: _np().abs(x)),
    "sqrt": _one(lambda x: _np().sqrt(x)),
    "log": _one(lambda x: _np().log(x)),
    "log10": _one(lambda x: _np().log10(x)),
    "exp": _one(lambda x: _np().exp(_np().minimum(x, 700.0))),
    "where": lambda c, a, b: _np().where(c, a, b),
    "_and": lambda *a: reduce(_np().logical_and, a),
    "_or": lambda *a: reduce(_np().logical_or, a),
    "_not": lambda a: _np().logical_not(a),
}
PUBLIC_FUNCTIONS = sorted(f for f in FUNCTIONS if not f.startswith("_"))
ARITY = {"min": (1, 20), "max": (1, 20), "abs": (1, 1), "sqrt": (1, 1), "log": (1, 1),
         "log10": (1, 1), "exp": (1, 1), "where": (3, 3)}


def _number(x: Any) -> Any:
    """Refuse texts and flags in arithmetic (at run time too, not only in :func:`infer`)."""
    if isinstance(x, (str, bytes)):
        raise TypeError("a text cannot be used in arithmetic")
    if isinstance(x, bool) or getattr(getattr(x, "dtype", None), "kind", "") == "b":
        raise TypeError("a flag (true/false) cannot be used in arithmetic")
    return x


def _arith(fn: Callable[[Any, Any], Any]) -> Callable[[Any, Any], Any]:
    def call(a: Any, b: Any) -> Any:
        return fn(_number(a), _number(b))
    return call


def _pow(a: Any, b: Any) -> Any:
    np = _np()
    result = np.power(np.asarray(_number(a), dtype=float), np.asarray(_number(b), dtype=float))
    return float(result) if np.ndim(result) == 0 else result


OPERATORS: dict[type, Any] = {
    ast.Add: _arith(operator.add), ast.Sub: _arith(operator.sub),
    ast.Mult: _arith(operator.mul), ast.Div: _arith(operator.truediv),
    ast.Mod: _arith(operator.mod), ast.Pow: _pow,
    ast.USub: lambda a: -_number(a), ast.UAdd: lambda a: +_number(a),
    ast.Eq: operator.eq, ast.NotEq: operator.ne, ast.Gt: operator.gt, ast.Lt: operator.lt,
    ast.GtE: operator.ge, ast.LtE: operator.le,
}

_ALLOWED = (
    ast.Expression, ast.Expr, ast.BinOp, ast.UnaryOp, ast.BoolOp, ast.Compare, ast.IfExp,
    ast.Call, ast.Name, ast.Load, ast.Constant, ast.Attribute,
    ast.Add, ast.Sub, ast.Mult, ast.Div, ast.Pow, ast.Mod, ast.USub, ast.UAdd, ast.Not,
    ast.And, ast.Or, ast.Eq, ast.NotEq, ast.Lt, ast.LtE, ast.Gt, ast.GtE,
)

# --- numbers with units ---------------------------------------------------------------------

_NUMBER = re.compile(r"(?<![\w.])(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?")
_UNIT = re.compile(r"[ \t]?[A-Za-zΩµμ°%][A-Za-zΩµμ°%²/]*")
_KEYWORDS = {"and", "or", "not", "if", "else", "in", "is", "e", "E"}
_AREA = re.compile(r"^\s*([0-9.]+(?:[eE][+-]?\d+)?)\s*([munµcdk]?)m(?:²|2)\s*$")
_AREA_PREFIX = {"": 1.0, "m": 1e-3, "u": 1e-6, "µ": 1e-6, "n": 1e-9, "c": 1e-2, "d": 1e-1,
                "k": 1e3}


def parse_quantity(text: str | float | int) -> tuple[float, str]:
    """A number written with a unit, as (SI value, unit symbol): ``"80 %" -> (0.8, "%")``.

    Adds to :func:`reviewer.units.parse_with_unit` the two readings a rule needs: a bare degree
    sign (``"30 °"``) is an angle, never a temperature (``"125 °C"`` is one), and an SI prefix on
    an area applies squared (``"4 mm²"`` is 4e-6 m²). Raises :class:`reviewer.units.UnitError`.
    """
    from reviewer.units import parse_with_unit

    if isinstance(text, str):
        stripped = text.strip()
        if stripped.endswith("°") and not stripped.endswith("°C"):
            from reviewer.units import parse_number

            return parse_number(stripped, "rad"), "rad"
        m = _AREA.match(stripped)
        if m:
            return float(m.group(1)) * _AREA_PREFIX[m.group(2)] ** 2, "m²"
    value, unit = parse_with_unit(text)
    if not math.isfinite(value):
        from reviewer.units import UnitError

        raise UnitError(f"{text!r} is not a finite number")
    return value, unit


def _read_units(text: str) -> tuple[str, dict[tuple[int, int], str]]:
    """Replace every number written with a unit by its SI value; remember where and which unit.

    Returns the new text and a map from (line, byte column) of each replaced number in the new
    text to its unit symbol (``""`` for a bare number written with an SI prefix, ``"2.2k"``).
    Text inside quotes is left alone.
    """
    from reviewer.units import UnitError

    out: list[str] = []
    units: dict[tuple[int, int], str] = {}
    i = 0
    n = len(text)
    while i < n:
        ch = text[i]
        if ch in "'\"":
            j = i + 1
            while j < n and text[j] != ch:
                j += 2 if text[j] == "\\" else 1
            out.append(text[i:j + 1])
            i = j + 1
            continue
        m = _NUMBER.match(text, i) if ch.isdigit() or ch == "." else None
        if m is None or (i and (text[i - 1].isalnum() or text[i - 1] in "_.")):
            out.append(ch)
            i += 1
            continue
        number_end = m.end()
        u = _UNIT.match(text, number_end)
        replaced = False
        if u is not None:
            word = u.group(0).strip()
            candidates = [word] + [word[:k] for k in range(len(word) - 1, 0, -1) if word[k] == "/"]
            for cand in candidates:
                if cand in _KEYWORDS or (word[0] == "%" and _operand_follows(
                        text, u.start() + u.group(0).index("%"))):
                    break
                spacer = " " if u.group(0)[0] in " \t" else ""
                try:
                    value, unit = parse_quantity(m.group(0) + spacer + cand)
                except UnitError:
                    continue
                prefix = "".join(out)
                line = prefix.count("\n") + 1
                col = len(prefix[prefix.rfind("\n") + 1:].encode("utf-8"))
                units[(line, col)] = unit
                out.append(repr(float(value)))
                i = u.start() + len(u.group(0)) - len(word) + len(cand)
                replaced = True
                break
        if not replaced:
            out.append(m.group(0))
            i = number_end
    return "".join(out), units


def _operand_follows(text: str, at: int) -> bool:
    """After a ``%`` at ``at``: does an operand follow (then it is the modulo operator)?"""
    rest = text[at + 1:].lstrip()
    return bool(rest) and (rest[0].isalnum() or rest[0] in "_(.'\"")


# --- compiling ---------------------------------------------------------------------------------

def _dotted(node: ast.AST) -> str | None:
    parts: list[str] = []
    while isinstance(node, ast.Attribute):
        parts.append(node.attr)
        node = node.value
    if isinstance(node, ast.Name):
        parts.append(node.id)
        return ".".join(reversed(parts))
    return None


def flat(name: str) -> str:
    """The single name a dotted quantity name becomes inside an evaluated tree."""
    return "q__" + name.replace(".", "__").replace("-", "_")


class _Rewrite(ast.NodeTransformer):
    def __init__(self) -> None:
        self.names: set[str] = set()

    def _call(self, fn: str, args: list[ast.expr]) -> ast.Call:
        return ast.Call(func=ast.Name(id=fn, ctx=ast.Load()), args=args, keywords=[])

    def visit_Constant(self, node: ast.Constant) -> ast.AST:
        if isinstance(node.value, int) and not isinstance(node.value, bool):
            return ast.Constant(value=float(node.value))
        return node

    def visit_Attribute(self, node: ast.Attribute) -> ast.AST:
        name = _dotted(node)
        if name is None:
            raise ExprError("only quantity names may be written with dots")
        if any(part.startswith("_") for part in name.split(".")):
            raise ExprError(f"name parts may not start with '_': {name!r}")
        self.names.add(name)
        return ast.Name(id=flat(name), ctx=ast.Load())

    def visit_Name(self, node: ast.Name) -> ast.AST:
        if node.id in FUNCTIONS:
            raise ExprError(f"{node.id!r} is a function: call it, as in {node.id}(x)")
        if node.id.startswith("_"):
            raise ExprError(f"names may not start with '_': {node.id!r}")
        if node.id in ("True", "False"):
            return ast.Constant(value=node.id == "True")
        self.names.add(node.id)
        return ast.Name(id=flat(node.id), ctx=ast.Load())

    def visit_Call(self, node: ast.Call) -> ast.AST:
        if not isinstance(node.func, ast.Name) or node.func.id not in PUBLIC_FUNCTIONS:
            shown = _dotted(node.func) or "this"
            raise ExprError(f"{shown!r} is not a function here; functions: {', '.join(PUBLIC_FUNCTIONS)}")
        if node.keywords:
            raise ExprError("functions take no keyword arguments")
        lo, hi = ARITY[node.func.id]
        if not lo <= len(node.args) <= hi:
            want = str(lo) if lo == hi else f"{lo} to {hi}"
            raise ExprError(f"{node.func.id}() takes {want} argument{'s' if hi > 1 else ''}, "
                            f"found {len(node.args)}")
        return self._call(node.func.id, [self.visit(a) for a in node.args])

    def visit_BoolOp(self, node: ast.BoolOp) -> ast.AST:
        fn = "_and" if isinstance(node.op, ast.And) else "_or"
        return self._call(fn, [self.visit(v) for v in node.values])

    def visit_UnaryOp(self, node: ast.UnaryOp) -> ast.AST:
        if isinstance(node.op, ast.Not):
            return self._call("_not", [self.visit(node.operand)])
        return ast.UnaryOp(op=node.op, operand=self.visit(node.operand))

    def visit_Compare(self, node: ast.Compare) -> ast.AST:
        left = self.visit(node.left)
        rights = [self.visit(c) for c in node.comparators]
        pairs = []
        for op, right in zip(node.ops, rights):
            pairs.append(ast.Compare(left=left, ops=[op], comparators=[right]))
            left = right
        return pairs[0] if len(pairs) == 1 else self._call("_and", pairs)

    def visit_IfExp(self, node: ast.IfExp) -> ast.AST:
        return self._call("where", [self.visit(node.test), self.visit(node.body),
                                    self.visit(node.orelse)])


def _depth(node: ast.AST) -> int:
    stack = [(node, 1)]
    deepest = 0
    while stack:
        n, d = stack.pop()
        deepest = max(deepest, d)
        stack.extend((c, d + 1) for c in ast.iter_child_nodes(n))
    return deepest


@dataclass(frozen=True)
class Expr:
    """A checked, rewritten expression; ``names`` are the quantities and parameters it reads."""

    text: str
    names: frozenset[str]
    tree: ast.AST
    source: ast.AST | None = None
    """The checked tree as written (dotted names, logic), for :func:`infer`."""
    units: dict[tuple[int, int], str] = field(default_factory=dict)
    """Unit of each number written with one, by (line, column) in :attr:`source`."""

    def evaluate(self, env: dict[str, Any]) -> Any:
        """Evaluate with ``env`` mapping each name in :attr:`names` to a number, array or text."""
        from simpleeval import SimpleEval

        missing = sorted(n for n in self.names if n not in env)
        if missing:
            raise ExprError(f"no value for {', '.join(map(repr, missing))} in {self.text!r}")
        names = {flat(n): env[n] for n in self.names}
        evaluator = SimpleEval(names=names, functions=FUNCTIONS, operators=OPERATORS)
        np = _np()
        try:
            with np.errstate(all="ignore"):
                return evaluator.eval(self.text, previously_parsed=self.tree)
        except ZeroDivisionError:
            raise ExprError(f"division by zero in {self.text!r}") from None
        except ExprError:
            raise
        except (ArithmeticError, TypeError, ValueError) as e:
            raise ExprError(f"cannot evaluate {self.text!r}: {e}") from None
        except Exception as e:  # simpleeval's own refusals (NumberTooHigh, IterableTooLong, ...)
            raise ExprError(f"refused {self.text!r}: {e}") from None


def compile_expr(text: str) -> Expr:
    """Check and rewrite ``text``; raise :class:`ExprError` saying what is not allowed.

    Compiled expressions are immutable and cached on their text: rule files and mitigation
    texts repeat them across subjects and reviews.
    """
    if not isinstance(text, str) or not text.strip():
        raise ExprError("an expression must be a non-empty text")
    return _compile(text)


@lru_cache(maxsize=4096)
def _compile(text: str) -> Expr:
    if len(text) > MAX_LENGTH:
        raise ExprError(f"expression longer than {MAX_LENGTH} characters")
    if max(text.count("("), text.count("["), text.count("{")) > MAX_DEPTH:
        raise ExprError(f"expression nested deeper than {MAX_DEPTH} levels")
    source_text, units = _read_units(" ".join(text.split()))
    try:
        tree = ast.parse(source_text, mode="eval")
    except (SyntaxError, RecursionError, MemoryError, ValueError) as e:
        msg = getattr(e, "msg", None) or str(e) or type(e).__name__
        raise ExprError(f"not a valid expression: {msg}") from None
    count = 0
    for node in ast.walk(tree):
        count += 1
        if count > MAX_NODES:
            raise ExprError(f"expression has more than {MAX_NODES} parts")
        if not isinstance(node, _ALLOWED):
            raise ExprError(f"{_what(node)} is not allowed in an expression")
        if isinstance(node, ast.Constant) and not isinstance(node.value, (int, float, str, bool)):
            raise ExprError(f"constant {node.value!r} is not allowed")
        if isinstance(node, ast.Constant) and isinstance(node.value, str) and len(node.value) > MAX_TEXT:
            raise ExprError(f"text constants are limited to {MAX_TEXT} characters")
        if isinstance(node, ast.Constant) and isinstance(node.value, (int, float)) \
                and not isinstance(node.value, bool) and not math.isfinite(float(node.value)):
            raise ExprError(f"the number {source_text[node.col_offset:node.end_col_offset]!r} is too large")
    if _depth(tree) > MAX_DEPTH:
        raise ExprError(f"expression nested deeper than {MAX_DEPTH} levels")
    rw = _Rewrite()
    body = rw.visit(ast.parse(source_text, mode="eval").body)
    stmt = ast.Expr(value=body)
    ast.fix_missing_locations(stmt)
    return Expr(text, frozenset(rw.names), stmt, tree.body, units)


_WHAT = {"Subscript": "indexing (x[i])", "Lambda": "lambda", "ListComp": "a comprehension",
         "GeneratorExp": "a comprehension", "SetComp": "a comprehension",
         "DictComp": "a comprehension", "JoinedStr": "an f-string", "NamedExpr": "':='",
         "List": "a list", "Tuple": "a tuple", "Dict": "a table", "Set": "a set",
         "Starred": "'*'", "Await": "await", "Yield": "yield", "Slice": "a slice",
         "FloorDiv": "'//'", "BitAnd": "'&'", "BitOr": "'|'", "BitXor": "'^'",
         "LShift": "'<<'", "RShift": "'>>'", "Invert": "'~'", "In": "'in'", "NotIn": "'not in'",
         "Is": "'is'", "IsNot": "'is not'", "MatMult": "'@'"}


def _what(node: ast.AST) -> str:
    return _WHAT.get(type(node).__name__, type(node).__name__)


# --- kinds and dimensions ----------------------------------------------------------------------

BASES = ("V", "A", "s", "m", "K")
Dim = tuple[int, ...]
NODIM: Dim = (0, 0, 0, 0, 0)


def _d(v: int = 0, a: int = 0, s: int = 0, m: int = 0, k: int = 0) -> Dim:
    return (v, a, s, m, k)


DIMENSIONS: dict[str, Dim] = {
    "": NODIM, "%": NODIM, "rad": NODIM,
    "V": _d(v=1), "A": _d(a=1), "s": _d(s=1), "m": _d(m=1), "m²": _d(m=2), "°C": _d(k=1),
    "K": _d(k=1), "Ω": _d(v=1, a=-1), "S": _d(v=-1, a=1), "F": _d(v=-1, a=1, s=1),
    "H": _d(v=1, a=-1, s=1), "Hz": _d(s=-1), "W": _d(v=1, a=1), "C": _d(a=1, s=1),
    "J": _d(v=1, a=1, s=1), "K/W": _d(v=-1, a=-1, k=1), "W/K": _d(v=1, a=1, k=-1),
    "V/s": _d(v=1, s=-1), "A/s": _d(a=1, s=-1), "A²s": _d(a=2, s=1),
}
"""Units as powers of volt, ampere, second, metre and kelvin (temperatures and their
differences share the kelvin; angles and ratios are dimensionless, as in SI)."""


def dimension_of(unit: str | None) -> Dim | None:
    """The dimension of a unit symbol, or None when it is not known here (then not checked)."""
    return None if unit is None else DIMENSIONS.get(unit)


def unit_name(dim: Dim | None) -> str:
    """A unit symbol for a dimension: a known one when it matches, else a product of bases."""
    if dim is None:
        return "an unknown unit"
    if dim == NODIM:
        return "no unit"
    for symbol, d in DIMENSIONS.items():
        if d == dim and symbol not in ("K", "J"):
            return symbol
    sup = str.maketrans("0123456789", "⁰¹²³⁴⁵⁶⁷⁸⁹")
    up = "·".join(f"{b}{'' if e == 1 else str(e).translate(sup)}" for b, e in zip(BASES, dim)
                  if e > 0) or "1"
    down = "·".join(f"{b}{'' if e == -1 else str(-e).translate(sup)}" for b, e in zip(BASES, dim)
                    if e < 0)
    return f"{up}/{down}" if down else up


@dataclass(frozen=True)
class Type:
    """What an expression yields: ``kind`` number, flag or text (None: unknown), its dimension
    (None: unknown), the values a text can take (None: any), and whether it is a bare number
    (which fits any dimension in a sum or a comparison, being written in the SI unit)."""

    kind: str | None
    dim: Dim | None = None
    choices: frozenset[str] | None = None
    loose: bool = False
    literal: str | None = None


ANY = Type(None)
NUMBER = Type("number", None)
FLAG = Type("flag")


def type_of_unit(unit: str, kind: str = "number", choices: frozenset[str] | None = None) -> Type:
    """The :class:`Type` of a quantity of this kind and unit."""
    if kind != "number":
        return Type(kind, None, choices)
    return Type("number", dimension_of(unit))


def infer(expr: Expr, lookup: Callable[[str], Type | None]) -> Type:
    """What ``expr`` yields, given the type of each name; raise :class:`ExprError` if ill-typed.

    ``lookup(name)`` gives a name's :class:`Type`, or None when unknown (unknown names are
    reported elsewhere; here they are of any kind).
    """
    return _Infer(expr, lookup).visit(expr.source)


class _Infer:
    def __init__(self, expr: Expr, lookup: Callable[[str], Type | None]):
        self.expr = expr
        self.lookup = lookup

    def show(self, node: ast.AST) -> str:
        try:
            return ast.unparse(node)
        except Exception:  # unparse of a tree we built ourselves; fall back to the node kind
            return type(node).__name__

    def visit(self, node: ast.AST) -> Type:
        method = getattr(self, "v_" + type(node).__name__, None)
        if method is None:
            return ANY
        return method(node)

    def v_Constant(self, node: ast.Constant) -> Type:
        v = node.value
        if isinstance(v, bool):
            return FLAG
        if isinstance(v, str):
            return Type("text", literal=v)
        unit = self.expr.units.get((node.lineno, node.col_offset))
        if unit is None or unit == "":
            return Type("number", NODIM, loose=True)
        return Type("number", dimension_of(unit))

    def v_Name(self, node: ast.Name) -> Type:
        if node.id in ("True", "False"):
            return FLAG
        return self.lookup(node.id) or ANY

    def v_Attribute(self, node: ast.Attribute) -> Type:
        name = _dotted(node)
        return (self.lookup(name) if name else None) or ANY

    def number(self, node: ast.AST, what: str) -> Type:
        t = self.visit(node)
        if t.kind == "flag":
            raise ExprError(f"{self.show(node)!r} is a flag (true/false) and cannot be used in {what}")
        if t.kind == "text":
            raise ExprError(f"{self.show(node)!r} is a text and cannot be used in {what}")
        return t

    def flag(self, node: ast.AST, what: str) -> Type:
        t = self.visit(node)
        if t.kind in ("number", "text"):
            raise ExprError(f"{self.show(node)!r} is a {t.kind}, not a condition; {what} needs "
                            "a comparison or a flag")
        return t

    def same(self, a: Type, b: Type, left: ast.AST, right: ast.AST, how: str) -> Type:
        """Two numbers that must share a dimension (a sum, a comparison, the branches of an if)."""
        if a.dim is None or b.dim is None:
            return Type("number", None, loose=a.loose and b.loose)
        if a.loose:
            return b
        if b.loose:
            return a
        if a.dim != b.dim:
            raise ExprError(f"{how}: {self.show(left)!r} is in {unit_name(a.dim)} but "
                            f"{self.show(right)!r} is in {unit_name(b.dim)}")
        return a

    def v_BinOp(self, node: ast.BinOp) -> Type:
        op = type(node.op)
        a = self.number(node.left, "arithmetic")
        b = self.number(node.right, "arithmetic")
        if op in (ast.Add, ast.Sub):
            return self.same(a, b, node.left, node.right,
                             "adding" if op is ast.Add else "subtracting")
        if op is ast.Mod:
            return self.same(a, b, node.left, node.right, "the remainder")
        if op in (ast.Mult, ast.Div):
            if a.dim is None or b.dim is None:
                return NUMBER
            sign = 1 if op is ast.Mult else -1
            # A bare number may stand for a quantity in SI units (a tempco of -0.005 is V/K):
            # a product with one is as loose as the number, so it never raises a false error.
            return Type("number", tuple(x + sign * y for x, y in zip(a.dim, b.dim)),
                        loose=a.loose or b.loose)
        if op is ast.Pow:
            if b.dim not in (None, NODIM) and not b.loose:
                raise ExprError(f"the exponent {self.show(node.right)!r} is in "
                                f"{unit_name(b.dim)}; an exponent has no unit")
            if a.dim is None or a.dim == NODIM:
                return Type("number", a.dim, loose=a.loose)
            k = _constant(node.right)
            if k is None or k != int(k):
                return NUMBER
            return Type("number", tuple(int(x * k) for x in a.dim))
        return NUMBER

    def v_UnaryOp(self, node: ast.UnaryOp) -> Type:
        if isinstance(node.op, ast.Not):
            self.flag(node.operand, "'not'")
            return FLAG
        return self.number(node.operand, "arithmetic")

    def v_BoolOp(self, node: ast.BoolOp) -> Type:
        word = "'and'" if isinstance(node.op, ast.And) else "'or'"
        for v in node.values:
            self.flag(v, word)
        return FLAG

    def v_Compare(self, node: ast.Compare) -> Type:
        left = node.left
        a = self.visit(left)
        for op, right in zip(node.ops, node.comparators):
            b = self.visit(right)
            ordering = not isinstance(op, (ast.Eq, ast.NotEq))
            if ordering:
                for t, n in ((a, left), (b, right)):
                    if t.kind in ("text", "flag"):
                        raise ExprError(f"{self.show(n)!r} is a {t.kind}; only numbers can be "
                                        "compared with < > <= >=")
            if a.kind and b.kind and a.kind != b.kind:
                raise ExprError(f"{self.show(node)!r} compares a {a.kind} ({self.show(left)!r}) "
                                f"with a {b.kind} ({self.show(right)!r}); it can never hold")
            if a.kind == "number" and b.kind == "number":
                self.same(a, b, left, right, "comparing")
            if a.kind == "text":
                for t, other, n in ((a, b, left), (b, a, right)):
                    if t.choices is not None and other.literal is not None \
                            and other.literal not in t.choices:
                        raise ExprError(f"{self.show(n)!r} is one of "
                                        f"{', '.join(map(repr, sorted(t.choices)))}; it is never "
                                        f"{other.literal!r}")
            left, a = right, b
        return FLAG

    def v_IfExp(self, node: ast.IfExp) -> Type:
        self.flag(node.test, "'if'")
        return self._branches(node.body, node.orelse)

    def _branches(self, x: ast.AST, y: ast.AST) -> Type:
        a, b = self.visit(x), self.visit(y)
        if a.kind and b.kind and a.kind != b.kind:
            raise ExprError(f"the two branches give a {a.kind} ({self.show(x)!r}) and a {b.kind} "
                            f"({self.show(y)!r})")
        if a.kind == "number" and b.kind == "number":
            return self.same(a, b, x, y, "the two branches differ")
        return a if a.kind else b

    def v_Call(self, node: ast.Call) -> Type:
        fn = node.func.id if isinstance(node.func, ast.Name) else ""
        args = node.args
        if fn == "where":
            self.flag(args[0], "where()")
            return self._branches(args[1], args[2])
        types = [self.number(a, f"{fn}()") for a in args]
        if fn in ("min", "max"):
            out = types[0]
            for t, a in zip(types[1:], args[1:]):
                out = self.same(out, t, args[0], a, f"{fn}() of different units")
            return out
        t = types[0]
        if fn == "abs":
            return t
        if fn == "sqrt":
            if t.dim is None or any(x % 2 for x in t.dim):
                return NUMBER
            return Type("number", tuple(x // 2 for x in t.dim), loose=t.loose)
        if t.dim not in (None, NODIM) and not t.loose:
            raise ExprError(f"{fn}() of {self.show(args[0])!r}, which is in {unit_name(t.dim)}; "
                            f"{fn}() takes a number without a unit")
        return Type("number", NODIM)


def _constant(node: ast.AST) -> float | None:
    if isinstance(node, ast.Constant) and isinstance(node.value, (int, float)) \
            and not isinstance(node.value, bool):
        return float(node.value)
    if isinstance(node, ast.UnaryOp) and isinstance(node.op, ast.USub):
        inner = _constant(node.operand)
        return None if inner is None else -inner
    return None


def sample(t: Type) -> Any:
    """A value of this type over two corners, for evaluating an expression once before any design."""
    np = _np()
    if t.kind == "flag":
        return np.array([False, True])
    if t.kind == "text":
        return sorted(t.choices)[0] if t.choices else "text"
    return np.array([1.5, 2.5])
