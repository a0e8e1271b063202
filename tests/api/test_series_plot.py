"""The required-HLB series' read-back as SVG: parsed back with xml.etree
(the standard library, independent of the matplotlib that writes it), the
plot must hold its axis labels, the estimate's figure, a marker for every
test (passed and failed in different shapes), the refining parabola where
the estimate was refined, the oil and the registry version in its title,
the caution; and no colour but black, white and greys. Every figure checked
is the JSON answer's to the same request (the arithmetic itself is tested
against hand-computed cases in tests/core)."""
from __future__ import annotations

import copy
import re
import subprocess
import sys
import xml.etree.ElementTree as ET

import pytest

PATH = "/v1/required-hlb-series/evaluate"
SVG = "{http://www.w3.org/2000/svg}"
XLINK_HREF = "{http://www.w3.org/1999/xlink}href"
# The README's demo series (invented scores).
SCORES = {"oil": "New emollient oil (demo)",
          "tests": [{"hlb": 8.58, "score": 3}, {"hlb": 9.65, "score": 6}, {"hlb": 10.72, "score": 8}, {"hlb": 11.79, "score": 7},
                    {"hlb": 12.86, "score": 4}],
          "pair": [{"ingredient": "sorbitan-monooleate"}, {"ingredient": "polysorbate-80"}]}
PASS_FAIL = {"oil": "Demo oil B", "tests": [{"hlb": h, "passed": p} for h, p in
                                            [(6, False), (7, True), (8, True), (9, True), (10, False), (11, False), (12, False)]]}
DROPLETS = {"tests": [{"hlb": h, "mean_droplet_um": d} for h, d in [(10, 9.0), (11, 4.0), (12, 3.0), (13, 6.0)]]}


def _svg(client, body) -> ET.Element:
    r = client.post(PATH, json=body, headers={"Accept": "image/svg+xml"})
    assert r.status_code == 200 and r.mimetype == "image/svg+xml", r.get_data(as_text=True)[:300]
    return ET.fromstring(r.data)


def _texts(root: ET.Element) -> list[str]:
    return ["".join(t.itertext()) for t in root.iter(f"{SVG}text")]


def _group(root: ET.Element, gid: str) -> ET.Element | None:
    return next((g for g in root.iter(f"{SVG}g") if g.get("id") == gid), None)


def _markers(root: ET.Element, gid: str) -> list[ET.Element]:
    group = _group(root, gid)
    return [] if group is None else list(group.iter(f"{SVG}use"))


def test_the_score_plot_shows_its_axes_the_estimate_and_every_test(client):
    answer = client.post(PATH, json=SCORES).get_json()
    root = _svg(client, SCORES)
    texts = _texts(root)
    assert "HLB of the surfactant blend (dimensionless)" in texts
    assert "Stability score, no unit (higher is better)" in texts
    # The estimate as the JSON answer rounds it (10.9 for the README's series), and its band.
    result = answer["result"]
    assert f"estimated required HLB {result['required_hlb']:.1f} ± {result['uncertainty_hlb']:.2g}" in texts
    low, high = result["required_hlb_unrounded"] - result["uncertainty_hlb"], result["required_hlb_unrounded"] + result["uncertainty_hlb"]
    assert f"uncertainty: HLB {low:.2f} to {high:.2f}" in texts
    assert len(_markers(root, "tests-observed")) == len(SCORES["tests"])
    assert _group(root, "refining-parabola") is not None and _group(root, "estimate") is not None
    title = " ".join(texts)
    assert "Required-HLB series: New emollient oil (demo)" in title and f"registry {answer['registry']['version']}" in title
    assert "Decision aid for a qualified pharmacist" in title


def test_the_uncertainty_band_is_hatched(client):
    root = _svg(client, SCORES)
    band = _group(root, "uncertainty-band")
    fill = re.search(r"fill: url\(#([^)]+)\)", next(band.iter(f"{SVG}path")).get("style"))
    assert fill, "the band is filled by a pattern"
    assert any(p.get("id") == fill.group(1) for p in root.iter(f"{SVG}pattern"))


def test_passed_and_failed_tests_have_markers_of_different_shapes(client):
    root = _svg(client, PASS_FAIL)
    passed, failed = _markers(root, "tests-passed"), _markers(root, "tests-failed")
    assert (len(passed), len(failed)) == (3, 4)
    shapes = {el.get("id"): el.get("d") for el in root.iter(f"{SVG}path") if el.get("id")}
    assert {shapes[u.get(XLINK_HREF)[1:]] for u in passed}.isdisjoint({shapes[u.get(XLINK_HREF)[1:]] for u in failed})
    texts = _texts(root)
    assert "Result: passed or failed (no unit)" in texts and {"passed", "failed"} <= set(texts)
    # Pass/fail is not refined by a fit: no curve, and the note says so.
    assert _group(root, "refining-parabola") is None
    assert any("no curve fitted" in t for t in texts)
    assert "estimated required HLB 8.0 ± 1.5" in texts  # hand-computed: passing run 7 to 9, step 1


def test_the_droplet_plot_names_its_unit(client):
    root = _svg(client, DROPLETS)
    assert "Mean droplet size, µm (smaller is better)" in _texts(root)
    assert len(_markers(root, "tests-observed")) == 4
    assert "Required-HLB series: oil not named in the request" in " ".join(_texts(root))


def test_lower_scores_better_is_said_on_the_axis(client):
    body = copy.deepcopy(SCORES)
    body["higher_score_is_better"] = False
    body["tests"] = [{"hlb": t["hlb"], "score": 10 - t["score"]} for t in body["tests"]]
    assert "Stability score, no unit (lower is better)" in _texts(_svg(client, body))


_COLOUR = re.compile(r"(?:^|;)\s*(fill|stroke|stop-color|color)\s*:\s*([^;]+)")


def _colours(el: ET.Element):
    for name in ("fill", "stroke", "stop-color", "color"):
        if el.get(name) is not None:
            yield name, el.get(name).strip()
    for name, value in _COLOUR.findall(el.get("style") or ""):
        yield name, value.strip()


@pytest.mark.parametrize("body", [SCORES, PASS_FAIL, DROPLETS], ids=["scores", "pass_fail", "droplets"])
def test_no_fill_or_stroke_has_a_colour_other_than_black_white_or_grey(client, body):
    root, seen = _svg(client, body), 0
    for el in root.iter():
        for name, value in _colours(el):
            seen += 1
            if value == "none" or value.startswith("url(#"):
                continue
            m = re.fullmatch(r"#([0-9a-fA-F]{2})([0-9a-fA-F]{2})([0-9a-fA-F]{2})", value)
            assert m and m.group(1).lower() == m.group(2).lower() == m.group(3).lower(), f"{el.tag} {name}: {value}"
    assert seen > 20


def test_the_same_request_gives_the_same_svg(client):
    a = client.post(PATH, json=SCORES, headers={"Accept": "image/svg+xml"}).data
    b = client.post(PATH, json=SCORES, headers={"Accept": "image/svg+xml"}).data
    assert a == b and b"<dc:date>" not in a


def test_an_oil_name_is_text_never_markup_or_mathtext(client):
    body = copy.deepcopy(SCORES)
    body["oil"] = "Oil $x^2$ <b>&amp; \"q\" 油"
    root = _svg(client, body)
    assert "Required-HLB series: Oil $x^2$ <b>&amp; \"q\" 油" in _texts(root)


def test_json_by_default_and_406_for_a_media_type_not_offered(client):
    assert client.post(PATH, json=SCORES).mimetype == "application/json"
    assert client.post(PATH, json=SCORES, headers={"Accept": "*/*"}).mimetype == "application/json"
    r = client.post(PATH, json=SCORES, headers={"Accept": "text/markdown"})
    assert r.status_code == 406 and "image/svg+xml" in r.get_json()["detail"]
    # Bad input is still a 422 problem, not a picture.
    bad = client.post(PATH, json={"tests": [{"hlb": 8, "score": 1}]}, headers={"Accept": "image/svg+xml"})
    assert bad.status_code == 422 and bad.mimetype == "application/problem+json"


def test_a_worker_never_asked_for_a_plot_does_not_load_matplotlib():
    # common practice, no source: heavy libraries are imported where they are used.
    code = ("import sys\n"
            "from service.http.app import create_app\n"
            f"c = create_app().test_client()\n"
            f"assert c.post({PATH!r}, json={SCORES!r}).status_code == 200\n"
            "print('matplotlib' in sys.modules)\n"
            f"assert c.post({PATH!r}, json={SCORES!r}, headers={{'Accept': 'image/svg+xml'}}).status_code == 200\n"
            "print('matplotlib' in sys.modules)\n")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout.split()
    assert out == ["False", "True"]
