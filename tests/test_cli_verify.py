"""``droprig verify`` through :func:`droprig.cli.main`.

Sources: the command contract is droprig's own (0 ok, 2 bad input naming the field);
the energy column is droprig check's peak force (Gere 7th ed. §9.10, tested in
tests/solver/test_member.py); the time history is tested against Blevins Table 8-1
and Gere §9.10 in tests/solver/test_timehistory.py; PNG files start with the
8-byte signature of the PNG specification (ISO/IEC 15948:2004 §5.2).
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from droprig.cli import CAUTION, main
from droprig.io.sections import get_grade, get_section
from droprig.solver.member import assess_member

FT, IN, LB = 0.3048, 0.0254, 0.45359237
REL = 1e-9
REL_TABLE = 1e-6  # the floor's Rayleigh-mass tables (loadpath._XI, linear interpolation)
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"

# an invented demo case: a light shackle-and-sling set on a 24 ft floor beam
EXAMPLE = ["verify", "--section", "W16X26", "--grade", "A992", "--span", "24ft", "--at",
           "9ft", "--mass", "60lb", "--drop", "3ft", "--load-stiffness", "20 kN/mm"]


def _run(argv: list[str], capsys: pytest.CaptureFixture[str]) -> tuple[int, str, str]:
    rc = main(argv)
    out, err = capsys.readouterr()
    return rc, out, err


def test_energy_column_is_droprig_check_at_midspan(capsys: pytest.CaptureFixture[str],
                                                   ) -> None:
    # the energy column is droprig check's own energy-method force (the chain that
    # makes the verdict: the same numbers), at midspan and off it (the floor's mass
    # table is interpolated: REL_TABLE)
    argv = [*EXAMPLE, "--json"]
    argv[argv.index("9ft")] = "12ft"
    rc, out, err = _run(argv, capsys)
    assert rc == 0, err
    data = json.loads(out)
    ref = assess_member(get_section("W16X26"), get_grade("A992"), "simple", 24 * FT,
                        12 * FT, 60 * LB, 36 * IN, basis="aisc360", load_stiffness=20e6)
    assert data["energy_method"]["force"] == pytest.approx(ref["peak_force"], rel=REL_TABLE)
    rc, out, err = _run([*EXAMPLE, "--json"], capsys)
    off = assess_member(get_section("W16X26"), get_grade("A992"), "simple", 24 * FT, 9 * FT,
                        60 * LB, 36 * IN, basis="aisc360", load_stiffness=20e6)
    assert json.loads(out)["energy_method"]["force"] == pytest.approx(off["peak_force"],
                                                                      rel=REL_TABLE)


def test_json_verify_fields(capsys: pytest.CaptureFixture[str]) -> None:
    rc, out, err = _run([*EXAMPLE, "--json"], capsys)
    assert rc == 0, err
    data = json.loads(out)
    assert data["caution"] == CAUTION
    for key in ("force", "moment", "shear", "deflection"):
        th = data["time_history"][key]
        assert th > 0
        assert data["energy_over_time_history"][key] == pytest.approx(
            data["energy_method"][key] / th, rel=REL)
        # the amplified demand is never below the time history
        assert data["amplified_demand"][key] >= th
    # a 60 lb set on a 26 lb/ft, 24 ft beam: light — the energy method reads low
    assert data["mass_ratio"] < 1.0
    assert data["energy_over_time_history"]["moment"] < 1.0


def test_table_carries_caution_and_plots(tmp_path: Path,
                                         capsys: pytest.CaptureFixture[str]) -> None:
    rc, out, err = _run([*EXAMPLE, "--plots", str(tmp_path / "plots")], capsys)
    assert rc == 0, err
    assert CAUTION in out
    for name in ("verify_force.png", "verify_deflection.png", "verify_moment.png"):
        p = tmp_path / "plots" / name
        assert p.read_bytes()[:8] == PNG_SIGNATURE
        assert str(p) in out
    assert not list((tmp_path / "plots").glob(".*.tmp"))


def test_rigid_contact_is_stated(capsys: pytest.CaptureFixture[str]) -> None:
    argv = [a for a in EXAMPLE if a not in ("--load-stiffness", "20 kN/mm")]
    rc, out, err = _run(argv, capsys)
    assert rc == 0, err
    assert "rigid contact" in out


@pytest.mark.parametrize(("extra", "field"), [
    (["--crush-force", "50kN", "--crush-stroke", "50mm"], "--crush-force"),
    (["--mass", "0.1kg"], "--mass"),
])
def test_bad_input_names_the_field(extra: list[str], field: str,
                                   capsys: pytest.CaptureFixture[str]) -> None:
    rc, out, err = _run([*EXAMPLE, *extra], capsys)
    assert rc == 2
    assert field in err and "Traceback" not in err
    assert out == ""


def test_point_on_support_refused(capsys: pytest.CaptureFixture[str]) -> None:
    argv = list(EXAMPLE)
    argv[argv.index("9ft")] = "0ft"
    rc, _, err = _run(argv, capsys)
    assert rc == 2 and "--at" in err


# --------------------------------------------------------------------------- project mode
DEMO = str(Path(__file__).resolve().parents[1] / "demo_projects" / "rooftop_plant_swap.droprig")


def test_project_table_every_bay(capsys: pytest.CaptureFixture[str]) -> None:
    rc, out, err = _run(["verify", DEMO], capsys)
    assert rc == 0, err
    assert CAUTION in out
    assert "energy method ÷ time history" in out


def _amplified_demo(tmp_path: Path) -> str:
    """The demo with the project setting dynamic_amplification on, saved in tmp_path."""
    import dataclasses

    from droprig.io.project_file import load_project, save_project

    p = load_project(DEMO)
    p = dataclasses.replace(p, settings=dataclasses.replace(
        p.settings, dynamic_amplification=True))
    f = tmp_path / "amplified.droprig"
    save_project(p, f)
    return str(f)


def test_project_one_point_json_and_plots(tmp_path: Path,
                                          capsys: pytest.CaptureFixture[str]) -> None:
    rc, out, err = _run(["verify", DEMO, "--bay", "1-2/B-C", "--load", "AHU-3 (old, drained)",
                         "--plots", str(tmp_path), "--json"], capsys)
    assert rc == 0, err
    data = json.loads(out)
    assert len(data["points"]) == 1 and data["caution"] == CAUTION
    pt = data["points"][0]
    # the force row compares the force the deck's checks take (under this declared
    # soft underside the chain's contact force F_c) beside the time history's. For
    # this heavy unit on a soft underside (r ≈ 10, κ ≈ 0.18) the chain's two-mass
    # contact force (CEB Bulletin 187 two-mass, from memory) must not read below the
    # member's own time history (the independent method), and the chain's force on the
    # framing is a part of it
    assert pt["energy_method"]["force"] >= pt["time_history"]["force"]
    assert 0.0 < pt["chain_peak_force"] <= pt["energy_method"]["force"] * (1 + 1e-9)
    assert len(data["plots"]) == 3
    for p in data["plots"]:
        assert Path(p).read_bytes()[:8] == PNG_SIGNATURE
    # with amplification on the verdict's demands are the chain's amplified ones, which
    # must cover the point's time history (the independent method); with it off they
    # are the chain's energy method (amplified_demand then equals it)
    for key in ("force", "moment", "shear", "deflection"):
        assert pt["amplified_demand"][key] == pytest.approx(pt["energy_method"][key], rel=REL)
    rc, out, err = _run(["verify", _amplified_demo(tmp_path), "--bay", "1-2/B-C", "--load",
                         "AHU-3 (old, drained)", "--json"], capsys)
    assert rc == 0, err
    pt = json.loads(out)["points"][0]
    for key in ("force", "moment", "shear", "deflection"):
        assert pt["amplified_demand"][key] >= pt["time_history"][key]


@pytest.mark.parametrize(("extra", "field"), [
    (["--lift", "NOPE"], "--lift"),
    (["--bay", "9-9/Z-Z"], "--bay"),
    (["--section", "W16X26"], "--section"),
    (["--plots", "unused"], "--plots"),  # more than one point selected
])
def test_project_bad_input_names_the_field(extra: list[str], field: str,
                                           capsys: pytest.CaptureFixture[str]) -> None:
    rc, _, err = _run(["verify", DEMO, *extra], capsys)
    assert rc == 2 and field in err and "Traceback" not in err


def test_member_options_or_file_required(capsys: pytest.CaptureFixture[str]) -> None:
    rc, _, err = _run(["verify"], capsys)
    assert rc == 2 and "--section" in err
    rc, _, err = _run(["verify", "--bay", "1-2/A-B"], capsys)
    assert rc == 2 and "--bay" in err
    rc, _, err = _run([*EXAMPLE, "--slab-mass"], capsys)
    assert rc == 2 and "--slab-mass" in err and "FILE" in err


def test_slab_mass_is_stated(capsys: pytest.CaptureFixture[str]) -> None:
    """The header and the JSON say which mass the struck member carries: by default
    (and with ``--slab-mass``) its steel, the deck and the superimposed dead load;
    with ``--steel-mass`` its steel alone (tests/solver/test_verify_struck_member.py
    checks the mass by hand)."""
    one = ["verify", DEMO, "--bay", "1-2/B-C", "--load", "AHU-3 (old, drained)"]
    rc, out, err = _run(one, capsys)
    assert rc == 0, err
    assert "carrying the mass of its steel, the deck and the superimposed dead load" in out
    rc, out, err = _run([*one, "--slab-mass", "--json"], capsys)
    assert rc == 0 and json.loads(out)["slab_mass"] is True, err
    rc, out, err = _run([*one, "--json"], capsys)
    assert rc == 0 and json.loads(out)["slab_mass"] is True, err
    rc, out, err = _run([*one, "--steel-mass"], capsys)
    assert rc == 0 and "carrying the mass of its steel alone" in out, err
    rc, out, err = _run([*one, "--steel-mass", "--json"], capsys)
    assert rc == 0 and json.loads(out)["slab_mass"] is False, err


def test_verdict_column_is_the_chains_own_force_with_amplification_off() -> None:
    """With amplification off the "verdict uses" column is the chain's own force on the
    framing on the struck member's unit-load envelopes (what its checks take), not the
    verification's single-member energy method. Seen in the verify dialog under Xvfb:
    AHU-3 (new) crushing pad MAT1 on the rooftop demo read 191.8 kN·m "verdict uses",
    the pad's 90 kN alone, where the chain's framing force over the crush's duration
    is 180 kN (2 × the crush force: a rectangular pulse at least half the floor's
    period long, Biggs 1964 ch. 2, from memory)."""
    from droprig.io.project_file import load_project
    from droprig.solver import verify_point
    from droprig.solver.chain import Impact
    from droprig.solver.evaluate import governing_landing_chain, point_case

    p = load_project(DEMO)
    x, y = 7.375, 4.25
    case = point_case(p, "MC1", "AHU-3 (new)", x, y, fields=("lift", "load", "point"))
    _, chain = governing_landing_chain(case.fm, p, case.load, case.geo,
                                       case.zone.hoist_speed)
    F = float(chain[Impact].F[0])
    F_c = float(chain[Impact].contact[0])
    # 2 × F_c by hand (the exact crush history agrees within 3e-5); the default path
    # reads the crush table's envelope of that history, at most 2 % above it
    assert 2.0 * F_c <= F <= 1.02 * 2.0 * F_c, "the crushing pad's framing force"
    v = verify_point(p, "MC1", "AHU-3 (new)", x, y).verification
    assert v.verdict["force"] == pytest.approx(F_c, rel=REL)
    # the member's moment: its share w of F at the struck point of the simply supported
    # member, w·F·a·(L − a)/L (AISC Manual 15th ed. Table 3-23 case 7), so twice what
    # the pad's force alone gives
    pv = verify_point(p, "MC1", "AHU-3 (new)", x, y)
    assert pv.cond == "simple"
    w = v.energy["moment"] / (F * pv.a * (pv.L - pv.a) / pv.L)
    assert 0.5 <= w <= 1.0, "a lever-rule share of the larger member"
    # (7.375 − 5.0)/2.5 by the lever rule, beams at x = 5.0 and 7.5 m
    assert w == pytest.approx(0.95, abs=1e-9)
    assert v.verdict["moment"] == pytest.approx(v.energy["moment"], rel=REL)
    assert v.amplification == dict.fromkeys(v.amplification, 1.0)


@pytest.mark.parametrize("amplified", [False, True])
def test_project_table_says_what_the_verdict_used(amplified: bool, tmp_path: Path,
                                                  capsys: pytest.CaptureFixture[str]) -> None:
    # the note under the table follows the project's setting (it said "on unless the
    # project turns it off" while the default was off): one truth across surfaces,
    # as the annex's appendix B2 and the verify dialog (droprig's own contract)
    import dataclasses

    from droprig.io.project_file import load_project, save_project

    p = load_project(DEMO)
    p = dataclasses.replace(p, settings=dataclasses.replace(
        p.settings, dynamic_amplification=amplified))
    f = tmp_path / "p.droprig"
    save_project(p, f)
    rc, out, err = _run(["verify", str(f), "--bay", "3-4/B-C"], capsys)
    assert rc == 0, err
    flat = " ".join(out.split())
    if amplified:
        assert "The verdict uses the amplified demands" in flat
        assert "amplification is off" not in flat
    else:
        assert "Dynamic amplification is off in this project" in flat
        assert "uses the amplified demands" not in flat
