"""What a picture of a required-HLB series' read-back shows, as plain data:
each test's observation against its HLB, the parabola the estimate was
refined with, the estimate and its uncertainty, a title naming the oil and
the registry version, and the cautions. The HTTP layer draws it
(service/http/series_svg.py); nothing is drawn here."""
from __future__ import annotations

from dataclasses import dataclass

from service.core.series import parabola_points
from service.usecases.hlb_series import estimate_of, observation_kind

X_LABEL = "HLB of the surfactant blend (dimensionless)"
# The observation each kind of test carries, as its axis names it, with its unit.
Y_LABELS = {
    "score": "Stability score, no unit ({better} is better)",
    "mean_droplet_um": "Mean droplet size, µm (smaller is better)",
    "passed": "Result: passed or failed (no unit)",
}
PASS_FAIL_TICKS = ((0.0, "failed"), (1.0, "passed"))
UNNAMED_OIL = "oil not named in the request"


@dataclass(frozen=True)
class Marker:
    hlb: float
    value: float  # the observation: a score, a droplet size in µm, or 1 passed / 0 failed
    kind: str     # observed | passed | failed


@dataclass(frozen=True)
class SeriesPicture:
    title: str
    subtitle: str
    x_label: str
    y_label: str
    y_ticks: tuple[tuple[float, str], ...]   # named ticks (pass/fail); empty for a numeric axis
    markers: tuple[Marker, ...]
    curve: tuple[tuple[float, float], ...]   # (HLB, observation) along the refining parabola; empty when not refined
    estimate_hlb: float
    uncertainty_hlb: float
    estimate_label: str
    note: str
    cautions: tuple[str, ...]


def picture(data: dict, answer: dict) -> SeriesPicture:
    """The picture of `answer`, the evaluation of the series request `data`
    (hlb_series.evaluate's envelope)."""
    kind = observation_kind(data)
    tests = sorted(data["tests"], key=lambda t: t["hlb"])
    if kind == "passed":
        markers = tuple(Marker(t["hlb"], 1.0 if t["passed"] else 0.0, "passed" if t["passed"] else "failed") for t in tests)
    else:
        markers = tuple(Marker(t["hlb"], float(t[kind]), "observed") for t in tests)
    # The fit is drawn through the observations themselves: a parabola through
    # the negated scores (or droplet sizes) has the same vertex.
    fit_hlbs = estimate_of(data).fit_hlbs
    observed = {m.hlb: m.value for m in markers}
    curve = tuple(parabola_points(fit_hlbs, [observed[h] for h in fit_hlbs])) if fit_hlbs else ()
    result = answer["result"]
    better = "higher" if data.get("higher_score_is_better", True) else "lower"
    estimate, uncertainty = result["required_hlb_unrounded"], result["uncertainty_hlb"]
    return SeriesPicture(
        title=f"Required-HLB series: {data.get('oil') or UNNAMED_OIL}",
        subtitle=f"registry {answer['registry']['version']}",
        x_label=X_LABEL,
        y_label=Y_LABELS[kind].format(better=better),
        y_ticks=PASS_FAIL_TICKS if kind == "passed" else (),
        markers=markers,
        curve=curve,
        estimate_hlb=estimate,
        uncertainty_hlb=uncertainty,
        # Shown as the JSON answer shows it: the estimate to 0.1 HLB.
        estimate_label=f"estimated required HLB {result['required_hlb']:.1f} ± {uncertainty:.2g}",
        note=result["note"] if curve else f"{result['note']} (no curve fitted)",
        cautions=tuple(answer["cautions"][:2]),
    )
