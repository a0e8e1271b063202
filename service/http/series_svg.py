"""The required-HLB series' read-back drawn as SVG (matplotlib), from its
picture (service/usecases/series_picture.py).

Readable in black and white: only black, white and greys; the tests as
markers whose shape says passed (filled circle) or failed (cross), the
refining parabola dashed, the estimate a solid vertical line and its
uncertainty a hatched band. The same request gives the same bytes: the SVG's
ids are salted with a constant and it carries no date. Text stays text
(svg.fonttype 'none'), so that it can be searched, read back and tested.

matplotlib (and numpy under it) is imported on the first plot only, so that
a worker never asked for one does not load it."""
from __future__ import annotations

import io
import textwrap
import threading
import warnings

from service.usecases.series_picture import SeriesPicture

RC = {
    "svg.hashsalt": "emulsion-series",  # constant: the SVG's ids, hence its bytes, are the same for the same request
    "svg.fonttype": "none",             # text as <text>, not paths
    "text.parse_math": False,           # a name holding '$' is text, never mathtext
    "font.family": "DejaVu Sans",       # shipped with matplotlib: the layout does not depend on the machine's fonts
    "font.size": 9.0,
    "axes.edgecolor": "black", "axes.labelcolor": "black", "text.color": "black",
    "xtick.color": "black", "ytick.color": "black",
    "hatch.color": "0.35", "hatch.linewidth": 0.8,
    "legend.edgecolor": "0.5", "legend.facecolor": "white", "legend.framealpha": 1.0,
}
# Each group of the drawing has an id: the tests' markers can be counted in it.
GIDS = {"observed": "tests-observed", "passed": "tests-passed", "failed": "tests-failed", "curve": "refining-parabola",
        "estimate": "estimate", "band": "uncertainty-band", "cautions": "cautions"}
MARKERS = {"observed": dict(marker="s", markerfacecolor="black", markeredgecolor="black", markersize=6),
           "passed": dict(marker="o", markerfacecolor="black", markeredgecolor="black", markersize=7),
           "failed": dict(marker="x", markerfacecolor="black", markeredgecolor="black", markeredgewidth=1.6, markersize=8)}
LEGEND = {"observed": "test", "passed": "test passed", "failed": "test failed"}

WIDTH_IN, AXES_HEIGHT_IN = 8.0, 3.6
LEFT_IN, RIGHT_IN = 0.9, 0.3
TITLE_LINE_IN, SMALL_LINE_IN, LEGEND_ROW_IN = 0.24, 0.16, 0.2

# matplotlib's rcParams are the process's; they are set once, and plots are
# drawn one at a time in a worker (its figure code is not made for threads).
_LOCK = threading.Lock()
_loaded = False


def _figure_class():
    global _loaded
    import matplotlib
    from matplotlib.figure import Figure

    if not _loaded:
        matplotlib.rcParams.update(RC)
        _loaded = True
    return Figure


def series_svg(picture: SeriesPicture) -> bytes:
    """The picture as an SVG document (UTF-8 bytes)."""
    with _LOCK:
        figure_class = _figure_class()
        with warnings.catch_warnings():
            # A name in a script the bundled font lacks is still written as
            # text (the viewer's fonts draw it); only its measured width is off.
            warnings.filterwarnings("ignore", message=r"Glyph .* missing from")
            return _draw(figure_class, picture)


def _draw(figure_class, p: SeriesPicture) -> bytes:
    title = textwrap.wrap(p.title, 80) + [p.subtitle]
    footer = textwrap.wrap(p.note, 130) + [line for c in p.cautions for line in textwrap.wrap(c, 130)]
    top_in = 0.2 + TITLE_LINE_IN * len(title)
    # Below the axes: the x label, the legend (two columns, so that it hides
    # no test), then the note and the cautions.
    legend_rows = -(-(len({m.kind for m in p.markers}) + 2 + bool(p.curve)) // 2)
    bottom_in = 0.55 + LEGEND_ROW_IN * legend_rows + 0.15 + SMALL_LINE_IN * len(footer) + 0.15
    height_in = top_in + AXES_HEIGHT_IN + bottom_in
    fig = figure_class(figsize=(WIDTH_IN, height_in), facecolor="white")
    ax = fig.add_axes((LEFT_IN / WIDTH_IN, bottom_in / height_in, 1 - (LEFT_IN + RIGHT_IN) / WIDTH_IN, AXES_HEIGHT_IN / height_in))
    ax.set_facecolor("white")

    low, high = p.estimate_hlb - p.uncertainty_hlb, p.estimate_hlb + p.uncertainty_hlb
    band = ax.axvspan(low, high, facecolor="0.9", edgecolor="0.35", hatch="///", linewidth=0.0,
                      label=f"uncertainty: HLB {low:.2f} to {high:.2f}")
    band.set_gid(GIDS["band"])
    line = ax.axvline(p.estimate_hlb, color="black", linestyle="-", linewidth=1.6, label=p.estimate_label)
    line.set_gid(GIDS["estimate"])
    if p.curve:
        curve, = ax.plot([x for x, _ in p.curve], [y for _, y in p.curve], color="black", linestyle="--", linewidth=1.1,
                         label="parabola the estimate was refined with")
        curve.set_gid(GIDS["curve"])
    for kind in ("observed", "passed", "failed"):
        points = [m for m in p.markers if m.kind == kind]
        if points:
            drawn, = ax.plot([m.hlb for m in points], [m.value for m in points], linestyle="none", color="black", zorder=3,
                             label=LEGEND[kind], **MARKERS[kind])
            drawn.set_gid(GIDS[kind])

    hlbs = [m.hlb for m in p.markers]
    pad = max(0.5, 0.05 * (max(hlbs) - min(hlbs)))
    ax.set_xlim(min(min(hlbs), low) - pad, max(max(hlbs), high) + pad)
    if p.y_ticks:
        ax.set_ylim(-0.5, 1.5)
        ax.set_yticks([v for v, _ in p.y_ticks], [name for _, name in p.y_ticks])
    ax.set_xlabel(p.x_label)
    ax.set_ylabel(p.y_label)
    ax.grid(True, color="0.85", linewidth=0.5)
    ax.set_axisbelow(True)
    ax.legend(loc="upper center", bbox_to_anchor=(0.5, -0.55 / AXES_HEIGHT_IN), ncols=2, fontsize=8)

    fig.text(0.5, 1 - 0.12 / height_in, "\n".join(title), ha="center", va="top", fontsize=11, linespacing=1.3)
    notes = fig.text(LEFT_IN / WIDTH_IN, 0.12 / height_in, "\n".join(footer), ha="left", va="bottom", fontsize=7, linespacing=1.35)
    notes.set_gid(GIDS["cautions"])

    out = io.BytesIO()
    fig.savefig(out, format="svg", metadata={"Date": None, "Title": p.title})
    return out.getvalue()
