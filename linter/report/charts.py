"""The review report's charts, drawn server-side as inline SVG from the design model's figures.

Each chart is built in two steps: collect what to plot from the model (plain numbers, no drawing),
then draw it. The report shows the collected values in a table beside each chart, so the picture
can be checked against numbers. Every piece of text passes through :func:`markupsafe.escape`:
part names and net names come from files under review and must never become markup.

Output is deterministic: coordinates are rounded to 0.1 px and nothing depends on the clock or
on dictionary order that the input does not fix.
"""

from __future__ import annotations

import math
from dataclasses import field
from typing import Any, Sequence

from markupsafe import Markup, escape

from ..quantities import format_quantity
from ..records import record

FONT = 12  # px, the chart text size
# Average advance of a character of the report's sans-serif face, in em: DejaVu Sans runs near
# 0.6 em for digits and lower case; a little more, so that estimated labels err wide, not short.
_CHAR = 0.62


def text_width(text: str, size: float = FONT) -> float:
    """Estimated rendered width of ``text``: enough to lay labels out without a browser."""
    return len(text) * size * _CHAR


def q(value: float, unit: str, digits: int = 3) -> str:
    return format_quantity(value, unit, digits)


def span_text(low: float, high: float, unit: str, digits: int = 3) -> str:
    """``4.275–4.325 V``; one value when the span is a point."""
    a, b = q(low, unit, digits), q(high, unit, digits)
    if a == b:
        return a
    # Say the unit once when both ends share the prefix: "4.275–4.325 V", "1.79–7.78 A".
    sa, sb = a.rsplit(" ", 1), b.rsplit(" ", 1)
    if len(sa) == 2 and len(sb) == 2 and sa[1] == sb[1]:
        return f"{sa[0]}–{sb[0]} {sa[1]}"
    return f"{a}–{b}"


# --- a small SVG writer -------------------------------------------------------------------------

def _n(x: float) -> str:
    """A coordinate: 0.1 px is finer than any screen shows, and keeps output byte-stable."""
    s = f"{x:.1f}"
    if s == "-0.0":
        s = "0.0"
    return s[:-2] if s.endswith(".0") else s


class Svg:
    """Collects elements; attribute values and text are always escaped."""

    def __init__(self, width: float, height: float, label: str, css_class: str):
        self.width, self.height = width, height
        self.label, self.css_class = label, css_class
        self.parts: list[str] = []

    @staticmethod
    def _attrs(attrs: dict) -> str:
        out = []
        for key, value in attrs.items():
            if value is None:
                continue
            name = key.rstrip("_").replace("_", "-")
            if isinstance(value, float):
                value = _n(value)
            out.append(f' {name}="{escape(str(value))}"')
        return "".join(out)

    def el(self, tag: str, text: str | None = None, **attrs: Any) -> None:
        if text is None:
            self.parts.append(f"<{tag}{self._attrs(attrs)}/>")
        else:
            self.parts.append(f"<{tag}{self._attrs(attrs)}>{escape(text)}</{tag}>")

    def open(self, tag: str, **attrs: Any) -> None:
        self.parts.append(f"<{tag}{self._attrs(attrs)}>")

    def close(self, tag: str) -> None:
        self.parts.append(f"</{tag}>")

    def line(self, x1: float, y1: float, x2: float, y2: float, cls: str, **attrs: Any) -> None:
        self.el("line", x1=float(x1), y1=float(y1), x2=float(x2), y2=float(y2), class_=cls, **attrs)

    def rect(self, x: float, y: float, w: float, h: float, cls: str, **attrs: Any) -> None:
        self.el("rect", x=float(x), y=float(y), width=float(max(w, 0.0)), height=float(max(h, 0.0)),
                class_=cls, **attrs)

    def text(self, x: float, y: float, text: str, cls: str = "", anchor: str = "start", **attrs: Any) -> None:
        self.el("text", text, x=float(x), y=float(y), class_=cls or None,
                text_anchor=None if anchor == "start" else anchor, **attrs)

    def markup(self) -> Markup:
        head = (f'<svg class="chart {escape(self.css_class)}" width="{_n(self.width)}" '
                f'height="{_n(self.height)}" viewBox="0 0 {_n(self.width)} {_n(self.height)}" '
                f'role="img" aria-label="{escape(self.label)}">')
        return Markup(head + f"<title>{escape(self.label)}</title>" + "".join(self.parts) + "</svg>")


def spread(wanted: Sequence[float], gap: float, lo: float, hi: float) -> list[float]:
    """Label positions as near ``wanted`` as possible, at least ``gap`` apart, within lo..hi.

    Overlapping labels are merged into clusters centred on their wanted positions, repeatedly,
    then the whole set is pushed inside the range. Order along the axis is kept, so a leader line
    from each label to its value never crosses another.
    """
    if not wanted:
        return []
    order = sorted(range(len(wanted)), key=lambda i: (wanted[i], i))
    clusters: list[list[int]] = []  # each: indices into order

    def top(c: list[int]) -> float:
        mean = sum(wanted[order[k]] for k in c) / len(c)
        return mean - (len(c) - 1) * gap / 2

    for k in range(len(order)):
        clusters.append([k])
        while len(clusters) > 1 and top(clusters[-2]) + len(clusters[-2]) * gap > top(clusters[-1]):
            last = clusters.pop()
            clusters[-1].extend(last)
    pos = [0.0] * len(order)
    for c in clusters:
        t = top(c)
        for j, k in enumerate(c):
            pos[k] = t + j * gap
    # inside the range: forward from lo, then back from hi (hi wins when it cannot all fit)
    for k in range(len(pos)):
        floor = lo if k == 0 else pos[k - 1] + gap
        pos[k] = max(pos[k], floor)
    for k in reversed(range(len(pos))):
        ceil = hi if k == len(pos) - 1 else pos[k + 1] - gap
        pos[k] = min(pos[k], ceil)
    out = [0.0] * len(wanted)
    for k, i in enumerate(order):
        out[i] = pos[k]
    return out


def nice_step(span: float, target: int) -> float:
    """A 1-2-5 step giving about ``target`` intervals over ``span``."""
    raw = span / max(target, 1)
    mag = 10 ** math.floor(math.log10(raw))
    for m in (1, 2, 2.5, 5, 10):
        if m * mag >= raw:
            return m * mag
    return 10 * mag  # pragma: no cover


def linear_ticks(lo: float, hi: float, target: int) -> list[float]:
    step = nice_step(hi - lo, target)
    first = math.ceil(lo / step - 1e-9) * step
    out, v = [], first
    while v <= hi + 1e-9:
        out.append(round(v, 10))
        v += step
    return out


def log_ticks(lo: float, hi: float) -> list[float]:
    """1-2-5 ticks of each decade between lo and hi."""
    out = []
    for e in range(math.floor(math.log10(lo)), math.ceil(math.log10(hi)) + 1):
        for m in (1, 2, 5):
            v = m * 10.0 ** e
            if lo <= v <= hi:
                out.append(float(f"{v:.6g}"))
    return out


def nice_below(v: float) -> float:
    """The largest 1-2-5 value at or below ``v`` (an axis end that carries a tick)."""
    e = math.floor(math.log10(v))
    return max(m * 10.0 ** e for m in (1, 2, 5) if m * 10.0 ** e <= v * (1 + 1e-9))


def nice_above(v: float) -> float:
    e = math.floor(math.log10(v))
    return min(m * 10.0 ** e for m in (1, 2, 5, 10) if m * 10.0 ** e >= v * (1 - 1e-9))


def tick_text(v: float, unit: str = "") -> str:
    s = f"{v:.6g}"
    return f"{s} {unit}".strip()


# --- what a chart is --------------------------------------------------------------------------

@record
class Chart:
    """One chart of the report: the SVG, the values it plots, and notes about what is left out."""

    id: str
    title: str
    caption: str
    svg: Markup | None = None
    values: list[tuple[str, str]] = field(default_factory=list)  # (what, value as text)
    notes: list[str] = field(default_factory=list)

    @property
    def drawn(self) -> bool:
        return self.svg is not None


TITLES = {"ladder": "Voltage ladder (per cell)", "trip": "Trip-current window",
          "tj": "Junction temperature against ambient", "tc": "Time–current coordination",
          "vds": "Blocking voltage per switch"}


def charts_for(model: Any) -> list[Chart]:
    """The five charts of a design. A chart the design lacks the parts for says why instead.

    Each is drawn on its own: a model figure that fails (the engine has reported it already)
    costs the chart that needs it, never the report.
    """
    out = []
    for cid, build in (("ladder", voltage_ladder), ("trip", trip_window),
                       ("tj", junction_temperature), ("tc", time_current_chart),
                       ("vds", blocking_voltage)):
        try:
            out.append(build(model))
        except Exception as exc:
            out.append(Chart(cid, TITLES[cid], "", notes=[f"not drawn: {type(exc).__name__}: {exc}"]))
    return out


# --- 1. the voltage ladder --------------------------------------------------------------------

@record(frozen=True)
class Band:
    column: str
    label: str
    low: float
    typ: float
    high: float
    kind: str  # css class


@record(frozen=True)
class Level:
    label: str
    value: float
    kind: str


def ladder_data(model: Any) -> tuple[list[Band], list[Level], list[str]]:
    """Bands (protector thresholds with tolerances, charger per cell) and the cell's levels."""
    notes: list[str] = []
    bands: list[Band] = []
    levels: list[Level] = []
    cl = model.cell_limits
    if cl is None:
        return bands, levels, ["no cell in the design"]
    p = model.protector
    if p is None:
        notes.append("no protector in the design: its thresholds are not shown")
    else:
        for column, th in (("overcharge", p.part.overcharge), ("over-discharge", p.part.overdischarge)):
            d = th.detect
            bands.append(Band(column, "detect", d.low, d.nominal, d.high, f"b-{column}-detect"))
            if th.release is not None:
                r = th.release
                bands.append(Band(column, "release", r.low, r.nominal, r.high, f"b-{column}-release"))
            else:
                notes.append(f"{p.refdes} gives no {column} release voltage")
    ch = model.charger_per_cell
    if ch is None:
        notes.append("no charger in the design: its band is not shown")
    else:
        bands.append(Band("charger", "regulation", ch.min, ch.typ, ch.max, "b-charger"))
    levels = [
        Level("overcharge limit", cl.overcharge_limit, "l-never"),
        Level("upper limit", cl.upper_limit, "l-limit"),
        Level("charge voltage", cl.charge, "l-level"),
        Level("cut-off", cl.cutoff, "l-level"),
        Level("lower limit", cl.lower_limit, "l-never"),
    ]
    notes.extend(cl.assumptions)
    return bands, levels, notes


class BrokenScale:
    """A vertical axis that skips long empty stretches, at one scale throughout.

    The values a ladder holds gather at the charge end and the discharge end of the cell's
    window, with nothing between; drawn unbroken, the crowded ends get little height. Each empty
    stretch longer than a quarter of the whole is cut out and marked by a break on the axis, so
    distances within each part stay true.
    """

    GAP_PX = 24.0

    def __init__(self, intervals: Sequence[tuple[float, float]], top: float, bottom: float):
        lo = min(a for a, _ in intervals)
        hi = max(b for _, b in intervals)
        pad = max((hi - lo) * 0.04, 0.04)
        merged: list[list[float]] = []
        for a, b in sorted((a - pad, b + pad) for a, b in intervals):
            if merged and a - merged[-1][1] < 0.25 * (hi - lo + 2 * pad):
                merged[-1][1] = max(merged[-1][1], b)
            else:
                merged.append([a, b])
        self.segments = [(a, b) for a, b in merged]
        total = sum(b - a for a, b in self.segments)
        self.per_volt = (bottom - top - self.GAP_PX * (len(self.segments) - 1)) / total
        # pixel position of each segment's high end, from the top down (highest segment first)
        self.starts: list[float] = []
        y = top
        for a, b in reversed(self.segments):
            self.starts.insert(0, y)
            y += (b - a) * self.per_volt + self.GAP_PX
        self.top, self.bottom = top, bottom

    def __call__(self, v: float) -> float:
        for (a, b), start in zip(self.segments, self.starts):
            if v <= b or (a, b) == self.segments[-1]:
                if v < a and (a, b) != self.segments[0]:
                    v = a
                return start + (b - v) * self.per_volt
        return self.bottom  # pragma: no cover

    def breaks(self) -> list[float]:
        """Pixel centres of the gaps between segments."""
        return [self(b) + self.GAP_PX / 2 for (a, b) in self.segments[:-1]]


def voltage_ladder(model: Any) -> Chart:
    chart = Chart("ladder", TITLES["ladder"],
                  "Protector detect and release voltages over their tolerances, and the charger's "
                  "regulation band per cell, against the cell's own levels. Bands span min–max; "
                  "the bar inside a band is the typical value. The axis skips the empty middle of "
                  "the window (zigzag) at one scale throughout.")
    bands, levels, notes = ladder_data(model)
    chart.notes.extend(notes)
    if not levels:
        return chart
    series = model.stack.series if model.stack is not None else 1
    columns = [c for c in ("overcharge", "over-discharge", "charger") if any(b.column == c for b in bands)]
    heads = {"overcharge": ("Protector", "overcharge"), "over-discharge": ("Protector", "over-discharge"),
             "charger": ("Charger", f"÷ {series} cell" + ("s" if series != 1 else ""))}

    W, H = 600.0, 600.0
    x0, x1, top, bottom = 50.0, 424.0, 58.0, H - 16.0
    y = BrokenScale([(b.low, b.high) for b in bands] + [(lv.value, lv.value) for lv in levels],
                    top, bottom)

    svg = Svg(W, H, "Voltage ladder per cell: protector thresholds and charger band against the "
                    "cell's limits", "ladder")
    svg.text(4, top - 8, "V per cell", "axis-title")
    for a, b in y.segments:
        px = (b - a) * y.per_volt
        for v in linear_ticks(a, b, max(int(px / 9), 2)):
            svg.line(x0, y(v), x1, y(v), "grid-minor")
        for v in linear_ticks(a, b, max(int(px / 40), 2)):
            svg.line(x0, y(v), x1, y(v), "grid")
            svg.text(x0 - 6, y(v) + 4, tick_text(v), "tick", anchor="end")
        svg.line(x0, y(b), x0, y(a), "axis")
    for mid in y.breaks():
        for dy in (-4.0, 4.0):
            svg.line(x0 - 6, mid + dy + 3, x0 + 6, mid + dy - 3, "axis")
        svg.line(x0 + 8, mid, x1, mid, "break")

    # the cell's levels across the plot, labelled at the right (spread so labels never overlap)
    for lv in levels:
        svg.line(x0, y(lv.value), x1, y(lv.value), lv.kind)
    label_y = spread([y(lv.value) for lv in levels], FONT + 4, top, bottom)
    for lv, ly in zip(levels, label_y):
        svg.el("polyline", points=f"{_n(x1)},{_n(y(lv.value))} {_n(x1 + 8)},{_n(ly)} {_n(x1 + 12)},{_n(ly)}",
               class_="leader")
        svg.text(x1 + 15, ly + 4, f"{lv.label} {q(lv.value, 'V', 4)}", f"t-{lv.kind}")
        chart.values.append((f"cell {lv.label}", q(lv.value, "V", 4)))

    # the bands, one column each for the protector's two thresholds and the charger
    colw = (x1 - x0) / max(len(columns), 1)
    for k, column in enumerate(columns):
        cx = x0 + k * colw
        h1, h2 = heads[column]
        svg.text(cx + 10, top - 36, h1, "col-head")
        svg.text(cx + 10, top - 21, h2, "col-head")
        in_col = [b for b in bands if b.column == column]
        mids = [(y(b.low) + y(b.high)) / 2 for b in in_col]
        ly = spread(mids, 2 * FONT + 16, top + FONT, bottom - FONT)
        bx, bw = cx + 10, 22.0
        for b, mid, lyy in zip(in_col, mids, ly):
            y_hi, y_lo = y(b.high), y(b.low)
            # a point value still shows: at least 3 px tall
            if y_lo - y_hi < 3:
                y_hi, y_lo = mid - 1.5, mid + 1.5
            svg.rect(bx, y_hi, bw, y_lo - y_hi, f"band {b.kind}")
            svg.line(bx, y(b.typ), bx + bw, y(b.typ), "band-typ")
            tx = bx + bw + 10
            svg.el("polyline", points=f"{_n(bx + bw)},{_n(mid)} {_n(tx - 3)},{_n(lyy)}", class_="leader")
            svg.text(tx, lyy - 2, b.label, "band-label")
            text = span_text(b.low, b.high, "V", 4)
            svg.text(tx, lyy + FONT, text, "band-value")
            what = f"{column} {b.label}" if column != "charger" else "charger per cell"
            chart.values.append((what, f"{text} (typ {q(b.typ, 'V', 4)})"))
    chart.svg = svg.markup()
    return chart


# --- 2. the trip-current window ---------------------------------------------------------------

@record(frozen=True)
class Row:
    label: str
    kind: str  # "band" | "mark" | "rating"
    low: float
    high: float
    typ: float | None = None
    text: str = ""
    css: str = ""


def refs_text(refs: Sequence[str]) -> str:
    """``Q1–Q4`` for a run of designators, ``Q1, Q3`` otherwise: short enough for a label."""
    import re

    parsed = []
    for r in refs:
        m = re.fullmatch(r"(.*?)(\d+)", r)
        parsed.append((m.group(1), int(m.group(2)), r) if m else (r, -1, r))
    parsed.sort(key=lambda p: (p[0], p[1], p[2]))
    out: list[str] = []
    k = 0
    while k < len(parsed):
        j = k
        while (j + 1 < len(parsed) and parsed[j + 1][0] == parsed[k][0] and parsed[k][1] >= 0
               and parsed[j + 1][1] == parsed[j][1] + 1):
            j += 1
        if j - k >= 2:
            out.append(f"{parsed[k][2]}–{parsed[j][2]}")
        else:
            out.extend(p[2] for p in parsed[k:j + 1])
        k = j + 1
    return ", ".join(out)


def _finite_pos(x: Any) -> bool:
    return isinstance(x, (int, float)) and math.isfinite(x) and x > 0


def _ellipsis(text: str, width: float) -> str:
    if text_width(text) <= width:
        return text
    n = max(int(width / (FONT * _CHAR)) - 1, 4)
    return text[:n] + "…"


def _window_text(low: float, typ: float, high: float) -> str:
    span = span_text(low, high, "A")
    return span if "–" not in span else f"{span}, typ {q(typ, 'A')}"


def trip_rows(model: Any) -> tuple[list[Row], Row | None, list[str]]:
    """Rows of the trip chart, the hard short's row (kept apart: it may be off scale), and notes."""
    rows: list[Row] = []
    notes: list[str] = []
    limits = model.limits  # the fuse derating and trace rise the rules judge by
    t, sc = model.overcurrent_trip, model.short_circuit_trip
    p = model.protector
    if t is not None and _finite_pos(t.min) and _finite_pos(t.max):
        rows.append(Row(f"{p.refdes} over-current trip", "band", t.min, t.max, t.typ,
                        _window_text(t.min, t.typ, t.max), "r-trip"))
    elif p is not None:
        notes.append("over-current trip window could not be computed (see the findings)")
    if sc is not None and _finite_pos(sc.min) and _finite_pos(sc.max):
        rows.append(Row(f"{p.refdes} short-circuit trip", "band", sc.min, sc.max, sc.typ,
                        _window_text(sc.min, sc.typ, sc.max), "r-short"))
    # The current the protection permits for ever, which the rules judge the ratings by.
    permitted = model.event("permitted")
    if permitted is not None and _finite_pos(permitted.current):
        rows.append(Row(f"permitted for ever, {permitted.ambient:g} °C", "mark", permitted.current,
                        permitted.current, None, q(permitted.current, "A"), "r-permitted"))
    load = model.design.load
    if _finite_pos(load.continuous):
        rows.append(Row("continuous load", "mark", load.continuous, load.continuous, None,
                        q(load.continuous, "A"), "r-load"))
    if load.peak is not None and _finite_pos(load.peak.current):
        rows.append(Row(f"peak load, {q(load.peak.duration, 's')}", "mark", load.peak.current,
                        load.peak.current, None, q(load.peak.current, "A"), "r-load"))
    stack = model.stack
    if stack is not None and stack.part is not None:
        per = stack.part.max_current.discharge
        total = stack.discharge_rating
        rows.append(Row(f"cell discharge max, {stack.parallel}P × {q(per, 'A')}", "rating", total, total,
                        None, q(total, "A"), "r-rating"))
    # FETs: the pack current at which the most loaded channel of a package reaches its id_max,
    # from how the permitted current divides (as the trip-window rule judges it).
    shares = ({c.name: permitted.current_through(c.name) / permitted.current
               for c in model.channels} if permitted is not None and permitted.current > 0 else {})
    # Packages with the same limit are one row: a bank of identical pairs reads as one rating.
    fets: dict[tuple[float, float], list[str]] = {}
    for pkg in sorted({c.package for c in model.channels}):
        mine = [c for c in model.channels if c.package == pkg]
        share = max((shares.get(c.name, 0.0) for c in mine), default=0.0) or 1.0
        fets.setdefault((mine[0].part.id_max, round(share, 6)), []).append(pkg)
    for (id_max, share), pkgs in sorted(fets.items(), key=lambda kv: (kv[1][0], kv[0])):
        pack = id_max / share
        who = refs_text(pkgs)
        if abs(share - 1.0) < 1e-6:
            rows.append(Row(f"{who} FET id_max", "rating", pack, pack, None, q(id_max, "A"), "r-rating"))
        else:
            rows.append(Row(f"{who} FET id_max, {q(id_max, 'A')}/channel", "rating", pack,
                            pack, None, f"{q(pack, 'A')} pack", "r-rating"))
    for f in model.netlist.of_kind("fuse", "ptc", "wire", "trace"):
        part = f.part
        if f.kind == "fuse":
            v = limits.fuse_current(part, model.ambient.max)
            rows.append(Row(f"{f.refdes} fuse derated, {limits.fuse_derating * 100:g} % of {q(part.rated_current, 'A')}",
                            "rating", v, v, None, q(v, "A"), "r-rating"))
        elif f.kind == "ptc":
            rows.append(Row(f"{f.refdes} PTC hold current", "rating", part.hold_current, part.hold_current,
                            None, q(part.hold_current, "A"), "r-rating"))
        elif f.kind == "wire":
            rows.append(Row(f"{f.refdes} wire rating", "rating", part.rated_current, part.rated_current,
                            None, q(part.rated_current, "A"), "r-rating"))
        elif f.kind == "trace":
            try:
                cap = limits.trace_capacity(part).current
            except ValueError:
                continue
            rows.append(Row(f"{f.refdes} trace, IPC-2221 at ΔT {limits.trace_rise:g} K", "rating", cap, cap,
                            None, q(cap, "A"), "r-rating"))
    hard = model.event("hard-short")
    psc_row = None
    if hard is not None and _finite_pos(hard.current):
        psc_row = Row("hard short", "rating", hard.current, hard.current, None,
                      q(hard.current, "A"), "r-psc")
    return rows, psc_row, notes


def trip_window(model: Any) -> Chart:
    chart = Chart("trip", TITLES["trip"],
                  "Where the protector's over-current and short-circuit detections trip, over every "
                  "tolerance and corner, against the loads it must carry and the ratings of the parts "
                  "in the path. The shaded column is the over-current trip window: loads belong left "
                  "of it, ratings right of it.")
    rows, psc, notes = trip_rows(model)
    chart.notes.extend(notes)
    if not rows:
        chart.notes.append("nothing to plot: no trip window, load or rating is known")
        return chart
    vals = [v for r in rows for v in (r.low, r.high)]
    lo, hi = nice_below(min(vals) / 1.25), nice_above(max(vals) * 1.25)
    off_scale = False
    if psc is not None:
        # Drawn when it stretches the axis by at most 20 times; beyond that the window would be
        # squeezed to a sliver, so it is named at the edge instead.
        if psc.low <= max(vals) * 20:
            rows.append(psc)
            hi = max(hi, nice_above(psc.low * 1.25))
        else:
            off_scale = True
    W = 1180.0
    label_w, x0, x1 = 262.0, 272.0, W - 24.0
    row_h, top = 30.0, 14.0
    n_rows = len(rows) + (1 if off_scale else 0)
    plot_bottom = top + n_rows * row_h
    H = plot_bottom + 46.0
    llo, lhi = math.log10(lo), math.log10(hi)

    def x(v: float) -> float:
        return x0 + (math.log10(v) - llo) / (lhi - llo) * (x1 - x0)

    svg = Svg(W, H, "Trip-current window against the loads and the ratings of the path", "trip")
    for k in range(n_rows):
        if k % 2 == 0:
            svg.rect(0, top + k * row_h, W, row_h, "row-stripe")
    for v in log_ticks(lo, hi):
        svg.line(x(v), top, x(v), plot_bottom, "grid")
        svg.text(x(v), plot_bottom + 16, tick_text(v), "tick", anchor="middle")
    svg.line(x0, plot_bottom, x1, plot_bottom, "axis")
    svg.text((x0 + x1) / 2, plot_bottom + 36, "current, A (log scale)", "axis-title", anchor="middle")
    oc = rows[0] if rows and rows[0].css == "r-trip" else None
    if oc is not None:
        svg.rect(x(oc.low), top, x(oc.high) - x(oc.low), plot_bottom - top, "trip-column")
    for k, r in enumerate(rows):
        yc = top + k * row_h + row_h / 2
        svg.text(label_w, yc + 4, _ellipsis(r.label, label_w - 8), "row-label", anchor="end")
        if r.kind == "band":
            xa, xb = x(r.low), x(r.high)
            svg.rect(xa, yc - 8, max(xb - xa, 3.0), 16, f"band {r.css}")
            if r.typ is not None and _finite_pos(r.typ):
                svg.el("path", d=f"M{_n(x(r.typ))},{_n(yc - 11)} l5,-6 h-10 z", class_="typ-mark")
                svg.line(x(r.typ), yc - 8, x(r.typ), yc + 8, "band-typ")
            end, start = xb + 8, xa - 8
        else:
            xv = x(r.low)
            if r.kind == "mark":
                svg.el("path", d=f"M{_n(xv)},{_n(yc - 8)} l7,8 l-7,8 l-7,-8 z", class_=f"mark {r.css}")
            else:
                svg.line(xv, yc - 10, xv, yc + 10, f"rating {r.css}")
            end, start = xv + 10, xv - 10
        if end + text_width(r.text) <= x1:
            svg.text(end, yc + 4, r.text, "row-value")
        else:
            svg.text(start, yc + 4, r.text, "row-value", anchor="end")
        chart.values.append((r.label, r.text))
    if off_scale and psc is not None:
        yc = top + len(rows) * row_h + row_h / 2
        svg.text(label_w, yc + 4, _ellipsis(psc.label, label_w - 8), "row-label", anchor="end")
        svg.text(x1, yc + 4, f"{psc.text}, off scale →", "row-value off-scale", anchor="end")
        chart.values.append((psc.label, f"{psc.text} (off scale)"))
        chart.notes.append(f"hard short {psc.text} lies beyond the axis")
    chart.svg = svg.markup()
    return chart


# --- 3. junction temperature against ambient --------------------------------------------------

@record(frozen=True)
class Curve:
    packages: tuple[str, ...]  # packages whose junctions follow this curve (identical ones share)
    label: str
    points: tuple[tuple[float, float], ...]  # (ambient, T_J)
    dashed: bool
    runaway_at: float | None  # ambient where the balance had no steady state


def ambient_points(a_min: float, a_max: float) -> list[float]:
    """The ambient range's ends and the multiples of 10 °C between them."""
    out = [a_min]
    v = math.floor(a_min / 10.0) * 10.0 + 10.0
    while v < a_max - 1e-9:
        if v > a_min + 1e-9:
            out.append(v)
        v += 10.0
    if a_max > a_min:
        out.append(a_max)
    return out


def tj_curves(model: Any) -> tuple[list[Curve], list[str]]:
    notes: list[str] = []
    gd = model.gate_drive
    if not model.channels:
        return [], ["no switch FETs in the power path"]
    if gd is None:
        return [], ["gate drive unknown (no protector or cell): operating points not computed"]
    a = model.ambient
    load = model.design.load.continuous
    packages = sorted({c.package for c in model.channels})
    cases = (
        # The trip-min corner: highest on-resistance, lowest gate drive (the protector at its
        # over-discharge detection), i.e. the worst case for heat at a given load.
        ("worst", "max", gd.min, False),
        ("typ", "typ", gd.typ, True),
    )
    curves: list[Curve] = []
    ambients = ambient_points(a.min, a.max)
    for name, corner, vgs, dashed in cases:
        pts: dict[str, list[tuple[float, float]]] = {p: [] for p in packages}
        runaway: dict[str, float | None] = {p: None for p in packages}
        for amb in ambients:
            op = model.operating_point(load, amb, vgs, corner)
            for pkg in packages:
                if runaway[pkg] is not None:
                    continue
                if op.runaway:
                    runaway[pkg] = amb
                    continue
                pts[pkg].append((amb, op.tj[pkg]))
        groups: dict[tuple, list[str]] = {}
        for pkg in packages:
            key = (tuple((ax, round(tv, 2)) for ax, tv in pts[pkg]), runaway[pkg])
            groups.setdefault(key, []).append(pkg)
        for (_, stop), pkgs in sorted(groups.items(), key=lambda kv: kv[1][0]):
            who = refs_text(pkgs)
            curves.append(Curve(tuple(pkgs), f"{who} {name}", tuple(pts[pkgs[0]]), dashed, stop))
            if stop is not None:
                notes.append(f"{who}, {name} case: no thermal steady state at {stop:g} °C ambient "
                             f"and above (the junction would pass tj_max)")
    return curves, notes


def junction_temperature(model: Any) -> Chart:
    load = model.design.load.continuous
    chart = Chart("tj", TITLES["tj"],
                  f"Steady-state junction temperature of each switch package carrying the "
                  f"continuous load ({q(load, 'A')}) with self-heating. Solid, “worst”: the trip-min "
                  f"corner (highest on-resistance, lowest gate drive); dashed, “typ”: typical values. "
                  f"The ring marks the operating point the over-current trip minimum is computed at.")
    curves, notes = tj_curves(model)
    chart.notes.extend(notes)
    if not curves:
        return chart
    a = model.ambient
    parts = {c.package: c.part for c in model.channels}
    packages = sorted(parts)
    t = model.overcurrent_trip
    corner_pt = None
    if t is not None and t.at_min.current == load and not t.at_min.runaway:
        corner_pt = {pkg: (t.at_min.ambient, t.at_min.tj[pkg]) for pkg in packages if pkg in t.at_min.tj}

    W, H = 530.0, 440.0
    x0, x1, top, bottom = 46.0, W - 178.0, 22.0, H - 46.0
    tj_limits = sorted({parts[p].tj_max for p in packages})
    derated = model.limits.junction  # switch-temperature's limit, as the rule judges by it
    ys = [v for c in curves for _, v in c.points] + tj_limits + [derated, a.min, a.max]
    ylo, yhi = min(ys), max(ys)
    pad = (yhi - ylo) * 0.06
    ylo, yhi = ylo - pad, yhi + pad
    xlo, xhi = a.min, a.max if a.max > a.min else a.min + 1.0

    def x(v: float) -> float:
        return x0 + (v - xlo) / (xhi - xlo) * (x1 - x0)

    def y(v: float) -> float:
        return bottom - (v - ylo) / (yhi - ylo) * (bottom - top)

    svg = Svg(W, H, "Junction temperature of the switch FETs against ambient temperature", "tj")
    for v in linear_ticks(ylo, yhi, 7):
        svg.line(x0, y(v), x1, y(v), "grid")
        svg.text(x0 - 6, y(v) + 4, tick_text(v), "tick", anchor="end")
    for v in linear_ticks(xlo, xhi, 6):
        svg.line(x(v), top, x(v), bottom, "grid")
        svg.text(x(v), bottom + 16, tick_text(v), "tick", anchor="middle")
    svg.line(x0, bottom, x1, bottom, "axis")
    svg.line(x0, top, x0, bottom, "axis")
    svg.text((x0 + x1) / 2, bottom + 36, "ambient, °C", "axis-title", anchor="middle")
    svg.text(x0 - 6, top - 8, "Tj, °C", "axis-title", anchor="end")

    labels: list[tuple[float, str, str]] = []  # (wanted y, text, css)
    # the diagonal: a junction at ambient, no self-heating, for scale
    svg.line(x(xlo), y(xlo), x(xhi), y(xhi), "l-diagonal")
    labels.append((y(xhi), "Tj = ambient", "t-diagonal"))
    svg.line(x0, y(derated), x1, y(derated), "l-limit")
    labels.append((y(derated), f"derating {derated:g} °C", "t-l-limit"))
    for lim in tj_limits:
        who = refs_text([p for p in packages if parts[p].tj_max == lim])
        svg.line(x0, y(lim), x1, y(lim), "l-never")
        labels.append((y(lim), f"{who} tj_max {lim:g} °C", "t-l-never"))
    colour = {pkg: k % 4 for k, pkg in enumerate(packages)}
    for c in curves:  # a shared curve takes its first package's colour
        for pkg in c.packages:
            colour.setdefault(pkg, colour[c.packages[0]])
    for c in curves:
        for ax, tv in c.points:
            chart.values.append((f"{c.label}, {ax:g} °C ambient", f"{tv:.1f} °C"))
        if c.runaway_at is not None:
            chart.values.append((f"{c.label}, {c.runaway_at:g} °C ambient", "no steady state"))
        if not c.points:
            continue
        pts = " ".join(f"{_n(x(ax))},{_n(y(tv))}" for ax, tv in c.points)
        svg.el("polyline", points=pts, class_=f"curve c{colour[c.packages[0]]}" + (" dashed" if c.dashed else ""))
        for ax, tv in c.points:
            svg.el("circle", cx=float(x(ax)), cy=float(y(tv)), r=2.2 if c.dashed else 2.8,
                   class_=f"pt c{colour[c.packages[0]]}")
        end_a, end_t = c.points[-1]
        labels.append((y(end_t), f"{c.label} {end_t:.1f} °C", f"t-c{colour[c.packages[0]]}"))
    if corner_pt:
        drawn: dict[tuple[float, float], list[str]] = {}
        for pkg, (ax, tv) in sorted(corner_pt.items()):
            drawn.setdefault((ax, round(tv, 2)), []).append(pkg)
        for (ax, tv), pkgs in sorted(drawn.items(), key=lambda kv: kv[1][0]):
            svg.el("circle", cx=float(x(ax)), cy=float(y(tv)), r=5.5, class_=f"corner c{colour[pkgs[0]]}")
            chart.values.append((f"{refs_text(pkgs)} at the trip-min corner ({ax:g} °C, "
                                 f"{q(t.at_min.vgs, 'V')} gate drive)", f"{tv:.1f} °C"))
    ly = spread([w for w, _, _ in labels], FONT + 4, top, bottom)
    for (wanted, text, css), lyy in zip(labels, ly):
        svg.el("polyline", points=f"{_n(x1)},{_n(wanted)} {_n(x1 + 8)},{_n(lyy)} {_n(x1 + 12)},{_n(lyy)}",
               class_="leader")
        svg.text(x1 + 15, lyy + 4, _ellipsis(text, W - x1 - 17), css)
    for lim in tj_limits:
        chart.values.append((f"tj_max ({refs_text([p for p in packages if parts[p].tj_max == lim])})",
                             f"{lim:g} °C"))
    chart.values.append(("derating line", f"{derated:g} °C"))
    chart.svg = svg.markup()
    return chart


# --- 4. time-current coordination -------------------------------------------------------------

def clip_polyline(points: Sequence[tuple[float, float]],
                  box: tuple[float, float, float, float]) -> list[list[tuple[float, float]]]:
    """The runs of a polyline inside ``box`` (x0, y0, x1, y1), each segment cut where it leaves
    (Liang–Barsky), so a curve that runs off the plot stops at its edge."""
    bx0, by0, bx1, by1 = box
    runs: list[list[tuple[float, float]]] = []
    current: list[tuple[float, float]] = []
    for (ax, ay), (bx, by) in zip(points, points[1:]):
        dx, dy = bx - ax, by - ay
        lo, hi = 0.0, 1.0
        for p, qv in ((-dx, ax - bx0), (dx, bx1 - ax), (-dy, ay - by0), (dy, by1 - ay)):
            if p == 0:
                if qv < 0:
                    lo, hi = 1.0, 0.0
                continue
            r = qv / p
            if p < 0:
                lo = max(lo, r)
            else:
                hi = min(hi, r)
        if lo > hi:
            if current:
                runs.append(current)
                current = []
            continue
        start = (ax + lo * dx, ay + lo * dy)
        end = (ax + hi * dx, ay + hi * dy)
        if not current or lo > 0:
            if current:
                runs.append(current)
            current = [start]
        current.append(end)
        if hi < 1:
            runs.append(current)
            current = []
    if current:
        runs.append(current)
    return [r for r in runs if len(r) > 1]


_KIND_WORDS = {"fuse": "melts", "ptc": "PTC", "fet": "FET rating", "conductor": "withstand"}


def time_current_chart(model: Any) -> Chart:
    """Log current against log time: the events, the protector's detections, the fuse's melting
    limit and gates, the FETs' ratings and the traces' withstand, all from
    :func:`packwarden.model.coordination.time_current` (the chart computes nothing itself)."""
    from ..model.coordination import DURATIONS, time_current
    chart = Chart("tc", TITLES["tc"],
                  "Pack current against time, both logarithmic. Each event is a bar up to its "
                  "duration (green: a load or what the protection permits; purple: a fault a "
                  "detection ends; dashed to the top: for ever). Shaded: the protector's "
                  "detections, trip current window by delay window, lighter where they surely "
                  "trip. Lines: where a fuse melts (with the standard's gates as bars), a PTC's "
                  "hold current and I_max, the FETs' ratings and steady thermal limit (θJA, at the highest "
                  "ambient), the traces' adiabatic withstand. "
                  "An event must end (its bar top) below every line it crosses: the part whose "
                  "line lies lowest above an event acts or fails first.")
    tc = time_current(model)
    chart.notes.extend(tc.notes)
    if not tc.marks:
        return chart
    currents = ([mk.current for mk in tc.marks] + [w.current_min for w in tc.windows]
                + [w.current_max for w in tc.windows])
    xlo, xhi = nice_below(min(currents) / 2), nice_above(max(currents) * 3)
    ylo, yhi = DURATIONS[0], DURATIONS[-1]
    W, H = 1180.0, 470.0
    x0, x1, top, bottom = 84.0, 840.0, 16.0, H - 46.0
    lx = x1 + 22

    def x(i: float) -> float:
        return x0 + (math.log10(i) - math.log10(xlo)) / (math.log10(xhi) - math.log10(xlo)) * (x1 - x0)

    def y(t: float) -> float:
        t = min(max(t, ylo / 10), yhi * 10)
        return bottom - (math.log10(t) - math.log10(ylo)) / (math.log10(yhi) - math.log10(ylo)) * (bottom - top)

    svg = Svg(W, H, "Time-current coordination: events, detections and part limits", "tc")
    decades = (math.log10(xhi) - math.log10(xlo)) > 3
    for v in log_ticks(xlo, xhi):
        if decades and not math.isclose(math.log10(v), round(math.log10(v))):
            continue
        svg.line(x(v), top, x(v), bottom, "grid")
        svg.text(x(v), bottom + 16, tick_text(v), "tick", anchor="middle")
    for e in range(round(math.log10(ylo)), round(math.log10(yhi)) + 1):
        svg.line(x0, y(10.0 ** e), x1, y(10.0 ** e), "grid")
        t = 10.0 ** e
        svg.text(x0 - 6, y(t) + 4, q(t, "s") if t < 1 else f"{t:g} s", "tick", anchor="end")
    svg.line(x0, bottom, x1, bottom, "axis")
    svg.line(x0, top, x0, bottom, "axis")
    svg.text((x0 + x1) / 2, bottom + 36, "pack current, A", "axis-title", anchor="middle")
    svg.text(x0 - 68, top + (bottom - top) / 2, "time", "axis-title", anchor="middle",
             transform=f"rotate(-90 {_n(x0 - 68)} {_n(top + (bottom - top) / 2)})")
    box = (x0, top, x1, bottom)
    for w in tc.windows:
        css = f"tc-w tc-{w.detection}"
        for a, b, extra in ((w.current_min, w.current_max, ""), (w.current_max, xhi, " sure")):
            xa, xb = max(x(a), x0), min(x(b), x1)
            ya, yb = max(y(w.delay_max), top), min(y(w.delay_min), bottom)
            svg.rect(xa, ya, xb - xa, yb - ya, css + extra)
        chart.values.append((f"{w.detection} detection",
                             f"trips {span_text(w.current_min, w.current_max, 'A')} after "
                             f"{span_text(w.delay_min, w.delay_max, 's')}"))
    for g in tc.gates:
        lo = y(g.t_min) if g.t_min > 0 else bottom
        hi = y(g.t_max) if math.isfinite(g.t_max) else top
        if x0 <= x(g.current) <= x1:
            svg.line(x(g.current), lo, x(g.current), hi, "tc-gate")
        chart.values.append((f"{g.element} gate at {q(g.current, 'A')}",
                             f"melts after {q(g.t_min, 's') if g.t_min > 0 else '—'} and before "
                             f"{q(g.t_max, 's') if math.isfinite(g.t_max) else '—'}"))
    # Identical parts draw one line, labelled once: "Q1–Q4 θJA steady".
    same: dict[tuple, list[Any]] = {}
    for lim in tc.limits:
        key = (lim.kind, lim.label[len(lim.element):], lim.basis,
               tuple((round(i, 6), t) for i, t in lim.points))
        same.setdefault(key, []).append(lim)
    drawn = []
    for (kind, rest, basis, _), group in same.items():
        lim = group[0]
        drawn.append((kind, refs_text([g.element for g in group]) + rest))
        for run in clip_polyline([(x(i), y(t)) for i, t in lim.points], box):
            svg.el("polyline", points=" ".join(f"{_n(a)},{_n(b)}" for a, b in run),
                   class_=f"tc-limit k-{kind}")
        chart.values.append((drawn[-1][1], basis))
    placed: list[tuple[float, float]] = []
    for k, mk in enumerate(tc.marks, 1):
        css = "m-load" if mk.load else "m-fault"
        xm = min(max(x(mk.current), x0), x1)
        if mk.duration is None:
            svg.line(xm, bottom, xm, top, f"tc-mark {css} ever")
            ym = top + 10
        else:
            ym = y(mk.duration)
            svg.line(xm, bottom, xm, ym, f"tc-mark {css}")
            svg.el("circle", cx=float(xm), cy=float(ym), r=4.0, class_=f"tc-dot {css}")
        # the number beside its event, moved down clear of the numbers already placed
        ny = max(ym - 5, top + FONT)
        while any(abs(xm - px) < 14 and abs(ny - py) < FONT + 2 for px, py in placed):
            ny += FONT + 2
        placed.append((xm, ny))
        svg.text(xm + 5, ny, str(k), f"tc-num {css}")
        chart.values.append((f"{k}: {mk.name}", f"{q(mk.current, 'A')}, "
                             + ("for ever" if mk.duration is None else f"for {q(mk.duration, 's')}")))
    # the legend: the numbered events, then each line's kind
    ly = top + 4
    svg.text(lx, ly + 8, "events", "col-head")
    for k, mk in enumerate(tc.marks, 1):
        ly += FONT + 5
        when = "for ever" if mk.duration is None else q(mk.duration, "s")
        svg.text(lx, ly + 8, _ellipsis(f"{k}  {mk.name}: {q(mk.current, 'A')}, {when}", W - lx - 4),
                 "tc-legend " + ("m-load" if mk.load else "m-fault"))
    ly += FONT + 12
    svg.text(lx, ly + 8, "limits", "col-head")
    keys = [(f"tc-limit k-{kind}", f"{label} ({_KIND_WORDS[kind]})") for kind, label in drawn]
    keys += [("tc-gate", f"{who} the standard's gates (melts within)")
             for who in dict.fromkeys(g.element for g in tc.gates)]
    for css, text in keys:
        ly += FONT + 5
        if ly > H - 8:
            break
        svg.line(lx, ly + 4, lx + 22, ly + 4, css)
        svg.text(lx + 28, ly + 8, _ellipsis(text, W - lx - 32), "tc-legend")
    chart.svg = svg.markup()
    return chart


__all__ = ["Chart", "charts_for", "voltage_ladder", "trip_window", "junction_temperature", "spread",
           "ladder_data", "trip_rows", "tj_curves", "Svg", "text_width", "time_current_chart"]


# --- 5. blocking voltage per switch -----------------------------------------------------------

@record(frozen=True)
class BlockingCase:
    """One voltage an off switch must block (the model's, in words) against its ratings."""

    switches: str  # "Q1.1" or "Q1.1, Q2.1" for parallel channels that block the same
    role: str
    what: str
    volts: float
    vds_max: float
    derated: float


def blocking_cases(model: Any) -> list[BlockingCase]:
    """Every switch channel's blocking voltages (``DesignModel.blocking_voltage`` and the
    turn-off spike of a short where the design gives the wiring inductance), its vds_max and the
    derated limit (``Limits.vds_derating``); parallel channels that block the same voltages are
    one entry. No value is computed here."""
    groups: dict[tuple, list[str]] = {}
    for ch in model.channels:
        if ch.role is None:
            continue
        cases = list(model.blocking_voltage(ch.role))
        spike = model.turn_off_spike(ch)
        if spike is not None:
            cases.append((spike.describe(), spike.total))
        key = (ch.role, ch.part.vds_max, tuple(sorted(cases, key=lambda c: -c[1])))
        groups.setdefault(key, []).append(ch.name)
    out = []
    for (role, vds_max, cases), names in groups.items():
        for what, volts in cases:
            out.append(BlockingCase(refs_text(names), role, what.split(":")[0], volts, vds_max,
                                    vds_max * model.limits.vds_derating))
    return out


def blocking_voltage(model: Any) -> Chart:
    chart = Chart("vds", TITLES["vds"],
                  "What each switch must block when it is off, against its vds_max (solid line) "
                  "and the derated limit (dashed). A bar past the dashed line fails "
                  "switch-voltage-margin; past the solid line the switch avalanches.")
    cases = [c for c in blocking_cases(model) if _finite_pos(c.volts) and _finite_pos(c.vds_max)]
    if not cases:
        chart.notes.append("nothing to plot: no switch with a role and a known blocking voltage")
        return chart
    hi = nice_above(max(max(c.volts, c.vds_max) for c in cases) * 1.1)
    W = 1180.0
    label_w, x0, x1 = 462.0, 472.0, W - 24.0
    row_h, top = max(26.0, 180.0 / len(cases)), 34.0  # a few rows still make a readable chart
    plot_bottom = top + len(cases) * row_h
    H = plot_bottom + 46.0

    def x(v: float) -> float:
        return x0 + max(v, 0.0) / hi * (x1 - x0)

    svg = Svg(W, H, "Blocking voltage of each switch against its vds_max and derated limit", "vds")
    lx = x0  # the legend: what each line and colour means
    for cls, word in (("vds-within", "within the derated limit"),
                      ("vds-over-derated", "over the derated limit"),
                      ("vds-over-rating", "over vds_max")):
        svg.rect(lx, 8, 14, 10, f"vds-key {cls}")
        svg.text(lx + 19, 17, word, "tick")
        lx += 19 + text_width(word, 11) + 18
    for cls, word in (("vds-rating", "vds_max"), ("vds-derated", "derated limit")):
        svg.line(lx + 7, 6, lx + 7, 20, cls)
        svg.text(lx + 15, 17, word, "tick")
        lx += 15 + text_width(word, 11) + 18
    for k in range(len(cases)):
        if k % 2 == 0:
            svg.rect(0, top + k * row_h, W, row_h, "row-stripe")
    for v in linear_ticks(0.0, hi, 8):
        svg.line(x(v), top, x(v), plot_bottom, "grid")
        svg.text(x(v), plot_bottom + 16, tick_text(v), "tick", anchor="middle")
    svg.line(x0, plot_bottom, x1, plot_bottom, "axis")
    svg.text((x0 + x1) / 2, plot_bottom + 36, "voltage, V", "axis-title", anchor="middle")
    for k, c in enumerate(cases):
        y0, yc = top + k * row_h, top + k * row_h + row_h / 2
        label = f"{c.switches} ({c.role}): {c.what}"
        svg.text(label_w, yc + 4, _ellipsis(label, label_w - 8), "row-label", anchor="end")
        state = ("over-rating" if c.volts > c.vds_max else
                 "over-derated" if c.volts > c.derated else "within")
        svg.rect(x0, yc - 7, x(c.volts) - x0, 14, f"vds-bar vds-{state}")
        svg.line(x(c.vds_max), y0 + 2, x(c.vds_max), y0 + row_h - 2, "vds-rating")
        svg.line(x(c.derated), y0 + 2, x(c.derated), y0 + row_h - 2, "vds-derated")
        text = q(c.volts, "V")
        end = max(x(c.volts), x(c.vds_max)) + 8
        svg.text(end, yc + 4, text, "row-value")
        chart.values.append((label, f"{text} (vds_max {q(c.vds_max, 'V')}, derated "
                                    f"{q(c.derated, 'V')})"))
    chart.svg = svg.markup()
    return chart
