"""Text hygiene at the door (issue 16, item 8): model constructors — used by the
loader and by every field of the window — refuse lone surrogates, control and
bidi-override characters, and messages quote at most ~80 characters of a value.

Sources: Unicode Standard §3.9 D76 (surrogate code points are not characters; no
UTF-8 form, RFC 3629 §3); Unicode Standard Annex #9, Table 1 (explicit directional
formatting characters); CVE-2021-42574 for the risk of bidi overrides in names;
general category Cc (Unicode Character Database) for control characters.
"""

from __future__ import annotations

import pytest

from droprig.model import LiftLoad, ModelError, ProjectInfo
from droprig.model.errors import BIDI_CONTROLS, QUOTE_MAX, quote, text_problem


@pytest.mark.parametrize("ch", ["\ud800", "\udbff", "\udc00", "\udfff"])
def test_lone_surrogates_are_refused(ch: str) -> None:
    with pytest.raises(ModelError, match="lone surrogate"):
        ProjectInfo(name=f"Roof{ch}")


@pytest.mark.parametrize("ch", sorted(BIDI_CONTROLS))
def test_bidi_formatting_characters_are_refused(ch: str) -> None:
    with pytest.raises(ModelError, match="bidirectional"):
        LiftLoad(f"pump{ch}skid", 100.0)


@pytest.mark.parametrize("ch", ["\x00", "\x07", "\x1b", "\x7f", "\x85", "\x9f"])
def test_control_characters_are_refused(ch: str) -> None:
    with pytest.raises(ModelError, match="control character"):
        ProjectInfo(name="x", site=f"a{ch}b")


@pytest.mark.parametrize("text", ["Level 2 — east", "Bühne 3", "塔吊 1", "a\tb",
                                  "line\nbreak", "zero\u200bwidth", "emoji 🏗"])
def test_ordinary_text_is_kept(text: str) -> None:
    assert text_problem(text) is None
    assert ProjectInfo(name="x", description=text).description == text


def test_the_message_names_the_position() -> None:
    assert text_problem("abc\x07") == "a control character U+0007 at character 4"


def test_messages_quote_a_long_value_short_and_printable() -> None:
    long = "\u202e" + "x" * 10_000
    with pytest.raises(ModelError) as info:
        ProjectInfo(name="x", description=long)
    msg = str(info.value)
    assert len(msg) < QUOTE_MAX + 200
    assert "\u202e" not in msg and "\\u202e" in msg
    msg.encode("utf-8")  # printable: no lone surrogate reaches a message
    assert quote("\ud800").encode("utf-8")
