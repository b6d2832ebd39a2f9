"""``droprig check`` through :func:`droprig.cli.main`.

Source: the command contract is droprig's own (droprig/cli.py: 0 ok, 2 bad input with
the field named, never a traceback); the numbers are those of
droprig.solver.member.assess_member (tested against published values in
tests/solver/test_member.py); unit factors are exact (1 ft = 0.3048 m, 1 lb = 0.45359237 kg,
NIST SP 811).
"""

from __future__ import annotations

import json

import pytest

from droprig.cli import main
from droprig.io.sections import get_grade, get_section
from droprig.solver.member import RESULT_KEYS, assess_member
from droprig.texts import CAUTION

FT, IN, LB = 0.3048, 0.0254, 0.45359237
REL = 1e-12

EXAMPLE = ["check", "--section", "W16X26", "--grade", "A992", "--span", "24ft", "--at", "12ft",
           "--mass", "1500lb", "--drop", "6in"]


def _run(argv: list[str], capsys: pytest.CaptureFixture[str]) -> tuple[int, str, str]:
    rc = main(argv)
    out, err = capsys.readouterr()
    return rc, out, err


def test_json_equals_assess_member(capsys: pytest.CaptureFixture[str]) -> None:
    rc, out, err = _run([*EXAMPLE, "--json"], capsys)
    assert rc == 0, err
    data = json.loads(out)
    assert tuple(data) == RESULT_KEYS
    ref = assess_member(get_section("W16X26"), get_grade("A992"), "simple", 24 * FT, 12 * FT,
                        1500 * LB, 6 * IN, basis="aisc360")
    for k in RESULT_KEYS:
        if isinstance(ref[k], float):
            assert data[k] == pytest.approx(ref[k], rel=REL), k
        elif isinstance(ref[k], dict):  # the amplification factors (on by default)
            assert data[k]["set_by"] == ref[k]["set_by"]
            for q in ("force", "moment", "shear", "deflection", "mass_ratio"):
                assert data[k][q] == pytest.approx(ref[k][q], rel=REL), q
        else:
            assert data[k] == ref[k], k


def test_json_en_grade_defaults_to_en1993(capsys: pytest.CaptureFixture[str]) -> None:
    rc, out, err = _run(["check", "--section", "IPE 300", "--grade", "S355", "--span", "6",
                         "--at", "2.5", "--mass", "2 t", "--drop", "300mm", "--support", "fixed",
                         "--udl", "5 kN/m", "--bearing", "100", "--json"], capsys)
    assert rc == 0, err
    ref = assess_member(get_section("IPE 300"), get_grade("S355"), "fixed", 6.0, 2.5, 2000.0,
                        0.3, basis="en1993", udl=5000.0, bearing=0.1)
    data = json.loads(out)
    assert data["peak_force"] == pytest.approx(ref["peak_force"], rel=REL)
    assert data["governing_check"] == ref["governing_check"]


def test_options_reach_the_solver(capsys: pytest.CaptureFixture[str]) -> None:
    rc, out, _ = _run([*EXAMPLE, "--json", "--crush-force", "20 kN", "--crush-stroke", "100mm",
                       "--no-self-weight", "--no-beam-mass", "--code", "en1993"], capsys)
    assert rc == 0
    ref = assess_member(get_section("W16X26"), get_grade("A992"), "simple", 24 * FT, 12 * FT,
                        1500 * LB, 6 * IN, basis="en1993", crush_force=20e3,
                        crush_stroke=0.1, self_weight=False, beam_mass=False)
    assert json.loads(out)["peak_force"] == pytest.approx(ref["peak_force"], rel=REL)


def test_table_has_units_verdict_and_caution(capsys: pytest.CaptureFixture[str]) -> None:
    # the energy method (the default, as the project setting): elastic
    rc, out, _ = _run(EXAMPLE, capsys)
    assert rc == 0
    assert "kip" in out and "RESPONSE: ELASTIC" in out
    assert "dynamic amplification: off" in out
    assert "information only" in out  # deflection is not a pass criterion
    assert out.rstrip().endswith(CAUTION)
    # amplified (as the floor analysis with the setting on): a rigid 1,500 lb load on
    # the bare flange takes the tables' rigid-contact factors and exceeds in web yielding
    rc, out, _ = _run([*EXAMPLE, "--amplified"], capsys)
    assert rc == 0
    assert "dynamic amplification (time-history calibration" in out
    assert "RESPONSE: EXCEEDS" in out
    assert out.rstrip().endswith(CAUTION)
    rc, out, _ = _run([*EXAMPLE, "--units", "SI"], capsys)
    assert rc == 0 and "kN" in out and out.rstrip().endswith(CAUTION)


@pytest.mark.parametrize(
    ("replace", "extra", "field"),
    [
        (("--span", "abc"), [], "--span"),
        (("--span", "0 ft"), [], "--span"),
        (("--at", "30ft"), [], "--at"),
        (("--at", "-1ft"), [], "--at"),
        (("--at", "0ft"), [], "--at"),  # on a rigid support without a cushion
        (("--mass", "-5lb"), [], "--mass"),
        (("--mass", "3 m"), [], "--mass"),
        (("--drop", "2 kg"), [], "--drop"),
        (("--section", "W99"), [], "--section"),
        (("--grade", "X1"), [], "--grade"),
        (None, ["--bearing", "50ft"], "--bearing"),
        (None, ["--cushion-stiffness", "0 N/m"], "--cushion-stiffness"),
        (None, ["--crush-force", "10 kN"], "--crush-stroke"),
        (None, ["--crush-force", "10 kN", "--crush-stroke", "9 m"], "--crush-stroke"),
        (None, ["--udl=-2 kN/m"], "--udl"),
    ],
)
def test_bad_values_exit_2_naming_the_field(capsys: pytest.CaptureFixture[str],
                                            replace: tuple[str, str] | None,
                                            extra: list[str], field: str) -> None:
    argv = list(EXAMPLE)
    if replace:  # "--opt=value" so that a value starting with "-" reaches droprig
        i = argv.index(replace[0])
        argv[i:i + 2] = [f"{replace[0]}={replace[1]}"]
    rc, out, err = _run([*argv, *extra, "--json"], capsys)
    assert rc == 2
    assert out == ""
    assert f"{field}:" in err
    assert "Traceback" not in err
