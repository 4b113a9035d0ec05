"""Charts of the report as inline SVG, drawn in Python (no script, no network, prints as vectors).

Every chart returns `markupsafe.Markup`; every piece of text that comes from the run (owner names,
dates) goes through `escape`, so a hostile owner name shows literally. Colours are set through CSS
classes of the page (`v-supported`, `v-stale`, `v-gap`, ...) so print and screen styles stay in one
place; each chart carries a <title> and an aria-label, and the page shows the same figures as text.
"""

from __future__ import annotations

import math

from markupsafe import Markup, escape

from auditor.models import VERDICTS

MAX_OWNER_BARS = 14


def _fmt(x: float) -> str:
    """Short, stable number text for SVG coordinates."""
    return f"{x:.1f}".rstrip("0").rstrip(".")


def _svg(width: int, height: int, label: str, body: list[str]) -> Markup:
    head = (
        f'<svg class="chart" viewBox="0 0 {width} {height}" width="100%" role="img" '
        f'aria-label="{escape(label)}" preserveAspectRatio="xMinYMin meet" '
        f'xmlns="http://www.w3.org/2000/svg"><title>{escape(label)}</title>'
    )
    return Markup(head + "".join(body) + "</svg>")


def _truncate(text: str, limit: int) -> str:
    return text if len(text) <= limit else text[: limit - 1] + "…"


def verdicts_by_owner(counts: dict[str, dict[str, int]]) -> Markup:
    """Stacked horizontal bars: one bar per owner, segments supported / stale / gap.

    `counts` maps owner → {verdict: count}. Owners are sorted by question count (highest first),
    then by name; past MAX_OWNER_BARS the rest are merged into one "other owners" bar.
    """
    rows = sorted(counts.items(), key=lambda kv: (-sum(kv[1].values()), kv[0]))
    if len(rows) > MAX_OWNER_BARS:
        rest: dict[str, int] = {}
        for _, c in rows[MAX_OWNER_BARS - 1 :]:
            for v, n in c.items():
                rest[v] = rest.get(v, 0) + n
        rows = rows[: MAX_OWNER_BARS - 1] + [(f"{len(rows) - MAX_OWNER_BARS + 1} other owners", rest)]
    if not rows:
        return _svg(
            640,
            40,
            "Verdicts by owner: no questions",
            ['<text x="0" y="24" class="axis">No questions in this run.</text>'],
        )
    label_w, bar_h, gap, top = 180, 22, 10, 8
    plot_w = 400
    width = label_w + plot_w + 70
    height = top + len(rows) * (bar_h + gap) + 24
    biggest = max(sum(c.values()) for _, c in rows) or 1
    body = []
    for i, (owner, c) in enumerate(rows):
        y = top + i * (bar_h + gap)
        total = sum(c.values())
        body.append(
            f'<text x="{label_w - 8}" y="{_fmt(y + bar_h * 0.68)}" text-anchor="end" '
            f'class="label">{escape(_truncate(owner, 22))}<title>{escape(owner)}</title></text>'
        )
        x = float(label_w)
        for verdict in VERDICTS:
            n = c.get(verdict, 0)
            if not n:
                continue
            w = plot_w * n / biggest
            body.append(
                f'<rect x="{_fmt(x)}" y="{y}" width="{_fmt(w)}" height="{bar_h}" '
                f'class="v-{verdict}"><title>{escape(owner)}: {n} {verdict}</title></rect>'
            )
            if w >= 22:
                body.append(
                    f'<text x="{_fmt(x + w / 2)}" y="{_fmt(y + bar_h * 0.68)}" '
                    f'text-anchor="middle" class="in-bar">{n}</text>'
                )
            x += w
        body.append(f'<text x="{_fmt(x + 6)}" y="{_fmt(y + bar_h * 0.68)}" class="axis">{total}</text>')
    ly = height - 8
    lx = label_w
    for verdict in VERDICTS:
        body.append(
            f'<rect x="{lx}" y="{ly - 10}" width="12" height="12" class="v-{verdict}"/>'
            f'<text x="{lx + 17}" y="{ly}" class="axis">{verdict}</text>'
        )
        lx += 95
    return _svg(width, height, "Verdicts by owner, stacked bars", body)


def _bin_width(span: float, horizon: int, most: int = 16) -> float:
    """Bin width in days that divides the horizon evenly (so the horizon falls on a bin edge),
    as fine as possible with at most `most` bins over `span` days."""
    for parts in (12, 6, 4, 3, 2, 1):
        if span / (horizon / parts) <= most:
            return horizon / parts
    k = math.ceil(span / (horizon * most))
    return float(horizon * k)


def age_histogram(ages: list[int], horizon_days: int, undated: int = 0) -> Markup:
    """Histogram of evidence age in days with the freshness horizon drawn as a vertical line.

    Bars past the horizon take the stale colour. `undated` is only written in the caption line.
    """
    width, height, left, right, top, bottom = 640, 230, 44, 16, 16, 48
    plot_w, plot_h = width - left - right, height - top - bottom
    body = []
    if not ages:
        body.append(f'<text x="{left}" y="40" class="axis">No dated supporting evidence.</text>')
        if undated:
            body.append(f'<text x="{left}" y="60" class="axis">{undated} undated</text>')
        return _svg(width, 80, "Age of supporting evidence: no dated evidence", body)
    horizon = max(int(horizon_days), 1)
    span = max(max(ages), horizon) + 1
    step = _bin_width(span, horizon)
    nbins = max(1, int(math.ceil(span / step)))
    counts = [0] * nbins
    for a in ages:
        counts[min(int(max(a, 0) // step), nbins - 1)] += 1
    peak = max(counts) or 1
    bw = plot_w / nbins
    # Horizontal guides at 0, half and peak.
    for value in sorted({0, peak // 2, peak}):
        y = top + plot_h * (1 - value / peak)
        body.append(
            f'<line x1="{left}" y1="{_fmt(y)}" x2="{width - right}" y2="{_fmt(y)}" class="grid"/>'
            f'<text x="{left - 6}" y="{_fmt(y + 4)}" text-anchor="end" class="axis">'
            f"{value}</text>"
        )
    for i, n in enumerate(counts):
        lo, hi = round(i * step), round((i + 1) * step)
        cls = "v-supported" if hi <= horizon else "v-stale"
        h = plot_h * n / peak
        x = left + i * bw
        body.append(
            f'<rect x="{_fmt(x + 1)}" y="{_fmt(top + plot_h - h)}" width="{_fmt(max(bw - 2, 1))}" '
            f'height="{_fmt(h)}" class="{cls}"><title>{lo}–{hi - 1} days: {n}</title></rect>'
        )
    label_every = max(1, int(math.ceil(nbins / 8)))
    for i in range(0, nbins + 1, label_every):
        x = left + i * bw
        body.append(
            f'<text x="{_fmt(x)}" y="{top + plot_h + 16}" text-anchor="middle" class="axis">{round(i * step)}</text>'
        )
    hx = left + plot_w * horizon / (nbins * step)
    body.append(
        f'<line x1="{_fmt(hx)}" y1="{top - 6}" x2="{_fmt(hx)}" y2="{top + plot_h}" class="horizon"/>'
        f'<text x="{_fmt(hx + 4)}" y="{top + 4}" class="horizon-label">horizon {horizon} d</text>'
    )
    caption = f"age in days at the audit date · {len(ages)} dated"
    if undated:
        caption += f" · {undated} undated"
    body.append(f'<text x="{left}" y="{height - 8}" class="axis">{escape(caption)}</text>')
    lx = width - right - 230
    for cls, name in (("v-supported", "within horizon"), ("v-stale", "beyond horizon")):
        body.append(
            f'<rect x="{lx}" y="{height - 18}" width="12" height="12" class="{cls}"/>'
            f'<text x="{lx + 17}" y="{height - 8}" class="axis">{name}</text>'
        )
        lx += 115
    return _svg(width, height, "Age of supporting evidence, histogram with the horizon marked", body)


TREND_SERIES = (
    ("supported_share", "supported share", "t-supported"),
    ("stale_exposure", "stale exposure", "t-stale"),
    ("fallback_exposure", "fallback exposure", "t-gap"),
)


def trend(points: list[dict], width: int = 1160) -> Markup:
    """Line chart across runs: supported share of questions, stale and fallback exposure (0–100 %).

    `points` are {"label", "supported_share", "stale_exposure", "fallback_exposure"}, oldest first.
    The chart is wide and low: it spans the page under the other two.
    """
    height, left, right, top, bottom = 230, 44, 24, 14, 52
    plot_w, plot_h = width - left - right, height - top - bottom
    body = []
    for frac in (0.0, 0.25, 0.5, 0.75, 1.0):
        y = top + plot_h * (1 - frac)
        body.append(
            f'<line x1="{left}" y1="{_fmt(y)}" x2="{width - right}" y2="{_fmt(y)}" class="grid"/>'
            f'<text x="{left - 6}" y="{_fmt(y + 4)}" text-anchor="end" class="axis">'
            f"{int(frac * 100)}%</text>"
        )
    n = len(points)
    xs = [left + (plot_w * i / (n - 1) if n > 1 else plot_w / 2) for i in range(n)]
    for key, name, cls in TREND_SERIES:
        coords = []
        for x, p in zip(xs, points):
            v = p.get(key)
            if v is None:
                continue
            coords.append((x, top + plot_h * (1 - min(max(float(v), 0.0), 1.0)), float(v)))
        if len(coords) > 1:
            body.append(
                f'<polyline class="{cls}" fill="none" points="'
                + " ".join(f"{_fmt(x)},{_fmt(y)}" for x, y, _ in coords)
                + '"/>'
            )
        for x, y, v in coords:
            body.append(
                f'<circle cx="{_fmt(x)}" cy="{_fmt(y)}" r="3.5" class="{cls}">'
                f"<title>{escape(name)}: {v * 100:.1f}%</title></circle>"
            )
    label_every = max(1, int(math.ceil(n / 8)))
    for i in range(0, n, label_every):
        # The outermost labels hang inwards so that they are not cut at the edges.
        anchor = "start" if i == 0 and n > 1 else ("end" if i == n - 1 and n > 1 else "middle")
        body.append(
            f'<text x="{_fmt(xs[i])}" y="{top + plot_h + 16}" text-anchor="{anchor}" class="axis">'
            f"{escape(points[i]['label'])}</text>"
        )
    if n > 1 and (n - 1) % label_every:
        body.append(
            f'<text x="{_fmt(xs[-1])}" y="{top + plot_h + 16}" text-anchor="end" class="axis">'
            f"{escape(points[-1]['label'])}</text>"
        )
    lx = left
    for _, name, cls in TREND_SERIES:
        body.append(
            f'<line x1="{lx}" y1="{height - 12}" x2="{lx + 18}" y2="{height - 12}" class="{cls}"/>'
            f'<text x="{lx + 24}" y="{height - 8}" class="axis">{escape(name)}</text>'
        )
        lx += 160
    return _svg(width, height, "Trend across runs: supported share, stale and fallback exposure", body)
