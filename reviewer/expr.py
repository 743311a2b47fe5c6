"""Rule expressions: small arithmetic and logic over published quantities, never Python's eval.

Evaluation is done by simpleeval, a well-kept restricted evaluator (no attribute access to
objects, no imports, bounded powers and strings; it imports in a few milliseconds, where the
Common Expression Language packages measured here cost 0.1–0.3 s of start-up). Before simpleeval
sees a tree, this module

- refuses anything but numbers, strings, names, arithmetic, comparisons, ``and``/``or``/``not``,
  ``x if c else y`` and calls of the functions listed in :data:`FUNCTIONS`;
- joins dotted names (``stress.high.vds_peak``) into single names, so that every quantity an
  expression reads is known before it runs (for "needs data" and for linting rule files);
- rewrites logic into element-wise numpy calls, so that one evaluation covers every tolerance
  corner at once.
"""

from __future__ import annotations

import ast
from dataclasses import dataclass
from functools import reduce
from typing import Any

MAX_LENGTH = 2000
MAX_DEPTH = 40
MAX_NODES = 400


class ExprError(ValueError):
    """An expression that is not allowed or not well formed; the message says why."""


def _np():
    import numpy

    return numpy


def _min(*a: Any) -> Any:
    return reduce(_np().minimum, a)


def _max(*a: Any) -> Any:
    return reduce(_np().maximum, a)


FUNCTIONS: dict[str, Any] = {
    "min": _min,
    "max": _max,
    "abs": lambda x: _np().abs(x),
    "sqrt": lambda x: _np().sqrt(x),
    "log": lambda x: _np().log(x),
    "log10": lambda x: _np().log10(x),
    "exp": lambda x: _np().exp(_np().minimum(x, 700.0)),
    "where": lambda c, a, b: _np().where(c, a, b),
    "_and": lambda *a: reduce(_np().logical_and, a),
    "_or": lambda *a: reduce(_np().logical_or, a),
    "_not": lambda a: _np().logical_not(a),
}
PUBLIC_FUNCTIONS = sorted(f for f in FUNCTIONS if not f.startswith("_"))

_ALLOWED = (
    ast.Expression, ast.Expr, ast.BinOp, ast.UnaryOp, ast.BoolOp, ast.Compare, ast.IfExp,
    ast.Call, ast.Name, ast.Load, ast.Constant, ast.Attribute,
    ast.Add, ast.Sub, ast.Mult, ast.Div, ast.Pow, ast.Mod, ast.USub, ast.UAdd, ast.Not,
    ast.And, ast.Or, ast.Eq, ast.NotEq, ast.Lt, ast.LtE, ast.Gt, ast.GtE,
)


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
            return node
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

    def eval(self, env: dict[str, Any]) -> Any:
        """Evaluate with ``env`` mapping each name in :attr:`names` to a number, array or text."""
        from simpleeval import SimpleEval

        names = {flat(n): env[n] for n in self.names}
        evaluator = SimpleEval(names=names, functions=FUNCTIONS)
        try:
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
    """Check and rewrite ``text``; raise :class:`ExprError` saying what is not allowed."""
    if not isinstance(text, str) or not text.strip():
        raise ExprError("an expression must be a non-empty text")
    if len(text) > MAX_LENGTH:
        raise ExprError(f"expression longer than {MAX_LENGTH} characters")
    if text.count("(") > MAX_DEPTH:
        raise ExprError(f"expression nested deeper than {MAX_DEPTH} levels")
    try:
        tree = ast.parse(text.strip(), mode="eval")
    except (SyntaxError, RecursionError, MemoryError, ValueError) as e:
        msg = getattr(e, "msg", None) or str(e) or type(e).__name__
        raise ExprError(f"not a valid expression: {msg}") from None
    count = 0
    for node in ast.walk(tree):
        count += 1
        if not isinstance(node, _ALLOWED):
            raise ExprError(f"{type(node).__name__} is not allowed in an expression")
        if isinstance(node, ast.Constant) and not isinstance(node.value, (int, float, str, bool)):
            raise ExprError(f"constant {node.value!r} is not allowed")
        if isinstance(node, ast.Constant) and isinstance(node.value, str) and len(node.value) > 200:
            raise ExprError("text constants are limited to 200 characters")
    if count > MAX_NODES:
        raise ExprError(f"expression has more than {MAX_NODES} parts")
    if _depth(tree) > MAX_DEPTH:
        raise ExprError(f"expression nested deeper than {MAX_DEPTH} levels")
    rw = _Rewrite()
    body = rw.visit(tree.body)
    stmt = ast.Expr(value=body)
    ast.fix_missing_locations(stmt)
    return Expr(text, frozenset(rw.names), stmt)
