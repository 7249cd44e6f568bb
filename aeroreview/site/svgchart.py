"""Simple charts written as SVG text directly: lines, bars, bands and labels on linear axes.

Why not matplotlib for these: laying out one figure there costs 60-120 ms (ticks, text
extents, a second pass for the tight box), which made the site build ten times a plain MkDocs
build; the review's charts are lines, bars and shaded bands on linear axes, which take a
fraction of a millisecond to write as text. Margins are fixed per chart kind (no tight box);
the browser test measures every drawn text against the canvas, so a clipped label fails.

Output is deterministic: coordinates rounded to 0.01 pt, no ids or dates. Text is XML-escaped
and drawn literally (no markup, no math), the same escaping for every label.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from xml.sax.saxutils import escape

FONT = "DejaVu Sans, Bitstream Vera Sans, Arial, Helvetica, sans-serif"  # matplotlib's default family first
SIZE = 9.0  # pt, the site's figure text size (matplotlib's STYLE font.size)
GRID = "#b0b0b0"  # matplotlib's grid colour, drawn at the style's grid alpha
# Advance widths [em] of the printable ASCII characters in DejaVu Sans Book (read from the font
# that matplotlib ships, at 100 pt, rounded to 0.01 em); any other character counts 0.8 em,
# wider than most, so estimates err wide and labels stay inside the canvas.
_ASCII = "".join(chr(c) for c in range(32, 127))
_EM = [0.32, 0.4, 0.47, 0.84, 0.64, 0.96, 0.78, 0.28, 0.39, 0.39, 0.5, 0.85, 0.32, 0.36, 0.32, 0.34, 0.64, 0.64, 0.64,
       0.64, 0.64, 0.64, 0.64, 0.64, 0.64, 0.64, 0.34, 0.34, 0.84, 0.85, 0.84, 0.53, 1.0, 0.68, 0.69, 0.7, 0.77, 0.63,
       0.58, 0.78, 0.75, 0.29, 0.29, 0.65, 0.56, 0.86, 0.75, 0.79, 0.6, 0.79, 0.7, 0.64, 0.62, 0.73, 0.68, 0.99, 0.69,
       0.61, 0.68, 0.39, 0.34, 0.39, 0.84, 0.5, 0.5, 0.62, 0.63, 0.56, 0.64, 0.62, 0.35, 0.64, 0.63, 0.28, 0.28, 0.58,
       0.28, 0.97, 0.63, 0.61, 0.63, 0.64, 0.42, 0.52, 0.39, 0.63, 0.59, 0.82, 0.59, 0.59, 0.52, 0.63, 0.34, 0.64, 0.84]
ADVANCE = dict(zip(_ASCII, _EM))
OTHER_EM = 0.8
STYLE = {"font": FONT, "size": SIZE, "grid": GRID, "grid_alpha": 0.3, "other_em": OTHER_EM, "version": 1}


def text_width(text: str, size: float = SIZE) -> float:
    """Estimated width [pt] of ``text`` at ``size`` pt."""
    return size * sum(ADVANCE.get(c, OTHER_EM) for c in text)


def fit(text: str, width: float, size: float = SIZE) -> str:
    """``text`` shortened with an ellipsis where it would be wider than ``width`` (sheet text can be long)."""
    if text_width(text, size) <= width:
        return text
    while text and text_width(text + "\u2026", size) > width:
        text = text[:-1]
    return text + "\u2026"


def _n(value: float) -> str:
    text = f"{value:.2f}".rstrip("0").rstrip(".")
    return "0" if text in ("-0", "") else text


def nice_ticks(low: float, high: float, most: int = 6) -> list[float]:
    """Round tick values inside [low, high], steps of 1, 2, 2.5 or 5 times a power of ten
    (the steps matplotlib's MaxNLocator uses by default)."""
    raw = (high - low) / most
    magnitude = 10 ** math.floor(math.log10(raw))
    step = next(m * magnitude for m in (1, 2, 2.5, 5, 10) if m * magnitude >= raw * (1 - 1e-9))
    first = math.ceil(low / step - 1e-9)
    values = [(first + i) * step for i in range(int(math.floor(high / step + 1e-9)) - first + 1)]
    return [0.0 if abs(v) < step * 1e-9 else v for v in values]


def tick_label(value: float, ticks: list[float]) -> str:
    step = ticks[1] - ticks[0] if len(ticks) > 1 else 1.0
    decimals = max(0, -math.floor(math.log10(step) + 1e-9) + (1 if round(step / 10 ** math.floor(
        math.log10(step) + 1e-9), 6) == 2.5 else 0))
    return f"{value:.{decimals}f}".replace("-", "\u2212")


@dataclass
class Axis:
    """One linear scale: data limits (automatic with a 5 % margin, as matplotlib's) onto pixels."""

    low: float | None = None
    high: float | None = None
    seen: list[float] = field(default_factory=list)
    ticks: list[float] | None = None
    labels: list[str] | None = None
    inverted: bool = False
    margin: float = 0.05

    def limits(self) -> tuple[float, float]:
        if self.low is not None and self.high is not None:
            return self.low, self.high
        values = [v for v in self.seen if v is not None and math.isfinite(v)] or [0.0, 1.0]
        low, high = min(values), max(values)
        if high - low < 1e-12:
            low, high = low - (abs(low) * 0.05 or 0.5), high + (abs(high) * 0.05 or 0.5)
        pad = (high - low) * self.margin
        return (self.low if self.low is not None else low - pad), (self.high if self.high is not None else high + pad)

    def tick_values(self) -> list[float]:
        return self.ticks if self.ticks is not None else nice_ticks(*self.limits())

    def scale(self, start: float, end: float):
        low, high = self.limits()
        if self.inverted:
            start, end = end, start
        return lambda v: start + (v - low) / (high - low) * (end - start)


class Panel:
    """One plot area: its drawings are kept until the limits are known, then written in order."""

    def __init__(self, box: tuple[float, float, float, float], canvas: float, sharex: Panel | None = None):
        self.box = box  # left, top, right, bottom in pt
        self.canvas = canvas  # the chart's width [pt]: labels wider than the panel stay inside it
        self.x = sharex.x if sharex else Axis()
        self.y = Axis()
        self.layers: list = []  # drawn inside the panel, clipped to it
        self.notes: list = []  # text, drawn over everything and never clipped (as matplotlib's annotations)
        self.legend_entries: list[tuple[str, dict]] = []
        self.legend_at: tuple[str, float] | None = None
        self.xlabel = self.ylabel = ""
        self.ylabel_colour = "#000000"
        self.side = "left"
        self.grid = True

    # drawings -------------------------------------------------------------------------------
    def plot(self, xs, ys, colour: str, width: float = 1.5, dash: bool = False, marker: str | None = None,
             label: str | None = None) -> None:
        self.x.seen += list(xs)
        self.y.seen += [y for y in ys if y is not None]
        style = {"stroke": colour, "width": width, "dash": dash, "marker": marker}
        self.layers.append(lambda sx, sy: _polyline(xs, ys, sx, sy, style))
        self._entry(label, style)

    def hline(self, y: float, colour: str, width: float = 0.8, dash: bool = False, label: str | None = None) -> None:
        self.y.seen.append(y)
        style = {"stroke": colour, "width": width, "dash": dash, "marker": None}
        self.layers.append(lambda sx, sy: _line(self.box[0], sy(y), self.box[2], sy(y), style))
        self._entry(label, style)

    def vline(self, x: float, colour: str, width: float = 0.8, dash: bool = False) -> None:
        self.x.seen.append(x)
        style = {"stroke": colour, "width": width, "dash": dash, "marker": None}
        self.layers.append(lambda sx, sy: _line(sx(x), self.box[1], sx(x), self.box[3], style))

    def vspan(self, start: float, end: float, colour: str, alpha: float, label: str | None = None) -> None:
        self.x.seen += [start, end]
        self.layers.append(lambda sx, sy: _rect(min(sx(start), sx(end)), self.box[1], abs(sx(end) - sx(start)),
                                                self.box[3] - self.box[1], colour, alpha))
        self._entry(label, {"fill": colour, "alpha": alpha})

    def band(self, xs, lows, highs, colour: str, alpha: float, label: str | None = None) -> None:
        """The area between two curves (matplotlib's fill_between)."""
        self.x.seen += list(xs)
        self.y.seen += list(lows) + list(highs)
        def draw(sx, sy):
            points = [(sx(x), sy(y)) for x, y in zip(xs, highs)] + [(sx(x), sy(y)) for x, y in
                                                                    reversed(list(zip(xs, lows)))]
            return (f'<polygon points="{" ".join(f"{_n(a)},{_n(b)}" for a, b in points)}" fill="{colour}" '
                    f'fill-opacity="{alpha}"/>')
        self.layers.append(draw)
        self._entry(label, {"fill": colour, "alpha": alpha})

    def barh(self, rows, widths, colours, lefts=None, height: float = 0.8, hatch: bool = False,
             label: str | None = None) -> None:
        """Horizontal bars at rows 0, 1, ... (from the top when the y axis is inverted)."""
        lefts = lefts or [0.0] * len(rows)
        self.x.seen += [v for left, w in zip(lefts, widths) for v in (left, left + w)]
        def draw(sx, sy):
            parts = []
            for row, w, left, colour in zip(rows, widths, lefts, colours):
                a, b = sorted((sx(left), sx(left + w)))
                top, bottom = sorted((sy(row - height / 2), sy(row + height / 2)))
                parts.append(_rect(a, top, b - a, bottom - top, colour, 1.0, hatch))
            return "".join(parts)
        self.layers.append(draw)
        self._entry(label, {"fill": colours[0], "alpha": 1.0, "hatch": hatch})

    def scatter(self, xs, ys, colour: str, marker: str = "o", alpha: float = 1.0, label: str | None = None) -> None:
        """Markers only, no line between them."""
        self.x.seen += list(xs)
        self.y.seen += list(ys)
        self.layers.append(lambda sx, sy: "".join(_marker(marker, sx(x), sy(y), colour, alpha) for x, y in zip(xs, ys)))
        self._entry(label, {"stroke": colour, "width": 0, "dash": False, "marker": marker, "alpha": alpha})

    def errorbar(self, x: float, y: float, colour: str, xerr=None, yerr=None, marker: str = "o",
                 label: str | None = None) -> None:
        """A marker with its interval drawn as a line with end caps; ``xerr``/``yerr`` are the (low, high) ends."""
        self.x.seen += [x, *(xerr or ())]
        self.y.seen += [y, *(yerr or ())]
        style = {"stroke": colour, "width": 1.5, "dash": False, "marker": marker}
        def draw(sx, sy):
            parts = []
            if xerr:
                parts += [_line(sx(xerr[0]), sy(y), sx(xerr[1]), sy(y), style)]
                parts += [_line(sx(end), sy(y) - 3, sx(end), sy(y) + 3, style) for end in xerr]
            if yerr:
                parts += [_line(sx(x), sy(yerr[0]), sx(x), sy(yerr[1]), style)]
                parts += [_line(sx(x) - 3, sy(end), sx(x) + 3, sy(end), style) for end in yerr]
            return "".join(parts) + _marker(marker, sx(x), sy(y), colour)
        self.layers.append(draw)
        self._entry(label, style)

    def text(self, x: float, y: float, text: str, size: float = SIZE, anchor: str = "start", baseline: str = "middle",
             dx: float = 0, dy: float = 0, rotate: bool = False, colour: str = "#000000", axes_y: bool = False) -> None:
        """Text at data (x, y), or at data x and a fraction of the panel's height with ``axes_y``;
        ``dx``/``dy`` move it in pt (up is positive), ``rotate`` turns it to read upwards."""
        def draw(sx, sy):
            py = self.box[3] - y * (self.box[3] - self.box[1]) if axes_y else sy(y)
            return _text(sx(x) + dx, py - dy, text, size, anchor, baseline, colour, -90 if rotate else 0)
        self.notes.append(draw)

    def legend(self, where: str = "upper left", size: float = 7.0) -> None:
        self.legend_at = (where, size)

    def _entry(self, label, style) -> None:
        if label:
            self.legend_entries.append((label, style))

    # rendering ------------------------------------------------------------------------------
    def render(self, index: int) -> str:
        left, top, right, bottom = self.box
        sx, sy = self.x.scale(left, right), self.y.scale(bottom, top)
        parts = [f'<clipPath id="p{index}"><rect x="{_n(left)}" y="{_n(top)}" '
                 f'width="{_n(right - left)}" height="{_n(bottom - top)}"/></clipPath>']
        if self.grid:
            parts += [_grid_line(sx(v), top, sx(v), bottom) for v in self.x.tick_values()]
            parts += [_grid_line(left, sy(v), right, sy(v)) for v in self.y.tick_values()]
        parts.append(f'<g clip-path="url(#p{index})">' + "".join(draw(sx, sy) for draw in self.layers) + "</g>")
        parts.append(self._axes(sx, sy))
        parts += [draw(sx, sy) for draw in self.notes]
        if self.legend_at and self.legend_entries:
            parts.append(self._legend())
        return "".join(parts)

    def _axes(self, sx, sy) -> str:
        left, top, right, bottom = self.box
        edge = left if self.side == "left" else right
        parts = [f'<path d="M{_n(edge)} {_n(top)}V{_n(bottom)}" stroke="#000" stroke-width="0.8"/>']
        y_ticks = self.y.tick_values()
        y_labels = self.y.labels or [tick_label(v, y_ticks) for v in y_ticks]
        sign, anchor = (-1, "end") if self.side == "left" else (1, "start")
        for value, label in zip(y_ticks, y_labels):
            parts.append(f'<path d="M{_n(edge)} {_n(sy(value))}h{sign * 3.5}" stroke="#000" stroke-width="0.8"/>')
            parts.append(_text(edge + sign * 5.5, sy(value), label, SIZE, anchor, "middle"))
        if self.ylabel:
            widest = max((text_width(label) for label in y_labels), default=0)
            parts.append(_text(edge + sign * (widest + 12), (top + bottom) / 2, self.ylabel, SIZE, "middle",
                               "middle", self.ylabel_colour, -90 if self.side == "left" else 90))
        if self.side == "left":
            parts.append(f'<path d="M{_n(left)} {_n(bottom)}H{_n(right)}" stroke="#000" stroke-width="0.8"/>')
            x_ticks = self.x.tick_values()
            for value, label in zip(x_ticks, self.x.labels or [tick_label(v, x_ticks) for v in x_ticks]):
                parts.append(f'<path d="M{_n(sx(value))} {_n(bottom)}v3.5" stroke="#000" stroke-width="0.8"/>')
                if self.xlabel is not None:
                    parts.append(_text(sx(value), bottom + 5, label, SIZE, "middle", "hanging"))
            if self.xlabel:
                parts.append(_text(centred((left + right) / 2, text_width(self.xlabel), self.canvas), bottom + 19,
                                   self.xlabel, SIZE, "middle", "hanging"))
        return "".join(parts)

    def _legend(self) -> str:
        """A framed legend inside the panel, one entry a row; or, with "above", one row over the panel."""
        where, size = self.legend_at
        left, top, right, bottom = self.box
        if where == "above":
            widths = [30 + text_width(label, size) + 8 for label, _ in self.legend_entries]
            x = centred((left + right) / 2, sum(widths), self.canvas) - sum(widths) / 2
            starts = [x + sum(widths[:i]) for i in range(len(widths))]
            return "".join(_legend_entry(start, top - size, label, style, size)
                           for start, (label, style) in zip(starts, self.legend_entries))
        row = size * 1.45
        width = 30 + max(text_width(label, size) for label, _ in self.legend_entries)
        height = row * len(self.legend_entries) + 6
        x = {"left": left + 6, "right": right - 6 - width, "center": (left + right - width) / 2}[where.split()[1]]
        y = top + 6 if where.startswith("upper") else bottom - 6 - height
        parts = [f'<rect x="{_n(x)}" y="{_n(y)}" width="{_n(width)}" height="{_n(height)}" fill="#fff" '
                 'fill-opacity="0.8" stroke="#ccc" stroke-width="0.8" rx="2"/>']
        parts += [_legend_entry(x, y + 3 + row * (i + 0.5), label, style, size)
                  for i, (label, style) in enumerate(self.legend_entries)]
        return "".join(parts)


def _legend_entry(x: float, middle: float, label: str, style: dict, size: float) -> str:
    """One legend entry starting at ``x``: its swatch, line or marker, then its label."""
    if "fill" in style:
        key = _rect(x + 6, middle - size * 0.35, 16, size * 0.7, style["fill"], style["alpha"], style.get("hatch", False))
    else:
        key = _line(x + 5, middle, x + 23, middle, style) if style["width"] else ""
        if style["marker"]:
            key += _marker(style["marker"], x + 14, middle, style["stroke"], style.get("alpha", 1.0))
    return key + _text(x + 27, middle, label, size, "start", "middle")


class Chart:
    """A canvas of ``width`` x ``height`` pt holding panels, a title and free text."""

    def __init__(self, width: float, height: float):
        self.width, self.height = width, height
        self.panels: list[Panel] = []
        self.extra: list[str] = []

    def panel(self, left: float, top: float, right: float, bottom: float, sharex: Panel | None = None) -> Panel:
        """A plot area with the given margins [pt] from the canvas edges."""
        panel = Panel((left, top, self.width - right, self.height - bottom), self.width, sharex)
        self.panels.append(panel)
        return panel

    def twin(self, panel: Panel) -> Panel:
        """A second y axis on the right of ``panel``, sharing its x axis (no grid)."""
        other = Panel(panel.box, self.width, sharex=panel)
        other.side, other.grid = "right", False
        self.panels.append(other)
        return other

    def title(self, text: str, over: Panel | None = None, size: float = SIZE * 1.2, pad: float = 6) -> None:
        left, top, right, _ = over.box if over else (0, 0, self.width, 0)
        text = fit(text, self.width - 8, size)
        self.extra.append(_text(centred((left + right) / 2, text_width(text, size), self.width),
                                top - pad if over else size + 4, text, size, "middle", "alphabetic"))

    def svg(self) -> bytes:
        body = "".join(p.render(i) for i, p in enumerate(self.panels)) + "".join(self.extra)
        return (f'<svg xmlns="http://www.w3.org/2000/svg" width="{_n(self.width)}pt" height="{_n(self.height)}pt" '
                f'viewBox="0 0 {_n(self.width)} {_n(self.height)}" font-family="{FONT}" font-size="{SIZE}">'
                f'<defs><pattern id="hatch" width="4" height="4" patternUnits="userSpaceOnUse">'
                f'<path d="M0 4L4 0" stroke="#000" stroke-width="0.6"/></pattern></defs>'
                f'<rect width="100%" height="100%" fill="#fff"/>{body}</svg>\n').encode()


def centred(middle: float, width: float, canvas: float, edge: float = 3) -> float:
    """The centre for a text ``width`` wide near ``middle``, moved inwards so it stays on the canvas."""
    return min(max(middle, width / 2 + edge), canvas - width / 2 - edge)


def _polyline(xs, ys, sx, sy, style) -> str:
    runs, run = [], []
    for x, y in zip(xs, ys):  # None or NaN breaks the line, as in matplotlib
        if y is None or not math.isfinite(y):
            runs, run = runs + [run] if run else runs, []
        else:
            run.append((sx(x), sy(y)))
    runs += [run] if run else []
    parts = [f'<polyline points="{" ".join(f"{_n(a)},{_n(b)}" for a, b in r)}" fill="none"{_stroke(style)}/>'
             for r in runs]
    if style["marker"]:
        parts += [_marker(style["marker"], a, b, style["stroke"]) for r in runs for a, b in r]
    return "".join(parts)


def _stroke(style) -> str:
    dash = ' stroke-dasharray="5.5,2.4"' if style["dash"] is True else (
        ' stroke-dasharray="1.5,2.5"' if style["dash"] == "dotted" else "")
    return f' stroke="{style["stroke"]}" stroke-width="{style["width"]}"{dash}'


def _line(x1, y1, x2, y2, style) -> str:
    return f'<path d="M{_n(x1)} {_n(y1)}L{_n(x2)} {_n(y2)}"{_stroke(style)}/>'


def _grid_line(x1, y1, x2, y2) -> str:
    return (f'<path d="M{_n(x1)} {_n(y1)}L{_n(x2)} {_n(y2)}" stroke="{GRID}" stroke-opacity="{STYLE["grid_alpha"]}" '
            'stroke-width="0.8"/>')


def _rect(x, y, width, height, colour, alpha, hatch=False) -> str:
    opacity = "" if alpha == 1.0 else f' fill-opacity="{alpha}"'
    rect = f'<rect x="{_n(x)}" y="{_n(y)}" width="{_n(width)}" height="{_n(height)}" fill="{colour}"{opacity}/>'
    return rect + (f'<rect x="{_n(x)}" y="{_n(y)}" width="{_n(width)}" height="{_n(height)}" fill="url(#hatch)"/>'
                   if hatch else "")


def _marker(kind: str, x: float, y: float, colour: str, alpha: float = 1.0) -> str:
    """A marker centred on (x, y): "o" circle, "s" square, "^" triangle, "D" diamond."""
    fill = f'fill="{colour}"' + ("" if alpha == 1.0 else f' fill-opacity="{alpha}"')
    if kind == "s":
        return f'<rect x="{_n(x - 2.2)}" y="{_n(y - 2.2)}" width="4.4" height="4.4" {fill}/>'
    if kind in ("^", "D"):
        points = ((0, -3.2), (2.8, 1.9), (-2.8, 1.9)) if kind == "^" else ((0, -4), (3.2, 0), (0, 4), (-3.2, 0))
        return f'<polygon points="{" ".join(f"{_n(x + dx)},{_n(y + dy)}" for dx, dy in points)}" {fill}/>'
    return f'<circle cx="{_n(x)}" cy="{_n(y)}" r="2.4" {fill}/>'


def _text(x, y, text, size, anchor, baseline, colour="#000000", rotate=0) -> str:
    turn = f' transform="rotate({rotate} {_n(x)} {_n(y)})"' if rotate else ""
    fill = "" if colour == "#000000" else f' fill="{colour}"'
    return (f'<text x="{_n(x)}" y="{_n(y)}" font-size="{size}" text-anchor="{anchor}" '
            f'dominant-baseline="{baseline}"{fill}{turn}>{escape(text)}</text>')
