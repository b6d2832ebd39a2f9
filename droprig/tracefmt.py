"""Putting numbers into a calculation trace's formulas (an edge helper, Qt-free).

Used by the desktop trace panel and the PDF annex so a formula reads the same on
screen and on paper. Each caller passes its own value formatter (units and
rounding of its medium).
"""

from __future__ import annotations

import re
from collections.abc import Callable

ValueFormatter = Callable[[float, str], str]
"""(value in SI, quantity) -> text in the user's units."""

_NUMBER = re.compile(r"\d+(?:\.\d+)?")


def split_run(run: str, symbols: tuple[str, ...]) -> list[str] | None:
    """Split a run written without operators (``2ηh``, ``ηWh``) into numbers and
    input symbols; ``None`` when the run is not made only of them, so an ordinary
    word (``height``, ``max``) is never touched."""
    n = len(run)
    tail: list[list[str] | None] = [None] * (n + 1)
    tail[n] = []
    for i in range(n - 1, -1, -1):
        m = _NUMBER.match(run, i)
        options = [m.group(0)] if m else []
        options += [k for k in symbols if run.startswith(k, i)]
        for tok in sorted(options, key=len, reverse=True):
            rest = tail[i + len(tok)]
            if rest is not None:
                tail[i] = [tok, *rest]
                break
    return tail[0]


def substitute_all(formula: str, inputs: dict[str, tuple[float, str]],
                   fmt: ValueFormatter) -> tuple[str, list[str]]:
    """``formula`` with each input symbol replaced by ``fmt(value, quantity)``, and
    the input symbols that do not appear in it (to be listed beside it).

    Symbols are matched as whole tokens, longest first (``δ_st`` is not read as
    ``δ``); a run written without operators (``2ηh``) is split into its symbols
    and joined with ``·``; a value with a unit or a sign is bracketed unless it
    already stands alone in brackets: ``K = 1 + √(1 + 2·1.000·(2.900 m)/(2.4 mm))``.
    """
    if not inputs:
        return formula, []
    plain = tuple(sorted((k for k in inputs if re.fullmatch(r"\w+", k)), key=len,
                         reverse=True))
    special = sorted((k for k in inputs if k not in plain), key=len, reverse=True)
    alternatives = [r"(?<![\w.])" + re.escape(k) + r"(?![\w])" for k in special]
    pattern = re.compile("|".join([*alternatives, r"\w+"]))
    used: set[str] = set()

    def value(k: str, enclosed: bool) -> str:
        used.add(k)
        v, quantity = inputs[k]
        text = fmt(v, quantity)
        if (" " in text or text.startswith("-")) and not enclosed:
            return f"({text})"
        return text

    def repl(m: re.Match[str]) -> str:
        tok = m.group(0)
        enclosed = (m.start() > 0 and m.string[m.start() - 1] == "("
                    and m.end() < len(m.string) and m.string[m.end()] == ")")
        if tok in inputs:
            return value(tok, enclosed)
        parts = split_run(tok, plain)
        if not parts or not any(p in inputs for p in parts):
            return tok
        return "·".join(value(p, False) if p in inputs else p for p in parts)

    out = pattern.sub(repl, formula)
    return out, [k for k in inputs if k not in used]
