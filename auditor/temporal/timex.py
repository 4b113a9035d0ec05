"""TIMEX3 values of intervals (ISO-TimeML, ISO 24617-1:2012; TimeML Annotation Guidelines 1.2.1).

A calendar-aligned interval has a value: a day `2024-03-05`, an ISO week `2024-W05`, a weekend
`2024-W44-WE`, a month `2024-03`, a quarter `2024-Q3`, a half `2025-H1`, a season `2025-SP`, a year
`2024`, a decade `199`. A range written with two ends has none (TIMEX3 gives each end its own).
"""

from __future__ import annotations

from datetime import date, timedelta

from auditor.temporal.patterns import month_end, month_span

__all__ = ["interval_value"]


def interval_value(start: date, end: date, granularity: str, hemisphere: str = "north") -> str | None:
    """The TIMEX3 `value` of the interval [start, end] of `granularity`, or None when it has none."""
    g = granularity
    if g == "day" and start == end:
        return start.isoformat()
    if g == "day" and start.weekday() == 5 and end == start + timedelta(days=1):
        year, week, _ = start.isocalendar()
        return f"{year}-W{week:02d}-WE"
    if g == "week" and start.weekday() == 0 and (end - start).days == 6:
        year, week, _ = start.isocalendar()
        return f"{year}-W{week:02d}"
    if g == "month" and start.day == 1 and end == month_end(start.year, start.month):
        return f"{start:%Y-%m}"
    if g == "quarter" and start.month % 3 == 1 and end == month_span(start.year, start.month, 3)[1]:
        return f"{start.year}-Q{(start.month - 1) // 3 + 1}"
    if g == "half" and start.month in (1, 7) and end == month_span(start.year, start.month, 6)[1]:
        return f"{start.year}-H{1 if start.month == 1 else 2}"
    if g == "season":
        codes = {3: "SP", 6: "SU", 9: "FA", 12: "WI"}
        month = start.month if hemisphere == "north" else (start.month + 6 - 1) % 12 + 1
        if month in codes and end == month_span(start.year, start.month, 3)[1]:
            return f"{start.year}-{codes[month]}"
    if g == "year" and (start.month, start.day, end.month, end.day) == (1, 1, 12, 31) and start.year == end.year:
        return str(start.year)
    if g == "decade" and start.year % 10 == 0 and end.year == start.year + 9:
        return str(start.year // 10)
    return None
