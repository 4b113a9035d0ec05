"""Passage freshness (docs/freshness.md): each reason, the specificity order, horizons, F and A.

Passages are run through the real extractor, so these tests hold the two modules together the way
ingest and audit use them. Audit date and horizon are fixed; every expected date and day count
below is worked out by hand from the calendar.
"""

from __future__ import annotations

from datetime import date, timedelta

import pytest

from auditor.config import FreshnessConfig, HorizonRule, load_config
from auditor.judgement.freshness import corpus_freshness, horizon_for, is_range, passage_freshness
from auditor.models import Freshness, TemporalExpression
from auditor.temporal.extract import extract

T = date(2026, 12, 1)
H = 365


def fresh_of(
    text, *, doc_date=date(2026, 6, 1), source="front_matter:updated", expires=None, horizon=H, today=T, reference=None
):
    statements = extract(text, reference or doc_date)
    return passage_freshness(
        statements,
        audit_date=today,
        horizon_days=horizon,
        doc_date=doc_date,
        doc_date_source=source,
        doc_expires=expires,
    )


def test_recent_statement_is_fresh():
    f = fresh_of("As of March 1, 2026, the base charge is $19.10.")
    assert f == Freshness(
        as_of=date(2026, 3, 1), as_of_source="statement", expires=None, fresh=True, reasons=(), age_days=275
    )  # Mar..Nov 2026: 31+30+31+30+31+31+30+31+30 = 275


def test_too_old_statement_wins_over_a_recent_document_date():
    # the statement is more specific than the document's modification date
    f = fresh_of("As of February 2023, you can pay by phone.", doc_date=date(2026, 11, 2))
    assert f.as_of == date(2023, 2, 28) and f.as_of_source == "statement"
    assert f.reasons == ("too_old",) and not f.fresh
    assert f.age_days == 1372  # 2023-02-28 -> 2026-02-28: 365+366+365, then 276 days to Dec 1


def test_horizon_boundary_is_inclusive():
    # T − as_of ≤ H is fresh
    assert fresh_of("Updated 2025-12-01.", horizon=365).fresh
    f = fresh_of("Updated 2025-11-30.", horizon=365)
    assert f.age_days == 366 and f.reasons == ("too_old",)


def test_expired_validity_window():
    f = fresh_of("Rebate applications are accepted from March 1 to April 15, 2026.", doc_date=date(2026, 2, 1))
    assert f.reasons == ("expired",) and f.expires == date(2026, 4, 15)
    assert f.as_of == date(2026, 3, 1) and f.as_of_source == "statement"


def test_expiry_after_audit_date_is_fine():
    f = fresh_of("The senior discount is available until March 31, 2027.")
    assert f.fresh and f.expires == date(2027, 3, 31)
    assert f.as_of == date(2026, 6, 1) and f.as_of_source == "metadata"


def test_superseded_expiry_is_history_not_expired():
    text = "Effective March 1, 2026, the residential rate replaces the rate in force until February 28, 2026."
    f = fresh_of(text)
    assert f.fresh and f.as_of == date(2026, 3, 1) and f.expires is None


def test_document_expiry_from_metadata():
    f = fresh_of("Call the billing team for a payment plan.", expires=date(2026, 10, 31))
    assert f.reasons == ("expired",) and f.expires == date(2026, 10, 31)


def test_planned_event_past_is_overtaken():
    f = fresh_of("Crews will replace the water main on Alder Lane in spring 2026.", doc_date=date(2026, 1, 10))
    assert f.reasons == ("overtaken",)
    assert f.as_of == date(2026, 1, 10) and f.as_of_source == "metadata"


def test_planned_event_still_ahead_is_fresh():
    f = fresh_of("Crews will replace the water main on Alder Lane in spring 2027.", doc_date=date(2026, 10, 1))
    assert f.fresh


def test_past_event_is_not_overtaken():
    f = fresh_of("The Alder Lane main was replaced in spring 2026.", doc_date=date(2026, 7, 1))
    assert f.fresh and f.as_of_source == "metadata"


def test_future_effective_date_is_not_an_as_of():
    f = fresh_of("New rates take effect on January 1, 2027.", doc_date=date(2025, 10, 1))
    assert f.as_of == date(2025, 10, 1) and f.as_of_source == "metadata"
    assert f.reasons == ("too_old",)  # 2025-10-01 -> 2026-12-01 = 426 days


def test_period_is_used_when_no_as_of_statement():
    f = fresh_of("The 2024 rate schedule lists the tiers below.", doc_date=date(2026, 11, 1))
    assert f.as_of == date(2024, 12, 31) and f.as_of_source == "statement"
    assert f.reasons == ("too_old",) and f.age_days == 700  # 2024-12-31 -> 2026-12-01


def test_as_of_beats_period():
    f = fresh_of("Reviewed 2026-09-15: the 2024 water quality report is the latest one published.")
    assert f.as_of == date(2026, 9, 15)


def test_several_reasons_together():
    text = "As of March 2024, crews will replace the Birch Road main in summer 2024. Offer valid until May 1, 2024."
    f = fresh_of(text, doc_date=date(2024, 3, 10))
    assert f.reasons == ("too_old", "expired", "overtaken")
    assert f.as_of == date(2024, 3, 31)


@pytest.mark.parametrize(
    "source, expected", [("front_matter:updated", "metadata"), ("pdf:info:ModDate", "metadata"), ("file:mtime", "file")]
)
def test_specificity_statement_metadata_file(source, expected):
    undated_text = "Call the billing team for a payment plan."
    assert fresh_of(undated_text, source=source).as_of_source == expected
    dated_text = "Last updated on 2026-10-01. Call the billing team for a payment plan."
    assert fresh_of(dated_text, source=source).as_of_source == "statement"


def test_undated_passage_is_fresh_but_marked_none():
    f = passage_freshness([], audit_date=T, horizon_days=H, doc_date=None, doc_date_source=None)
    assert f == Freshness(as_of=None, as_of_source="none", expires=None, fresh=True, reasons=(), age_days=None)


def test_undated_passage_can_still_expire():
    statements = extract("Offer valid until May 1, 2024.", date(2024, 1, 1))
    f = passage_freshness(statements, audit_date=T, horizon_days=H, doc_date=None, doc_date_source=None)
    assert f.as_of is None and f.reasons == ("expired",)


def test_audit_date_is_honoured():
    # the same passage, audited at two dates
    text = "Applications close on March 31, 2026."
    assert fresh_of(text, today=date(2026, 3, 1)).fresh
    assert fresh_of(text, today=date(2026, 4, 1)).reasons == ("expired",)


def test_is_range():
    one_day = TemporalExpression("", "", date(2024, 7, 1), date(2024, 7, 1), "day", "effective")
    window = TemporalExpression("", "", date(2024, 7, 1), date(2025, 6, 30), "day", "effective")
    fiscal = TemporalExpression("", "", date(2024, 7, 1), date(2025, 6, 30), "year", "period")
    assert not is_range(one_day) and is_range(window) and not is_range(fiscal)


# --- horizons -----------------------------------------------------------------------------------------

CONFIG = FreshnessConfig(
    horizon_days=365,
    rules=(
        HorizonRule(horizon_days=30, path="advisories/*"),
        HorizonRule(horizon_days=730, path="**/*.pdf"),
        HorizonRule(horizon_days=90, topic="Outages"),
    ),
)


def test_horizon_precedence():
    assert horizon_for(CONFIG) == 365
    assert horizon_for(CONFIG, path="billing/rates.md") == 365
    assert horizon_for(CONFIG, path="advisories/boil-water.md") == 30
    assert horizon_for(CONFIG, path="reports/2023/quality.pdf") == 730
    assert horizon_for(CONFIG, path="quality.pdf") == 730  # "**/" may match no folder
    assert horizon_for(CONFIG, path="advisories/boil-water.md", topic="outages") == 90  # topic > path
    assert horizon_for(CONFIG, path="advisories/boil-water.md", topic="outages", override=7) == 7
    assert horizon_for(CONFIG, topic="payments") == 365
    assert horizon_for(CONFIG, override=0) == 0


def test_horizon_rules_from_a_config_file(tmp_path):
    path = tmp_path / "audit.toml"
    path.write_text(
        "[freshness]\nhorizon_days = 180\n"
        '[[freshness.rules]]\npath = "rates/**"\nhorizon_days = 400\n'
        '[[freshness.rules]]\ntopic = "advisories"\nhorizon_days = 14\n',
        encoding="utf-8",
    )
    config = load_config(path, env={})
    assert horizon_for(config.freshness, path="rates/2025/residential.md") == 400
    assert horizon_for(config.freshness, topic="Advisories") == 14
    assert horizon_for(config.freshness, path="faq.md") == 180


# --- corpus figures -----------------------------------------------------------------------------------


def test_corpus_freshness_and_age_by_hand():
    # Cho & Garcia-Molina 2000: F = (1/N) Σ F_i; A = (1/N) Σ A_i with A_i = 0 when up to date.
    items = [
        Freshness(date(2026, 11, 1), "statement", None, True, (), 30),
        Freshness(date(2025, 1, 1), "metadata", None, False, ("too_old",), 699),
        Freshness(date(2026, 6, 1), "statement", date(2026, 7, 1), False, ("expired",), 183),
        Freshness(None, "none", None, True, (), None),
    ]
    F, A = corpus_freshness(items)
    assert F == pytest.approx(2 / 4)
    assert A == pytest.approx((0 + 699 + 183 + 0) / 4)


def test_corpus_freshness_empty():
    assert corpus_freshness([]) == (1.0, 0.0)


def test_review_after_an_expiry_does_not_excuse_it():
    text = "Reviewed 2026-06-01. Rebate applications are accepted until March 31, 2026."
    f = fresh_of(text)
    assert f.as_of == date(2026, 6, 1) and f.reasons == ("expired",) and f.expires == date(2026, 3, 31)


def test_review_after_a_planned_event_does_not_excuse_it():
    text = "Reviewed 2026-07-01. Crews will replace the Alder Street main in spring 2026."
    assert fresh_of(text).reasons == ("overtaken",)


# --- TIMEX3 kinds (docs/dates.md, docs/freshness.md) -------------------------------------------------


def test_currently_pins_the_as_of_to_the_document_date():
    # the document is dated 2026-11-20; "currently" says the fee holds on that date, not only on
    # the older "Updated March 2025" (which alone would make the passage too old on 2027-01-15)
    text = "Updated March 2025: the late fee is currently $12."
    f = fresh_of(text, doc_date=date(2026, 11, 20), today=date(2027, 1, 15))
    assert (f.as_of, f.as_of_source, f.fresh, f.age_days) == (date(2026, 11, 20), "statement", True, 56)
    older = fresh_of("Updated March 2025: the late fee is $12.", doc_date=date(2026, 11, 20), today=date(2027, 1, 15))
    assert (older.as_of, older.reasons) == (date(2025, 3, 31), ("too_old",))


def test_a_validity_window_counted_from_a_date_expires_at_its_end():
    # reference: Python's date arithmetic, date(2026, 3, 1) + timedelta(days=90) == date(2026, 5, 30)
    end = date(2026, 3, 1) + timedelta(days=90)
    text = "The permit is valid for 90 days from 1 March 2026."
    on_the_day = fresh_of(text, doc_date=date(2026, 2, 15), today=end)
    assert on_the_day.expires == end == date(2026, 5, 30) and on_the_day.fresh
    after = fresh_of(text, doc_date=date(2026, 2, 15), today=end + timedelta(days=1))
    assert after.expires == end and after.reasons == ("expired",)
    assert after.as_of == date(2026, 3, 1)


def test_a_schedule_never_makes_a_passage_stale():
    # "every Tuesday" recurs: however long after the document date, it is no stale date; the
    # passage's age still counts from the document date
    for text in ("Meters are read every Tuesday.", "Rate tables are reviewed annually in April."):
        f = fresh_of(text, doc_date=date(2026, 11, 2), today=date(2027, 6, 1))
        assert f == Freshness(
            as_of=date(2026, 11, 2), as_of_source="metadata", expires=None, fresh=True, reasons=(), age_days=211
        ), text
    (schedule,) = extract("Meters are read every Tuesday.", date(2026, 11, 2))
    assert (schedule.timex_type, schedule.value, schedule.role) == ("SET", "XXXX-WXX-2", "other")
    # a schedule statement read as an expiry would be stale; read as a SET it is not, whatever its role
    as_expiry = TemporalExpression(
        "s", "every Tuesday", date(2026, 1, 6), date(2026, 1, 6), "day", "expires", 0, 13, "SET", "XXXX-WXX-2"
    )
    f = passage_freshness([as_expiry], audit_date=T, horizon_days=H, doc_date=date(2026, 11, 2), doc_date_source="x")
    assert f.fresh and f.expires is None
