"""Charts as hand-built SVG strings: deterministic, searchable text, no plotting dependency.

Styled for grey-scale print: features are told apart by marker shape and line dash, never by
colour alone; regime bands carry their names.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from html import escape

from ..recipe import LIMITS

WIDTH, HEIGHT = 640, 270
LEFT, RIGHT, TOP, BOTTOM = 64, 150, 18, 44
MARKERS = ("circle", "square", "triangle", "diamond", "cross")
DASHES = ("", "6 3", "2 3", "8 3 2 3", "1 2")
INK = ("#1d232a", "#3f5f7a", "#6b4f1d", "#555555", "#7a1020")
BANDS = {"continuum": "#dfe7ef", "slip": "#eef2f6", "transition": "#f6f1e4",
         "free-molecular": "#ffffff"}


#: Pressure axes are in Torr, the unit recipes and tables lead with.
TORR_PA = 101325.0 / 760.0
PRESSURE_LABEL = "pressure (Torr)"


def _torr(p_pa: float) -> float:
    return p_pa / TORR_PA


def _num(x: float) -> str:
    return f"{x:.1f}"


@dataclass
class Axis:
    lo: float
    hi: float
    log: bool
    label: str

    def frac(self, v: float) -> float:
        if self.log:
            return (math.log10(v) - math.log10(self.lo)) / (math.log10(self.hi)
                                                              - math.log10(self.lo))
        return (v - self.lo) / (self.hi - self.lo)

    def ticks(self) -> list[tuple[float, str]]:
        if self.log:
            a, b = math.floor(math.log10(self.lo) + 1e-9), math.ceil(math.log10(self.hi) - 1e-9)
            step = max(1, math.ceil((b - a) / 7))
            return [(10.0 ** e, _pow10(e)) for e in range(a, b + 1, step)
                    if self.lo <= 10.0 ** e <= self.hi * (1 + 1e-9)]
        span = self.hi - self.lo
        raw = span / 5
        mag = 10 ** math.floor(math.log10(raw)) if raw > 0 else 1
        step = next(m * mag for m in (1, 2, 5, 10) if m * mag >= raw)
        first = math.ceil(self.lo / step) * step
        out, v = [], first
        while v <= self.hi + 1e-9 * step:
            out.append((v, f"{v:g}"))
            v += step
        return out


def _pow10(e: int) -> str:
    return {0: "1", 1: "10", -1: "0.1", 2: "100", -2: "0.01"}.get(e, f"1e{e}")


def log_axis(values, label: str, pad: float = 0.3) -> Axis:
    vals = [v for v in values if v is not None and v > 0 and math.isfinite(v)]
    if not vals:
        return Axis(0.1, 10.0, True, label)
    lo, hi = math.log10(min(vals)) - pad, math.log10(max(vals)) + pad
    return Axis(10 ** math.floor(lo), 10 ** math.ceil(hi), True, label)


def lin_axis(values, label: str, zero: bool = True) -> Axis:
    vals = [v for v in values if v is not None and math.isfinite(v)] or [0.0, 1.0]
    lo = min(0.0, min(vals)) if zero else min(vals)
    hi = max(vals)
    if hi <= lo:
        hi = lo + 1.0
    return Axis(lo, hi + 0.08 * (hi - lo), False, label)


@dataclass
class Chart:
    """A small x-y chart: one plot area, optional bands, series of points and lines."""

    x: Axis
    y: Axis
    title: str
    parts: list[str] = field(default_factory=list)
    legend: list[tuple[int, str]] = field(default_factory=list)

    @property
    def pw(self) -> float:
        return WIDTH - LEFT - RIGHT

    @property
    def ph(self) -> float:
        return HEIGHT - TOP - BOTTOM

    def px(self, v: float) -> float:
        return LEFT + self.x.frac(v) * self.pw

    def py(self, v: float) -> float:
        return TOP + (1.0 - self.y.frac(v)) * self.ph

    def band(self, y0: float, y1: float, name: str) -> None:
        y0, y1 = max(y0, self.y.lo), min(y1, self.y.hi)
        if y1 <= y0:
            return
        top, bottom = self.py(y1), self.py(y0)
        self.parts.append(f'<rect x="{LEFT}" y="{_num(top)}" width="{_num(self.pw)}" '
                          f'height="{_num(bottom - top)}" fill="{BANDS.get(name, "#fff")}"/>')
        self.parts.append(f'<text x="{_num(LEFT + self.pw - 4)}" y="{_num(top + 11)}" '
                          f'text-anchor="end" font-size="9" fill="#444">{escape(name)}</text>')

    def hline(self, y: float, dash: str = "3 3") -> None:
        if self.y.lo <= y <= self.y.hi:
            self.parts.append(f'<line x1="{LEFT}" x2="{_num(LEFT + self.pw)}" y1="{_num(self.py(y))}"'
                              f' y2="{_num(self.py(y))}" stroke="#777" stroke-dasharray="{dash}"/>')

    def line(self, points: list[tuple[float, float]], k: int) -> None:
        pts = self._clip(points)
        if len(pts) < 2:
            return
        path = " ".join(f"{_num(self.px(x))},{_num(self.py(y))}" for x, y in pts)
        dash = DASHES[k % len(DASHES)]
        self.parts.append(f'<polyline points="{path}" fill="none" stroke="{INK[k % len(INK)]}" '
                          f'stroke-width="1.4"' + (f' stroke-dasharray="{dash}"' if dash else "")
                          + "/>")

    def marker(self, x: float, y: float, k: int, label: str = "", tip: str = "") -> None:
        if not self._inside(x, y):
            return
        cx, cy, r, ink = self.px(x), self.py(y), 4.0, INK[k % len(INK)]
        shape = MARKERS[k % len(MARKERS)]
        title = f"<title>{escape(tip)}</title>" if tip else ""
        if shape == "circle":
            body = f'<circle cx="{_num(cx)}" cy="{_num(cy)}" r="{r}"'
        elif shape == "square":
            body = f'<rect x="{_num(cx - r)}" y="{_num(cy - r)}" width="{2 * r}" height="{2 * r}"'
        elif shape == "triangle":
            body = (f'<polygon points="{_num(cx)},{_num(cy - r - 1)} {_num(cx - r - 1)},'
                    f'{_num(cy + r)} {_num(cx + r + 1)},{_num(cy + r)}"')
        elif shape == "diamond":
            body = (f'<polygon points="{_num(cx)},{_num(cy - r - 1)} {_num(cx + r + 1)},{_num(cy)} '
                    f'{_num(cx)},{_num(cy + r + 1)} {_num(cx - r - 1)},{_num(cy)}"')
        else:
            body = (f'<path d="M{_num(cx - r)},{_num(cy - r)} L{_num(cx + r)},{_num(cy + r)} '
                    f'M{_num(cx - r)},{_num(cy + r)} L{_num(cx + r)},{_num(cy - r)}"')
        self.parts.append(f'<g>{body} fill="white" stroke="{ink}" stroke-width="1.5"/>{title}</g>')
        if label:
            self.parts.append(f'<text x="{_num(cx + 6)}" y="{_num(cy - 5)}" font-size="8.5" '
                              f'fill="#333">{escape(label)}</text>')

    def tick_mark(self, x: float, y: float, half_width: float = 9.0) -> None:
        """A short horizontal bar (e.g. a step's duration) at (x, y)."""
        if self._inside(x, y):
            cx, cy = self.px(x), self.py(y)
            self.parts.append(f'<line x1="{_num(cx - half_width)}" x2="{_num(cx + half_width)}" '
                              f'y1="{_num(cy)}" y2="{_num(cy)}" stroke="#111" stroke-width="2.5"/>')

    def _clip(self, points: list[tuple[float, float]]) -> list[tuple[float, float]]:
        """Points of a polyline clipped to the plot area (in axis fractions), so a line whose
        ends stick out is cut at the frame instead of dropped."""
        def frac(p):
            x, y = p
            ok = (x is not None and y is not None and math.isfinite(x) and math.isfinite(y)
                  and not (self.x.log and x <= 0) and not (self.y.log and y <= 0))
            return (self.x.frac(x), self.y.frac(y)) if ok else None

        def back(u, v):
            x = (10 ** (math.log10(self.x.lo) + u * (math.log10(self.x.hi)
                                                       - math.log10(self.x.lo)))
                 if self.x.log else self.x.lo + u * (self.x.hi - self.x.lo))
            y = (10 ** (math.log10(self.y.lo) + v * (math.log10(self.y.hi)
                                                       - math.log10(self.y.lo)))
                 if self.y.log else self.y.lo + v * (self.y.hi - self.y.lo))
            return x, y

        out: list[tuple[float, float]] = []
        fr = [frac(p) for p in points]
        for a, b in zip(fr, fr[1:]):
            if a is None or b is None:
                continue
            t0, t1 = 0.0, 1.0
            dx, dy = b[0] - a[0], b[1] - a[1]
            for p, q in ((-dx, a[0]), (dx, 1 - a[0]), (-dy, a[1]), (dy, 1 - a[1])):
                if p == 0:
                    if q < 0:
                        t0, t1 = 1.0, 0.0
                elif p < 0:
                    t0 = max(t0, q / p)
                else:
                    t1 = min(t1, q / p)
            if t0 <= t1:
                start = back(a[0] + t0 * dx, a[1] + t0 * dy)
                if not out or out[-1] != start:
                    out.append(start)
                out.append(back(a[0] + t1 * dx, a[1] + t1 * dy))
        return out

    def _inside(self, x: float, y: float) -> bool:
        ok = x is not None and y is not None and math.isfinite(x) and math.isfinite(y)
        if not ok or (self.x.log and x <= 0) or (self.y.log and y <= 0):
            return False
        return -1e-9 <= self.x.frac(x) <= 1 + 1e-9 and -1e-9 <= self.y.frac(y) <= 1 + 1e-9

    def svg(self, x_labels: dict[float, str] | None = None) -> str:
        out = [f'<svg xmlns="http://www.w3.org/2000/svg" width="{WIDTH}" height="{HEIGHT}" '
               f'viewBox="0 0 {WIDTH} {HEIGHT}" role="img" aria-label="{escape(self.title)}">',
               f'<rect x="0" y="0" width="{WIDTH}" height="{HEIGHT}" fill="white"/>']
        out += self.parts
        out.append(f'<rect x="{LEFT}" y="{TOP}" width="{_num(self.pw)}" height="{_num(self.ph)}" '
                   'fill="none" stroke="#1d232a"/>')
        xt = [(v, x_labels[v]) for v in sorted(x_labels)] if x_labels else self.x.ticks()
        for v, text in xt:
            x = self.px(v)
            out.append(f'<line x1="{_num(x)}" x2="{_num(x)}" y1="{_num(TOP + self.ph)}" '
                       f'y2="{_num(TOP + self.ph + 4)}" stroke="#1d232a"/>')
            out.append(f'<text x="{_num(x)}" y="{_num(TOP + self.ph + 15)}" font-size="9" '
                       f'text-anchor="middle">{escape(text)}</text>')
        for v, text in (self.y.ticks() if self.y.label else []):
            y = self.py(v)
            out.append(f'<line x1="{LEFT - 4}" x2="{LEFT}" y1="{_num(y)}" y2="{_num(y)}" '
                       'stroke="#1d232a"/>')
            out.append(f'<text x="{LEFT - 6}" y="{_num(y + 3)}" font-size="9" '
                       f'text-anchor="end">{escape(text)}</text>')
        out.append(f'<text x="{_num(LEFT + self.pw / 2)}" y="{HEIGHT - 8}" font-size="10" '
                   f'text-anchor="middle">{escape(self.x.label)}</text>')
        out.append(f'<text x="14" y="{_num(TOP + self.ph / 2)}" font-size="10" '
                   f'text-anchor="middle" transform="rotate(-90 14 {_num(TOP + self.ph / 2)})">'
                   f'{escape(self.y.label)}</text>')
        lx, ly = WIDTH - RIGHT + 12, TOP + 6
        for i, (k, text) in enumerate(self.legend):
            y = ly + 16 * i
            saved = self.parts
            self.parts = []
            out.append(f'<line x1="{lx - 4}" x2="{lx + 14}" y1="{y}" y2="{y}" '
                       f'stroke="{INK[k % len(INK)]}" stroke-width="1.4"'
                       + (f' stroke-dasharray="{DASHES[k % len(DASHES)]}"'
                          if DASHES[k % len(DASHES)] else "") + "/>")
            self.parts = saved
            out.append(_legend_marker(lx + 5, y, k))
            out.append(f'<text x="{lx + 20}" y="{y + 3}" font-size="9">{escape(text[:24])}</text>')
        out.append("</svg>")
        return "\n".join(out)


def _legend_marker(cx: float, cy: float, k: int) -> str:
    shape, ink, r = MARKERS[k % len(MARKERS)], INK[k % len(INK)], 3.5
    if shape == "circle":
        return f'<circle cx="{cx}" cy="{cy}" r="{r}" fill="white" stroke="{ink}"/>'
    if shape == "square":
        return (f'<rect x="{cx - r}" y="{cy - r}" width="{2 * r}" height="{2 * r}" fill="white" '
                f'stroke="{ink}"/>')
    if shape == "triangle":
        return (f'<polygon points="{cx},{cy - r} {cx - r},{cy + r} {cx + r},{cy + r}" '
                f'fill="white" stroke="{ink}"/>')
    if shape == "diamond":
        return (f'<polygon points="{cx},{cy - r} {cx + r},{cy} {cx},{cy + r} {cx - r},{cy}" '
                f'fill="white" stroke="{ink}"/>')
    return (f'<path d="M{cx - r},{cy - r} L{cx + r},{cy + r} M{cx - r},{cy + r} '
            f'L{cx + r},{cy - r}" stroke="{ink}"/>')


# ------------------------------------------------------------------------------------------
# the standard charts of a check report

def _feature_index(doc: dict) -> dict[str, int]:
    ids = dict.fromkeys(f["id"] for s in doc["steps"] for f in s["features"])
    return {fid: k for k, fid in enumerate(ids)}


def _feature_names(doc: dict) -> dict[str, str]:
    return {f["id"]: f["name"] for s in doc["steps"] for f in s["features"]}


def regime_map(doc: dict, bounds: tuple[float, float, float]) -> dict | None:
    """Knudsen number of each feature against pressure, with the regime bands; each step's
    point sits on its line Kn proportional to 1/p (fixed gas, temperature and width)."""
    points = [(_torr(s["pressure_Pa"]), f["knudsen_number"], s["index"], f["id"])
              for s in doc["steps"] for f in s["features"]]
    if not points:
        return None
    x = log_axis([p for p, *_ in points], PRESSURE_LABEL, pad=1.0)
    y = log_axis([kn for _, kn, *_ in points] + list(bounds), "Knudsen number", pad=0.5)
    c = Chart(x, y, "Regime map")
    edges = [y.lo, *bounds, y.hi]
    for name, lo, hi in zip(("continuum", "slip", "transition", "free-molecular"), edges,
                            edges[1:]):
        c.band(lo, hi, name)
    for b in bounds:
        c.hline(b)
    index = _feature_index(doc)
    for p, kn, step, fid in points:
        k = index[fid]
        c.line([(p / 10, kn * 10), (p * 10, kn / 10)], k)
    for p, kn, step, fid in points:
        c.marker(p, kn, index[fid], label=str(step), tip=f"step {step}, {fid}: Kn {kn:.3g}")
    names = _feature_names(doc)
    c.legend = [(k, names[fid]) for fid, k in index.items()]
    return {"title": "Regime map",
            "caption": "Knudsen number of each feature against pressure. Markers are the recipe's "
                       "steps (numbered); each line shows how Kn would move with pressure alone "
                       "(Kn proportional to 1/p). Bands are the regimes, dashed lines their bounds.",
            "svg": c.svg()}


def across_steps(doc: dict, key: str, title: str, label: str, log: bool, caption: str
                 ) -> dict | None:
    """One figure of every feature against the step number."""
    index = _feature_index(doc)
    if not index:
        return None
    series = {fid: [(s["index"], f[key]) for s in doc["steps"] for f in s["features"]
                    if f["id"] == fid and f.get(key) is not None] for fid in index}
    values = [v for pts in series.values() for _, v in pts]
    if not values:
        return None
    steps = [s["index"] for s in doc["steps"]]
    x = Axis(min(steps) - 0.5, max(steps) + 0.5, False, "step")
    y = log_axis(values, label) if log else lin_axis(values, label)
    c = Chart(x, y, title)
    for fid, k in index.items():
        c.line(series[fid], k)
        for step, v in series[fid]:
            c.marker(step, v, k, tip=f"step {step}, {fid}: {v:.3g}")
    names = _feature_names(doc)
    c.legend = [(k, names[fid]) for fid, k in index.items()]
    return {"title": title, "caption": caption,
            "svg": c.svg({float(i): str(i) for i in steps})}


def fill_vs_duration(doc: dict) -> dict | None:
    """The 99 % fill time of each feature against each step's duration (black bars)."""
    index = _feature_index(doc)
    vals = [f["fill_time_99_s"] for s in doc["steps"] for f in s["features"]
            if f.get("fill_time_99_s")] + [s["duration_s"] for s in doc["steps"]]
    if not index or not any(f.get("fill_time_99_s") for s in doc["steps"]
                            for f in s["features"]):
        return None
    steps = [s["index"] for s in doc["steps"]]
    c = Chart(Axis(min(steps) - 0.5, max(steps) + 0.5, False, "step"),
              log_axis(vals, "time (s)"), "Fill time against step duration")
    for s in doc["steps"]:
        c.tick_mark(s["index"], s["duration_s"])
        for f in s["features"]:
            if f.get("fill_time_99_s"):
                c.marker(s["index"], f["fill_time_99_s"], index[f["id"]],
                         tip=f"step {s['index']}, {f['id']}: {f['fill_time_99_s']:.3g} s")
    names = _feature_names(doc)
    c.legend = [(k, names[fid]) for fid, k in index.items()]
    return {"title": "Fill time against step duration",
            "caption": "Time for the bottom of each feature to reach 99 % of the opening's "
                       "reactant concentration (markers) against the step's duration (black "
                       "bars). A marker above its bar means the step ends before the bottom "
                       "catches up.",
            "svg": c.svg({float(i): str(i) for i in steps})}


def process_window(doc: dict) -> dict | None:
    """For each step and feature, the pressure ranges of each regime (same gas, temperature and
    width) and where the step's pressure sits."""
    rows = [(s, f) for s in doc["steps"] for f in s["features"] if f.get("window_pressures_Pa")]
    if not rows:
        return None
    bounds = [_torr(p) for _, f in rows for p in f["window_pressures_Pa"]] + \
        [_torr(s["pressure_Pa"]) for s, _ in rows]
    x = log_axis(bounds, PRESSURE_LABEL, pad=0.5)
    # no wider than the decades around the pressures a recipe may ask for (LIMITS["pressure"])
    lo_pa, hi_pa, _ = LIMITS["pressure"]
    x = Axis(max(x.lo, 10.0 ** math.floor(math.log10(_torr(lo_pa)))),
             min(x.hi, 10.0 ** math.ceil(math.log10(_torr(hi_pa)))), True, x.label)
    n = len(rows)
    c = Chart(x, Axis(0.0, float(n), False, ""), "Process window")
    names = ("continuum", "slip", "transition", "free-molecular")
    for i, (s, f) in enumerate(rows):
        y0, y1 = c.py(n - i - 0.15), c.py(n - i - 0.85)
        # Kn falls as pressure rises: free-molecular at the low-pressure end
        edges = [x.lo, *sorted(_torr(p) for p in f["window_pressures_Pa"]), x.hi]
        for name, lo, hi in zip(reversed(names), edges, edges[1:]):
            lo, hi = max(lo, x.lo), min(hi, x.hi)
            if hi <= lo:
                continue
            c.parts.append(f'<rect x="{_num(c.px(lo))}" y="{_num(y0)}" '
                           f'width="{_num(c.px(hi) - c.px(lo))}" height="{_num(y1 - y0)}" '
                           f'fill="{BANDS[name]}" stroke="#8a96a3" stroke-width="0.6">'
                           f'<title>{escape(name)}</title></rect>')
        px = c.px(_torr(s["pressure_Pa"]))
        c.parts.append(f'<line x1="{_num(px)}" x2="{_num(px)}" y1="{_num(y0 - 2)}" '
                       f'y2="{_num(y1 + 2)}" stroke="#111" stroke-width="2.5"/>')
        c.parts.append(f'<text x="{LEFT + 3}" y="{_num((y0 + y1) / 2 + 3)}" font-size="8">'
                       f'{escape(str(s["index"]))} {escape(f["name"][:18])}</text>')
    c.legend = []
    svg = c.svg()
    return {"title": "Process window",
            "caption": "Each row is a step and feature: shaded spans show the pressures at which "
                       "that feature would be continuum (darkest), slip, transition or "
                       "free-molecular (white) at the step's gas and temperature; the black bar is "
                       "the step's pressure. The axis stops at the pressures a recipe may ask "
                       "for (1e-7 Pa to 10 bar). The JSON gives the crossing pressures and the "
                       "factor to the nearest bound.",
            "svg": svg}


def window_comparison(doc: dict) -> dict | None:
    """The process window of each matched step and feature, old revision above new."""
    steps, features = [], []
    for pair in doc["steps"]:
        for f in pair["features"]:
            for side in ("old", "new"):
                fig = f.get(side)
                p = pair["results"]["pressure_Pa"][side]
                if fig and p and fig.get("window_pressures_Pa"):
                    label = f"{side} {pair[side + '_index']}"
                    steps.append({"index": label, "pressure_Pa": p})
                    features.append({"name": f["name"], **fig})
    if not steps:
        return None
    chart = process_window({"steps": [{**s, "features": [f]} for s, f in zip(steps, features)]})
    chart["title"] = "Process window, old and new"
    return chart


def sweep_charts(doc: dict) -> list[dict]:
    sweep = doc.get("sweep")
    if not sweep:
        return []
    key = "values_Pa" if sweep["parameter"] == "pressure" else "values_K"
    scale = _torr if key == "values_Pa" else float
    xs = [scale(v) for v in sweep[key]]
    label = PRESSURE_LABEL if key == "values_Pa" else "temperature (K)"
    out = []
    for field, title, ylabel, log in (
            ("knudsen_number", "Knudsen number", "Knudsen number", True),
            ("fill_time_99_s", "99 % fill time", "time (s)", True),
            ("bottom_flux_ratio", "bottom flux", "bottom flux / opening flux", False)):
        values = [v for f in sweep["features"] for v in f[field] if v is not None]
        if not values:
            continue
        x = log_axis(xs, label, pad=0.0) if key == "values_Pa" else lin_axis(xs, label, False)
        y = log_axis(values, ylabel) if log else lin_axis(values, ylabel)
        c = Chart(x, y, title)
        for k, f in enumerate(sweep["features"]):
            c.line([(a, b) for a, b in zip(xs, f[field]) if b is not None], k)
        at = scale(sweep["step_value"])
        sx = c.px(at) if x.lo <= at <= x.hi else None
        if sx is not None:
            c.parts.append(f'<line x1="{_num(sx)}" x2="{_num(sx)}" y1="{TOP}" '
                           f'y2="{_num(TOP + c.ph)}" stroke="#111" stroke-dasharray="4 2"/>')
        c.legend = [(k, f["name"]) for k, f in enumerate(sweep["features"])]
        out.append({"title": f"Sweep of step {sweep['step_index']}: {title}",
                    "caption": f"{title} of each feature in step '{sweep['step']}' as its "
                               f"{sweep['parameter']} varies; the dashed line marks the "
                               "recipe's value.",
                    "svg": c.svg()})
    return out


def charts_for(doc: dict) -> list[dict]:
    """The charts for one evaluation document: a list of {title, caption, svg}."""
    bounds = tuple(doc.get("regime_bounds", (0.01, 0.1, 10.0)))
    charts = [
        regime_map(doc, bounds),
        across_steps(doc, "aspect_ratio", "Aspect ratio across the steps", "aspect ratio",
                     False, "Depth over width of each feature at the start of each step: film "
                            "narrows features, etching deepens them."),
        across_steps(doc, "knudsen_number", "Knudsen number across the steps",
                     "Knudsen number", True, "Knudsen number of each feature at each step."),
        fill_vs_duration(doc),
        process_window(doc),
        *sweep_charts(doc),
    ]
    return [c for c in charts if c is not None]
