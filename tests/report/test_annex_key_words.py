"""The annex's bay table explains every tag it can print (a P row had no key: the
sentence named E, Y and X only). Our own wording rule, no engineering source."""

from __future__ import annotations

from droprig.outcomes import NOT_ASSESSED, ORDER, OUTCOMES
from droprig.report.annex import outcome_key_words


def test_every_printed_tag_is_explained() -> None:
    words = outcome_key_words()
    for key in (*ORDER, NOT_ASSESSED):
        assert f"{OUTCOMES[key].tag} " in words, key
    assert "P may go through" in words
    # one list, one comma between entries (the label "Yields, within limits" keeps none)
    assert words.count(",") == len(ORDER)
