"""The annex's numbered reference list (appendix C) and the citations the
calculation sheets print instead of the solver's free-text sources.

A trace step names its source in words (``"AISC 360-16 F2.1 / EN 1993-1-1 Eq.
6.13"``, ``"Gere, Mechanics of Materials 7th ed., §9.10, Eq. 9-94"``). The annex
prints ``[4] F2.1`` or ``[2] §9.10, Eq. 9-94`` and lists the documents once, with
their editions, in appendix C. Clauses of a design basis the project does not use
are dropped (an EN 1993 project cites EN clauses only), and internal names of
droprig's code never reach the page.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from droprig.model import Project


@dataclass(frozen=True)
class Reference:
    """One document of appendix C. ``pattern``: how a trace source names it (regex);
    ``basis``: the design basis it belongs to (``None``: any)."""

    key: str
    text: str
    pattern: str
    basis: str | None = None


REFERENCES: tuple[Reference, ...] = (
    Reference("gere", "Gere, J. M. and Goodno, B. J., Mechanics of Materials, 7th ed., "
              "Cengage, 2009 — §9.10 impact loading (energy method), Eq. 9-94.",
              r"Gere,? Mechanics of Materials 7th ed\.,?"),
    Reference("timoshenko", "Timoshenko, S., Strength of Materials, Part I, 3rd ed., Van "
              "Nostrand, 1955 — impact with the mass of the struck beam; Rayleigh's "
              "method in the static deflected shape.",
              r"Timoshenko,? Strength of Materials Part I"),
    Reference("aisc_manual", "AISC, Steel Construction Manual, 15th ed., 2017 — Table 3-23, "
              "shears, moments and deflections of beams.", r"AISC Manual(?: 15th ed\.)?"),
    Reference("roark", "Young, W. C. and Budynas, R. G., Roark's Formulas for Stress and "
              "Strain, 7th ed., McGraw-Hill, 2002 — Table 8.1, beams.", r"Roark 7th ed\.?"),
    Reference("aisc360", "ANSI/AISC 360-16, Specification for Structural Steel Buildings, "
              "AISC, 2016 — F2, F3 flexure; G2.1 shear; J10.2 web local yielding; J10.3 "
              "web crippling; Appendix 1 §1.3.2b plastic hinges.", r"AISC 360-16", "aisc360"),
    Reference("en1993_1_1", "EN 1993-1-1:2005 + AC:2009, Eurocode 3: Design of steel "
              "structures, Part 1-1 — Eq. 6.13, 6.14 bending; Eq. 6.18 shear; §5.6 "
              "plastic global analysis; Table 5.2 classification.", r"EN 1993-1-1",
              "en1993"),
    Reference("en1993_1_5", "EN 1993-1-5:2006, Eurocode 3, Part 1-5: Plated structural "
              "elements — §5 shear buckling; §6 resistance to transverse forces (patch "
              "loading).", r"EN 1993-1-5", "en1993"),
    Reference("aci318", "ACI 318-19, Building Code Requirements for Structural Concrete, "
              "ACI, 2019 — §22.2 flexural strength; §22.6 two-way (punching) shear.",
              r"ACI 318-19", "aisc360"),
    Reference("en1992", "EN 1992-1-1:2004 + AC:2010, Eurocode 2: Design of concrete "
              "structures, Part 1-1 — §3.1.7 stress block; §6.4.4 punching shear.",
              r"EN 1992-1-1", "en1993"),
    Reference("sneddon", "Sneddon, I. N., The relation between load and penetration in the "
              "axisymmetric Boussinesq problem, Int. J. Engng Sci. 3 (1965) 47–57 — rigid "
              "flat punch on an elastic half-space.", r"Sneddon 1965"),
    Reference("johnson", "Johnson, K. L., Contact Mechanics, Cambridge University Press, "
              "1985 — §3.8 flat punch; ch. 6 plastic indentation.", r"Johnson,? Contact Mechanics"),
    Reference("biggs", "Biggs, J. M., Introduction to Structural Dynamics, McGraw-Hill, "
              "1964 — ch. 5, elastic–plastic resistance and ductility.",
              r"Biggs,? Introduction to Structural Dynamics \(1964\)"),
    Reference("ufc", "UFC 3-340-02, Structures to Resist the Effects of Accidental "
              "Explosions, US Department of Defense, 2008 — ch. 3, ductility and support "
              "rotation limits.", r"UFC 3-340-02"),
    Reference("dnv", "DNV-RP-C204, Design against Accidental Loads, DNV, 2010 — accidental "
              "limit state, no plastic reserve in brittle modes (cited from memory).",
              r"DNV-RP-C204"),
    Reference("ibc", "International Building Code 2021, ICC — Table 1604.3 deflection "
              "limits (serviceability; information only for an accidental impact).",
              r"IBC Table 1604\.3"),
    Reference("neal", "Neal, B. G., The Plastic Methods of Structural Analysis, 3rd ed., "
              "Chapman and Hall, 1977 — virtual work, collapse loads of beams.",
              r"virtual work \(Neal\)"),
    Reference("toolbox", "Engineering ToolBox, Impact Force, "
              "https://www.engineeringtoolbox.com/impact-force-d_1780.html — springs in "
              "series, stopping distance.", r"Engineering ToolBox,? Impact Force"),
    Reference("kennedy", "Kennedy, R. P., A review of procedures for the analysis and "
              "design of concrete structures to resist missile impact effects, Nucl. Eng. "
              "Des. 37 (1976) 183–203 — modified NDRC penetration, scabbing and "
              "perforation (cited from memory).", r"Kennedy 1976"),
    Reference("li2005", "Li, Q. M., Reid, S. R., Wen, H. M. and Telford, A. R., Local "
              "impact effects of hard missiles on concrete targets, Int. J. Impact Eng. 32 "
              "(2005) 224–284 — review of the NDRC, UKAEA, Barr, Chang and BRL formulas "
              "(cited from memory).", r"Li et al\. 2005"),
    Reference("doe3014", "DOE-STD-3014, Accident Analysis for Aircraft Crash into "
              "Hazardous Facilities, US Department of Energy — Appendix C, local damage "
              "of concrete and steel barriers by hard missiles, design margins.",
              r"DOE-STD-3014(?: App\. C)?"),
    Reference("practice", "Common practice of structural engineering with no single "
              "published source (statics of the load path, lever rule over a one-way "
              "deck strip, springs in series, largest demand/resistance ratio, Newton's "
              "second law, plan geometry, the project's own input data).",
              r"\(?common practice, no source\)?"),
)

_BASIS_PAIRS = (
    # (AISC-side name, EN-side name) joined by " / " in one trace source
    (r"AISC 360-16", r"EN 199[23]-1-[15]"),
    (r"ACI 318-19", r"EN 1992-1-1"),
)

_INTERNAL = re.compile(
    r"\s*\((?:droprig|LiftLoad)[\w.]*(?:\.\w+)*\)|;?\s*droprig(?:\.\w+)+|\bLiftLoad\.\w+")
"""Internal names of droprig's code (module paths, class attributes)."""

_PLAIN = {
    # sources written in words that name no document: cited as common practice
    "plan geometry": "practice",
    "Newton's second law": "practice",
    "linear checks": "practice",
    "load data": "practice",
    "Maxwell–Betti": "practice",
    "statics of the member tree": "practice",
    "springs in series": "practice",
    "series springs": "practice",
    "lever rule": "practice",
    "uniform acceleration": "practice",
    "largest demand/resistance ratio": "practice",
}


def applicable(project: Project) -> tuple[Reference, ...]:
    """The references of appendix C for ``project``'s design basis, in order."""
    basis = project.settings.design_basis
    return tuple(r for r in REFERENCES if r.basis in (None, basis))


def numbers(project: Project) -> dict[str, int]:
    """Reference key -> its number in appendix C (1-based)."""
    return {r.key: k + 1 for k, r in enumerate(applicable(project))}


def _keep_basis(part: str, basis: str) -> bool:
    if basis == "en1993":
        return not re.search(r"AISC 360|ACI 318", part)
    return not re.search(r"EN 199\d", part)


def cite(source: str, project: Project) -> str:
    """A trace step's ``source`` as printed on a calculation sheet: document names
    replaced by their appendix C numbers, clauses kept, clauses of the other design
    basis and internal names of droprig's code removed.

    >>> cite("AISC 360-16 F2.1 / EN 1993-1-1 Eq. 6.13 (droprig.solver.capacity)", p)
    '[5] Eq. 6.13'   # on an EN project
    """
    basis = project.settings.design_basis
    nums = numbers(project)
    text = _INTERNAL.sub("", source)
    # split alternatives written for both design bases and keep this basis's one
    parts = [p.strip() for p in re.split(r"\s+/\s+(?=[A-Z])", text)]
    parts = [p for p in parts if _keep_basis(p, basis)] or parts
    text = " / ".join(parts)
    cited: list[str] = []
    for ref in applicable(project):
        def repl(m: re.Match[str], ref: Reference = ref) -> str:
            cited.append(ref.key)
            return f"[{nums[ref.key]}]"

        text = re.sub(ref.pattern, repl, text)
    # plain-words sources -> the common-practice reference
    for words, key in _PLAIN.items():
        if words in text:
            text = text.replace(words, f"[{nums[key]}] {words}", 1) if key not in cited \
                else text
            cited.append(key)
    text = re.sub(r"\s+", " ", text).strip(" ;,")
    text = re.sub(r"\(\s*\)", "", text)
    return text


def strip_internal(text: str) -> str:
    """``text`` without internal names of droprig's code (module paths)."""
    return re.sub(r"\s+", " ", _INTERNAL.sub("", text))


def cited_numbers(text: str) -> list[int]:
    """The reference numbers a printed source cites (``[3] …; [7]`` -> [3, 7])."""
    return [int(n) for n in re.findall(r"\[(\d+)\]", text)]
