"""Decimal comma in number entry: accepted where it has one reading, refused
with a message where it could be a thousands separator — in the inspector, in
the command line and in :func:`droprig.units.normalise_decimal`.

Rule checked against: BIPM, The International System of Units (SI Brochure,
9th ed., 2019), §5.4.4, and ISO 80000-1:2009, §7.3.2 — the decimal marker is
the point or the comma on the line; digits may be grouped in threes separated
by a thin space, never by a point or a comma. So a point or comma followed by
three digits may be either mark in text from an unknown writer (from memory,
both clauses).
"""

from __future__ import annotations

import pytest

from droprig import units
from droprig.cli import main
from droprig.gui.document import Document, Selection
from droprig.gui.inspector import Inspector
from droprig.io.sections import get_grade, get_section
from droprig.model import LiftLoad, LiftZone, Project, generate_level

REL = 1e-12


@pytest.fixture(autouse=True)
def _point_locale():
    units.set_decimal_mark(".")
    yield
    units.set_decimal_mark(".")


@pytest.mark.parametrize(("text", "mark", "expected_m"), [
    ("1,5 m", ".", 1.5),        # one reading: a group of thousands has three digits
    ("1,5 m", ",", 1.5),
    ("0,125 m", ".", 0.125),    # a leading zero is never grouped
    ("1.500 m", ".", 1.5),      # the locale's own mark
    ("1,500 m", ",", 1.5),      # the locale's own mark
    ("12,75", ".", 12.75),      # bare number: display unit m
    ("2,5e3 mm", ".", 2.5),
    ("4,5 in", ",", 4.5 * 0.0254),  # NIST SP 811 B.8: 1 in = 0.0254 m exactly
])
def test_a_decimal_comma_with_one_reading(text: str, mark: str, expected_m: float) -> None:
    units.set_decimal_mark(mark)
    assert units.parse(text, "length", "SI", field="Drop height") == \
        pytest.approx(expected_m, rel=REL)


@pytest.mark.parametrize(("text", "mark"), [
    ("1,500 m", "."),      # thousands or decimals: refused, never guessed
    ("1.500 m", ","),
    ("1,500,000 kg", "."),
    ("1.500,5 kg", ","),
    ("1,500.5 kg", "."),
])
def test_ambiguous_or_grouped_numbers_are_refused_naming_the_field(text: str,
                                                                  mark: str) -> None:
    units.set_decimal_mark(mark)
    q = "mass" if "kg" in text else "length"
    with pytest.raises(units.UnitError) as exc:
        units.parse(text, q, "SI", field="Drop height")
    msg = str(exc.value)
    assert msg.startswith("Drop height: ") and "write" in msg


def test_normalise_decimal_leaves_plain_text_alone() -> None:
    for t in ("12 m", "2e6 N/m", "300 mm", "50 kN/mm", "W16X26", "1 t"):
        assert units.normalise_decimal(t, ".") == t
        assert units.normalise_decimal(t, ",") == t


# ------------------------------------------------------------------ the inspector


def _project() -> Project:
    level = generate_level(
        level_id="L1", name="Roof", elevation=10.0, x_spacings=(6.0,), y_spacings=(5.0,),
        girder_direction="x", beam_spacing=2.5, girder_section=get_section("IPE 400"),
        beam_section=get_section("IPE 240"), girder_grade=get_grade("S355"),
        beam_grade=get_grade("S355"))
    zone = LiftZone(id="Z1", name="Crane", level_id="L1", crane=(-3.0, 2.5), r_min=2.0,
                    r_max=9.0, loads=(LiftLoad(name="Skid", mass=1500.0, drop_height=0.8),))
    return Project(levels=(level,), lift_zones=(zone,))


@pytest.mark.gui
def test_inspector_reads_1_5_m_as_one_and_a_half_metres(qtbot) -> None:
    doc = Document(_project())
    insp = Inspector(doc)
    qtbot.addWidget(insp)
    doc.select(Selection("load", ("Z1", "Skid")))
    box = insp.editor("drop_height")
    box.setText("1,5 m")
    box.editingFinished.emit()
    assert doc.project.zone("Z1").loads[0].drop_height == pytest.approx(1.5, rel=REL)
    box = insp.editor("drop_height")
    box.setText("1,500 m")
    box.editingFinished.emit()
    assert doc.project.zone("Z1").loads[0].drop_height == pytest.approx(1.5, rel=REL)
    assert "Drop height" in insp.message and "ambiguous" in insp.message
    assert "Nothing was changed" in insp.message


# ------------------------------------------------------------------ the command line

CHECK = ["check", "--section", "IPE 300", "--grade", "S355", "--span", "6 m", "--at", "3 m",
         "--mass", "500 kg", "--json"]


def test_cli_reads_a_decimal_comma_like_a_point(capsys, monkeypatch) -> None:
    import json

    monkeypatch.setattr(units, "system_decimal_mark", lambda: ".")
    assert main([*CHECK, "--drop", "0.25 m"]) == 0
    point = json.loads(capsys.readouterr().out)
    assert main([*CHECK, "--drop", "0,25 m"]) == 0
    comma = json.loads(capsys.readouterr().out)
    assert comma == point


def test_cli_refuses_an_ambiguous_number(capsys, monkeypatch) -> None:
    monkeypatch.setattr(units, "system_decimal_mark", lambda: ".")
    assert main([*CHECK, "--drop", "1,500 mm"]) == 2
    err = capsys.readouterr().err
    assert "ambiguous" in err and "1500" in err


def test_cli_takes_the_locale_mark(capsys, monkeypatch) -> None:
    import json

    monkeypatch.setattr(units, "system_decimal_mark", lambda: ",")
    assert main([*CHECK, "--drop", "1,250 m"]) == 0  # in a comma locale: 1.25 m
    comma = json.loads(capsys.readouterr().out)
    monkeypatch.setattr(units, "system_decimal_mark", lambda: ".")
    assert main([*CHECK, "--drop", "1.25 m"]) == 0
    assert json.loads(capsys.readouterr().out) == comma
